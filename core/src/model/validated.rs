//! The validated model: what the solvers borrow.

use std::collections::HashMap;

use super::Vec3;
use super::error::Problem;
use super::project::{MemberDocKind, Project, Rest};
use crate::element::MemberKind;

/// Which translations of a node are held.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Support {
    pub fixed: [bool; 3],
}

impl Support {
    /// Nothing held.
    pub const FREE: Support = Support { fixed: [false; 3] };
    /// Everything held.
    pub const ANCHOR: Support = Support { fixed: [true; 3] };

    /// True when any direction is held (the node has a reaction).
    pub fn is_supported(&self) -> bool {
        self.fixed.iter().any(|f| *f)
    }

    /// True when all directions are held.
    pub fn is_anchor(&self) -> bool {
        self.fixed.iter().all(|f| *f)
    }
}

/// A validated node.
#[derive(Debug, Clone, PartialEq)]
pub struct Node {
    pub id: String,
    /// Position as drawn (m).
    pub position: Vec3,
    /// Lumped mass (kg), including half of each attached member's own mass.
    pub mass: f64,
    /// Held directions, after the planar constraint is applied.
    pub support: Support,
}

/// A validated member with its rest length resolved.
#[derive(Debug, Clone, PartialEq)]
pub struct Member {
    pub id: String,
    /// Node indices of the ends.
    pub ends: [usize; 2],
    pub kind: MemberKind,
    /// Mass per unstressed length (kg/m). A cable with mass sags under its own weight (an
    /// elastic catenary that carries its weight in its law); the mass of a spring or strut is
    /// lumped half to each end node instead.
    pub mass_per_length: f64,
}

impl Member {
    /// True for a cable whose own weight is in its law (it sags): its mass is not in the node
    /// masses that carry the nodal weights.
    pub fn sags(&self) -> bool {
        self.mass_per_length > 0.0 && matches!(self.kind, MemberKind::Cable { .. })
    }
}

/// A load case: gravity multiplier and nodal point loads (N).
#[derive(Debug, Clone, PartialEq)]
pub struct LoadCase {
    pub name: String,
    pub gravity: f64,
    /// (node index, force) pairs.
    pub loads: Vec<(usize, Vec3)>,
}

/// A rig ready for the solvers. Build it with [`Project::validate`].
#[derive(Debug, Clone, PartialEq)]
pub struct Model {
    pub title: String,
    pub planar: bool,
    /// Gravitational acceleration (m/s²).
    pub gravity: Vec3,
    pub nodes: Vec<Node>,
    pub members: Vec<Member>,
    pub cases: Vec<LoadCase>,
}

fn finite3(v: (f64, f64, f64)) -> bool {
    v.0.is_finite() && v.1.is_finite() && v.2.is_finite()
}

/// Largest coordinate accepted (m): far beyond any site grid, small enough that lengths,
/// forces and energies of a rig stay finite.
pub const MAX_COORDINATE: f64 = 1e8;
/// Largest mass (kg), force component (N) and mass per length (kg/m) accepted.
pub const MAX_MASS: f64 = 1e12;
pub const MAX_FORCE: f64 = 1e15;
pub const MAX_MASS_PER_LENGTH: f64 = 1e6;
/// Largest EA (N) or spring rate (N/m), and largest member rate EA/L0 (N/m), accepted.
pub const MAX_STIFFNESS: f64 = 1e15;
pub const MAX_RATE: f64 = 1e18;
/// Shortest unstressed or free length accepted (m), other than a spring's free length of 0.
pub const MIN_LENGTH: f64 = 1e-9;
/// Largest gravity component (m/s²) and load-case gravity multiplier accepted.
pub const MAX_GRAVITY: f64 = 1e4;
pub const MAX_MULTIPLIER: f64 = 1e6;

fn v3(v: (f64, f64, f64)) -> Vec3 {
    Vec3::new(v.0, v.1, v.2)
}

impl Model {
    /// Index of the node with this id.
    pub fn node_index(&self, id: &str) -> Option<usize> {
        self.nodes.iter().position(|n| n.id == id)
    }

    /// True when the node is held in a direction that carries a reaction (the implicit z
    /// restraint of a planar rig does not count).
    pub fn has_reaction(&self, node: usize) -> bool {
        let f = self.nodes[node].support.fixed;
        f[0] || f[1] || (f[2] && !self.planar)
    }

    /// Index of the member with this id.
    pub fn member_index(&self, id: &str) -> Option<usize> {
        self.members.iter().position(|m| m.id == id)
    }

    /// Index of the load case with this name.
    pub fn case_index(&self, name: &str) -> Option<usize> {
        self.cases.iter().position(|c| c.name == name)
    }

    /// Diagonal of the bounding box of the drawn geometry (m), at least 1 mm.
    pub fn extent(&self) -> f64 {
        let mut lo = Vec3::repeat(f64::INFINITY);
        let mut hi = Vec3::repeat(f64::NEG_INFINITY);
        for n in &self.nodes {
            lo = lo.inf(&n.position);
            hi = hi.sup(&n.position);
        }
        if self.nodes.is_empty() { 1e-3 } else { (hi - lo).norm().max(1e-3) }
    }

    /// Gravitational acceleration of load case `case` at full load (m/s²): the project's
    /// gravity times the case's multiplier. It weighs the cables that sag.
    pub fn case_gravity(&self, case: usize) -> Vec3 {
        self.gravity * self.cases[case].gravity
    }

    /// Lumped mass of every node for the dynamics (kg): the node's own mass and half of each
    /// attached member's, sagging cables included (their weight is in their law for the
    /// statics, their inertia is lumped at their ends).
    pub fn dynamic_masses(&self) -> Vec<f64> {
        let mut m: Vec<f64> = self.nodes.iter().map(|n| n.mass).collect();
        for member in self.members.iter().filter(|x| x.sags()) {
            let half = 0.5 * member.mass_per_length * member.kind.rest_length();
            m[member.ends[0]] += half;
            m[member.ends[1]] += half;
        }
        m
    }

    /// External load vector of a case at full load, one force per node (N).
    pub fn case_forces(&self, case: usize) -> Vec<Vec3> {
        let c = &self.cases[case];
        let mut f: Vec<Vec3> = self.nodes.iter().map(|n| self.gravity * (n.mass * c.gravity)).collect();
        for (node, force) in &c.loads {
            f[*node] += force;
        }
        f
    }

    /// Resultant of every load of a case at full load (N): the nodal forces and the weight of
    /// the cables that sag under their own weight. Balances the sum of the reactions.
    pub fn case_resultant(&self, case: usize) -> Vec3 {
        let nodal: Vec3 = self.case_forces(case).iter().sum();
        let g = self.case_gravity(case);
        let cables: f64 = self
            .members
            .iter()
            .filter(|m| m.sags())
            .map(|m| m.mass_per_length * m.kind.rest_length())
            .sum();
        nodal + g * cables
    }

    /// Checks a project and builds the model, or lists every problem found.
    pub fn from_project(p: &Project) -> Result<Model, Vec<Problem>> {
        let mut problems = Vec::new();
        let mut index: HashMap<&str, usize> = HashMap::new();
        if !finite3(p.gravity) {
            problems.push(Problem::new(
                "gravity",
                "is not a finite vector",
                "write three numbers, e.g. (0.0, -9.81, 0.0)",
            ));
        } else if [p.gravity.0, p.gravity.1, p.gravity.2].iter().any(|g| g.abs() > MAX_GRAVITY) {
            problems.push(Problem::new(
                "gravity",
                format!(
                    "({}, {}, {}) m/s² is beyond ±{MAX_GRAVITY} m/s²",
                    p.gravity.0, p.gravity.1, p.gravity.2
                ),
                "give the acceleration in m/s², e.g. (0.0, -9.81, 0.0)",
            ));
        }

        let mut nodes = Vec::with_capacity(p.nodes.len());
        for (i, n) in p.nodes.iter().enumerate() {
            let item = format!("node `{}`", n.id);
            if n.id.trim().is_empty() {
                problems.push(Problem::new(
                    format!("node #{}", i + 1),
                    "has an empty id",
                    "give every node a short unique name",
                ));
            } else if index.insert(n.id.as_str(), i).is_some() {
                problems.push(Problem::new(&item, "id is used by more than one node", "rename one of them"));
            }
            if !finite3(n.at) {
                problems.push(Problem::new(
                    &item,
                    "position is not finite (NaN or infinity)",
                    "give three finite coordinates in metres",
                ));
            } else if [n.at.0, n.at.1, n.at.2].iter().any(|c| c.abs() > MAX_COORDINATE) {
                problems.push(Problem::new(
                    &item,
                    format!("position ({}, {}, {}) m is beyond ±{MAX_COORDINATE:e} m", n.at.0, n.at.1, n.at.2),
                    "give coordinates in metres relative to a nearby site origin",
                ));
            }
            if !(n.mass.is_finite() && n.mass >= 0.0) {
                problems.push(Problem::new(
                    &item,
                    format!("mass {} kg is not allowed", n.mass),
                    "use a mass of 0 kg or more",
                ));
            } else if n.mass > MAX_MASS {
                problems.push(Problem::new(
                    &item,
                    format!("mass {:e} kg is beyond {MAX_MASS:e} kg", n.mass),
                    "give the mass in kilograms",
                ));
            }
            if p.planar && n.at.2 != 0.0 {
                problems.push(Problem::new(
                    &item,
                    format!("z = {} m in a planar project", n.at.2),
                    "set z to 0, or clear `planar` for a 3D rig",
                ));
            }
            let mut fixed = n.fixed;
            if p.planar {
                fixed[2] = true;
            }
            nodes.push(Node {
                id: n.id.clone(),
                position: v3(n.at),
                mass: n.mass.max(0.0),
                support: Support { fixed },
            });
        }

        let mut member_ids: HashMap<&str, usize> = HashMap::new();
        let mut members = Vec::with_capacity(p.members.len());
        let mut connected = vec![false; nodes.len()];
        for (i, m) in p.members.iter().enumerate() {
            let item = format!("member `{}`", m.id);
            if m.id.trim().is_empty() {
                problems.push(Problem::new(
                    format!("member #{}", i + 1),
                    "has an empty id",
                    "give every member a short unique name",
                ));
            } else if member_ids.insert(m.id.as_str(), i).is_some() {
                problems.push(Problem::new(&item, "id is used by more than one member", "rename one of them"));
            }
            let a = index.get(m.ends.0.as_str()).copied();
            let b = index.get(m.ends.1.as_str()).copied();
            for (end, found) in [(&m.ends.0, a), (&m.ends.1, b)] {
                if found.is_none() {
                    problems.push(Problem::new(
                        &item,
                        format!("end node `{end}` does not exist"),
                        "check the spelling or add that node",
                    ));
                }
            }
            if !(m.mass_per_length.is_finite() && m.mass_per_length >= 0.0) {
                problems.push(Problem::new(
                    &item,
                    format!("mass per length {} kg/m is not allowed", m.mass_per_length),
                    "use 0 kg/m or more",
                ));
            } else if m.mass_per_length > MAX_MASS_PER_LENGTH {
                problems.push(Problem::new(
                    &item,
                    format!(
                        "mass per length {:e} kg/m is beyond {MAX_MASS_PER_LENGTH:e} kg/m",
                        m.mass_per_length
                    ),
                    "give the mass per metre of unstressed length in kg/m",
                ));
            }
            let (Some(a), Some(b)) = (a, b) else { continue };
            if a == b {
                problems.push(Problem::new(&item, "both ends are the same node", "connect two different nodes"));
                continue;
            }
            connected[a] = true;
            connected[b] = true;
            let drawn = (nodes[b].position - nodes[a].position).norm();
            if !drawn.is_finite() {
                // Its ends are refused above (not finite, or too far out): nothing to add.
                continue;
            }
            if drawn < MIN_LENGTH {
                problems.push(Problem::new(
                    &item,
                    format!("zero length: nodes `{}` and `{}` coincide", nodes[a].id, nodes[b].id),
                    "move one node, or merge the two",
                ));
                continue;
            }
            let chord = nodes[b].position - nodes[a].position;
            let weight = (m.mass_per_length > 0.0 && finite3(p.gravity)).then(|| (m.mass_per_length, v3(p.gravity)));
            match resolve_kind(&m.kind, &chord, weight).and_then(within_bounds) {
                Ok(kind) => {
                    let member = Member {
                        id: m.id.clone(),
                        ends: [a, b],
                        kind,
                        mass_per_length: m.mass_per_length,
                    };
                    if !member.sags() {
                        let w = m.mass_per_length * kind.rest_length() * 0.5;
                        nodes[a].mass += w;
                        nodes[b].mass += w;
                    }
                    members.push(member);
                }
                Err((problem, hint)) => problems.push(Problem::new(&item, problem, hint)),
            }
        }
        for (i, n) in nodes.iter().enumerate() {
            if !connected[i] && !n.support.is_anchor() {
                problems.push(Problem::new(
                    format!("node `{}`", n.id),
                    "is tied to nothing: no member ends there",
                    "connect it with a member, make it an anchor, or delete it",
                ));
            }
        }
        let held = |n: &Node| n.support.fixed[0] || n.support.fixed[1] || (n.support.fixed[2] && !p.planar);
        if !nodes.is_empty() && !nodes.iter().any(held) {
            problems.push(Problem::new(
                "rig",
                "has no support, so it can float away",
                "make at least one node an anchor",
            ));
        }

        problems.extend(crate::sizing::design_rules::design_problems(p));

        let mut cases = Vec::new();
        if p.cases.is_empty() {
            cases.push(LoadCase {
                name: "gravity".into(),
                gravity: 1.0,
                loads: Vec::new(),
            });
        }
        let mut case_names: HashMap<&str, ()> = HashMap::new();
        for c in &p.cases {
            let item = format!("load case `{}`", c.name);
            if case_names.insert(c.name.as_str(), ()).is_some() {
                problems.push(Problem::new(&item, "name is used by more than one load case", "rename one of them"));
            }
            if !c.gravity.is_finite() {
                problems.push(Problem::new(
                    &item,
                    "gravity multiplier is not finite",
                    "use 1 for self-weight, 0 for none",
                ));
            } else if c.gravity.abs() > MAX_MULTIPLIER {
                problems.push(Problem::new(
                    &item,
                    format!("gravity multiplier {:e} is beyond ±{MAX_MULTIPLIER:e}", c.gravity),
                    "use 1 for self-weight, 0 for none",
                ));
            }
            let mut loads = Vec::new();
            for l in &c.loads {
                match index.get(l.node.as_str()) {
                    None => problems.push(Problem::new(
                        &item,
                        format!("load on node `{}`, which does not exist", l.node),
                        "check the node id",
                    )),
                    Some(&n) if !finite3(l.force) => problems.push(Problem::new(
                        &item,
                        format!("load on node `{}` is not finite", nodes[n].id),
                        "give three finite force components in newtons",
                    )),
                    Some(&n) if [l.force.0, l.force.1, l.force.2].iter().any(|f| f.abs() > MAX_FORCE) => problems.push(Problem::new(
                        &item,
                        format!("load on node `{}` has a component beyond ±{MAX_FORCE:e} N", nodes[n].id),
                        "give the force in newtons",
                    )),
                    Some(&n) => loads.push((n, v3(l.force))),
                }
            }
            cases.push(LoadCase {
                name: c.name.clone(),
                gravity: c.gravity,
                loads,
            });
        }

        // Weights and loads together must stay finite at every node.
        for c in &cases {
            for (i, n) in nodes.iter().enumerate() {
                let mut f = v3(p.gravity) * (n.mass * c.gravity);
                for (node, force) in &c.loads {
                    if *node == i {
                        f += force;
                    }
                }
                if !f.iter().all(|x| x.is_finite() && x.abs() <= MAX_FORCE) {
                    problems.push(Problem::new(
                        format!("load case `{}`", c.name),
                        format!("the weight and loads on node `{}` add up beyond ±{MAX_FORCE:e} N", n.id),
                        "check the node's mass, the gravity multiplier and the loads",
                    ));
                }
            }
        }

        if problems.is_empty() {
            Ok(Model {
                title: p.title.clone(),
                planar: p.planar,
                gravity: v3(p.gravity),
                nodes,
                members,
                cases,
            })
        } else {
            Err(problems)
        }
    }
}

/// Refuses member laws whose numbers would overflow the solver's arithmetic.
fn within_bounds(kind: MemberKind) -> Result<MemberKind, (String, String)> {
    let (stiff, what, unit) = match kind {
        MemberKind::Cable { ea, .. } | MemberKind::Strut { ea, .. } => (ea, "EA", "N"),
        MemberKind::Spring { k, .. } => (k, "rate", "N/m"),
    };
    if stiff > MAX_STIFFNESS {
        return Err((
            format!("{what} {stiff:e} {unit} is beyond {MAX_STIFFNESS:e} {unit}"),
            format!("give the {what} in {unit}"),
        ));
    }
    let l0 = kind.rest_length();
    let spring = matches!(kind, MemberKind::Spring { .. });
    if !(l0 >= MIN_LENGTH || (spring && l0 == 0.0)) {
        return Err((
            format!("unstressed length {l0:e} m is below {MIN_LENGTH:e} m"),
            "give a longer unstressed length, or a smaller pretension".into(),
        ));
    }
    if kind.rate().is_nan() || kind.rate() > MAX_RATE {
        return Err((
            format!("stiffness EA/L0 = {:e} N/m is beyond {MAX_RATE:e} N/m", kind.rate()),
            "check EA and the unstressed length".into(),
        ));
    }
    Ok(kind)
}

/// Resolves the stored member law to a [`MemberKind`] for the drawn chord `chord` (m), with
/// the member's mass per length and the project's gravity when it has mass.
///
/// A pretension of a cable that sags (`Tension`) is its largest tension, at the upper end, in
/// the drawn geometry under the project's gravity; `Horizontal` gives the horizontal component
/// instead (the same all along the span). For a weightless cable both mean the straight
/// cable's tension (`Horizontal`: its horizontal component).
fn resolve_kind(kind: &MemberDocKind, chord: &Vec3, weight: Option<(f64, Vec3)>) -> Result<MemberKind, (String, String)> {
    use crate::element::catenary::{GivenTension, rest_length_for};
    let drawn = chord.norm();
    let positive = |what: &str, v: f64, unit: &str| -> Result<f64, (String, String)> {
        if v.is_finite() && v > 0.0 {
            Ok(v)
        } else {
            Err((format!("{what} {v} {unit} is not allowed"), format!("give a positive {what}")))
        }
    };
    let finite_force = |t: f64| -> Result<f64, (String, String)> {
        if t.is_finite() {
            Ok(t)
        } else {
            Err(("pretension is not finite".into(), "give a finite force in newtons".into()))
        }
    };
    match *kind {
        MemberDocKind::Cable { ea, rest } | MemberDocKind::Strut { ea, rest } => {
            let ea = positive("EA", ea, "N")?;
            let is_cable = matches!(kind, MemberDocKind::Cable { .. });
            // The cable's vertical plane and weight, when it sags.
            let sag = weight.filter(|(m, g)| is_cable && *m > 0.0 && g.norm() > 0.0).map(|(m, g)| {
                let up = -g / g.norm();
                let lz = chord.dot(&up);
                let lx = (chord - up * lz).norm();
                (m * g.norm(), lx, lz)
            });
            let l0 = match rest {
                Rest::AsDrawn => drawn,
                Rest::Length(l) => positive("unstressed length", l, "m")?,
                Rest::Tension(t) | Rest::Horizontal(t) => {
                    let t = finite_force(t)?;
                    let horizontal = matches!(rest, Rest::Horizontal(_));
                    if is_cable && t < 0.0 {
                        return Err((
                            format!("pretension {t} N is compression, which a cable cannot carry"),
                            "give a tension of 0 N or more, or use a strut".into(),
                        ));
                    }
                    if horizontal && !is_cable {
                        return Err((
                            "a horizontal pretension is for cables".into(),
                            "give the strut's force with Tension instead".into(),
                        ));
                    }
                    if t <= -ea {
                        return Err((
                            format!("force {t} N would need a zero or negative unstressed length"),
                            "reduce the compression below EA".into(),
                        ));
                    }
                    match sag {
                        Some((q, lx, lz)) => {
                            let given = if horizontal {
                                GivenTension::Horizontal(t)
                            } else {
                                GivenTension::UpperEnd(t)
                            };
                            rest_length_for(ea, q, lx, lz, given).map_err(|least| {
                                (
                                    format!(
                                        "pretension {t} N is less than this cable's own weight allows in the drawn geometry (at least {least:.1} N at the upper end)"
                                    ),
                                    "raise the pretension, or give the unstressed length instead".into(),
                                )
                            })?
                        }
                        None => {
                            let t = if horizontal {
                                let up = weight.map_or(Vec3::y(), |(_, g)| if g.norm() > 0.0 { -g / g.norm() } else { Vec3::y() });
                                let lx = (chord - up * chord.dot(&up)).norm();
                                if lx <= 1e-9 * drawn {
                                    return Err((
                                        "a vertical cable has no horizontal tension".into(),
                                        "give its tension with Tension instead".into(),
                                    ));
                                }
                                t * drawn / lx
                            } else {
                                t
                            };
                            drawn / (1.0 + t / ea)
                        }
                    }
                }
            };
            Ok(if is_cable {
                MemberKind::Cable { ea, l0 }
            } else {
                MemberKind::Strut { ea, l0 }
            })
        }
        MemberDocKind::Spring { rate, rest } => {
            let k = positive("rate", rate, "N/m")?;
            let l0 = match rest {
                Rest::AsDrawn => drawn,
                Rest::Length(l) => {
                    if !(l.is_finite() && l >= 0.0) {
                        return Err((
                            format!("free length {l} m is not allowed"),
                            "give a free length of 0 m or more".into(),
                        ));
                    }
                    l
                }
                Rest::Tension(t) => {
                    if !t.is_finite() {
                        return Err(("preload is not finite".into(), "give a finite force in newtons".into()));
                    }
                    let l0 = drawn - t / k;
                    if l0 < 0.0 {
                        return Err((
                            format!("preload {t} N needs a free length of {l0:.4} m, below zero"),
                            "lower the preload, raise the rate, or give the free length instead".into(),
                        ));
                    }
                    l0
                }
                Rest::Horizontal(_) => {
                    return Err((
                        "a horizontal pretension is for cables".into(),
                        "give the spring's preload with Tension instead".into(),
                    ));
                }
            };
            Ok(MemberKind::Spring { k, l0 })
        }
    }
}
