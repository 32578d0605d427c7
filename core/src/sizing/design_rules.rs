//! What design data a project may hold: design factors of 1 or more, efficiencies and the
//! near limit in (0, 1], positive sizes of springs and sections, sound catalogue parts.
//!
//! Part of validation ([`Model::from_project`](crate::Model::from_project) lists these
//! problems with the rest); kept apart from the design data itself (`design.rs`), which the
//! stored document includes, so that the data never needs the document.

use crate::model::{Problem, Project};

/// Problems with the design data of a project, each naming the item and the fix.
pub fn design_problems(p: &Project) -> Vec<Problem> {
    let mut out = Vec::new();
    let positive = |v: f64| v.is_finite() && v > 0.0;
    let s = &p.sizing;
    for (name, v) in [
        ("cable", s.design_factors.cable),
        ("spring", s.design_factors.spring),
        ("strut", s.design_factors.strut),
    ] {
        if !(v.is_finite() && v >= 1.0) {
            out.push(Problem::new(
                "sizing",
                format!("{name} design factor {v} is below 1"),
                "use a design factor of 1 or more",
            ));
        }
    }
    if !(s.near_limit.is_finite() && s.near_limit > 0.0 && s.near_limit <= 1.0) {
        out.push(Problem::new(
            "sizing",
            format!("near limit {} is not in (0, 1]", s.near_limit),
            "use e.g. 0.9",
        ));
    }
    if !(s.slack_threshold.is_finite() && s.slack_threshold >= 0.0) {
        out.push(Problem::new("sizing", "slack threshold must be 0 N or more", "use e.g. 0"));
    }
    if !(positive(s.termination_efficiency) && s.termination_efficiency <= 1.0) {
        out.push(Problem::new(
            "sizing",
            format!("termination efficiency {} is not in (0, 1]", s.termination_efficiency),
            "use the termination's rated efficiency, e.g. 0.8",
        ));
    }
    for part in &s.parts {
        if let Some(why) = part.problem() {
            out.push(Problem::new("sizing parts", why, "correct the entry"));
        }
    }
    for m in &p.members {
        let Some(d) = &m.design else { continue };
        let item = format!("member `{}`", m.id);
        if let Some(v) = d.design_factor
            && !(v.is_finite() && v >= 1.0)
        {
            out.push(Problem::new(
                &item,
                format!("design factor {v} is below 1"),
                "use 1 or more, or remove it to use the class default",
            ));
        }
        if let Some(v) = d.termination_efficiency
            && !(positive(v) && v <= 1.0)
        {
            out.push(Problem::new(
                &item,
                format!("termination efficiency {v} is not in (0, 1]"),
                "use the termination's rated efficiency",
            ));
        }
        if let Some(v) = d.breaking_force
            && !positive(v)
        {
            out.push(Problem::new(
                &item,
                format!("breaking force {v} N is not positive"),
                "give the rated minimum breaking force in newtons",
            ));
        }
        if let Some(sp) = &d.spring {
            let ok = positive(sp.wire_mm)
                && positive(sp.mean_mm)
                && sp.mean_mm > sp.wire_mm
                && positive(sp.active_coils)
                && positive(sp.free_length_mm)
                && positive(sp.buckling_alpha)
                && sp.initial_tension.is_finite()
                && sp.initial_tension >= 0.0;
            if !ok {
                out.push(Problem::new(
                    &item,
                    "spring design has a size that is not positive (or a mean diameter not above the wire)",
                    "give wire and mean diameters, active coils and free length as positive numbers",
                ));
            }
        }
        if let Some(sec) = &d.section {
            let ok =
                positive(sec.modulus) && positive(sec.second_moment) && positive(sec.length_factor) && sec.capacity.is_none_or(positive);
            if !ok {
                out.push(Problem::new(
                    &item,
                    "strut section has a value that is not positive",
                    "give E (Pa), I (m⁴), K and the capacity (N) as positive numbers",
                ));
            }
        }
    }
    out
}
