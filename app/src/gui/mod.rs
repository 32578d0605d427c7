//! The desktop app: Rig view, Properties, Readouts, menus, files.
//!
//! Responsible for showing the document and its solved equilibrium and for turning user
//! actions into [`Command`]s, which [`RigApp`] applies once per frame (file I/O happens only
//! there). Not responsible for mechanics: every number comes from `rigwright-core`.

mod about;
mod background;
mod document;
pub mod export;
mod menus;
mod palette;
mod pluck;
mod properties;
mod readouts;
pub mod recovery;
pub mod samples;
pub mod sizing;
mod solver;
mod task;
mod view;

use std::path::{Path, PathBuf};
use std::sync::Arc;

use eframe::egui;
use rigwright_core::{Equilibrium, Model, NodeStiffness, Project, Vec3};
use serde::{Deserialize, Serialize};

pub use background::hold_jobs_spawned_here;
pub use document::Document;
pub use readouts::ReadoutTab;
pub use recovery::Recovery;
pub use rigwright_report::plane::Plane;
pub use rigwright_report::units::{Quantity, Units};
pub use solver::{SolveOutcome, SolveRequest};
pub use view::RigView;

/// Key of the persisted settings.
const SETTINGS_KEY: &str = "rigwright-settings";
/// Recent files kept.
const RECENT: usize = 8;

/// Settings kept between runs (everything else is runtime state).
#[derive(Debug, Clone, Serialize, Deserialize)]
#[serde(default)]
pub struct Settings {
    pub units: Units,
    /// The last project file open (reopened on start).
    pub last_file: Option<PathBuf>,
    /// Or the last sample open, when it was never saved.
    pub last_sample: Option<usize>,
    pub recent: Vec<PathBuf>,
    /// Snap new and dragged nodes to the grid.
    pub snap: bool,
    /// Force values written beside members and arrows.
    pub force_labels: bool,
    /// Reaction arrows at supports.
    pub reactions: bool,
    /// Faint drawn geometry under the solved shape.
    pub drawn_geometry: bool,
    /// Node ids written beside the nodes.
    pub node_ids: bool,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            units: Units::Si,
            last_file: None,
            last_sample: Some(samples::DEFAULT_SAMPLE),
            recent: Vec::new(),
            snap: true,
            force_labels: true,
            reactions: true,
            drawn_geometry: true,
            node_ids: false,
        }
    }
}

/// What a press on the Rig view does.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Tool {
    Select,
    Pull,
    Anchor,
    Guided,
    Node,
    Cable,
    Spring,
    Strut,
    Load,
}

impl Tool {
    pub const ALL: [Tool; 9] = [
        Tool::Select,
        Tool::Pull,
        Tool::Anchor,
        Tool::Guided,
        Tool::Node,
        Tool::Cable,
        Tool::Spring,
        Tool::Strut,
        Tool::Load,
    ];

    /// Button label.
    pub fn label(self) -> &'static str {
        match self {
            Tool::Select => "Select",
            Tool::Pull => "Pull",
            Tool::Anchor => "Anchor",
            Tool::Guided => "Guided support",
            Tool::Node => "Node",
            Tool::Cable => "Cable",
            Tool::Spring => "Spring",
            Tool::Strut => "Strut",
            Tool::Load => "Point load",
        }
    }

    /// Shortcut key.
    pub fn key(self) -> egui::Key {
        use egui::Key;
        match self {
            Tool::Select => Key::V,
            Tool::Pull => Key::P,
            Tool::Anchor => Key::A,
            Tool::Guided => Key::G,
            Tool::Node => Key::N,
            Tool::Cable => Key::C,
            Tool::Spring => Key::S,
            Tool::Strut => Key::T,
            Tool::Load => Key::L,
        }
    }

    /// Tooltip.
    pub fn tip(self) -> &'static str {
        match self {
            Tool::Select => {
                "Select a node, member or load; drag a node or anchor to move it (the rig re-solves as you drag); drag on empty space to box-select nodes. [V]"
            }
            Tool::Pull => {
                "Pull: grab a free node and hold it at the cursor; the rest re-equilibrates and the restoring force is shown. [P]"
            }
            Tool::Anchor => "Add an anchor: a node held in every direction. Click on the Rig view. [A]",
            Tool::Guided => "Add a guided support: held vertically (y), free to slide along x. Click on the Rig view. [G]",
            Tool::Node => "Add a free node with a 10 kg mass. Click on the Rig view. [N]",
            Tool::Cable => "Add a cable (tension only, goes slack): click its first node, then its second. [C]",
            Tool::Spring => "Add a linear spring (tension and compression): click its first node, then its second. [S]",
            Tool::Strut => "Add a strut (bar in tension and compression): click its first node, then its second. [T]",
            Tool::Load => "Add a point load to the current load case: click a node. [L]",
        }
    }

    /// True for the tools that add a member between two nodes.
    pub fn is_member(self) -> bool {
        matches!(self, Tool::Cable | Tool::Spring | Tool::Strut)
    }
}

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

/// An edit of the document.
pub type EditFn = Box<dyn FnOnce(&mut Project)>;

/// Something the UI asks for; applied once per frame, after all views are drawn.
#[must_use]
pub enum Command {
    New,
    OpenDialog,
    Open(PathBuf),
    OpenSample(usize),
    Save,
    SaveAsDialog,
    /// Save to this path (no dialog).
    SaveTo(PathBuf),
    Undo,
    Redo,
    /// Change the document; edits with the same merge key in a row are one undo step.
    Edit {
        merge: Option<String>,
        apply: EditFn,
    },
    /// End the current merged edit (e.g. at the end of a drag).
    Seal,
    DeleteSelection,
    SetCase(usize),
    SetUnits(Units),
    FitView,
    /// The user confirmed discarding unsaved changes for the pending command.
    Discard,
    /// The user cancelled the pending command.
    KeepEditing,
    /// Let go of the pulled node: start a Pluck from the held shape.
    Pluck,
    /// Close the window (asks first when there are unsaved changes).
    Close,
    /// Write the Sheet, CSV or JSON of the open document (asks where).
    Export(export::ExportKind),
}

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
    pub modes: Option<pluck::ModesState>,
    /// Modes of a large rig being computed on another thread.
    pub modes_job: Option<pluck::ModesJob>,
    /// A Pluck being prepared on another thread (large rigs).
    pub pluck_job: Option<pluck::PluckJob>,
    /// Auto-size or an export running on another thread (large rigs).
    pub task: Option<task::Task>,
    /// Start a Pluck when a pulled node is let go.
    pub pluck_on_release: bool,
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

#[derive(Clone, PartialEq)]
struct RequestKey {
    model: *const Model,
    revision: u64,
    case: usize,
    hold: Option<(usize, [u64; 3])>,
    stiffness_at: Option<usize>,
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

    /// Screen position of a model point in the last drawn Rig view (for tests and tools).
    pub fn screen_pos(&self, p: [f64; 3]) -> egui::Pos2 {
        self.view.to_screen(Vec3::new(p[0], p[1], p[2]))
    }

    /// Index of the selected node in the solved model, if it is in there.
    fn selected_model_node(&self, model: &Model) -> Option<usize> {
        match self.selection {
            Selection::Node(i) => self.doc.project.nodes.get(i).and_then(|n| model.node_index(&n.id)),
            _ => None,
        }
    }

    fn open_sample(&mut self, index: usize) {
        let Some((name, _, text)) = samples::SAMPLES.get(index) else {
            return;
        };
        match Project::from_ron(text)
            .map_err(|e| e.to_string())
            .and_then(|p| Document::open(p, None))
        {
            Ok(doc) => {
                self.replace_document(doc);
                self.settings.last_sample = Some(index);
                self.settings.last_file = None;
                self.message = Some((format!("Opened sample `{name}`"), false));
            }
            Err(e) => self.message = Some((format!("sample {name}: {e}"), true)),
        }
    }

    fn open_path(&mut self, path: &Path) -> Result<(), String> {
        // Absolute, so the next start finds it from any working directory.
        let absolute = std::fs::canonicalize(path).unwrap_or_else(|_| path.to_path_buf());
        let path = absolute.as_path();
        let result = Project::load(path)
            .map_err(|e| e.to_string())
            .and_then(|p| Document::open(p, Some(path.to_path_buf())));
        match result {
            Ok(doc) => {
                self.replace_document(doc);
                self.settings.last_file = Some(path.to_path_buf());
                self.settings.last_sample = None;
                self.remember(path);
                self.message = Some((format!("Opened {}", path.display()), false));
                Ok(())
            }
            Err(e) => {
                let text = format!("Could not open {}: {e}. The current project is unchanged.", path.display());
                self.message = Some((text.clone(), true));
                Err(text)
            }
        }
    }

    fn replace_document(&mut self, doc: Document) {
        self.settings.units = match doc.project.units {
            rigwright_core::model::UnitSystem::SI => self.settings.units,
            rigwright_core::model::UnitSystem::US => Units::Us,
        };
        self.doc = doc;
        self.case = 0;
        self.selection = Selection::None;
        self.pull = None;
        self.solved = None;
        self.requested = None;
        self.view.choose_plane(&self.doc.project);
    }

    fn remember(&mut self, path: &Path) {
        self.settings.recent.retain(|p| p != path);
        self.settings.recent.insert(0, path.to_path_buf());
        self.settings.recent.truncate(RECENT);
    }

    fn save_to(&mut self, path: PathBuf) {
        // Temporary file, sync, backup, rename: a failed or interrupted save never leaves half a file.
        match self.doc.project.save(&path) {
            Ok(()) => {
                self.remember(&path);
                self.settings.last_file = Some(path.clone());
                self.settings.last_sample = None;
                self.message = Some((format!("Saved {}", path.display()), false));
                self.doc.saved(path);
            }
            Err(e) => self.message = Some((format!("Could not save: {e}"), true)),
        }
    }

    fn needs_discard_prompt(command: &Command) -> bool {
        matches!(
            command,
            Command::New | Command::OpenDialog | Command::Open(_) | Command::OpenSample(_) | Command::Close
        )
    }

    /// Applies the queued commands, in order.
    pub fn apply_commands(&mut self) {
        let commands = std::mem::take(&mut self.commands);
        for command in commands {
            if self.doc.dirty && Self::needs_discard_prompt(&command) {
                self.pending_discard = Some(Box::new(command));
                continue;
            }
            self.apply(command);
        }
    }

    fn apply(&mut self, command: Command) {
        match command {
            Command::New => {
                self.replace_document(Document::empty());
                self.settings.last_file = None;
                self.settings.last_sample = None;
            }
            Command::OpenDialog => {
                let picked = rfd::FileDialog::new().add_filter("Rig project", &["ron"]).pick_file();
                if let Some(path) = picked {
                    let _ = self.open_path(&path);
                }
            }
            Command::Open(path) => {
                let _ = self.open_path(&path);
            }
            Command::OpenSample(i) => self.open_sample(i),
            Command::Save => match self.doc.path.clone() {
                Some(p) => self.save_to(p),
                None => self.apply(Command::SaveAsDialog),
            },
            Command::SaveAsDialog => {
                let name = format!("{}{}", file_stem(&self.doc.project.title), rigwright_core::FILE_EXTENSION);
                let picked = rfd::FileDialog::new()
                    .add_filter("Rig project", &["ron"])
                    .set_file_name(name)
                    .save_file();
                if let Some(path) = picked {
                    self.save_to(path);
                }
            }
            Command::SaveTo(path) => self.save_to(path),
            Command::Undo => {
                self.doc.undo();
                self.clamp_selection();
            }
            Command::Redo => {
                self.doc.redo();
                self.clamp_selection();
            }
            Command::Edit { merge, apply } => {
                self.doc.edit(merge.as_deref(), apply);
                self.clamp_selection();
            }
            Command::Seal => self.doc.seal(),
            Command::DeleteSelection => self.delete_selection(),
            Command::SetCase(c) => {
                self.case = c;
                self.pull = None;
            }
            Command::SetUnits(u) => self.settings.units = u,
            Command::FitView => self.view.fit_next = true,
            Command::Discard => {
                if let Some(c) = self.pending_discard.take() {
                    self.doc.dirty = false;
                    self.apply(*c);
                }
            }
            Command::KeepEditing => self.pending_discard = None,
            Command::Close => self.close_now = true,
            Command::Pluck => self.start_pluck(),
            Command::Export(kind) => export::run(self, kind),
        }
    }

    fn clamp_selection(&mut self) {
        let p = &self.doc.project;
        self.boxed.retain(|&i| i < p.nodes.len());
        let ok = match self.selection {
            Selection::None => true,
            Selection::Node(i) => i < p.nodes.len(),
            Selection::Member(i) => i < p.members.len(),
            Selection::Load(i) => p.cases.get(self.case).is_some_and(|c| i < c.loads.len()),
        };
        if !ok {
            self.selection = Selection::None;
        }
        if self.case >= self.doc.model.cases.len() {
            self.case = 0;
        }
    }

    fn delete_selection(&mut self) {
        let case = self.case;
        if !self.boxed.is_empty() {
            let mut ids: Vec<String> = self
                .boxed
                .iter()
                .filter_map(|&i| self.doc.project.nodes.get(i).map(|n| n.id.clone()))
                .collect();
            ids.sort();
            self.boxed.clear();
            self.selection = Selection::None;
            self.doc.edit(None, move |p: &mut Project| {
                let gone = |id: &String| ids.binary_search(id).is_ok();
                p.nodes.retain(|n| !gone(&n.id));
                p.members.retain(|m| !gone(&m.ends.0) && !gone(&m.ends.1));
                for c in &mut p.cases {
                    c.loads.retain(|l| !gone(&l.node));
                }
            });
            self.clamp_selection();
            return;
        }
        let apply: EditFn = match self.selection {
            Selection::None => return,
            Selection::Node(i) => Box::new(move |p: &mut Project| {
                if i >= p.nodes.len() {
                    return;
                }
                let id = p.nodes.remove(i).id;
                p.members.retain(|m| m.ends.0 != id && m.ends.1 != id);
                for c in &mut p.cases {
                    c.loads.retain(|l| l.node != id);
                }
            }),
            Selection::Member(i) => Box::new(move |p: &mut Project| {
                if i < p.members.len() {
                    p.members.remove(i);
                }
            }),
            Selection::Load(i) => Box::new(move |p: &mut Project| {
                if let Some(c) = p.cases.get_mut(case)
                    && i < c.loads.len()
                {
                    c.loads.remove(i);
                }
            }),
        };
        self.selection = Selection::None;
        self.doc.edit(None, apply);
        self.clamp_selection();
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
            .map(|eq| eq.positions());
        let request = SolveRequest {
            generation: 0,
            model,
            case,
            warm,
            hold,
            stiffness_at,
        };
        if let Some(o) = self.solver.submit(request) {
            self.take_outcome(o);
        }
    }

    fn take_outcome(&mut self, o: SolveOutcome) {
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

    /// Starts a Pluck from the held shape of the Pull that was just let go.
    fn start_pluck(&mut self) {
        let Some(pull) = self.pull.as_ref() else { return };
        let Some(held) = self.solved.as_ref().filter(|o| Arc::ptr_eq(&o.model, &pull.model)) else {
            return;
        };
        let Ok(held_eq) = held.result.as_ref() else { return };
        if held_eq.hold.is_none() || !held_eq.stability.is_stable() {
            return;
        }
        let (model, node) = (pull.model.clone(), pull.node);
        let start = held_eq.positions();
        pluck::begin(self, model, start, node);
    }

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

    fn shortcuts(&mut self, ctx: &egui::Context) {
        use egui::{Key, KeyboardShortcut, Modifiers};
        let redo = KeyboardShortcut::new(Modifiers::COMMAND | Modifiers::SHIFT, Key::Z);
        let undo = KeyboardShortcut::new(Modifiers::COMMAND, Key::Z);
        let save_as = KeyboardShortcut::new(Modifiers::COMMAND | Modifiers::SHIFT, Key::S);
        let save = KeyboardShortcut::new(Modifiers::COMMAND, Key::S);
        let open = KeyboardShortcut::new(Modifiers::COMMAND, Key::O);
        let new = KeyboardShortcut::new(Modifiers::COMMAND, Key::N);
        let mut out = Vec::new();
        ctx.input_mut(|i| {
            // Longer combinations first, so Ctrl+Shift+Z is not taken as Ctrl+Z.
            for (s, c) in [(redo, Command::Redo), (undo, Command::Undo)] {
                if i.consume_shortcut(&s) {
                    out.push(c);
                }
            }
            if i.consume_shortcut(&KeyboardShortcut::new(Modifiers::COMMAND, Key::Y)) {
                out.push(Command::Redo);
            }
            if i.consume_shortcut(&save_as) {
                out.push(Command::SaveAsDialog);
            }
            if i.consume_shortcut(&save) {
                out.push(Command::Save);
            }
            if i.consume_shortcut(&open) {
                out.push(Command::OpenDialog);
            }
            if i.consume_shortcut(&new) {
                out.push(Command::New);
            }
        });
        self.commands.extend(out);
        if ctx.egui_wants_keyboard_input() {
            return;
        }
        ctx.input(|i| {
            if i.modifiers.command || i.modifiers.alt {
                return;
            }
            if i.key_pressed(Key::F1) || i.events.iter().any(|e| matches!(e, egui::Event::Text(t) if t == "?")) {
                self.show_help = !self.show_help;
            }
            if i.key_pressed(Key::Escape) {
                self.view.cancel();
                self.tool = Tool::Select;
                self.show_help = false;
            }
            if i.key_pressed(Key::Delete) || i.key_pressed(Key::Backspace) {
                self.commands.push(Command::DeleteSelection);
            }
            if i.key_pressed(Key::F) {
                self.commands.push(Command::FitView);
            }
            for (k, plane) in [(Key::Num1, Plane::Elevation), (Key::Num2, Plane::Side), (Key::Num3, Plane::Plan)] {
                if i.key_pressed(k) {
                    self.view.set_plane(plane);
                }
            }
            if !i.modifiers.shift {
                for t in Tool::ALL {
                    if i.key_pressed(t.key()) {
                        self.tool = t;
                        self.view.cancel();
                    }
                }
            }
        });
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

    fn discard_prompt(&mut self, ctx: &egui::Context) {
        if self.pending_discard.is_none() {
            return;
        }
        let name = self.doc.name();
        let mut out = None;
        egui::Modal::new(egui::Id::unique("discard-prompt")).show(ctx, |ui| {
            ui.heading("Unsaved changes");
            ui.label(format!("`{name}` has changes that are not saved. Discard them?"));
            ui.add_space(8.0);
            ui.horizontal(|ui| {
                if ui.button("Discard changes").clicked() {
                    out = Some(Command::Discard);
                }
                if ui.button("Keep editing").clicked() {
                    out = Some(Command::KeepEditing);
                }
            });
        });
        if let Some(c) = out {
            self.commands.push(c);
        }
    }
}

fn file_stem(title: &str) -> String {
    let s: String = title
        .chars()
        .map(|c| if c.is_alphanumeric() { c.to_ascii_lowercase() } else { '-' })
        .collect();
    let s = s.trim_matches('-').to_string();
    if s.is_empty() { "rig".into() } else { s }
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

        egui::Panel::top("menu").show(ui, |ui| menus::menu_bar(self, ui));
        egui::Panel::top("tools").show(ui, |ui| menus::toolbar(self, ui));
        egui::Panel::bottom("status").show(ui, |ui| menus::status_bar(self, ui));
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
            .show(ui, |ui| view::ui(self, ui));

        about::windows(self, &ctx);
        sizing::windows(self, &ctx);
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
