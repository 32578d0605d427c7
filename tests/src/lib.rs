//! Shared helpers for the verification suite; the checks live in `tests/`, one file per topic.

use rigwright_core::{Equilibrium, Model, Project, Statics};

/// Validates a project, panicking with the problems listed.
pub fn model(p: &Project) -> Model {
    p.validate().unwrap_or_else(|e| panic!("invalid project: {e}"))
}

/// Solves the first load case, panicking on failure.
pub fn solve(m: &Model) -> Equilibrium {
    Statics::new(m).solve(0, None).unwrap_or_else(|e| panic!("solve failed: {e}"))
}

/// Relative difference |a − b| / |b|.
pub fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs()
}

/// Path of a sample project, from the tests crate.
pub fn sample(name: &str) -> std::path::PathBuf {
    std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample-projects").join(name)
}
