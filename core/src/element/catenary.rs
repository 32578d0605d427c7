//! The elastic catenary: an extensible cable hanging under its own uniform weight between two
//! end points, solved exactly.
//!
//! Formulation of Irvine, *Cable Structures* (MIT Press 1981), ch. 1 (from memory; shared
//! REFERENCES §2), in the element form used by the catenary elements of Jayaraman & Knudson
//! (*Computers & Structures* 14, 1981) and Thai & Kim (*J. Constr. Steel Res.* 2011): with
//! unstressed arc length `s ∈ [0, L0]` from end a, weight `q` per unstressed length acting
//! down, axial stiffness `EA`, and the force the cable exerts on end a written `(H, V)` in the
//! vertical plane through the chord (`x` horizontal from a towards b, `z` up), the tension at
//! `s` is `(H, V + q s)`, of size `T(s)`, and the span it covers is
//!
//! ```text
//! l_x = H L0/EA + (H/q) [asinh(V_b/H) − asinh(V/H)]
//! l_z = (V_b² − V²)/(2 q EA) + (T_b − T_a)/q,        V_b = V + q L0.
//! ```
//!
//! Given the chord `(l_x, l_z)` these two equations fix `H` and `V` (Newton's method on the
//! flexibility `F = ∂(l_x, l_z)/∂(H, V)`, which is symmetric and given in closed form below).
//! The end forces follow, and the in-plane stiffness of end b against end a is `F⁻¹`; turning
//! the vertical plane about the vertical through a adds `H/l_x` across it. The curve, the sag,
//! the end angles and the energy (strain plus the potential of the cable's own weight) are all
//! closed-form integrals of the same expressions.

use nalgebra::{Matrix2, Vector2};

/// A catenary's data: what it is made of and what it spans (SI units).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Catenary {
    /// Axial stiffness EA (N).
    pub ea: f64,
    /// Unstressed length L0 (m).
    pub l0: f64,
    /// Weight per unstressed length q (N/m), > 0.
    pub q: f64,
}

/// The solved cable for one chord.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Hanging {
    /// Horizontal span `l_x` ≥ 0 and rise `l_z` of end b over end a (m).
    pub span: (f64, f64),
    /// Horizontal tension H (N), > 0.
    pub h: f64,
    /// Vertical component of the force the cable exerts on end a (N), up positive; the cable
    /// exerts `−(H, V + q L0)` on end b.
    pub v: f64,
    /// Flexibility `∂(l_x, l_z)/∂(H, V)` (m/N).
    pub flexibility: Matrix2<f64>,
}

/// Why a chord has no catenary solution (never for a valid cable; reported, not hidden).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NoSolution;

impl Catenary {
    /// Span covered by the cable for end force `(h, v)` at a, and its flexibility.
    pub fn span_of(&self, h: f64, v: f64) -> (Vector2<f64>, Matrix2<f64>) {
        let Catenary { ea, l0, q } = *self;
        let vb = v + q * l0;
        let (ta, tb) = (hyp(h, v), hyp(h, vb));
        let asinh_diff = asinh_difference(vb, v, h, q * l0);
        let lx = h * l0 / ea + h / q * asinh_diff;
        // (T_b − T_a)/q without cancellation: (V_b² − V²)/(q (T_a + T_b)) = L0 (V + V_b)/(T_a + T_b).
        // (V_b² − V²)/(2 q EA) = L0 (V + V_b)/(2 EA), without cancellation.
        let lz = l0 * (v + vb) / (2.0 * ea) + l0 * (v + vb) / (ta + tb);
        let dx_dh = l0 / ea + asinh_diff / q + (v / ta - vb / tb) / q;
        let dx_dv = h / q * (1.0 / tb - 1.0 / ta);
        let dz_dv = l0 / ea + (vb / tb - v / ta) / q;
        let f = Matrix2::new(dx_dh, dx_dv, dx_dv, dz_dv);
        (Vector2::new(lx, lz), f)
    }

    /// Solves for the end forces that make the cable span `(lx, lz)` (m), `lx ≥ 0`.
    pub fn hang(&self, lx: f64, lz: f64) -> Result<Hanging, NoSolution> {
        self.hang_near(lx, lz, None)
    }

    /// [`hang`](Self::hang) starting Newton's method from `near`, the `(H, V)` of a nearby
    /// chord (a neighbouring configuration of the same cable), when given.
    pub fn hang_near(&self, lx: f64, lz: f64, near: Option<(f64, f64)>) -> Result<Hanging, NoSolution> {
        let Catenary { ea, l0, q } = *self;
        if !(ea > 0.0 && l0 > 0.0 && q > 0.0 && lx.is_finite() && lz.is_finite()) {
            return Err(NoSolution);
        }
        // A vertical chord has no horizontal direction: solve a hair off it (the stiffness
        // across it tends to a finite limit, and the forces to those of the vertical cable).
        let lx = lx.max(1e-10 * l0);
        let target = Vector2::new(lx, lz);
        let (mut h, mut v) = match near {
            Some((h, v)) if h > 0.0 && h.is_finite() && v.is_finite() => (h, v),
            _ => self.first_guess(lx, lz),
        };
        let scale = hyp(lx, lz).max(l0);
        let mut last = f64::INFINITY;
        let done = |h: f64, v: f64, f: Matrix2<f64>| {
            Ok(Hanging {
                span: (lx, lz),
                h,
                v,
                flexibility: f,
            })
        };
        // The span and flexibility at the current (H, V), carried from the accepted trial.
        let (mut at, mut f) = self.span_of(h, v);
        for _ in 0..200 {
            let miss = at - target;
            let err = miss.norm();
            if err <= 1e-14 * scale {
                return done(h, v, f);
            }
            let Some(inv) = f.try_inverse() else { return Err(NoSolution) };
            let step = inv * miss;
            // Damped: keep H positive and the miss falling.
            let mut alpha = 1.0;
            let mut accepted = false;
            for _ in 0..60 {
                let (hn, vn) = (h - alpha * step.x, v - alpha * step.y);
                if hn > 0.0 && hn.is_finite() && vn.is_finite() {
                    let (a2, f2) = self.span_of(hn, vn);
                    let e2 = (a2 - target).norm();
                    if e2 < err || e2 <= 1e-14 * scale {
                        (h, v, at, f) = (hn, vn, a2, f2);
                        accepted = true;
                        break;
                    }
                }
                alpha *= 0.5;
            }
            if !accepted {
                // At round-off: the best that can be had.
                if err <= 1e-11 * scale {
                    return done(h, v, f);
                }
                return Err(NoSolution);
            }
            if err >= last && err <= 1e-11 * scale {
                return done(h, v, f);
            }
            last = err;
        }
        Err(NoSolution)
    }

    /// A starting point for Newton: the straight elastic cable when the chord is longer than
    /// the cable, else the inextensible parabola-like estimate of Peyrot & Goulois (1979,
    /// *J. Struct. Div. ASCE* 105; from memory), `λ = √(3((L0² − l_z²)/l_x² − 1))`,
    /// `H = q l_x/(2λ)`, `V = −(q/2)(L0 − l_z coth λ)`.
    fn first_guess(&self, lx: f64, lz: f64) -> (f64, f64) {
        let Catenary { ea, l0, q } = *self;
        let chord = hyp(lx, lz);
        let w = q * l0;
        if chord >= l0 {
            let t = (ea * (chord - l0) / l0).max(w);
            let h = (t * lx / chord).max(1e-6 * w);
            (h, t * lz / chord - 0.5 * w)
        } else {
            let ratio = ((l0 * l0 - lz * lz) / (lx * lx) - 1.0).max(1e-6);
            let lambda = (3.0 * ratio).sqrt().min(50.0);
            let h = (q * lx / (2.0 * lambda)).max(1e-12 * w);
            (h, -0.5 * q * (l0 - lz / lambda.tanh()))
        }
    }

    /// Tension at unstressed arc length `s` (N).
    pub fn tension_at(&self, hang: &Hanging, s: f64) -> f64 {
        hyp(hang.h, hang.v + self.q * s)
    }

    /// Position `(x, z)` of the point at unstressed arc length `s` relative to end a (m).
    pub fn point_at(&self, hang: &Hanging, s: f64) -> (f64, f64) {
        let Catenary { ea, q, .. } = *self;
        let (h, v) = (hang.h, hang.v);
        let vs = v + q * s;
        let x = h * s / ea + h / q * asinh_difference(vs, v, h, q * s);
        let (ta, ts) = (hyp(h, v), hyp(h, vs));
        let z = s * (v + vs) / (2.0 * ea) + if ta + ts > 0.0 { s * (v + vs) / (ta + ts) } else { 0.0 };
        (x, z)
    }

    /// Strain energy plus the potential of the cable's weight above end a (J):
    /// `∫ T²/(2EA) ds + q ∫ z(s) ds`.
    pub fn energy(&self, hang: &Hanging) -> f64 {
        let Catenary { ea, l0, q } = *self;
        let (h, v) = (hang.h, hang.v);
        let vb = v + q * l0;
        let strain = (h * h * l0 + (vb.powi(3) - v.powi(3)) / (3.0 * q)) / (2.0 * ea);
        // ∫ z ds with z(s) = (V(s)² − V²)/(2qEA) + (T(s) − T_a)/q.
        let int_v2 = (vb.powi(3) - v.powi(3)) / (3.0 * q);
        let ta = hyp(h, v);
        let int_t = (primitive_t(vb, h) - primitive_t(v, h)) / q;
        let int_z = (int_v2 - v * v * l0) / (2.0 * q * ea) + (int_t - ta * l0) / q;
        strain + q * int_z
    }

    /// Stretched length `∫ (1 + T/EA) ds` (m).
    pub fn stretched_length(&self, hang: &Hanging) -> f64 {
        let Catenary { ea, l0, q } = *self;
        l0 + (primitive_t(hang.v + q * l0, hang.h) - primitive_t(hang.v, hang.h)) / (q * ea)
    }

    /// Largest distance of the cable from its chord (m), and the unstressed arc length where
    /// it is: the point whose tangent is parallel to the chord, `V(s)/H = l_z/l_x`.
    pub fn sag(&self, hang: &Hanging) -> (f64, f64) {
        let (lx, lz) = hang.span;
        let chord = hyp(lx, lz);
        if chord <= 0.0 {
            return (0.0, 0.0);
        }
        let s = ((hang.h * lz / lx - hang.v) / self.q).clamp(0.0, self.l0);
        let (x, z) = self.point_at(hang, s);
        // Distance from the chord line through (0, 0) and (lx, lz).
        ((x * lz - z * lx).abs() / chord, s)
    }

    /// Vertical distance of the cable below its chord at mid-span, half-way across the
    /// horizontal span (m).
    pub fn mid_span_sag(&self, hang: &Hanging) -> f64 {
        let (lx, lz) = hang.span;
        let (ea, h) = (self.ea, hang.h);
        // x(s) rises monotonically (H > 0), dx/ds = H (1/EA + 1/T(s)): Newton's method for
        // x(s) = lx/2, kept inside a shrinking bracket (bisection where a step leaves it).
        let (mut lo, mut hi) = (0.0, self.l0);
        let mut s = 0.5 * self.l0;
        for _ in 0..100 {
            let x = self.point_at(hang, s).0 - 0.5 * lx;
            if x.abs() <= 1e-15 * lx.max(1e-300) || hi - lo <= 1e-15 * self.l0 {
                break;
            }
            if x < 0.0 {
                lo = s
            } else {
                hi = s
            }
            let slope = h * (1.0 / ea + 1.0 / self.tension_at(hang, s));
            let next = s - x / slope;
            s = if next > lo && next < hi { next } else { 0.5 * (lo + hi) };
        }
        let (_, z) = self.point_at(hang, s);
        0.5 * lz - z
    }

    /// Rate of change of `(H, V)` with the weight `q` at a fixed chord: `−F⁻¹ ∂(l_x, l_z)/∂q`.
    pub fn weight_rate(&self, hang: &Hanging) -> Vector2<f64> {
        let Catenary { ea, l0, q } = *self;
        let (h, v) = (hang.h, hang.v);
        let vb = v + q * l0;
        let (ta, tb) = (hyp(h, v), hyp(h, vb));
        let asinh_diff = asinh_difference(vb, v, h, q * l0);
        let dx = -h / (q * q) * asinh_diff + h / q * l0 / tb;
        let dz = -(vb * vb - v * v) / (2.0 * q * q * ea) + vb * l0 / (q * ea) - (tb - ta) / (q * q) + vb * l0 / (q * tb);
        match hang.flexibility.try_inverse() {
            Some(inv) => -(inv * Vector2::new(dx, dz)),
            None => Vector2::zeros(),
        }
    }
}

/// Which tension a pretension given "in the drawn geometry" means for a sagging cable.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum GivenTension {
    /// The largest tension, at the upper end (what the upper fitting carries) (N).
    UpperEnd(f64),
    /// The horizontal component, the same all along the span (N).
    Horizontal(f64),
}

/// The unstressed length of a cable of axial stiffness `ea` (N) and weight `q` (N/m) that
/// spans `(lx, lz)` (m) with the tension `given`, on the taut side (the shortest cable that
/// does it). `Err` with the least tension the cable can have there, when `given` is below it.
pub fn rest_length_for(ea: f64, q: f64, lx: f64, lz: f64, given: GivenTension) -> Result<f64, f64> {
    let chord = hyp(lx, lz);
    let measure = |l0: f64| -> Option<f64> {
        let c = Catenary { ea, l0, q };
        let hang = c.hang(lx, lz).ok()?;
        Some(match given {
            GivenTension::UpperEnd(_) => hyp(hang.h, hang.v).max(hyp(hang.h, hang.v + q * l0)),
            GivenTension::Horizontal(_) => hang.h,
        })
    };
    let target = match given {
        GivenTension::UpperEnd(t) | GivenTension::Horizontal(t) => t,
    };
    // Tension falls as the cable lengthens, until its own weight makes it rise again (for the
    // upper-end tension): march out from the straight estimate to bracket the target.
    let straight = chord / (1.0 + target.max(0.0) / ea);
    let mut lo = straight * 0.5;
    while measure(lo).is_some_and(|t| t < target) && lo > 1e-9 * chord {
        lo *= 0.5;
    }
    let mut hi = straight;
    let mut least = f64::INFINITY;
    let mut previous = f64::INFINITY;
    let mut before = lo;
    let mut step = 1e-4 * chord.max(1e-9);
    loop {
        let Some(t) = measure(hi) else { return Err(least) };
        least = least.min(t);
        if t <= target {
            break;
        }
        if t > previous || hi > 1e3 * chord + 1.0 {
            // Past the least tension: it lies between `before` and `hi`. Find it by golden
            // section; the target is reachable only if it is at least that low.
            let (mut a, mut b) = (before, hi);
            let r = 0.5 * (5f64.sqrt() - 1.0);
            for _ in 0..200 {
                let (c, d) = (b - r * (b - a), a + r * (b - a));
                match (measure(c), measure(d)) {
                    (Some(tc), Some(td)) if tc < td => b = d,
                    (Some(_), Some(_)) => a = c,
                    _ => break,
                }
                if b - a <= 1e-13 * b {
                    break;
                }
            }
            let at = 0.5 * (a + b);
            match measure(at) {
                Some(t) if t <= target => {
                    hi = at;
                    break;
                }
                Some(t) => return Err(least.min(t)),
                None => return Err(least),
            }
        }
        previous = t;
        before = lo;
        lo = hi;
        hi += step;
        step *= 2.0;
    }
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        match measure(mid) {
            Some(t) if t > target => lo = mid,
            Some(_) => hi = mid,
            None => return Err(least),
        }
        if hi - lo <= 1e-15 * hi {
            break;
        }
    }
    Ok(0.5 * (lo + hi))
}

/// `√(a² + b²)` without the cost of a correctly rounded `hypot` (within about an ulp of it);
/// `hypot` itself where the squares would overflow or underflow.
#[inline]
fn hyp(a: f64, b: f64) -> f64 {
    let s = (a * a + b * b).sqrt();
    if s.is_finite() && s > 1e-150 { s } else { a.hypot(b) }
}

/// `asinh` through `ln_1p` of an exact rearrangement, `asinh|x| = ln_1p(|x| + x²/(1 + √(1 + x²)))`
/// (accurate for small and large arguments; the standard `asinh` where `x²` would overflow).
trait AsinhFast {
    fn asinh_fast(self) -> f64;
}

impl AsinhFast for f64 {
    #[inline]
    fn asinh_fast(self) -> f64 {
        let a = self.abs();
        if a > 1e150 || !a.is_finite() {
            return self.asinh();
        }
        let a2 = a * a;
        (a + a2 / (1.0 + (1.0 + a2).sqrt())).ln_1p().copysign(self)
    }
}

/// `asinh(a/h) − asinh(b/h)` for `h > 0`, without the cancellation of two large values of the
/// same sign; `diff = a − b` as the caller knows it exactly (the weight `q s` of the stretch
/// between the two points), not as the difference of two nearly equal numbers.
fn asinh_difference(a: f64, b: f64, h: f64, diff: f64) -> f64 {
    if a.signum() == b.signum() && a != 0.0 {
        // asinh(x) − asinh(y) = asinh(x √(1+y²) − y √(1+x²)), exact for the same sign.
        let (x, y) = (a / h, b / h);
        let (sx, sy) = (hyp(x, 1.0), hyp(y, 1.0));
        // x sy − y sx = (x² sy² − y² sx²)/(x sy + y sx) = (x² − y²)/(x sy + y sx).
        let d = (diff / h) * (x + y) / (x * sy + y * sx);
        d.asinh_fast()
    } else {
        (a / h).asinh_fast() - (b / h).asinh_fast()
    }
}

/// `∫ √(h² + v²) dv = ½ (v √(h² + v²) + h² asinh(v/h))`.
fn primitive_t(v: f64, h: f64) -> f64 {
    0.5 * (v * hyp(h, v) + h * h * (v / h).asinh_fast())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Shared REFERENCES §2 (calc from Irvine's equations): level supports 100 m apart,
    /// L0 = 101 m, w = 10 N/m, EA = 1e7 N → H = 2023.1664 N, V = 505 N (half the weight),
    /// mid-span sag 6.20867 m.
    #[test]
    fn level_span_matches_the_reference_values() {
        let c = Catenary {
            ea: 1e7,
            l0: 101.0,
            q: 10.0,
        };
        let hang = c.hang(100.0, 0.0).unwrap();
        assert!((hang.h - 2023.1664).abs() < 1e-3, "H = {}", hang.h);
        assert!((hang.v + 505.0).abs() < 1e-9, "V = {}", hang.v);
        let (_, z) = c.point_at(&hang, 50.5);
        assert!((z + 6.20867).abs() < 1e-5, "sag {z}");
    }

    /// The flexibility equals central differences of the span (common practice).
    #[test]
    fn flexibility_matches_central_differences() {
        for &(h, v, ea, l0, q) in &[
            (2000.0, -505.0, 1e7, 101.0, 10.0),
            (50.0, -20.0, 1e6, 10.0, 5.0),
            (1e5, 300.0, 2e8, 30.0, 20.0),
            (3.0, -400.0, 1e7, 100.0, 10.0),
            (800.0, 2000.0, 1e6, 50.0, 3.0),
        ] {
            let c = Catenary { ea, l0, q };
            let (_, f) = c.span_of(h, v);
            let dh = 1e-6 * h;
            let dv = 1e-6 * v.abs().max(h);
            let col_h = (c.span_of(h + dh, v).0 - c.span_of(h - dh, v).0) / (2.0 * dh);
            let col_v = (c.span_of(h, v + dv).0 - c.span_of(h, v - dv).0) / (2.0 * dv);
            let scale = f.abs().max();
            for (fd, an) in [
                (col_h.x, f[(0, 0)]),
                (col_h.y, f[(1, 0)]),
                (col_v.x, f[(0, 1)]),
                (col_v.y, f[(1, 1)]),
            ] {
                assert!((fd - an).abs() < 1e-6 * scale, "({h}, {v}): fd {fd} vs {an}");
            }
        }
    }

    /// Solving and re-evaluating gives the chord back, taut to deep sag, rising and falling.
    #[test]
    fn hang_reproduces_the_chord_from_taut_to_deep_sag() {
        let c = Catenary {
            ea: 1e6,
            l0: 10.0,
            q: 20.0,
        };
        for &(lx, lz) in &[
            (9.999, 0.0),
            (10.05, 0.0),
            (6.0, 3.0),
            (1.0, -2.0),
            (0.5, 9.9),
            (3.0, -8.0),
            (0.0, 5.0),
            (0.0, 10.001),
            (8.0, 5.9),
        ] {
            let hang = c.hang(lx, lz).unwrap_or_else(|_| panic!("({lx}, {lz})"));
            let (at, _) = c.span_of(hang.h, hang.v);
            assert!(
                (at.x - lx.max(1e-9)).abs() < 1e-9 && (at.y - lz).abs() < 1e-9,
                "({lx}, {lz}): {at:?}"
            );
            assert!(hang.h > 0.0);
        }
    }

    /// The energy's derivatives are the end forces: `∂E/∂l_x = H` and `∂E/∂l_z = V_b` (with end
    /// a held), the envelope property of the cable's equilibrium shape (common practice).
    #[test]
    fn energy_derivatives_are_the_end_forces() {
        let c = Catenary {
            ea: 1e6,
            l0: 10.0,
            q: 20.0,
        };
        for &(lx, lz) in &[(9.0, 1.0), (6.0, -3.0), (9.99, 0.5)] {
            let e = |x: f64, z: f64| c.energy(&c.hang(x, z).unwrap());
            let hang = c.hang(lx, lz).unwrap();
            let d = 1e-6;
            let ex = (e(lx + d, lz) - e(lx - d, lz)) / (2.0 * d);
            let ez = (e(lx, lz + d) - e(lx, lz - d)) / (2.0 * d);
            let vb = hang.v + c.q * c.l0;
            assert!((ex - hang.h).abs() < 1e-5 * hang.h.max(vb.abs()), "H {} vs {ex}", hang.h);
            assert!((ez - vb).abs() < 1e-5 * hang.h.max(vb.abs()), "V_b {vb} vs {ez}");
        }
    }

    /// A pretension given at the upper end or as the horizontal component gives a cable with
    /// that tension back (closed form of the same equations, round trip).
    #[test]
    fn rest_length_for_a_given_tension_round_trips() {
        let (ea, q) = (1e6, 20.0);
        for &(lx, lz, t) in &[(10.0, 0.0, 5000.0), (8.0, 4.0, 800.0), (5.0, -6.0, 2000.0), (10.0, 0.0, 160.0)] {
            for given in [GivenTension::UpperEnd(t), GivenTension::Horizontal(t)] {
                let l0 = rest_length_for(ea, q, lx, lz, given).unwrap_or_else(|least| panic!("{given:?}: least {least}"));
                let c = Catenary { ea, l0, q };
                let hg = c.hang(lx, lz).unwrap();
                let got = match given {
                    GivenTension::UpperEnd(_) => hyp(hg.h, hg.v).max(hyp(hg.h, hg.v + q * l0)),
                    GivenTension::Horizontal(_) => hg.h,
                };
                assert!((got - t).abs() < 1e-9 * t, "{given:?} at ({lx}, {lz}): {got}");
            }
        }
        // Below the least upper-end tension the cable's weight allows: refused, with the least.
        // Closed form for an inextensible level catenary of span a and weight w per length:
        // T_end = H cosh(u), u = w a/(2H), least where u tanh u = 1 (u = 1.19968), so
        // T_min = 1.50888 · w a/2 (Irvine 1981, ch. 1; the minimum-tension span of transmission
        // line practice). Here w a/2 = 100 N and EA is stiff enough for the stretch to shift it
        // by about 1e-4.
        let u = {
            let mut u: f64 = 1.2;
            for _ in 0..50 {
                u -= (u * u.tanh() - 1.0) / (u.tanh() + u / u.cosh().powi(2));
            }
            u
        };
        let t_min = u.cosh() / u * 100.0;
        assert!((t_min - 150.888).abs() < 1e-3, "{t_min}");
        match rest_length_for(ea, q, 10.0, 0.0, GivenTension::UpperEnd(100.0)) {
            Err(least) => assert!((least - t_min).abs() < 1e-3 * t_min, "least {least} vs {t_min}"),
            Ok(l0) => panic!("accepted with L0 = {l0}"),
        }
    }

    /// Sag, mid-span sag and stretched length of the level reference span (shared REFERENCES
    /// §2, calc from Irvine's equations: mid-span sag 6.20867 m); the largest distance from a
    /// level chord is at mid-span; the stretched length exceeds L0 by the mean strain.
    #[test]
    fn sag_and_stretched_length_of_the_level_span() {
        let c = Catenary {
            ea: 1e7,
            l0: 101.0,
            q: 10.0,
        };
        let hang = c.hang(100.0, 0.0).unwrap();
        let (sag, s) = c.sag(&hang);
        assert!((sag - 6.20867).abs() < 1e-5 && (s - 50.5).abs() < 1e-6, "{sag} at {s}");
        assert!((c.mid_span_sag(&hang) - 6.20867).abs() < 1e-5);
        // Mean tension over the length, by Simpson's rule on T(s), gives the stretch.
        let n = 2000;
        let mut t_int = 0.0;
        for k in 0..=n {
            let w = if k == 0 || k == n {
                1.0
            } else if k % 2 == 1 {
                4.0
            } else {
                2.0
            };
            t_int += w * c.tension_at(&hang, 101.0 * k as f64 / n as f64);
        }
        t_int *= 101.0 / n as f64 / 3.0;
        assert!((c.stretched_length(&hang) - (101.0 + t_int / 1e7)).abs() < 1e-9);
    }

    /// The weight rate equals a central difference in `q`.
    #[test]
    fn weight_rate_matches_central_differences() {
        for &(lx, lz) in &[(9.0, 1.0), (6.0, -3.0), (9.999, 0.1)] {
            let rate = |q: f64| {
                let c = Catenary { ea: 1e6, l0: 10.0, q };
                let hg = c.hang(lx, lz).unwrap();
                Vector2::new(hg.h, hg.v)
            };
            let c = Catenary {
                ea: 1e6,
                l0: 10.0,
                q: 20.0,
            };
            let an = c.weight_rate(&c.hang(lx, lz).unwrap());
            let dq = 1e-5;
            let fd = (rate(20.0 + dq) - rate(20.0 - dq)) / (2.0 * dq);
            assert!((fd - an).norm() < 1e-5 * fd.norm().max(1.0), "({lx}, {lz}): fd {fd:?} vs {an:?}");
        }
    }
}
