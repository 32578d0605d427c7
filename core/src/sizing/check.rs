//! Checks of every member across every load case: cable tension and slack, spring stress,
//! solid length and buckling, strut buckling and capacity.
//!
//! A case that has no stable equilibrium is reported as such and its members are not checked
//! in it; the report then does not pass, whatever the other cases say.

use serde::Serialize;

use super::catalogue::Catalogue;
use super::design::{DesignFactors, MemberDesign};
use crate::element::{MemberClass, MemberKind};
use crate::model::{Model, Project, ProjectError};
use crate::solve::{Equilibrium, Statics};
use crate::watch::Watch;

/// A utilisation may exceed 1 by this much and still pass: the solver's forces are exact to
/// its residual tolerance (1e-10 relative), not to the last bit.
pub const UTILISATION_TOLERANCE: f64 = 1e-9;

/// Outcome of a check, member or line. Shown with its word, never by colour alone.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Status {
    Pass,
    /// Passes, with utilisation above the project's near-limit fraction.
    Near,
    Fail,
    /// Nothing to check against (no part, design or section given).
    NotChecked,
}

impl Status {
    /// The word shown in tables.
    pub fn word(self) -> &'static str {
        match self {
            Status::Pass => "pass",
            Status::Near => "near limit",
            Status::Fail => "FAIL",
            Status::NotChecked => "not checked",
        }
    }
}

/// The equilibrium of one load case, or why there is none.
#[derive(Debug, Clone, Serialize)]
pub struct CaseOutcome {
    pub name: String,
    /// The stable equilibrium; `None` when the case did not give one.
    #[serde(skip)]
    pub equilibrium: Option<Equilibrium>,
    /// Why there is no usable equilibrium.
    pub error: Option<String>,
}

/// One check of one member in one case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CheckLine {
    /// "tension", "slack", "stress", "solid length", "buckling", "capacity", "direction".
    pub check: &'static str,
    /// Governing load case (empty for checks that do not depend on the load).
    pub case: String,
    /// What the member must carry, in `unit`.
    pub demand: f64,
    /// What it can carry after the design factor and efficiency, in `unit`.
    pub limit: f64,
    /// "N", "Pa" or "m".
    pub unit: &'static str,
    /// demand ÷ limit where that is meaningful.
    pub utilisation: Option<f64>,
    pub status: Status,
    /// The formula or the reason, as printed.
    pub note: String,
}

/// What a member's capacity is, for tables.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Capacity {
    pub value: f64,
    pub unit: &'static str,
    /// "minimum breaking force", "allowable stress", "Euler load".
    pub what: &'static str,
}

/// Every check of one member.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberCheck {
    pub id: String,
    pub class: MemberClass,
    /// Catalogue entry or design, as printed.
    pub made_of: Option<String>,
    /// Smallest axial force over the solved cases (N) and its case.
    pub force_min: Option<(f64, String)>,
    /// Largest axial force over the solved cases (N) and its case.
    pub force_max: Option<(f64, String)>,
    pub capacity: Option<Capacity>,
    pub design_factor: f64,
    /// Termination efficiency of a cable.
    pub efficiency: Option<f64>,
    /// Largest utilisation of any check.
    pub utilisation: Option<f64>,
    pub status: Status,
    /// Index into `lines` of the governing check.
    pub governing: Option<usize>,
    pub lines: Vec<CheckLine>,
    /// Why it was not checked, or what to look at.
    pub notes: Vec<String>,
}

impl MemberCheck {
    /// The governing line.
    pub fn governing_line(&self) -> Option<&CheckLine> {
        self.governing.map(|i| &self.lines[i])
    }
}

/// The checks of a whole project.
#[derive(Debug, Clone, Serialize)]
pub struct CheckReport {
    pub cases: Vec<CaseOutcome>,
    pub members: Vec<MemberCheck>,
    pub design_factors: DesignFactors,
    pub near_limit: f64,
}

impl CheckReport {
    /// True when every case has a stable equilibrium and no member fails.
    pub fn passes(&self) -> bool {
        self.cases.iter().all(|c| c.error.is_none()) && self.members.iter().all(|m| m.status != Status::Fail)
    }

    /// Member indices in order of concern: failing first, then by utilisation, highest first
    /// (whatever the status), those without one last; the project's order among equals.
    pub fn members_by_concern(&self) -> Vec<usize> {
        let members = &self.members;
        let mut order: Vec<usize> = (0..members.len()).collect();
        order.sort_by(|&a, &b| {
            let fails = |i: usize| members[i].status == Status::Fail;
            let u = |i: usize| members[i].utilisation.unwrap_or(f64::NEG_INFINITY);
            fails(b).cmp(&fails(a)).then_with(|| u(b).total_cmp(&u(a)))
        });
        order
    }

    /// Number of members with each status.
    pub fn count(&self, status: Status) -> usize {
        self.members.iter().filter(|m| m.status == status).count()
    }

    /// Largest utilisation of any member.
    pub fn peak_utilisation(&self) -> Option<f64> {
        self.members.iter().filter_map(|m| m.utilisation).reduce(f64::max)
    }
}

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

/// A line whose status follows from its utilisation.
fn ratio_line(check: &'static str, case: &str, demand: f64, limit: f64, unit: &'static str, note: String) -> CheckLine {
    let u = demand / limit;
    CheckLine {
        check,
        case: case.to_string(),
        demand,
        limit,
        unit,
        utilisation: Some(u),
        status: if u <= 1.0 + UTILISATION_TOLERANCE {
            Status::Pass
        } else {
            Status::Fail
        },
        note,
    }
}

/// A pass/fail line with no utilisation.
fn flag_line(check: &'static str, case: &str, demand: f64, limit: f64, unit: &'static str, ok: bool, note: String) -> CheckLine {
    CheckLine {
        check,
        case: case.to_string(),
        demand,
        limit,
        unit,
        utilisation: None,
        status: if ok { Status::Pass } else { Status::Fail },
        note,
    }
}

/// The case with the largest value of `f` among `forces`.
fn worst<'a>(forces: &[(f64, f64, &'a str)], f: impl Fn(&(f64, f64, &str)) -> f64) -> Option<(f64, f64, &'a str)> {
    forces.iter().copied().max_by(|a, b| f(a).total_cmp(&f(b)))
}

/// `v` to six decimals without trailing zeros ("0.144", not "0.14400000000000002").
fn six_decimals(v: f64) -> String {
    let s = format!("{v:.6}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" { "0".into() } else { s.to_string() }
}

fn check_cable(
    m: &mut MemberCheck,
    design: &MemberDesign,
    (ea, mass_per_length): (f64, f64),
    sizing: &super::design::SizingDoc,
    catalogue: &Catalogue,
    forces: &[(f64, f64, &str)],
) {
    let eff = design.termination_efficiency.unwrap_or(sizing.termination_efficiency);
    m.efficiency = Some(eff);
    let breaking = match (&design.part, design.breaking_force) {
        (Some(id), _) => match catalogue.find(id) {
            Some(part) => {
                m.made_of = Some(if part.description.is_empty() {
                    part.id.clone()
                } else {
                    part.description.clone()
                });
                if (part.ea - ea).abs() > 1e-6 * part.ea {
                    m.notes.push(format!(
                        "EA {ea:.4e} N differs from the part's {:.4e} N; assign the part again",
                        part.ea
                    ));
                }
                if (part.mass_per_length - mass_per_length).abs() > 1e-6 * part.mass_per_length.max(1e-9) {
                    m.notes.push(format!(
                        "mass per length {} kg/m differs from the part's {} kg/m; assign the part again",
                        six_decimals(mass_per_length),
                        six_decimals(part.mass_per_length)
                    ));
                }
                Some(part.breaking_force)
            }
            None => {
                m.lines.push(flag_line(
                    "part",
                    "",
                    0.0,
                    0.0,
                    "N",
                    false,
                    format!(
                        "catalogue entry `{id}` is not in the catalogue; add it to the project's parts, load its catalogue file, or choose another"
                    ),
                ));
                None
            }
        },
        (None, Some(f)) => {
            m.made_of = Some("user breaking force".into());
            Some(f)
        }
        (None, None) => None,
    };
    if let Some(f) = breaking {
        m.capacity = Some(Capacity {
            value: f,
            unit: "N",
            what: "minimum breaking force",
        });
        if let Some((t, _, case)) = worst(forces, |f| f.0) {
            let limit = f * eff / m.design_factor;
            m.lines.push(ratio_line(
                "tension",
                case,
                t.max(0.0),
                limit,
                "N",
                format!("T·DF/(F_min·e) with DF {} and e {}", m.design_factor, eff),
            ));
        }
    } else if design.part.is_none() {
        m.notes
            .push("no catalogue entry or breaking force: choose a part or give the breaking force".into());
    }
    if !design.may_slacken
        && let Some((t, _, case)) = worst(forces, |f| -f.0)
    {
        let threshold = sizing.slack_threshold;
        m.lines.push(flag_line(
            "slack",
            case,
            t,
            threshold,
            "N",
            t > threshold,
            format!("lowest tension must stay above {threshold} N (mark the cable `may slacken` if intended)"),
        ));
    }
}

fn check_spring(m: &mut MemberCheck, design: &MemberDesign, k: f64, l0: f64, forces: &[(f64, f64, &str)]) {
    let Some(s) = design.spring else {
        m.notes.push("no spring design: design one with the spring designer".into());
        return;
    };
    let p = s.properties();
    m.made_of = Some(format!(
        "{}, d {} mm, D {} mm, {} active coils, {} ends",
        s.material.name(),
        s.wire_mm,
        s.mean_mm,
        s.active_coils,
        s.ends.name()
    ));
    m.capacity = Some(Capacity {
        value: p.allowable,
        unit: "Pa",
        what: "allowable shear stress",
    });
    if (p.rate - k).abs() > 0.01 * p.rate {
        m.notes.push(format!(
            "the member's rate {k:.4e} N/m differs from the design's {:.4e} N/m; assign the design again",
            p.rate
        ));
    }
    if let Some((f, _, case)) = worst(forces, |f| f.0.abs()) {
        m.lines.push(ratio_line(
            "stress",
            case,
            s.stress(f),
            p.allowable / m.design_factor,
            "Pa",
            format!(
                "Bergsträsser τ = KB·8FD/(πd³) against {:.0}% of Sut ÷ DF",
                100.0 * s.material.allowable_fraction()
            ),
        ));
    }
    let (smallest, largest) = s.material.size_range();
    if !(smallest..=largest).contains(&s.wire_mm) {
        m.lines.push(flag_line(
            "wire size",
            "",
            s.wire_mm * 1e-3,
            largest * 1e-3,
            "m",
            false,
            format!(
                "{} mm is outside {smallest}–{largest} mm, where Sut = A/d^m holds (Shigley Table 10-4)",
                s.wire_mm
            ),
        ));
    }
    if s.ends.is_compression() {
        // Solid-safe (Shigley §10-8): the stress with the coils closed, F = k (L0 − Ls).
        let solid_force = p.rate * (s.free_length_mm * 1e-3 - p.solid_length).max(0.0);
        m.lines.push(ratio_line(
            "solid-safe",
            "",
            s.stress(solid_force),
            p.allowable / m.design_factor,
            "Pa",
            format!("τ at solid (F = k(L0 − Ls) = {solid_force:.1} N) against the allowable ÷ DF"),
        ));
        if let Some((f, _, case)) = worst(forces, |f| f.0)
            && f > 0.0
        {
            m.lines.push(flag_line(
                "direction",
                case,
                f,
                0.0,
                "N",
                false,
                "a compression spring is pulled: use an extension spring or change the geometry".into(),
            ));
        }
        // Deflection is the member's shortening from its free length, so a spring may sit in
        // a longer link (brackets, rods) whose length is the member's.
        if let Some((_, length, case)) = worst(forces, |f| -f.1) {
            let travel = (l0 - length).max(0.0);
            m.lines.push(ratio_line(
                "solid length",
                case,
                travel,
                (s.free_length_mm * 1e-3 - p.solid_length).max(0.0),
                "m",
                format!("deflection against free length − solid length ({:.1} mm)", p.solid_length * 1e3),
            ));
        }
        if let Some(limit) = p.buckling_free_length {
            m.lines.push(ratio_line(
                "buckling",
                "",
                s.free_length_mm * 1e-3,
                limit,
                "m",
                format!("free length against 2.63 D/α with α = {} (Shigley eq. 10-13)", s.buckling_alpha),
            ));
        }
    } else {
        if let Some((f, _, case)) = worst(forces, |f| -f.0)
            && f < s.initial_tension * (1.0 - UTILISATION_TOLERANCE) - UTILISATION_TOLERANCE
        {
            m.lines.push(flag_line(
                "direction",
                case,
                f,
                s.initial_tension,
                "N",
                false,
                "an extension spring below its initial tension has closed coils: use a compression spring or change the geometry".into(),
            ));
        }
        m.notes
            .push("hook stresses are not checked (Shigley eqs. 10-34, 10-35): check the hooks with the maker's data".into());
    }
}

fn check_strut(m: &mut MemberCheck, design: &MemberDesign, forces: &[(f64, f64, &str)]) {
    let Some(sec) = design.section else {
        m.notes.push("no section: give E, I and the effective-length factor".into());
        return;
    };
    m.made_of = Some(format!(
        "E {:.3e} Pa, I {:.3e} m⁴, K {}",
        sec.modulus, sec.second_moment, sec.length_factor
    ));
    let euler = |length: f64| std::f64::consts::PI.powi(2) * sec.modulus * sec.second_moment / (sec.length_factor * length).powi(2);
    // The capacity shown in tables is the one of the check that governs.
    let mut capacities: Vec<(Capacity, f64)> = Vec::new();
    // Governing buckling case: the largest compression over its Euler load at that length.
    if let Some((f, length, case)) = worst(forces, |f| -f.0 / euler(f.1))
        && f < 0.0
    {
        let p = euler(length);
        let what = "Euler load";
        capacities.push((Capacity { value: p, unit: "N", what }, -f / p));
        m.lines.push(ratio_line(
            "buckling",
            case,
            -f,
            p / m.design_factor,
            "N",
            format!("π²EI/(KL)² at L = {length:.4} m"),
        ));
    }
    if sec.capacity.is_none() {
        m.notes
            .push("no axial capacity given: yield and squash are not checked, only buckling; give the capacity".into());
    }
    if let Some(cap) = sec.capacity
        && let Some((f, _, case)) = worst(forces, |f| f.0.abs())
    {
        let what = "axial capacity";
        capacities.push((
            Capacity {
                value: cap,
                unit: "N",
                what,
            },
            f.abs() / cap,
        ));
        m.lines.push(ratio_line(
            "capacity",
            case,
            f.abs(),
            cap / m.design_factor,
            "N",
            "|F|·DF against the given capacity".into(),
        ));
    }
    m.capacity = capacities.into_iter().max_by(|a, b| a.1.total_cmp(&b.1)).map(|(c, _)| c);
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

#[cfg(test)]
mod tests {
    use super::six_decimals;

    #[test]
    fn numbers_in_notes_drop_float_noise_and_trailing_zeros() {
        assert_eq!(six_decimals(0.144_000_000_000_000_02), "0.144");
        assert_eq!(six_decimals(0.0), "0");
        assert_eq!(six_decimals(2.5), "2.5");
        assert_eq!(six_decimals(-1e-9), "0");
        assert_eq!(six_decimals(0.1440016), "0.144002");
    }
}
