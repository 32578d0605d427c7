//! The Pluck tab of the Readouts: the motion's controls, its frequencies and energy, and the
//! time history of the pulled node.

use eframe::egui::{self, RichText};
use egui_plot::{Legend, Line, Plot, PlotPoints};
use rigwright_report::units::Quantity;

use crate::gui::RigApp;
use crate::gui::background::progress_row;
use crate::gui::palette as pal;

/// The Pluck tab of the Readouts.
pub(super) fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    let units = app.settings.units;
    if let Some(job) = &app.pluck_job {
        let text = format!(
            "Preparing the Pluck of this large rig (the equilibrium it vibrates about and its lowest mode)… {:.1} s",
            job.started.elapsed().as_secs_f64()
        );
        if progress_row(ui, text, "Do not start this Pluck") {
            app.pluck_job = None;
        }
        return;
    }
    let Some(p) = app.pluck.as_mut() else {
        ui.label("No Pluck running. Choose the Pull tool, drag a free node and let go: the rig vibrates from where you released it.");
        return;
    };
    let mut stop = false;
    ui.horizontal(|ui| {
        let label = if p.playing { "Pause" } else { "Play" };
        if ui.button(label).on_hover_text("Pause or resume the motion").clicked() {
            p.playing = !p.playing;
        }
        ui.label("Speed");
        ui.add(egui::Slider::new(&mut p.speed, 0.05..=2.0).logarithmic(true).suffix(" ×"))
            .on_hover_text("Rig seconds per second of wall-clock time");
        if ui
            .button("Stop")
            .on_hover_text("End the Pluck and show the equilibrium again")
            .clicked()
        {
            stop = true;
        }
    });
    ui.separator();
    ui.columns(2, |cols| {
        let ui = &mut cols[0];
        ui.label(RichText::new(format!("Pluck of `{}`", p.node_id)).strong());
        ui.label(format!("time {:.3} s, step {:.2e} s", p.motion.time(), p.motion.settings().dt));
        match p.dominant_hz {
            Some(f) => ui.label(format!("dominant frequency {f:.3} Hz")),
            None => ui.label("dominant frequency: needs a longer record"),
        };
        if let Some(f) = p.linear_hz {
            ui.label(format!("lowest linear natural frequency {f:.3} Hz"));
        }
        let e = p.motion.energy();
        ui.label(format!(
            "kinetic {}, strain + load {}",
            joules(e.kinetic),
            joules(e.strain + e.load)
        ));
        ui.label(format!("energy error {:.1e} of the energy in play", p.energy_error));
        ui.label(format!("cable slack events {}", p.motion.slack_events()));
        if !p.cables.is_empty() {
            let links: usize = p.cables.iter().map(|c| c.1).sum();
            ui.label(format!(
                "{} sagging cable{} cut into {links} links so that their own mass moves",
                p.cables.len(),
                if p.cables.len() == 1 { "" } else { "s" }
            ))
            .on_hover_text(
                p.cables
                    .iter()
                    .map(|(id, n)| format!("{id}: {n} links"))
                    .collect::<Vec<_>>()
                    .join("\n"),
            );
        }
        if let Some(note) = &p.note {
            ui.colored_label(pal::ALARM, format!("Note: {note}"));
        }
        let u = p.motion.positions()[p.node] - p.about[p.node];
        ui.label(format!(
            "displacement of `{}` {}",
            p.node_id,
            units.show(Quantity::Length, u.norm())
        ));
        if let Some(f) = &p.failure {
            ui.colored_label(pal::ALARM, format!("stopped: {f}"));
        }
        let ui = &mut cols[1];
        let pts: Vec<[f64; 2]> = p.history.iter().map(|h| [h[0], units.to_display(Quantity::Length, h[1])]).collect();
        Plot::new("pluck-history")
            .legend(Legend::default())
            .x_axis_label("time (s)")
            .y_axis_label(format!("displacement along the pull ({})", units.symbol(Quantity::Length)))
            .show(ui, |plot| {
                plot.line(Line::new(format!("`{}`", p.node_id), PlotPoints::from(pts)).color(pal::PULL))
            });
    });
    if stop {
        app.pluck = None;
    }
}

fn joules(e: f64) -> String {
    format!("{} J", rigwright_report::units::significant(e, 4))
}
