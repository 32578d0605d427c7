//! A computation on its own thread, polled once per frame, so the window never waits for it.
//!
//! The work receives a [`Watch`]: it counts its steps there (shown as progress) and stops at
//! its next check once the [`Background`] is cancelled, replaced or dropped, so an abandoned
//! computation does not keep a core busy.

use std::cell::RefCell;
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::mpsc::{Receiver, TryRecvError, channel};
use std::time::{Duration, Instant};

use eframe::egui;
use rigwright_core::{Model, Watch};

/// Above this many nodes, work that solves every load case (checks, Sweeps, auto-size, the
/// Sheet) runs on another thread.
pub const BACKGROUND_NODES: usize = 350;
/// Above this many free DOFs the modes and the preparation of a Pluck run on another thread.
pub const BACKGROUND_DOF: usize = 1000;

/// Free degrees of freedom of `model` (cheap: no sparse analysis, unlike `Statics::new`).
pub fn free_dofs(model: &Model) -> usize {
    rigwright_core::solve::system::DofMap::new(model, None).count
}

/// The key of a model: its address, which changes with every edit.
pub fn model_key(model: &Model) -> usize {
    model as *const Model as usize
}

thread_local! {
    static GATE: RefCell<Option<Arc<AtomicBool>>> = const { RefCell::new(None) };
}

/// Test hook: jobs spawned afterwards from the calling thread wait before they start for as
/// long as `gate` holds `true` (or until cancelled), so a test can press Cancel on a job that
/// is certainly still running and then let the next one go. `None` removes the hook.
pub fn hold_jobs_spawned_here(gate: Option<Arc<AtomicBool>>) {
    GATE.with(|g| *g.borrow_mut() = gate);
}

/// A result being computed on another thread.
pub struct Background<K, T> {
    /// What the result belongs to (e.g. a document revision).
    pub key: K,
    pub started: Instant,
    watch: Watch,
    rx: Receiver<T>,
}

impl<K: PartialEq, T: Send + 'static> Background<K, T> {
    /// Starts `work` on a new thread.
    pub fn spawn(key: K, work: impl FnOnce(Watch) -> T + Send + 'static) -> Self {
        let (tx, rx) = channel();
        let watch = Watch::new();
        let theirs = watch.clone();
        let gate = GATE.with(|g| g.borrow().clone());
        std::thread::spawn(move || {
            if let Some(gate) = gate {
                while gate.load(Ordering::Relaxed) && !theirs.stopped() {
                    std::thread::sleep(Duration::from_millis(2));
                }
            }
            // The receiver may be gone (the result was abandoned); nothing to do then.
            let _ = tx.send(work(theirs));
        });
        Background {
            key,
            started: Instant::now(),
            watch,
            rx,
        }
    }

    /// The result when it is ready; `Some(Err(..))` if the thread died without one.
    pub fn poll(&self) -> Option<Result<T, String>> {
        match self.rx.try_recv() {
            Ok(v) => Some(Ok(v)),
            Err(TryRecvError::Empty) => None,
            Err(TryRecvError::Disconnected) => Some(Err("the computation stopped without a result".into())),
        }
    }

    /// Steps the work has finished (its own unit: load cases, Sweep values, Lanczos blocks).
    pub fn steps_done(&self) -> usize {
        self.watch.done()
    }
}

/// A job's progress `text` with a Cancel button beside it (hover text `hover`); true when
/// Cancel was clicked. Keeps the window repainting so the progress moves.
pub fn progress_row(ui: &mut egui::Ui, text: String, hover: &str) -> bool {
    ui.ctx().request_repaint_after(Duration::from_millis(100));
    ui.horizontal(|ui| {
        ui.label(text);
        ui.button("Cancel").on_hover_text(hover).clicked()
    })
    .inner
}

impl<K, T> Drop for Background<K, T> {
    fn drop(&mut self) {
        self.watch.stop();
    }
}
