//! The live solve: a request to the solver whenever the document, the load case, the held
//! position of a Pull or the selected node changed, and the outcomes taken as they arrive
//! (the force–displacement samples of a Pull recorded from them).

use std::sync::Arc;

use rigwright_core::{Model, Vec3, Warm};

use super::{RigApp, Selection, SolveOutcome, SolveRequest};

#[derive(Clone, PartialEq)]
pub(super) struct RequestKey {
    model: *const Model,
    revision: u64,
    case: usize,
    hold: Option<(usize, [u64; 3])>,
    stiffness_at: Option<usize>,
    follow: bool,
}

impl RigApp {
    /// Index of the selected node in the solved model, if it is in there.
    fn selected_model_node(&self, model: &Model) -> Option<usize> {
        match self.selection {
            Selection::Node(i) => self.doc.project.nodes.get(i).and_then(|n| model.node_index(&n.id)),
            _ => None,
        }
    }

    /// Takes any solver outcome that arrived and sends a new request when the document, the
    /// load case, the held position or the selected node changed.
    pub fn solve_if_needed(&mut self) {
        if let Some(o) = self.solver.poll() {
            self.take_outcome(o);
        }
        let model = self.doc.model.clone();
        if model.nodes.is_empty() || model.cases.is_empty() {
            self.solved = None;
            return;
        }
        let case = self.case.min(model.cases.len() - 1);
        let hold = self
            .pull
            .as_ref()
            .filter(|p| p.active && Arc::ptr_eq(&p.model, &model))
            .map(|p| (p.node, p.target));
        let stiffness_at = self.selected_model_node(&model);
        let key = RequestKey {
            model: Arc::as_ptr(&model),
            revision: self.doc.revision,
            case,
            hold: hold.map(|(n, p)| (n, [p.x.to_bits(), p.y.to_bits(), p.z.to_bits()])),
            stiffness_at,
            follow: self.follow,
        };
        if self.requested.as_ref() == Some(&key) {
            return;
        }
        self.requested = Some(key);
        let warm = self
            .solved
            .as_ref()
            .filter(|s| s.model.nodes.len() == model.nodes.len())
            .and_then(|s| s.result.as_ref().ok())
            .map(Warm::from);
        let request = SolveRequest {
            generation: 0,
            model,
            case,
            warm,
            hold,
            stiffness_at,
            follow: self.follow,
        };
        if let Some(o) = self.solver.submit(request) {
            self.take_outcome(o);
        }
    }

    pub(super) fn take_outcome(&mut self, o: SolveOutcome) {
        if o.generation < self.applied {
            return;
        }
        self.applied = o.generation;
        self.solve_times.push(o.elapsed.as_secs_f64() * 1e3);
        if self.solve_times.len() > 60 {
            self.solve_times.remove(0);
        }
        match o.hold {
            Some((node, at)) => {
                if let Some(p) = self.pull.as_mut().filter(|p| p.node == node && Arc::ptr_eq(&p.model, &o.model)) {
                    match &o.result {
                        Ok(eq) if eq.stability.is_stable() => {
                            let force = eq.hold.as_ref().map(|h| h.force).unwrap_or_else(Vec3::zeros);
                            let f0 = *p.f0.get_or_insert(force);
                            let d = at - p.start;
                            let dist = d.norm();
                            if dist > 0.0 {
                                let dir = d / dist;
                                let measured = (force - f0).dot(&dir);
                                let predicted = p.stiffness.as_ref().map(|k| k.along(&dir) * dist).unwrap_or(f64::NAN);
                                p.samples.push([dist, measured, predicted]);
                            }
                            p.force = Some(force);
                            p.failure = None;
                        }
                        Ok(eq) => {
                            p.force = None;
                            p.failure = Some(eq.stability.describe());
                        }
                        Err(e) => {
                            p.force = None;
                            p.failure = Some(e.clone());
                        }
                    }
                }
                // Keep the held shape as the answer being drawn.
                self.solved = Some(o);
            }
            None => self.solved = Some(o),
        }
    }
}
