//! Static equilibrium against closed-form solutions.

use rigwright_core::{Project, Rest, SolveError, Stability, Statics, Vec3};
use rigwright_verification::*;

fn planar(title: &str) -> Project {
    Project::new(title)
}

/// Hooke's law for a mass on a vertical spring: the spring stays vertical, so the static
/// deflection is exactly m g / k (common practice).
#[test]
fn mass_on_one_spring_deflects_by_weight_over_rate() {
    let mut p = planar("mass on a spring");
    p.nodes = vec![anchor("top", (0.0, 0.0, 0.0)), node("m", (0.0, -1.0, 0.0), 10.0)];
    p.members = vec![member("s", "top", "m", spring(1000.0, Rest::AsDrawn))];
    let eq = solve(&model(&p));
    let dy = eq.nodes[1].displacement.y;
    assert!(rel(dy, -10.0 * 9.81 / 1000.0) < 1e-10, "dy = {dy}");
    assert!(rel(eq.members[0].force, 98.1) < 1e-10);
    assert!(eq.stability.is_stable());
}

/// A straight cable of span L with tension T has transverse stiffness 4T/L at mid-span from
/// the geometric term alone (K_G = (N/l)(I − êêᵀ) for each half, two halves of length L/2;
/// shared REFERENCES §1, calc: 4000 N/m for L = 10 m, T = 10 kN).
#[test]
fn pretensioned_cable_has_transverse_stiffness_four_t_over_l_at_mid_span() {
    let mut p = planar("pretensioned cable");
    p.gravity = (0.0, 0.0, 0.0);
    p.nodes = vec![
        anchor("a", (0.0, 0.0, 0.0)),
        node("mid", (5.0, 0.0, 0.0), 0.0),
        anchor("b", (10.0, 0.0, 0.0)),
    ];
    let ea = 1.0e8;
    p.members = vec![
        member("left", "a", "mid", cable(ea, Rest::Tension(10_000.0))),
        member("right", "mid", "b", cable(ea, Rest::Tension(10_000.0))),
    ];
    let m = model(&p);
    let statics = Statics::new(&m);
    let eq = statics.solve(0, None).unwrap();
    assert!(rel(eq.members[0].force, 10_000.0) < 1e-12);
    let k = statics.node_stiffness(&eq, 1).unwrap();
    assert_eq!(k.axes, vec![0, 1]);
    // Transverse (y): 4000 N/m, all geometric.
    assert!(rel(k.total[1][1], 4000.0) < 1e-9, "k_yy = {}", k.total[1][1]);
    assert!(rel(k.geometric[1][1], 4000.0) < 1e-9);
    assert!(k.elastic[1][1].abs() < 1e-6);
    // Along the cable (x): two halves of EA/L0 in parallel, all elastic.
    let l0 = 5.0 / (1.0 + 10_000.0 / ea);
    assert!(rel(k.total[0][0], 2.0 * ea / l0) < 1e-9);
    assert!(k.geometric[0][0].abs() < 1e-6 * k.total[0][0]);
    // Principal values, smallest first, with their directions.
    assert!(rel(k.principal[0].value, 4000.0) < 1e-9);
    assert!((k.principal[0].direction - Vec3::y()).norm() < 1e-9);
}

/// Shallow two-bar (von Mises) truss with engineering strain: half-span a, rise h,
/// L0 = √(a² + h²); with apex drop v and y = h − v, P(v) = 2 EA y (L0 − L)/(L0 L),
/// L = √(a² + y²) (Bažant & Cedolin, *Stability of Structures*, §4.4, from memory; the
/// expression is re-derived from equilibrium of the apex).
fn truss_load(v: f64, a: f64, h: f64, ea: f64) -> f64 {
    let l0 = (a * a + h * h).sqrt();
    let y = h - v;
    let l = (a * a + y * y).sqrt();
    2.0 * ea * y * (l0 - l) / (l0 * l)
}

fn truss(p_down: f64) -> Project {
    let mut p = planar("two-bar truss");
    p.nodes = vec![
        anchor("left", (-1.0, 0.0, 0.0)),
        node("apex", (0.0, 0.1, 0.0), 0.0),
        anchor("right", (1.0, 0.0, 0.0)),
    ];
    p.members = vec![
        member("bar-l", "left", "apex", strut(1.0e6, Rest::AsDrawn)),
        member("bar-r", "apex", "right", strut(1.0e6, Rest::AsDrawn)),
    ];
    p.cases = vec![case("load", 0.0, &[("apex", (0.0, -p_down, 0.0))])];
    p
}

fn truss_limit() -> (f64, f64) {
    // The limit load is the maximum of P(v) on 0 < v < h (fine scan, then golden section).
    let f = |v: f64| truss_load(v, 1.0, 0.1, 1.0e6);
    let (mut lo, mut hi) = (0.0, 0.1);
    let g = 0.5 * (5f64.sqrt() - 1.0);
    for _ in 0..200 {
        let c = hi - g * (hi - lo);
        let d = lo + g * (hi - lo);
        if f(c) > f(d) { hi = d } else { lo = c }
    }
    let v = 0.5 * (lo + hi);
    (v, f(v))
}

#[test]
fn shallow_two_bar_truss_follows_its_analytic_load_deflection_curve_below_the_limit() {
    let (v_lim, p_lim) = truss_limit();
    for frac in [0.2, 0.5, 0.9, 0.98] {
        let p_applied = frac * p_lim;
        let eq = solve(&model(&truss(p_applied)));
        assert!(eq.stability.is_stable());
        let v = -eq.nodes[1].displacement.y;
        assert!(v < v_lim, "frac {frac}: v = {v} past the limit at {v_lim}");
        let p_curve = truss_load(v, 1.0, 0.1, 1.0e6);
        assert!(rel(p_curve, p_applied) < 1e-8, "frac {frac}: P(v) = {p_curve} vs {p_applied}");
        assert!(eq.nodes[1].displacement.x.abs() < 1e-12);
    }
}

#[test]
fn two_bar_truss_loaded_past_its_limit_reports_the_limit_point_not_the_inverted_branch() {
    let (_, p_lim) = truss_limit();
    let over = 1.05;
    match Statics::new(&model(&truss(over * p_lim))).solve(0, None) {
        Err(SolveError::LimitPoint { load_factor, .. }) => {
            let reached = load_factor * over;
            assert!(
                (0.98..=1.0 + 1e-9).contains(&reached),
                "limit found at {reached} of the analytic limit load"
            );
        }
        other => panic!("expected a limit point, got {other:?}"),
    }
}

/// A node held between a preloaded spring above and a pretensioned cable below; a downward
/// load F is shared in proportion to the rates until the cable goes slack at
/// F* = T0 (k_s + k_c)/k_c, after which the spring alone carries it (statics of two springs
/// in parallel, common practice).
#[test]
fn cable_goes_slack_and_hands_its_load_to_the_spring() {
    let t0 = 200.0;
    let ks = 1000.0;
    let ea = 4000.0;
    let build = |f: f64| {
        let mut p = planar("spring over cable");
        p.nodes = vec![
            anchor("top", (0.0, 1.0, 0.0)),
            node("n", (0.0, 0.0, 0.0), 0.0),
            anchor("bottom", (0.0, -1.0, 0.0)),
        ];
        p.members = vec![
            member("spring", "top", "n", spring(ks, Rest::Tension(t0))),
            member("cable", "n", "bottom", cable(ea, Rest::Tension(t0))),
        ];
        p.cases = vec![case("pull", 0.0, &[("n", (0.0, -f, 0.0))])];
        p
    };
    let kc = ea / (1.0 / (1.0 + t0 / ea));
    let f_star = t0 * (ks + kc) / kc;
    for f in [0.5 * f_star, 0.9 * f_star] {
        let eq = solve(&model(&build(f)));
        let u = -eq.nodes[1].displacement.y;
        assert!(rel(u, f / (ks + kc)) < 1e-9, "F = {f}: u = {u}");
        assert!(!eq.members[1].slack);
        assert!(rel(eq.members[1].force, t0 - kc * u) < 1e-9);
    }
    for f in [1.1 * f_star, 3.0 * f_star] {
        let eq = solve(&model(&build(f)));
        let u = -eq.nodes[1].displacement.y;
        assert!(eq.members[1].slack, "F = {f}: cable should be slack");
        assert_eq!(eq.members[1].force, 0.0);
        assert!(rel(u, (f - t0) / ks) < 1e-9, "F = {f}: u = {u}");
        assert!(rel(eq.members[0].force, f) < 1e-9);
    }
}

/// Two free nodes joined only to each other fall without limit under gravity.
#[test]
fn a_part_with_no_path_to_an_anchor_is_reported_as_a_mechanism_naming_a_node() {
    let mut p = planar("floating");
    p.nodes = vec![
        anchor("a", (0.0, 0.0, 0.0)),
        node("f1", (2.0, 0.0, 0.0), 5.0),
        node("f2", (3.0, 0.0, 0.0), 5.0),
        node("m", (0.0, -1.0, 0.0), 1.0),
    ];
    p.members = vec![
        member("link", "f1", "f2", strut(1e6, Rest::AsDrawn)),
        member("hanger", "a", "m", cable(1e6, Rest::AsDrawn)),
    ];
    match Statics::new(&model(&p)).solve(0, None) {
        Err(SolveError::Mechanism { node, direction }) => {
            assert!(node == "f1" || node == "f2", "named {node}");
            assert!(direction[1] < -0.99, "direction {direction:?}");
        }
        other => panic!("expected a mechanism, got {other:?}"),
    }
}

/// An upright strut carrying a mass on its top is an inverted pendulum: the straight state is
/// an equilibrium but its lateral tangent stiffness N/L is negative (common practice).
#[test]
fn an_upright_strut_with_a_mass_on_top_is_flagged_unstable_sideways() {
    let mut p = planar("inverted pendulum");
    p.nodes = vec![anchor("base", (0.0, 0.0, 0.0)), node("top", (0.0, 2.0, 0.0), 50.0)];
    p.members = vec![member("post", "base", "top", strut(1e8, Rest::AsDrawn))];
    let eq = solve(&model(&p));
    match &eq.stability {
        Stability::Unstable {
            node,
            direction,
            eigenvalue,
        } => {
            assert_eq!(node, "top");
            assert!(direction[0].abs() > 0.999, "direction {direction:?}");
            // Lowest eigenvalue is N/L = −m g / L (the strut shortens negligibly).
            assert!(rel(*eigenvalue, -50.0 * 9.81 / 2.0) < 1e-4, "eigenvalue {eigenvalue}");
        }
        other => panic!("expected unstable, got {other:?}"),
    }
}

/// Two colinear unloaded springs leave their middle node free to move sideways.
#[test]
fn an_unloaded_node_between_colinear_springs_is_a_mechanism_sideways() {
    let mut p = planar("colinear springs");
    p.gravity = (0.0, 0.0, 0.0);
    p.nodes = vec![
        anchor("a", (0.0, 0.0, 0.0)),
        node("mid", (1.0, 0.0, 0.0), 0.0),
        anchor("b", (2.0, 0.0, 0.0)),
    ];
    p.members = vec![
        member("s1", "a", "mid", spring(100.0, Rest::AsDrawn)),
        member("s2", "mid", "b", spring(100.0, Rest::AsDrawn)),
    ];
    let eq = solve(&model(&p));
    match &eq.stability {
        Stability::Mechanism { node, direction } => {
            assert_eq!(node, "mid");
            assert!(direction[1].abs() > 0.999);
        }
        other => panic!("expected a mechanism, got {other:?}"),
    }
}

/// A weightless node on one unstressed cable has no stiffness in any direction (a slack
/// tension-only member, closed form): the diagnostic must name that node and a real direction,
/// not the anchor.
#[test]
fn a_lone_slack_cable_is_a_mechanism_at_its_free_end() {
    let mut p = planar("lone cable");
    p.nodes = vec![anchor("anchor", (0.0, 0.0, 0.0)), node("end", (1.0, 0.0, 0.0), 0.0)];
    p.members = vec![member("c", "anchor", "end", cable(1e6, Rest::AsDrawn))];
    match Statics::new(&model(&p)).solve(0, None) {
        Err(SolveError::Mechanism { node, direction }) => {
            assert_eq!(node, "end");
            let len = direction.iter().map(|d| d * d).sum::<f64>().sqrt();
            assert!((len - 1.0).abs() < 1e-12, "{direction:?}");
        }
        Ok(eq) => match eq.stability {
            Stability::Mechanism { node, direction } => {
                assert_eq!(node, "end");
                assert!((direction.iter().map(|d| d * d).sum::<f64>().sqrt() - 1.0).abs() < 1e-12);
            }
            other => panic!("{other:?}"),
        },
        Err(e) => panic!("{e}"),
    }
}
