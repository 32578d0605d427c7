//! Readouts: the results area under the Rig view, one tab per kind of result.
//!
//! Responsible for the tab strip and for showing nothing as a result unless the last solve
//! converged to a stable state. Each tab is its own file beside this one; a further tab is a
//! variant of [`ReadoutTab`] (`tab.rs`), its file, and an arm of the `match` in [`ui`].

mod cells;
mod checks;
mod members;
mod modes;
mod nodes;
mod path;
mod pluck;
mod pull;
mod stiffness;
mod sweep;
mod tab;

use eframe::egui::{self, RichText};

use crate::gui::RigApp;
use crate::gui::palette as pal;

pub use tab::ReadoutTab;

pub fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    ui.add_space(4.0);
    ui.horizontal(|ui| {
        ui.label(RichText::new("Readouts").strong());
        ui.separator();
        for tab in ReadoutTab::ALL {
            if ui
                .selectable_label(app.readout_tab == tab, tab.label())
                .on_hover_text(tab.tip())
                .clicked()
            {
                app.readout_tab = tab;
            }
        }
        ui.separator();
        if let Some(c) = app.doc.model.cases.get(app.case) {
            ui.label(format!("load case: {}", c.name));
        }
    });
    ui.separator();
    match app.readout_tab {
        ReadoutTab::Pull => return pull::ui(app, ui),
        ReadoutTab::Pluck => return pluck::ui(app, ui),
        ReadoutTab::Modes => return modes::ui(app, ui),
        ReadoutTab::Checks => return checks::ui(app, ui),
        ReadoutTab::Sweep => return sweep::ui(app, ui),
        ReadoutTab::Path => return path::ui(app, ui),
        _ => {}
    }
    let Some(answer) = app.answer() else {
        match app.diagnostic() {
            Some(d) => ui.label(RichText::new(d).color(pal::ALARM)),
            None => ui.label("Nothing solved yet."),
        };
        return;
    };
    let units = app.settings.units;
    egui::ScrollArea::both()
        .auto_shrink([false, false])
        .show(ui, |ui| match app.readout_tab {
            ReadoutTab::Members => members::ui(&answer, units, ui),
            ReadoutTab::Nodes => nodes::ui(&answer, units, ui),
            ReadoutTab::Stiffness => stiffness::ui(app, units, ui),
            ReadoutTab::Pull | ReadoutTab::Modes | ReadoutTab::Pluck | ReadoutTab::Checks | ReadoutTab::Sweep | ReadoutTab::Path => {}
        });
}
