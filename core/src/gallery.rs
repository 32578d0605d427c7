//! Parametric rigs built in code: used by the benchmarks, tests and sample projects.

use crate::model::{CaseDoc, MemberDoc, MemberDocKind, NodeDoc, Project, Rest};

/// A square, flat, pretensioned cable net in the horizontal x–z plane.
///
/// `n` grid points per side (including the anchored edge), spacing `spacing` (m); every
/// cable has axial stiffness `ea` (N) and pretension `pretension` (N) as drawn; each free
/// node carries `node_mass` (kg). The four corner points are left out (they would join
/// nothing). Gravity acts along −y. For n = 32 the net has 2,700 free degrees of freedom.
pub fn cable_net(n: usize, spacing: f64, ea: f64, pretension: f64, node_mass: f64) -> Project {
    assert!(n >= 3, "a net needs at least 3 points per side");
    let mut p = Project::new(&format!("{n}×{n} pretensioned cable net"));
    p.planar = false;
    let id = |i: usize, j: usize| format!("n{i}_{j}");
    let edge = |i: usize| i == 0 || i == n - 1;
    for i in 0..n {
        for j in 0..n {
            if edge(i) && edge(j) {
                continue;
            }
            let anchor = edge(i) || edge(j);
            p.nodes.push(NodeDoc {
                id: id(i, j),
                at: (i as f64 * spacing, 0.0, j as f64 * spacing),
                mass: if anchor { 0.0 } else { node_mass },
                fixed: [anchor; 3],
            });
        }
    }
    let cable = || MemberDocKind::Cable {
        ea,
        rest: Rest::Tension(pretension),
    };
    for i in 0..n {
        for j in 0..n {
            // Members run between neighbours where at least one end is free.
            if i + 1 < n && !edge(j) {
                p.members.push(MemberDoc {
                    id: format!("x{i}_{j}"),
                    ends: (id(i, j), id(i + 1, j)),
                    kind: cable(),
                    mass_per_length: 0.0,
                    design: None,
                });
            }
            if j + 1 < n && !edge(i) {
                p.members.push(MemberDoc {
                    id: format!("z{i}_{j}"),
                    ends: (id(i, j), id(i, j + 1)),
                    kind: cable(),
                    mass_per_length: 0.0,
                    design: None,
                });
            }
        }
    }
    p.cases.push(CaseDoc {
        name: "self-weight".into(),
        gravity: 1.0,
        loads: Vec::new(),
    });
    p
}

/// A chain of `links` equal elastic cable links hung between (0, 0, 0) and (`span`, 0, 0),
/// drawn on a parabola with mid-span sag `sag` (m); total unstressed length `length` (m),
/// axial stiffness `ea` (N), weight `weight_per_length` (N/m of unstressed length) lumped at
/// the nodes through each link's mass per length. A planar rig.
pub fn hanging_chain(links: usize, span: f64, length: f64, ea: f64, weight_per_length: f64, gravity: f64, sag: f64) -> Project {
    let mut p = Project::new(&format!("chain of {links} links"));
    p.gravity = (0.0, -gravity, 0.0);
    for k in 0..=links {
        let x = span * k as f64 / links as f64;
        let y = -4.0 * sag * x * (span - x) / (span * span);
        let end = k == 0 || k == links;
        p.nodes.push(NodeDoc {
            id: format!("p{k}"),
            at: (x, y, 0.0),
            mass: 0.0,
            fixed: [end; 3],
        });
    }
    for k in 0..links {
        p.members.push(MemberDoc {
            id: format!("link{k}"),
            ends: (format!("p{k}"), format!("p{}", k + 1)),
            kind: MemberDocKind::Cable {
                ea,
                rest: Rest::Length(length / links as f64),
            },
            mass_per_length: weight_per_length / gravity,
            design: None,
        });
    }
    p
}
