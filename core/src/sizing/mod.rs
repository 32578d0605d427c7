//! Sizing: the parts catalogue, wire rope from the published minimum-breaking-force method,
//! helical springs from the standard design formulas, design factors, the checks of every
//! member across every load case, auto-size and Sweep.
//!
//! Every default here is labelled with where it comes from; the user can override all of it.
//! These are design aids: rated data of actual components, local codes and a qualified
//! engineer decide.

pub mod autosize;
pub mod catalogue;
pub mod check;
mod check_report;
pub mod design;
pub mod design_rules;
pub mod material;
mod member_checks;
pub mod rope;
pub mod spring;
pub mod sweep;

pub use autosize::{AutoSize, auto_size, auto_size_watched};
pub use catalogue::{Catalogue, Part};
pub use check::{
    CaseOutcome, CheckLine, CheckReport, MemberCheck, Status, check, check_project, check_project_watched, project_catalogue, solve_cases,
    solve_cases_watched,
};
pub use design::{DesignFactors, MemberDesign, SizingDoc, SpringDesign, SpringEnds, StrutSection};
pub use material::SpringMaterial;
pub use rope::{Construction, Core, RopeSpec, minimum_breaking_force_kn};
pub use spring::{SpringProperties, SpringReport, SpringRequirement, design_spring, helical_spring};
pub use sweep::{Output, Param, SweepResult, sweep, sweep_watched};
