//! Menu bar, toolbar and status bar: they only issue commands or switch modes.

use eframe::egui::{self, RichText};

use super::export::ExportKind;
use super::palette as pal;
use super::samples::SAMPLES;
use super::{Command, RigApp, Tool};
use rigwright_report::Paper;
use rigwright_report::plane::Plane;
use rigwright_report::units::Units;

pub fn menu_bar(app: &mut RigApp, ui: &mut egui::Ui) {
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

pub fn toolbar(app: &mut RigApp, ui: &mut egui::Ui) {
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

pub fn status_bar(app: &mut RigApp, ui: &mut egui::Ui) {
    ui.horizontal(|ui| {
        match &app.solved {
            Some(s) => match &s.result {
                Ok(eq) => {
                    let state = if eq.stability.is_stable() { "stable" } else { "NOT STABLE" };
                    ui.label(format!(
                        "{} · {} iterations, {} load step(s) · residual {:.1e} · {:.1} ms",
                        state,
                        eq.iterations,
                        eq.load_steps,
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
