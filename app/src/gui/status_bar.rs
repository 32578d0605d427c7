//! The status bar: the last solve, a running task with its Cancel button, the last message,
//! the tool in use.

use eframe::egui::{self, RichText};

use super::RigApp;
use super::palette as pal;

pub fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    ui.horizontal(|ui| {
        match &app.solved {
            Some(s) => match &s.result {
                Ok(eq) => {
                    let state = if eq.stability.is_stable() { "stable" } else { "NOT STABLE" };
                    ui.label(format!(
                        "{} · {}, {} · residual {:.1e} · {:.1} ms",
                        state,
                        rigwright_report::format::count(eq.iterations, "iteration"),
                        rigwright_report::format::count(eq.load_steps, "load step"),
                        eq.residual.abs(),
                        s.elapsed.as_secs_f64() * 1e3
                    ));
                }
                Err(_) => {
                    ui.label(RichText::new("no equilibrium").color(pal::ALARM));
                }
            },
            None => {
                ui.label("not solved");
            }
        }
        if app.solver_busy() {
            ui.spinner();
            ui.label("solving…");
        }
        ui.separator();
        super::task::status(app, ui);
        if let Some((text, error)) = &app.message {
            let t = RichText::new(text);
            ui.label(if *error { t.color(pal::ALARM) } else { t });
        }
        ui.with_layout(egui::Layout::right_to_left(egui::Align::Center), |ui| {
            ui.label(format!("tool: {}", app.tool.label()));
        });
    });
}
