//! Sizing: wire rope and strand from the published minimum-breaking-force method, helical
//! springs from the standard design formulas, and design factors.
//!
//! Every default here is labelled with where it comes from; the user can override all of it.
//! These are design aids: rated data of actual components and local codes decide.

pub mod rope;
pub mod spring;

pub use rope::{Construction, Core, RopeSpec, minimum_breaking_force_kn};
pub use spring::{SpringMaterial, SpringReport, helical_spring};
