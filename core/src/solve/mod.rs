//! Solvers: large-displacement static equilibrium and tangent stiffness.
//!
//! [`Statics`] borrows a [`Model`](crate::Model), keeps the sparse pattern and symbolic
//! factorisation for one set of held degrees of freedom, and returns [`Equilibrium`] values.

mod result;
mod statics;
pub mod system;

pub use result::{Equilibrium, Hold, MemberResult, NodeResult, NodeStiffness, Principal, Stability};
pub use statics::{SolveError, SolveSettings, Statics};
