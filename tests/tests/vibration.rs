//! Natural frequencies and free vibration against closed-form results.

use std::f64::consts::{PI, TAU};

use rigwright_core::dynamics::{Motion, MotionSettings, Scheme, modes};
use rigwright_core::{Model, Project, Rest, Statics, Vec3};
use rigwright_verification::*;

/// A bead of `mass` (kg) at the middle of a 2 m string of two cables with axial stiffness `ea`
/// (N) pretensioned to `tension` (N), no gravity.
fn bead_on_string(mass: f64, tension: f64, ea: f64) -> Model {
    let mut p = Project::new("bead on a string");
    p.gravity = (0.0, 0.0, 0.0);
    p.nodes = vec![
        anchor("a", (0.0, 0.0, 0.0)),
        node("bead", (1.0, 0.0, 0.0), mass),
        anchor("b", (2.0, 0.0, 0.0)),
    ];
    p.members = vec![
        member("left", "a", "bead", cable(ea, Rest::Tension(tension))),
        member("right", "bead", "b", cable(ea, Rest::Tension(tension))),
    ];
    model(&p)
}

/// A bead of mass m at mid-span of a massless string with tension T and span L vibrates
/// transversely at ω² = 4T/(mL) (shared REFERENCES §2, from memory of any vibration text,
/// e.g. Rao, *Mechanical Vibrations*): m = 10 kg, T = 1000 N, L = 2 m → f = 2.25079 Hz (calc).
#[test]
fn bead_at_mid_span_of_a_tensioned_string_has_the_textbook_frequency() {
    let m = bead_on_string(10.0, 1000.0, 1e7);
    let statics = Statics::new(&m);
    let eq = statics.solve(0, None).unwrap();
    let ms = modes(&statics, &eq, 2).unwrap();
    let f = ms.modes[0].frequency_hz;
    assert!(rel(f, 2.25079) < 2e-6, "f = {f}");
    assert!((ms.modes[0].shape[1].normalize() - Vec3::y()).norm() < 1e-9);
    // Mass-normalised: φᵀ M φ = 1, and all the bead's mass participates along y.
    assert!(rel(ms.modes[0].shape[1].norm_squared() * 10.0, 1.0) < 1e-9);
    assert!(rel(ms.modes[0].effective_mass[1], 10.0) < 1e-9);
}

/// A string of N − 1 equal beads (spacing h, bead mass μh, tension T) vibrates at
/// ω_n = 2 √(T/(μ h²)) sin(nπ/(2N)) (Lagrange's beaded string; e.g. Rao, *Mechanical
/// Vibrations*, from memory), which tends to the taut string's ω_n = nπ/L √(T/μ).
fn beaded_string(beads: usize, planar: bool) -> Model {
    let (l, t, mu) = (10.0, 2000.0, 1.5);
    let h = l / beads as f64;
    let mut p = Project::new("beaded string");
    p.planar = planar;
    p.gravity = (0.0, 0.0, 0.0);
    for k in 0..=beads {
        let at = (k as f64 * h, 0.0, 0.0);
        p.nodes.push(if k == 0 || k == beads {
            anchor(&format!("p{k}"), at)
        } else {
            node(&format!("p{k}"), at, mu * h)
        });
    }
    for k in 0..beads {
        p.members.push(member(
            &format!("s{k}"),
            &format!("p{k}"),
            &format!("p{}", k + 1),
            cable(1e9, Rest::Tension(t)),
        ));
    }
    model(&p)
}

fn discrete_omega(n: usize, beads: usize) -> f64 {
    let (l, t, mu) = (10.0, 2000.0, 1.5);
    let h = l / beads as f64;
    2.0 * (t / (mu * h * h)).sqrt() * (n as f64 * PI / (2.0 * beads as f64)).sin()
}

#[test]
fn beaded_string_matches_lagranges_formula_and_converges_to_the_taut_string() {
    let continuous = |n: usize| n as f64 / (2.0 * 10.0) * (2000.0f64 / 1.5).sqrt();
    let mut errors = Vec::new();
    for beads in [10, 20, 40] {
        let m = beaded_string(beads, true);
        let statics = Statics::new(&m);
        let eq = statics.solve(0, None).unwrap();
        let ms = modes(&statics, &eq, 3).unwrap();
        for n in 1..=3 {
            let f = ms.modes[n - 1].frequency_hz;
            assert!(rel(f * TAU, discrete_omega(n, beads)) < 1e-7, "{beads} beads, mode {n}: {f}");
        }
        errors.push((ms.modes[0].frequency_hz - continuous(1)).abs());
    }
    // Error ∝ 1/N²: ratio ≈ 4 per halving of the spacing.
    for w in errors.windows(2) {
        let r = w[0] / w[1];
        assert!((3.9..4.1).contains(&r), "ratio {r}");
    }
}

/// In 3D the string's transverse modes come in equal pairs (y and z). With 749 massive
/// degrees of freedom the sparse block-Lanczos path runs, and must return both members of
/// every pair.
#[test]
fn repeated_frequency_pairs_of_a_3d_string_are_all_found_by_the_sparse_eigensolver() {
    check_string_pairs(250);
}

/// The same above 5,000 degrees of freedom (5,097), where the solves and the basis products are
/// shared out among threads.
#[test]
fn repeated_frequency_pairs_survive_the_threaded_solves_of_a_long_string() {
    check_string_pairs(1700);
}

fn check_string_pairs(beads: usize) {
    let m = beaded_string(beads, false);
    let statics = Statics::new(&m);
    let eq = statics.solve(0, None).unwrap();
    let ms = modes(&statics, &eq, 6).unwrap();
    assert_eq!(ms.modes.len(), 6);
    for (k, mode) in ms.modes.iter().enumerate() {
        let n = k / 2 + 1;
        assert!(
            rel(mode.omega, discrete_omega(n, beads)) < 1e-7,
            "mode {k}: ω = {} vs {}",
            mode.omega,
            discrete_omega(n, beads)
        );
    }
}

/// A mass `mass` (kg) guided vertically under a spring of rate `k` (N/m), no gravity: the
/// model, its equilibrium positions and a start pulled down by `pull` (m).
fn vertical_oscillator(k: f64, mass: f64, pull: f64) -> (Model, Vec<Vec3>, Vec<Vec3>) {
    let mut p = Project::new("oscillator");
    p.gravity = (0.0, 0.0, 0.0);
    p.nodes = vec![anchor("top", (0.0, 1.0, 0.0)), guided_y("m", (0.0, 0.0, 0.0), mass)];
    p.members = vec![member("s", "top", "m", spring(k, Rest::AsDrawn))];
    let m = model(&p);
    let about: Vec<Vec3> = m.nodes.iter().map(|n| n.position).collect();
    let mut start = about.clone();
    start[1].y -= pull;
    (m, about, start)
}

/// Mass on a vertical spring (linear: the spring stays vertical). The energy-conserving rule
/// is the average-acceleration Newmark rule on a linear system, which keeps energy exactly
/// and lengthens the period by T̄/T = Ω/(2 atan(Ω/2)), Ω = ωΔt (Hughes, *The Finite Element
/// Method*, ch. 9, from memory; Ω = 0.5 → 1.020497, calc).
#[test]
fn linear_oscillator_conserves_energy_and_shows_the_newmark_period_elongation() {
    let (k, mass): (f64, f64) = (4000.0, 10.0);
    let omega = (k / mass).sqrt();
    let (m, about, start) = vertical_oscillator(k, mass, 0.05);
    let dt = 0.5 / omega;
    let mut motion = Motion::new(&m, 0, &start, None, &about, MotionSettings { dt, ..Default::default() }).unwrap();
    let e0 = motion.energy().mechanical();
    let mut crossings = Vec::new();
    let mut prev = motion.positions()[1].y;
    for _ in 0..4000 {
        motion.step().unwrap();
        let y = motion.positions()[1].y;
        if prev < 0.0 && y >= 0.0 {
            crossings.push(motion.time() - dt * y / (y - prev));
        }
        prev = y;
        assert!((motion.energy().mechanical() - e0).abs() < 1e-12 * e0, "energy drift");
    }
    // The discrete solution is exactly sinusoidal at the shifted frequency, but linear
    // interpolation of crossings adds a small error: average over many periods.
    let period = (crossings[crossings.len() - 1] - crossings[0]) / (crossings.len() - 1) as f64;
    let ratio = period / (TAU / omega);
    assert!((ratio - 1.020497).abs() < 2e-5, "T̄/T = {ratio}");
}

/// A pulled bead on a string swings with large amplitude (nonlinear). Halving Δt quarters the
/// error at a fixed time (second-order accuracy of the midpoint rule, common practice).
#[test]
fn pluck_is_second_order_accurate_in_the_time_step() {
    let m = bead_on_string(2.0, 200.0, 2e4);
    let about: Vec<Vec3> = m.nodes.iter().map(|n| n.position).collect();
    let mut start = about.clone();
    start[1].y += 0.3;
    let run = |dt: f64| {
        let mut mo = Motion::new(&m, 0, &start, None, &about, MotionSettings { dt, ..Default::default() }).unwrap();
        mo.advance(0.5).unwrap();
        assert!((mo.time() - 0.5).abs() < 1e-9);
        mo.positions()[1]
    };
    let reference = run(0.5 / 6400.0);
    let e: Vec<f64> = [0.5 / 50.0, 0.5 / 100.0, 0.5 / 200.0]
        .iter()
        .map(|&dt| (run(dt) - reference).norm())
        .collect();
    for w in e.windows(2) {
        let r = w[0] / w[1];
        assert!((3.7..4.3).contains(&r), "error ratio {r} ({e:?})");
    }
}

/// Mass between a spring above (rate k1) and a pretensioned cable below (rate k2, tension T0),
/// released from rest at u = −A below equilibrium with A > δ = T0/k2, so the cable goes slack
/// every cycle. Forces on the mass (up positive): taut, F = −(k1 + k2) u; slack (u ≤ −δ),
/// F = T0 − k1 u, harmonic about u_c = T0/k1. With ω_s = √(k1/m), ω_t = √((k1 + k2)/m):
/// slack arc from −A to −δ takes t₁ = acos((δ + u_c)/(A + u_c))/ω_s and arrives with speed
/// v₁ = ω_s √((A + u_c)² − (δ + u_c)²); the taut arc is harmonic about 0 with amplitude
/// B = √(δ² + (v₁/ω_t)²) and lasts (π + 2 asin(δ/B))/ω_t. Period T = 2t₁ + (π + 2 asin(δ/B))/ω_t
/// (derived here from piecewise-linear free vibration, common practice).
#[test]
fn cable_that_goes_slack_every_cycle_has_the_two_stiffness_period_and_keeps_energy() {
    let (k1, k2, t0, mass, a) = (1000.0, 9000.0, 90.0, 4.0, 0.03);
    // The cable's rate EA/L0 differs slightly from EA because L0 = 1 m/(1 + T0/EA); the
    // exact k2 is read back from the model below.
    let ea = k2;
    let mut p = Project::new("slack oscillator");
    p.gravity = (0.0, 0.0, 0.0);
    p.nodes = vec![
        anchor("top", (0.0, 1.0, 0.0)),
        guided_y("m", (0.0, 0.0, 0.0), mass),
        anchor("bottom", (0.0, -1.0, 0.0)),
    ];
    p.members = vec![
        member("spring", "top", "m", spring(k1, Rest::Tension(t0))),
        member("cable", "m", "bottom", cable(ea, Rest::Tension(t0))),
    ];
    let m = model(&p);
    let k2 = m.members[1].kind.rate();
    let delta = t0 / k2;
    assert!(a > delta);
    let uc = t0 / k1;
    let (ws, wt) = ((k1 / mass).sqrt(), ((k1 + k2) / mass).sqrt());
    let t1 = ((delta + uc) / (a + uc)).acos() / ws;
    let v1 = ws * ((a + uc).powi(2) - (delta + uc).powi(2)).sqrt();
    let b = (delta * delta + (v1 / wt).powi(2)).sqrt();
    let period = 2.0 * t1 + (PI + 2.0 * (delta / b).asin()) / wt;

    let about: Vec<Vec3> = m.nodes.iter().map(|n| n.position).collect();
    let mut start = about.clone();
    start[1].y -= a;
    let dt = period / 4000.0;
    let mut mo = Motion::new(&m, 0, &start, None, &about, MotionSettings { dt, ..Default::default() }).unwrap();
    let e0 = mo.energy().mechanical();
    // Times of the lowest points (velocity turning from down to up).
    let mut lows = Vec::new();
    let mut prev_v = 0.0f64;
    let cycles = 5;
    while mo.time() < period * (cycles as f64 + 0.5) {
        mo.step().unwrap();
        let v = mo.velocities()[1].y;
        if prev_v < 0.0 && v >= 0.0 {
            lows.push(mo.time() - dt * v / (v - prev_v));
        }
        prev_v = v;
    }
    assert_eq!(mo.slack_events(), cycles, "one slack event per cycle");
    let measured = (lows[lows.len() - 1] - lows[0]) / (lows.len() - 1) as f64;
    assert!(rel(measured, period) < 1e-4, "period {measured} vs {period}");
    let drift = (mo.energy().mechanical() - e0).abs() / e0;
    assert!(drift < 1e-9, "energy drift {drift}");
}

/// Generalized-α with ρ∞ < 1 removes energy over time (Chung & Hulbert 1993, J. Appl.
/// Mech. 60, numerical dissipation; common practice check), and the audit books it.
#[test]
fn generalized_alpha_with_rho_below_one_dissipates_and_the_audit_books_it() {
    let m = beaded_string(8, true);
    let about: Vec<Vec3> = m.nodes.iter().map(|n| n.position).collect();
    let mut start = about.clone();
    start[4].y += 0.2;
    let settings = MotionSettings {
        dt: 2e-3,
        scheme: Scheme::GeneralizedAlpha { rho_inf: 0.6 },
        ..Default::default()
    };
    let mut mo = Motion::new(&m, 0, &start, None, &about, settings).unwrap();
    let e0 = mo.energy().mechanical();
    mo.advance(1.0).unwrap();
    let last = mo.energy().mechanical();
    assert!(last < 0.999 * e0, "{last} vs {e0}");
    let e = mo.energy();
    assert_eq!(e.damped, 0.0);
    assert!(rel(e.numerical, e0 - last) < 1e-9);
}

/// Viscous damping ratio ζ makes free vibration decay by the logarithmic decrement
/// δ = ln(u_k / u_{k+1}) = 2πζ/√(1 − ζ²) per cycle (Rao, *Mechanical Vibrations*, §2.6, from
/// memory). Rayleigh coefficients for ζ at ω₁ = ω₂ = ω give exactly ζ at ω.
#[test]
fn rayleigh_damping_gives_the_logarithmic_decrement_of_its_damping_ratio() {
    let (k, mass, zeta): (f64, f64, f64) = (4000.0, 10.0, 0.03);
    let omega = (k / mass).sqrt();
    let (m, about, start) = vertical_oscillator(k, mass, 0.05);
    let settings = MotionSettings {
        dt: 2e-3 / omega,
        rayleigh: rigwright_core::dynamics::rayleigh_coefficients(zeta, omega, omega),
        ..Default::default()
    };
    let mut mo = Motion::new(&m, 0, &start, None, &about, settings).unwrap();
    // Successive troughs (velocity crossing zero upward), refined by a parabola through three samples.
    let mut peaks = Vec::new();
    let (mut y0, mut y1) = (mo.positions()[1].y, mo.positions()[1].y);
    while peaks.len() < 6 {
        mo.step().unwrap();
        let y2 = mo.positions()[1].y;
        if y1 < y0 && y1 <= y2 {
            let denom = y0 - 2.0 * y1 + y2;
            peaks.push(y1 - (y0 - y2).powi(2) / (8.0 * denom));
        }
        (y0, y1) = (y1, y2);
    }
    let expected = std::f64::consts::TAU * zeta / (1.0 - zeta * zeta).sqrt();
    for w in peaks.windows(2) {
        let decrement = (w[0] / w[1]).ln();
        assert!(rel(decrement, expected) < 1e-4, "decrement {decrement} vs {expected}");
    }
    // The audit books the lost energy as damping work, not as numerical error.
    let e = mo.energy();
    assert!(e.damped > 0.0);
    assert!(e.numerical.abs() < 1e-9 * e.damped, "numerical {}", e.numerical);
}
