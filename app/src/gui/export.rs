//! File menu actions that write result files: the Sheet (PDF), CSV tables and the JSON
//! result, each through a save dialog. Failures go to the status bar, never a crash.

use std::path::{Path, PathBuf};

use crate::sheet::{Paper, Sheet, SheetOptions, export};

use super::RigApp;

/// What to write.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ExportKind {
    /// The Sheet as PDF (A4 or Letter).
    Sheet(Paper),
    /// Members and nodes CSV.
    Csv,
    /// The full result as JSON.
    Json,
}

/// A file name from the document's file or title.
fn stem(app: &RigApp) -> String {
    if let Some(name) = app.doc.path.as_ref().and_then(|p| p.file_name()) {
        let name = name.to_string_lossy();
        return name.strip_suffix(rigwright_core::FILE_EXTENSION).unwrap_or(&name).to_string();
    }
    let t: String = app
        .doc
        .project
        .title
        .chars()
        .map(|c| if c.is_alphanumeric() || c == '-' { c } else { '-' })
        .collect();
    if t.trim_matches('-').is_empty() { "rig".into() } else { t }
}

/// The sheet content for the open document and its current load case.
pub fn build_sheet(app: &RigApp) -> Result<Sheet, String> {
    // The bytes on disk when they are what is shown, else the text as it would be saved.
    let saved = match (&app.doc.path, app.doc.dirty) {
        (Some(p), false) => std::fs::read(p).ok(),
        _ => None,
    };
    let unsaved = saved.is_none();
    let bytes = saved.unwrap_or_else(|| app.doc.project.to_ron().into_bytes());
    let options = SheetOptions {
        case: app.doc.model.cases.get(app.case).map(|c| c.name.clone()),
        stiffness: Vec::new(),
        info: Default::default(),
        file_name: app
            .doc
            .path
            .as_ref()
            .and_then(|p| p.file_name())
            .map(|n| n.to_string_lossy().into_owned()),
        unsaved,
    };
    Sheet::build(&app.doc.project, &bytes, &options)
}

fn save_dialog(name: String, filter: &str, ext: &str) -> Option<PathBuf> {
    rfd::FileDialog::new().add_filter(filter, &[ext]).set_file_name(name).save_file()
}

/// Writes `kind` for the open document to `path` (for the CSV, `path` is the members file;
/// the nodes file goes beside it). Returns what was written.
pub fn write(app: &RigApp, kind: ExportKind, path: &Path) -> Result<String, String> {
    let sheet = build_sheet(app)?;
    let put = |p: &Path, bytes: &[u8]| std::fs::write(p, bytes).map_err(|e| format!("could not write {}: {e}", p.display()));
    match kind {
        ExportKind::Sheet(paper) => {
            put(path, &sheet.to_pdf(paper)?)?;
            Ok(format!("Sheet written to {} ({})", path.display(), sheet.verdict()))
        }
        ExportKind::Json => {
            put(path, format!("{}\n", export::result_json(&sheet)).as_bytes())?;
            Ok(format!("Result written to {}", path.display()))
        }
        ExportKind::Csv => {
            put(path, export::members_csv(&sheet).as_bytes())?;
            let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
            let nodes_name = match name.strip_suffix("-members.csv") {
                Some(s) => format!("{s}-nodes.csv"),
                None => format!("{}-nodes.csv", name.strip_suffix(".csv").unwrap_or(&name)),
            };
            let nodes = path.with_file_name(nodes_name);
            match export::nodes_csv(&sheet) {
                Some(csv) => {
                    put(&nodes, csv.as_bytes())?;
                    Ok(format!("Members written to {}, nodes to {}", path.display(), nodes.display()))
                }
                None => Err(format!(
                    "Members written to {}; no nodes file: load case `{}` has no equilibrium",
                    path.display(),
                    sheet.case_name()
                )),
            }
        }
    }
}

/// Asks where to write, then writes; the outcome goes to the status bar.
pub fn run(app: &mut RigApp, kind: ExportKind) {
    let stem = stem(app);
    let picked = match kind {
        ExportKind::Sheet(_) => save_dialog(format!("{stem}-sheet.pdf"), "PDF", "pdf"),
        ExportKind::Csv => save_dialog(format!("{stem}-members.csv"), "CSV", "csv"),
        ExportKind::Json => save_dialog(format!("{stem}-result.json"), "JSON", "json"),
    };
    let Some(path) = picked else { return };
    app.message = Some(match write(app, kind, &path) {
        Ok(text) => (text, false),
        Err(e) => (format!("Nothing exported: {e}"), true),
    });
}
