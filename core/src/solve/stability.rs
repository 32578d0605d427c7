//! The one stability verdict: is the tangent stiffness positive definite, singular to working
//! precision (neutral), or indefinite?
//!
//! A plain Cholesky factorisation that happens to succeed proves nothing about a zero mode:
//! round-off leaves a zero eigenvalue slightly positive as often as slightly negative. The
//! verdict is therefore scale-aware. With `‖K‖` the largest entry of the tangent and
//! `τ = NEUTRAL_TOLERANCE · ‖K‖`:
//!
//! * `K − τI` has a Cholesky factor ⇒ every eigenvalue exceeds `τ`: **stable**;
//! * else `K + τI` has one ⇒ the lowest eigenvalue lies within `±τ`: **neutral** (a mechanism);
//! * else an eigenvalue is below `−τ`: **unstable**.
//!
//! A Cholesky factorisation of a symmetric matrix is backward stable: the computed factor
//! belongs to `K + E` with `|E| ≤ γ_k |L||Lᵀ|`, `γ_k ≈ k ε` for columns of `k` entries
//! (Higham, *Accuracy and Stability of Numerical Algorithms*, 2nd ed., §10.1), and the member
//! blocks are assembled with errors of a few `ε` of their entries. For the node-block
//! patterns of rigs (a few to a few hundred entries per column of the factor) the lowest
//! eigenvalue is therefore resolved to about `10⁻¹⁵…10⁻¹⁴ ‖K‖`. With `τ = 10⁻¹³ ‖K‖` (about
//! 450 ε) a zero mode is never called stable, while a genuinely soft but stable rig — a
//! 1,700-bead string whose lowest stiffness is 3·10⁻¹² of its largest, with frequencies that
//! match Lagrange's formula to 10⁻⁷ — still is. A rig whose stiffness contrast exceeds what
//! double precision resolves is reported neutral rather than given a wrong number. Solve, the
//! condensed stiffness, the modes, Pluck, the checks, the Sheet
//! and the app all use this verdict. A cable whose tension is zero to the solver's resolution
//! counts as slack in it: it resists being stretched, not being slackened.

use super::factor::Factor;
use super::system::System;

/// Relative size of the lowest tangent eigenvalue below which a state counts as neutral.
pub const NEUTRAL_TOLERANCE: f64 = 1e-13;

/// The three verdicts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Definiteness {
    /// Every eigenvalue of the tangent above `τ`.
    Positive,
    /// The lowest eigenvalue within `±τ`: singular to working precision.
    Semi,
    /// An eigenvalue below `−τ`.
    Indefinite,
}

/// The verdict on the tangent stiffness `values` of `sys`, and the Cholesky factor of
/// `K − τI` when it is [`Definiteness::Positive`].
pub fn verdict(sys: &System, values: &[f64]) -> (Definiteness, Option<Factor>) {
    if sys.size() == 0 {
        return (Definiteness::Positive, None);
    }
    let norm = sys.max_entry(values);
    if norm <= 1e-250 {
        // Nothing is stiff at all (for example one slack, unstressed cable).
        return (Definiteness::Semi, None);
    }
    let tau = NEUTRAL_TOLERANCE * norm;
    if let Some(f) = sys.factor(values, -tau) {
        return (Definiteness::Positive, Some(f));
    }
    if sys.factor(values, tau).is_some() {
        (Definiteness::Semi, None)
    } else {
        (Definiteness::Indefinite, None)
    }
}

/// The verdict on the equilibrium at displacements `disp` of `model` under gravitational
/// acceleration `gravity` (for sagging cables): [`verdict`] on the
/// tangent with cables at zero tension counted slack ([`System::assemble_for_verdict`]).
pub fn verdict_at(
    sys: &System,
    model: &crate::model::Model,
    disp: &[crate::model::Vec3],
    gravity: &crate::model::Vec3,
) -> (Definiteness, Option<Factor>) {
    verdict(sys, &sys.assemble_verdict_tangent(model, disp, gravity))
}

fn norm(v: &[f64]) -> f64 {
    v.iter().map(|x| x * x).sum::<f64>().sqrt()
}

fn dot(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

/// Deterministic start vector with every component non-zero.
fn start(n: usize) -> Vec<f64> {
    (0..n).map(|i| 1.0 + ((i * 7919) % 13) as f64 * 0.01).collect()
}

/// Lowest eigenpair of the stored symmetric matrix by shifted inverse iteration.
///
/// The shift `σ` is the smallest of 0, 1e-9·d, 1e-8·d, … (d the largest entry) at which
/// `K + σI` factorises, so `(K + σI)⁻¹` is positive definite and its dominant eigenvector
/// is the lowest mode of `K`. Returns the Rayleigh quotient and the unit vector.
pub fn lowest_mode(sys: &System, values: &[f64]) -> (f64, Vec<f64>) {
    let n = sys.size();
    let dmax = sys.max_entry(values);
    if dmax <= 1e-250 {
        // Nothing is stiff at all: every free direction is a zero mode; report the first.
        let mut v = vec![0.0; n];
        if let Some(first) = v.first_mut() {
            *first = 1.0;
        }
        return (0.0, v);
    }
    let mut shift = 0.0;
    let factor: Factor = loop {
        if let Some(f) = sys.factor(values, shift) {
            break f;
        }
        shift = if shift == 0.0 { 1e-9 * dmax } else { shift * 10.0 };
        if shift > 1e6 * dmax {
            return (f64::NAN, vec![0.0; n]);
        }
    };
    inverse_iteration(sys, values, &factor, dmax)
}

/// The eigenpair of the stored symmetric matrix nearest zero (signed), by inverse iteration
/// with an `LDLᵀ` factor of `K` itself; `None` when `K` has an exactly zero pivot.
pub fn nearest_zero_mode(sys: &System, values: &[f64]) -> Option<(f64, Vec<f64>)> {
    let dmax = sys.max_entry(values);
    let factor = sys.factor_indefinite(values, 0.0)?;
    Some(inverse_iteration(sys, values, &factor, dmax))
}

fn inverse_iteration(sys: &System, values: &[f64], factor: &Factor, scale: f64) -> (f64, Vec<f64>) {
    let n = sys.size();
    let mut v = start(n);
    let mut rq = f64::NAN;
    for _ in 0..200 {
        let nv = norm(&v);
        if !(nv > 0.0 && nv.is_finite()) {
            break;
        }
        v.iter_mut().for_each(|x| *x /= nv);
        let kv = sys.mul(values, &v);
        let new_rq = dot(&v, &kv);
        // Residual of the eigenpair: converged when ‖K v − ρ v‖ is at round-off of ‖K‖ or
        // the quotient has settled.
        let res = norm(&kv.iter().zip(&v).map(|(k, x)| k - new_rq * x).collect::<Vec<_>>());
        let settled = (new_rq - rq).abs() <= 1e-13 * scale;
        rq = new_rq;
        if res <= 1e-10 * scale || settled {
            break;
        }
        factor.solve_in_place(&mut v);
    }
    let nv = norm(&v);
    if nv > 0.0 && nv.is_finite() {
        v.iter_mut().for_each(|x| *x /= nv);
    }
    (rq, v)
}
