//! Commands: what the UI asks for, applied once per frame after every view is drawn (file I/O
//! happens only here), and the deletion of the selection they may ask for.

use std::path::PathBuf;

use rigwright_core::Project;
use rigwright_report::units::Units;

use super::files::file_stem;
use super::{Document, RigApp, Selection, export};

/// An edit of the document.
pub type EditFn = Box<dyn FnOnce(&mut Project)>;

/// Something the UI asks for; applied once per frame, after all views are drawn.
#[must_use]
pub enum Command {
    New,
    OpenDialog,
    Open(PathBuf),
    OpenSample(usize),
    Save,
    SaveAsDialog,
    /// Save to this path (no dialog).
    SaveTo(PathBuf),
    Undo,
    Redo,
    /// Change the document; edits with the same merge key in a row are one undo step.
    Edit {
        merge: Option<String>,
        apply: EditFn,
    },
    /// End the current merged edit (e.g. at the end of a drag).
    Seal,
    DeleteSelection,
    SetCase(usize),
    SetUnits(Units),
    FitView,
    /// The user confirmed discarding unsaved changes for the pending command.
    Discard,
    /// The user cancelled the pending command.
    KeepEditing,
    /// Let go of the pulled node: start a Pluck from the held shape.
    Pluck,
    /// Close the window (asks first when there are unsaved changes).
    Close,
    /// Write the Sheet, CSV or JSON of the open document (asks where).
    Export(export::ExportKind),
}

/// Queues an edit with a merge key, so typing or dragging in one field is one undo step.
pub(super) fn edit(app: &mut RigApp, key: String, f: impl FnOnce(&mut Project) + 'static) {
    app.queue(Command::Edit {
        merge: Some(key),
        apply: Box::new(f),
    });
}

impl RigApp {
    fn needs_discard_prompt(command: &Command) -> bool {
        matches!(
            command,
            Command::New | Command::OpenDialog | Command::Open(_) | Command::OpenSample(_) | Command::Close
        )
    }

    /// Applies the queued commands, in order.
    pub fn apply_commands(&mut self) {
        let commands = std::mem::take(&mut self.commands);
        for command in commands {
            if self.doc.dirty && Self::needs_discard_prompt(&command) {
                self.pending_discard = Some(Box::new(command));
                continue;
            }
            self.apply(command);
        }
    }

    fn apply(&mut self, command: Command) {
        match command {
            Command::New => {
                self.replace_document(Document::empty());
                self.settings.last_file = None;
                self.settings.last_sample = None;
            }
            Command::OpenDialog => {
                let picked = rfd::FileDialog::new().add_filter("Rig project", &["ron"]).pick_file();
                if let Some(path) = picked {
                    let _ = self.open_path(&path);
                }
            }
            Command::Open(path) => {
                let _ = self.open_path(&path);
            }
            Command::OpenSample(i) => self.open_sample(i),
            Command::Save => match self.doc.path.clone() {
                Some(p) => self.save_to(p),
                None => self.apply(Command::SaveAsDialog),
            },
            Command::SaveAsDialog => {
                let name = format!("{}{}", file_stem(&self.doc.project.title), rigwright_core::FILE_EXTENSION);
                let picked = rfd::FileDialog::new()
                    .add_filter("Rig project", &["ron"])
                    .set_file_name(name)
                    .save_file();
                if let Some(path) = picked {
                    self.save_to(path);
                }
            }
            Command::SaveTo(path) => self.save_to(path),
            Command::Undo => {
                self.doc.undo();
                self.clamp_selection();
            }
            Command::Redo => {
                self.doc.redo();
                self.clamp_selection();
            }
            Command::Edit { merge, apply } => {
                self.doc.edit(merge.as_deref(), apply);
                self.clamp_selection();
            }
            Command::Seal => self.doc.seal(),
            Command::DeleteSelection => self.delete_selection(),
            Command::SetCase(c) => {
                self.case = c;
                self.pull = None;
            }
            Command::SetUnits(u) => self.settings.units = u,
            Command::FitView => self.view.fit_next = true,
            Command::Discard => {
                if let Some(c) = self.pending_discard.take() {
                    self.doc.dirty = false;
                    self.apply(*c);
                }
            }
            Command::KeepEditing => self.pending_discard = None,
            Command::Close => self.close_now = true,
            Command::Pluck => self.start_pluck(),
            Command::Export(kind) => export::run(self, kind),
        }
    }

    fn clamp_selection(&mut self) {
        let p = &self.doc.project;
        self.boxed.retain(|&i| i < p.nodes.len());
        let ok = match self.selection {
            Selection::None => true,
            Selection::Node(i) => i < p.nodes.len(),
            Selection::Member(i) => i < p.members.len(),
            Selection::Load(i) => p.cases.get(self.case).is_some_and(|c| i < c.loads.len()),
        };
        if !ok {
            self.selection = Selection::None;
        }
        if self.case >= self.doc.model.cases.len() {
            self.case = 0;
        }
    }

    fn delete_selection(&mut self) {
        let case = self.case;
        if !self.boxed.is_empty() {
            let mut ids: Vec<String> = self
                .boxed
                .iter()
                .filter_map(|&i| self.doc.project.nodes.get(i).map(|n| n.id.clone()))
                .collect();
            ids.sort();
            self.boxed.clear();
            self.selection = Selection::None;
            self.doc.edit(None, move |p: &mut Project| {
                let gone = |id: &String| ids.binary_search(id).is_ok();
                p.nodes.retain(|n| !gone(&n.id));
                p.members.retain(|m| !gone(&m.ends.0) && !gone(&m.ends.1));
                for c in &mut p.cases {
                    c.loads.retain(|l| !gone(&l.node));
                }
            });
            self.clamp_selection();
            return;
        }
        let apply: EditFn = match self.selection {
            Selection::None => return,
            Selection::Node(i) => Box::new(move |p: &mut Project| {
                if i >= p.nodes.len() {
                    return;
                }
                let id = p.nodes.remove(i).id;
                p.members.retain(|m| m.ends.0 != id && m.ends.1 != id);
                for c in &mut p.cases {
                    c.loads.retain(|l| l.node != id);
                }
            }),
            Selection::Member(i) => Box::new(move |p: &mut Project| {
                if i < p.members.len() {
                    p.members.remove(i);
                }
            }),
            Selection::Load(i) => Box::new(move |p: &mut Project| {
                if let Some(c) = p.cases.get_mut(case)
                    && i < c.loads.len()
                {
                    c.loads.remove(i);
                }
            }),
        };
        self.selection = Selection::None;
        self.doc.edit(None, apply);
        self.clamp_selection();
    }
}
