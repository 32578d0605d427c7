//! The menu bar: File, Edit, View, Units, Samples, Help. It only issues commands or switches
//! modes.

use eframe::egui;
use rigwright_report::Paper;
use rigwright_report::plane::Plane;
use rigwright_report::units::Units;

use super::export::ExportKind;
use super::samples::SAMPLES;
use super::{Command, RigApp};

pub fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    egui::MenuBar::new().ui(ui, |ui| {
        ui.menu_button("File", |ui| {
            if ui.button("New").on_hover_text("Start an empty rig [Ctrl+N]").clicked() {
                app.queue(Command::New);
            }
            if ui.button("Open…").on_hover_text("Open a .rig.ron project [Ctrl+O]").clicked() {
                app.queue(Command::OpenDialog);
            }
            ui.menu_button("Open recent", |ui| {
                if app.settings.recent.is_empty() {
                    ui.label("no recent files");
                }
                for path in app.settings.recent.clone() {
                    if ui.button(path.display().to_string()).clicked() {
                        app.queue(Command::Open(path));
                    }
                }
            });
            ui.separator();
            if ui.button("Save").on_hover_text("Save the project [Ctrl+S]").clicked() {
                app.queue(Command::Save);
            }
            if ui
                .button("Save As…")
                .on_hover_text("Save under a new name [Ctrl+Shift+S]")
                .clicked()
            {
                app.queue(Command::SaveAsDialog);
            }
            ui.separator();
            ui.menu_button("Print Sheet…", |ui| {
                for paper in [Paper::A4, Paper::Letter] {
                    if ui
                        .button(format!("{} (PDF)…", paper.name()))
                        .on_hover_text("Write the printable summary of the current load case as a PDF")
                        .clicked()
                    {
                        app.queue(Command::Export(ExportKind::Sheet(paper)));
                    }
                }
            });
            if ui
                .button("Export CSV…")
                .on_hover_text("Members and nodes tables, SI units (nodes for the current load case)")
                .clicked()
            {
                app.queue(Command::Export(ExportKind::Csv));
            }
            if ui
                .button("Export JSON…")
                .on_hover_text("The full result of every load case and every check, SI units")
                .clicked()
            {
                app.queue(Command::Export(ExportKind::Json));
            }
        });
        ui.menu_button("Edit", |ui| {
            if ui
                .add_enabled(app.doc.can_undo(), egui::Button::new("Undo"))
                .on_hover_text("Ctrl+Z")
                .clicked()
            {
                app.queue(Command::Undo);
            }
            if ui
                .add_enabled(app.doc.can_redo(), egui::Button::new("Redo"))
                .on_hover_text("Ctrl+Shift+Z")
                .clicked()
            {
                app.queue(Command::Redo);
            }
            ui.separator();
            if ui.button("Delete selection").on_hover_text("Delete").clicked() {
                app.queue(Command::DeleteSelection);
            }
        });
        ui.menu_button("View", |ui| {
            for (k, plane) in Plane::ALL.into_iter().enumerate() {
                if ui
                    .selectable_label(app.view.plane == plane, plane.label())
                    .on_hover_text(format!("[{}]", k + 1))
                    .clicked()
                {
                    app.view.set_plane(plane);
                }
            }
            ui.separator();
            if ui.button("Fit rig to view").on_hover_text("[F]").clicked() {
                app.queue(Command::FitView);
            }
            ui.checkbox(&mut app.settings.drawn_geometry, "Drawn geometry (faint)");
            ui.checkbox(&mut app.settings.force_labels, "Force labels");
            ui.checkbox(&mut app.settings.node_ids, "Node ids");
            ui.checkbox(&mut app.settings.sag_dimensions, "Sag dimensions")
                .on_hover_text("Dimension the largest distance of each sagging cable from its chord");
            ui.checkbox(&mut app.settings.reactions, "Reaction arrows");
            ui.checkbox(&mut app.settings.snap, "Snap to grid");
        });
        ui.menu_button("Units", |ui| {
            for u in [Units::Si, Units::Us] {
                if ui.selectable_label(app.settings.units == u, u.name()).clicked() {
                    app.queue(Command::SetUnits(u));
                }
            }
        });
        ui.menu_button("Samples", |ui| {
            for (i, (name, file, _)) in SAMPLES.iter().enumerate() {
                if ui.button(*name).on_hover_text(*file).clicked() {
                    app.queue(Command::OpenSample(i));
                }
            }
        });
        ui.menu_button("Help", |ui| {
            if ui.button("Keyboard shortcuts").on_hover_text("F1 or ?").clicked() {
                app.show_help = true;
            }
            if ui.button("About Rigwright").clicked() {
                app.show_about = true;
            }
        });
    });
}
