//! The desktop app: the Rig view, Properties, Readouts, menus and files.
//!
//! Responsible for showing the document and its solved equilibrium and for turning user
//! actions into [`Command`]s, which [`RigApp`] applies once per frame (file I/O happens only
//! there). Not responsible for mechanics: every number comes from `rigwright-core`.
//!
//! This file holds the app's state ([`RigApp`]) and its frame loop; each view has its own
//! module (`rig_view`, `readouts`, `properties`, `menus`, `toolbar`, `status_bar`, …), the
//! commands and their application are in `command.rs`, files in `files.rs`, the live solve
//! in `live_solve.rs`.

mod about;
mod background;
mod command;
mod discard;
mod document;
pub mod export;
mod files;
mod live_solve;
mod menus;
mod modes;
mod palette;
mod path;
mod pluck;
mod properties;
mod pull;
mod readouts;
pub mod recovery;
mod rig_view;
pub mod samples;
mod settings;
mod shortcuts;
pub mod sizing;
mod solver;
mod spring_designer;
mod status_bar;
mod task;
mod tool;
mod toolbar;

use std::path::PathBuf;

use eframe::egui;
use rigwright_core::{Equilibrium, Model, Vec3};

pub use background::hold_jobs_spawned_here;
pub use command::{Command, EditFn};
pub use document::Document;
pub use pull::PullSession;
pub use readouts::ReadoutTab;
pub use recovery::Recovery;
pub use rig_view::RigView;
pub use rigwright_report::plane::Plane;
pub use rigwright_report::units::{Quantity, Units};
pub use settings::Settings;
pub use solver::{SolveOutcome, SolveRequest};
pub use tool::Tool;

use live_solve::RequestKey;
use settings::SETTINGS_KEY;

/// The selected item (indices into the document).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Selection {
    #[default]
    None,
    Node(usize),
    Member(usize),
    /// A point load of the current load case.
    Load(usize),
}

/// The equilibrium to draw, if the last solve gave a usable answer.
pub struct Answer<'a> {
    pub model: &'a Model,
    pub eq: &'a Equilibrium,
}

/// The Rigwright desktop app.
pub struct RigApp {
    pub settings: Settings,
    pub doc: Document,
    /// Current load case (index into the model's cases).
    pub case: usize,
    pub tool: Tool,
    pub selection: Selection,
    pub view: RigView,
    pub readout_tab: ReadoutTab,
    /// The last unheld solve outcome (the answer shown).
    pub solved: Option<SolveOutcome>,
    pub pull: Option<PullSession>,
    /// Nodes caught by a box selection (document indices); Delete removes them all.
    pub boxed: Vec<usize>,
    /// The rig vibrating after a Pull was let go.
    pub pluck: Option<pluck::PluckSession>,
    /// Natural modes of the current answer (computed when the Modes tab is shown).
    pub modes: Option<modes::ModesState>,
    /// Modes of a large rig being computed on another thread.
    pub modes_job: Option<modes::ModesJob>,
    /// A Pluck being prepared on another thread (large rigs).
    pub pluck_job: Option<pluck::PluckJob>,
    /// Auto-size or an export running on another thread (large rigs).
    pub task: Option<task::Task>,
    /// Start a Pluck when a pulled node is let go.
    pub pluck_on_release: bool,
    /// Follow the rig past a limit point or bifurcation to the state it snaps to. Asked for
    /// each session (never saved): by default a critical point is reported, not passed.
    pub follow: bool,
    /// The traced load path (Path tab).
    pub path: Option<path::PathState>,
    /// Checks, Sweep and the spring designer.
    pub sizing: sizing::SizingState,
    /// A message for the status bar: (text, is an error).
    pub message: Option<(String, bool)>,
    pub show_about: bool,
    pub show_help: bool,
    /// Solve times of recent solves (ms), newest last.
    pub solve_times: Vec<f64>,
    /// Autosave of unsaved changes, and the copy offered at start after a crash.
    pub recovery: Recovery,
    commands: Vec<Command>,
    /// A command waiting for "discard unsaved changes?".
    pending_discard: Option<Box<Command>>,
    solver: solver::Solver,
    /// Key of the last request sent, to re-solve only when something changed.
    requested: Option<RequestKey>,
    /// Generation of the last outcome applied.
    applied: u64,
    title: String,
    /// The window may close now (changes saved or discarded).
    close_now: bool,
}

impl RigApp {
    /// Creates the app, restoring settings and reopening the last project.
    pub fn new(cc: &eframe::CreationContext<'_>) -> Self {
        let settings: Settings = cc.storage.and_then(|s| eframe::get_value(s, SETTINGS_KEY)).unwrap_or_default();
        Self::with_settings(&cc.egui_ctx, settings, None)
    }

    /// Creates the app and opens `file` (or the last project when `None`).
    pub fn with_file(cc: &eframe::CreationContext<'_>, file: Option<PathBuf>) -> Self {
        let settings: Settings = cc.storage.and_then(|s| eframe::get_value(s, SETTINGS_KEY)).unwrap_or_default();
        Self::with_settings(&cc.egui_ctx, settings, file)
    }

    /// Creates the app with given settings; `file` overrides the last project. Autosave goes
    /// to the user's data folder ([`recovery::data_dir`]).
    pub fn with_settings(ctx: &egui::Context, settings: Settings, file: Option<PathBuf>) -> Self {
        Self::with_recovery(ctx, settings, file, Recovery::from_env())
    }

    /// [`RigApp::with_settings`] with autosave as given; a recovery copy found there is offered.
    pub fn with_recovery(ctx: &egui::Context, settings: Settings, file: Option<PathBuf>, recovery: Recovery) -> Self {
        ctx.set_visuals(egui::Visuals::light());
        let wake_ctx = ctx.clone();
        let mut app = RigApp {
            settings,
            doc: Document::empty(),
            case: 0,
            tool: Tool::Select,
            selection: Selection::None,
            view: RigView::default(),
            readout_tab: ReadoutTab::Members,
            solved: None,
            pull: None,
            boxed: Vec::new(),
            sizing: sizing::SizingState::default(),
            pluck: None,
            modes: None,
            modes_job: None,
            pluck_job: None,
            task: None,
            pluck_on_release: true,
            follow: false,
            path: None,
            message: None,
            show_about: false,
            show_help: false,
            solve_times: Vec::new(),
            recovery,
            commands: Vec::new(),
            pending_discard: None,
            solver: solver::Solver::new(move || wake_ctx.request_repaint()),
            requested: None,
            applied: 0,
            title: String::new(),
            close_now: false,
        };
        let opened = match file.or_else(|| app.settings.last_file.clone()) {
            Some(path) => app.open_path(&path).is_ok(),
            None => false,
        };
        if !opened {
            let sample = app
                .settings
                .last_sample
                .unwrap_or(samples::DEFAULT_SAMPLE)
                .min(samples::SAMPLES.len() - 1);
            app.open_sample(sample);
        }
        app.solve_if_needed();
        if let Some(notice) = app.recovery.look() {
            app.message = Some((notice, true));
        }
        app
    }

    /// Queues a command (applied at the end of the frame).
    pub fn queue(&mut self, command: Command) {
        self.commands.push(command);
    }

    /// The equilibrium to draw and tabulate: only a converged, stable solve of the current case.
    pub fn answer(&self) -> Option<Answer<'_>> {
        let s = self.solved.as_ref()?;
        let eq = s.result.as_ref().ok()?;
        eq.stability.is_stable().then_some(Answer { model: &s.model, eq })
    }

    /// Why there is no answer, when the last solve gave none.
    pub fn diagnostic(&self) -> Option<String> {
        let s = self.solved.as_ref()?;
        match &s.result {
            Err(e) => Some(format!("No equilibrium — {e}")),
            Ok(eq) if !eq.stability.is_stable() => Some(format!("Not a usable equilibrium — {}", eq.stability.describe())),
            Ok(_) => None,
        }
    }

    /// How the answer shown was reached, when that is not the plain load path (followed past
    /// a limit point, or found from the drawn geometry because the unloaded rig is a
    /// mechanism): one sentence for a banner.
    pub fn route_note(&self) -> Option<String> {
        self.answer()?.eq.route.describe()
    }

    /// Load factor of the critical point that stopped the last solve, if that is why there is
    /// no answer (the Follow choice is then offered).
    pub fn critical(&self) -> Option<f64> {
        self.solved.as_ref()?.critical
    }

    /// Screen position of a model point in the last drawn Rig view (for tests and tools).
    pub fn screen_pos(&self, p: [f64; 3]) -> egui::Pos2 {
        self.view.to_screen(Vec3::new(p[0], p[1], p[2]))
    }

    fn update_title(&mut self, ctx: &egui::Context) {
        let title = format!("{}{} — Rigwright", if self.doc.dirty { "● " } else { "" }, self.doc.name());
        if title != self.title {
            ctx.send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.title = title;
        }
    }

    /// A solve is running on the worker thread.
    pub fn solver_busy(&self) -> bool {
        self.solver.busy
    }

    /// The window title as last set (with the dirty marker).
    pub fn title(&self) -> &str {
        &self.title
    }
}

impl eframe::App for RigApp {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        let ctx = ui.ctx().clone();
        if let Some(o) = self.solver.poll() {
            self.take_outcome(o);
        }
        self.shortcuts(&ctx);
        let wall = f64::from(ctx.input(|i| i.stable_dt));
        if pluck::tick(self, wall) {
            ctx.request_repaint();
        }
        if task::poll(self) {
            ctx.request_repaint_after(std::time::Duration::from_millis(100));
        }
        let dropped: Vec<PathBuf> = ctx.input(|i| {
            i.raw
                .dropped_files
                .iter()
                .map(|f| f.path().to_path_buf())
                .filter(|p| !p.as_os_str().is_empty())
                .collect()
        });
        for path in dropped {
            self.commands.push(Command::Open(path));
        }
        if ctx.input(|i| i.viewport().close_requested()) && !self.close_now && self.doc.dirty {
            ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
            self.commands.push(Command::Close);
        }

        egui::Panel::top("menu").show(ui, |ui| menus::ui(self, ui));
        egui::Panel::top("tools").show(ui, |ui| toolbar::ui(self, ui));
        egui::Panel::bottom("status").show(ui, |ui| status_bar::ui(self, ui));
        egui::Panel::bottom("readouts")
            .resizable(true)
            .default_size(230.0)
            .min_size(120.0)
            .show(ui, |ui| readouts::ui(self, ui));
        egui::Panel::right("properties")
            .resizable(true)
            .default_size(290.0)
            .show(ui, |ui| properties::ui(self, ui));
        egui::CentralPanel::default()
            .frame(egui::Frame::NONE)
            .show(ui, |ui| rig_view::ui(self, ui));

        about::windows(self, &ctx);
        spring_designer::windows(self, &ctx);
        self.discard_prompt(&ctx);
        recovery::offer_modal(self, &ctx);

        let had_commands = !self.commands.is_empty();
        self.apply_commands();
        if had_commands {
            ctx.request_repaint();
        }
        let before = self.applied;
        self.solve_if_needed();
        if self.applied != before {
            ctx.request_repaint();
        }
        recovery::tick(self, &ctx);
        self.update_title(&ctx);
        if self.close_now {
            ctx.send_viewport_cmd(egui::ViewportCommand::Close);
        }
    }

    /// Settings (last project, recent files, units) are small: keep them fresh.
    fn auto_save_interval(&self) -> std::time::Duration {
        std::time::Duration::from_secs(5)
    }

    fn save(&mut self, storage: &mut dyn eframe::Storage) {
        eframe::set_value(storage, SETTINGS_KEY, &self.settings);
    }

    /// A clean exit: the recovery copy goes (or keeps the last changes if any are unsaved).
    fn on_exit(&mut self, _gl: Option<&eframe::glow::Context>) {
        self.recovery.exit(&self.doc);
    }
}

/// Opens the window; `file` is opened instead of the last project when given.
pub fn run(file: Option<PathBuf>) -> eframe::Result {
    let options = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default()
            .with_title("Rigwright")
            .with_inner_size([1280.0, 800.0])
            .with_min_inner_size([800.0, 500.0])
            .with_drag_and_drop(true),
        ..Default::default()
    };
    eframe::run_native("Rigwright", options, Box::new(move |cc| Ok(Box::new(RigApp::with_file(cc, file)))))
}
