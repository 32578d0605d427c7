//! From the stored document to the validated model: [`Project::validate`] and
//! [`Project::load_model`], thin methods over [`Model::from_project`].
//!
//! Kept apart from `project.rs` so that the document never needs the model: the model is
//! built from the document, in one direction.

use std::path::Path;

use super::error::ProjectError;
use super::project::Project;
use super::validated::Model;

impl Project {
    /// Reads, parses and validates a file.
    pub fn load_model(path: &Path) -> Result<(Self, Model), ProjectError> {
        let project = Self::load(path)?;
        let model = project.validate()?;
        Ok((project, model))
    }

    /// Checks the document and builds the solver's model.
    pub fn validate(&self) -> Result<Model, ProjectError> {
        Model::from_project(self).map_err(|problems| ProjectError::Invalid { problems })
    }
}
