//! The design part of a member's properties: the cable's part (chosen from the catalogue) or
//! breaking force, the spring's design (with the spring designer), the strut's section, the
//! member's own design factor, and its check.

use eframe::egui::{self, DragValue, RichText};
use rigwright_core::element::MemberClass;
use rigwright_core::model::MemberDocKind;
use rigwright_core::sizing::autosize::assign_part;
use rigwright_core::sizing::{MemberDesign, SpringEnds, SpringMaterial, SpringRequirement, StrutSection};
use rigwright_report::units::Quantity;

use crate::gui::RigApp;
use crate::gui::command::edit;
use crate::gui::palette as pal;
use crate::gui::sizing::{Designer, catalogue, status_text};

/// The design part of a member's properties.
pub(super) fn member_design(app: &mut RigApp, ui: &mut egui::Ui, i: usize) {
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
