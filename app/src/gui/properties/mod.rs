//! Properties: edit the selected node, member or load (or the project) with units shown.
//!
//! Responsible for turning field edits into [`Command::Edit`]s and showing why the rig as
//! edited is not valid. Not responsible for validation itself (the core does it).
//!
//! This file shows the panel and the project, node and load sections; `member.rs` and
//! `design.rs` the member, `fields.rs` the fields they all use.

mod design;
mod fields;
mod member;

use eframe::egui::{self, DragValue, RichText};
use rigwright_core::Project;
use rigwright_report::units::Quantity;

use self::fields::{quantity, text};
use self::member::member;
use super::command::edit;
use super::palette as pal;
use super::{RigApp, Selection};

pub fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    ui.add_space(4.0);
    ui.heading("Properties");
    ui.separator();
    egui::ScrollArea::vertical().auto_shrink([false, false]).show(ui, |ui| {
        match app.selection {
            Selection::None if app.boxed.len() > 1 => {
                ui.label(RichText::new(format!("{} nodes selected", app.boxed.len())).strong());
                ui.label("Delete removes them with the members and loads attached to them. Click on the Rig view to clear.");
            }
            Selection::None => project(app, ui),
            Selection::Node(i) => node(app, ui, i),
            Selection::Member(i) => member(app, ui, i),
            Selection::Load(i) => load(app, ui, i),
        }
        if let Some(p) = app.doc.problems.clone() {
            ui.add_space(10.0);
            ui.label(RichText::new("The rig as edited cannot be solved").strong().color(pal::ALARM));
            ui.label(RichText::new("The Rig view shows the last valid rig until this is fixed:").small());
            for line in p.lines() {
                ui.label(RichText::new(format!("• {line}")).color(pal::ALARM));
            }
        }
    });
}

fn project(app: &mut RigApp, ui: &mut egui::Ui) {
    let units = app.settings.units;
    let p = app.doc.project.clone();
    ui.label(RichText::new("Project").strong());
    egui::Grid::new("project-props").num_columns(2).spacing([8.0, 6.0]).show(ui, |ui| {
        if let Some(t) = text(ui, "Title", &p.title) {
            edit(app, "project-title".into(), move |d| d.title = t);
        }
        ui.label("Geometry");
        ui.label(if p.planar { "planar (x–y)" } else { "3D" });
        ui.end_row();
        let case = app.case;
        if let Some(c) = p.cases.get(case) {
            if let Some(t) = text(ui, "Load case", &c.name) {
                edit(app, format!("case-name-{case}"), move |d| d.cases[case].name = t);
            }
            let name = ui.label("Gravity factor").id;
            let mut g = c.gravity;
            if ui
                .add(DragValue::new(&mut g).speed(0.01).max_decimals(3))
                .labelled_by(name)
                .changed()
            {
                edit(app, format!("case-g-{case}"), move |d| d.cases[case].gravity = g);
            }
            ui.end_row();
        }
        ui.label("Nodes / members");
        ui.label(format!("{} / {}", p.nodes.len(), p.members.len()));
        ui.end_row();
        ui.label("Total mass");
        ui.label(units.show(Quantity::Mass, app.doc.model.nodes.iter().map(|n| n.mass).sum()));
        ui.end_row();
    });
    egui::CollapsingHeader::new("Sheet title block")
        .id_salt("sheet-info")
        .show(ui, |ui| {
            egui::Grid::new("sheet-props").num_columns(2).spacing([8.0, 6.0]).show(ui, |ui| {
                let info = p.sheet.clone();
                let fields: [(&str, &str, InfoField); 7] = [
                    ("Project / job", &info.project, |s| &mut s.project),
                    ("Location", &info.location, |s| &mut s.location),
                    ("Client", &info.client, |s| &mut s.client),
                    ("Prepared by", &info.prepared_by, |s| &mut s.prepared_by),
                    ("Checked by", &info.checked_by, |s| &mut s.checked_by),
                    ("Date (empty: today)", &info.date, |s| &mut s.date),
                    ("Revision", &info.revision, |s| &mut s.revision),
                ];
                for (label, value, field) in fields {
                    if let Some(t) = text(ui, label, value) {
                        edit(app, format!("sheet-{label}"), move |d| *field(&mut d.sheet) = t);
                    }
                }
            });
            ui.label(RichText::new("Printed on every page of the Sheet (File menu, Print Sheet…).").weak());
        });
    ui.add_space(6.0);
    ui.label(RichText::new("Select a node, member or load on the Rig view to edit it.").weak());
    if !p.notes.is_empty() {
        ui.add_space(6.0);
        ui.label(RichText::new("Notes").strong());
        ui.label(&p.notes);
    }
}

fn node(app: &mut RigApp, ui: &mut egui::Ui, i: usize) {
    let units = app.settings.units;
    let Some(n) = app.doc.project.nodes.get(i).cloned() else { return };
    let kind = match n.fixed {
        [true, true, true] => "Anchor",
        [false, false, false] => "Free node",
        _ => "Guided support",
    };
    ui.label(RichText::new(format!("{kind} `{}`", n.id)).strong());
    let planar = app.doc.project.planar;
    egui::Grid::new("node-props").num_columns(2).spacing([8.0, 6.0]).show(ui, |ui| {
        if let Some(id) = text(ui, "Id", &n.id) {
            let old = n.id.clone();
            edit(app, format!("node-id-{i}"), move |d| rename_node(d, &old, &id));
        }
        let at = [n.at.0, n.at.1, n.at.2];
        for (k, name) in ["x", "y", "z"].iter().enumerate() {
            if planar && k == 2 {
                continue;
            }
            if let Some(v) = quantity(ui, name, at[k], Quantity::Length, units) {
                edit(app, format!("node-at-{i}-{k}"), move |d| match k {
                    0 => d.nodes[i].at.0 = v,
                    1 => d.nodes[i].at.1 = v,
                    _ => d.nodes[i].at.2 = v,
                });
            }
        }
        if let Some(m) = quantity(ui, "Mass", n.mass, Quantity::Mass, units) {
            edit(app, format!("node-mass-{i}"), move |d| d.nodes[i].mass = m);
        }
        ui.label("Held in");
        ui.horizontal(|ui| {
            let mut fixed = n.fixed;
            let mut changed = false;
            for (k, name) in ["x", "y", "z"].iter().enumerate() {
                if planar && k == 2 {
                    continue;
                }
                changed |= ui
                    .checkbox(&mut fixed[k], *name)
                    .on_hover_text(format!("Hold this node in {name}: the support takes a reaction along {name}"))
                    .changed();
            }
            if changed {
                edit(app, format!("node-fixed-{i}"), move |d| d.nodes[i].fixed = fixed);
            }
        });
        ui.end_row();
    });
    let mut marked = app.doc.project.sheet.stiffness_at.contains(&n.id);
    if ui
        .checkbox(&mut marked, "list its tangent stiffness on the Sheet")
        .on_hover_text("The Sheet prints the condensed stiffness at every node marked here")
        .changed()
    {
        let id = n.id.clone();
        edit(app, format!("node-mark-{i}"), move |d| {
            d.sheet.stiffness_at.retain(|s| *s != id);
            if marked {
                d.sheet.stiffness_at.push(id);
            }
        });
    }
    if let Some(a) = app.answer()
        && let Some(mi) = a.model.node_index(&n.id)
    {
        let r = &a.eq.nodes[mi];
        ui.add_space(6.0);
        ui.label(RichText::new("At equilibrium").strong());
        ui.label(format!("displacement {}", units.show(Quantity::Length, r.displacement.norm())));
        if let Some(f) = r.reaction.filter(|_| a.model.has_reaction(mi)) {
            ui.label(format!("reaction {}", units.show(Quantity::Force, f.norm())));
        }
    }
}

/// One text field of the Sheet title block.
type InfoField = fn(&mut rigwright_core::model::SheetInfo) -> &mut String;

fn rename_node(d: &mut Project, old: &str, new: &str) {
    for n in d.nodes.iter_mut().filter(|n| n.id == old) {
        n.id = new.to_string();
    }
    for m in &mut d.members {
        if m.ends.0 == old {
            m.ends.0 = new.to_string();
        }
        if m.ends.1 == old {
            m.ends.1 = new.to_string();
        }
    }
    for c in &mut d.cases {
        for l in c.loads.iter_mut().filter(|l| l.node == old) {
            l.node = new.to_string();
        }
    }
    for s in d.sheet.stiffness_at.iter_mut().filter(|s| *s == old) {
        *s = new.to_string();
    }
}

fn load(app: &mut RigApp, ui: &mut egui::Ui, i: usize) {
    let units = app.settings.units;
    let case = app.case;
    let Some(l) = app.doc.project.cases.get(case).and_then(|c| c.loads.get(i)).cloned() else {
        return;
    };
    ui.label(RichText::new("Point load").strong());
    ui.label(format!("on node `{}`, load case `{}`", l.node, app.doc.project.cases[case].name));
    egui::Grid::new("load-props").num_columns(2).spacing([8.0, 6.0]).show(ui, |ui| {
        let f = [l.force.0, l.force.1, l.force.2];
        for (k, name) in ["Fx", "Fy", "Fz"].iter().enumerate() {
            if app.doc.project.planar && k == 2 {
                continue;
            }
            if let Some(v) = quantity(ui, name, f[k], Quantity::Force, units) {
                edit(app, format!("load-{case}-{i}-{k}"), move |d| {
                    let force = &mut d.cases[case].loads[i].force;
                    match k {
                        0 => force.0 = v,
                        1 => force.1 = v,
                        _ => force.2 = v,
                    }
                });
            }
        }
    });
}
