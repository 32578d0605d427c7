//! A member's properties: id, stiffness, rest state (as drawn, unstressed or free length,
//! pretension or preload), mass per length, its state at equilibrium, then its design.

use eframe::egui::{self, RichText};
use rigwright_core::Project;
use rigwright_core::model::{MemberDocKind, Rest};
use rigwright_report::units::Quantity;

use super::fields::{quantity, text};
use crate::gui::RigApp;
use crate::gui::command::edit;

#[derive(Clone, Copy, PartialEq)]
enum RestMode {
    AsDrawn,
    Length,
    Tension,
    Horizontal,
}

pub(super) fn member(app: &mut RigApp, ui: &mut egui::Ui, i: usize) {
    let units = app.settings.units;
    let Some(m) = app.doc.project.members.get(i).cloned() else { return };
    let (class, stiff, rest) = match m.kind {
        MemberDocKind::Cable { ea, rest } => ("Cable", ea, rest),
        MemberDocKind::Spring { rate, rest } => ("Spring", rate, rest),
        MemberDocKind::Strut { ea, rest } => ("Strut", ea, rest),
    };
    let is_spring = class == "Spring";
    ui.label(RichText::new(format!("{class} `{}`", m.id)).strong());
    egui::Grid::new("member-props").num_columns(2).spacing([8.0, 6.0]).show(ui, |ui| {
        if let Some(id) = text(ui, "Id", &m.id) {
            edit(app, format!("member-id-{i}"), move |d| d.members[i].id = id);
        }
        ui.label("Ends");
        ui.label(format!("{} to {}", m.ends.0, m.ends.1));
        ui.end_row();
        let (label, q) = if is_spring {
            ("Rate k", Quantity::Stiffness)
        } else {
            ("Axial stiffness EA", Quantity::Force)
        };
        if let Some(v) = quantity(ui, label, stiff, q, units) {
            edit(app, format!("member-k-{i}"), move |d| set_stiffness(&mut d.members[i].kind, v));
        }
        let mode = match rest {
            Rest::AsDrawn => RestMode::AsDrawn,
            Rest::Length(_) => RestMode::Length,
            Rest::Tension(_) => RestMode::Tension,
            Rest::Horizontal(_) => RestMode::Horizontal,
        };
        let (len_name, force_name) = if is_spring {
            ("Free length", "Preload")
        } else if class == "Cable" && m.mass_per_length > 0.0 {
            // A cable with weight sags: its tension varies along it, largest at the upper end.
            ("Unstressed length", "Pretension at upper end")
        } else {
            ("Unstressed length", "Pretension")
        };
        let horizontal_name = "Horizontal pretension";
        let name = ui.label("Rest state").id;
        let mut new_mode = mode;
        egui::ComboBox::from_id_salt("rest-mode")
            .selected_text(match mode {
                RestMode::AsDrawn => "stress-free as drawn",
                RestMode::Length => len_name,
                RestMode::Tension => force_name,
                RestMode::Horizontal => horizontal_name,
            })
            .show_ui(ui, |ui| {
                ui.selectable_value(&mut new_mode, RestMode::AsDrawn, "stress-free as drawn");
                ui.selectable_value(&mut new_mode, RestMode::Length, len_name);
                ui.selectable_value(&mut new_mode, RestMode::Tension, force_name);
                if class == "Cable" {
                    ui.selectable_value(&mut new_mode, RestMode::Horizontal, horizontal_name);
                }
            })
            .response
            .labelled_by(name);
        ui.end_row();
        if new_mode != mode {
            let drawn = drawn_length(&app.doc.project, i).unwrap_or(1.0);
            let rest = match new_mode {
                RestMode::AsDrawn => Rest::AsDrawn,
                RestMode::Length => Rest::Length(drawn),
                RestMode::Tension => Rest::Tension(0.0),
                RestMode::Horizontal => Rest::Horizontal(0.0),
            };
            edit(app, format!("member-rest-mode-{i}"), move |d| {
                set_rest(&mut d.members[i].kind, rest)
            });
        }
        match rest {
            Rest::Length(l) => {
                if let Some(v) = quantity(ui, len_name, l, Quantity::Length, units) {
                    edit(app, format!("member-rest-{i}"), move |d| {
                        set_rest(&mut d.members[i].kind, Rest::Length(v))
                    });
                }
            }
            Rest::Tension(t) => {
                if let Some(v) = quantity(ui, force_name, t, Quantity::Force, units) {
                    edit(app, format!("member-rest-{i}"), move |d| {
                        set_rest(&mut d.members[i].kind, Rest::Tension(v))
                    });
                }
            }
            Rest::Horizontal(t) => {
                if let Some(v) = quantity(ui, horizontal_name, t, Quantity::Force, units) {
                    edit(app, format!("member-rest-{i}"), move |d| {
                        set_rest(&mut d.members[i].kind, Rest::Horizontal(v))
                    });
                }
            }
            Rest::AsDrawn => {}
        }
        if let Some(v) = quantity(ui, "Mass per length", m.mass_per_length, Quantity::MassPerLength, units) {
            edit(app, format!("member-mpl-{i}"), move |d| d.members[i].mass_per_length = v);
        }
        if let Some(l) = drawn_length(&app.doc.project, i) {
            ui.label("Drawn length");
            ui.label(units.show(Quantity::Length, l));
            ui.end_row();
        }
    });
    if let Some(a) = app.answer()
        && let Some(mi) = a.model.member_index(&m.id)
    {
        let r = &a.eq.members[mi];
        ui.add_space(6.0);
        ui.label(RichText::new("At equilibrium").strong());
        ui.label(if r.slack {
            "slack".to_string()
        } else {
            format!("force {}", units.show(Quantity::Force, r.force))
        });
        ui.label(format!("length {}", units.show(Quantity::Length, r.length)));
        if let Some(sag) = &r.sag {
            ui.label(format!(
                "sag {} (mid-span {}); tension {} to {}, horizontal {}",
                units.show(Quantity::Length, sag.sag),
                units.show(Quantity::Length, sag.mid_span_sag),
                units.show(Quantity::Force, sag.tension_a.min(sag.tension_b)),
                units.show(Quantity::Force, sag.tension_a.max(sag.tension_b)),
                units.show(Quantity::Force, sag.horizontal),
            ));
        }
    }
    super::design::member_design(app, ui, i);
}

fn drawn_length(p: &Project, i: usize) -> Option<f64> {
    let m = p.members.get(i)?;
    let at = |id: &str| p.nodes.iter().find(|n| n.id == id).map(|n| n.at);
    let (a, b) = (at(&m.ends.0)?, at(&m.ends.1)?);
    Some(((b.0 - a.0).powi(2) + (b.1 - a.1).powi(2) + (b.2 - a.2).powi(2)).sqrt())
}

fn set_stiffness(kind: &mut MemberDocKind, v: f64) {
    match kind {
        MemberDocKind::Cable { ea, .. } | MemberDocKind::Strut { ea, .. } => *ea = v,
        MemberDocKind::Spring { rate, .. } => *rate = v,
    }
}

fn set_rest(kind: &mut MemberDocKind, r: Rest) {
    match kind {
        MemberDocKind::Cable { rest, .. } | MemberDocKind::Strut { rest, .. } | MemberDocKind::Spring { rest, .. } => *rest = r,
    }
}
