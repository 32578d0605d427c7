//! Sagging cables subdivided for the dynamics.
//!
//! For the statics a cable that sags under its own weight is one exact element (the elastic
//! catenary). Its own mass, though, vibrates: a long guy or span has modes of its own, often
//! among a rig's lowest. For modes each sagging cable is therefore replaced by a chain of `n`
//! straight links of its EA, their joints placed on the exact static curve at equal steps of
//! unstressed length, with the cable's mass lumped at the joints (`m' L0/n` at each inner
//! joint, half that at each end); the subdivided rig is solved from there (a few Newton
//! iterations: the lumped chain's equilibrium lies within O(1/n²) of the curve) and its modes
//! are those of the rig with the cable's own modes included. As `n` grows they converge to
//! the continuous cable's (checked against Irvine's in-plane and out-of-plane frequencies in
//! the verification suite).
//!
//! `n` by default follows the frequency range wanted: the rig's modes are first found with
//! each cable's mass lumped at its ends, and a cable gets 8 links per mode of its own, as a
//! taut string of its mean tension, below 1.5 × the highest frequency asked for (at least
//! the 12th, so that asking for fewer modes gives the same ones) (8 to 64
//! links; a chain of `n` links has its `k`-th frequency low by about `(kπ/2n)²/6`, 0.6 % at
//! `n = 8k`; 16 links when the range is unknown). A rig with many cables shares a budget of extra joints (`4 ×` its nodes
//! `+ 2,000`) among them. The user may fix `n` instead; `n = 1` keeps the lumped ends.

use crate::element::MemberKind;
use crate::element::response::respond;
use crate::model::{Member, Model, Node, Support, Vec3};
use crate::solve::{Equilibrium, Warm};

/// How many links each sagging cable gets for the dynamics.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum CableLinks {
    /// Chosen from the frequency range wanted (the module documentation says how).
    #[default]
    Auto,
    /// The same number for every sagging cable (1: no subdivision, the mass lumped at the
    /// cable's ends).
    Each(usize),
}

/// Most links per cable, chosen or asked for.
pub const MAX_LINKS: usize = 256;

/// A sagging cable of the original rig and the links it was given.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Subdivision {
    /// The cable's id.
    pub member: String,
    /// Number of links (≥ 2).
    pub links: usize,
}

/// The rig with its sagging cables subdivided, and where to start its solve.
#[derive(Debug, Clone)]
pub struct Subdivided {
    /// The original nodes first (same indices), then each cable's inner joints in order; the
    /// original members that do not sag, then the links.
    pub model: Model,
    /// Start: the original nodes where the equilibrium has them, the joints on the curve.
    pub warm: Warm,
    /// The cables subdivided.
    pub cables: Vec<Subdivision>,
    /// For each original member, the members of `model` it became (itself, or its links).
    pub members_of: Vec<Vec<usize>>,
}

/// Fundamental frequency of a cable as a taut string of its mean end tension (Hz).
pub fn string_frequency(m: &Member, eq: &Equilibrium, index: usize) -> f64 {
    let r = &eq.members[index];
    let mean = r.sag.as_ref().map_or(r.force, |s| 0.5 * (s.tension_a + s.tension_b));
    let l0 = m.kind.rest_length();
    (mean.max(0.0) / m.mass_per_length).sqrt() / (2.0 * l0)
}

/// `n` links (within 1 to [`MAX_LINKS`]) for every sagging cable, 1 for every other member.
pub fn each_links(model: &Model, n: usize) -> Vec<usize> {
    model
        .members
        .iter()
        .map(|m| if m.sags() { n.clamp(1, MAX_LINKS) } else { 1 })
        .collect()
}

/// The inner joints of cable `m` cut into `links` links, at equal steps of unstressed length
/// along its exact static curve between its ends at `pa` and `pb` (on the chord when it does
/// not sag there); `u_a` is end a's displacement.
fn joints(m: &Member, pa: Vec3, pb: Vec3, gravity: &Vec3, u_a: &Vec3, links: usize) -> Vec<Vec3> {
    let chord = pb - pa;
    let l0 = m.kind.rest_length();
    let shape = respond(&m.kind, m.mass_per_length, &chord, gravity, u_a).and_then(|r| r.sag);
    (1..links)
        .map(|k| {
            let s = l0 * k as f64 / links as f64;
            match &shape {
                Some(sag) => sag.point(&pa, s),
                None => pa + chord * (s / l0),
            }
        })
        .collect()
}

/// Links for every sagging cable when the highest frequency wanted is `highest_hz`, within
/// the budget of joints.
pub fn auto_links(model: &Model, eq: &Equilibrium, highest_hz: f64) -> Vec<usize> {
    let mut links: Vec<usize> = model
        .members
        .iter()
        .enumerate()
        .map(|(i, m)| {
            if !m.sags() {
                return 1;
            }
            let f1 = string_frequency(m, eq, i);
            let own = if f1 > 0.0 && highest_hz.is_finite() {
                (1.5 * highest_hz / f1).ceil().min(MAX_LINKS as f64)
            } else {
                // Range unknown: the cable's first two modes.
                2.0
            };
            ((8.0 * own) as usize).clamp(8, 64)
        })
        .collect();
    let budget = 4 * model.nodes.len() + 2000;
    let extra = |l: &[usize]| l.iter().map(|n| n - 1).sum::<usize>();
    while extra(&links) > budget {
        let mut changed = false;
        for n in links.iter_mut().filter(|n| **n > 1) {
            let fewer = (*n / 2).max(1);
            changed |= fewer != *n;
            *n = if fewer == 1 { 1 } else { fewer.max(2) };
        }
        if !changed {
            break;
        }
    }
    links
}

/// The rig of `eq` with sagging cable `i` cut into `links[i]` links (1: left whole, its mass
/// lumped at its ends). `case` is the equilibrium's load case (its gravity shapes the curve).
pub fn subdivide(model: &Model, eq: &Equilibrium, case: usize, links: &[usize]) -> Subdivided {
    let gravity = model.case_gravity(case);
    let disp = eq.displacements();
    let mut nodes: Vec<Node> = model.nodes.clone();
    let mut positions = eq.positions();
    let mut members = Vec::new();
    let mut cables = Vec::new();
    let mut members_of = Vec::with_capacity(model.members.len());
    let taken = |nodes: &[Node], id: &str| nodes.iter().any(|n| n.id == id);
    for (i, m) in model.members.iter().enumerate() {
        let first = members.len();
        members_of.push(Vec::new());
        let n = links.get(i).copied().unwrap_or(1).min(MAX_LINKS);
        let MemberKind::Cable { ea, l0 } = m.kind else {
            members.push(m.clone());
            members_of[i] = vec![first];
            continue;
        };
        if !m.sags() {
            members.push(m.clone());
            members_of[i] = vec![first];
            continue;
        }
        let [a, b] = m.ends;
        let joint_mass = m.mass_per_length * l0 / n as f64;
        if n < 2 {
            // Whole: one exact element, its mass lumped at its ends for the dynamics.
            members.push(m.clone());
            members_of[i] = vec![first];
            continue;
        }
        let points = joints(m, positions[a], positions[b], &gravity, &disp[a], n);
        nodes[a].mass += 0.5 * joint_mass;
        nodes[b].mass += 0.5 * joint_mass;
        let mut previous = a;
        for k in 1..=n {
            let next = if k == n {
                b
            } else {
                let mut id = format!("{}~{k}", m.id);
                while taken(&nodes, &id) {
                    id.push('~');
                }
                let at = points[k - 1];
                nodes.push(Node {
                    id,
                    position: at,
                    mass: joint_mass,
                    support: if model.planar {
                        Support {
                            fixed: [false, false, true],
                        }
                    } else {
                        Support::FREE
                    },
                });
                positions.push(at);
                nodes.len() - 1
            };
            members.push(Member {
                id: format!("{}~link{k}", m.id),
                ends: [previous, next],
                kind: MemberKind::Cable { ea, l0: l0 / n as f64 },
                mass_per_length: 0.0,
            });
            previous = next;
        }
        members_of[i] = (first..members.len()).collect();
        cables.push(Subdivision {
            member: m.id.clone(),
            links: n,
        });
    }
    Subdivided {
        model: Model {
            title: model.title.clone(),
            planar: model.planar,
            gravity: model.gravity,
            nodes,
            members,
            cases: model.cases.clone(),
        },
        warm: Warm {
            positions,
            route: eq.route.clone(),
        },
        cables,
        members_of,
    }
}

impl Subdivided {
    /// Positions of every node of the subdivided rig for the original rig's node positions
    /// `positions`: the original nodes there, each cable's joints on its exact static curve
    /// between its ends (the shape it has in any equilibrium, the joints' own weight aside).
    pub fn place(&self, original: &Model, case: usize, positions: &[Vec3]) -> Vec<Vec3> {
        let gravity = original.case_gravity(case);
        let mut out: Vec<Vec3> = positions.to_vec();
        out.resize(self.model.nodes.len(), Vec3::zeros());
        let mut next = original.nodes.len();
        for c in &self.cables {
            let Some(m) = original.members.iter().find(|m| m.id == c.member) else {
                continue;
            };
            let [a, b] = m.ends;
            let u_a = positions[a] - original.nodes[a].position;
            for p in joints(m, positions[a], positions[b], &gravity, &u_a, c.links) {
                out[next] = p;
                next += 1;
            }
        }
        out
    }
}

/// A rig ready for a Pluck with its sagging cables cut into links: the rig, where the motion
/// starts (the pulled node held where the original rig's pull put it, the rest in
/// equilibrium), the equilibrium it vibrates about, and which of its members each original
/// member became.
#[derive(Debug, Clone)]
pub struct PluckRig {
    pub model: Model,
    pub start: Vec<Vec3>,
    pub about: Vec<Vec3>,
    pub members: Vec<Vec<usize>>,
    pub cables: Vec<Subdivision>,
    /// Why the cables were left whole (their mass lumped at their ends), when they were.
    pub note: Option<String>,
}

impl PluckRig {
    /// The original members' forces from the subdivided rig's: a cable cut into links has the
    /// largest of its links' tensions (N).
    pub fn original_forces(&self, forces: &[f64]) -> Vec<f64> {
        self.members
            .iter()
            .map(|ids| ids.iter().map(|&i| forces[i]).fold(f64::NEG_INFINITY, f64::max))
            .collect()
    }
}

/// The Pluck rig for equilibrium `eq` of `case` and the pulled, held positions `start` of the
/// original rig with `node` held. With no sagging cable (or links 1) it is the original rig.
pub fn pluck_rig(
    model: &Model,
    case: usize,
    eq: &Equilibrium,
    start: &[Vec3],
    node: usize,
    links: CableLinks,
) -> Result<PluckRig, crate::solve::SolveError> {
    let per_member: Vec<usize> = match links {
        CableLinks::Each(n) => each_links(model, n),
        CableLinks::Auto => auto_links(model, eq, f64::NAN),
    };
    let whole = |note: Option<String>| PluckRig {
        model: model.clone(),
        start: start.to_vec(),
        about: eq.positions(),
        members: (0..model.members.len()).map(|i| vec![i]).collect(),
        cables: Vec::new(),
        note,
    };
    if model.case_gravity(case).norm() == 0.0 || !model.members.iter().any(|m| m.sags()) {
        return Ok(whole(None));
    }
    let sub = subdivide(model, eq, case, &per_member);
    if sub.cables.is_empty() {
        return Ok(whole(None));
    }
    let lumped = |why: String| Ok(whole(Some(format!("the cables' own mass is lumped at their ends: {why}"))));
    let about = match crate::solve::Statics::new(&sub.model).solve(case, Some(&sub.warm)) {
        Ok(e) if e.stability.is_stable() => e,
        Ok(e) => return lumped(format!("the rig with its cables cut into links is {}", e.stability.describe())),
        Err(e) => return lumped(format!("the rig with its cables cut into links has no equilibrium: {e}")),
    };
    let guess = Warm {
        positions: sub.place(model, case, start),
        route: about.route.clone(),
    };
    let held = match crate::solve::Statics::holding(&sub.model, node).solve_held(case, start[node], Some(&guess)) {
        Ok(e) if e.stability.is_stable() => e,
        Ok(e) => {
            return lumped(format!(
                "the pulled rig with its cables cut into links is {}",
                e.stability.describe()
            ));
        }
        Err(e) => return lumped(format!("the pulled rig with its cables cut into links has no equilibrium: {e}")),
    };
    Ok(PluckRig {
        members: sub.members_of.clone(),
        model: sub.model,
        start: held.positions(),
        about: about.positions(),
        cables: sub.cables,
        note: None,
    })
}
