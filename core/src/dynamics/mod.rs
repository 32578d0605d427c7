//! Vibration about the preloaded equilibrium: natural frequencies and mode shapes
//! ([`modes`]), nonlinear free vibration — Pluck — ([`Motion`]), and spectra of signals
//! ([`spectrum`]).
//!
//! Masses are lumped at the nodes, so the mass matrix is diagonal; nodes with zero mass are
//! allowed and follow the massive ones quasi-statically.

mod modes;
mod motion;
mod pluck;
pub mod spectrum;
pub mod subdivide;

pub use modes::{Mode, ModeError, Modes, modes, modes_watched, modes_with};
pub use motion::{Energy, Motion, MotionError, MotionSettings, Scheme, rayleigh_coefficients};
pub use pluck::{BackbonePoint, PluckError, PluckSpec, Record, backbone, pulled_positions, record};
pub use subdivide::{CableLinks, Subdivision};
