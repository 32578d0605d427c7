//! Text and JSON renderings of results for the command line.

use std::fmt::Write;

use rigwright_core::solve::{LoadPathTrace, sig6};
use rigwright_core::{Equilibrium, Model, NodeStiffness, SolveError};
use serde_json::{Value, json};

fn v3(v: &rigwright_core::Vec3) -> Value {
    json!([v.x, v.y, v.z])
}

/// `rigwright.solve/1` document. A state that is not stable is not an answer: the document
/// then gives the diagnostic and leaves the node and member values out.
pub fn solve_json(eq: &Equilibrium, k: Option<&NodeStiffness>) -> String {
    if !eq.stability.is_stable() {
        let doc = json!({
            "format": "rigwright.solve/1",
            "case": eq.case,
            "converged": true,
            "stable": false,
            "stability": eq.stability,
            "route": eq.route,
            "diagnostic": eq.stability.describe(),
            "iterations": eq.iterations,
            "residual": eq.residual,
        });
        return serde_json::to_string_pretty(&doc).expect("json");
    }
    let nodes: Vec<Value> = eq
        .nodes
        .iter()
        .map(|n| json!({"id": n.id, "position": v3(&n.position), "displacement": v3(&n.displacement), "reaction": n.reaction.as_ref().map(v3)}))
        .collect();
    let members: Vec<Value> = eq.members.iter().map(rigwright_report::export::member_json).collect();
    let mut doc = json!({
        "format": "rigwright.solve/1",
        "units": {"length": "m", "force": "N", "stiffness": "N/m"},
        "case": eq.case,
        "converged": true,
        "stable": eq.stability.is_stable(),
        "stability": eq.stability,
        "route": eq.route,
        "iterations": eq.iterations,
        "load_steps": eq.load_steps,
        "residual": eq.residual,
        "nodes": nodes,
        "members": members,
    });
    if let Some(k) = k {
        doc["stiffness"] = serde_json::to_value(k).expect("stiffness serialises");
    }
    serde_json::to_string_pretty(&doc).expect("json")
}

/// JSON printed when no equilibrium was found.
pub fn failure_json(model: &Model, case: usize, e: &SolveError) -> String {
    let doc = json!({
        "format": "rigwright.solve/1",
        "case": model.cases[case].name,
        "converged": false,
        "stable": false,
        "kind": e.kind(),
        "critical_load_factor": e.critical_load_factor(),
        "diagnostic": e.to_string(),
    });
    serde_json::to_string_pretty(&doc).expect("json")
}

/// Readable tables of members, nodes and (optionally) the stiffness at a node.
pub fn solve_table(model: &Model, eq: &Equilibrium, k: Option<&NodeStiffness>) -> String {
    let mut s = String::new();
    let title = if model.title.is_empty() { "(untitled rig)" } else { &model.title };
    let _ = writeln!(s, "{title} — load case `{}`", eq.case);
    let steps = if eq.load_steps == 1 {
        "1 load step".to_string()
    } else {
        format!("{} load steps", eq.load_steps)
    };
    let _ = writeln!(
        s,
        "{}; {} Newton iterations in {steps}, relative residual {:.2e}",
        eq.stability.describe(),
        eq.iterations,
        eq.residual
    );
    if let Some(route) = eq.route.describe() {
        let _ = writeln!(s, "note: {route}");
    }
    let _ = writeln!(s);
    if !eq.stability.is_stable() {
        let _ = writeln!(s, "no table: a state that is not stable is not an answer.");
        return s;
    }
    let _ = writeln!(
        s,
        "{:<14} {:<7} {:>14} {:>12} {:>12} {:>10}  state",
        "member", "kind", "force [N]", "length [m]", "L0 [m]", "strain"
    );
    for m in &eq.members {
        let state = if m.slack {
            "SLACK"
        } else if m.force < 0.0 {
            "compression"
        } else {
            "tension"
        };
        let _ = writeln!(
            s,
            "{:<14} {:<7} {:>14.2} {:>12.5} {:>12.5} {:>10.3e}  {state}",
            m.id,
            m.kind.name(),
            m.force,
            m.length,
            m.unstressed_length,
            m.strain
        );
    }
    if eq.members.iter().any(|m| m.sag.is_some()) {
        let _ = writeln!(
            s,
            "\ncables that sag under their own weight (force above = the larger end tension; angles above the horizontal, rising towards end b)\n{:<14} {:>12} {:>12} {:>12} {:>10} {:>13} {:>10} {:>10} {:>14}",
            "member", "T at a [N]", "T at b [N]", "H [N]", "sag [m]", "mid-span [m]", "at a [°]", "at b [°]", "stretched [m]"
        );
        for m in &eq.members {
            if let Some(g) = &m.sag {
                let _ = writeln!(
                    s,
                    "{:<14} {:>12.2} {:>12.2} {:>12.2} {:>10.4} {:>13.4} {:>10.2} {:>10.2} {:>14.5}",
                    m.id,
                    g.tension_a,
                    g.tension_b,
                    g.horizontal,
                    g.sag,
                    g.mid_span_sag,
                    g.angle_a.to_degrees(),
                    g.angle_b.to_degrees(),
                    g.stretched_length
                );
            }
        }
    }
    let _ = writeln!(
        s,
        "\n{:<14} {:>30} {:>36}",
        "node", "displacement [mm] (x, y, z)", "reaction [N] (x, y, z)"
    );
    for n in &eq.nodes {
        let d = n.displacement * 1000.0;
        let r = match &n.reaction {
            Some(r) => format!("({:.2}, {:.2}, {:.2})", r.x, r.y, r.z),
            None => "—".into(),
        };
        let _ = writeln!(s, "{:<14} {:>30} {:>36}", n.id, format!("({:.3}, {:.3}, {:.3})", d.x, d.y, d.z), r);
    }
    if let Some(k) = k {
        let axes: Vec<&str> = k.axes.iter().map(|a| ["x", "y", "z"][*a]).collect();
        let _ = writeln!(s, "\ntangent stiffness at node `{}` [N/m], axes {}:", k.node, axes.join(", "));
        for (label, mat) in [("total", &k.total), ("elastic", &k.elastic), ("geometric", &k.geometric)] {
            let _ = writeln!(s, "  {label}:");
            for row in mat {
                let _ = writeln!(s, "    {}", row.iter().map(|v| format!("{v:>14.2}")).collect::<Vec<_>>().join(" "));
            }
        }
        for p in &k.principal {
            let _ = writeln!(
                s,
                "  principal {:>14.2} N/m along ({:.3}, {:.3}, {:.3})",
                p.value, p.direction.x, p.direction.y, p.direction.z
            );
        }
    }
    s
}

/// The traced path as a table, CSV or a `rigwright.path/1` JSON document (SI units).
pub fn path_output(trace: &LoadPathTrace, csv: bool, json: bool) -> String {
    if json {
        let doc = json!({
            "format": "rigwright.path/1",
            "units": {"displacement": "m"},
            "case": trace.case,
            "node": trace.node,
            "reached": trace.reached,
            "critical": trace.critical,
            "points": trace.points.iter().map(|p| json!({"load_factor": p.load_factor, "displacement": v3(&p.displacement), "stable": p.stable})).collect::<Vec<_>>(),
        });
        return serde_json::to_string_pretty(&doc).expect("json");
    }
    let mut s = String::new();
    if csv {
        let _ = writeln!(s, "load_factor,ux_m,uy_m,uz_m,stable");
        for p in &trace.points {
            let d = p.displacement;
            let _ = writeln!(s, "{},{},{},{},{}", p.load_factor, d.x, d.y, d.z, p.stable);
        }
        return s;
    }
    let _ = writeln!(
        s,
        "load path of case `{}`, node `{}` ({} points)",
        trace.case,
        trace.node,
        trace.points.len()
    );
    for c in &trace.critical {
        let d = c.displacement * 1000.0;
        let _ = writeln!(
            s,
            "{} at load factor {} (node displacement ({:.3}, {:.3}, {:.3}) mm)",
            c.kind,
            sig6(c.load_factor),
            d.x,
            d.y,
            d.z
        );
    }
    let _ = writeln!(s, "{:>14} {:>36}  state", "load factor", "displacement [mm] (x, y, z)");
    for p in &trace.points {
        let d = p.displacement * 1000.0;
        let _ = writeln!(
            s,
            "{:>14.6} {:>36}  {}",
            p.load_factor,
            format!("({:.3}, {:.3}, {:.3})", d.x, d.y, d.z),
            if p.stable { "stable" } else { "UNSTABLE" }
        );
    }
    if !trace.reached {
        let _ = writeln!(s, "the path stopped before the load factor asked for");
    }
    s
}
