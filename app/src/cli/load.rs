//! What every subcommand shares: the exit codes, the [`Failure`] that ends a command, and
//! loading a project and its load case with messages that name the file.

use std::path::Path;

use rigwright_core::{Model, Project, SolveError};

/// Exit code for bad input.
pub const EXIT_BAD_INPUT: u8 = 2;
/// Exit code when there is no valid equilibrium.
pub const EXIT_NO_EQUILIBRIUM: u8 = 3;

/// An error that ends the command, with its exit code.
#[derive(Debug)]
pub struct Failure {
    pub code: u8,
    pub message: String,
}

impl Failure {
    pub(super) fn input(message: impl Into<String>) -> Self {
        Failure {
            code: EXIT_BAD_INPUT,
            message: message.into(),
        }
    }
}

pub(super) fn load(path: &Path) -> Result<(Project, Model), Failure> {
    Project::load_model(path).map_err(|e| load_failure(path, &e))
}

/// A project file that could not be read or used, named once, with what to do about it.
pub(super) fn load_failure(path: &Path, e: &rigwright_core::model::ProjectError) -> Failure {
    use rigwright_core::model::ProjectError;
    match e {
        // The message already names the file.
        ProjectError::Io { .. } => Failure::input(format!("{e}; check the file's name and folder")),
        _ => Failure::input(format!("{}: {e}", path.display())),
    }
}

pub(super) fn case_index(model: &Model, case: Option<&str>) -> Result<usize, Failure> {
    match case {
        None => Ok(0),
        Some(name) => model
            .case_index(name)
            .ok_or_else(|| Failure::input(SolveError::UnknownCase(name.into(), case_list(model)).to_string())),
    }
}

/// Loads a project and resolves the load case (default: the first).
pub(super) fn load_case(path: &Path, case: Option<&str>) -> Result<(Model, usize), Failure> {
    let (_, model) = load(path)?;
    let case = case_index(&model, case).map_err(|f| Failure::input(format!("{}: {}", path.display(), f.message)))?;
    Ok((model, case))
}

pub(super) fn case_list(model: &Model) -> String {
    model.cases.iter().map(|c| format!("`{}`", c.name)).collect::<Vec<_>>().join(", ")
}
