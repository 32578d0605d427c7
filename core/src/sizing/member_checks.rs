//! The checks of one member against its design across the solved load cases: a cable's
//! tension against its minimum breaking force and its slack, a spring's stress, solid length
//! and buckling, a strut's buckling and capacity. Each check is a line with its demand, limit,
//! utilisation and the formula as printed.

use super::catalogue::Catalogue;
use super::check_report::{Capacity, CheckLine, MemberCheck, Status};
use super::design::{MemberDesign, SizingDoc};

/// A utilisation may exceed 1 by this much and still pass: the solver's forces are exact to
/// its residual tolerance (1e-10 relative), not to the last bit.
pub const UTILISATION_TOLERANCE: f64 = 1e-9;

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

pub(super) fn check_cable(
    m: &mut MemberCheck,
    design: &MemberDesign,
    (ea, mass_per_length): (f64, f64),
    sizing: &SizingDoc,
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

pub(super) fn check_spring(m: &mut MemberCheck, design: &MemberDesign, k: f64, l0: f64, forces: &[(f64, f64, &str)]) {
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

pub(super) fn check_strut(m: &mut MemberCheck, design: &MemberDesign, forces: &[(f64, f64, &str)]) {
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
