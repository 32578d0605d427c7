//! The Nodes tab of the Readouts: position and displacement of every node, reactions at
//! supports.

use eframe::egui;
use rigwright_report::units::{Quantity, Units};

use super::cells::{header, vec_text};
use crate::gui::Answer;

pub(super) fn ui(a: &Answer<'_>, units: Units, ui: &mut egui::Ui) {
    let planar = a.model.planar;
    egui::Grid::new("nodes-table").striped(true).spacing([18.0, 4.0]).show(ui, |ui| {
        header(
            ui,
            &[
                "node",
                "support",
                "mass",
                "position",
                "displacement",
                "|displacement|",
                "reaction",
                "|reaction|",
            ],
        );
        for (i, (n, r)) in a.model.nodes.iter().zip(&a.eq.nodes).enumerate() {
            let support = if n.support.is_anchor() {
                "anchor"
            } else if a.model.has_reaction(i) {
                "guided"
            } else {
                "free"
            };
            ui.label(&n.id);
            ui.label(support);
            ui.label(units.show(Quantity::Mass, n.mass));
            ui.label(vec_text(units, Quantity::Length, &r.position, planar));
            ui.label(vec_text(units, Quantity::Length, &r.displacement, planar));
            ui.label(units.show(Quantity::Length, r.displacement.norm()));
            match r.reaction.filter(|_| a.model.has_reaction(i)) {
                Some(f) => {
                    ui.label(vec_text(units, Quantity::Force, &f, planar));
                    ui.label(units.show(Quantity::Force, f.norm()));
                }
                None => {
                    ui.label("—");
                    ui.label("—");
                }
            }
            ui.end_row();
        }
    });
}
