//! Newton's method at a fixed load factor, globalised by a trust region.
//!
//! The equilibrium minimises the total potential `Π(u) = Σ U_m − λ fᵀu` over the free
//! displacements. Each iteration takes the Newton step `K_T p = −r` when `K_T` is positive
//! definite and the step lies inside the trust region; otherwise the step solves
//! `(K_T + μI) p = −r` with `μ > 0` chosen so that `‖p‖` meets the trust radius (the
//! Levenberg–Marquardt form of the trust-region subproblem, with Moré and Sorensen's update
//! of `μ`: Nocedal & Wright, *Numerical Optimization*, 2nd ed., §4.3). A step is kept when
//! the potential falls by at least a small fraction of what the quadratic model predicts,
//! and the radius grows or shrinks with that ratio (ibid., Algorithm 4.1). Near convergence
//! the change of `Π` drowns in round-off; a step is then kept when it reduces the residual
//! without raising `Π` beyond round-off.
//!
//! A *local* solve starts with an unbounded radius (plain Newton with a backtracking line
//! search, Nocedal & Wright §3.1), which is what load steps, drags and warm starts need; a
//! *strict* local solve refuses to pass through a tangent with a negative eigenvalue (the load
//! path would have crossed a limit point). A *global* solve starts with a radius of a tenth of
//! the rig's size and cannot stall at a zero pivot: it reaches an equilibrium from far away
//! (a chain drawn straight, a rig that is a mechanism until it is loaded).

use super::stability::{Definiteness, NEUTRAL_TOLERANCE, lowest_mode, verdict_at};
use super::statics::Statics;
use super::system::{Evaluation, Loading, Part};
use crate::model::Vec3;

/// How a Newton solve may move.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) enum Mode {
    /// Plain Newton with line search; `strict` fails on an indefinite tangent.
    Local { strict: bool },
    /// Trust region from a radius of a tenth of the rig's size. With `escape`, a saddle or
    /// maximum found is left along its direction of negative curvature (up to three times),
    /// so the solve ends at a minimum.
    Global { escape: bool },
}

/// A converged Newton solve.
pub(super) struct Converged {
    /// Relative residual reached.
    pub residual: f64,
    pub definiteness: Definiteness,
    /// Every step a full Newton step that reduced the residual: the state is the solution
    /// nearest the start (the iteration stayed in Newton's region of quadratic convergence).
    pub clean: bool,
    /// A saddle or maximum was left along negative curvature on the way (global solves with
    /// `escape` only).
    pub escaped: bool,
    /// The Cholesky factor of `K_T − τI` at the solution when it is stable (`τ` of the
    /// verdict): `K_T⁻¹` to within `τ` of its lowest eigenvalue, for load-path tangents.
    pub factor: Option<super::factor::Factor>,
}

/// How a Newton solve failed.
pub(super) enum NewtonFail {
    /// Met a tangent with a negative eigenvalue in a strict solve.
    Indefinite,
    /// Iteration cap or no further progress.
    Stalled { residual: f64 },
    /// A node ran away (mechanism).
    Runaway { node: usize, direction: Vec3 },
    /// The cancel flag was raised.
    Cancelled,
}

fn norm(v: &[f64]) -> f64 {
    v.iter().map(|x| x * x).sum::<f64>().sqrt()
}

fn dot(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

/// The change of potential from `a` to `b` is below round-off of the terms that make it up.
fn within_round_off(a: &Evaluation, b: &Evaluation) -> bool {
    (a.energy - b.energy).abs() <= 1e-11 * (a.energy_scale + b.energy_scale) + 1e-300
}

impl Statics<'_> {
    /// Newton's method at load factor `lambda`, updating the displacements `u` in place;
    /// at most `budget` iterations (and the solver's overall cap, counted in `total`).
    pub(super) fn newton(
        &self,
        u: &mut [Vec3],
        load: &Loading,
        lambda: f64,
        mode: Mode,
        budget: usize,
        total: &mut usize,
    ) -> Result<Converged, NewtonFail> {
        let model = self.model;
        let sys = &self.system;
        let s = &self.settings;
        let extent = model.extent();
        let limit = s.runaway_factor * extent;
        let mut eval = sys
            .evaluate(model, u, load, lambda)
            .ok_or(NewtonFail::Stalled { residual: f64::INFINITY })?;
        let mut radius = match mode {
            Mode::Local { .. } => f64::INFINITY,
            Mode::Global { .. } => 0.1 * extent,
        };
        let strict = matches!(mode, Mode::Local { strict: true });
        let mut mu_guess = 0.0;
        let mut clean = true;
        let mut escapes = 0;
        for it in 0..=budget {
            let rnorm = norm(&eval.residual);
            let rel = rnorm / eval.scale;
            if rel <= s.tolerance || sys.size() == 0 {
                let (definiteness, factor) = verdict_at(sys, model, u, &load.gravity_at(lambda));
                if let Mode::Global { escape: true } = mode
                    && definiteness != Definiteness::Positive
                    && escapes < 3
                    && let Some(e) = self.escape(
                        u,
                        load,
                        lambda,
                        &sys.assemble_for_verdict(
                            model,
                            u,
                            &load.gravity_at(lambda),
                            super::system::System::slack_floor(model, u, &load.gravity_at(lambda)),
                        ),
                        &eval,
                    )
                {
                    escapes += 1;
                    eval = e;
                    clean = false;
                    radius = 0.1 * extent;
                    continue;
                }
                return Ok(Converged {
                    residual: rel,
                    definiteness,
                    clean,
                    escaped: escapes > 0,
                    factor,
                });
            }
            if it == budget || *total >= s.max_iterations {
                return Err(NewtonFail::Stalled { residual: rel });
            }
            if self.cancelled() {
                return Err(NewtonFail::Cancelled);
            }
            *total += 1;
            let values = sys.assemble(model, u, &load.gravity_at(lambda), Part::Total);
            let (p, mu) = self.trust_step(&values, &eval.residual, radius, mu_guess, strict)?;
            mu_guess = 0.1 * mu;
            let plen = norm(&p);
            let kp = sys.mul(&values, &p);
            let rp = dot(&eval.residual, &p);
            let predicted = -(rp + 0.5 * dot(&p, &kp));
            let mut trial = u.to_vec();
            sys.add_scaled(&mut trial, &p, 1.0);
            let accept = |e: &Evaluation, alpha: f64, pred: f64| {
                let drop = eval.energy - e.energy;
                (pred > 0.0 && drop >= 1e-4 * pred)
                    || (norm(&e.residual) <= (1.0 - 1e-4 * alpha) * rnorm && (drop >= 0.0 || within_round_off(&eval, e)))
            };
            let mut taken: Option<(Vec<Vec3>, Evaluation)> = None;
            let full = sys.evaluate(model, &trial, load, lambda);
            if let Some(e) = full {
                let drop = eval.energy - e.energy;
                if accept(&e, 1.0, predicted) {
                    let rho = if predicted > 0.0 { drop / predicted } else { 1.0 };
                    if radius.is_finite() {
                        if rho > 0.75 && plen >= 0.9 * radius {
                            radius = (2.0 * radius).min(1e3 * extent);
                        } else if rho < 0.25 {
                            radius = 0.5 * plen;
                        }
                    }
                    if mu > 0.0 || norm(&e.residual) >= rnorm {
                        clean = false;
                    }
                    taken = Some((trial, e));
                }
            }
            if taken.is_none() {
                clean = false;
                if radius.is_infinite() {
                    // Backtrack along the Newton direction before shrinking to a trust region.
                    let mut alpha = 0.5;
                    while alpha >= 1.0 / 64.0 {
                        let mut t = u.to_vec();
                        sys.add_scaled(&mut t, &p, alpha);
                        if let Some(e) = sys.evaluate(model, &t, load, lambda)
                            && accept(&e, alpha, -alpha * rp - 0.5 * alpha * alpha * dot(&p, &kp))
                        {
                            taken = Some((t, e));
                            break;
                        }
                        alpha *= 0.5;
                    }
                    if taken.is_none() {
                        radius = 0.25 * plen;
                    }
                } else {
                    radius = 0.25 * plen.min(radius);
                }
            }
            match taken {
                Some((t, e)) => {
                    u.copy_from_slice(&t);
                    eval = e;
                }
                None => {
                    if radius <= 1e-15 * extent {
                        // No step reduces the residual: converged to round-off, or stuck.
                        if rel <= 1e-8 {
                            let (definiteness, factor) = verdict_at(sys, model, u, &load.gravity_at(lambda));
                            return Ok(Converged {
                                residual: rel,
                                definiteness,
                                clean: false,
                                escaped: escapes > 0,
                                factor,
                            });
                        }
                        return Err(NewtonFail::Stalled { residual: rel });
                    }
                }
            }
            // Runaway: a node far beyond the rig's own size.
            if let Some((node, d)) = u.iter().enumerate().max_by(|a, b| a.1.norm().total_cmp(&b.1.norm()))
                && d.norm() > limit
            {
                return Err(NewtonFail::Runaway { node, direction: *d });
            }
        }
        Err(NewtonFail::Stalled { residual: f64::INFINITY })
    }

    /// The step for residual `r` at tangent `values`: the Newton step when the tangent is
    /// positive definite and the step fits in `radius`, else the Levenberg–Marquardt step
    /// whose length meets the radius. Returns the step and the `μ` used.
    fn trust_step(&self, values: &[f64], r: &[f64], radius: f64, mu_guess: f64, strict: bool) -> Result<(Vec<f64>, f64), NewtonFail> {
        let sys = &self.system;
        let scale = sys.max_entry(values).max(self.rate_scale);
        let solve = |f: &super::factor::Factor| {
            let mut p: Vec<f64> = r.iter().map(|x| -x).collect();
            f.solve_in_place(&mut p);
            p
        };
        if let Some(f) = sys.factor(values, 0.0) {
            let p = solve(&f);
            if norm(&p) <= radius {
                return Ok((p, 0.0));
            }
        } else if strict && sys.factor(values, NEUTRAL_TOLERANCE * sys.max_entry(values)).is_none() {
            return Err(NewtonFail::Indefinite);
        }
        let mut mu = mu_guess.max(1e-8 * scale);
        let mut lo = 0.0f64;
        let mut best: Option<(Vec<f64>, f64)> = None;
        for _ in 0..30 {
            let Some(f) = sys.factor(values, mu) else {
                lo = mu;
                mu *= 10.0;
                if mu > 1e14 * scale {
                    break;
                }
                continue;
            };
            let p = solve(&f);
            let q = norm(&p);
            if !radius.is_finite() {
                return Ok((p, mu));
            }
            if q <= 1.2 * radius {
                let good = q >= 0.8 * radius || mu <= 1.01 * lo.max(1e-12 * scale);
                best = Some((p.clone(), mu));
                if good {
                    break;
                }
            }
            // Moré–Sorensen: Newton's method on 1/radius − 1/‖p(μ)‖.
            let mut z = p.clone();
            f.solve_in_place(&mut z);
            let w2 = dot(&p, &z).max(1e-300);
            let mut next = mu + (q / radius - 1.0) * q * q / w2;
            if next.is_nan() || next <= lo || !next.is_finite() {
                next = if q > radius { 10.0 * mu } else { 0.5 * (lo + mu) };
            }
            if (next - mu).abs() <= 1e-3 * mu {
                break;
            }
            mu = next;
        }
        match best {
            Some(b) => Ok(b),
            None => {
                // The shortest step found, scaled back to the radius.
                let Some(f) = sys.factor(values, mu) else {
                    return Err(NewtonFail::Stalled { residual: f64::INFINITY });
                };
                let mut p = solve(&f);
                let q = norm(&p);
                if q > radius && radius.is_finite() {
                    p.iter_mut().for_each(|x| *x *= radius / q);
                }
                Ok((p, mu))
            }
        }
    }

    /// Leaves a stationary point that is not a minimum along the direction of its lowest
    /// tangent eigenvalue, to whichever side lowers the potential most; `None` when neither
    /// side does.
    fn escape(&self, u: &mut [Vec3], load: &Loading, lambda: f64, values: &[f64], at: &Evaluation) -> Option<Evaluation> {
        let sys = &self.system;
        let model = self.model;
        let (_, phi) = lowest_mode(sys, values);
        let extent = model.extent();
        let mut best: Option<(Vec<Vec3>, Evaluation)> = None;
        for size in [1e-3, 1e-2, 1e-1] {
            for sign in [1.0, -1.0] {
                let mut t = u.to_vec();
                sys.add_scaled(&mut t, &phi, sign * size * extent);
                if let Some(e) = sys.evaluate(model, &t, load, lambda)
                    && e.energy < at.energy
                    && !within_round_off(at, &e)
                    && best.as_ref().is_none_or(|(_, b)| e.energy < b.energy)
                {
                    best = Some((t, e));
                }
            }
            if best.is_some() {
                break;
            }
        }
        best.map(|(t, e)| {
            u.copy_from_slice(&t);
            e
        })
    }
}
