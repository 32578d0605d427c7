//! The fields of the Properties panel: a number in display units with its unit, a text.

use eframe::egui::{self, DragValue};
use rigwright_report::units::{Quantity, Units};

/// A number field in display units; returns the new SI value when the user changed it.
pub(super) fn quantity(ui: &mut egui::Ui, label: &str, si: f64, q: Quantity, units: Units) -> Option<f64> {
    let mut v = units.to_display(q, si);
    let speed = (v.abs() * 0.005).max(0.001);
    let mut out = None;
    let name = ui.label(label).id;
    ui.horizontal(|ui| {
        let r = ui.add(DragValue::new(&mut v).speed(speed).max_decimals(6)).labelled_by(name);
        ui.label(units.symbol(q));
        if r.changed() && v.is_finite() {
            out = Some(units.to_si(q, v));
        }
    });
    ui.end_row();
    out
}

/// A text field; returns the new text when changed.
pub(super) fn text(ui: &mut egui::Ui, label: &str, value: &str) -> Option<String> {
    let mut v = value.to_string();
    let name = ui.label(label).id;
    let r = ui.add(egui::TextEdit::singleline(&mut v).desired_width(150.0)).labelled_by(name);
    ui.end_row();
    r.changed().then_some(v)
}
