//! Following the load path: load steps, arc-length continuation, critical points.
//!
//! The answer to a load case is the equilibrium the rig reaches as the load factor `λ` grows
//! from the unloaded state (`λ = 0`) to the full load (`λ = 1`) through stable states. Load
//! steps are cheap and carry almost every rig there in one or a few steps; each step must
//! pass three tests before it is kept:
//!
//! 1. its Newton iterations never meet a tangent with a negative eigenvalue (strict Newton);
//! 2. the state reached is stable by the scale-aware verdict;
//! 3. the *secant compliance* `fᵀΔu / Δλ` lies within 25 % of the larger of the tangent
//!    compliances `fᵀK_T⁻¹f` at the two ends. Along a continuous stable path the compliance
//!    `fᵀ du/dλ = fᵀK_T⁻¹f` varies smoothly, so over a short enough step the secant value lies
//!    between the end values; a Newton iteration that jumped over a limit point to a distant
//!    branch (a snap-through it must not take silently) does far more work than either end's
//!    tangent allows, however large the load. A rejected step is halved.
//!
//! When the steps shrink below `min_load_step` the path is continued by arc length (Riks'
//! normal-plane method: Riks 1979, *Int. J. Solids Struct.* 15; Crisfield, *Non-linear Finite
//! Element Analysis of Solids and Structures*, vol. 1, §9.3), which passes limit points. A
//! change of the stability verdict between two path points brackets a critical point; it is
//! located by bisection on the arc length to well below 1e-6 in the load factor. The path
//! tangent tells the kind: its load component changes sign at a limit point and keeps it at a
//! bifurcation (the path goes on through it).

use super::factor::Factor;
use super::newton::{Converged, Mode, NewtonFail};
use super::stability::{Definiteness, nearest_zero_mode, verdict, verdict_at};
use super::statics::{SolveError, Statics};
use super::system::{Loading, Part};
use serde::Serialize;

use crate::model::Vec3;

/// Allowed excess of the secant over the tangent compliance in one load step.
const SECANT_EXCESS: f64 = 0.25;
/// Newton iterations allowed in one load step or one arc-length corrector.
const STEP_ITERATIONS: usize = 30;
/// Newton iterations an arc-length step aims at.
const ARC_TARGET_ITERATIONS: f64 = 5.0;

/// What kind of critical point the load path met.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CriticalKind {
    /// The load factor reaches a maximum: the rig snaps through or collapses.
    Limit,
    /// The path goes on, but unstable beyond: the rig buckles into another shape.
    Bifurcation,
}

impl CriticalKind {
    pub fn name(self) -> &'static str {
        match self {
            CriticalKind::Limit => "limit point",
            CriticalKind::Bifurcation => "bifurcation",
        }
    }
}

/// A critical point found on the load path.
#[derive(Debug, Clone)]
pub(super) struct Critical {
    pub kind: CriticalKind,
    pub load_factor: f64,
    /// A state on the path just past the critical point (not stable).
    pub beyond: Point,
    /// The mode that loses stiffness there (free-DOF vector, unit length).
    pub mode: Vec<f64>,
}

/// How following the load path ended.
pub(super) enum PathEnd {
    /// Reached the full load with every state stable.
    Reached {
        u: Vec<Vec3>,
        converged: Converged,
        steps: usize,
    },
    /// Stability was lost before the full load.
    Critical(Critical),
    /// Neither load steps nor arc length could go on, and no critical point was seen.
    Stuck {
        load_factor: f64,
        residual: f64,
    },
    /// A node ran away.
    Runaway {
        node: usize,
        direction: Vec3,
    },
    Cancelled,
}

/// A point of the equilibrium path.
#[derive(Debug, Clone)]
pub(super) struct Point {
    pub u: Vec<Vec3>,
    pub lambda: f64,
    pub definiteness: Definiteness,
    /// Unit tangent in the scaled norm `‖(x, α)‖² = ‖x‖²/u_ref² + α²`, oriented along the
    /// direction of travel: (displacement part on free DOFs, load-factor part).
    pub tangent: (Vec<f64>, f64),
    /// Newton iterations its corrector took.
    pub iterations: usize,
}

fn norm(v: &[f64]) -> f64 {
    v.iter().map(|x| x * x).sum::<f64>().sqrt()
}

fn dot(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

/// Arc-length continuation of one load case.
pub(super) struct Walker<'s, 'm> {
    statics: &'s Statics<'m>,
    load: &'s Loading,
    /// Displacement scale of the arc-length norm (m).
    pub u_ref: f64,
    pub iterations: usize,
    /// Largest change of the load factor in one step (default 0.1).
    pub max_dlambda: f64,
}

impl<'s, 'm> Walker<'s, 'm> {
    pub fn new(statics: &'s Statics<'m>, load: &'s Loading, u_ref: f64) -> Self {
        Walker {
            statics,
            load,
            u_ref: u_ref.max(1e-9 * statics.model.extent()),
            iterations: 0,
            max_dlambda: 0.1,
        }
    }

    fn sdot(&self, a: &(Vec<f64>, f64), b: &(Vec<f64>, f64)) -> f64 {
        dot(&a.0, &b.0) / (self.u_ref * self.u_ref) + a.1 * b.1
    }

    /// `∂r/∂λ` on the free DOFs at `u`, `lambda` (the load, and how sagging cables change with it).
    fn rate(&self, u: &[Vec3], lambda: f64) -> Vec<f64> {
        self.statics.system.load_rate(self.statics.model, u, self.load, lambda)
    }

    /// A factor of `K_T` at `u`, `lambda` that may be indefinite (shifted by a hair at an
    /// exactly zero pivot).
    fn factor_at(&self, u: &[Vec3], lambda: f64) -> Option<(Vec<f64>, Factor)> {
        let sys = &self.statics.system;
        let values = sys.assemble(self.statics.model, u, &self.load.gravity_at(lambda), Part::Total);
        let scale = sys.max_entry(&values);
        let f = sys
            .factor_indefinite(&values, 0.0)
            .or_else(|| sys.factor_indefinite(&values, 1e-12 * scale))?;
        Some((values, f))
    }

    /// The unit tangent at `u`, `lambda`, oriented like `previous` (or with `dλ > 0` without one).
    fn tangent(&self, u: &[Vec3], lambda: f64, factor: &Factor, previous: Option<&(Vec<f64>, f64)>) -> (Vec<f64>, f64) {
        let mut b = self.rate(u, lambda);
        factor.solve_in_place(&mut b);
        let mut t = (b, 1.0);
        let len = self.sdot(&t, &t).sqrt();
        t.0.iter_mut().for_each(|x| *x /= len);
        t.1 /= len;
        let flip = match previous {
            Some(p) => self.sdot(&t, p) < 0.0,
            None => t.1 < 0.0,
        };
        if flip {
            t.0.iter_mut().for_each(|x| *x = -*x);
            t.1 = -t.1;
        }
        t
    }

    /// The path point at equilibrium `u`, `lambda`.
    pub fn point(&self, u: Vec<Vec3>, lambda: f64, previous: Option<&(Vec<f64>, f64)>, iterations: usize) -> Option<Point> {
        let (_, factor) = self.factor_at(&u, lambda)?;
        let (definiteness, _) = verdict_at(&self.statics.system, self.statics.model, &u, &self.load.gravity_at(lambda));
        let tangent = self.tangent(&u, lambda, &factor, previous);
        Some(Point {
            u,
            lambda,
            definiteness,
            tangent,
            iterations,
        })
    }

    /// `ds` limited so that one step changes the load factor by at most `max_dlambda` and moves no
    /// node by more than 2 % of the rig's size (steps that could jump between branches).
    pub fn cap(&self, ds: f64, at: &Point) -> f64 {
        let extent = self.statics.model.extent();
        let mut ds = ds;
        if at.tangent.1.abs() > 0.0 {
            ds = ds.min(self.max_dlambda / at.tangent.1.abs());
        }
        let du = at.tangent.0.iter().fold(0.0f64, |m, x| m.max(x.abs()));
        if du > 0.0 {
            ds = ds.min(0.02 * extent / du);
        }
        ds
    }

    /// One predictor–corrector step of scaled length `ds` from `from`; `None` when the
    /// corrector does not converge or the path turns by more than about 25°.
    pub fn advance(&mut self, from: &Point, ds: f64) -> Option<Point> {
        let st = self.statics;
        let sys = &st.system;
        let model = st.model;
        let mut u = from.u.clone();
        sys.add_scaled(&mut u, &from.tangent.0, ds);
        let mut lambda = from.lambda + ds * from.tangent.1;
        let tol = st.settings.tolerance;
        let mut first = f64::NAN;
        for it in 0..=STEP_ITERATIONS {
            let eval = sys.evaluate(model, &u, self.load, lambda)?;
            let rel = norm(&eval.residual) / eval.scale;
            if rel <= tol {
                let p = self.point(u, lambda, Some(&from.tangent), it)?;
                if self.sdot(&p.tangent, &from.tangent) < 0.9 {
                    return None;
                }
                return Some(p);
            }
            if it == 0 {
                first = rel;
            } else if rel.is_nan() || rel >= 1e3 * first {
                return None;
            }
            if it == STEP_ITERATIONS || st.cancelled() {
                return None;
            }
            self.iterations += 1;
            let (_, factor) = self.factor_at(&u, lambda)?;
            let mut a: Vec<f64> = eval.residual.iter().map(|r| -r).collect();
            factor.solve_in_place(&mut a);
            let mut b = self.rate(&u, lambda);
            factor.solve_in_place(&mut b);
            let t = &from.tangent;
            let den = dot(&t.0, &b) / (self.u_ref * self.u_ref) + t.1;
            if den.abs() < 1e-14 {
                return None;
            }
            let dl = -(dot(&t.0, &a) / (self.u_ref * self.u_ref)) / den;
            let du: Vec<f64> = a.iter().zip(&b).map(|(a, b)| a + dl * b).collect();
            sys.add_scaled(&mut u, &du, 1.0);
            lambda += dl;
        }
        None
    }

    /// Locates the critical point between `lo` (stable) and the point reached from it with
    /// step `ds` (not stable), by bisection on the step.
    pub fn locate(&mut self, lo: &Point, ds: f64, hi: Point) -> Critical {
        let (mut s_lo, mut s_hi) = (0.0, ds);
        let mut p_lo = lo.clone();
        let mut p_hi = hi;
        for _ in 0..48 {
            let dl = (p_hi.lambda - p_lo.lambda).abs();
            if s_hi - s_lo <= 1e-7 * ds && dl <= 1e-9 * p_lo.lambda.abs().max(1e-6) {
                break;
            }
            let mid = 0.5 * (s_lo + s_hi);
            match self.advance(lo, mid) {
                Some(p) if p.definiteness == Definiteness::Positive => {
                    s_lo = mid;
                    p_lo = p;
                }
                Some(p) => {
                    s_hi = mid;
                    p_hi = p;
                }
                None => break,
            }
        }
        // A limit point turns the load factor back; at a bifurcation it goes on rising.
        let limit = p_lo.tangent.1.signum() != p_hi.tangent.1.signum() || p_hi.lambda < p_lo.lambda;
        let (kind, load_factor) = if limit {
            (CriticalKind::Limit, p_lo.lambda.max(p_hi.lambda))
        } else {
            (CriticalKind::Bifurcation, 0.5 * (p_lo.lambda + p_hi.lambda))
        };
        let sys = &self.statics.system;
        let values = sys.assemble(self.statics.model, &p_hi.u, &self.load.gravity_at(p_hi.lambda), Part::Total);
        let mode = nearest_zero_mode(sys, &values).map_or_else(|| p_hi.tangent.0.clone(), |(_, v)| v);
        Critical {
            kind,
            load_factor,
            beyond: p_hi,
            mode,
        }
    }
}

impl Statics<'_> {
    /// `K⁻¹ f` and `fᵀ K⁻¹ f` with `factor` (N⁻¹·m per unit load factor, N·m).
    fn compliance(&self, factor: &Factor, f: &[f64]) -> (Vec<f64>, f64) {
        let mut t = f.to_vec();
        factor.solve_in_place(&mut t);
        let c = dot(f, &t);
        (t, c)
    }

    /// True when the potential is strictly convex along the straight segment from
    /// displacements `a` to `b` at `samples` + 1 evenly spaced points: the curvature
    /// `dᵀ K_T d` in the segment's direction `d`, summed member by member without assembling,
    /// is positive (above round-off of its terms) at each. Convex along the line, the
    /// line-constrained minimum moves continuously from one end to the other as the load
    /// grows: the step cannot have snapped along its own direction.
    pub(super) fn convex_along(&self, (a, la): (&[Vec3], f64), (b, lb): (&[Vec3], f64), load: &Loading, samples: usize) -> bool {
        let model = self.model;
        let d: Vec<Vec3> = a.iter().zip(b).map(|(x, y)| y - x).collect();
        // Each sagging cable's solve starts from its state at the previous sample.
        let mut near: Vec<Option<(f64, f64)>> = vec![None; model.members.len()];
        // Curvature terms at fraction `s`: (straight members' sum and size, whether one is in
        // compression; sagging cables' sum and size, whether there is one), the sagging cables
        // solved only when `cables`.
        let mut terms = |s: f64, cables: bool| -> Option<[f64; 6]> {
            let at: Vec<Vec3> = a.iter().zip(&d).map(|(x, dx)| x + dx * s).collect();
            let gravity = load.gravity_at(la + (lb - la) * s);
            let mut t = [0.0; 6];
            for (m, near) in model.members.iter().zip(near.iter_mut()) {
                let [i, j] = m.ends;
                if !cables && crate::element::response::sags(&m.kind, m.mass_per_length, &gravity) {
                    continue;
                }
                let chord = super::system::member_vector(model, m, &at);
                let r = crate::element::response::respond_near(&m.kind, m.mass_per_length, &chord, &gravity, &at[i], *near)?;
                let dm = d[j] - d[i];
                let (ce, cg) = (dm.dot(&(r.elastic * dm)), dm.dot(&(r.geometric * dm)));
                if let Some(sag) = r.sag {
                    *near = Some((sag.hang.h, sag.hang.v));
                    t[3] += ce + cg;
                    t[4] += ce.abs() + cg.abs();
                    t[5] = 1.0;
                } else {
                    t[0] += ce + cg;
                    t[1] += ce.abs() + cg.abs();
                    if r.force < 0.0 {
                        t[2] = 1.0;
                    }
                }
            }
            Some(t)
        };
        // A sagging cable's tangent is positive definite (the inverse of its flexibility in
        // its plane, `H/l_x` across it): its curvature term is never negative. Between samples
        // where the cables' terms were comfortably positive, and where no straight member is
        // in compression (the only source of negative terms), the sum stays positive: the
        // cables need not be solved there (they are at the ends and every eighth sample).
        let mut cables_positive = false;
        (0..=samples).all(|k| {
            let s = k as f64 / samples as f64;
            let exact = k == 0 || k == samples || k % 8 == 0 || !cables_positive;
            let t = if exact {
                terms(s, true)
            } else {
                match terms(s, false) {
                    Some(t) if t[2] == 0.0 => return t[0] >= 0.0,
                    _ => terms(s, true),
                }
            };
            let Some(t) = t else { return false };
            let size = t[1] + t[4];
            cables_positive = t[5] > 0.0 && t[3] > 1e-6 * size && t[2] == 0.0;
            t[0] + t[3] > 1e-12 * size
        })
    }

    /// True when the tangent is positive definite at the given fractions of the straight
    /// segment between displacements `a` and `b` (always true for a step too small to move
    /// any node by a millionth of the rig's size).
    pub(super) fn stable_along(&self, (a, la): (&[Vec3], f64), (b, lb): (&[Vec3], f64), load: &Loading, fractions: &[f64]) -> bool {
        let step = a.iter().zip(b).map(|(x, y)| (y - x).norm()).fold(0.0, f64::max);
        if step <= 1e-6 * self.model.extent() {
            return true;
        }
        fractions.iter().all(|&s| {
            let at: Vec<Vec3> = a.iter().zip(b).map(|(x, y)| x + (y - x) * s).collect();
            let values = self
                .system
                .assemble(self.model, &at, &load.gravity_at(la + (lb - la) * s), Part::Total);
            verdict(&self.system, &values).0 == Definiteness::Positive
        })
    }

    /// Follows the load from the stable state `start` at load factor `from` (the unloaded
    /// state, or a small load for a rig that is a mechanism unloaded; with its Newton result
    /// `at_start`) to the full load.
    pub(super) fn load_path(&self, start: Vec<Vec3>, at_start: Converged, from: f64, load: &Loading, total: &mut usize) -> PathEnd {
        let sys = &self.system;
        let model = self.model;
        let mut f = sys.load_rate(model, &start, load, from);
        let Some(factor) = at_start.factor.as_ref() else {
            return PathEnd::Stuck {
                load_factor: 0.0,
                residual: at_start.residual,
            };
        };
        let (mut t, mut c) = self.compliance(factor, &f);
        let mut u = start;
        let mut state = at_start;
        let mut lambda = from;
        let mut step: f64 = 1.0 - from;
        let mut steps = 0;
        let mut last_residual = state.residual;
        while lambda < 1.0 {
            if self.cancelled() {
                return PathEnd::Cancelled;
            }
            if *total >= self.settings.max_iterations {
                return PathEnd::Stuck {
                    load_factor: lambda,
                    residual: last_residual,
                };
            }
            let target = (lambda + step).min(1.0);
            let dl = target - lambda;
            // The tangent predictor overshoots a stiffening rig; the first attempt at the whole
            // load starts from the unloaded state itself, later steps from the predictor.
            let mut trial = u.clone();
            if steps > 0 || dl < 1.0 - from {
                sys.add_scaled(&mut trial, &t, dl);
            }
            let outcome = self.newton(&mut trial, load, target, Mode::Local { strict: true }, STEP_ITERATIONS, total);
            let accepted = match outcome {
                Ok(conv) if conv.definiteness == Definiteness::Positive => match conv.factor.as_ref() {
                    Some(fac) => {
                        let f_new = sys.load_rate(model, &trial, load, target);
                        let (t_new, c_new) = self.compliance(fac, &f_new);
                        let du: Vec<f64> = sys.gather(&trial).iter().zip(sys.gather(&u)).map(|(a, b)| a - b).collect();
                        let work = 0.5 * (dot(&f, &du) + dot(&f_new, &du)) / dl;
                        let bound = (1.0 + SECANT_EXCESS) * c.max(c_new);
                        let tiny = 1e-12 * (c.abs() + c_new.abs()) + 1e-300;
                        // A jump to another branch crosses the unstable region between the
                        // two basins: along the step the potential must be convex in the
                        // step's own direction (at 32 points, cheap), and the rig stable at
                        // its mid-point (one factorisation).
                        let (from_here, to_there) = ((u.as_slice(), lambda), (trial.as_slice(), target));
                        let between_stable =
                            self.convex_along(from_here, to_there, load, 32) && self.stable_along(from_here, to_there, load, &[0.5]);
                        if work >= -tiny && work <= bound + tiny && between_stable {
                            t = t_new;
                            c = c_new;
                            f = f_new;
                            Some(conv)
                        } else {
                            None
                        }
                    }
                    None => None,
                },
                Ok(conv) => {
                    last_residual = conv.residual;
                    None
                }
                Err(NewtonFail::Runaway { node, direction }) => return PathEnd::Runaway { node, direction },
                Err(NewtonFail::Cancelled) => return PathEnd::Cancelled,
                Err(NewtonFail::Stalled { residual }) => {
                    last_residual = residual;
                    None
                }
                Err(NewtonFail::Indefinite) => None,
            };
            match accepted {
                Some(conv) => {
                    u = trial;
                    lambda = target;
                    last_residual = conv.residual;
                    state = conv;
                    steps += 1;
                    step = (2.0 * step).min(1.0);
                }
                None => {
                    step *= 0.5;
                    if step < self.settings.min_load_step {
                        return self.continue_by_arc(u, lambda, &t, load, total, steps);
                    }
                }
            }
        }
        PathEnd::Reached {
            u,
            converged: state,
            steps,
        }
    }

    /// Arc-length continuation from the stable state `u` at `lambda` (with load-path tangent
    /// `t = K⁻¹f`) to the full load, or to the first critical point.
    fn continue_by_arc(&self, u: Vec<Vec3>, lambda: f64, t: &[f64], load: &Loading, total: &mut usize, steps: usize) -> PathEnd {
        let mut walker = Walker::new(self, load, norm(t));
        let Some(mut here) = walker.point(u, lambda, None, 0) else {
            return PathEnd::Stuck {
                load_factor: lambda,
                residual: f64::NAN,
            };
        };
        // Start with a step worth the smallest load step tried.
        let mut ds = (self.settings.min_load_step * 4.0).max(1e-6);
        let mut count = 0;
        let out = loop {
            if self.cancelled() {
                break PathEnd::Cancelled;
            }
            if count > 2000 || *total + walker.iterations >= self.settings.max_iterations || ds < 1e-12 {
                break PathEnd::Stuck {
                    load_factor: here.lambda,
                    residual: f64::NAN,
                };
            }
            count += 1;
            let Some(next) = walker.advance(&here, ds) else {
                ds *= 0.5;
                continue;
            };
            if next.definiteness != Definiteness::Positive {
                break PathEnd::Critical(walker.locate(&here, ds, next));
            }
            if next.lambda >= 1.0 {
                // Land exactly on the full load with a Newton solve from the bracketing point.
                let frac = (1.0 - here.lambda) / (next.lambda - here.lambda);
                let mut u1 = here.u.clone();
                for (a, b) in u1.iter_mut().zip(&next.u) {
                    *a += (b - *a) * frac;
                }
                let mut iters = walker.iterations;
                match self.newton(&mut u1, load, 1.0, Mode::Local { strict: true }, STEP_ITERATIONS, &mut iters) {
                    Ok(conv) if conv.definiteness == Definiteness::Positive => {
                        walker.iterations = iters;
                        break PathEnd::Reached {
                            u: u1,
                            converged: conv,
                            steps: steps + count,
                        };
                    }
                    _ => {
                        ds *= 0.5;
                        continue;
                    }
                }
            }
            let grow = (ARC_TARGET_ITERATIONS / next.iterations.max(1) as f64).sqrt().clamp(0.5, 2.0);
            ds = walker.cap(ds * grow, &next);
            here = next;
        };
        *total += walker.iterations;
        out
    }
}

/// One point of a traced load path.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PathPoint {
    /// Load factor λ (1 = the full load case).
    pub load_factor: f64,
    /// Displacement of the traced node from the drawn geometry (m).
    pub displacement: Vec3,
    /// The state is stable by the one verdict.
    pub stable: bool,
}

/// A critical point met on a traced path.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PathCritical {
    /// "limit point" or "bifurcation".
    pub kind: String,
    pub load_factor: f64,
    /// Displacement of the traced node there (m).
    pub displacement: Vec3,
}

/// The equilibrium path of a load case: load factor against one node's displacement.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LoadPathTrace {
    pub case: String,
    pub node: String,
    pub points: Vec<PathPoint>,
    /// Where stability was lost along the path, in order.
    pub critical: Vec<PathCritical>,
    /// The path reached the load factor asked for.
    pub reached: bool,
}

impl Statics<'_> {
    /// Traces the equilibrium path of load case `case` by arc length from the unloaded state
    /// to load factor `to`, through limit points and unstable stretches, recording node
    /// `node`'s displacement at up to `max_points` points. Refused when the unloaded rig is
    /// not stable (a path needs a stable start) or `node` is out of range.
    pub fn trace(&self, case: usize, node: usize, to: f64, max_points: usize) -> Result<LoadPathTrace, SolveError> {
        let model = self.model;
        if case >= model.cases.len() {
            return Err(SolveError::UnknownCase(format!("#{case}"), String::new()));
        }
        let Some(node_id) = model.nodes.get(node).map(|n| n.id.clone()) else {
            return Err(SolveError::BadNode(format!("#{node}"), "no such node".into()));
        };
        if !(to.is_finite() && to > 0.0) {
            return Err(SolveError::BadNode(
                node_id,
                format!("a path needs a positive, finite load factor to reach, not {to}"),
            ));
        }
        if model.members.is_empty() {
            return Err(SolveError::NothingToSolve);
        }
        let load = Loading::of(model, case);
        let mut iterations = 0;
        let mut u = vec![Vec3::zeros(); model.nodes.len()];
        let start = match self.newton(&mut u, &load, 0.0, Mode::Local { strict: false }, 60, &mut iterations) {
            Ok(c) if c.definiteness == Definiteness::Positive => c,
            Ok(_) | Err(NewtonFail::Stalled { .. }) | Err(NewtonFail::Indefinite) => {
                return Err(SolveError::NotStable(
                    "the unloaded rig is not stable (a mechanism until it is loaded), so there is no load path to trace from it; solve the load case instead".into(),
                ));
            }
            Err(NewtonFail::Runaway { node, direction }) => return Err(self.mechanism(node, direction)),
            Err(NewtonFail::Cancelled) => return Err(SolveError::Cancelled { iterations }),
        };
        let f = self.system.load_rate(model, &u, &load, 0.0);
        let u_ref = match start.factor.as_ref() {
            Some(fac) => norm(&self.compliance(fac, &f).0),
            None => 1.0,
        };
        let mut walker = Walker::new(self, &load, u_ref);
        walker.max_dlambda = to / 40.0;
        let Some(mut here) = walker.point(u, 0.0, None, 0) else {
            return Err(SolveError::NotStable("no tangent at the unloaded state".into()));
        };
        let record = |p: &Point| PathPoint {
            load_factor: p.lambda,
            displacement: p.u[node],
            stable: p.definiteness == Definiteness::Positive,
        };
        let mut trace = LoadPathTrace {
            case: model.cases[case].name.clone(),
            node: node_id,
            points: vec![record(&here)],
            critical: Vec::new(),
            reached: false,
        };
        let mut ds = walker.cap(1.0, &here);
        let max_points = max_points.max(2);
        while trace.points.len() < max_points {
            if self.cancelled() {
                return Err(SolveError::Cancelled {
                    iterations: walker.iterations,
                });
            }
            if walker.iterations + iterations >= self.settings.max_iterations || ds < 1e-12 {
                break;
            }
            let Some(next) = walker.advance(&here, ds) else {
                ds *= 0.5;
                continue;
            };
            if here.definiteness == Definiteness::Positive && next.definiteness != Definiteness::Positive {
                let c = walker.locate(&here, ds, next.clone());
                trace.critical.push(PathCritical {
                    kind: c.kind.name().into(),
                    load_factor: c.load_factor,
                    displacement: c.beyond.u[node],
                });
            }
            if next.lambda >= to && here.lambda < to {
                // The last point exactly at the load factor asked for.
                let frac = (to - here.lambda) / (next.lambda - here.lambda);
                let mut u1 = here.u.clone();
                for (a, b) in u1.iter_mut().zip(&next.u) {
                    *a += (b - *a) * frac;
                }
                let mut its = 0;
                if self.newton(&mut u1, &load, to, Mode::Local { strict: false }, 30, &mut its).is_ok()
                    && let Some(p) = walker.point(u1, to, Some(&here.tangent), 0)
                {
                    trace.points.push(record(&p));
                } else {
                    trace.points.push(record(&next));
                }
                trace.reached = true;
                break;
            }
            trace.points.push(record(&next));
            let grow = (ARC_TARGET_ITERATIONS / next.iterations.max(1) as f64).sqrt().clamp(0.5, 2.0);
            ds = walker.cap(ds * grow, &next);
            here = next;
        }
        Ok(trace)
    }
}
