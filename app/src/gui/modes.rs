//! Natural modes about the current equilibrium, computed when the Modes tab asks: at once on
//! a small rig, on another thread on a large one; and the mode being animated.

use rigwright_core::dynamics::{CableLinks, Modes, modes_with};
use rigwright_core::{Statics, Watch};

use super::RigApp;
use super::background::{BACKGROUND_DOF, Background, free_dofs, model_key};

/// Natural modes of the current equilibrium, and the one being animated.
/// Modes being computed on another thread, keyed like [`ModesState`].
pub type ModesJob = Background<(usize, usize), Result<Modes, String>>;

pub struct ModesState {
    /// Which solve the modes belong to (model pointer and case).
    pub key: (usize, usize),
    pub result: Result<Modes, String>,
    pub animate: Option<usize>,
    /// Animation clock (s).
    pub clock: f64,
    /// The computation was cancelled by the user (no result; offer to compute again).
    pub cancelled: bool,
}

/// Computes the modes of the current answer if they are missing or stale: at once for small
/// rigs, on another thread for large ones (the window keeps running meanwhile).
pub fn refresh_modes(app: &mut RigApp) {
    let Some(a) = app.answer() else {
        app.modes = None;
        app.modes_job = None;
        return;
    };
    let key = (model_key(a.model), app.case);
    if app.modes.as_ref().is_some_and(|m| m.key == key) {
        return;
    }
    let done = |result| ModesState {
        key,
        result,
        animate: None,
        clock: 0.0,
        cancelled: false,
    };
    if let Some(job) = app.modes_job.as_ref().filter(|j| j.key == key) {
        if let Some(r) = job.poll() {
            app.modes = Some(done(r.and_then(|r| r)));
            app.modes_job = None;
        }
        return;
    }
    let links = app.settings.cable_links.map_or(CableLinks::Auto, CableLinks::Each);
    if free_dofs(a.model) <= BACKGROUND_DOF {
        let result = modes_with(&Statics::new(a.model), a.eq, 12, links, &Watch::new()).map_err(|e| e.to_string());
        app.modes = Some(done(result));
        return;
    }
    let (Some(model), eq) = (app.solved.as_ref().map(|s| s.model.clone()), a.eq.clone()) else {
        return;
    };
    app.modes = None;
    app.modes_job = Some(Background::spawn(key, move |watch| {
        let statics = Statics::new(&model);
        modes_with(&statics, &eq, 12, links, &watch).map_err(|e| e.to_string())
    }));
}
