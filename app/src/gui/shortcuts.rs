//! Keyboard shortcuts: file and undo commands with Ctrl, the tools and the view planes by
//! single keys (not while a text field has the keyboard).

use eframe::egui;

use super::{Command, Plane, RigApp, Tool};

impl RigApp {
    pub(super) fn shortcuts(&mut self, ctx: &egui::Context) {
        use egui::{Key, KeyboardShortcut, Modifiers};
        let redo = KeyboardShortcut::new(Modifiers::COMMAND | Modifiers::SHIFT, Key::Z);
        let undo = KeyboardShortcut::new(Modifiers::COMMAND, Key::Z);
        let save_as = KeyboardShortcut::new(Modifiers::COMMAND | Modifiers::SHIFT, Key::S);
        let save = KeyboardShortcut::new(Modifiers::COMMAND, Key::S);
        let open = KeyboardShortcut::new(Modifiers::COMMAND, Key::O);
        let new = KeyboardShortcut::new(Modifiers::COMMAND, Key::N);
        let mut out = Vec::new();
        ctx.input_mut(|i| {
            // Longer combinations first, so Ctrl+Shift+Z is not taken as Ctrl+Z.
            for (s, c) in [(redo, Command::Redo), (undo, Command::Undo)] {
                if i.consume_shortcut(&s) {
                    out.push(c);
                }
            }
            if i.consume_shortcut(&KeyboardShortcut::new(Modifiers::COMMAND, Key::Y)) {
                out.push(Command::Redo);
            }
            if i.consume_shortcut(&save_as) {
                out.push(Command::SaveAsDialog);
            }
            if i.consume_shortcut(&save) {
                out.push(Command::Save);
            }
            if i.consume_shortcut(&open) {
                out.push(Command::OpenDialog);
            }
            if i.consume_shortcut(&new) {
                out.push(Command::New);
            }
        });
        self.commands.extend(out);
        if ctx.egui_wants_keyboard_input() {
            return;
        }
        ctx.input(|i| {
            if i.modifiers.command || i.modifiers.alt {
                return;
            }
            if i.key_pressed(Key::F1) || i.events.iter().any(|e| matches!(e, egui::Event::Text(t) if t == "?")) {
                self.show_help = !self.show_help;
            }
            if i.key_pressed(Key::Escape) {
                self.view.cancel();
                self.tool = Tool::Select;
                self.show_help = false;
            }
            if i.key_pressed(Key::Delete) || i.key_pressed(Key::Backspace) {
                self.commands.push(Command::DeleteSelection);
            }
            if i.key_pressed(Key::F) {
                self.commands.push(Command::FitView);
            }
            for (k, plane) in [(Key::Num1, Plane::Elevation), (Key::Num2, Plane::Side), (Key::Num3, Plane::Plan)] {
                if i.key_pressed(k) {
                    self.view.set_plane(plane);
                }
            }
            if !i.modifiers.shift {
                for t in Tool::ALL {
                    if i.key_pressed(t.key()) {
                        self.tool = t;
                        self.view.cancel();
                    }
                }
            }
        });
    }
}
