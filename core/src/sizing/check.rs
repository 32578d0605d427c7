//! Checks of every member across every load case: cable tension and slack, spring stress,
//! solid length and buckling, strut buckling and capacity.
//!
//! A case that has no stable equilibrium is reported as such and its members are not checked
//! in it; the report then does not pass, whatever the other cases say.
//!
//! This file solves the cases and settles each member's status; the report's types are in
//! `check_report.rs`, the checks of one member in `member_checks.rs`.

use super::catalogue::Catalogue;
use super::design::MemberDesign;
use super::member_checks::{check_cable, check_spring, check_strut};
use crate::element::MemberKind;
use crate::model::{Model, Project, ProjectError};
use crate::solve::Statics;
use crate::watch::Watch;

pub use super::check_report::{Capacity, CaseOutcome, CheckLine, CheckReport, MemberCheck, Status};
pub use super::member_checks::UTILISATION_TOLERANCE;

/// Solves every load case from the unloaded state.
pub fn solve_cases(model: &Model) -> Vec<CaseOutcome> {
    solve_cases_watched(model, &Watch::new())
}

/// [`solve_cases`], counting finished cases on `watch`; once it is stopped the remaining
/// cases are not solved and say so.
pub fn solve_cases_watched(model: &Model, watch: &Watch) -> Vec<CaseOutcome> {
    let statics = Statics::new(model).cancel_with(watch.flag());
    (0..model.cases.len())
        .map(|i| {
            let name = model.cases[i].name.clone();
            let solved = statics.solve(i, None);
            watch.advance();
            match solved {
                Ok(eq) if eq.stability.is_stable() => CaseOutcome {
                    name,
                    equilibrium: Some(eq),
                    error: None,
                },
                Ok(eq) => CaseOutcome {
                    name,
                    equilibrium: None,
                    error: Some(eq.stability.describe()),
                },
                Err(e) => CaseOutcome {
                    name,
                    equilibrium: None,
                    error: Some(e.to_string()),
                },
            }
        })
        .collect()
}

/// Validates, solves every case and checks every member.
pub fn check_project(project: &Project, catalogue: &Catalogue) -> Result<CheckReport, ProjectError> {
    check_project_watched(project, catalogue, &Watch::new())
}

/// [`check_project`] that counts solved load cases on `watch` and stops solving once it is
/// stopped (a stopped check's report is incomplete: it names the unsolved cases).
pub fn check_project_watched(project: &Project, catalogue: &Catalogue, watch: &Watch) -> Result<CheckReport, ProjectError> {
    let model = project.validate()?;
    let cases = solve_cases_watched(&model, watch);
    Ok(check(project, &model, catalogue, cases))
}

/// The catalogue a project sees: the built-in ropes, then `extra` (catalogue files), then the
/// project's own parts; later entries replace earlier ones with the same id.
pub fn project_catalogue(project: &Project, extra: &Catalogue) -> Catalogue {
    let mut c = Catalogue::builtin();
    c.extend(extra.parts().iter().cloned());
    c.extend(project.sizing.parts.iter().cloned());
    c
}

/// Checks every member of `model` (built from `project`) against the solved `cases`.
pub fn check(project: &Project, model: &Model, catalogue: &Catalogue, cases: Vec<CaseOutcome>) -> CheckReport {
    let sizing = &project.sizing;
    let empty = MemberDesign::default();
    let members = model
        .members
        .iter()
        .enumerate()
        .map(|(i, member)| {
            let doc = project.members.iter().find(|d| d.id == member.id);
            let design = doc.and_then(|d| d.design.as_ref()).unwrap_or(&empty);
            let mass_per_length = doc.map_or(0.0, |d| d.mass_per_length);
            let class = member.kind.class();
            let df = design.design_factor.unwrap_or(sizing.design_factors.of(class));
            let forces: Vec<(f64, f64, &str)> = cases
                .iter()
                .filter_map(|c| {
                    let eq = c.equilibrium.as_ref()?;
                    let r = &eq.members[i];
                    Some((r.force, r.length, c.name.as_str()))
                })
                .collect();
            let mut m = MemberCheck {
                id: member.id.clone(),
                class,
                made_of: None,
                force_min: forces.iter().min_by(|a, b| a.0.total_cmp(&b.0)).map(|f| (f.0, f.2.to_string())),
                force_max: forces.iter().max_by(|a, b| a.0.total_cmp(&b.0)).map(|f| (f.0, f.2.to_string())),
                capacity: None,
                design_factor: df,
                efficiency: None,
                utilisation: None,
                status: Status::NotChecked,
                governing: None,
                lines: Vec::new(),
                notes: Vec::new(),
            };
            match member.kind {
                MemberKind::Cable { ea, .. } => check_cable(&mut m, design, (ea, mass_per_length), sizing, catalogue, &forces),
                MemberKind::Spring { k, l0 } => check_spring(&mut m, design, k, l0, &forces),
                MemberKind::Strut { .. } => check_strut(&mut m, design, &forces),
            }
            let unsolved: Vec<&str> = cases.iter().filter(|c| c.error.is_some()).map(|c| c.name.as_str()).collect();
            if !unsolved.is_empty() {
                m.notes
                    .push(format!("not checked in {} (no valid equilibrium)", unsolved.join(", ")));
            }
            settle(&mut m, sizing.near_limit, unsolved.is_empty());
            m
        })
        .collect();
    CheckReport {
        cases,
        members,
        design_factors: sizing.design_factors,
        near_limit: sizing.near_limit,
    }
}

/// Sets the member's status, utilisation and governing line from its lines; `all_cases`
/// is false when some case has no equilibrium (then nothing better than "not checked").
fn settle(m: &mut MemberCheck, near: f64, all_cases: bool) {
    m.utilisation = m.lines.iter().filter_map(|l| l.utilisation).reduce(f64::max);
    m.governing = m
        .lines
        .iter()
        .enumerate()
        .max_by(|(_, a), (_, b)| {
            (a.status == Status::Fail)
                .cmp(&(b.status == Status::Fail))
                .then(a.utilisation.unwrap_or(0.0).total_cmp(&b.utilisation.unwrap_or(0.0)))
        })
        .map(|(i, _)| i);
    m.status = if m.lines.is_empty() {
        Status::NotChecked
    } else if m.lines.iter().any(|l| l.status == Status::Fail) {
        Status::Fail
    } else if m.capacity.is_none() || !all_cases || incomplete(m) {
        // The strength is unknown, a case is missing, or a check the member needs is absent.
        Status::NotChecked
    } else if m.utilisation.is_some_and(|u| u > near) {
        Status::Near
    } else {
        Status::Pass
    };
}

/// True when a member passes its lines but misses a check it needs: a strut without a
/// capacity, an extension spring (hooks unchecked).
fn incomplete(m: &MemberCheck) -> bool {
    m.notes
        .iter()
        .any(|n| n.starts_with("no axial capacity") || n.starts_with("hook stresses"))
}
