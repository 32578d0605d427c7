//! Degrees of freedom: which node directions are free, and their numbers.

use crate::model::Model;

/// Map from (node, axis) to a free degree-of-freedom number.
#[derive(Debug, Clone, PartialEq)]
pub struct DofMap {
    pub dof: Vec<[Option<usize>; 3]>,
    pub count: usize,
    /// (node, axis) of each free DOF, in DOF order.
    owner: Vec<(usize, usize)>,
}

impl DofMap {
    /// Free DOFs of `model`, with the node `held` (if any) treated as fully held.
    pub fn new(model: &Model, held: Option<usize>) -> Self {
        let mut owner = Vec::new();
        let dof = model
            .nodes
            .iter()
            .enumerate()
            .map(|(i, n)| {
                let mut d = [None; 3];
                for (axis, slot) in d.iter_mut().enumerate() {
                    if !n.support.fixed[axis] && held != Some(i) {
                        *slot = Some(owner.len());
                        owner.push((i, axis));
                    }
                }
                d
            })
            .collect();
        DofMap {
            dof,
            count: owner.len(),
            owner,
        }
    }

    /// Every free DOF as (node, axis, dof number), in node order.
    pub fn free(&self) -> impl Iterator<Item = (usize, usize, usize)> + '_ {
        self.owner.iter().enumerate().map(|(k, &(n, a))| (n, a, k))
    }

    /// (node, axis) of free DOF `k`.
    pub fn locate(&self, k: usize) -> (usize, usize) {
        self.owner[k]
    }
}
