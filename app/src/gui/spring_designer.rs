//! The spring designer window: a helical spring proposed from a rate and a working force
//! (Shigley ch. 10 formulas, from the core), its properties and checks, and assigning it to
//! the member.

use eframe::egui::{self, DragValue, RichText};
use rigwright_core::sizing::autosize::assign_spring;
use rigwright_core::sizing::{SpringDesign, SpringEnds, SpringMaterial, design_spring};
use rigwright_report::units::Quantity;

use super::palette as pal;
use super::{Command, RigApp};

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
