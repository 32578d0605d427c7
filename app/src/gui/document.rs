//! The open project: the `Project` document, its file, undo history and last valid model.
//!
//! Responsible for edits (every edit snapshots the document for undo), validation after each
//! edit, and the dirty flag. Not responsible for file dialogs or solving.

use std::path::PathBuf;
use std::sync::Arc;

use rigwright_core::{Model, Project};

/// Undo snapshots kept.
const HISTORY: usize = 200;

/// The open project.
pub struct Document {
    /// The document as the user edits it (may be invalid).
    pub project: Project,
    /// Where it was loaded from or last saved to.
    pub path: Option<PathBuf>,
    /// Unsaved changes exist.
    pub dirty: bool,
    /// The model of the last valid state of the document.
    pub model: Arc<Model>,
    /// Why the current document is not valid (the model above is then older), one problem a line.
    pub problems: Option<String>,
    /// A number no other state of any document in this process has: taken afresh at every
    /// change and for every document opened, so work keyed by it can never be applied to
    /// another document that happens to have made as many edits.
    pub revision: u64,
    undo: Vec<Project>,
    redo: Vec<Project>,
    /// Key of the last edit; an edit with the same key merges into it (one undo step per drag).
    merge_key: Option<String>,
}

/// The next unused document revision.
fn fresh_revision() -> u64 {
    static NEXT: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(1);
    NEXT.fetch_add(1, std::sync::atomic::Ordering::Relaxed)
}

impl Document {
    /// A document for `project`. Fails when the project is not valid: a file that cannot be
    /// analysed is refused so the current project stays open.
    pub fn open(project: Project, path: Option<PathBuf>) -> Result<Self, String> {
        let model = project.validate().map_err(|e| e.to_string())?;
        Ok(Document {
            project,
            path,
            dirty: false,
            model: Arc::new(model),
            problems: None,
            revision: fresh_revision(),
            undo: Vec::new(),
            redo: Vec::new(),
            merge_key: None,
        })
    }

    /// An empty document. An empty rig is valid (nothing to solve).
    pub fn empty() -> Self {
        Self::open(Project::new("Untitled rig"), None).expect("an empty project is valid")
    }

    /// Applies an edit. Edits with the same `merge` key in a row share one undo step.
    pub fn edit(&mut self, merge: Option<&str>, apply: impl FnOnce(&mut Project)) {
        let before = self.project.clone();
        apply(&mut self.project);
        if self.project == before {
            return;
        }
        let merging = merge.is_some() && merge == self.merge_key.as_deref();
        if !merging {
            self.undo.push(before);
            if self.undo.len() > HISTORY {
                self.undo.remove(0);
            }
        }
        self.merge_key = merge.map(str::to_string);
        self.redo.clear();
        self.changed();
    }

    /// Ends merging: the next edit gets its own undo step.
    pub fn seal(&mut self) {
        self.merge_key = None;
    }

    pub fn can_undo(&self) -> bool {
        !self.undo.is_empty()
    }

    pub fn can_redo(&self) -> bool {
        !self.redo.is_empty()
    }

    pub fn undo(&mut self) {
        if let Some(p) = self.undo.pop() {
            self.redo.push(std::mem::replace(&mut self.project, p));
            self.merge_key = None;
            self.changed();
        }
    }

    pub fn redo(&mut self) {
        if let Some(p) = self.redo.pop() {
            self.undo.push(std::mem::replace(&mut self.project, p));
            self.merge_key = None;
            self.changed();
        }
    }

    /// Marks the document saved at `path`.
    pub fn saved(&mut self, path: PathBuf) {
        self.path = Some(path);
        self.dirty = false;
    }

    /// File name for the title bar.
    pub fn name(&self) -> String {
        match &self.path {
            Some(p) => p.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default(),
            None if self.project.title.is_empty() => "Untitled rig".into(),
            None => self.project.title.clone(),
        }
    }

    fn changed(&mut self) {
        self.dirty = true;
        self.revision = fresh_revision();
        match self.project.validate() {
            Ok(m) => {
                self.model = Arc::new(m);
                self.problems = None;
            }
            Err(e) => self.problems = Some(e.to_string()),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use rigwright_core::model::NodeDoc;

    fn anchor(id: &str, x: f64) -> NodeDoc {
        NodeDoc {
            id: id.into(),
            at: (x, 0.0, 0.0),
            mass: 0.0,
            fixed: [true; 3],
        }
    }

    #[test]
    fn undo_restores_the_document_and_redo_reapplies_it() {
        let mut d = Document::empty();
        d.edit(None, |p| p.nodes.push(anchor("a", 0.0)));
        d.edit(None, |p| p.nodes.push(anchor("b", 1.0)));
        assert_eq!(d.project.nodes.len(), 2);
        d.undo();
        assert_eq!(d.project.nodes.len(), 1);
        d.redo();
        assert_eq!(d.project.nodes.len(), 2);
    }

    #[test]
    fn edits_with_one_merge_key_are_one_undo_step() {
        let mut d = Document::empty();
        d.edit(None, |p| p.nodes.push(anchor("a", 0.0)));
        for i in 1..5 {
            d.edit(Some("drag"), |p| p.nodes[0].at.0 = i as f64);
        }
        d.undo();
        assert_eq!(d.project.nodes[0].at.0, 0.0);
    }

    #[test]
    fn an_invalid_edit_keeps_the_last_valid_model_and_says_why() {
        let mut d = Document::empty();
        d.edit(None, |p| p.nodes.push(anchor("a", 0.0)));
        d.edit(None, |p| {
            p.nodes.push(NodeDoc {
                id: "m".into(),
                at: (1.0, 0.0, 0.0),
                mass: 1.0,
                fixed: [false; 3],
            })
        });
        assert_eq!(d.model.nodes.len(), 1);
        assert!(d.problems.as_deref().unwrap_or("").contains("node `m`"));
    }
}
