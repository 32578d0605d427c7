//! What one member does at one configuration: the forces at its ends, its energy and its
//! tangent stiffness — for a straight member (the laws of [`MemberKind`]) and for a cable that
//! sags under its own weight (the elastic catenary of [`catenary`](super::catenary)).
//!
//! Sign convention (as the solver's residual): `end_a`, `end_b` are the internal forces `f_int`,
//! the negatives of the forces the member exerts on its end nodes. A straight member has
//! `end_a = −end_b`; a sagging cable's ends also carry its weight, `end_a + end_b = q L0 ẑ` (ẑ
//! up). The tangent is `K = ∂ end_b/∂x_b`; the element matrix is `[K −K; −K K]`, because the
//! forces depend on the chord `x_b − x_a` alone.

use nalgebra::{Matrix3, Vector3};

use super::MemberKind;
use super::catenary::{Catenary, Hanging};

type Vec3 = Vector3<f64>;

/// A sagging cable's shape and forces at one configuration, for results and drawing.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Sag {
    pub cable: Catenary,
    pub hang: Hanging,
    /// Unit vectors of the cable's vertical plane: horizontal from end a towards end b, and up.
    pub horizontal: Vec3,
    pub up: Vec3,
}

impl Sag {
    /// The point of the curve at unstressed arc length `s` from end a, end a being at `at_a`
    /// (m).
    pub fn point(&self, at_a: &Vec3, s: f64) -> Vec3 {
        let (x, z) = self.cable.point_at(&self.hang, s);
        at_a + self.horizontal * x + self.up * z
    }
}

/// A member's response at one configuration.
#[derive(Debug, Clone, PartialEq)]
pub struct Response {
    /// Internal force at end a (N).
    pub end_a: Vec3,
    /// Internal force at end b (N).
    pub end_b: Vec3,
    /// Strain energy, plus for a sagging cable the potential of its weight relative to the
    /// drawn height of end a (J).
    pub energy: f64,
    /// Elastic part of `K` (N/m): `k_a ê êᵀ` for a straight member; for a sagging cable, what is
    /// left of its exact stiffness after the chord-force term below.
    pub elastic: Matrix3<f64>,
    /// Geometric part of `K` (N/m): `(N/L)(I − ê êᵀ)` with `N` the force along the chord.
    pub geometric: Matrix3<f64>,
    /// Force to report and check (N): the axial force of a straight member, tension positive;
    /// the largest tension of a sagging cable (at one of its ends).
    pub force: f64,
    /// A straight cable with `L ≤ L0`.
    pub slack: bool,
    /// The solved catenary, for a sagging cable.
    pub sag: Option<Sag>,
}

/// A cable sags when its weight on its unstressed length exceeds this fraction of its EA;
/// lighter than that its weight is far below the forces of any rig and it is straight.
const WEIGHT_FLOOR: f64 = 1e-12;

/// Whether a cable of this kind and mass per length (kg/m) sags under acceleration `gravity`.
pub fn sags(kind: &MemberKind, mass_per_length: f64, gravity: &Vec3) -> bool {
    match *kind {
        MemberKind::Cable { ea, l0 } => mass_per_length > 0.0 && mass_per_length * gravity.norm() * l0 > WEIGHT_FLOOR * ea,
        _ => false,
    }
}

/// The response of a member of `kind` with mass per length `mass_per_length` (kg/m) whose chord
/// (end a to end b) is `chord` (m), under gravitational acceleration `gravity` (m/s², the load
/// case's, times the load factor), end a displaced by `u_a` (m) from its drawn position. `None`
/// when the member has collapsed to zero length or its catenary has no solution.
pub fn respond(kind: &MemberKind, mass_per_length: f64, chord: &Vec3, gravity: &Vec3, u_a: &Vec3) -> Option<Response> {
    respond_near(kind, mass_per_length, chord, gravity, u_a, None)
}

/// [`respond`] for a sagging cable whose `(H, V)` at a nearby configuration is `near` (its
/// [`Sag::hang`]): the catenary's solve starts there. The same answer, sooner.
pub fn respond_near(
    kind: &MemberKind,
    mass_per_length: f64,
    chord: &Vec3,
    gravity: &Vec3,
    u_a: &Vec3,
    near: Option<(f64, f64)>,
) -> Option<Response> {
    if sags(kind, mass_per_length, gravity) {
        return sagging(kind, mass_per_length, chord, gravity, u_a, near);
    }
    let l = chord.norm();
    if !(l > 0.0 && l.is_finite()) {
        return None;
    }
    let e = chord / l;
    let s = kind.state(l);
    let (elastic, geometric) = kind.tangent_blocks(&e, l);
    // A cable whose weight is too small to sag it (below `WEIGHT_FLOOR` of EA) still weighs:
    // half at each end, so that every cable's weight reaches the supports the same way.
    let weight = match *kind {
        MemberKind::Cable { l0, .. } if mass_per_length > 0.0 => -gravity * (mass_per_length * l0),
        _ => Vec3::zeros(),
    };
    Some(Response {
        end_a: -e * s.force + weight * 0.5,
        end_b: e * s.force + weight * 0.5,
        energy: s.energy + weight.dot(&(u_a + chord * 0.5)),
        elastic,
        geometric,
        force: s.force,
        slack: s.slack,
        sag: None,
    })
}

/// Vertical plane of a chord: (horizontal unit towards b, up unit, horizontal span, rise).
fn plane(chord: &Vec3, up: &Vec3) -> (Vec3, f64, f64) {
    let lz = chord.dot(up);
    let h = chord - up * lz;
    let lx = h.norm();
    let horizontal = if lx > 1e-300 {
        h / lx
    } else {
        // A vertical chord: any horizontal direction will do.
        let trial = if up.x.abs() < 0.9 { Vec3::x() } else { Vec3::y() };
        (trial - up * trial.dot(up)).normalize()
    };
    (horizontal, lx, lz)
}

fn sagging(
    kind: &MemberKind,
    mass_per_length: f64,
    chord: &Vec3,
    gravity: &Vec3,
    u_a: &Vec3,
    near: Option<(f64, f64)>,
) -> Option<Response> {
    let MemberKind::Cable { ea, l0 } = *kind else { return None };
    let g = gravity.norm();
    let up = -gravity / g;
    let cable = Catenary {
        ea,
        l0,
        q: mass_per_length * g,
    };
    let (horizontal, lx, lz) = plane(chord, &up);
    let hang = cable.hang_near(lx, lz, near).ok()?;
    let (h, v) = (hang.h, hang.v);
    let vb = v + cable.q * l0;
    let end_b = horizontal * h + up * vb;
    let end_a = -horizontal * h - up * v;
    let kin = hang.flexibility.try_inverse()?;
    let across = up.cross(&horizontal);
    let span = hang.span.0;
    let total = if lx <= 1e-9 * chord.norm() {
        // A vertical chord (within round-off): the same across every horizontal direction,
        // `1/∫(1/T + 1/EA) ds`, the limit of `H/l_x`; zero where the tension vanishes along the
        // cable (a free lower end, or a loop hanging below both ends), where the force across
        // grows only as `δ/ln(1/δ)` and the tangent's exact value is nil (tension below a
        // millionth of the weight counts as vanished: an equilibrium's residual leaves that).
        let tension_free = v <= 1e-6 * cable.q * l0 && vb >= -1e-6 * cable.q * l0;
        let lateral = if tension_free { 0.0 } else { h / span };
        up * up.transpose() * kin[(1, 1)] + (Matrix3::identity() - up * up.transpose()) * lateral
    } else {
        horizontal * horizontal.transpose() * kin[(0, 0)]
            + (horizontal * up.transpose() + up * horizontal.transpose()) * kin[(0, 1)]
            + up * up.transpose() * kin[(1, 1)]
            + across * across.transpose() * (h / span)
    };
    let l = chord.norm();
    let geometric = if l > 0.0 {
        let e = chord / l;
        (Matrix3::identity() - e * e.transpose()) * (end_b.dot(&e) / l)
    } else {
        Matrix3::zeros()
    };
    let energy = cable.energy(&hang) + cable.q * l0 * up.dot(u_a);
    Some(Response {
        end_a,
        end_b,
        energy,
        elastic: total - geometric,
        geometric,
        force: h.hypot(v).max(h.hypot(vb)),
        slack: false,
        sag: Some(Sag {
            cable,
            hang,
            horizontal,
            up,
        }),
    })
}

/// Rate of change of the internal end forces `(end_a, end_b)` with the load factor, for a
/// member whose weight grows with it: `gravity_case` is the load case's full gravitational
/// acceleration, `lambda` the load factor. Zero for members whose laws do not depend on the
/// load (their weight, if any, is lumped at the nodes and part of the nodal load).
pub fn load_rate(kind: &MemberKind, mass_per_length: f64, chord: &Vec3, gravity_case: &Vec3, lambda: f64) -> (Vec3, Vec3) {
    let MemberKind::Cable { l0, .. } = *kind else {
        return (Vec3::zeros(), Vec3::zeros());
    };
    let g_case = gravity_case.norm();
    if !(mass_per_length > 0.0 && g_case > 0.0) {
        return (Vec3::zeros(), Vec3::zeros());
    }
    let up = -gravity_case / g_case;
    let q_case = mass_per_length * g_case;
    let gravity = gravity_case * lambda;
    let Some(Response { sag: Some(sag), .. }) = (sags(kind, mass_per_length, &gravity))
        .then(|| respond(kind, mass_per_length, chord, &gravity, &Vec3::zeros()))
        .flatten()
    else {
        // Straight (no load yet): its weight reaches the ends half each.
        let half = up * (0.5 * q_case * l0);
        return (half, half);
    };
    let d = sag.cable.weight_rate(&sag.hang) * q_case;
    let end_b = sag.horizontal * d.x + up * (d.y + q_case * l0);
    let end_a = -sag.horizontal * d.x - up * d.y;
    (end_a, end_b)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn fd_tangent(kind: &MemberKind, m: f64, chord: Vec3, g: Vec3) -> Matrix3<f64> {
        let mut k = Matrix3::zeros();
        let h = 1e-6 * chord.norm();
        for j in 0..3 {
            let mut p = chord;
            let mut q = chord;
            p[j] += h;
            q[j] -= h;
            let fp = respond(kind, m, &p, &g, &Vec3::zeros()).unwrap().end_b;
            let fm = respond(kind, m, &q, &g, &Vec3::zeros()).unwrap().end_b;
            let col = (fp - fm) / (2.0 * h);
            for i in 0..3 {
                k[(i, j)] = col[i];
            }
        }
        k
    }

    /// The sagging cable's tangent equals central differences of its end force, from taut to
    /// deep sag, inclined both ways, in 3D and for a near-vertical chord (common practice for a
    /// consistent linearisation); it is symmetric.
    #[test]
    fn sagging_tangent_matches_central_differences() {
        let g = Vec3::new(0.0, -9.81, 0.0);
        let kind = MemberKind::Cable { ea: 2e6, l0: 10.0 };
        for chord in [
            Vec3::new(9.99, 0.0, 0.0),
            Vec3::new(9.0, 2.0, 1.0),
            Vec3::new(-3.0, -5.0, 2.0),
            Vec3::new(2.0, 7.0, -1.0),
            Vec3::new(1.0, -2.0, 0.5),
            Vec3::new(0.001, 9.0, 0.002),
            Vec3::new(10.02, 0.3, 0.1),
        ] {
            let r = respond(&kind, 1.5, &chord, &g, &Vec3::zeros()).unwrap();
            let k = r.elastic + r.geometric;
            let fd = fd_tangent(&kind, 1.5, chord, g);
            let scale = k.abs().max();
            assert!((k - fd).abs().max() < 1e-6 * scale, "{chord:?}: {k} vs {fd}");
            assert!((k - k.transpose()).abs().max() < 1e-9 * scale, "{chord:?} not symmetric");
            // The ends carry the whole weight: end_a + end_b = q L0 up.
            let w = r.end_a + r.end_b;
            assert!(
                (w - Vec3::new(0.0, 1.5 * 9.81 * 10.0, 0.0)).norm() < 1e-9 * r.force.max(1.0),
                "{w:?}"
            );
        }
    }

    /// The load rate equals a central difference of the end forces in the load factor.
    #[test]
    fn load_rate_matches_central_differences() {
        let g = Vec3::new(0.0, -9.81, 0.0);
        let kind = MemberKind::Cable { ea: 2e6, l0: 10.0 };
        for chord in [Vec3::new(9.99, 0.0, 0.0), Vec3::new(6.0, 3.0, 1.0), Vec3::new(1.0, -4.0, 0.0)] {
            let (ra, rb) = load_rate(&kind, 1.5, &chord, &g, 0.7);
            let f = |l: f64| respond(&kind, 1.5, &chord, &(g * l), &Vec3::zeros()).unwrap();
            let d = 1e-6;
            let (p, m) = (f(0.7 + d), f(0.7 - d));
            let fa = (p.end_a - m.end_a) / (2.0 * d);
            let fb = (p.end_b - m.end_b) / (2.0 * d);
            assert!(
                (fa - ra).norm() < 1e-5 * fa.norm().max(1.0) && (fb - rb).norm() < 1e-5 * fb.norm().max(1.0),
                "{chord:?}: {fa:?} {fb:?} vs {ra:?} {rb:?}"
            );
        }
    }

    /// Nearly taut, the sagging cable agrees with the straight one to the order of its weight
    /// (its end forces differ by half the weight at each end and by the sag's effect).
    #[test]
    fn a_nearly_taut_heavy_cable_agrees_with_the_straight_cable() {
        let kind = MemberKind::Cable { ea: 1e8, l0: 10.0 };
        let chord = Vec3::new(10.01, 0.0, 0.0);
        let straight = respond(&kind, 0.0, &chord, &Vec3::zeros(), &Vec3::zeros()).unwrap();
        let m = 1e-6;
        let g = Vec3::new(0.0, -9.81, 0.0);
        let sag = respond(&kind, m, &chord, &g, &Vec3::zeros()).unwrap();
        let w = m * 9.81 * 10.0;
        assert!(
            (sag.end_b.x - straight.end_b.x).abs() < 1e-9 * straight.force,
            "{} vs {}",
            sag.end_b.x,
            straight.end_b.x
        );
        assert!((sag.end_b.y - 0.5 * w).abs() < 1e-9 * straight.force);
    }
}
