//! No wrong answer: every state the solver calls stable is checked here by the member laws
//! (residual and dense eigenvalues, `rigwright_verification::independent`), and every state
//! it must refuse is refused with a true diagnostic. One test per wrong answer found in trials
//! (issue 14), each with its reference value and source.

use rigwright_core::dynamics::{ModeError, modes};
use rigwright_core::sizing::{Output, Param, sweep};
use rigwright_core::{Project, Route, SolveError, Stability, Statics, Vec3};
use rigwright_verification::independent::{check_stable_answer, displacements, residual};
use rigwright_verification::*;

fn parse(text: &str) -> Project {
    Project::from_ron(text).unwrap()
}

/// Two as-drawn springs meeting at 33.7° in line (anchors at (−3, −2) and (3, 2)): the exact
/// tangent is `2k ê êᵀ`, eigenvalues 0 and 2000 N/m (closed form), so the state is neutral at
/// any angle, and has neither a condensed stiffness nor natural frequencies.
#[test]
fn a_singular_tangent_is_neutral_at_every_angle_never_stable() {
    for (x, y) in [(3.0, 2.0), (3.0f64.sqrt(), 1.0), (1.0, 1.0), (1.0, 0.0)] {
        let text = format!(
            "(version: 2, planar: true, gravity: (0.0, 0.0, 0.0), nodes: [(id: \"A\", at: ({}, {}, 0.0), fixed: (true, true, true)), (id: \"B\", at: ({x}, {y}, 0.0), fixed: (true, true, true)), (id: \"M\", at: (0.0, 0.0, 0.0), mass: 1.0)], members: [(id: \"s1\", ends: (\"A\", \"M\"), kind: Spring(rate: 1000.0, rest: AsDrawn)), (id: \"s2\", ends: (\"M\", \"B\"), kind: Spring(rate: 1000.0, rest: AsDrawn))])",
            -x, -y
        );
        let m = model(&parse(&text));
        let statics = Statics::new(&m);
        let eq = statics.solve(0, None).unwrap();
        let Stability::Mechanism { node, direction } = &eq.stability else {
            panic!("({x}, {y}): {:?}", eq.stability)
        };
        assert_eq!(node, "M");
        // The free direction is across the line of the springs.
        let e = Vec3::new(x, y, 0.0).normalize();
        let d = Vec3::new(direction[0], direction[1], direction[2]);
        assert!(d.dot(&e).abs() < 1e-9, "({x}, {y}): direction {d:?}");
        assert!(matches!(modes(&statics, &eq, 2), Err(ModeError::NotStable(_))));
        assert!(matches!(statics.node_stiffness(&eq, 2), Err(SolveError::NotStable(_))));
    }
}

/// A strut from an anchor to a massless free node: the exact tangent `EA/L ê êᵀ` is singular
/// (closed form), so the state is neutral and has no condensed stiffness. With 1 kg on the node
/// it is a pendulum: it swings down to hang below the anchor, stretched by m g L0 / EA, with
/// the pendulum frequency `√(g/L)/2π` (the tension m g over the length gives the whole
/// transverse stiffness; any dynamics text, common practice).
#[test]
fn a_dangling_strut_is_neutral_and_with_a_mass_hangs_as_a_pendulum() {
    let text = |mass: f64| {
        format!(
            "(version: 2, planar: true, nodes: [(id: \"O\", at: (0.0, 0.0, 0.0), fixed: (true, true, true)), (id: \"P\", at: (0.6, -0.8, 0.0), mass: {mass})], members: [(id: \"s\", ends: (\"O\", \"P\"), kind: Strut(ea: 1000000.0, rest: AsDrawn))])"
        )
    };
    let m = model(&parse(&text(0.0)));
    let statics = Statics::new(&m);
    let eq = statics.solve(0, None).unwrap();
    assert!(matches!(eq.stability, Stability::Mechanism { .. }), "{:?}", eq.stability);
    assert!(matches!(statics.node_stiffness(&eq, 1), Err(SolveError::NotStable(_))));

    let m = model(&parse(&text(1.0)));
    let statics = Statics::new(&m);
    let eq = statics.solve(0, None).unwrap();
    check_stable_answer(&m, 0, &eq).unwrap();
    let l = 1.0 + 9.81 / 1e6;
    let p = eq.nodes[1].position;
    assert!(p.x.abs() < 1e-9 && (p.y + l).abs() < 1e-9, "{p:?}");
    let f = modes(&statics, &eq, 1).unwrap().modes[0].frequency_hz;
    assert!(rel(f, (9.81 / l).sqrt() / std::f64::consts::TAU) < 1e-9, "{f} Hz");
}

/// Unloaded, this rig is a mechanism (the cable unstressed, the spring pulling the node
/// off); loaded by 18 kg it has a stable equilibrium. Reference: an independent Newton solve
/// of the same two member laws (issue 14, residual 2.5e-12 N): N0 = (−2.569150, −2.397193) m,
/// cable 249.473 N, spring 95.741 N, frequencies 1.2616 and 4.8145 Hz.
#[test]
fn a_rig_that_is_a_mechanism_until_loaded_reaches_its_stable_equilibrium() {
    let p = parse(
        "(version: 2, planar: true, nodes: [(id: \"A0\", at: (-3.7, 1.3, 0.0), fixed: (true, true, true)), (id: \"A1\", at: (-0.8, -3.9, 0.0), fixed: (true, true, true)), (id: \"N0\", at: (-0.3, -0.5, 0.0), mass: 18.0)], members: [(id: \"cable\", ends: (\"A0\", \"N0\"), kind: Cable(ea: 50000.0, rest: AsDrawn)), (id: \"spring\", ends: (\"A1\", \"N0\"), kind: Spring(rate: 4500.0, rest: Length(2.3)))])",
    );
    let m = model(&p);
    let statics = Statics::new(&m);
    let eq = statics.solve(0, None).unwrap();
    check_stable_answer(&m, 0, &eq).unwrap();
    let n0 = eq.nodes[2].position;
    assert!((n0.x + 2.569150).abs() < 1e-6 && (n0.y + 2.397193).abs() < 1e-6, "{n0:?}");
    assert!(rel(eq.members[0].force, 249.473) < 2e-6, "{}", eq.members[0].force);
    assert!(rel(eq.members[1].force, 95.741) < 1e-5, "{}", eq.members[1].force);
    let ms = modes(&statics, &eq, 2).unwrap();
    assert!(rel(ms.modes[0].frequency_hz, 1.2616) < 1e-4, "{}", ms.modes[0].frequency_hz);
    assert!(rel(ms.modes[1].frequency_hz, 4.8145) < 1e-4, "{}", ms.modes[1].frequency_hz);
}

/// Shallow two-bar truss, half-span 1 m, rise 0.1 m, EA 1e5 N, engineering strain:
/// `P(v) = 2 EA y (L0 − L)/(L0 L)` (Bažant & Cedolin, *Stability of Structures*, §4.4, from
/// memory; re-derived from equilibrium of the apex), maximum 38.10872 N at v = 0.042361 m.
fn truss_text(loads: &[f64]) -> String {
    let cases: Vec<String> = loads
        .iter()
        .map(|p| format!("(name: \"{p}\", loads: [(node: \"C\", force: (0.0, {}, 0.0))])", -p))
        .collect();
    format!(
        "(version: 2, planar: true, gravity: (0.0, 0.0, 0.0), nodes: [(id: \"L\", at: (-1.0, 0.0, 0.0), fixed: (true, true, true)), (id: \"R\", at: (1.0, 0.0, 0.0), fixed: (true, true, true)), (id: \"C\", at: (0.0, 0.1, 0.0), mass: 1.0)], members: [(id: \"b1\", ends: (\"L\", \"C\"), kind: Strut(ea: 100000.0, rest: AsDrawn)), (id: \"b2\", ends: (\"R\", \"C\"), kind: Strut(ea: 100000.0, rest: AsDrawn))], cases: [{}])",
        cases.join(", ")
    )
}

fn truss_curve(v: f64) -> f64 {
    let (a, h, ea) = (1.0f64, 0.1f64, 1e5);
    let l0 = (a * a + h * h).sqrt();
    let y = h - v;
    let l = (a * a + y * y).sqrt();
    2.0 * ea * y * (l0 - l) / (l0 * l)
}

fn truss_limit() -> f64 {
    let (mut lo, mut hi) = (0.0, 0.1);
    let g = 0.5 * (5f64.sqrt() - 1.0);
    for _ in 0..300 {
        let c = hi - g * (hi - lo);
        let d = lo + g * (hi - lo);
        if truss_curve(c) > truss_curve(d) { hi = d } else { lo = c }
    }
    truss_curve(0.5 * (lo + hi))
}

#[test]
fn past_a_limit_point_every_load_size_reports_the_limit_to_six_digits() {
    let p_lim = truss_limit();
    assert!((p_lim - 38.10872).abs() < 1e-5, "closed form {p_lim}");
    let loads = [1.02, 1.5, 2.0, 3.0, 5.0, 7.0, 10.0, 20.0, 30.0, 50.0, 100.0, 300.0, 1000.0].map(|f| f * 38.1);
    let m = model(&parse(&truss_text(&loads)));
    let statics = Statics::new(&m);
    for (c, p) in loads.iter().enumerate() {
        match statics.solve(c, None) {
            Err(SolveError::LimitPoint { load_factor, node, .. }) => {
                assert_eq!(node, "C");
                assert!(
                    rel(load_factor * p, p_lim) < 1e-6,
                    "{p} N: limit at {} N vs {p_lim}",
                    load_factor * p
                );
                let text = SolveError::LimitPoint {
                    load_factor,
                    node: node.clone(),
                    direction: [0.0; 3],
                }
                .to_string();
                assert!(text.contains(&rigwright_core::solve::sig6(load_factor)), "{text}");
            }
            other => panic!("{p} N: expected a limit point, got {other:?}"),
        }
    }
}

/// With `follow`, the truss loaded past its limit snaps through to the inverted stable state,
/// which lies on the same closed-form curve (the branch with v > 2h) and says so.
#[test]
fn following_past_the_limit_lands_on_the_snapped_through_branch_and_says_so() {
    let p_lim = truss_limit();
    let loads = [2.0 * 38.1, 10.0 * 38.1];
    let m = model(&parse(&truss_text(&loads)));
    let mut statics = Statics::new(&m);
    statics.settings.follow = true;
    for (c, p) in loads.iter().enumerate() {
        let eq = statics.solve(c, None).unwrap();
        check_stable_answer(&m, c, &eq).unwrap();
        let v = -eq.nodes[2].displacement.y;
        assert!(v > 0.2, "{p} N: v = {v}");
        assert!(rel(truss_curve(v), *p) < 1e-7, "{p} N: P(v) = {} vs {p}", truss_curve(v));
        match &eq.route {
            Route::Followed {
                critical: Some(l),
                crossed,
            } => {
                assert_eq!(crossed, "limit point");
                assert!(rel(l * p, p_lim) < 1e-6, "{p} N: critical {}", l * p);
            }
            other => panic!("{p} N: route {other:?}"),
        }
    }
}

fn sign_sample() -> Project {
    Project::load(&sample("sign-on-two-cables.rig.ron")).unwrap()
}

/// Moving an anchor and solving warm from the old equilibrium must give exactly what a cold
/// solve of the edited file gives: a warm start never moves a held coordinate back.
/// Reference (issue 14): with `wall-right` at x = 5.5 m, 428.40 N and 384.28 N.
#[test]
fn a_warm_start_never_puts_a_moved_anchor_back() {
    let p = sign_sample();
    let before = model(&p);
    let old = Statics::new(&before).solve(0, None).unwrap();
    let mut moved = p.clone();
    moved.nodes.iter_mut().find(|n| n.id == "wall-right").unwrap().at.0 = 5.5;
    let m = model(&moved);
    let statics = Statics::new(&m);
    let warm = statics.solve(0, Some(&(&old).into())).unwrap();
    let cold = statics.solve(0, None).unwrap();
    check_stable_answer(&m, 0, &warm).unwrap();
    let right = m.node_index("wall-right").unwrap();
    assert_eq!(warm.nodes[right].displacement, Vec3::zeros());
    assert_eq!(warm.nodes[right].position.x, 5.5);
    for (w, c) in warm.members.iter().zip(&cold.members) {
        assert!(rel(w.force, c.force) < 1e-9, "{}: warm {} cold {}", w.id, w.force, c.force);
    }
    // Upper-end tensions with the ropes' weight in their catenaries (issue 15; 428.40 N and
    // 384.28 N with it lumped at the ends).
    assert!((warm.members[0].force - 429.39).abs() < 0.01, "{}", warm.members[0].force);
    assert!((warm.members[1].force - 385.70).abs() < 0.01, "{}", warm.members[1].force);
}

/// A Sweep of a held coordinate means exactly what editing the file means (issue 14:
/// 370.61 N at the upper end of the short rope with `wall-right` at y = 5.0 m, its weight in its
/// catenary; 369.62 N with the weight lumped at its ends).
#[test]
fn a_sweep_of_an_anchor_coordinate_matches_the_edited_file() {
    let p = sign_sample();
    let param: Param = "node:wall-right:y".parse().unwrap();
    let out: Output = "force:short-rope".parse().unwrap();
    let s = sweep(
        &p,
        &rigwright_core::sizing::Catalogue::builtin(),
        None,
        &param,
        (4.8, 5.0, 2),
        &[out],
    )
    .unwrap();
    for (value, row) in s.values.iter().zip(&s.rows) {
        let mut edited = p.clone();
        edited.nodes.iter_mut().find(|n| n.id == "wall-right").unwrap().at.1 = *value;
        let m = model(&edited);
        let eq = Statics::new(&m).solve(0, None).unwrap();
        let f = row[0].unwrap();
        assert!(
            rel(f, eq.members[0].force) < 1e-9,
            "y = {value}: sweep {f} vs file {}",
            eq.members[0].force
        );
    }
    assert!((s.rows[1][0].unwrap() - 370.61).abs() < 0.01, "{:?}", s.rows[1]);
}

/// Chains and subdivided ropes drawn far from their equilibrium converge: a 400-link chain drawn
/// straight between two anchors, and a 150-link chain drawn on a parabola far too deep. The
/// answer is checked by the member laws and, for the straight chain, against the elastic
/// catenary it approaches (Irvine, *Cable Structures*, 1981, ch. 1, from memory; shared
/// REFERENCES §2: span 100 m, L0 101 m, w 10 N/m, EA 1e7 N → H = 2023.1664 N; a chain of N
/// links differs by O(1/N²), about 1e-5 at 400 links).
#[test]
fn long_chains_drawn_far_from_their_shape_converge_to_a_checked_equilibrium() {
    use rigwright_core::gallery::hanging_chain;
    let straight = model(&hanging_chain(400, 100.0, 101.0, 1e7, 10.0, 9.81, 0.0));
    let eq = Statics::new(&straight).solve(0, None).unwrap();
    check_stable_answer(&straight, 0, &eq).unwrap();
    let h = eq.nodes[0].reaction.unwrap().x.abs();
    assert!(rel(h, 2023.1664) < 1e-4, "H = {h}");
    let deep = model(&hanging_chain(150, 100.0, 101.0, 1e7, 10.0, 9.81, 30.0));
    let eq = Statics::new(&deep).solve(0, None).unwrap();
    check_stable_answer(&deep, 0, &eq).unwrap();
    let h = eq.nodes[0].reaction.unwrap().x.abs();
    assert!(rel(h, 2023.1664) < 1e-3, "H = {h}");
}

/// Rounds every coordinate to what it is after a shift by `d` and back: the geometry the
/// shifted file really holds, expressed near the origin.
fn shift(p: &Project, d: f64, back: bool) -> Project {
    let mut q = p.clone();
    for n in &mut q.nodes {
        n.at.0 += d;
        if !q.planar {
            n.at.2 += d;
        }
        if back {
            n.at.0 -= d;
            if !q.planar {
                n.at.2 -= d;
            }
        }
    }
    q
}

/// Results do not depend on where the origin is: every sample shifted by 1 km, 100 km and
/// 1,000 km gives the same forces as the same geometry near the origin, to 1e-9 (common
/// practice: an equilibrium is invariant under translation). The comparison rig holds exactly
/// the coordinates the shifted file holds, moved back without rounding.
#[test]
fn every_sample_gives_the_same_forces_far_from_the_origin() {
    for name in SAMPLES {
        let p = Project::load(&sample(name)).unwrap();
        for d in [1e3, 1e5, 1e6] {
            let far = model(&shift(&p, d, false));
            let near = model(&shift(&p, d, true));
            let (sf, sn) = (Statics::new(&far), Statics::new(&near));
            for c in 0..far.cases.len() {
                let a = sf.solve(c, None).unwrap_or_else(|e| panic!("{name} +{d} m case {c}: {e}"));
                let b = sn.solve(c, None).unwrap();
                assert_eq!(a.stability.is_stable(), b.stability.is_stable(), "{name} +{d} m");
                if a.stability.is_stable() {
                    check_stable_answer(&far, c, &a).unwrap_or_else(|e| panic!("{name} +{d} m case {c}: {e}"));
                }
                let scale = b.members.iter().map(|m| m.force.abs()).fold(1.0, f64::max);
                for (x, y) in a.members.iter().zip(&b.members) {
                    assert!(
                        (x.force - y.force).abs() <= 1e-9 * scale,
                        "{name} +{d} m case {c} {}: {} vs {}",
                        x.id,
                        x.force,
                        y.force
                    );
                }
            }
        }
    }
}

/// A light sign (0.045 kg, ropes weightless) hangs 1.2 µm from the drawing: a stable answer,
/// not a limit point.
#[test]
fn a_very_light_load_is_a_stable_answer() {
    let mut p = sign_sample();
    p.nodes.iter_mut().find(|n| n.id == "sign").unwrap().mass = 0.045;
    for m in &mut p.members {
        m.mass_per_length = 0.0;
    }
    let m = model(&p);
    let eq = Statics::new(&m).solve(0, None).unwrap();
    check_stable_answer(&m, 0, &eq).unwrap();
    assert!(eq.nodes[2].displacement.norm() < 1e-5);
}

/// A huge mass on an anchor loads only the anchor: it must not enlarge the residual scale of
/// the free node. Reference: the same rig without that mass (issue 14; upper-end tensions
/// 403.359 N, 375.876 N with the ropes as catenaries, 402.368 N, 374.453 N with their weight
/// lumped).
#[test]
fn loads_on_held_directions_do_not_loosen_the_convergence_test() {
    let mut p = sign_sample();
    let plain = Statics::new(&model(&p)).solve(0, None).unwrap();
    p.nodes.iter_mut().find(|n| n.id == "wall-left").unwrap().mass = 1e9;
    let m = model(&p);
    let eq = Statics::new(&m).solve(0, None).unwrap();
    check_stable_answer(&m, 0, &eq).unwrap();
    assert!(residual(&m, 0, &displacements(&eq)) < 1e-10);
    for (a, b) in eq.members.iter().zip(&plain.members) {
        assert!(rel(a.force, b.force) < 1e-9, "{}: {} vs {}", a.id, a.force, b.force);
    }
    assert!((plain.members[0].force - 403.359).abs() < 1e-3 && (plain.members[1].force - 375.876).abs() < 1e-3);
}

/// Items that overflow are refused at validation with the item named, never dropped.
#[test]
fn overflowing_inputs_are_refused_naming_the_item() {
    let base = "(version: 2, planar: true, nodes: [(id: \"a\", at: (0.0, 0.0, 0.0), fixed: (true, true, true)), (id: \"b\", at: (1.0, -1.0, 0.0), mass: 1.0)], members: [(id: \"m\", ends: (\"a\", \"b\"), kind: Cable(ea: 1000000.0, rest: AsDrawn))])";
    let cases = [
        ("(1.0, -1.0, 0.0), mass: 1.0", "(1e200, -1.0, 0.0), mass: 1.0", "node `b`"),
        ("(1.0, -1.0, 0.0), mass: 1.0", "(1.0, -1.0, 0.0), mass: 1e308", "node `b`"),
        ("ea: 1000000.0", "ea: 1e308", "member `m`"),
        ("rest: AsDrawn", "rest: Length(5e-324)", "member `m`"),
    ];
    for (from, to, item) in cases {
        let text = base.replace(from, to);
        match parse(&text).validate() {
            Err(e) => assert!(e.to_string().contains(item), "{to}: {e}"),
            Ok(_) => panic!("{to} accepted"),
        }
    }
    // An empty drawing opens (a new document starts empty) but is never a stable equilibrium.
    let empty = model(&parse("(version: 2, nodes: [], members: [])"));
    assert!(matches!(Statics::new(&empty).solve(0, None), Err(SolveError::NothingToSolve)));
}

/// The traced equilibrium path of the shallow truss under three times its limit load: every
/// point lies on the closed-form curve `P(v)` (above), the path passes the limit point at
/// `P_lim / P` (to 1e-6) and the mirror point where the load factor is least, and reaches the
/// full load on the snapped-through branch, stable again.
#[test]
fn the_traced_path_of_the_truss_follows_its_closed_form_through_the_limit_point() {
    let p_lim = truss_limit();
    let load = 3.0 * 38.1;
    let m = model(&parse(&truss_text(&[load])));
    let statics = Statics::new(&m);
    let path = statics.trace(0, 2, 1.0, 400).unwrap();
    assert!(path.reached, "{} points", path.points.len());
    for pt in &path.points {
        let v = -pt.displacement.y;
        let p = pt.load_factor * load;
        assert!(
            (truss_curve(v) - p).abs() < 1e-7 * load,
            "v = {v}: λP = {p}, P(v) = {}",
            truss_curve(v)
        );
        assert!(pt.displacement.x.abs() < 1e-9);
    }
    let first = &path.critical[0];
    assert_eq!(first.kind, "limit point");
    assert!(
        rel(first.load_factor * load, p_lim) < 1e-6,
        "{} vs {p_lim}",
        first.load_factor * load
    );
    let least = path.points.iter().map(|p| p.load_factor).fold(f64::INFINITY, f64::min);
    assert!(rel(least * load, -p_lim) < 1e-2, "least load factor {least}");
    let last = path.points.last().unwrap();
    assert!(
        last.stable && (last.load_factor - 1.0).abs() < 1e-12 && -last.displacement.y > 0.2,
        "{last:?}"
    );
    // Stable before the limit, unstable between the limit points, stable again after.
    let v_lim = 0.042360743;
    for pt in &path.points {
        let v = -pt.displacement.y;
        if v < v_lim - 1e-3 || v > 2.0 * 0.1 - v_lim + 1e-3 {
            assert!(pt.stable, "v = {v}");
        } else if (v_lim + 1e-3..2.0 * 0.1 - v_lim - 1e-3).contains(&v) {
            assert!(!pt.stable, "v = {v}");
        }
    }
}
