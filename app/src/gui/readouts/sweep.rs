//! The Sweep tab of the Readouts: what to vary over which range (chosen from the rig's own
//! parameters or typed), the outputs, running the Sweep (beside the window on a large rig)
//! and the plot of one output against the parameter.

use eframe::egui::{self, DragValue, RichText};
use egui_plot::{Line, Plot, PlotPoints, Points};
use rigwright_core::Watch;
use rigwright_core::model::MemberDocKind;
use rigwright_core::sizing::{Output, Param, sweep_watched};

use crate::gui::background::{BACKGROUND_NODES, Background, progress_row};
use crate::gui::palette as pal;
use crate::gui::sizing::{CHOICES_PER_GROUP, catalogue, sweep_choices};
use crate::gui::{RigApp, Selection};

/// The Sweep readout.
pub(super) fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
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
