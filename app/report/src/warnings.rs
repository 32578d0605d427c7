//! The Sheet's plain statements of what needs attention, most serious first: load cases
//! without equilibrium, failing members (grouped by check and case), slack cables, large
//! displacements, members near their limit or not checked, and the checks' own notes.

use rigwright_core::Model;
use rigwright_core::sizing::{CheckReport, Status};

use crate::units::{Quantity, Units};

/// A node moving more than this fraction of the rig's size (the diagonal of its drawn
/// geometry) is pointed out among the warnings.
const LARGE_MOVE: f64 = 0.25;

/// Plain statements of what needs attention: cases without equilibrium, failing members,
/// slack cables, members near their limit, unchecked members and the checks' own notes.
pub(crate) fn warnings(model: &Model, report: &CheckReport, drawn: usize, units: Units) -> Vec<String> {
    let mut out = Vec::new();
    for c in &report.cases {
        if let Some(e) = &c.error {
            out.push(format!(
                "Load case `{}` has NO EQUILIBRIUM: {e}. Nothing in this case is a result; its members are not checked in it.",
                c.name
            ));
        }
    }
    // Failures, one statement per check and load case: "Members `a`, `b` FAIL their tension
    // check in load case `x` (utilisation up to 130.4 %): …".
    struct Failing<'a> {
        check: &'a str,
        case: &'a str,
        ids: Vec<String>,
        worst: Option<f64>,
        note: &'a str,
    }
    let mut fails: Vec<Failing> = Vec::new();
    for m in &report.members {
        if m.status != Status::Fail {
            continue;
        }
        let Some(line) = m.governing_line() else { continue };
        match fails
            .iter_mut()
            .find(|f| f.check == line.check && f.case == line.case && f.note == line.note)
        {
            Some(f) => {
                f.ids.push(m.id.clone());
                f.worst = match (f.worst, line.utilisation) {
                    (Some(a), Some(b)) => Some(a.max(b)),
                    (a, b) => a.or(b),
                };
            }
            None => fails.push(Failing {
                check: line.check,
                case: &line.case,
                ids: vec![m.id.clone()],
                worst: line.utilisation,
                note: &line.note,
            }),
        }
    }
    for Failing {
        check,
        case,
        ids,
        worst: u,
        note,
    } in fails
    {
        let case = if case.is_empty() {
            String::new()
        } else {
            format!(" in load case `{case}`")
        };
        let text = if ids.len() == 1 {
            let u = u.map(|u| format!(", utilisation {:.1} %", u * 100.0)).unwrap_or_default();
            format!("Member `{}` FAILS its {check} check{case}{u}: {note}.", ids[0])
        } else {
            let u = u.map(|u| format!(" (utilisation up to {:.1} %)", u * 100.0)).unwrap_or_default();
            format!(
                "{} FAIL their {check} check{case}{u}: {note}.",
                members_phrase(&ids, report.members.len())
            )
        };
        out.push(text);
    }
    for (ci, c) in report.cases.iter().enumerate() {
        let Some(eq) = &c.equilibrium else { continue };
        let slack: Vec<String> = eq.members.iter().filter(|r| r.slack).map(|r| format!("`{}`", r.id)).collect();
        if !slack.is_empty() {
            let drawn = if ci == drawn { " (dashed on the drawing)" } else { "" };
            out.push(format!(
                "SLACK in load case `{}`: cable(s) {} carry no tension{drawn}.",
                c.name,
                slack.join(", ")
            ));
        }
    }
    // Displacements large against the rig's size: a result, but one to look at.
    let size = model.extent();
    for c in &report.cases {
        let Some(eq) = &c.equilibrium else { continue };
        let Some((i, d)) = eq
            .nodes
            .iter()
            .map(|n| n.displacement.norm())
            .enumerate()
            .max_by(|a, b| a.1.total_cmp(&b.1))
        else {
            continue;
        };
        if d > LARGE_MOVE * size {
            out.push(format!(
                "Large displacement in load case `{}`: node `{}` moves {}, {:.0} % of the rig's size; check clearances and that this shape is intended.",
                c.name,
                model.nodes[i].id,
                units.show(Quantity::Length, d),
                100.0 * d / size
            ));
        }
    }
    out.extend(sag_warnings(model, report, units));
    let with = |status: Status| -> String {
        let ids: Vec<String> = report.members.iter().filter(|m| m.status == status).map(|m| m.id.clone()).collect();
        id_list(&ids, report.members.len())
    };
    let near = with(Status::Near);
    if !near.is_empty() {
        out.push(format!(
            "Near limit (utilisation above {:.0} %): {near}.",
            report.near_limit * 100.0
        ));
    }
    let unchecked = with(Status::NotChecked);
    if !unchecked.is_empty() {
        out.push(format!(
            "Not checked (no catalogue entry, breaking force, spring design or section given): {unchecked}."
        ));
    }
    // The same note on many members (a catalogue change, say) is one line naming them all.
    let mut notes: Vec<(&str, Vec<String>)> = Vec::new();
    for m in &report.members {
        for note in &m.notes {
            // "no catalogue entry …" notes of unchecked members are in the list above.
            if m.status == Status::NotChecked && note.starts_with("no ") {
                continue;
            }
            match notes.iter_mut().find(|(n, _)| *n == note.as_str()) {
                Some((_, ids)) => ids.push(m.id.clone()),
                None => notes.push((note, vec![m.id.clone()])),
            }
        }
    }
    for (note, ids) in notes {
        out.push(format!("{}: {note}.", members_phrase(&ids, report.members.len())));
    }
    out
}

/// A cable's end is this far (degrees) off its chord line before the warnings say the
/// fittings should follow the cable's own end angles (a judgement: a few degrees of
/// misalignment is what shackles and sockets take without comment).
const END_ANGLE_OFF_CHORD: f64 = 5.0;

/// Sag at least this fraction of the chord is pointed out.
const LARGE_SAG: f64 = 0.05;

/// Softening of a weightless cable's chord stiffness by its likely real weight beyond which
/// the warnings ask for its mass per length.
const WEIGHT_SOFTENS: f64 = 0.03;

/// Cables whose sag matters for their fittings, and weightless cables whose real weight would
/// change their stiffness: per cable, its worst load case.
fn sag_warnings(model: &Model, report: &CheckReport, units: Units) -> Vec<String> {
    let mut out = Vec::new();
    for (mi, m) in model.members.iter().enumerate() {
        let rigwright_core::MemberKind::Cable { ea, .. } = m.kind else {
            continue;
        };
        // Worst case by end angle off the chord (sagging) or by softening (weightless).
        let mut worst: Option<(f64, String)> = None;
        for (ci, c) in report.cases.iter().enumerate() {
            let Some(eq) = &c.equilibrium else { continue };
            let r = &eq.members[mi];
            let g = model.gravity.norm() * model.cases[ci].gravity.abs();
            if let Some(sag) = &r.sag {
                let chord = r.length.max(1e-300);
                let [a, b] = m.ends;
                let d = eq.nodes[b].position - eq.nodes[a].position;
                let up = -model.gravity / model.gravity.norm().max(1e-300);
                let rise = d.dot(&up);
                let chord_angle = rise.atan2((d - up * rise).norm());
                let off = (sag.angle_a - chord_angle)
                    .abs()
                    .max((sag.angle_b - chord_angle).abs())
                    .to_degrees();
                let ratio = sag.sag / chord;
                if (off > END_ANGLE_OFF_CHORD || ratio > LARGE_SAG) && worst.as_ref().is_none_or(|w| off > w.0) {
                    worst = Some((
                        off,
                        format!(
                            "Cable `{}` sags {} over its {} chord (1 : {:.0}) in load case `{}`; its ends, at {:.1}° and {:.1}° above the horizontal, leave the chord line by up to {off:.1}°: align its fittings with the cable, not the chord.",
                            m.id,
                            units.show(Quantity::Length, sag.sag),
                            units.show(Quantity::Length, chord),
                            chord / sag.sag.max(1e-300),
                            c.name,
                            sag.angle_a.to_degrees(),
                            sag.angle_b.to_degrees()
                        ),
                    ));
                }
            } else if m.mass_per_length == 0.0 && g > 0.0 && !r.slack && r.force > 0.0 {
                // A steel rope of this EA (modulus about 100 GPa on its metallic area, density
                // 7850 kg/m³; common practice) and its weight's softening by Ernst's
                // equivalent modulus, E_eq/E = 1/(1 + (w l)² EA/(12 T³)), l the horizontal span.
                let w = 7850.0 * ea / 100e9 * g;
                let [a, b] = m.ends;
                let d = eq.nodes[b].position - eq.nodes[a].position;
                let up = -model.gravity / model.gravity.norm();
                let across = (d - up * d.dot(&up)).norm(); // the horizontal span
                let soft = 1.0 - 1.0 / (1.0 + (w * across).powi(2) * ea / (12.0 * r.force.powi(3)));
                if soft > WEIGHT_SOFTENS && worst.as_ref().is_none_or(|x| soft > x.0) {
                    worst = Some((
                        soft,
                        format!(
                            "Cable `{}` has no mass per length: a steel rope of its EA weighs about {:.2} N/m, which at its {} tension in load case `{}` would soften its stiffness along the chord by up to {:.0} % (Ernst's equivalent modulus); give it its mass per length (catalogue parts carry it) so that it sags as it will.",
                            m.id,
                            w,
                            units.show(Quantity::Force, r.force),
                            c.name,
                            soft * 100.0
                        ),
                    ));
                }
            }
        }
        if let Some((_, text)) = worst {
            out.push(text);
        }
    }
    out
}

/// The subject of a statement about members: "Member `a`", "Members `a`, `b`", "All N
/// members".
fn members_phrase(ids: &[String], members: usize) -> String {
    let list = id_list(ids, members);
    if list.starts_with("all ") {
        format!("A{}", &list[1..])
    } else if ids.len() == 1 {
        format!("Member {list}")
    } else {
        format!("Members {list}")
    }
}

/// Member ids for a statement: all of them, or "all N members", or the first ten and a count.
pub(crate) fn id_list(ids: &[String], members: usize) -> String {
    let quoted: Vec<String> = ids.iter().map(|id| format!("`{id}`")).collect();
    match quoted.len() {
        n if n == members && n > 3 => format!("all {n} members"),
        n if n > 12 => format!("{} and {} more", quoted[..10].join(", "), n - 10),
        _ => quoted.join(", "),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn long_lists_of_members_are_shortened() {
        let ids: Vec<String> = (1..=14).map(|i| format!("c{i}")).collect();
        assert_eq!(id_list(&ids[..2], 20), "`c1`, `c2`");
        assert_eq!(id_list(&ids, 14), "all 14 members");
        assert_eq!(members_phrase(&ids, 14), "All 14 members");
        assert_eq!(members_phrase(&ids[..1], 14), "Member `c1`");
        assert_eq!(members_phrase(&ids[..2], 14), "Members `c1`, `c2`");
        assert_eq!(
            id_list(&ids, 20),
            "`c1`, `c2`, `c3`, `c4`, `c5`, `c6`, `c7`, `c8`, `c9`, `c10` and 4 more"
        );
    }
}
