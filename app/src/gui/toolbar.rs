//! The toolbar: the tools, the load case, the view plane and the view toggles. It only switches
//! modes or issues commands.

use eframe::egui;
use rigwright_report::plane::Plane;
use rigwright_report::units::Units;

use super::{Command, RigApp, Tool};

pub fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    ui.add_space(2.0);
    ui.horizontal_wrapped(|ui| {
        for (k, tool) in Tool::ALL.into_iter().enumerate() {
            if k == 2 {
                ui.separator();
            }
            if ui
                .selectable_label(app.tool == tool, tool.label())
                .on_hover_text(tool.tip())
                .clicked()
            {
                app.tool = tool;
                app.view.cancel();
            }
        }
        ui.separator();
        ui.label("Load case");
        let cases: Vec<String> = app.doc.model.cases.iter().map(|c| c.name.clone()).collect();
        let current = cases.get(app.case).cloned().unwrap_or_default();
        let mut pick = app.case;
        egui::ComboBox::from_id_salt("case")
            .selected_text(current)
            .show_ui(ui, |ui| {
                for (i, c) in cases.iter().enumerate() {
                    ui.selectable_value(&mut pick, i, c);
                }
            })
            .response
            .on_hover_text("The load case solved and shown");
        if pick != app.case {
            app.queue(Command::SetCase(pick));
        }
        ui.separator();
        let mut plane = app.view.plane;
        egui::ComboBox::from_id_salt("plane")
            .selected_text(plane.label())
            .show_ui(ui, |ui| {
                for p in Plane::ALL {
                    ui.selectable_value(&mut plane, p, p.label());
                }
            })
            .response
            .on_hover_text("Which two axes the Rig view shows [1, 2, 3]");
        app.view.set_plane(plane);
        ui.toggle_value(&mut app.settings.snap, "Snap")
            .on_hover_text("Snap new and dragged nodes to the grid");
        ui.toggle_value(&mut app.settings.force_labels, "Labels")
            .on_hover_text("Write forces and masses on the Rig view");
        ui.toggle_value(&mut app.settings.node_ids, "Ids")
            .on_hover_text("Write node ids beside the nodes (the names the Sweep and the command line use)");
        if ui.button("Fit").on_hover_text("Fit the rig into the Rig view [F]").clicked() {
            app.queue(Command::FitView);
        }
        if ui
            .button(if app.settings.units == Units::Si { "SI" } else { "US" })
            .on_hover_text("Switch units: SI (m, N, kg) or US customary (ft, lbf, lb)")
            .clicked()
        {
            let u = if app.settings.units == Units::Si { Units::Us } else { Units::Si };
            app.queue(Command::SetUnits(u));
        }
    });
    ui.add_space(2.0);
}
