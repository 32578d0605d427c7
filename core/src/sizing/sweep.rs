//! Sweep: vary one parameter over a range, solve one load case at each value, and collect
//! chosen outputs. A value at which the rig has no stable equilibrium gives no outputs, only
//! the reason.

use std::fmt;
use std::str::FromStr;

use serde::Serialize;

use super::catalogue::Catalogue;
use super::check::{CaseOutcome, check};
use crate::dynamics::modes_watched;
use crate::model::{Axis, CaseDoc, LoadDoc, MemberDocKind, Project, ProjectError, Rest, Vec3};
use crate::solve::Statics;
use crate::watch::Watch;

/// The quantity a Sweep varies. Text form in brackets, as typed on the command line.
#[derive(Debug, Clone, PartialEq)]
pub enum Param {
    /// `member:ID:pretension`: force in the drawn geometry (N).
    Pretension(String),
    /// `member:ID:rate`: spring rate (N/m).
    Rate(String),
    /// `member:ID:ea`: axial stiffness of a cable or strut (N).
    Ea(String),
    /// `node:ID:x|y|z`: a node's drawn coordinate (m), e.g. an anchor position.
    Coordinate(String, Axis),
    /// `node:ID:mass`: a node's lumped mass (kg).
    Mass(String),
    /// `load:CASE:NODE:x|y|z`: one component of a point load (N).
    Load { case: String, node: String, axis: Axis },
}

/// What a Sweep records at each value.
#[derive(Debug, Clone, PartialEq)]
pub enum Output {
    /// `lowest-frequency` (Hz).
    LowestFrequency,
    /// `peak-tension`: the largest member force (N).
    PeakTension,
    /// `peak-utilisation`: the largest utilisation of any check.
    PeakUtilisation,
    /// `displacement:NODE` (magnitude) or `displacement:NODE:x|y|z` (m).
    Displacement(String, Option<Axis>),
    /// `stiffness:NODE:x|y|z` (N/m).
    Stiffness(String, Axis),
    /// `force:MEMBER` (N, tension positive).
    Force(String),
}

fn axis(s: &str) -> Result<Axis, String> {
    match s {
        "x" => Ok(Axis::X),
        "y" => Ok(Axis::Y),
        "z" => Ok(Axis::Z),
        _ => Err(format!("`{s}` is not an axis; use x, y or z")),
    }
}

impl FromStr for Param {
    type Err = String;
    fn from_str(s: &str) -> Result<Self, String> {
        Self::parse(s).map_err(|why| {
            format!(
                "`{s}` is not a parameter ({why}); use member:ID:pretension, member:ID:rate, member:ID:ea, node:ID:x|y|z, node:ID:mass or load:CASE:NODE:x|y|z"
            )
        })
    }
}

impl Param {
    fn parse(s: &str) -> Result<Self, String> {
        // The last field names the quantity; ids may themselves hold ':' (the load form splits
        // the case from the node at the first ':', so a case name may not).
        let (head, last) = s.rsplit_once(':').ok_or("unknown form")?;
        let nonempty = |id: &str| {
            if id.is_empty() {
                Err("an empty id".to_string())
            } else {
                Ok(id.to_string())
            }
        };
        if let Some(id) = head.strip_prefix("member:") {
            let id = nonempty(id)?;
            return Ok(match last {
                "pretension" => Param::Pretension(id),
                "rate" => Param::Rate(id),
                "ea" => Param::Ea(id),
                _ => return Err(format!("`{last}` is not a member property")),
            });
        }
        if let Some(id) = head.strip_prefix("node:") {
            let id = nonempty(id)?;
            return Ok(match last {
                "mass" => Param::Mass(id),
                a => Param::Coordinate(id, axis(a)?),
            });
        }
        if let Some(rest) = head.strip_prefix("load:") {
            let (case, node) = rest.split_once(':').ok_or("load:CASE:NODE:axis needs a case and a node")?;
            return Ok(Param::Load {
                case: nonempty(case)?,
                node: nonempty(node)?,
                axis: axis(last)?,
            });
        }
        Err("unknown form".into())
    }
}

impl fmt::Display for Param {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Param::Pretension(id) => write!(f, "member:{id}:pretension"),
            Param::Rate(id) => write!(f, "member:{id}:rate"),
            Param::Ea(id) => write!(f, "member:{id}:ea"),
            Param::Coordinate(id, a) => write!(f, "node:{id}:{}", a.name()),
            Param::Mass(id) => write!(f, "node:{id}:mass"),
            Param::Load { case, node, axis } => write!(f, "load:{case}:{node}:{}", axis.name()),
        }
    }
}

impl Param {
    /// Unit of the varied value.
    pub fn unit(&self) -> &'static str {
        match self {
            Param::Pretension(_) | Param::Ea(_) | Param::Load { .. } => "N",
            Param::Rate(_) => "N/m",
            Param::Coordinate(..) => "m",
            Param::Mass(_) => "kg",
        }
    }

    /// The parameter's value in `p` now, if it exists there.
    pub fn current(&self, p: &Project) -> Option<f64> {
        let member = |id: &str| p.members.iter().find(|m| m.id == id);
        let node = |id: &str| p.nodes.iter().find(|n| n.id == id);
        match self {
            Param::Pretension(id) => match &member(id)?.kind {
                MemberDocKind::Cable {
                    rest: Rest::Tension(t), ..
                }
                | MemberDocKind::Spring {
                    rest: Rest::Tension(t), ..
                }
                | MemberDocKind::Strut {
                    rest: Rest::Tension(t), ..
                }
                | MemberDocKind::Cable {
                    rest: Rest::Horizontal(t), ..
                } => Some(*t),
                _ => Some(0.0),
            },
            Param::Rate(id) => match &member(id)?.kind {
                MemberDocKind::Spring { rate, .. } => Some(*rate),
                _ => None,
            },
            Param::Ea(id) => match &member(id)?.kind {
                MemberDocKind::Cable { ea, .. } | MemberDocKind::Strut { ea, .. } => Some(*ea),
                _ => None,
            },
            Param::Coordinate(id, a) => node(id).map(|n| [n.at.0, n.at.1, n.at.2][a.index()]),
            Param::Mass(id) => node(id).map(|n| n.mass),
            Param::Load { case, node, axis } => {
                let c = p.cases.iter().find(|c| &c.name == case)?;
                Some(
                    c.loads
                        .iter()
                        .filter(|l| &l.node == node)
                        .map(|l| [l.force.0, l.force.1, l.force.2][axis.index()])
                        .sum(),
                )
            }
        }
    }

    /// Sets the parameter in `p`.
    pub fn apply(&self, p: &mut Project, value: f64) -> Result<(), String> {
        let missing_member = |id: &str| format!("member `{id}` does not exist");
        let missing_node = |id: &str| format!("node `{id}` does not exist");
        match self {
            Param::Pretension(id) => {
                let m = p.members.iter_mut().find(|m| &m.id == id).ok_or_else(|| missing_member(id))?;
                match &mut m.kind {
                    // A cable's pretension given as its horizontal component stays so.
                    MemberDocKind::Cable {
                        rest: rest @ Rest::Horizontal(_),
                        ..
                    } => *rest = Rest::Horizontal(value),
                    MemberDocKind::Cable { rest, .. } | MemberDocKind::Spring { rest, .. } | MemberDocKind::Strut { rest, .. } => {
                        *rest = Rest::Tension(value)
                    }
                }
            }
            Param::Rate(id) => match &mut p.members.iter_mut().find(|m| &m.id == id).ok_or_else(|| missing_member(id))?.kind {
                MemberDocKind::Spring { rate, .. } => *rate = value,
                _ => return Err(format!("member `{id}` is not a spring; sweep `ea` of cables and struts")),
            },
            Param::Ea(id) => match &mut p.members.iter_mut().find(|m| &m.id == id).ok_or_else(|| missing_member(id))?.kind {
                MemberDocKind::Cable { ea, .. } | MemberDocKind::Strut { ea, .. } => *ea = value,
                _ => return Err(format!("member `{id}` is a spring; sweep its `rate`")),
            },
            Param::Coordinate(id, a) => {
                let n = p.nodes.iter_mut().find(|n| &n.id == id).ok_or_else(|| missing_node(id))?;
                match a {
                    Axis::X => n.at.0 = value,
                    Axis::Y => n.at.1 = value,
                    Axis::Z => n.at.2 = value,
                }
            }
            Param::Mass(id) => p.nodes.iter_mut().find(|n| &n.id == id).ok_or_else(|| missing_node(id))?.mass = value,
            Param::Load { case, node, axis } => {
                if !p.nodes.iter().any(|n| &n.id == node) {
                    return Err(missing_node(node));
                }
                if p.cases.is_empty() && case == "gravity" {
                    p.cases.push(CaseDoc {
                        name: "gravity".into(),
                        gravity: 1.0,
                        loads: Vec::new(),
                    });
                }
                let c = p
                    .cases
                    .iter_mut()
                    .find(|c| &c.name == case)
                    .ok_or_else(|| format!("load case `{case}` does not exist"))?;
                // One load per node carries the swept component; others on the node keep theirs,
                // and the first is set so that the node's total is the swept value (as `current`
                // reads it).
                let k = axis.index();
                let others: f64 = c
                    .loads
                    .iter()
                    .filter(|l| &l.node == node)
                    .skip(1)
                    .map(|l| [l.force.0, l.force.1, l.force.2][k])
                    .sum();
                let value = value - others;
                let load = match c.loads.iter().position(|l| &l.node == node) {
                    Some(i) => &mut c.loads[i],
                    None => {
                        c.loads.push(LoadDoc {
                            node: node.clone(),
                            force: (0.0, 0.0, 0.0),
                        });
                        c.loads.last_mut().expect("just pushed")
                    }
                };
                match axis {
                    Axis::X => load.force.0 = value,
                    Axis::Y => load.force.1 = value,
                    Axis::Z => load.force.2 = value,
                }
            }
        }
        Ok(())
    }
}

impl FromStr for Output {
    type Err = String;
    fn from_str(s: &str) -> Result<Self, String> {
        let parts: Vec<&str> = s.split(':').collect();
        Ok(match parts.as_slice() {
            ["lowest-frequency"] => Output::LowestFrequency,
            ["peak-tension"] => Output::PeakTension,
            ["peak-utilisation"] => Output::PeakUtilisation,
            ["displacement", node] => Output::Displacement(node.to_string(), None),
            ["displacement", node, a] => Output::Displacement(node.to_string(), Some(axis(a)?)),
            ["stiffness", node, a] => Output::Stiffness(node.to_string(), axis(a)?),
            ["force", member] => Output::Force(member.to_string()),
            _ => {
                return Err(format!(
                    "`{s}` is not an output; use lowest-frequency, peak-tension, peak-utilisation, displacement:NODE[:x|y|z], stiffness:NODE:x|y|z or force:MEMBER"
                ));
            }
        })
    }
}

impl fmt::Display for Output {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Output::LowestFrequency => write!(f, "lowest-frequency"),
            Output::PeakTension => write!(f, "peak-tension"),
            Output::PeakUtilisation => write!(f, "peak-utilisation"),
            Output::Displacement(n, None) => write!(f, "displacement:{n}"),
            Output::Displacement(n, Some(a)) => write!(f, "displacement:{n}:{}", a.name()),
            Output::Stiffness(n, a) => write!(f, "stiffness:{n}:{}", a.name()),
            Output::Force(m) => write!(f, "force:{m}"),
        }
    }
}

impl Output {
    /// Unit of the output ("" for a ratio).
    pub fn unit(&self) -> &'static str {
        match self {
            Output::LowestFrequency => "Hz",
            Output::PeakTension | Output::Force(_) => "N",
            Output::PeakUtilisation => "",
            Output::Displacement(..) => "m",
            Output::Stiffness(..) => "N/m",
        }
    }
}

/// The outputs at each value of a Sweep.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SweepResult {
    /// The varied parameter, as typed.
    pub param: String,
    pub unit: &'static str,
    pub case: String,
    /// Output names, as typed, and their units.
    pub outputs: Vec<(String, &'static str)>,
    pub values: Vec<f64>,
    /// One row per value: each output, or `None` where it could not be found.
    pub rows: Vec<Vec<Option<f64>>>,
    /// Why a row (or an output in it) is missing.
    pub notes: Vec<Option<String>>,
}

/// Most values one Sweep takes.
pub const MAX_STEPS: usize = 10_000;

/// Solves `case` (the first case when `None`) at `steps` evenly spaced values of `param` from
/// `from` to `to` and evaluates `outputs` at each.
pub fn sweep(
    project: &Project,
    catalogue: &Catalogue,
    case: Option<&str>,
    param: &Param,
    range: (f64, f64, usize),
    outputs: &[Output],
) -> Result<SweepResult, ProjectError> {
    sweep_watched(project, catalogue, case, param, range, outputs, &Watch::new())
}

/// [`sweep`] that counts finished values on `watch` and, once it is stopped, returns only
/// values finished before the stop (fewer rows than asked for; the value in progress is left
/// out).
pub fn sweep_watched(
    project: &Project,
    catalogue: &Catalogue,
    case: Option<&str>,
    param: &Param,
    (from, to, steps): (f64, f64, usize),
    outputs: &[Output],
    watch: &Watch,
) -> Result<SweepResult, ProjectError> {
    let base = project.validate()?;
    let case_index = match case {
        Some(name) => base.case_index(name).ok_or_else(|| ProjectError::Invalid {
            problems: vec![crate::model::Problem::new(
                format!("load case `{name}`"),
                "does not exist",
                format!("use one of: {}", project.case_names().join(", ")),
            )],
        })?,
        None => 0,
    };
    let case_name = base.cases[case_index].name.clone();
    let invalid = |problem: String| ProjectError::Invalid {
        problems: vec![crate::model::Problem::new("sweep", problem, "check the parameter and range")],
    };
    if !(from.is_finite() && to.is_finite() && (2..=MAX_STEPS).contains(&steps)) {
        return Err(invalid(format!("the range needs finite ends and 2 to {MAX_STEPS} steps")));
    }
    param.apply(&mut project.clone(), from).map_err(invalid)?;
    let mut result = SweepResult {
        param: param.to_string(),
        unit: param.unit(),
        case: case_name.clone(),
        outputs: outputs.iter().map(|o| (o.to_string(), o.unit())).collect(),
        values: Vec::with_capacity(steps),
        rows: Vec::with_capacity(steps),
        notes: Vec::with_capacity(steps),
    };
    let mut warm: Option<crate::solve::Warm> = None;
    for k in 0..steps {
        if watch.stopped() {
            break;
        }
        if k > 0 {
            watch.advance();
        }
        let value = from + (to - from) * k as f64 / (steps - 1) as f64;
        result.values.push(value);
        let mut p = project.clone();
        param.apply(&mut p, value).map_err(invalid)?;
        let model = match p.validate() {
            Ok(m) => m,
            Err(e) => {
                result.rows.push(vec![None; outputs.len()]);
                result.notes.push(Some(e.to_string()));
                continue;
            }
        };
        let statics = Statics::new(&model).cancel_with(watch.flag());
        let eq = match statics.solve(case_index, warm.as_ref()) {
            Ok(eq) if eq.stability.is_stable() => eq,
            Ok(eq) => {
                result.rows.push(vec![None; outputs.len()]);
                result.notes.push(Some(eq.stability.describe()));
                continue;
            }
            Err(e) => {
                result.rows.push(vec![None; outputs.len()]);
                result.notes.push(Some(e.to_string()));
                continue;
            }
        };
        let mut note: Option<String> = None;
        let mut row = Vec::with_capacity(outputs.len());
        for o in outputs {
            let v: Result<f64, String> = match o {
                Output::LowestFrequency => modes_watched(&statics, &eq, 1, &watch.child())
                    .map_err(|e| e.to_string())
                    .and_then(|m| m.modes.first().map(|m| m.frequency_hz).ok_or_else(|| "no mode".to_string())),
                Output::PeakTension => Ok(eq.members.iter().map(|m| m.force).fold(0.0, f64::max)),
                Output::PeakUtilisation => {
                    let outcome = CaseOutcome {
                        name: case_name.clone(),
                        equilibrium: Some(eq.clone()),
                        error: None,
                    };
                    let report = check(&p, &model, catalogue, vec![outcome]);
                    let unmeasured = report
                        .members
                        .iter()
                        .filter(|m| {
                            m.lines
                                .iter()
                                .any(|l| l.status == super::check::Status::Fail && l.utilisation.is_none())
                        })
                        .count();
                    if unmeasured > 0 {
                        note.get_or_insert(format!(
                            "{unmeasured} member(s) fail a check that has no utilisation (slack, direction or a missing part)"
                        ));
                    }
                    report
                        .peak_utilisation()
                        .ok_or_else(|| "no member has a capacity to check against".to_string())
                }
                Output::Displacement(node, a) => model
                    .node_index(node)
                    .map(|n| {
                        let d = eq.nodes[n].displacement;
                        a.map_or(d.norm(), |a| d[a.index()])
                    })
                    .ok_or_else(|| format!("node `{node}` does not exist")),
                Output::Stiffness(node, a) => match model.node_index(node) {
                    None => Err(format!("node `{node}` does not exist")),
                    Some(n) => statics.node_stiffness(&eq, n).map_err(|e| e.to_string()).and_then(|s| {
                        let mut d = Vec3::zeros();
                        d[a.index()] = 1.0;
                        if s.axes.contains(&a.index()) {
                            Ok(s.along(&d))
                        } else {
                            Err(format!("node `{node}` is held along {}", a.name()))
                        }
                    }),
                },
                Output::Force(member) => model
                    .member_index(member)
                    .map(|i| eq.members[i].force)
                    .ok_or_else(|| format!("member `{member}` does not exist")),
            };
            match v {
                Ok(v) if v.is_finite() => row.push(Some(v)),
                Ok(_) => row.push(None),
                Err(e) => {
                    row.push(None);
                    note.get_or_insert(format!("{o}: {e}"));
                }
            }
        }
        warm = Some((&eq).into());
        result.rows.push(row);
        result.notes.push(note);
    }
    if watch.stopped() {
        // The value in progress when the stop came may have been cut short: leave it out.
        let keep = result.values.len().saturating_sub(1);
        result.values.truncate(keep);
        result.rows.truncate(keep);
        result.notes.truncate(keep);
    } else {
        watch.advance();
    }
    Ok(result)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parameters_read_back_as_written_with_colons_in_ids() {
        for text in [
            "member:guy-a:pretension",
            "member:a:b:ea",
            "node:n1:mass",
            "node:hook:2:y",
            "load:service:top:x",
            "load:service:bay:3:z",
        ] {
            let p: Param = text.parse().unwrap_or_else(|e| panic!("{text}: {e}"));
            assert_eq!(p.to_string(), text);
        }
        assert_eq!("member:a:b:ea".parse::<Param>(), Ok(Param::Ea("a:b".into())));
        for bad in ["member::ea", "member:a:width", "node:a:w", "load:case:x", "pull:a:x", "mass"] {
            assert!(bad.parse::<Param>().is_err(), "{bad}");
        }
    }
}
