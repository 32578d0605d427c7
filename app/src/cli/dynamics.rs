//! `modes` and `pluck`: natural frequencies and nonlinear free vibration from the command line.

use std::fmt::Write as _;
use std::path::Path;

use rigwright_core::dynamics::subdivide::{PluckRig, pluck_rig};
use rigwright_core::dynamics::{
    CableLinks, MotionSettings, PluckSpec, Record, backbone, modes, modes_with, pulled_positions, rayleigh_coefficients, record,
};
use rigwright_core::{Equilibrium, Model, Statics, Vec3};
use serde_json::{Value, json};

use super::load::{EXIT_BAD_INPUT, EXIT_NO_EQUILIBRIUM, Failure};

/// Solves the case and refuses an equilibrium that is not stable.
fn stable_equilibrium(statics: &Statics, case: usize) -> Result<Equilibrium, Failure> {
    let eq = statics.solve(case, None).map_err(|e| Failure {
        code: EXIT_NO_EQUILIBRIUM,
        message: e.to_string(),
    })?;
    if !eq.stability.is_stable() {
        return Err(Failure {
            code: EXIT_NO_EQUILIBRIUM,
            message: eq.stability.describe(),
        });
    }
    Ok(eq)
}

/// `rigwright modes`.
pub fn modes_command(model: &Model, case: usize, count: usize, links: CableLinks, json: bool) -> Result<String, Failure> {
    let statics = Statics::new(model);
    let eq = stable_equilibrium(&statics, case)?;
    let ms = modes_with(&statics, &eq, count.max(1), links, &rigwright_core::Watch::new()).map_err(|e| Failure {
        code: EXIT_NO_EQUILIBRIUM,
        message: e.to_string(),
    })?;
    if json {
        let list: Vec<Value> = ms
            .modes
            .iter()
            .map(|m| {
                let shape: Vec<Value> = model
                    .nodes
                    .iter()
                    .zip(&m.shape)
                    .map(|(n, s)| json!({"id": n.id, "vector": [s.x, s.y, s.z]}))
                    .collect();
                json!({"frequency_hz": m.frequency_hz, "period_s": m.period_s, "omega_rad_s": m.omega,
                       "effective_mass_kg": m.effective_mass, "cable_share": m.cable_share, "shape": shape})
            })
            .collect();
        let doc = json!({"format": "rigwright.modes/1", "case": eq.case, "units": {"frequency": "Hz", "period": "s", "mass": "kg",
                         "shape": "mass-normalised, m·kg^-1/2"}, "mobile_mass_kg": ms.mobile_mass,
                         "cables": ms.cables, "note": ms.note, "modes": list});
        return Ok(serde_json::to_string_pretty(&doc).expect("json"));
    }
    let mut s = String::new();
    let _ = writeln!(s, "natural modes about the equilibrium of load case `{}`", eq.case);
    if !ms.cables.is_empty() {
        let list: Vec<String> = ms.cables.iter().map(|c| format!("`{}` {}", c.member, c.links)).collect();
        let _ = writeln!(
            s,
            "sagging cables cut into links so that their own mass vibrates: {}",
            if list.len() > 8 {
                format!("{} and {} more", list[..6].join(", "), list.len() - 6)
            } else {
                list.join(", ")
            }
        );
    }
    if let Some(note) = &ms.note {
        let _ = writeln!(s, "note: {note}");
    }
    let _ = writeln!(
        s,
        "{:>4} {:>14} {:>12} {:>36}  largest motion",
        "mode", "frequency [Hz]", "period [s]", "effective mass x, y, z [kg]"
    );
    for (i, m) in ms.modes.iter().enumerate() {
        let (node, v) = model
            .nodes
            .iter()
            .zip(&m.shape)
            .max_by(|a, b| a.1.norm().total_cmp(&b.1.norm()))
            .map(|(n, v)| (n.id.as_str(), v))
            .unwrap_or(("—", &m.shape[0]));
        let d = if v.norm() > 0.0 { v.normalize() } else { *v };
        let em = m.effective_mass;
        let (lead, cables) = if ms.cables.is_empty() {
            ("", String::new())
        } else if m.cable_share >= 0.5 {
            (
                "the cables' own; of the nodes, ",
                format!(" ({:.1} % of its energy in the cables)", 100.0 * m.cable_share),
            )
        } else {
            ("", format!(" ({:.1} % of its energy in the cables)", 100.0 * m.cable_share))
        };
        let _ = writeln!(
            s,
            "{:>4} {:>14.4} {:>12.5} {:>36}  {lead}node `{node}` along ({:.2}, {:.2}, {:.2}){cables}",
            i + 1,
            m.frequency_hz,
            m.period_s,
            format!("{:.2}, {:.2}, {:.2}", em[0], em[1], em[2]),
            d.x,
            d.y,
            d.z
        );
    }
    let _ = writeln!(
        s,
        "mobile mass x, y, z: {:.2}, {:.2}, {:.2} kg",
        ms.mobile_mass[0], ms.mobile_mass[1], ms.mobile_mass[2]
    );
    Ok(s)
}

/// Force histories of the original members from those of the Pluck rig's (a cable cut into
/// links: the largest of its links' tensions at each sample).
fn collapse_histories(rig: &PluckRig, histories: &[Vec<f64>]) -> Vec<Vec<f64>> {
    let samples = histories.first().map_or(0, Vec::len);
    rig.members
        .iter()
        .map(|ids| {
            (0..samples)
                .map(|t| ids.iter().map(|&i| histories[i][t]).fold(f64::NEG_INFINITY, f64::max))
                .collect()
        })
        .collect()
}

/// Arguments of `rigwright pluck`.
pub struct PluckArgs<'a> {
    pub case: usize,
    pub node: &'a str,
    pub offset: Vec3,
    pub duration: f64,
    pub dt: Option<f64>,
    pub damping: Option<f64>,
    pub rho_inf: Option<f64>,
    pub backbone: Option<usize>,
    pub links: CableLinks,
    pub csv: Option<&'a Path>,
    pub json: bool,
}

/// `rigwright pluck`.
pub fn pluck_command(model: &Model, a: &PluckArgs) -> Result<String, Failure> {
    let bad = |m: String| Failure {
        code: EXIT_BAD_INPUT,
        message: m,
    };
    let node = model
        .node_index(a.node)
        .ok_or_else(|| bad(format!("node `{}` does not exist; check the id", a.node)))?;
    if model.nodes[node].support.is_anchor() {
        return Err(bad(format!(
            "node `{}` is held in every direction, so it cannot be pulled; pluck a free node",
            a.node
        )));
    }
    if !(a.duration.is_finite() && a.duration > 0.0) {
        return Err(bad(format!("duration {} s: give a positive time in seconds", a.duration)));
    }
    if a.offset.norm() == 0.0 || !a.offset.iter().all(|v| v.is_finite()) {
        return Err(bad("offset must be a finite, non-zero displacement in metres, e.g. 0,-0.05".into()));
    }
    let statics = Statics::new(model);
    let eq = stable_equilibrium(&statics, a.case)?;
    let ms = modes(&statics, &eq, 2).map_err(|e| Failure {
        code: EXIT_NO_EQUILIBRIUM,
        message: e.to_string(),
    })?;
    let w1 = ms.modes.first().map(|m| m.omega).ok_or_else(|| Failure {
        code: EXIT_NO_EQUILIBRIUM,
        message: "no vibration mode".into(),
    })?;
    let w2 = ms.modes.get(1).map(|m| m.omega).unwrap_or(3.0 * w1);
    let dt = a.dt.unwrap_or((std::f64::consts::TAU / w1 / 200.0).min(1e-3));
    if !(dt.is_finite() && dt > 0.0) {
        return Err(bad(format!("time step {dt} s: give a positive time step")));
    }
    let mut settings = MotionSettings { dt, ..Default::default() };
    if let Some(z) = a.damping {
        if !(0.0..1.0).contains(&z) {
            return Err(bad(format!("damping ratio {z}: give a fraction between 0 and 1, e.g. 0.02")));
        }
        settings.rayleigh = rayleigh_coefficients(z, w1, w2);
    }
    if let Some(r) = a.rho_inf {
        if !(0.0..=1.0).contains(&r) {
            return Err(bad(format!("spectral radius {r}: give a value between 0 and 1")));
        }
        settings.scheme = rigwright_core::dynamics::Scheme::GeneralizedAlpha { rho_inf: r };
    }
    let pull_fail = |e: rigwright_core::SolveError| Failure {
        code: EXIT_NO_EQUILIBRIUM,
        message: format!("could not pull node `{}`: {e}", a.node),
    };
    let start = pulled_positions(model, a.case, &eq, node, a.offset).map_err(pull_fail)?;
    // Sagging cables cut into links so that their own mass moves.
    let rig = pluck_rig(model, a.case, &eq, &start, node, a.links).map_err(pull_fail)?;
    let motion_fail = |e: rigwright_core::dynamics::MotionError| Failure {
        code: EXIT_NO_EQUILIBRIUM,
        message: e.to_string(),
    };
    let mut motion =
        rigwright_core::dynamics::Motion::new(&rig.model, a.case, &rig.start, None, &rig.about, settings.clone()).map_err(motion_fail)?;
    let mut rec = record(&mut motion, &rig.model, node, rig.about[node], a.duration, 20_000).map_err(motion_fail)?;
    rec.member_force = collapse_histories(&rig, &rec.member_force);
    let dir = a.offset.normalize();
    let dominant = rec.dominant_frequency(&dir);
    let curve = match a.backbone {
        Some(steps) if steps > 0 => {
            let amps: Vec<f64> = (1..=steps).map(|k| a.offset.norm() * k as f64 / steps as f64).collect();
            let spec = PluckSpec {
                case: a.case,
                node,
                direction: dir,
                duration: a.duration,
                settings: settings.clone(),
            };
            Some(backbone(model, &eq, &spec, &amps).map_err(|e| Failure {
                code: EXIT_NO_EQUILIBRIUM,
                message: e.to_string(),
            })?)
        }
        _ => None,
    };
    if let Some(path) = a.csv {
        rigwright_core::model::write_atomic(path, csv(model, &rec).as_bytes()).map_err(|e| bad(e.to_string()))?;
    }
    let peaks: Vec<(f64, f64)> = rec
        .member_force
        .iter()
        .map(|h| {
            (
                h.iter().copied().fold(f64::INFINITY, f64::min),
                h.iter().copied().fold(f64::NEG_INFINITY, f64::max),
            )
        })
        .collect();
    if a.json {
        let members: Vec<Value> = model
            .members
            .iter()
            .zip(&peaks)
            .map(|(m, (lo, hi))| json!({"id": m.id, "min_force": lo, "max_force": hi}))
            .collect();
        let doc = json!({
            "format": "rigwright.pluck/1",
            "case": eq.case, "node": a.node, "offset": [a.offset.x, a.offset.y, a.offset.z],
            "dt": dt, "duration": a.duration,
            "units": {"time": "s", "length": "m", "force": "N", "energy": "J", "frequency": "Hz"},
            "dominant_frequency_hz": dominant,
            "linear_frequency_hz": ms.modes[0].frequency_hz,
            "energy_error": rec.energy_error(),
            "slack_events": rec.slack_events,
            "cables": rig.cables,
            "note": rig.note,
            "members": members,
            "backbone": curve,
            "history": {"time": rec.time, "displacement": rec.displacement.iter().map(|u| [u.x, u.y, u.z]).collect::<Vec<_>>(),
                        "member_force": rec.member_force, "energy": rec.energy},
        });
        return Ok(serde_json::to_string_pretty(&doc).expect("json"));
    }
    let mut s = String::new();
    let _ = writeln!(
        s,
        "Pluck of node `{}` in load case `{}`: pulled by ({:.4}, {:.4}, {:.4}) m and released",
        a.node, eq.case, a.offset.x, a.offset.y, a.offset.z
    );
    let _ = writeln!(s, "time step {dt:.3e} s, duration {:.3} s, {} samples", a.duration, rec.time.len());
    if !rig.cables.is_empty() {
        let list: Vec<String> = rig.cables.iter().map(|c| format!("`{}` {}", c.member, c.links)).collect();
        let list = if list.len() > 8 {
            format!("{} and {} more", list[..6].join(", "), list.len() - 6)
        } else {
            list.join(", ")
        };
        let _ = writeln!(
            s,
            "sagging cables cut into links so that their own mass moves (a cable's force: its largest link tension): {list}"
        );
    }
    if let Some(note) = &rig.note {
        let _ = writeln!(s, "note: {note}");
    }
    match dominant {
        Some(f) => {
            let _ = writeln!(
                s,
                "dominant frequency {f:.4} Hz (lowest linear natural frequency {:.4} Hz)",
                ms.modes[0].frequency_hz
            );
        }
        None => {
            let _ = writeln!(
                s,
                "no dominant frequency found (lowest linear natural frequency {:.4} Hz)",
                ms.modes[0].frequency_hz
            );
        }
    }
    let _ = writeln!(
        s,
        "energy error {:.2e} of the energy in motion; {} cable slack event(s)",
        rec.energy_error(),
        rec.slack_events
    );
    let _ = writeln!(s, "\n{:<14} {:>14} {:>14}", "member", "min force [N]", "max force [N]");
    for (m, (lo, hi)) in model.members.iter().zip(&peaks) {
        let _ = writeln!(s, "{:<14} {lo:>14.2} {hi:>14.2}", m.id);
    }
    if let Some(curve) = curve {
        let _ = writeln!(s, "\n{:>14} {:>16}", "pull [m]", "frequency [Hz]");
        for p in curve {
            let f = p.frequency_hz.map(|f| format!("{f:.4}")).unwrap_or_else(|| "—".into());
            let _ = writeln!(s, "{:>14.5} {f:>16}", p.amplitude);
        }
    }
    Ok(s)
}

fn csv(model: &Model, rec: &Record) -> String {
    let mut s = String::from("time_s,ux_m,uy_m,uz_m");
    for m in &model.members {
        let _ = write!(s, ",{}_force_N", m.id.replace(',', "_"));
    }
    s.push_str(",kinetic_J,strain_J,load_potential_J,damped_J,numerical_J\n");
    for (k, t) in rec.time.iter().enumerate() {
        let u = rec.displacement[k];
        let _ = write!(s, "{t},{},{},{}", u.x, u.y, u.z);
        for h in &rec.member_force {
            let _ = write!(s, ",{}", h[k]);
        }
        let e = rec.energy[k];
        let _ = writeln!(s, ",{},{},{},{},{}", e.kinetic, e.strain, e.load, e.damped, e.numerical);
    }
    s
}
