//! Solvers: large-displacement static equilibrium and tangent stiffness.
//!
//! [`Statics`] borrows a [`Model`](crate::Model), keeps the sparse pattern and symbolic
//! factorisation for one set of held degrees of freedom, and returns [`Equilibrium`] values.

mod dofs;
pub mod factor;
mod newton;
mod path;
mod relax;
mod result;
pub mod stability;
mod statics;
pub mod system;

pub use path::{CriticalKind, LoadPathTrace, PathCritical, PathPoint};
pub use result::{Equilibrium, Hold, MemberResult, NodeResult, NodeStiffness, Principal, Route, SagResult, Stability, Warm, sig6};
pub use statics::{SolveError, SolveSettings, Statics};
