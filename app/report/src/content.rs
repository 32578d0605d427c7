//! What a sheet says: everything is gathered from the core here, once, before any layout.
//!
//! Responsible for solving every load case, checking every member, choosing the case that is
//! drawn and tabulated, the modes and the stiffness at marked nodes, the plain-language
//! warnings and the traceability data. Not responsible for where anything goes on the page.

use crate::date::today;
use crate::units::Units;
use crate::warnings::warnings;
use rigwright_core::dynamics::{Modes, modes_watched};
use rigwright_core::model::{SheetInfo, UnitSystem};
use rigwright_core::sizing::{Catalogue, CheckReport, Status, check, project_catalogue, solve_cases_watched};
use rigwright_core::{Equilibrium, Model, NodeStiffness, Project, Statics, Watch};
use sha2::{Digest, Sha256};

/// Lowest natural frequencies listed.
pub const MODE_COUNT: usize = 6;

/// What the caller asks of a sheet or an export.
#[derive(Debug, Clone, Default)]
pub struct SheetOptions {
    /// Load case drawn and tabulated; the governing case when `None`.
    pub case: Option<String>,
    /// Nodes whose tangent stiffness is listed.
    pub stiffness: Vec<String>,
    /// Title-block fields that replace the project's (empty fields keep the project's).
    pub info: SheetInfo,
    /// File name printed in the footer (the project file's).
    pub file_name: Option<String>,
    /// The document differs from the file on disk (the hash is of the text as it would be saved).
    pub unsaved: bool,
    /// Parts from catalogue files, found after the built-in ropes and the project's own parts.
    pub extra_parts: Catalogue,
    /// Dimension the sag of every cable that sags under its own weight on the drawing.
    pub sag_dimensions: bool,
}

/// How the drawn case was chosen.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CaseChoice {
    /// Asked for by name.
    Chosen,
    /// The case of the most utilised member's governing check.
    Governing,
    /// No member check names a case: the first case with an equilibrium, or the first case.
    First,
}

/// Everything a sheet or an export shows, computed once.
pub struct Sheet {
    pub project: Project,
    pub model: Model,
    /// Title-block fields, overrides applied and the date filled in.
    pub info: SheetInfo,
    pub units: Units,
    pub report: CheckReport,
    /// Index of the drawn and tabulated case.
    pub case: usize,
    pub choice: CaseChoice,
    /// Lowest natural frequencies about the drawn case, or why there are none.
    pub modes: Result<Modes, String>,
    /// Stiffness at each marked node, or why there is none.
    pub stiffness: Vec<(String, Result<NodeStiffness, String>)>,
    /// Plain statements of everything that needs attention, most serious first.
    pub warnings: Vec<String>,
    /// SHA-256 of the project file bytes, lower-case hex.
    pub sha256: String,
    pub file_name: String,
    pub unsaved: bool,
    /// The drawing dimensions the sag of the cables that sag.
    pub sag_dimensions: bool,
}

/// Lower-case hex SHA-256 of `bytes` (the same as `sha256sum` prints).
pub fn sha256_hex(bytes: &[u8]) -> String {
    Sha256::digest(bytes).iter().map(|b| format!("{b:02x}")).collect()
}

fn merge(base: &SheetInfo, over: &SheetInfo) -> SheetInfo {
    let pick = |a: &String, b: &String| if b.trim().is_empty() { a.clone() } else { b.clone() };
    let mut info = SheetInfo {
        project: pick(&base.project, &over.project),
        location: pick(&base.location, &over.location),
        client: pick(&base.client, &over.client),
        prepared_by: pick(&base.prepared_by, &over.prepared_by),
        checked_by: pick(&base.checked_by, &over.checked_by),
        date: pick(&base.date, &over.date),
        revision: pick(&base.revision, &over.revision),
        stiffness_at: base.stiffness_at.clone(),
    };
    if info.date.trim().is_empty() {
        info.date = today();
    }
    info
}

/// What [`Sheet::build_watched`] says when it was stopped.
pub const STOPPED: &str = "stopped before the sheet was made";

impl Sheet {
    /// Validates the project, solves every case, checks every member and gathers the rest.
    /// `bytes` are the project file as stored (hashed for traceability). Fails with a message
    /// for bad input: an invalid project, an unknown case or node.
    pub fn build(project: &Project, bytes: &[u8], options: &SheetOptions) -> Result<Sheet, String> {
        Sheet::build_watched(project, bytes, options, &Watch::new())
    }

    /// [`Sheet::build`] that gives up with [`STOPPED`] once `watch` is stopped (checked after
    /// the load cases are solved and between the Lanczos blocks of the modes).
    pub fn build_watched(project: &Project, bytes: &[u8], options: &SheetOptions, watch: &Watch) -> Result<Sheet, String> {
        let model = project.validate().map_err(|e| e.to_string())?;
        let case_names = || model.cases.iter().map(|c| format!("`{}`", c.name)).collect::<Vec<_>>().join(", ");
        let asked = match &options.case {
            Some(name) => Some(
                model
                    .case_index(name)
                    .ok_or_else(|| format!("no load case named `{name}`; the cases are: {}", case_names()))?,
            ),
            None => None,
        };
        let mut marked = Vec::new();
        let mut ids: Vec<&String> = options.stiffness.iter().collect();
        // Nodes marked in the project (the app's node properties), after those asked for here.
        for id in &project.sheet.stiffness_at {
            if !ids.contains(&id) && model.node_index(id).is_some() {
                ids.push(id);
            }
        }
        for id in ids {
            let i = model
                .node_index(id)
                .ok_or_else(|| format!("node `{id}` does not exist; check the id (--stiffness takes a node id)"))?;
            marked.push((id.clone(), i));
        }
        let catalogue = project_catalogue(project, &options.extra_parts);
        let report = check(project, &model, &catalogue, solve_cases_watched(&model, watch));
        if watch.stopped() {
            return Err(STOPPED.into());
        }
        let (case, choice) = match asked {
            Some(i) => (i, CaseChoice::Chosen),
            None => governing_case(&model, &report),
        };
        let statics = Statics::new(&model);
        let eq = report.cases[case].equilibrium.as_ref();
        let why_none = || {
            format!(
                "load case `{}` has no equilibrium: {}",
                model.cases[case].name,
                report.cases[case].error.as_deref().unwrap_or("not solved")
            )
        };
        let modes = match eq {
            Some(eq) => modes_watched(&statics, eq, MODE_COUNT, &watch.child()).map_err(|e| e.to_string()),
            None => Err(why_none()),
        };
        let stiffness = marked
            .into_iter()
            .map(|(id, i)| {
                let k = match eq {
                    Some(eq) => statics.node_stiffness(eq, i).map_err(|e| e.to_string()),
                    None => Err(why_none()),
                };
                (id, k)
            })
            .collect();
        if watch.stopped() {
            return Err(STOPPED.into());
        }
        let units = match project.units {
            UnitSystem::SI => Units::Si,
            UnitSystem::US => Units::Us,
        };
        let warnings = warnings(&model, &report, case, units);
        Ok(Sheet {
            project: project.clone(),
            info: merge(&project.sheet, &options.info),
            units,
            case,
            choice,
            modes,
            stiffness,
            warnings,
            sha256: sha256_hex(bytes),
            file_name: options.file_name.clone().unwrap_or_else(|| "(not saved)".into()),
            unsaved: options.unsaved,
            sag_dimensions: options.sag_dimensions,
            model,
            report,
        })
    }

    /// The equilibrium of the drawn case, when it has one (always stable: a case that did not
    /// converge or is not stable has none).
    pub fn equilibrium(&self) -> Option<&Equilibrium> {
        self.report.cases[self.case].equilibrium.as_ref()
    }

    /// Name of the drawn case.
    pub fn case_name(&self) -> &str {
        &self.model.cases[self.case].name
    }

    /// True when every case has an equilibrium.
    pub fn all_cases_solved(&self) -> bool {
        self.report.cases.iter().all(|c| c.equilibrium.is_some())
    }

    /// The one-line verdict at the top of the sheet.
    pub fn verdict(&self) -> String {
        let unsolved = self.report.cases.iter().filter(|c| c.equilibrium.is_none()).count();
        let fail = self.report.count(Status::Fail);
        let unchecked = self.report.count(Status::NotChecked);
        let n = self.report.members.len();
        let cases = self.report.cases.len();
        if unsolved > 0 || fail > 0 {
            let mut parts = Vec::new();
            if unsolved > 0 {
                parts.push(format!("{unsolved} of {cases} load case(s) without equilibrium"));
            }
            if fail > 0 {
                parts.push(format!("{fail} member(s) FAIL"));
            }
            format!("DOES NOT PASS — {}", parts.join("; "))
        } else if unchecked == n {
            format!("NOT CHECKED — all {cases} load case(s) solved, but no member has a capacity to check against")
        } else if unchecked > 0 {
            format!(
                "PASSES AS FAR AS CHECKED — {} of {n} members checked in {cases} load case(s); {unchecked} not checked",
                n - unchecked
            )
        } else {
            format!("PASSES — all {n} members checked in all {cases} load case(s)")
        }
    }
}

/// The case of the most utilised member's governing check, else the first case with an
/// equilibrium, else the first case.
fn governing_case(model: &Model, report: &CheckReport) -> (usize, CaseChoice) {
    let governing = report
        .members
        .iter()
        .filter_map(|m| Some((m.utilisation?, m.governing_line()?.case.as_str())))
        .filter(|(_, case)| !case.is_empty())
        .max_by(|a, b| a.0.total_cmp(&b.0))
        .and_then(|(_, case)| model.case_index(case));
    if let Some(i) = governing {
        return (i, CaseChoice::Governing);
    }
    let first = report.cases.iter().position(|c| c.equilibrium.is_some()).unwrap_or(0);
    (first, CaseChoice::First)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sha256_of_abc_is_the_published_test_vector() {
        // FIPS 180-2, appendix B.1: SHA-256("abc").
        assert_eq!(
            sha256_hex(b"abc"),
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
    }
}
