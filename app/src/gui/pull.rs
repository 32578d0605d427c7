//! Pull: a free node grabbed on the Rig view and held at the cursor while the rest of the rig
//! re-equilibrates; the session keeps the force–displacement curve and the tangent
//! prediction it is compared with.

use std::sync::Arc;

use rigwright_core::{Model, NodeStiffness, Vec3};

use super::{ReadoutTab, RigApp, solver};

/// A Pull in progress (or the last one, kept for its plot).
pub struct PullSession {
    /// Model the pull runs on.
    pub model: Arc<Model>,
    /// Index of the pulled node in that model.
    pub node: usize,
    pub node_id: String,
    /// Equilibrium position where the pull began (m).
    pub start: Vec3,
    /// Where the node is held now (m).
    pub target: Vec3,
    /// Condensed tangent stiffness at the start (for the linearised prediction).
    pub stiffness: Option<NodeStiffness>,
    /// Holding force at the start (N), ideally zero.
    pub f0: Option<Vec3>,
    /// (displacement from the start in m, holding force along the displacement in N, tangent
    /// prediction in N).
    pub samples: Vec<[f64; 3]>,
    /// Force needed to hold the node at the last solved target (N); the restoring force is its negative.
    pub force: Option<Vec3>,
    /// Why the last held solve failed, if it did.
    pub failure: Option<String>,
    /// The mouse still holds the node.
    pub active: bool,
}

impl RigApp {
    /// Starts a Pull on model node `node` from the current answer.
    pub fn start_pull(&mut self, node: usize) -> bool {
        let Some(a) = self.answer() else { return false };
        if !Arc::ptr_eq(&self.solved.as_ref().expect("answer implies solved").model, &self.doc.model) {
            return false;
        }
        if a.eq.hold.is_some() || node >= a.model.nodes.len() || a.model.has_reaction(node) {
            return false;
        }
        let start = a.eq.nodes[node].position;
        let stiffness = solver::stiffness_now(a.model, a.eq, node);
        self.pull = Some(PullSession {
            model: self.doc.model.clone(),
            node,
            node_id: a.model.nodes[node].id.clone(),
            start,
            target: start,
            stiffness,
            f0: None,
            samples: vec![[0.0, 0.0, 0.0]],
            force: None,
            failure: None,
            active: true,
        });
        self.pluck = None;
        self.pluck_job = None;
        self.readout_tab = ReadoutTab::Pull;
        true
    }
}
