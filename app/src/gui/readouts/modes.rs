//! The Modes tab of the Readouts: the natural frequencies, periods and effective masses about
//! the equilibrium, each mode with its Animate button.

use eframe::egui::{self, RichText};
use rigwright_report::units::{Quantity, Units};

use crate::gui::RigApp;
use crate::gui::background::progress_row;
use crate::gui::modes::{ModesState, refresh_modes};
use crate::gui::palette as pal;

/// The Modes tab of the Readouts.
pub(super) fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    refresh_modes(app);
    let units: Units = app.settings.units;
    let sagging = app.answer().is_some_and(|a| a.model.members.iter().any(|m| m.sags()));
    if let Some(job) = &app.modes_job {
        let key = job.key;
        let text = format!(
            "Computing the natural modes of this large rig… {:.1} s, {} Lanczos blocks",
            job.started.elapsed().as_secs_f64(),
            job.steps_done()
        );
        if progress_row(ui, text, "Stop computing the modes") {
            app.modes_job = None;
            app.modes = Some(ModesState {
                key,
                result: Err("cancelled".into()),
                animate: None,
                clock: 0.0,
                cancelled: true,
            });
        }
        return;
    }
    let Some(state) = app.modes.as_mut() else {
        ui.label("No stable equilibrium: natural frequencies exist only about a stable state.");
        return;
    };
    if state.cancelled {
        ui.horizontal(|ui| {
            ui.label("The computation of the natural modes was cancelled.");
            if ui
                .button("Compute the modes")
                .on_hover_text("Start computing the modes again")
                .clicked()
            {
                app.modes = None;
            }
        });
        return;
    }
    let list = match &state.result {
        Ok(m) => m,
        Err(e) => {
            ui.colored_label(pal::ALARM, e);
            return;
        }
    };
    let mass_unit = units.symbol(Quantity::Mass);
    let mut choice = state.animate;
    let cables = !list.cables.is_empty();
    let mut links = app.settings.cable_links;
    if sagging {
        ui.horizontal(|ui| {
            let mut auto = links.is_none();
            if ui
                .checkbox(&mut auto, "Cable links chosen from the frequencies")
                .on_hover_text("Each sagging cable is cut into links so that its own mass vibrates; untick to set how many (1 lumps its mass at its ends)")
                .changed()
            {
                links = if auto { None } else { Some(list.cables.first().map_or(16, |c| c.links)) };
            }
            if let Some(n) = links.as_mut() {
                ui.add(egui::DragValue::new(n).range(1..=rigwright_core::dynamics::subdivide::MAX_LINKS).suffix(" links per cable"));
            }
        });
    }
    if cables {
        let links: usize = list.cables.iter().map(|c| c.links).sum();
        ui.label(format!(
            "{} sagging cable{} cut into {links} links so that their own mass vibrates; \"in the cables\" is each mode's share of energy there",
            list.cables.len(),
            if list.cables.len() == 1 { "" } else { "s" }
        ));
    }
    if let Some(note) = &list.note {
        ui.colored_label(pal::ALARM, format!("Note: {note}"));
    }
    egui::ScrollArea::vertical().show(ui, |ui| {
        egui::Grid::new("modes-table").striped(true).show(ui, |ui| {
            for h in [
                "mode",
                "frequency (Hz)",
                "period (s)",
                &format!("effective mass x, y, z ({mass_unit})"),
                if cables { "in the cables (%)" } else { "" },
                "",
            ] {
                ui.label(RichText::new(h).strong());
            }
            ui.end_row();
            for (k, m) in list.modes.iter().enumerate() {
                ui.label(format!("{}", k + 1));
                ui.label(format!("{:.4}", m.frequency_hz));
                ui.label(format!("{:.5}", m.period_s));
                let em = m.effective_mass.map(|v| units.to_display(Quantity::Mass, v));
                ui.label(format!("{:.2}, {:.2}, {:.2}", em[0], em[1], em[2]));
                ui.label(if cables {
                    format!("{:.1}", 100.0 * m.cable_share)
                } else {
                    String::new()
                });
                let on = choice == Some(k);
                if ui
                    .selectable_label(on, if on { "Animating" } else { "Animate" })
                    .on_hover_text("Show this mode shape moving on the Rig view")
                    .clicked()
                {
                    choice = if on { None } else { Some(k) };
                }
                ui.end_row();
            }
        });
    });
    if choice != state.animate {
        state.animate = choice;
        state.clock = 0.0;
    }
    if links != app.settings.cable_links {
        // Computed again with the new links.
        app.settings.cable_links = links;
        app.modes = None;
        app.modes_job = None;
    }
}
