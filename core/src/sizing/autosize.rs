//! Assigning parts and spring designs to members, and auto-size: the lightest catalogue entry
//! for each chosen cable that passes its tension check in every case, iterated because a
//! part's EA and weight change the forces.

use serde::Serialize;

use super::catalogue::{Catalogue, Part};
use super::check::{UTILISATION_TOLERANCE, solve_cases_watched};
use super::design::{MemberDesign, SpringDesign};
use crate::model::{MemberDocKind, Project, ProjectError, Rest};
use crate::watch::Watch;

/// Makes cable `member` of the given part: its EA, its weight per length and the part's id.
pub fn assign_part(project: &mut Project, member: &str, part: &Part) -> Result<(), String> {
    let doc = project
        .members
        .iter_mut()
        .find(|m| m.id == member)
        .ok_or_else(|| format!("member `{member}` does not exist"))?;
    let MemberDocKind::Cable { ea, .. } = &mut doc.kind else {
        return Err(format!("member `{member}` is not a cable; catalogue entries are for cables"));
    };
    *ea = part.ea;
    doc.mass_per_length = part.mass_per_length;
    let design = doc.design.get_or_insert_with(MemberDesign::default);
    design.part = Some(part.id.clone());
    design.breaking_force = None;
    Ok(())
}

/// Makes spring `member` the designed spring: its rate and free length (less Fi/k for an
/// extension spring's initial tension).
pub fn assign_spring(project: &mut Project, member: &str, spring: &SpringDesign) -> Result<(), String> {
    let doc = project
        .members
        .iter_mut()
        .find(|m| m.id == member)
        .ok_or_else(|| format!("member `{member}` does not exist"))?;
    let MemberDocKind::Spring { rate, rest } = &mut doc.kind else {
        return Err(format!("member `{member}` is not a spring"));
    };
    let k = spring.properties().rate;
    *rate = k;
    // An extension spring pulls with its initial tension Fi as soon as its coils open, so the
    // linear member law F = k (L − L0) takes L0 = L0,spring − Fi/k.
    *rest = Rest::Length(spring.free_length_mm * 1e-3 - spring.initial_tension / k);
    doc.design.get_or_insert_with(MemberDesign::default).spring = Some(*spring);
    Ok(())
}

/// Result of [`auto_size`].
#[derive(Debug, Clone, Serialize)]
pub struct AutoSize {
    /// The project with the chosen parts assigned.
    #[serde(skip)]
    pub project: Project,
    /// Solve-and-choose rounds taken.
    pub iterations: usize,
    /// True when the last round chose the same parts as the one before.
    pub converged: bool,
    /// (member, part id) chosen.
    pub choices: Vec<(String, String)>,
    /// (member, reason) for members no entry can carry, or cases that could not be solved.
    pub failures: Vec<(String, String)>,
}

/// Picks, for each cable in `members` (every cable when empty), the lightest entry of
/// `catalogue` whose `F_min · e / DF` carries the member's largest tension over every load
/// case; re-solves with the new parts and repeats until the choice is stable, at most
/// `max_rounds` times.
pub fn auto_size(project: &Project, catalogue: &Catalogue, members: &[String], max_rounds: usize) -> Result<AutoSize, ProjectError> {
    auto_size_watched(project, catalogue, members, max_rounds, &Watch::new())
}

/// [`auto_size`] that counts rounds on `watch` and, once it is stopped, returns after the
/// round in progress with the choice so far (not marked converged).
pub fn auto_size_watched(
    project: &Project,
    catalogue: &Catalogue,
    members: &[String],
    max_rounds: usize,
    watch: &Watch,
) -> Result<AutoSize, ProjectError> {
    let mut p = project.clone();
    let targets: Vec<String> = p
        .members
        .iter()
        .filter(|m| matches!(m.kind, MemberDocKind::Cable { .. }))
        .filter(|m| members.is_empty() || members.contains(&m.id))
        .map(|m| m.id.clone())
        .collect();
    for id in members {
        if !targets.contains(id) {
            return Err(ProjectError::Invalid {
                problems: vec![crate::model::Problem::new(
                    format!("member `{id}`"),
                    "is not a cable of this project",
                    "auto-size picks parts for cables; choose cable ids",
                )],
            });
        }
    }
    let candidates = catalogue.by_weight();
    let mut previous: Vec<Vec<(String, String)>> = Vec::new();
    let mut result = AutoSize {
        project: p.clone(),
        iterations: 0,
        converged: false,
        choices: Vec::new(),
        failures: Vec::new(),
    };
    for round in 1..=max_rounds.max(1) {
        if watch.stopped() {
            break;
        }
        let model = p.validate()?;
        let cases = solve_cases_watched(&model, &watch.child());
        if watch.stopped() {
            // Cases cut short are not failures: keep the previous round's choice.
            break;
        }
        watch.advance();
        result.iterations = round;
        if let Some(bad) = cases.iter().find(|c| c.error.is_some()) {
            result.failures = vec![(
                format!("load case `{}`", bad.name),
                format!("no stable equilibrium: {}", bad.error.as_deref().unwrap_or("")),
            )];
            result.project = p;
            return Ok(result);
        }
        let mut choices = Vec::new();
        let mut failures = Vec::new();
        for id in &targets {
            let i = model.member_index(id).expect("validated");
            let t = cases
                .iter()
                .filter_map(|c| c.equilibrium.as_ref())
                .map(|eq| eq.members[i].force)
                .fold(0.0, f64::max);
            let doc = p.members.iter().find(|m| &m.id == id).expect("target exists");
            let design = doc.design.clone().unwrap_or_default();
            let df = design.design_factor.unwrap_or(p.sizing.design_factors.cable);
            let eff = design.termination_efficiency.unwrap_or(p.sizing.termination_efficiency);
            let passes = |part: &&&Part| t * df / (part.breaking_force * eff) <= 1.0 + UTILISATION_TOLERANCE;
            match candidates.iter().find(passes) {
                Some(part) => choices.push((id.clone(), part.id.clone())),
                None => {
                    let strongest = candidates.iter().max_by(|a, b| a.breaking_force.total_cmp(&b.breaking_force));
                    match strongest {
                        Some(part) => {
                            failures.push((
                                id.clone(),
                                format!(
                                    "needs a minimum breaking force of {:.0} N (tension {:.0} N × DF {} ÷ efficiency {}); the strongest entry, `{}`, has {:.0} N",
                                    t * df / eff,
                                    t,
                                    df,
                                    eff,
                                    part.id,
                                    part.breaking_force
                                ),
                            ));
                            choices.push((id.clone(), part.id.clone()));
                        }
                        None => failures.push((id.clone(), "the catalogue is empty".into())),
                    }
                }
            }
        }
        for (member, part) in &choices {
            let part = catalogue.find(part).expect("chosen from the catalogue");
            assign_part(&mut p, member, part).expect("targets are cables");
        }
        result.failures = failures;
        let stable = previous.last() == Some(&choices);
        let cycling = !stable && previous.contains(&choices);
        previous.push(choices.clone());
        result.choices = choices;
        if stable {
            result.converged = true;
            break;
        }
        if cycling {
            result.failures.push((
                "auto-size".into(),
                "the choice alternates between parts; fix one member's part by hand and run again".into(),
            ));
            break;
        }
    }
    result.project = p;
    Ok(result)
}
