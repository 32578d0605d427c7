//! File menu actions that write result files: the Sheet (PDF), CSV tables and the JSON
//! result, each through a save dialog. Failures go to the status bar, never a crash.

use std::path::{Path, PathBuf};

use rigwright_core::Watch;
use rigwright_report::{Paper, Sheet, SheetOptions, export};

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

/// What the Sheet and the exports are made from: the project, the bytes its hash covers and
/// the options; taken on the window's thread, cheap.
pub struct SheetInputs {
    project: rigwright_core::Project,
    bytes: Vec<u8>,
    options: SheetOptions,
}

/// The inputs of the sheet for the open document and its current load case.
pub fn sheet_inputs(app: &RigApp) -> SheetInputs {
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
        // The app imports catalogue files into the project's own parts.
        extra_parts: Default::default(),
        // As the Rig view shows it (View > Sag dimensions).
        sag_dimensions: app.settings.sag_dimensions,
    };
    SheetInputs {
        project: app.doc.project.clone(),
        bytes,
        options,
    }
}

/// The sheet content for the open document and its current load case.
pub fn build_sheet(app: &RigApp) -> Result<Sheet, String> {
    let inputs = sheet_inputs(app);
    Sheet::build(&inputs.project, &inputs.bytes, &inputs.options)
}

fn save_dialog(name: String, filter: &str, ext: &str) -> Option<PathBuf> {
    rfd::FileDialog::new().add_filter(filter, &[ext]).set_file_name(name).save_file()
}

/// Files to write (path, bytes), what to say once they are written, and whether that is a
/// warning (something asked for could not be made).
type Output = (Vec<(PathBuf, Vec<u8>)>, String, bool);

/// Builds the sheet and renders `kind` for writing to `path` (for the CSV, `path` is the
/// members file; the nodes file goes beside it). The slow part, safe on any thread.
fn render(inputs: &SheetInputs, kind: ExportKind, path: &Path, watch: &Watch) -> Result<Output, String> {
    let sheet = Sheet::build_watched(&inputs.project, &inputs.bytes, &inputs.options, watch)?;
    match kind {
        ExportKind::Sheet(paper) => Ok((
            vec![(path.to_path_buf(), sheet.to_pdf(paper)?)],
            format!("Sheet written to {} ({})", path.display(), sheet.verdict()),
            false,
        )),
        ExportKind::Json => Ok((
            vec![(path.to_path_buf(), format!("{}\n", export::result_json(&sheet)).into_bytes())],
            format!("Result written to {}", path.display()),
            false,
        )),
        ExportKind::Csv => {
            let members = (path.to_path_buf(), export::members_csv(&sheet).into_bytes());
            let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
            let nodes_name = match name.strip_suffix("-members.csv") {
                Some(s) => format!("{s}-nodes.csv"),
                None => format!("{}-nodes.csv", name.strip_suffix(".csv").unwrap_or(&name)),
            };
            let nodes = path.with_file_name(nodes_name);
            match export::nodes_csv(&sheet) {
                Some(csv) => Ok((
                    vec![members, (nodes.clone(), csv.into_bytes())],
                    format!("Members written to {}, nodes to {}", path.display(), nodes.display()),
                    false,
                )),
                None => Ok((
                    vec![members],
                    format!(
                        "Members written to {}; no nodes file: load case `{}` has no equilibrium",
                        path.display(),
                        sheet.case_name()
                    ),
                    true,
                )),
            }
        }
    }
}

fn put(p: &Path, bytes: &[u8]) -> Result<(), String> {
    rigwright_core::model::write_atomic(p, bytes).map_err(|e| e.to_string())
}

/// Writes rendered files in order; the message when all are written (an error when it is a
/// warning).
fn put_all((files, done, warning): Output) -> Result<String, String> {
    for (p, bytes) in &files {
        put(p, bytes)?;
    }
    if warning { Err(done) } else { Ok(done) }
}

/// Writes `kind` for the open document to `path`, now. Returns what was written.
pub fn write(app: &RigApp, kind: ExportKind, path: &Path) -> Result<String, String> {
    render(&sheet_inputs(app), kind, path, &Watch::new()).and_then(put_all)
}

/// Asks where to write, then writes (beside the window on a large rig); the outcome goes to
/// the status bar. Cancelling a long one writes nothing.
pub fn run(app: &mut RigApp, kind: ExportKind) {
    if let Some(t) = &app.task {
        app.message = Some((format!("Wait for `{}` to finish, or cancel it, before exporting", t.what), true));
        return;
    }
    let stem = stem(app);
    let picked = match kind {
        ExportKind::Sheet(_) => save_dialog(format!("{stem}-sheet.pdf"), "PDF", "pdf"),
        ExportKind::Csv => save_dialog(format!("{stem}-members.csv"), "CSV", "csv"),
        ExportKind::Json => save_dialog(format!("{stem}-result.json"), "JSON", "json"),
    };
    let Some(path) = picked else { return };
    let inputs = sheet_inputs(app);
    let what = match kind {
        ExportKind::Sheet(_) => "Making the Sheet",
        ExportKind::Csv => "Exporting CSV",
        ExportKind::Json => "Exporting JSON",
    };
    // A cancelled task stops the build at its next step; its result is dropped unwritten.
    super::task::start(app, what, move |watch| {
        let rendered = render(&inputs, kind, &path, &watch);
        Box::new(move |app: &mut RigApp| {
            app.message = Some(match rendered {
                Err(e) => (format!("Nothing exported: {e}"), true),
                Ok(out) => match put_all(out) {
                    Ok(text) => (text, false),
                    Err(e) => (e, true),
                },
            });
        })
    });
}
