//! The question asked before a command would drop unsaved changes (New, Open, a sample,
//! Close): discard them, or keep editing.

use eframe::egui;

use super::{Command, RigApp};

impl RigApp {
    pub(super) fn discard_prompt(&mut self, ctx: &egui::Context) {
        if self.pending_discard.is_none() {
            return;
        }
        let name = self.doc.name();
        let mut out = None;
        egui::Modal::new(egui::Id::unique("discard-prompt")).show(ctx, |ui| {
            ui.heading("Unsaved changes");
            ui.label(format!("`{name}` has changes that are not saved. Discard them?"));
            ui.add_space(8.0);
            ui.horizontal(|ui| {
                if ui.button("Discard changes").clicked() {
                    out = Some(Command::Discard);
                }
                if ui.button("Keep editing").clicked() {
                    out = Some(Command::KeepEditing);
                }
            });
        });
        if let Some(c) = out {
            self.commands.push(c);
        }
    }
}
