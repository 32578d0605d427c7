//! # rigwright-core
//!
//! The mechanics of tensioned cable-and-spring rigs, with no GUI dependency.
//!
//! Data flows one way: a project document as stored on disk ([`Project`]) is checked and
//! turned into a validated [`Model`]; the solvers borrow the model and return plain result
//! values ([`Equilibrium`], [`NodeStiffness`], …) that the app draws and the sheet prints.
//!
//! * [`model`]: nodes, members, load cases, the project file and its validation.
//! * [`element`]: the force law of each member kind and its tangent stiffness.
//! * [`solve`]: assembly, large-displacement equilibrium, condensed stiffness.
//!
//! Units are SI throughout: metres, newtons, kilograms, seconds.

/// The cautions shown in the app's About box, after `rigwright check` and on every sheet.
pub const CAUTION: &str = "Rigging and tensioned structures can fail suddenly and hurt people. Results are a design aid for qualified persons; they do not replace the checks that local codes and standards require, the manufacturer's ratings of actual components, or review by a licensed engineer.";

pub mod dynamics;
pub mod element;
pub mod gallery;
pub mod model;
pub mod sizing;
pub mod solve;
pub mod watch;

pub use element::{MemberKind, MemberState};
pub use model::{Axis, FILE_EXTENSION, FORMAT_VERSION, Member, Model, Node, Problem, Project, ProjectError, Rest, Support, Vec3};
pub use solve::{
    CriticalKind, Equilibrium, Hold, MemberResult, NodeResult, NodeStiffness, Route, SolveError, SolveSettings, Stability, Statics, Warm,
};
pub use watch::Watch;
