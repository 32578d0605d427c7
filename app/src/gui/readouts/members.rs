//! The Members tab of the Readouts: force, length, strain and state of every member, and for
//! the cables that sag under their own weight their end tensions, horizontal tension, sag and
//! end angles.

use eframe::egui;
use rigwright_report::units::{Quantity, Units, significant};

use super::cells::header;
use crate::gui::Answer;

pub(super) fn ui(a: &Answer<'_>, units: Units, ui: &mut egui::Ui) {
    let l = units.symbol(Quantity::Length);
    let f = units.symbol(Quantity::Force);
    let sagging = a.eq.members.iter().any(|r| r.sag.is_some());
    egui::Grid::new("members-table").striped(true).spacing([18.0, 4.0]).show(ui, |ui| {
        let mut columns = vec![
            "member".to_string(),
            "kind".into(),
            "state".into(),
            format!("force ({f})"),
            format!("length ({l})"),
            format!("unstressed ({l})"),
            "strain (%)".into(),
        ];
        if sagging {
            columns.extend([
                format!("tension at a / b ({f})"),
                format!("horizontal ({f})"),
                format!("sag ({l})"),
                format!("mid-span sag ({l})"),
                "angle at a / b (°)".into(),
            ]);
        }
        let columns: Vec<&str> = columns.iter().map(String::as_str).collect();
        header(ui, &columns);
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
            if let Some(g) = &r.sag {
                ui.label(format!(
                    "{} / {}",
                    units.show(Quantity::Force, g.tension_a),
                    units.show(Quantity::Force, g.tension_b)
                ));
                ui.label(units.show(Quantity::Force, g.horizontal));
                ui.label(units.show(Quantity::Length, g.sag));
                ui.label(units.show(Quantity::Length, g.mid_span_sag));
                ui.label(format!("{:.1} / {:.1}", g.angle_a.to_degrees(), g.angle_b.to_degrees()));
            } else if sagging {
                for _ in 0..5 {
                    ui.label("");
                }
            }
            ui.end_row();
        }
    });
}
