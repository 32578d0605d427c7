//! The About box (with the cautions) and the keyboard-shortcut overlay.

use eframe::egui::{self, RichText};

use super::{RigApp, Tool};

/// The cautions shown in the About box (from the product design, verbatim).
pub const CAUTION: &str = rigwright_core::CAUTION;

const SHORTCUTS: &[(&str, &str)] = &[
    ("Ctrl+N / Ctrl+O", "new / open project"),
    ("Ctrl+S / Ctrl+Shift+S", "save / save as"),
    ("Ctrl+Z", "undo"),
    ("Ctrl+Shift+Z or Ctrl+Y", "redo"),
    ("Delete", "delete the selection"),
    ("Esc", "cancel, back to Select"),
    ("Wheel", "zoom about the cursor"),
    ("Middle or right drag, Space + drag", "pan"),
    ("F", "fit the rig to the view"),
    ("1 / 2 / 3", "elevation / side / plan view"),
    ("F1 or ?", "this help"),
];

pub fn windows(app: &mut RigApp, ctx: &egui::Context) {
    egui::Window::new("About Rigwright")
        .open(&mut app.show_about)
        .collapsible(false)
        .resizable(false)
        .default_width(420.0)
        .show(ctx, |ui| {
            ui.heading("Rigwright");
            ui.label(format!("version {}", env!("CARGO_PKG_VERSION")));
            ui.label("Sketch, solve and size tensioned cable-and-spring rigs: large-displacement equilibrium, Pull and tangent stiffness.");
            ui.add_space(8.0);
            ui.label(RichText::new("Caution").strong());
            ui.label(CAUTION);
        });
    egui::Window::new("Keyboard shortcuts")
        .open(&mut app.show_help)
        .collapsible(false)
        .default_width(440.0)
        .show(ctx, |ui| {
            egui::Grid::new("shortcuts").striped(true).show(ui, |ui| {
                for (k, what) in SHORTCUTS {
                    ui.label(RichText::new(*k).monospace());
                    ui.label(*what);
                    ui.end_row();
                }
                for t in Tool::ALL {
                    ui.label(RichText::new(format!("{:?}", t.key())).monospace());
                    ui.label(format!("tool: {}", t.label()));
                    ui.end_row();
                }
            });
        });
}
