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
//! taut string of its mean tension, below 1.5 × the highest frequency asked for (8 to 64
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
}

/// Fundamental frequency of a cable as a taut string of its mean end tension (Hz).
pub fn string_frequency(m: &Member, eq: &Equilibrium, index: usize) -> f64 {
    let r = &eq.members[index];
    let mean = r.sag.as_ref().map_or(r.force, |s| 0.5 * (s.tension_a + s.tension_b));
    let l0 = m.kind.rest_length();
    (mean.max(0.0) / m.mass_per_length).sqrt() / (2.0 * l0)
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
    let taken = |nodes: &[Node], id: &str| nodes.iter().any(|n| n.id == id);
    for (i, m) in model.members.iter().enumerate() {
        let n = links.get(i).copied().unwrap_or(1).min(MAX_LINKS);
        let MemberKind::Cable { ea, l0 } = m.kind else {
            members.push(m.clone());
            continue;
        };
        if !m.sags() {
            members.push(m.clone());
            continue;
        }
        let [a, b] = m.ends;
        let joint_mass = m.mass_per_length * l0 / n as f64;
        if n < 2 {
            // Whole: one exact element, its mass lumped at its ends for the dynamics.
            members.push(m.clone());
            continue;
        }
        let (pa, pb) = (positions[a], positions[b]);
        let chord = pb - pa;
        let shape = respond(&m.kind, m.mass_per_length, &chord, &gravity, &disp[a]).and_then(|r| r.sag);
        let point = |s: f64| -> Vec3 {
            match &shape {
                Some(sag) => {
                    let (x, z) = sag.cable.point_at(&sag.hang, s);
                    pa + sag.horizontal * x + sag.up * z
                }
                None => pa + chord * (s / l0),
            }
        };
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
                let at = point(l0 * k as f64 / n as f64);
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
    }
}
