//! The own modes of a sagging cable: the links the dynamics cut it into against Irvine's
//! linear theory of a suspended cable (Irvine & Caughey 1974; Irvine, *Cable Structures*, MIT
//! Press 1981, ch. 3; from memory, shared REFERENCES §2). For a level span `l` with horizontal
//! tension `H`, mass `m` per length, weight `w = m g` and `λ² = (w l/H)² l/(H L_e/EA)`,
//! `L_e ≈ l (1 + 8 (d/l)²)`:
//! - out of the plane: `ω_n = (nπ/l) √(H/m)`;
//! - in the plane, antisymmetric: `ω_n = (2nπ/l) √(H/m)`;
//! - in the plane, symmetric: `tan(ω̄/2) = ω̄/2 − (4/λ²)(ω̄/2)³`, `ω̄ = ω l/√(H/m)`, whose
//!   first root passes the first antisymmetric one (`ω̄ = 2π`) at the crossover `λ² = 4π²`.
//!
//! The theory holds for shallow sag; the span here sags 1 : 50, so it agrees to about
//! `8 (d/l)²` = 3.2e-3 (measured: 2e-4 out of the plane, 2e-3 in it). Its `m` is the mass per length of the hanging (stretched) cable: the file's mass
//! per unstressed length times `L0/S`, `S` the stretched length. The chain of `n` links converges as `1/n²` (Richardson's ratio of successive
//! differences near 4).

use rigwright_core::dynamics::subdivide::subdivide;
use rigwright_core::dynamics::{CableLinks, Mode, modes, modes_with};
use rigwright_core::model::{CaseDoc, MemberDoc, MemberDocKind, NodeDoc, Rest};
use rigwright_core::{Model, Project, Statics, Watch};
use rigwright_verification::{model, rel, solve};

const SPAN: f64 = 100.0;
const MASS: f64 = 1.0; // kg/m
const G: f64 = 9.81;
/// Sag 1 : 50 → H = w l²/(8 d).
const H: f64 = MASS * G * SPAN * SPAN / (8.0 * SPAN / 50.0);

fn span(ea: f64) -> Model {
    let mut p = Project::new("level span");
    p.planar = false;
    p.gravity = (0.0, -G, 0.0);
    for (id, x) in [("a", 0.0), ("b", SPAN)] {
        p.nodes.push(NodeDoc {
            id: id.into(),
            at: (x, 0.0, 0.0),
            mass: 0.0,
            fixed: [true; 3],
        });
    }
    p.members.push(MemberDoc {
        id: "span".into(),
        ends: ("a".into(), "b".into()),
        kind: MemberDocKind::Cable {
            ea,
            rest: Rest::Horizontal(H),
        },
        mass_per_length: MASS,
        design: None,
    });
    p.cases = vec![CaseDoc {
        name: "still".into(),
        gravity: 1.0,
        loads: vec![],
    }];
    model(&p)
}

/// EA giving `λ²` for the span (small-sag `L_e`).
fn ea_for(lambda2: f64) -> f64 {
    let d = SPAN / 50.0;
    let le = SPAN * (1.0 + 8.0 * (d / SPAN).powi(2));
    lambda2 * H * le / (SPAN * (MASS * G * SPAN / H).powi(2))
}

/// First root of Irvine's symmetric equation, by bisection on (π, 3π) (Hz), for mass `mass`
/// per stretched length.
fn irvine_symmetric(lambda2: f64, mass: f64) -> f64 {
    let f = |w: f64| (w / 2.0).tan() - w / 2.0 + 4.0 / lambda2 * (w / 2.0).powi(3);
    // tan has its pole at ω̄ = π; the root lies between π and 3π.
    let (mut lo, mut hi) = (std::f64::consts::PI + 1e-9, 3.0 * std::f64::consts::PI - 1e-9);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if f(lo).signum() == f(mid).signum() { lo = mid } else { hi = mid }
    }
    0.5 * (lo + hi) * (H / mass).sqrt() / (std::f64::consts::TAU * SPAN)
}

/// Which family a mode of the subdivided span belongs to, from its joints' motion.
#[derive(Debug, PartialEq)]
enum Family {
    OutOfPlane,
    Symmetric,
    Antisymmetric,
}

fn family(mode: &Mode, joints: std::ops::Range<usize>) -> Family {
    let v: Vec<_> = mode.shape[joints].to_vec();
    let out: f64 = v.iter().map(|s| s.z * s.z).sum();
    let inp: f64 = v.iter().map(|s| s.x * s.x + s.y * s.y).sum();
    if out > inp {
        return Family::OutOfPlane;
    }
    // Mirror about mid-span: joint k against joint n−k (vertical motion).
    let n = v.len();
    let mirror: f64 = (0..n).map(|k| v[k].y * v[n - 1 - k].y).sum();
    let norm: f64 = v.iter().map(|s| s.y * s.y).sum();
    if mirror > 0.0 * norm {
        Family::Symmetric
    } else {
        Family::Antisymmetric
    }
}

/// Lowest frequency of each family with the span cut into `n` links (Hz), from the modes of
/// the subdivided rig, and the same from the product's `modes_with` (which reports shapes at
/// the original nodes only).
fn first_of_each(m: &Model, n: usize) -> [f64; 3] {
    let eq = solve(m);
    let sub = subdivide(m, &eq, 0, &[n]);
    let st = Statics::new(&sub.model);
    let eq2 = st.solve(0, Some(&sub.warm)).unwrap();
    let ms = modes(&st, &eq2, 8).unwrap();
    let joints = m.nodes.len()..sub.model.nodes.len();
    let mut first = [f64::NAN; 3];
    for mode in &ms.modes {
        let k = match family(mode, joints.clone()) {
            Family::OutOfPlane => 0,
            Family::Symmetric => 1,
            Family::Antisymmetric => 2,
        };
        if first[k].is_nan() {
            first[k] = mode.frequency_hz;
        }
    }
    // The product's path gives the same frequencies.
    let product = modes_with(&Statics::new(m), &eq, 8, CableLinks::Each(n), &Watch::new()).unwrap();
    for (a, b) in product.modes.iter().zip(&ms.modes) {
        assert!(rel(a.frequency_hz, b.frequency_hz) < 1e-9);
        assert!(a.cable_share > 0.999, "a span between anchors vibrates only in its cable");
    }
    first
}

#[test]
fn a_sagging_span_has_irvines_frequencies_and_the_links_converge() {
    for lambda2 in [1.0, 4.0 * std::f64::consts::PI.powi(2), 400.0] {
        let m = span(ea_for(lambda2));
        let r = solve(&m).members[0].clone();
        let mass = MASS * r.unstressed_length / r.sag.expect("sags").stretched_length;
        let string = (H / mass).sqrt() / (2.0 * SPAN); // out-of-plane fundamental, Hz
        let expected = [string, irvine_symmetric(lambda2, mass), 2.0 * string];
        let runs: Vec<[f64; 3]> = [16, 32, 64].iter().map(|&n| first_of_each(&m, n)).collect();
        for k in 0..3 {
            let (f16, f32, f64_) = (runs[0][k], runs[1][k], runs[2][k]);
            // Richardson: differences shrink about 4× per doubling, and the extrapolated value
            // lies within the theory's own accuracy of Irvine's.
            let ratio = (f32 - f16) / (f64_ - f32);
            let extrapolated = f64_ + (f64_ - f32) / 3.0;
            assert!(
                (3.0..5.0).contains(&ratio) || (f64_ - f32).abs() < 1e-6 * f64_,
                "λ² {lambda2}, family {k}: ratio of differences {ratio} ({f16}, {f32}, {f64_} Hz)"
            );
            assert!(
                rel(extrapolated, expected[k]) < 3.2e-3,
                "λ² {lambda2}, family {k}: {extrapolated} Hz vs Irvine {} Hz",
                expected[k]
            );
        }
        if lambda2 > 39.0 && lambda2 < 40.0 {
            // The crossover: the first symmetric and antisymmetric in-plane modes coincide.
            assert!(rel(runs[2][1], runs[2][2]) < 3e-3, "crossover: {} vs {} Hz", runs[2][1], runs[2][2]);
        }
    }
}

/// Lumping each cable's mass at its ends (`--cable-links 1`) leaves a span between anchors
/// nothing to vibrate; the default cuts it into links.
#[test]
fn the_default_subdivides_and_one_link_lumps() {
    let m = span(ea_for(10.0));
    let eq = solve(&m);
    let st = Statics::new(&m);
    let auto = modes(&st, &eq, 4).unwrap();
    assert_eq!(auto.cables.len(), 1);
    assert!((8..=64).contains(&auto.cables[0].links), "{:?}", auto.cables);
    let lumped = modes_with(&st, &eq, 4, CableLinks::Each(1), &Watch::new());
    assert!(lumped.is_err() || lumped.unwrap().modes.is_empty());
}
