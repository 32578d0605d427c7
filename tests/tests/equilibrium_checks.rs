//! Checks every solved state must pass: reactions balance the loads, the assembled tangent
//! equals a finite-difference Jacobian of the residual, and a held node's force closes the
//! balance (common practice for verifying nonlinear solvers).

use rigwright_core::solve::system::Part;
use rigwright_core::{Project, Statics, Vec3};
use rigwright_verification::{SAMPLES, sample};

#[test]
fn reactions_balance_applied_loads_in_every_sample_and_case() {
    for name in SAMPLES {
        let (_, m) = Project::load_model(&sample(name)).unwrap();
        let statics = Statics::new(&m);
        for c in 0..m.cases.len() {
            let eq = statics.solve(c, None).unwrap();
            let loads: Vec3 = m.case_resultant(c);
            let reactions: Vec3 = eq.nodes.iter().filter_map(|n| n.reaction).sum();
            let scale = loads.norm().max(1.0);
            assert!(
                (loads + reactions).norm() < 1e-8 * scale,
                "{name} case {c}: loads {loads:?} reactions {reactions:?}"
            );
        }
    }
}

#[test]
fn assembled_tangent_matches_central_differences_of_the_residual() {
    for name in SAMPLES {
        let (_, m) = Project::load_model(&sample(name)).unwrap();
        let statics = Statics::new(&m);
        let eq = statics.solve(0, None).unwrap();
        let sys = statics.system();
        // A perturbed state, so that no symmetry hides an error.
        let mut pos = eq.displacements();
        for (i, p) in pos.iter_mut().enumerate() {
            if !m.nodes[i].support.is_anchor() {
                *p += Vec3::new(0.003 * ((i % 3) as f64 - 1.0), 0.002 * ((i % 5) as f64 - 2.0), 0.0);
            }
        }
        let load = rigwright_core::solve::system::Loading::of(&m, 0);
        let k = sys.dense(&sys.assemble(&m, &pos, &load.gravity, Part::Total));
        let n = sys.size();
        let h = 1e-7;
        let mut worst: f64 = 0.0;
        for j in 0..n {
            let mut dx = vec![0.0; n];
            dx[j] = 1.0;
            let mut plus = pos.clone();
            sys.add_scaled(&mut plus, &dx, h);
            let mut minus = pos.clone();
            sys.add_scaled(&mut minus, &dx, -h);
            let rp = sys.evaluate(&m, &plus, &load, 1.0).unwrap().residual;
            let rm = sys.evaluate(&m, &minus, &load, 1.0).unwrap().residual;
            for i in 0..n {
                let fd = (rp[i] - rm[i]) / (2.0 * h);
                worst = worst.max((fd - k[(i, j)]).abs());
            }
        }
        let scale = k.abs().max();
        assert!(worst < 1e-6 * scale, "{name}: worst |fd − K| = {worst} (scale {scale})");
        assert!((&k - k.transpose()).abs().max() < 1e-12 * scale, "{name}: K_T not symmetric");
    }
}

#[test]
fn a_held_node_needs_the_force_that_closes_the_balance_and_it_grows_with_the_pull() {
    let (_, m) = Project::load_model(&sample("sign-on-two-cables.rig.ron")).unwrap();
    let free = Statics::new(&m).solve(0, None).unwrap();
    let sign = m.node_index("sign").unwrap();
    let statics = Statics::holding(&m, sign);
    let start = free.nodes[sign].position;
    let mut warm = rigwright_core::Warm::from(&free);
    let mut last = 0.0;
    for step in 1..=4 {
        let at = start + Vec3::new(0.0, -0.01 * step as f64, 0.0);
        let eq = statics.solve_held(0, at, Some(&warm)).unwrap();
        warm = (&eq).into();
        let hold = eq.hold.clone().unwrap();
        let loads: Vec3 = m.case_resultant(0);
        let reactions: Vec3 = eq.nodes.iter().filter_map(|n| n.reaction).sum();
        assert!((loads + reactions + hold.force).norm() < 1e-8 * loads.norm());
        // Pulling down needs a downward force that grows with the pull.
        assert!(hold.force.y < last, "step {step}: {:?}", hold.force);
        last = hold.force.y;
    }
}
