//! Property tests on random planar rigs (proptest): the solver never panics, and every answer
//! it gives is a real equilibrium — relative residual ≤ 1e-10, reactions balance the loads,
//! the tangent is symmetric and agrees with finite differences, no NaN or infinity — or it
//! returns a named diagnostic (common practice for nonlinear solvers).

use proptest::prelude::*;
use rigwright_core::model::NodeDoc;
use rigwright_core::solve::system::Part;
use rigwright_core::{Project, Rest, Stability, Statics, Vec3};
use rigwright_verification::*;

#[derive(Debug, Clone)]
struct RandomRig {
    anchors: Vec<(f64, f64)>,
    free: Vec<(f64, f64, f64)>,
    /// (end a, end b, kind 0..3, rest selector, stiffness factor)
    members: Vec<(usize, usize, u8, u8, f64)>,
    load: (f64, f64),
}

fn rig_strategy() -> impl Strategy<Value = RandomRig> {
    (
        prop::collection::vec((-3.0..3.0f64, 1.0..3.0f64), 2..4),
        prop::collection::vec((-3.0..3.0f64, -2.0..1.0f64, 0.0..20.0f64), 1..5),
        prop::collection::vec((0usize..8, 0usize..8, 0u8..3, 0u8..3, 0.1..10.0f64), 1..10),
        (-200.0..200.0f64, -200.0..200.0f64),
    )
        .prop_map(|(anchors, free, members, load)| RandomRig {
            anchors,
            free,
            members,
            load,
        })
}

fn build(r: &RandomRig) -> Option<Project> {
    let mut p = Project::new("random");
    for (i, a) in r.anchors.iter().enumerate() {
        p.nodes.push(anchor(&format!("a{i}"), (a.0, a.1, 0.0)));
    }
    for (i, f) in r.free.iter().enumerate() {
        p.nodes.push(NodeDoc {
            id: format!("f{i}"),
            at: (f.0, f.1, 0.0),
            mass: f.2,
            fixed: [false; 3],
        });
    }
    let n = p.nodes.len();
    let ids: Vec<String> = p.nodes.iter().map(|x| x.id.clone()).collect();
    // Tie every free node to an anchor, then add the random members.
    let mut list: Vec<(usize, usize, u8, u8, f64)> = (0..r.free.len())
        .map(|i| (i % r.anchors.len(), r.anchors.len() + i, 1, 0, 1.0))
        .collect();
    list.extend(r.members.iter().map(|&(a, b, k, s, f)| (a % n, b % n, k, s, f)));
    for (k, (a, b, kind, rest, f)) in list.into_iter().enumerate() {
        if a == b || (a < r.anchors.len() && b < r.anchors.len()) {
            continue;
        }
        let rest = match rest {
            0 => Rest::AsDrawn,
            1 => Rest::Tension(50.0 * f),
            _ => Rest::Tension(-20.0 * f),
        };
        let kind = match kind {
            0 => cable(
                2e4 * f,
                if matches!(rest, Rest::Tension(t) if t < 0.0) {
                    Rest::AsDrawn
                } else {
                    rest
                },
            ),
            1 => spring(500.0 * f, rest),
            _ => strut(1e5 * f, rest),
        };
        p.members.push(member(&format!("m{k}"), &ids[a], &ids[b], kind));
    }
    let last = format!("f{}", r.free.len() - 1);
    p.cases = vec![case("c", 1.0, &[(&last, (r.load.0, r.load.1, 0.0))])];
    Some(p)
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 200, .. ProptestConfig::default() })]

    #[test]
    fn random_rigs_either_converge_to_a_checked_equilibrium_or_name_the_problem(r in rig_strategy()) {
        let Some(p) = build(&r) else { return Ok(()) };
        let Ok(m) = p.validate() else { return Ok(()) };
        let statics = Statics::new(&m);
        match statics.solve(0, None) {
            Err(e) => prop_assert!(!e.to_string().is_empty()),
            Ok(eq) => {
                prop_assert!(eq.residual <= 1e-10, "residual {}", eq.residual);
                for n in &eq.nodes {
                    prop_assert!(n.position.iter().all(|v| v.is_finite()));
                    if let Some(rx) = n.reaction { prop_assert!(rx.iter().all(|v| v.is_finite())); }
                }
                for mr in &eq.members { prop_assert!(mr.force.is_finite() && mr.length.is_finite()); }
                let loads: Vec3 = m.case_forces(0).iter().sum();
                let reactions: Vec3 = eq.nodes.iter().filter_map(|n| n.reaction).sum();
                let scale = loads.norm() + eq.members.iter().map(|x| x.force.abs()).sum::<f64>() + 1.0;
                prop_assert!((loads + reactions).norm() <= 1e-8 * scale, "imbalance {:?}", loads + reactions);
                if let Stability::Stable = eq.stability {
                    let sys = statics.system();
                    let pos = eq.displacements();
                    let k = sys.dense(&sys.assemble(&m, &pos, Part::Total));
                    let kscale = k.abs().max().max(1.0);
                    prop_assert!((&k - k.transpose()).abs().max() <= 1e-12 * kscale);
                    let load = m.case_forces(0);
                    let h = 1e-7;
                    for j in 0..sys.size() {
                        let mut dx = vec![0.0; sys.size()];
                        dx[j] = 1.0;
                        let (mut pp, mut pm) = (pos.clone(), pos.clone());
                        sys.add_scaled(&mut pp, &dx, h);
                        sys.add_scaled(&mut pm, &dx, -h);
                        let (Some(ep), Some(em)) = (sys.evaluate(&m, &pp, &load, 1.0), sys.evaluate(&m, &pm, &load, 1.0)) else { continue };
                        // Cables within h of slack have a kink: skip columns where the tangent changes.
                        let kink = m.members.iter().any(|mm| {
                            let l = (pos[mm.ends[1]] - pos[mm.ends[0]]).norm();
                            matches!(mm.kind, rigwright_core::MemberKind::Cable { .. }) && (l - mm.kind.rest_length()).abs() < 1e-5
                        });
                        if kink { continue; }
                        for i in 0..sys.size() {
                            let fd = (ep.residual[i] - em.residual[i]) / (2.0 * h);
                            prop_assert!((fd - k[(i, j)]).abs() <= 1e-5 * kscale, "K[{i},{j}] = {} vs fd {fd}", k[(i, j)]);
                        }
                    }
                }
            }
        }
    }
}
