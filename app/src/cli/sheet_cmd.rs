//! The `sheet` and `export` commands.

use std::path::{Path, PathBuf};

use clap::Args;
use rigwright_core::Project;
use rigwright_core::model::SheetInfo;

use super::load::{EXIT_NO_EQUILIBRIUM, Failure, load_failure};
use rigwright_report::{Paper, Sheet, SheetOptions, export};

/// Title-block fields given on the command line; each replaces the project's.
#[derive(Args, Debug, Default)]
pub struct InfoArgs {
    /// Title block: project name or number.
    #[arg(long)]
    pub project: Option<String>,
    /// Title block: location.
    #[arg(long)]
    pub location: Option<String>,
    /// Title block: client.
    #[arg(long)]
    pub client: Option<String>,
    /// Title block: prepared by.
    #[arg(long)]
    pub prepared_by: Option<String>,
    /// Title block: checked by.
    #[arg(long)]
    pub checked_by: Option<String>,
    /// Title block: date (default: the project's, else today).
    #[arg(long)]
    pub date: Option<String>,
    /// Title block: revision.
    #[arg(long)]
    pub revision: Option<String>,
}

impl InfoArgs {
    fn into_info(self) -> SheetInfo {
        SheetInfo {
            project: self.project.unwrap_or_default(),
            location: self.location.unwrap_or_default(),
            client: self.client.unwrap_or_default(),
            prepared_by: self.prepared_by.unwrap_or_default(),
            checked_by: self.checked_by.unwrap_or_default(),
            date: self.date.unwrap_or_default(),
            revision: self.revision.unwrap_or_default(),
            stiffness_at: Vec::new(),
        }
    }
}

/// What a sheet or an export is of: the load case, the nodes whose stiffness it lists, and
/// catalogue files to find parts in.
pub struct Choice {
    pub case: Option<String>,
    pub stiffness: Vec<String>,
    pub catalogue: Vec<PathBuf>,
    pub sag: bool,
    /// Replace an existing project file by the output all the same.
    pub force: bool,
}

/// Reads the project and builds the sheet's content.
fn build(file: &Path, choice: Choice, info: SheetInfo) -> Result<Sheet, Failure> {
    let project = Project::load(file).map_err(|e| load_failure(file, &e))?;
    let bytes = std::fs::read(file).map_err(|e| Failure::input(format!("{}: {e}", file.display())))?;
    let options = SheetOptions {
        case: choice.case,
        stiffness: choice.stiffness,
        info,
        file_name: file.file_name().map(|n| n.to_string_lossy().into_owned()),
        unsaved: false,
        extra_parts: super::sizing::catalogue_files(&choice.catalogue)?,
        sag_dimensions: choice.sag,
    };
    Sheet::build(&project, &bytes, &options).map_err(|e| Failure::input(format!("{}: {e}", file.display())))
}

/// Writes an output file whole or not at all; never over the project it was made from.
fn write(path: &Path, bytes: &[u8]) -> Result<(), Failure> {
    rigwright_core::model::write_atomic(path, bytes).map_err(|e| Failure::input(e.to_string()))
}

/// Refuses an output path that is the input project, or any project file (by its ending).
pub fn check_output(input: &Path, output: &Path, force: bool) -> Result<(), Failure> {
    if rigwright_core::model::same_file(input, output) {
        return Err(Failure::input(format!(
            "{}: this is the project being read; choose another output file name",
            output.display()
        )));
    }
    let name = output.file_name().map(|n| n.to_string_lossy().to_lowercase()).unwrap_or_default();
    if !force && name.ends_with(rigwright_core::FILE_EXTENSION) && output.exists() {
        return Err(Failure::input(format!(
            "{}: this is a project file and would be replaced by a non-project file; choose another name, or add --force",
            output.display()
        )));
    }
    Ok(())
}

/// Exit 3 when a load case has no equilibrium (the files are written all the same and say so).
fn unsolved(sheet: &Sheet, what: &str) -> Result<(), Failure> {
    let missing: Vec<String> = sheet
        .report
        .cases
        .iter()
        .filter_map(|c| Some(format!("`{}`: {}", c.name, c.error.as_ref()?)))
        .collect();
    if missing.is_empty() {
        Ok(())
    } else {
        Err(Failure {
            code: EXIT_NO_EQUILIBRIUM,
            message: format!("{what}; no equilibrium in load case {}", missing.join("; ")),
        })
    }
}

/// `rigwright sheet`.
pub fn sheet(file: &Path, output: &Path, paper: &str, choice: Choice, info: InfoArgs) -> Result<(), Failure> {
    let paper = Paper::parse(paper).ok_or_else(|| Failure::input(format!("paper `{paper}`: use a4 or letter")))?;
    check_output(file, output, choice.force)?;
    let sheet = build(file, choice, info.into_info())?;
    let laid = sheet.pages(paper);
    let pdf = sheet.pdf_of(&laid, paper).map_err(Failure::input)?;
    write(output, &pdf)?;
    let pages = laid.len();
    eprintln!("{}: {} page(s), {}", output.display(), pages, sheet.verdict());
    unsolved(&sheet, &format!("the sheet {} was written", output.display()))
}

/// Where `rigwright export` writes.
pub struct Outputs {
    pub members: Option<PathBuf>,
    pub nodes: Option<PathBuf>,
    pub json: Option<PathBuf>,
}

/// `rigwright export`.
pub fn export(file: &Path, choice: Choice, out: Outputs) -> Result<(), Failure> {
    if out.members.is_none() && out.nodes.is_none() && out.json.is_none() {
        return Err(Failure::input(
            "nothing to export: give --csv-members FILE, --csv-nodes FILE or --json FILE (or --json - to print)",
        ));
    }
    for path in [&out.members, &out.nodes, &out.json].into_iter().flatten() {
        if path.as_os_str() != "-" {
            check_output(file, path, choice.force)?;
        }
    }
    let sheet = build(file, choice, SheetInfo::default())?;
    if let Some(path) = &out.members {
        write(path, export::members_csv(&sheet).as_bytes())?;
    }
    let mut skipped = None;
    if let Some(path) = &out.nodes {
        match export::nodes_csv(&sheet) {
            Some(csv) => write(path, csv.as_bytes())?,
            None => {
                skipped = Some(format!(
                    "{} not written: load case `{}` has no equilibrium, so there are no node results",
                    path.display(),
                    sheet.case_name()
                ))
            }
        }
    }
    if let Some(path) = &out.json {
        let text = export::result_json(&sheet);
        if path.as_os_str() == "-" {
            super::emit(&format!("{text}\n"));
        } else {
            write(path, format!("{text}\n").as_bytes())?;
        }
    }
    match skipped {
        Some(message) => Err(Failure {
            code: EXIT_NO_EQUILIBRIUM,
            message,
        }),
        None => unsolved(&sheet, "the result files were written"),
    }
}
