//! The rig as the solvers see it, and the project file it comes from.
//!
//! [`Project`] mirrors the `.rig.ron` file as stored (ids as strings, rest lengths as the
//! user gave them). [`Project::validate`] checks it and builds a [`Model`]: indices instead of
//! ids, every unstressed length resolved, every free degree of freedom known. Nothing here
//! solves anything.

mod error;
mod project;
mod save;
mod title_block;
mod validate;
mod validated;

pub use error::{Problem, ProjectError};
pub use project::{CaseDoc, FILE_EXTENSION, FORMAT_VERSION, LoadDoc, MemberDoc, MemberDocKind, NodeDoc, Project, Rest, UnitSystem};
pub use save::{BACKUP_SUFFIX, backup_path, same_file, save_atomic, write_atomic};
pub use title_block::SheetInfo;
pub use validated::{LoadCase, Member, Model, Node, Support};

/// 3-vector of f64 (m, N or m/s² depending on use).
pub type Vec3 = nalgebra::Vector3<f64>;

/// A coordinate direction.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Axis {
    X,
    Y,
    Z,
}

impl Axis {
    /// All three, in order.
    pub const ALL: [Axis; 3] = [Axis::X, Axis::Y, Axis::Z];

    /// 0, 1 or 2.
    pub fn index(self) -> usize {
        match self {
            Axis::X => 0,
            Axis::Y => 1,
            Axis::Z => 2,
        }
    }

    /// "x", "y" or "z".
    pub fn name(self) -> &'static str {
        ["x", "y", "z"][self.index()]
    }
}
