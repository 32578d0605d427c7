//! The Stiffness tab of the Readouts: the condensed tangent stiffness of the selected free
//! node, its principal values and directions, split into elastic and geometric parts.

use eframe::egui::{self, RichText};
use rigwright_core::NodeStiffness;
use rigwright_report::units::{Quantity, Units};

use super::cells::header;
use crate::gui::palette as pal;
use crate::gui::{RigApp, Selection};

pub(super) fn ui(app: &RigApp, units: Units, ui: &mut egui::Ui) {
    let node = match app.selection {
        Selection::Node(i) => app.doc.project.nodes.get(i).map(|n| n.id.clone()),
        _ => None,
    };
    let Some(node) = node else {
        ui.label("Select a free node on the Rig view to see its tangent stiffness.");
        return;
    };
    match app.solved.as_ref().and_then(|s| s.stiffness.as_ref()) {
        Some(Ok(k)) if k.node == node => stiffness_table(k, units, ui),
        Some(Err(e)) => {
            ui.label(RichText::new(format!("No stiffness at `{node}`: {e}")).color(pal::ALARM));
        }
        _ => {
            ui.label(format!("`{node}` has no free direction (a support), or it is not solved yet."));
        }
    }
}

fn stiffness_table(k: &NodeStiffness, units: Units, ui: &mut egui::Ui) {
    let s = units.symbol(Quantity::Stiffness);
    let axis = |a: usize| ["x", "y", "z"][a];
    ui.label(format!(
        "Tangent stiffness at `{}`, condensed (every other free node re-equilibrates). Units: {s}.",
        k.node
    ));
    ui.horizontal_top(|ui| {
        egui::Grid::new("principal").striped(true).spacing([14.0, 4.0]).show(ui, |ui| {
            header(ui, &["principal", "stiffness", "direction (x, y, z)"]);
            for (i, p) in k.principal.iter().enumerate() {
                ui.label(format!("k{}", i + 1));
                ui.label(units.show(Quantity::Stiffness, p.value));
                ui.label(format!("({:.3}, {:.3}, {:.3})", p.direction.x, p.direction.y, p.direction.z));
                ui.end_row();
            }
        });
        ui.separator();
        egui::Grid::new("split").striped(true).spacing([14.0, 4.0]).show(ui, |ui| {
            header(ui, &["entry", "total K_T", "elastic K_E", "geometric K_G"]);
            for (i, &ai) in k.axes.iter().enumerate() {
                for (j, &aj) in k.axes.iter().enumerate() {
                    if j < i {
                        continue;
                    }
                    ui.label(format!("k_{}{}", axis(ai), axis(aj)));
                    ui.label(units.show(Quantity::Stiffness, k.total[i][j]));
                    ui.label(units.show(Quantity::Stiffness, k.elastic[i][j]));
                    ui.label(units.show(Quantity::Stiffness, k.geometric[i][j]));
                    ui.end_row();
                }
            }
        });
    });
}
