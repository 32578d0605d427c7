//! The Pull curve tab of the Readouts: the restoring force of the last Pull and its
//! force–displacement curve beside the tangent prediction.

use eframe::egui::{self, RichText};
use egui_plot::{Legend, Line, LineStyle, Plot, PlotPoints};
use rigwright_core::Vec3;
use rigwright_report::units::Quantity;

use super::cells::vec_text;
use crate::gui::RigApp;
use crate::gui::palette as pal;

pub(super) fn ui(app: &RigApp, ui: &mut egui::Ui) {
    let units = app.settings.units;
    let Some(p) = &app.pull else {
        ui.label("Pick the Pull tool, then drag a free node: it is held at the cursor while the rest of the rig re-equilibrates.");
        return;
    };
    ui.horizontal_top(|ui| {
        ui.vertical(|ui| {
            ui.set_width(300.0);
            ui.label(RichText::new(format!("Pull at `{}`", p.node_id)).strong());
            let d = p.target - p.start;
            ui.label(format!("displacement {}", units.show(Quantity::Length, d.norm())));
            match (&p.failure, p.force) {
                (Some(f), _) => {
                    ui.label(RichText::new(format!("No equilibrium with the node held here: {f}")).color(pal::ALARM));
                }
                (None, Some(f)) => {
                    let r = -(f - p.f0.unwrap_or_else(Vec3::zeros));
                    ui.label(RichText::new(format!("Restoring force {}", units.show(Quantity::Force, r.norm()))).color(pal::PULL));
                    ui.label(format!("components {}", vec_text(units, Quantity::Force, &r, app.doc.model.planar)));
                }
                (None, None) => {
                    ui.label("Restoring force — (drag to pull)");
                }
            }
            if let Some(k) = &p.stiffness
                && d.norm() > 0.0
            {
                let dir = d / d.norm();
                ui.label(format!(
                    "tangent stiffness along the pull {}",
                    units.show(Quantity::Stiffness, k.along(&dir))
                ));
            }
            if !p.active {
                ui.label(RichText::new("released; the rig is back at its equilibrium").weak());
            }
        });
        let lu = Quantity::Length;
        let fu = Quantity::Force;
        let measured: Vec<[f64; 2]> = p
            .samples
            .iter()
            .map(|s| [units.to_display(lu, s[0]), units.to_display(fu, s[1])])
            .collect();
        let predicted: Vec<[f64; 2]> = p
            .samples
            .iter()
            .filter(|s| s[2].is_finite())
            .map(|s| [units.to_display(lu, s[0]), units.to_display(fu, s[2])])
            .collect();
        Plot::new("pull-plot")
            .legend(Legend::default())
            .x_axis_label(format!("displacement from start ({})", units.symbol(lu)))
            .y_axis_label(format!("holding force along the pull ({})", units.symbol(fu)))
            .y_axis_min_width(56.0)
            .show(ui, |plot| {
                plot.line(
                    Line::new("equilibrium (large displacement)", PlotPoints::from(measured))
                        .color(pal::PULL)
                        .width(2.0),
                );
                plot.line(
                    Line::new("tangent prediction from the start", PlotPoints::from(predicted))
                        .color(pal::STIFFNESS)
                        .style(LineStyle::dashed_loose()),
                );
            });
    });
}
