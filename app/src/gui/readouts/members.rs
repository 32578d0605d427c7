//! The Members tab of the Readouts: force, length, strain and state of every member.

use eframe::egui;
use rigwright_report::units::{Quantity, Units, significant};

use super::cells::header;
use crate::gui::Answer;

pub(super) fn ui(a: &Answer<'_>, units: Units, ui: &mut egui::Ui) {
    let l = units.symbol(Quantity::Length);
    let f = units.symbol(Quantity::Force);
    egui::Grid::new("members-table").striped(true).spacing([18.0, 4.0]).show(ui, |ui| {
        header(
            ui,
            &[
                "member",
                "kind",
                "state",
                &format!("force ({f})"),
                &format!("length ({l})"),
                &format!("unstressed ({l})"),
                "strain (%)",
            ],
        );
        for r in &a.eq.members {
            let state = if r.slack {
                "slack"
            } else if r.force > 0.0 {
                "tension"
            } else if r.force < 0.0 {
                "compression"
            } else {
                "unloaded"
            };
            ui.label(&r.id);
            ui.label(r.kind.name());
            ui.label(state);
            ui.label(units.show(Quantity::Force, r.force));
            ui.label(units.show(Quantity::Length, r.length));
            ui.label(units.show(Quantity::Length, r.unstressed_length));
            ui.label(format!("{} %", significant(r.strain * 100.0, 4)));
            ui.end_row();
        }
    });
}
