//! Sizing in the app: the state the Checks and Sweep tabs, the design part of a member's
//! properties and the spring designer share, and the sizing actions (auto-size, importing
//! parts, what a Sweep can vary).
//!
//! Responsible for keeping the core's check report and the Sweep's set-up between frames and
//! for running auto-size. The checks themselves live in `rigwright_core::sizing`; the views
//! are `readouts/checks.rs`, `readouts/sweep.rs`, `properties/design.rs` and
//! `spring_designer.rs`.

use eframe::egui::RichText;
use rigwright_core::Project;
use rigwright_core::sizing::{
    AutoSize, Catalogue, CheckReport, Param, SpringRequirement, Status, SweepResult, auto_size_watched, project_catalogue,
};

use super::background::Background;
use super::palette as pal;
use super::{Command, RigApp};

/// Sizing state kept between frames.
#[derive(Default)]
pub struct SizingState {
    /// The last check report and the document revision it belongs to.
    pub(super) report: Option<(u64, Result<CheckReport, String>)>,
    /// Checks of a large rig running on another thread, keyed by document revision.
    pub(super) job: Option<Background<u64, Result<CheckReport, String>>>,
    /// The document revision whose checks the user cancelled (not restarted until asked).
    pub(super) cancelled: Option<u64>,
    /// The spring designer, when open.
    pub designer: Option<Designer>,
    pub sweep: SweepPanel,
    /// Filter text of the part chooser.
    pub(super) part_filter: String,
    /// Auto-size chooses only among part ids containing this text.
    pub autosize_only: String,
    /// List the members in the project's order instead of failing first, then by utilisation.
    pub project_order: bool,
}

impl SizingState {
    /// The last check report, if it ran and succeeded.
    pub fn report(&self) -> Option<&CheckReport> {
        self.report.as_ref().and_then(|(_, r)| r.as_ref().ok())
    }

    /// True while checks run on another thread.
    pub fn checking(&self) -> bool {
        self.job.is_some()
    }

    /// Whether a Sweep is running on another thread.
    pub fn sweeping(&self) -> bool {
        self.sweep.job.is_some()
    }

    /// What the Sweep varies and over which range (SI), as set up in its panel.
    pub fn sweep_setup(&self) -> (&str, f64, f64) {
        (&self.sweep.param, self.sweep.from, self.sweep.to)
    }

    /// The last Sweep's result, if one finished.
    pub fn sweep_result(&self) -> Option<&Result<SweepResult, String>> {
        self.sweep.result.as_ref()
    }
}

/// The spring designer window.
pub struct Designer {
    /// Member (document index) the design is for.
    pub(super) member: usize,
    pub(super) member_id: String,
    pub(super) req: SpringRequirement,
}

/// A Sweep running on another thread, keyed by document revision.
type SweepJob = Background<u64, Result<SweepResult, String>>;

/// The Sweep readout's inputs and last result.
pub struct SweepPanel {
    pub(super) param: String,
    pub(super) from: f64,
    pub(super) to: f64,
    pub(super) steps: usize,
    /// Outputs, one per line as typed.
    pub(super) outputs: String,
    /// Which output the plot shows.
    pub(super) shown: usize,
    pub(super) result: Option<Result<SweepResult, String>>,
    /// A Sweep of a large rig running on another thread, keyed by document revision, and the
    /// number of values it takes.
    pub(super) job: Option<(SweepJob, usize)>,
}

impl Default for SweepPanel {
    fn default() -> Self {
        SweepPanel {
            param: String::new(),
            from: 0.0,
            to: 1.0,
            steps: 11,
            outputs: "peak-tension\npeak-utilisation\nlowest-frequency".into(),
            shown: 0,
            result: None,
            job: None,
        }
    }
}

/// The status as shown: a mark and a word, coloured as a second cue only.
pub fn status_text(s: Status) -> RichText {
    let colour = match s {
        Status::Pass => pal::OK,
        Status::Near => pal::WARN,
        Status::Fail => pal::ALARM,
        Status::NotChecked => pal::MUTED,
    };
    let text = RichText::new(s.word()).color(colour);
    if s == Status::Fail { text.strong() } else { text }
}

pub(super) fn catalogue(p: &Project) -> Catalogue {
    project_catalogue(p, &Catalogue::default())
}

/// Copies the parts of a catalogue file into the project (one undo step); a part with an id
/// already in the project replaces it.
pub fn import_parts(app: &mut RigApp, path: &std::path::Path) {
    match Catalogue::load(path) {
        Ok(c) => {
            let parts = c.parts().to_vec();
            let n = parts.len();
            app.queue(Command::Edit {
                merge: None,
                apply: Box::new(move |p| {
                    for part in parts {
                        match p.sizing.parts.iter_mut().find(|q| q.id == part.id) {
                            Some(q) => *q = part,
                            None => p.sizing.parts.push(part),
                        }
                    }
                }),
            });
            app.message = Some((format!("Imported {n} part(s) from {}", path.display()), false));
        }
        Err(e) => app.message = Some((format!("{}: {e}", path.display()), true)),
    }
}

pub(super) fn autosize(app: &mut RigApp) {
    let p = app.doc.project.clone();
    let only = app.sizing.autosize_only.trim().to_string();
    let parts = Catalogue::of(catalogue(&p).parts().iter().filter(|q| q.id.contains(&only)).cloned().collect());
    if parts.parts().is_empty() {
        app.message = Some((format!("Auto-size: no part id contains `{only}`"), true));
        return;
    }
    let revision = app.doc.revision;
    super::task::start(app, "Auto-sizing the cables", move |watch| {
        let result = auto_size_watched(&p, &parts, &[], 20, &watch);
        Box::new(move |app: &mut RigApp| apply_autosize(app, revision, result))
    });
}

/// Takes an auto-size result into the document as one undo step, unless the rig was edited
/// while it ran.
fn apply_autosize(app: &mut RigApp, revision: u64, result: Result<AutoSize, rigwright_core::ProjectError>) {
    if app.doc.revision != revision {
        app.message = Some((
            "Auto-size: the rig was edited while it ran, so its choice was not applied; run it again".into(),
            true,
        ));
        return;
    }
    match result {
        Ok(a) => {
            let mut msg = format!(
                "Auto-size: {} round(s), {}; {} cable(s) sized",
                a.iterations,
                if a.converged { "choice stable" } else { "choice NOT stable" },
                a.choices.len()
            );
            let failed = !a.failures.is_empty() || !a.converged;
            for (m, why) in &a.failures {
                msg.push_str(&format!("; {m}: {why}"));
            }
            let sized = a.project;
            app.queue(Command::Edit {
                merge: None,
                apply: Box::new(move |d| *d = sized),
            });
            app.message = Some((msg, failed));
        }
        Err(e) => app.message = Some((format!("Auto-size could not run: {e}"), true)),
    }
}

/// Most entries listed per group in the Sweep's Choose menu.
pub(super) const CHOICES_PER_GROUP: usize = 100;

/// What the Sweep can vary on this rig, by group (members, nodes, loads), each a parameter
/// as typed; only those the rig has.
pub fn sweep_choices(p: &Project) -> Vec<(&'static str, Vec<String>)> {
    let valid = |text: String| text.parse::<Param>().ok().and_then(|q| q.current(p)).map(|_| text);
    let members = p
        .members
        .iter()
        .flat_map(|m| ["pretension", "rate", "ea"].map(|what| format!("member:{}:{what}", m.id)))
        .filter_map(valid)
        .take(CHOICES_PER_GROUP)
        .collect();
    let nodes = p
        .nodes
        .iter()
        .flat_map(|n| ["mass", "x", "y", "z"].map(|what| format!("node:{}:{what}", n.id)))
        .filter(|t| !(p.planar && t.ends_with(":z")))
        .filter_map(valid)
        .take(CHOICES_PER_GROUP)
        .collect();
    let loads = p
        .cases
        .iter()
        .flat_map(|c| {
            c.loads
                .iter()
                .flat_map(move |l| ["x", "y", "z"].map(|a| format!("load:{}:{}:{a}", c.name, l.node)))
        })
        .filter(|t| !(p.planar && t.ends_with(":z")))
        .filter_map(valid)
        .take(CHOICES_PER_GROUP)
        .collect();
    let mut groups: Vec<(&'static str, Vec<String>)> = vec![
        ("Member properties", members),
        ("Node mass and position", nodes),
        ("Point loads", loads),
    ];
    for (_, items) in &mut groups {
        // Two loads on one node in one case are one entry.
        let mut seen = std::collections::HashSet::new();
        items.retain(|t| seen.insert(t.clone()));
    }
    groups
}
