//! Pieces the Readouts tables share: a row of column headings, a vector with its unit.

use eframe::egui::{self, RichText};
use rigwright_core::Vec3;
use rigwright_report::units::{Quantity, Units, significant};

pub(super) fn header(ui: &mut egui::Ui, cols: &[&str]) {
    for c in cols {
        ui.label(RichText::new(*c).strong());
    }
    ui.end_row();
}

pub(super) fn vec_text(units: Units, q: Quantity, v: &Vec3, planar: bool) -> String {
    let n = if planar { 2 } else { 3 };
    let parts: Vec<String> = (0..n).map(|k| significant(units.to_display(q, v[k]), 4)).collect();
    format!("({}) {}", parts.join(", "), units.symbol(q))
}
