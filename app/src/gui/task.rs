//! One-off work started from a menu or a button — auto-size, the Sheet and the exports — that
//! can take long on a large rig. On a small rig it runs at once; on a large one it runs beside
//! the window, shown in the status bar with the time so far and a Cancel button, and its
//! result is applied on the window's thread when it arrives. One task at a time.

use eframe::egui;
use rigwright_core::Watch;

use super::RigApp;
use super::background::{BACKGROUND_NODES, Background};

/// What a finished task does to the app (on the window's thread).
pub type Apply = Box<dyn FnOnce(&mut RigApp) + Send>;

/// A task running on another thread.
pub struct Task {
    /// What it does, as the status bar says it ("Auto-sizing the cables").
    pub what: String,
    job: Background<u64, Apply>,
}

/// Starts `work`: at once on a small rig, else on another thread. Refused (with a message)
/// while another task runs.
pub fn start(app: &mut RigApp, what: &str, work: impl FnOnce(Watch) -> Apply + Send + 'static) {
    if let Some(t) = &app.task {
        app.message = Some((format!("{what}: wait for `{}` to finish, or cancel it", t.what), true));
        return;
    }
    if app.doc.project.nodes.len() <= BACKGROUND_NODES {
        work(Watch::new())(app);
        return;
    }
    app.task = Some(Task {
        what: what.to_string(),
        job: Background::spawn(app.doc.revision, work),
    });
}

/// Applies a finished task; true while one is still running (keep repainting).
pub fn poll(app: &mut RigApp) -> bool {
    let Some(task) = &app.task else { return false };
    let Some(result) = task.job.poll() else { return true };
    let what = app.task.take().map(|t| t.what).unwrap_or_default();
    match result {
        Ok(apply) => apply(app),
        Err(e) => app.message = Some((format!("{what}: {e}"), true)),
    }
    false
}

/// The running task in the status bar, with its Cancel button.
pub fn status(app: &mut RigApp, ui: &mut egui::Ui) {
    let Some(task) = &app.task else { return };
    ui.spinner();
    ui.label(format!("{}… {:.1} s", task.what, task.job.started.elapsed().as_secs_f64()));
    if ui.button("Cancel").on_hover_text("Stop this and change nothing").clicked() {
        let what = app.task.take().map(|t| t.what).unwrap_or_default();
        app.message = Some((format!("{what}: cancelled, nothing changed"), false));
    }
    ui.separator();
}
