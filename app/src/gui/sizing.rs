//! Sizing in the app: the Checks and Sweep readouts, the design part of a member's
//! properties, and the spring designer window.
//!
//! Responsible for showing the core's check report (status in words, never by colour alone),
//! turning design choices into [`Command::Edit`]s, and running auto-size and Sweep. The checks
//! themselves live in `rigwright_core::sizing`.

use eframe::egui::{self, DragValue, RichText};
use egui_plot::{Line, Plot, PlotPoints, Points};
use rigwright_core::Project;
use rigwright_core::Watch;
use rigwright_core::element::MemberClass;
use rigwright_core::model::MemberDocKind;
use rigwright_core::sizing::autosize::{assign_part, assign_spring};
use rigwright_core::sizing::{
    AutoSize, Catalogue, CheckReport, DesignFactors, MemberDesign, Output, Param, SpringDesign, SpringEnds, SpringMaterial,
    SpringRequirement, Status, StrutSection, SweepResult, auto_size_watched, check_project_watched, design_spring, project_catalogue,
    sweep_watched,
};

use super::background::{BACKGROUND_NODES, Background, progress_row};
use super::command::edit;
use super::palette as pal;
use super::{Command, RigApp, Selection};
use rigwright_report::units::{Quantity, significant};

/// Sizing state kept between frames.
#[derive(Default)]
pub struct SizingState {
    /// The last check report and the document revision it belongs to.
    report: Option<(u64, Result<CheckReport, String>)>,
    /// Checks of a large rig running on another thread, keyed by document revision.
    job: Option<Background<u64, Result<CheckReport, String>>>,
    /// The document revision whose checks the user cancelled (not restarted until asked).
    cancelled: Option<u64>,
    /// The spring designer, when open.
    pub designer: Option<Designer>,
    pub sweep: SweepPanel,
    /// Filter text of the part chooser.
    part_filter: String,
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
    member: usize,
    member_id: String,
    req: SpringRequirement,
}

/// A Sweep running on another thread, keyed by document revision.
type SweepJob = Background<u64, Result<SweepResult, String>>;

/// The Sweep readout's inputs and last result.
pub struct SweepPanel {
    param: String,
    from: f64,
    to: f64,
    steps: usize,
    /// Outputs, one per line as typed.
    outputs: String,
    /// Which output the plot shows.
    shown: usize,
    result: Option<Result<SweepResult, String>>,
    /// A Sweep of a large rig running on another thread, keyed by document revision, and the
    /// number of values it takes.
    job: Option<(SweepJob, usize)>,
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

fn catalogue(p: &Project) -> Catalogue {
    project_catalogue(p, &Catalogue::default())
}

/// The Checks readout.
pub fn checks_ui(app: &mut RigApp, ui: &mut egui::Ui) {
    let units = app.settings.units;
    settings_row(app, ui);
    ui.separator();
    let revision = app.doc.revision;
    let stale = app.sizing.report.as_ref().is_none_or(|(r, _)| *r != revision);
    if app.doc.problems.is_some() {
        ui.label(RichText::new("The rig as edited cannot be solved; fix the problems listed in Properties.").color(pal::ALARM));
        return;
    }
    if stale && app.sizing.cancelled == Some(revision) {
        ui.horizontal(|ui| {
            ui.label("The checks of this large rig were cancelled.");
            if ui
                .button("Check now")
                .on_hover_text("Solve every load case and check every member")
                .clicked()
            {
                app.sizing.cancelled = None;
            }
        });
        return;
    }
    if stale {
        let project = app.doc.project.clone();
        let run = move |watch: Watch| check_project_watched(&project, &catalogue(&project), &watch).map_err(|e| e.to_string());
        if app.doc.project.nodes.len() <= BACKGROUND_NODES {
            app.sizing.report = Some((revision, run(Watch::new())));
            app.sizing.job = None;
        } else {
            if app.sizing.job.as_ref().is_none_or(|j| j.key != revision) {
                app.sizing.job = Some(Background::spawn(revision, run));
            }
            let job = app.sizing.job.as_ref().expect("just set");
            match job.poll() {
                Some(r) => {
                    app.sizing.report = Some((revision, r.and_then(|r| r)));
                    app.sizing.job = None;
                }
                None => {
                    let text = format!(
                        "Checking every member in every load case of this large rig… {:.1} s, {} of {} cases solved (the window stays usable)",
                        job.started.elapsed().as_secs_f64(),
                        job.steps_done(),
                        app.doc.project.cases.len()
                    );
                    if progress_row(ui, text, "Stop the checks") {
                        app.sizing.job = None;
                        app.sizing.cancelled = Some(revision);
                    }
                    return;
                }
            }
        }
    }
    let Some((_, result)) = &app.sizing.report else { return };
    let report = match result {
        Ok(r) => r.clone(),
        Err(e) => {
            ui.label(RichText::new(format!("The checks could not run: {e}")).color(pal::ALARM));
            return;
        }
    };
    ui.horizontal_wrapped(|ui| {
        let verdict = if !report.passes() {
            RichText::new("NOT ALL CHECKS PASS").strong().color(pal::ALARM)
        } else if report.count(Status::NotChecked) > 0 {
            RichText::new("No check fails; some members have nothing to check against").strong()
        } else {
            RichText::new("All checks pass").strong().color(pal::OK)
        };
        ui.label(verdict);
        ui.label(format!(
            "— {} pass, {} near limit, {} fail, {} not checked; near limit above {:.1} %",
            report.count(Status::Pass),
            report.count(Status::Near),
            report.count(Status::Fail),
            report.count(Status::NotChecked),
            report.near_limit * 100.0
        ));
        ui.checkbox(&mut app.sizing.project_order, "project order")
            .on_hover_text("List the members as in the project instead of failing first, then by utilisation");
    });
    for c in &report.cases {
        if let Some(e) = &c.error {
            ui.label(RichText::new(format!("Load case `{}`: NO VALID EQUILIBRIUM, nothing checked in it — {e}", c.name)).color(pal::ALARM));
        }
    }
    let f = units.symbol(Quantity::Force);
    egui::ScrollArea::both().auto_shrink([false, false]).show(ui, |ui| {
        egui::Grid::new("checks-table").striped(true).spacing([14.0, 4.0]).show(ui, |ui| {
            for h in [
                "member".to_string(),
                "status".into(),
                "utilisation".into(),
                "governing check".into(),
                format!("min force ({f}) [case]"),
                format!("max force ({f}) [case]"),
                "capacity".into(),
                "DF".into(),
                "class".into(),
                "made of".into(),
            ] {
                ui.label(RichText::new(h).strong());
            }
            ui.end_row();
            let order: Vec<usize> = if app.sizing.project_order {
                (0..report.members.len()).collect()
            } else {
                report.members_by_concern()
            };
            for m in order.into_iter().map(|i| &report.members[i]) {
                if ui.link(&m.id).on_hover_text("Select this member").clicked()
                    && let Some(i) = app.doc.project.members.iter().position(|d| d.id == m.id)
                {
                    app.selection = Selection::Member(i);
                }
                ui.label(status_text(m.status));
                // The governing check's own utilisation (a failing slack check has none).
                ui.label(
                    m.governing_line()
                        .and_then(|l| l.utilisation)
                        .map_or("—".to_string(), |u| format!("{:.1} %", u * 100.0)),
                );
                let gov = match m.governing_line() {
                    Some(l) if l.case.is_empty() => l.check.to_string(),
                    Some(l) => format!("{} in “{}”", l.check, l.case),
                    None => m.notes.first().cloned().unwrap_or_default(),
                };
                let r = ui.label(gov);
                let mut tip = String::new();
                for l in &m.lines {
                    tip.push_str(&format!(
                        "{}{}: {} — {}\n",
                        l.check,
                        if l.case.is_empty() {
                            String::new()
                        } else {
                            format!(" in “{}”", l.case)
                        },
                        l.utilisation
                            .map_or(l.status.word().to_string(), |u| format!("utilisation {:.1} %", u * 100.0)),
                        l.note
                    ));
                }
                for n in &m.notes {
                    tip.push_str(&format!("note: {n}\n"));
                }
                if !tip.is_empty() {
                    r.on_hover_text(tip.trim_end());
                }
                let env = |v: &Option<(f64, String)>| {
                    v.as_ref().map_or("—".to_string(), |(x, c)| {
                        format!("{} [“{c}”]", significant(units.to_display(Quantity::Force, *x), 4))
                    })
                };
                ui.label(env(&m.force_min));
                ui.label(env(&m.force_max));
                ui.label(m.capacity.as_ref().map_or("—".to_string(), |c| {
                    let q = if c.unit == "Pa" { Quantity::Stress } else { Quantity::Force };
                    format!("{} ({})", units.show(q, c.value), c.what)
                }));
                ui.label(format!("{}", m.design_factor));
                ui.label(m.class.name());
                ui.label(m.made_of.as_deref().unwrap_or("—"));
                ui.end_row();
            }
        });
        ui.add_space(6.0);
        ui.label(RichText::new(rigwright_core::CAUTION).small().weak());
    });
}

/// Design factors and limits, editable, with where each default comes from.
fn settings_row(app: &mut RigApp, ui: &mut egui::Ui) {
    let s = app.doc.project.sizing.clone();
    ui.horizontal_wrapped(|ui| {
        for class in [MemberClass::Cable, MemberClass::Spring, MemberClass::Strut] {
            let mut v = s.design_factors.of(class);
            let r = ui
                .add(DragValue::new(&mut v).range(1.0..=50.0).speed(0.05).prefix(format!("DF {} ", class.name())))
                .on_hover_text(format!(
                    "Design factor on the {} capacity. Default {}: {}",
                    class.name(),
                    DesignFactors::default().of(class),
                    DesignFactors::source(class)
                ));
            if r.changed() {
                edit(app, format!("df-{}", class.name()), move |p| match class {
                    MemberClass::Cable => p.sizing.design_factors.cable = v,
                    MemberClass::Spring => p.sizing.design_factors.spring = v,
                    MemberClass::Strut => p.sizing.design_factors.strut = v,
                });
            }
        }
        ui.label(RichText::new("defaults: common practice (hover for sources)").small().weak());
        let mut e = s.termination_efficiency;
        if ui
            .add(DragValue::new(&mut e).range(0.1..=1.0).speed(0.005).prefix("termination efficiency "))
            .on_hover_text("Used where a cable gives none. Default 0.8: wire rope grips (common practice); swaged sockets 1.0, ferrule-secured eyes about 0.9")
            .changed()
        {
            edit(app, "termination".into(), move |p| p.sizing.termination_efficiency = e);
        }
        let mut near = s.near_limit;
        if ui
            .add(DragValue::new(&mut near).range(0.5..=1.0).speed(0.005).prefix("near limit above "))
            .on_hover_text("Utilisation above which a passing member is marked near limit")
            .changed()
        {
            edit(app, "near-limit".into(), move |p| p.sizing.near_limit = near);
        }
        if ui
            .button("Import parts…")
            .on_hover_text("Copy the parts of a catalogue file (*.parts.ron) into this project")
            .clicked()
            && let Some(path) = rfd::FileDialog::new().add_filter("Rigwright parts", &["ron"]).pick_file()
        {
            import_parts(app, &path);
        }
        let name = ui.label("from parts matching").id;
        ui.add(
            egui::TextEdit::singleline(&mut app.sizing.autosize_only)
                .hint_text("any, or e.g. 6x19-IWRC")
                .desired_width(110.0),
        )
        .labelled_by(name);
        if ui
            .button("Auto-size cables")
            .on_hover_text("Choose the lightest catalogue part for every cable that passes every load case, re-solving until the choice is stable")
            .clicked()
        {
            autosize(app);
        }
    });
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

fn autosize(app: &mut RigApp) {
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

/// The design part of a member's properties.
pub fn member_design(app: &mut RigApp, ui: &mut egui::Ui, i: usize) {
    let units = app.settings.units;
    let Some(m) = app.doc.project.members.get(i).cloned() else { return };
    let design = m.design.clone().unwrap_or_default();
    ui.add_space(8.0);
    ui.label(RichText::new("Design").strong());
    let member_id = m.id.clone();
    let set = move |app: &mut RigApp, key: &str, f: Box<dyn FnOnce(&mut MemberDesign)>| {
        let id = member_id.clone();
        edit(app, format!("design-{key}-{i}"), move |p| {
            // Found by id when the edit runs: the member may have gone since.
            let Some(m) = p.members.iter_mut().find(|m| m.id == id) else {
                return;
            };
            let d = m.design.get_or_insert_with(MemberDesign::default);
            f(d);
            if d.is_empty() {
                m.design = None;
            }
        });
    };
    match m.kind {
        MemberDocKind::Cable { .. } => {
            let cat = catalogue(&app.doc.project);
            let current = design.part.as_deref().and_then(|id| cat.find(id)).cloned();
            ui.horizontal(|ui| {
                let name = ui.label("Part").id;
                let shown = current.as_ref().map_or("choose…".to_string(), |p| p.id.clone());
                egui::ComboBox::from_id_salt("part-chooser")
                    .selected_text(shown)
                    .width(190.0)
                    .show_ui(ui, |ui| {
                        let filter_name = ui.label("filter").id;
                        ui.add(egui::TextEdit::singleline(&mut app.sizing.part_filter).hint_text("e.g. 6x19 or IWRC-10"))
                            .labelled_by(filter_name);
                        let filter = app.sizing.part_filter.clone();
                        for part in cat
                            .by_weight()
                            .into_iter()
                            .filter(|p| filter.is_empty() || p.id.contains(&filter) || p.description.contains(&filter))
                            .take(150)
                        {
                            let label = format!(
                                "{}  ({}, {})",
                                part.id,
                                units.show(Quantity::Force, part.breaking_force),
                                part.description
                            );
                            if ui
                                .selectable_label(current.as_ref().is_some_and(|c| c.id == part.id), label)
                                .clicked()
                            {
                                let part = part.clone();
                                let id = m.id.clone();
                                edit(app, format!("part-{i}"), move |p| {
                                    let _ = assign_part(p, &id, &part);
                                });
                            }
                        }
                    })
                    .response
                    .labelled_by(name);
            });
            match &current {
                Some(p) => {
                    ui.label(format!(
                        "F_min {}, EA {}, {}",
                        units.show(Quantity::Force, p.breaking_force),
                        units.show(Quantity::Force, p.ea),
                        units.show(Quantity::MassPerLength, p.mass_per_length)
                    ));
                    if !p.source.is_empty() {
                        ui.label(RichText::new(&p.source).small().weak());
                    }
                }
                None => {
                    if let Some(id) = &design.part {
                        ui.label(RichText::new(format!("`{id}` is not in the catalogue")).color(pal::ALARM));
                    }
                    let mut has = design.breaking_force.is_some();
                    if ui.checkbox(&mut has, "breaking force given by hand").changed() {
                        set(app, "bf", Box::new(move |d| d.breaking_force = has.then_some(10_000.0)));
                    }
                    if let Some(bf) = design.breaking_force {
                        let mut v = units.to_display(Quantity::Force, bf);
                        ui.horizontal(|ui| {
                            let name = ui.label("Minimum breaking force").id;
                            if ui
                                .add(DragValue::new(&mut v).speed(bf.abs() * 0.002 + 1.0))
                                .labelled_by(name)
                                .changed()
                                && v > 0.0
                            {
                                let si = units.to_si(Quantity::Force, v);
                                set(app, "bf", Box::new(move |d| d.breaking_force = Some(si)));
                            }
                            ui.label(units.symbol(Quantity::Force));
                        });
                    }
                }
            }
            let default_eff = app.doc.project.sizing.termination_efficiency;
            let mut own = design.termination_efficiency.is_some();
            let mut eff = design.termination_efficiency.unwrap_or(default_eff);
            ui.horizontal(|ui| {
                let c = ui.checkbox(&mut own, "own termination efficiency");
                let v = ui
                    .add_enabled(own, DragValue::new(&mut eff).range(0.1..=1.0).speed(0.005))
                    .labelled_by(c.id)
                    .changed();
                if c.changed() || v {
                    set(app, "eff", Box::new(move |d| d.termination_efficiency = own.then_some(eff)));
                }
            });
            let mut slack = design.may_slacken;
            if ui
                .checkbox(&mut slack, "may go slack (safety or check cable)")
                .on_hover_text("Skip the slack check for this cable")
                .changed()
            {
                set(app, "slack", Box::new(move |d| d.may_slacken = slack));
            }
        }
        MemberDocKind::Spring { rate, .. } => {
            match &design.spring {
                Some(s) => {
                    ui.label(format!(
                        "{}, d {} mm, D {} mm, {} active coils, {} ends, free length {:.1} mm",
                        s.material.name(),
                        s.wire_mm,
                        s.mean_mm,
                        s.active_coils,
                        s.ends.name(),
                        s.free_length_mm
                    ));
                }
                None => {
                    ui.label("No spring design: the stress and solid-length checks need one.");
                }
            }
            if ui.button("Spring designer…").clicked() {
                let force = max_force(app, &m.id).unwrap_or(rate * 0.05).abs().max(1.0);
                app.sizing.designer = Some(Designer {
                    member: i,
                    member_id: m.id.clone(),
                    req: SpringRequirement {
                        rate,
                        max_force: force,
                        material: design.spring.map_or(SpringMaterial::OilTempered, |s| s.material),
                        ends: design.spring.map_or(SpringEnds::SquaredGround, |s| s.ends),
                        max_outside_mm: None,
                        min_inside_mm: None,
                        max_free_length_mm: None,
                        design_factor: app.doc.project.sizing.design_factors.spring,
                        buckling_alpha: design.spring.map_or(1.0, |s| s.buckling_alpha),
                    },
                });
            }
        }
        MemberDocKind::Strut { .. } => {
            let mut has = design.section.is_some();
            if ui.checkbox(&mut has, "section for the buckling check").changed() {
                set(
                    app,
                    "section",
                    Box::new(move |d| {
                        d.section = has.then_some(StrutSection {
                            modulus: 210e9,
                            second_moment: 1e-6,
                            length_factor: 1.0,
                            capacity: None,
                        })
                    }),
                );
            }
            if let Some(sec) = design.section {
                egui::Grid::new("section").num_columns(3).show(ui, |ui| {
                    let mut e = units.to_display(Quantity::Stress, sec.modulus);
                    let name = ui.label("Young's modulus E").id;
                    if ui.add(DragValue::new(&mut e).speed(100.0)).labelled_by(name).changed() && e > 0.0 {
                        let si = units.to_si(Quantity::Stress, e);
                        set(
                            app,
                            "E",
                            Box::new(move |d| {
                                if let Some(sec) = d.section.as_mut() {
                                    sec.modulus = si;
                                }
                            }),
                        );
                    }
                    ui.label(units.symbol(Quantity::Stress));
                    ui.end_row();
                    let mut i4 = sec.second_moment * 1e8;
                    let name = ui.label("second moment I").id;
                    if ui.add(DragValue::new(&mut i4).speed(0.5)).labelled_by(name).changed() && i4 > 0.0 {
                        set(
                            app,
                            "I",
                            Box::new(move |d| {
                                if let Some(sec) = d.section.as_mut() {
                                    sec.second_moment = i4 * 1e-8;
                                }
                            }),
                        );
                    }
                    ui.label("cm⁴");
                    ui.end_row();
                    let mut k = sec.length_factor;
                    let name = ui.label("effective-length factor K").id;
                    if ui
                        .add(DragValue::new(&mut k).range(0.5..=2.5).speed(0.01))
                        .labelled_by(name)
                        .changed()
                    {
                        set(
                            app,
                            "K",
                            Box::new(move |d| {
                                if let Some(sec) = d.section.as_mut() {
                                    sec.length_factor = k;
                                }
                            }),
                        );
                    }
                    ui.label("(1 pinned–pinned)");
                    ui.end_row();
                });
            }
        }
    }
    let class_df = app.doc.project.sizing.design_factors.of(match m.kind {
        MemberDocKind::Cable { .. } => MemberClass::Cable,
        MemberDocKind::Spring { .. } => MemberClass::Spring,
        MemberDocKind::Strut { .. } => MemberClass::Strut,
    });
    let mut own = design.design_factor.is_some();
    let mut df = design.design_factor.unwrap_or(class_df);
    ui.horizontal(|ui| {
        let c = ui.checkbox(&mut own, "own design factor");
        let v = ui
            .add_enabled(own, DragValue::new(&mut df).range(1.0..=50.0).speed(0.05))
            .labelled_by(c.id)
            .changed();
        if c.changed() || v {
            set(app, "df", Box::new(move |d| d.design_factor = own.then_some(df)));
        }
    });
    if let Some((_, Ok(report))) = &app.sizing.report
        && let Some(c) = report.members.iter().find(|c| c.id == m.id)
    {
        ui.horizontal(|ui| {
            ui.label("check:");
            ui.label(status_text(c.status));
            if let Some(u) = c.utilisation {
                ui.label(format!("utilisation {u:.3}"));
            }
        });
    }
}

/// Largest absolute force of a member in the last check report (N).
fn max_force(app: &RigApp, id: &str) -> Option<f64> {
    let (_, Ok(r)) = app.sizing.report.as_ref()? else { return None };
    let m = r.members.iter().find(|m| m.id == id)?;
    let hi = m.force_max.as_ref().map_or(0.0, |f| f.0.abs());
    let lo = m.force_min.as_ref().map_or(0.0, |f| f.0.abs());
    Some(hi.max(lo))
}

/// The spring designer window.
pub fn windows(app: &mut RigApp, ctx: &egui::Context) {
    let units = app.settings.units;
    let Some(mut d) = app.sizing.designer.take() else { return };
    let mut open = true;
    let mut assign: Option<SpringDesign> = None;
    egui::Window::new(format!("Spring designer — `{}`", d.member_id))
        .open(&mut open)
        .default_width(380.0)
        .show(ctx, |ui| {
            ui.label(RichText::new("Helical spring from a rate and working force (Shigley ch. 10)").small());
            egui::Grid::new("designer").num_columns(3).spacing([8.0, 4.0]).show(ui, |ui| {
                let mut k = units.to_display(Quantity::Stiffness, d.req.rate);
                let speed = k.abs() * 0.005 + 0.1;
                let name = ui.label("rate").id;
                if ui.add(DragValue::new(&mut k).speed(speed)).labelled_by(name).changed() && k > 0.0 {
                    d.req.rate = units.to_si(Quantity::Stiffness, k);
                }
                ui.label(units.symbol(Quantity::Stiffness));
                ui.end_row();
                let mut f = units.to_display(Quantity::Force, d.req.max_force);
                let speed = f.abs() * 0.005 + 0.1;
                let name = ui.label("largest working force").id;
                if ui.add(DragValue::new(&mut f).speed(speed)).labelled_by(name).changed() && f > 0.0 {
                    d.req.max_force = units.to_si(Quantity::Force, f);
                }
                ui.label(units.symbol(Quantity::Force));
                ui.end_row();
                let name = ui.label("material").id;
                egui::ComboBox::from_id_salt("material")
                    .selected_text(d.req.material.name())
                    .show_ui(ui, |ui| {
                        for m in SpringMaterial::ALL {
                            ui.selectable_value(&mut d.req.material, m, m.name());
                        }
                    })
                    .response
                    .labelled_by(name);
                ui.end_row();
                let name = ui.label("ends").id;
                egui::ComboBox::from_id_salt("ends")
                    .selected_text(d.req.ends.name())
                    .show_ui(ui, |ui| {
                        for e in SpringEnds::ALL {
                            ui.selectable_value(&mut d.req.ends, e, e.name());
                        }
                    })
                    .response
                    .labelled_by(name);
                ui.end_row();
                for (label, v) in [
                    ("largest outside diameter", &mut d.req.max_outside_mm),
                    ("smallest inside diameter", &mut d.req.min_inside_mm),
                    ("longest free length", &mut d.req.max_free_length_mm),
                ] {
                    let mut on = v.is_some();
                    let mut x = v.unwrap_or(50.0);
                    let c = ui.checkbox(&mut on, label);
                    ui.add_enabled(on, DragValue::new(&mut x).range(1.0..=2000.0).speed(0.5))
                        .labelled_by(c.id);
                    ui.label("mm");
                    *v = on.then_some(x);
                    ui.end_row();
                }
                let name = ui.label("design factor").id;
                ui.add(DragValue::new(&mut d.req.design_factor).range(1.0..=5.0).speed(0.01))
                    .labelled_by(name);
                ui.label("on the allowable stress");
                ui.end_row();
            });
            ui.separator();
            match design_spring(&d.req) {
                Ok(s) => {
                    let p = s.properties();
                    egui::Grid::new("proposal").num_columns(2).striped(true).show(ui, |ui| {
                        let rows = [
                            ("wire diameter d", format!("{} mm", s.wire_mm)),
                            ("mean coil diameter D", format!("{} mm", s.mean_mm)),
                            ("outside diameter", format!("{:.2} mm", p.outside_diameter * 1e3)),
                            ("active coils Na", format!("{}", s.active_coils)),
                            ("free length", format!("{:.2} mm", s.free_length_mm)),
                            ("solid length", format!("{:.2} mm", p.solid_length * 1e3)),
                            ("rate", units.show(Quantity::Stiffness, p.rate)),
                            ("index C", format!("{:.2}", p.index)),
                            (
                                "stress at the working force",
                                units.show(Quantity::Stress, s.stress(d.req.max_force)),
                            ),
                            ("allowable (Sut × fraction)", units.show(Quantity::Stress, p.allowable)),
                            (
                                "utilisation at the working force (with the DF)",
                                format!("{:.3}", s.stress(d.req.max_force) * d.req.design_factor / p.allowable),
                            ),
                            (
                                "utilisation at solid (with the DF)",
                                if s.ends.is_compression() {
                                    let solid = p.rate * (s.free_length_mm * 1e-3 - p.solid_length);
                                    format!("{:.3}", s.stress(solid) * d.req.design_factor / p.allowable)
                                } else {
                                    "n/a (extension spring)".to_string()
                                },
                            ),
                            (
                                "buckling",
                                p.buckling_free_length.map_or("n/a (extension spring)".to_string(), |l| {
                                    format!("stable below {:.1} mm free length (flat parallel ends)", l * 1e3)
                                }),
                            ),
                            ("surge frequency", format!("{:.1} Hz", p.surge_hz)),
                            ("mass", units.show(Quantity::Mass, p.mass)),
                        ];
                        for (k, v) in rows {
                            ui.label(k);
                            ui.label(v);
                            ui.end_row();
                        }
                        if let Some((lo, hi)) = p.initial_tension {
                            ui.label("initial tension band");
                            ui.label(format!(
                                "{} to {}",
                                units.show(Quantity::Force, lo),
                                units.show(Quantity::Force, hi)
                            ));
                            ui.end_row();
                        }
                    });
                    if ui
                        .button(format!("Assign to `{}`", d.member_id))
                        .on_hover_text("Sets the member's rate and free length from this spring")
                        .clicked()
                    {
                        assign = Some(s);
                    }
                }
                Err(e) => {
                    ui.label(RichText::new(e).color(pal::ALARM));
                }
            }
        });
    if let Some(s) = assign {
        let id = d.member_id.clone();
        let member = d.member;
        app.queue(Command::Edit {
            merge: None,
            apply: Box::new(move |p| {
                if p.members.get(member).is_some_and(|m| m.id == id) {
                    let _ = assign_spring(p, &id, &s);
                }
            }),
        });
        app.message = Some((format!("Spring design assigned to `{}`", d.member_id), false));
        open = false;
    }
    if open {
        app.sizing.designer = Some(d);
    }
}

/// The Sweep readout.
pub fn sweep_ui(app: &mut RigApp, ui: &mut egui::Ui) {
    if app.sizing.sweep.param.is_empty() {
        let param = suggest_param(app);
        choose_param(app, param);
    }
    let mut run = false;
    let mut chosen = None;
    ui.horizontal_top(|ui| {
        ui.vertical(|ui| {
            ui.set_width(300.0);
            let s = &mut app.sizing.sweep;
            let name = ui.label("Vary (member:ID:pretension|rate|ea, node:ID:x|y|z|mass, load:CASE:NODE:x|y|z)").id;
            ui.horizontal(|ui| {
                ui.add(egui::TextEdit::singleline(&mut s.param).desired_width(200.0)).labelled_by(name);
                ui.menu_button("Choose…", |ui| {
                    for (group, items) in sweep_choices(&app.doc.project) {
                        if items.is_empty() {
                            continue;
                        }
                        ui.menu_button(group, |ui| {
                            egui::ScrollArea::vertical().max_height(320.0).show(ui, |ui| {
                                let full = items.len() >= CHOICES_PER_GROUP;
                                for item in items {
                                    if ui.button(&item).clicked() {
                                        chosen = Some(item);
                                    }
                                }
                                if full {
                                    ui.label(format!("(the first {CHOICES_PER_GROUP}; type any other)"));
                                }
                            });
                        });
                    }
                })
                .response
                .on_hover_text("Pick what to vary from this rig's members, nodes and point loads");
            });
            let s = &mut app.sizing.sweep;
            let unit = s.param.parse::<Param>().map(|p| p.unit()).unwrap_or("SI");
            ui.horizontal(|ui| {
                ui.add(DragValue::new(&mut s.from).speed(0.01).prefix("from "));
                ui.add(DragValue::new(&mut s.to).speed(0.01).prefix("to "));
                ui.label(format!("{unit} (SI)"));
            });
            ui.add(DragValue::new(&mut s.steps).range(2..=60).prefix("steps "));
            let name = ui
                .label("Outputs, one per line (lowest-frequency, peak-tension, peak-utilisation, displacement:NODE[:x|y|z], stiffness:NODE:x|y|z, force:MEMBER)")
                .id;
            ui.add(egui::TextEdit::multiline(&mut s.outputs).desired_rows(3).desired_width(280.0)).labelled_by(name);
            run = ui.button("Run Sweep").clicked();
        });
        ui.separator();
        ui.vertical(|ui| sweep_result(app, ui));
    });
    if let Some(param) = chosen {
        choose_param(app, param);
    }
    if run {
        start_sweep(app);
    }
    let revision = app.doc.revision;
    if let Some((job, _)) = &app.sizing.sweep.job {
        if job.key != revision {
            // Edited meanwhile: the Sweep belonged to the rig as it was.
            app.sizing.sweep.job = None;
        } else if let Some(r) = job.poll() {
            app.sizing.sweep.result = Some(r.and_then(|r| r));
            app.sizing.sweep.shown = 0;
            app.sizing.sweep.job = None;
        }
    }
}

/// Runs the Sweep as set up in the panel: at once on a small rig, on another thread on a
/// large one.
fn start_sweep(app: &mut RigApp) {
    let s = &app.sizing.sweep;
    let outputs: Result<Vec<Output>, String> = s.outputs.lines().map(str::trim).filter(|l| !l.is_empty()).map(str::parse).collect();
    let prepared = s.param.parse::<Param>().and_then(|param| Ok((param, outputs?)));
    let (param, outputs) = match prepared {
        Ok(v) => v,
        Err(e) => {
            app.sizing.sweep.result = Some(Err(e));
            app.sizing.sweep.job = None;
            return;
        }
    };
    let project = app.doc.project.clone();
    let parts = catalogue(&project);
    let case = app.doc.model.cases.get(app.case).map(|c| c.name.clone());
    let range = (s.from, s.to, s.steps);
    let work =
        move |watch: Watch| sweep_watched(&project, &parts, case.as_deref(), &param, range, &outputs, &watch).map_err(|e| e.to_string());
    if app.doc.project.nodes.len() <= BACKGROUND_NODES {
        app.sizing.sweep.result = Some(work(Watch::new()));
        app.sizing.sweep.shown = 0;
        app.sizing.sweep.job = None;
    } else {
        app.sizing.sweep.result = None;
        app.sizing.sweep.job = Some((Background::spawn(app.doc.revision, work), range.2));
    }
}

fn sweep_result(app: &mut RigApp, ui: &mut egui::Ui) {
    let s = &mut app.sizing.sweep;
    if let Some((job, steps)) = &s.job {
        let text = format!(
            "Sweeping this large rig… {} of {steps} values done, {:.1} s (the window stays usable)",
            job.steps_done(),
            job.started.elapsed().as_secs_f64()
        );
        if progress_row(ui, text, "Stop the Sweep") {
            s.job = None;
        }
        return;
    }
    let Some(result) = &s.result else {
        ui.label("Choose what to vary and the outputs, then Run Sweep. Values at which the rig has no stable equilibrium are left out and say why.");
        return;
    };
    let r = match result {
        Ok(r) => r,
        Err(e) => {
            ui.label(RichText::new(e).color(pal::ALARM));
            return;
        }
    };
    ui.horizontal(|ui| {
        for (k, (name, unit)) in r.outputs.iter().enumerate() {
            let label = if unit.is_empty() {
                name.clone()
            } else {
                format!("{name} ({unit})")
            };
            ui.selectable_value(&mut s.shown, k, label);
        }
    });
    let k = s.shown.min(r.outputs.len().saturating_sub(1));
    let (name, unit) = r.outputs.get(k).cloned().unwrap_or_default();
    let pts: Vec<[f64; 2]> = r
        .values
        .iter()
        .zip(&r.rows)
        .filter_map(|(v, row)| row.get(k).copied().flatten().map(|y| [*v, y]))
        .collect();
    let missing = r.rows.iter().filter(|row| row.get(k).copied().flatten().is_none()).count();
    if missing > 0 {
        let why = r.notes.iter().flatten().next().cloned().unwrap_or_default();
        ui.label(RichText::new(format!("{missing} value(s) without a result: {why}")).color(pal::ALARM));
    }
    Plot::new("sweep-plot")
        .x_axis_label(format!("{} ({})", r.param, r.unit))
        .y_axis_label(if unit.is_empty() {
            name.clone()
        } else {
            format!("{name} ({unit})")
        })
        .y_axis_min_width(56.0)
        .show(ui, |plot| {
            // One line per run of values with results: no line is drawn across a gap.
            let mut run: Vec<[f64; 2]> = Vec::new();
            for (v, row) in r.values.iter().zip(&r.rows) {
                match row.get(k).copied().flatten() {
                    Some(y) => run.push([*v, y]),
                    None if !run.is_empty() => {
                        let pts = PlotPoints::from(std::mem::take(&mut run));
                        plot.line(Line::new(name.clone(), pts).color(pal::STIFFNESS).width(2.0));
                    }
                    None => {}
                }
            }
            if !run.is_empty() {
                plot.line(Line::new(name.clone(), PlotPoints::from(run)).color(pal::STIFFNESS).width(2.0));
            }
            plot.points(Points::new("values", PlotPoints::from(pts)).radius(3.0).color(pal::STIFFNESS));
        });
}

/// Sets what the Sweep varies, with a range of ±50 % about its present value. From zero, the
/// range comes from the rig: up to its largest node mass, ± its largest point load, ± a tenth
/// of its size (the diagonal of its drawn geometry); masses, rates and EA never go below zero.
fn choose_param(app: &mut RigApp, param: String) {
    app.sizing.sweep.param = param;
    let project = &app.doc.project;
    let Ok(p) = app.sizing.sweep.param.parse::<Param>() else { return };
    let Some(mut v) = p.current(project) else { return };
    // A member stress-free as drawn has no pretension to start from: use its force.
    if let (Param::Pretension(id), Some(a), true) = (&p, app.answer(), v == 0.0)
        && let Some(i) = a.model.member_index(id)
    {
        v = a.eq.members[i].force;
    }
    let largest_mass = project.nodes.iter().map(|n| n.mass).fold(0.0, f64::max);
    let largest_load = project
        .cases
        .iter()
        .flat_map(|c| &c.loads)
        .map(|l| (l.force.0.powi(2) + l.force.1.powi(2) + l.force.2.powi(2)).sqrt())
        .fold(0.0, f64::max);
    let size = app.doc.model.extent();
    let positive = |x: f64| if x > 0.0 { x } else { 1.0 };
    let nonnegative = matches!(p, Param::Mass(_) | Param::Rate(_) | Param::Ea(_));
    let (from, to) = match (&p, v == 0.0) {
        (Param::Mass(_), true) => (0.0, positive(largest_mass)),
        (Param::Load { .. }, true) => (-positive(largest_load), positive(largest_load)),
        (Param::Coordinate(..), true) => (-0.1 * positive(size), 0.1 * positive(size)),
        (_, true) => (-0.5, 0.5),
        (_, false) => (v - 0.5 * v.abs(), v + 0.5 * v.abs()),
    };
    let from = if nonnegative { from.max(0.0) } else { from };
    (app.sizing.sweep.from, app.sizing.sweep.to) = (from, to);
}

/// Most entries listed per group in the Sweep's Choose menu.
const CHOICES_PER_GROUP: usize = 100;

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

/// A parameter to start from: the selected member's pretension or rate, the selected node's
/// mass, or the first member's.
fn suggest_param(app: &RigApp) -> String {
    let p = &app.doc.project;
    match app.selection {
        Selection::Member(i) if i < p.members.len() => member_param(&p.members[i].id, &p.members[i].kind),
        Selection::Node(i) if i < p.nodes.len() => format!("node:{}:mass", p.nodes[i].id),
        _ => match p.nodes.iter().find(|n| n.mass > 0.0) {
            Some(n) => format!("node:{}:mass", n.id),
            None => p.members.first().map_or(String::new(), |m| member_param(&m.id, &m.kind)),
        },
    }
}

fn member_param(id: &str, kind: &MemberDocKind) -> String {
    match kind {
        MemberDocKind::Spring { .. } => format!("member:{id}:rate"),
        _ => format!("member:{id}:pretension"),
    }
}
