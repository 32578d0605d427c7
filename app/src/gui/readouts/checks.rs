//! The Checks tab of the Readouts: the verdict, every member checked in every load case
//! (status in words, never by colour alone; most concern first or in the project's order),
//! and the design factors and limits, editable, with auto-size and the import of parts.

use eframe::egui::{self, DragValue, RichText};
use rigwright_core::Watch;
use rigwright_core::element::MemberClass;
use rigwright_core::sizing::{DesignFactors, Status, check_project_watched};
use rigwright_report::units::{Quantity, significant};

use crate::gui::background::{BACKGROUND_NODES, Background, progress_row};
use crate::gui::command::edit;
use crate::gui::palette as pal;
use crate::gui::sizing::{autosize, catalogue, import_parts, status_text};
use crate::gui::{RigApp, Selection};

/// The Checks readout.
pub(super) fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
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
