//! Result files: CSV tables of members and nodes, and the full result as one JSON document.
//!
//! Always SI; every CSV column name ends in its unit (`force_max_N`, `ux_m`) or names a
//! dimensionless or text value. The JSON document's `format` is `rigwright.result/1`.

use rigwright_core::Vec3;
use rigwright_core::element::MemberClass;
use rigwright_core::sizing::DesignFactors;
use serde_json::{Value, json};

use super::content::Sheet;

/// Version tag of the JSON document.
pub const RESULT_FORMAT: &str = "rigwright.result/1";

/// Header of the members CSV.
pub const MEMBER_COLUMNS: &[&str] = &[
    "member",
    "kind",
    "node_a",
    "node_b",
    "made_of",
    "unstressed_length_m",
    "force_N",
    "length_m",
    "slack",
    "force_min_N",
    "force_min_case",
    "force_max_N",
    "force_max_case",
    "capacity_N",
    "allowable_stress_Pa",
    "capacity_what",
    "design_factor",
    "utilisation",
    "governing_check",
    "governing_case",
    "status",
];

/// Header of the nodes CSV.
pub const NODE_COLUMNS: &[&str] = &[
    "node", "support", "mass_kg", "x_m", "y_m", "z_m", "ux_m", "uy_m", "uz_m", "rx_N", "ry_N", "rz_N",
];

/// One CSV field, quoted when it holds a comma, quote or line break (RFC 4180).
fn field(s: &str) -> String {
    if s.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}

fn num(v: f64) -> String {
    format!("{v}")
}

fn line(fields: &[String]) -> String {
    let mut s = fields.iter().map(|f| field(f)).collect::<Vec<_>>().join(",");
    s.push('\n');
    s
}

fn support_word(sheet: &Sheet, i: usize) -> &'static str {
    let n = &sheet.model.nodes[i];
    if !sheet.model.has_reaction(i) {
        "free"
    } else if n.support.is_anchor() || (sheet.model.planar && n.support.fixed[0] && n.support.fixed[1]) {
        "anchor"
    } else {
        "guided"
    }
}

/// Members: checks across all cases, plus force and length in the sheet's load case (empty
/// where that case has no equilibrium).
pub fn members_csv(sheet: &Sheet) -> String {
    let mut out = line(&MEMBER_COLUMNS.iter().map(|s| s.to_string()).collect::<Vec<_>>());
    let eq = sheet.equilibrium();
    for (i, m) in sheet.report.members.iter().enumerate() {
        let member = &sheet.model.members[i];
        let r = eq.map(|eq| &eq.members[i]);
        let (cap_n, cap_pa, what) = match &m.capacity {
            Some(c) if c.unit == "Pa" => (String::new(), num(c.value), c.what.to_string()),
            Some(c) => (num(c.value), String::new(), c.what.to_string()),
            None => (String::new(), String::new(), String::new()),
        };
        let g = m.governing_line();
        out.push_str(&line(&[
            m.id.clone(),
            m.class.name().into(),
            sheet.model.nodes[member.ends[0]].id.clone(),
            sheet.model.nodes[member.ends[1]].id.clone(),
            m.made_of.clone().unwrap_or_default(),
            num(member.kind.rest_length()),
            r.map(|r| num(r.force)).unwrap_or_default(),
            r.map(|r| num(r.length)).unwrap_or_default(),
            r.map(|r| r.slack.to_string()).unwrap_or_default(),
            m.force_min.as_ref().map(|f| num(f.0)).unwrap_or_default(),
            m.force_min.as_ref().map(|f| f.1.clone()).unwrap_or_default(),
            m.force_max.as_ref().map(|f| num(f.0)).unwrap_or_default(),
            m.force_max.as_ref().map(|f| f.1.clone()).unwrap_or_default(),
            cap_n,
            cap_pa,
            what,
            num(m.design_factor),
            m.utilisation.map(num).unwrap_or_default(),
            g.map(|l| l.check.to_string()).unwrap_or_default(),
            g.map(|l| l.case.clone()).unwrap_or_default(),
            m.status.word().into(),
        ]));
    }
    out
}

/// Nodes in the sheet's load case; `None` when that case has no equilibrium (no numbers are
/// written for a state that is not a result).
pub fn nodes_csv(sheet: &Sheet) -> Option<String> {
    let eq = sheet.equilibrium()?;
    let mut out = line(&NODE_COLUMNS.iter().map(|s| s.to_string()).collect::<Vec<_>>());
    for (i, (n, r)) in sheet.model.nodes.iter().zip(&eq.nodes).enumerate() {
        let reaction = |a: usize| r.reaction.map(|f| num(f[a])).unwrap_or_default();
        out.push_str(&line(&[
            n.id.clone(),
            support_word(sheet, i).into(),
            num(n.mass),
            num(n.position.x),
            num(n.position.y),
            num(n.position.z),
            num(r.displacement.x),
            num(r.displacement.y),
            num(r.displacement.z),
            reaction(0),
            reaction(1),
            reaction(2),
        ]));
    }
    Some(out)
}

fn v3(v: &Vec3) -> Value {
    json!([v.x, v.y, v.z])
}

/// One member's result as JSON (SI): force, length, unstressed length, strain and slackness,
/// and for a cable that sags under its own weight a `sag` object — `tension_a`, `tension_b`
/// (N, at each end; `force` is the larger), `horizontal` (N), `sag` (largest distance from the
/// chord, m), `mid_span_sag` (below the chord half-way across, m), `angle_a_deg`, `angle_b_deg`
/// (above the horizontal where the cable leaves end a and meets end b, rising towards b
/// positive), `stretched_length` (m), `weight` (N) and `curve` (points end a to end b, m).
pub fn member_json(m: &rigwright_core::solve::MemberResult) -> Value {
    let mut v = json!({"id": m.id, "kind": m.kind.name(), "force": m.force, "length": m.length,
                       "unstressed_length": m.unstressed_length, "strain": m.strain, "slack": m.slack});
    if let Some(s) = &m.sag {
        v["sag"] = json!({
            "tension_a": s.tension_a, "tension_b": s.tension_b, "horizontal": s.horizontal,
            "sag": s.sag, "mid_span_sag": s.mid_span_sag,
            "angle_a_deg": s.angle_a.to_degrees(), "angle_b_deg": s.angle_b.to_degrees(),
            "stretched_length": s.stretched_length, "weight": s.weight,
            "curve": s.curve.iter().map(v3).collect::<Vec<_>>(),
        });
    }
    v
}

/// The full result: every case (equilibrium or why none), every member check with its lines,
/// the design basis, modes and stiffness of the sheet's case, and traceability.
pub fn result_json(sheet: &Sheet) -> String {
    let cases: Vec<Value> = sheet
        .report
        .cases
        .iter()
        .map(|c| match &c.equilibrium {
            Some(eq) => json!({
                "name": c.name,
                "converged": true,
                "stable": true,
                "iterations": eq.iterations,
                "load_steps": eq.load_steps,
                "residual": eq.residual,
                "nodes": eq.nodes.iter().map(|n| json!({
                    "id": n.id, "position": v3(&n.position), "displacement": v3(&n.displacement),
                    "reaction": n.reaction.as_ref().map(v3)})).collect::<Vec<_>>(),
                "members": eq.members.iter().map(member_json).collect::<Vec<_>>(),
            }),
            None => json!({"name": c.name, "converged": false, "stable": false, "diagnostic": c.error}),
        })
        .collect();
    let factors: Vec<Value> = [MemberClass::Cable, MemberClass::Spring, MemberClass::Strut]
        .into_iter()
        .map(|c| json!({"class": c.name(), "value": sheet.report.design_factors.of(c), "source": DesignFactors::source(c)}))
        .collect();
    let modes = match &sheet.modes {
        Ok(m) => json!({"modes": m.modes.iter().map(|m| json!({
            "frequency_hz": m.frequency_hz, "period_s": m.period_s, "effective_mass": m.effective_mass})).collect::<Vec<_>>(),
            "mobile_mass": m.mobile_mass}),
        Err(e) => json!({"none": e}),
    };
    let stiffness: Vec<Value> = sheet
        .stiffness
        .iter()
        .map(|(id, k)| match k {
            Ok(k) => serde_json::to_value(k).expect("stiffness serialises"),
            Err(e) => json!({"node": id, "none": e}),
        })
        .collect();
    let doc = json!({
        "format": RESULT_FORMAT,
        "program": {"name": "rigwright", "version": env!("CARGO_PKG_VERSION")},
        "project": {"title": sheet.project.title, "file": sheet.file_name, "sha256": sheet.sha256,
                    "unsaved_changes": sheet.unsaved, "sheet": sheet.info},
        "units": {"length": "m", "force": "N", "stiffness": "N/m", "stress": "Pa", "mass": "kg", "frequency": "Hz"},
        "passes": sheet.report.passes(),
        "verdict": sheet.verdict(),
        "warnings": sheet.warnings,
        "case": sheet.case_name(),
        "cases": cases,
        "checks": sheet.report.members,
        "design_factors": factors,
        "near_limit": sheet.report.near_limit,
        "natural_frequencies": modes,
        "stiffness": stiffness,
    });
    serde_json::to_string_pretty(&doc).expect("json")
}
