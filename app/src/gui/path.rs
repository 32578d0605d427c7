//! The traced load path of the Path tab: load factor against one node's displacement, from
//! the unloaded state through limit points (computed by the core, on another thread for a
//! large rig).

use std::sync::Arc;

use rigwright_core::solve::LoadPathTrace;
use rigwright_core::{Model, Statics};

use super::RigApp;
use super::background::{BACKGROUND_DOF, Background, free_dofs, model_key};

/// A path being traced on another thread, keyed by model, case and node.
pub type PathJob = Background<(usize, usize, usize), Result<LoadPathTrace, String>>;

/// The Path tab's state.
pub struct PathState {
    /// Model, case and node the trace belongs to.
    pub key: (usize, usize, usize),
    pub result: Option<Result<LoadPathTrace, String>>,
    pub job: Option<PathJob>,
}

/// Most points of a traced path in the app.
const POINTS: usize = 600;

fn trace(model: &Model, case: usize, node: usize) -> Result<LoadPathTrace, String> {
    Statics::new(model).trace(case, node, 1.0, POINTS).map_err(|e| e.to_string())
}

impl RigApp {
    /// Starts tracing the load path of the current case at `node` (a model index): at once on
    /// a small rig, on another thread on a large one.
    pub fn trace_path(&mut self, node: usize) {
        let model: Arc<Model> = self.doc.model.clone();
        let case = self.case.min(model.cases.len().saturating_sub(1));
        let key = (model_key(&model), case, node);
        if free_dofs(&model) <= BACKGROUND_DOF {
            let result = trace(&model, case, node);
            self.path = Some(PathState {
                key,
                result: Some(result),
                job: None,
            });
            return;
        }
        let job = Background::spawn(key, move |_watch| trace(&model, case, node));
        self.path = Some(PathState {
            key,
            result: None,
            job: Some(job),
        });
    }

    /// Takes a finished trace; drops one that belongs to a rig or case no longer shown.
    pub fn poll_path(&mut self) {
        let key_now = |app: &RigApp, node: usize| (model_key(&app.doc.model), app.case, node);
        let Some(p) = self.path.as_mut() else { return };
        if let Some(job) = &p.job
            && let Some(r) = job.poll()
        {
            p.result = Some(r.and_then(|r| r));
            p.job = None;
        }
        let node = p.key.2;
        if self.path.as_ref().is_some_and(|p| p.key != key_now(self, node)) {
            self.path = None;
        }
    }
}
