//! Project files: opening a file or a sample, saving (crash-safe, through the core) and the
//! recent files.

use std::path::{Path, PathBuf};

use rigwright_core::Project;
use rigwright_report::units::Units;

use super::{Document, RigApp, Selection, samples};

/// Recent files kept.
const RECENT: usize = 8;

impl RigApp {
    pub(super) fn open_sample(&mut self, index: usize) {
        let Some((name, _, text)) = samples::SAMPLES.get(index) else {
            return;
        };
        match Project::from_ron(text)
            .map_err(|e| e.to_string())
            .and_then(|p| Document::open(p, None))
        {
            Ok(doc) => {
                self.replace_document(doc);
                self.settings.last_sample = Some(index);
                self.settings.last_file = None;
                self.message = Some((format!("Opened sample `{name}`"), false));
            }
            Err(e) => self.message = Some((format!("sample {name}: {e}"), true)),
        }
    }

    pub(super) fn open_path(&mut self, path: &Path) -> Result<(), String> {
        // Absolute, so the next start finds it from any working directory.
        let absolute = std::fs::canonicalize(path).unwrap_or_else(|_| path.to_path_buf());
        let path = absolute.as_path();
        let result = Project::load(path)
            .map_err(|e| e.to_string())
            .and_then(|p| Document::open(p, Some(path.to_path_buf())));
        match result {
            Ok(doc) => {
                self.replace_document(doc);
                self.settings.last_file = Some(path.to_path_buf());
                self.settings.last_sample = None;
                self.remember(path);
                self.message = Some((format!("Opened {}", path.display()), false));
                Ok(())
            }
            Err(e) => {
                let text = format!("Could not open {}: {e}. The current project is unchanged.", path.display());
                self.message = Some((text.clone(), true));
                Err(text)
            }
        }
    }

    pub(super) fn replace_document(&mut self, doc: Document) {
        self.settings.units = match doc.project.units {
            rigwright_core::model::UnitSystem::SI => self.settings.units,
            rigwright_core::model::UnitSystem::US => Units::Us,
        };
        self.doc = doc;
        self.case = 0;
        self.selection = Selection::None;
        self.pull = None;
        self.solved = None;
        self.requested = None;
        self.view.choose_plane(&self.doc.project);
    }

    fn remember(&mut self, path: &Path) {
        self.settings.recent.retain(|p| p != path);
        self.settings.recent.insert(0, path.to_path_buf());
        self.settings.recent.truncate(RECENT);
    }

    pub(super) fn save_to(&mut self, path: PathBuf) {
        // Temporary file, sync, backup, rename: a failed or interrupted save never leaves half a file.
        match self.doc.project.save(&path) {
            Ok(()) => {
                self.remember(&path);
                self.settings.last_file = Some(path.clone());
                self.settings.last_sample = None;
                self.message = Some((format!("Saved {}", path.display()), false));
                self.doc.saved(path);
            }
            Err(e) => self.message = Some((format!("Could not save: {e}"), true)),
        }
    }
}

pub(super) fn file_stem(title: &str) -> String {
    let s: String = title
        .chars()
        .map(|c| if c.is_alphanumeric() { c.to_ascii_lowercase() } else { '-' })
        .collect();
    let s = s.trim_matches('-').to_string();
    if s.is_empty() { "rig".into() } else { s }
}
