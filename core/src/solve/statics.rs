//! Large-displacement static equilibrium: the solver's entry points and result assembly.
//!
//! The equilibrium minimises the total potential `Π(u) = Σ U_m(L_m) − λ fᵀu` over the free
//! node displacements `u`. Its gradient is the out-of-balance force `r = f_int − λ f` and its
//! Hessian the tangent stiffness `K_T = K_E + K_G`.
//!
//! A load case is solved in this order (each stage only when the one before cannot answer):
//!
//! 1. **Warm start** (a drag, a Pull, a Sweep): Newton from the nearby state the caller
//!    gives. Kept only when every step was a full Newton step that reduced the residual and
//!    the state is stable — then it is the solution nearest that state, on its branch.
//! 2. **Load path**: the unloaded equilibrium (pretension alone, `λ = 0`), then load steps
//!    and arc length to `λ = 1` ([`path`](super::path)). A limit point or bifurcation on the
//!    way is reported with its load factor, never passed silently.
//! 3. **Global start**, when the unloaded rig is a mechanism or has no unloaded equilibrium:
//!    a trust-region Newton method from the drawn geometry under the full load, which cannot
//!    stall at a zero pivot. The result says so ([`Route::GlobalStart`]).
//!
//! With [`SolveSettings::follow`] the rig is followed past a critical point (or off an
//! unstable start) to the stable state it moves to, and the result says that it did.

use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};

use nalgebra::{DMatrix, SymmetricEigen};

use super::newton::{Converged, Mode, NewtonFail};
use super::path::{Critical, CriticalKind, PathEnd, Walker};
use super::relax::Relaxed;
use super::result::{Equilibrium, Hold, MemberResult, NodeResult, NodeStiffness, Principal, Route, Stability, Warm, sig6};
use super::stability::{Definiteness, lowest_mode, verdict_at};
use super::system::{DofMap, Loading, Part, System, member_response};
use crate::model::{Model, Vec3};

/// Settings of the equilibrium solver.
#[derive(Debug, Clone, PartialEq)]
pub struct SolveSettings {
    /// Relative residual `‖r‖ / scale` at which Newton stops (default: 1e-10).
    pub tolerance: f64,
    /// Newton iterations allowed in all (default: 2000).
    pub max_iterations: usize,
    /// Smallest load-factor step before the path is continued by arc length (default: 1e-4).
    pub min_load_step: f64,
    /// A displacement larger than this multiple of the rig's size means it runs away as a
    /// mechanism (default: 1e3).
    pub runaway_factor: f64,
    /// Follow the rig past a critical point (limit point, bifurcation) or off an unstable
    /// start to the stable state it moves to, instead of reporting the critical point
    /// (default: false; the result's [`Route`] says when it was used).
    pub follow: bool,
}

impl Default for SolveSettings {
    fn default() -> Self {
        SolveSettings {
            tolerance: 1e-10,
            max_iterations: 2000,
            min_load_step: 1e-4,
            runaway_factor: 1e3,
            follow: false,
        }
    }
}

/// Why no equilibrium could be returned.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SolveError {
    /// The named load case does not exist.
    #[error("no load case named `{0}`; the cases are: {1}")]
    UnknownCase(String, String),
    /// A node runs away under load: nothing resists its motion.
    #[error("mechanism: node `{node}` moves without limit along ({:.3}, {:.3}, {:.3}); add a member or a support that resists that direction, or pretension the members there", direction[0], direction[1], direction[2])]
    Mechanism { node: String, direction: [f64; 3] },
    /// The load path reached a limit point (snap-through or collapse) before full load.
    #[error("limit point at load factor {}: the rig carries only {} % of the load case before node `{node}` snaps through or collapses (following the path past it shows where the rig goes); stiffen or brace it, or reduce the load", sig6(*load_factor), sig6(load_factor * 100.0))]
    LimitPoint {
        load_factor: f64,
        node: String,
        direction: [f64; 3],
    },
    /// The load path lost stability at a bifurcation before full load.
    #[error("bifurcation at load factor {}: beyond {} % of the load case the rig buckles, node `{node}` moving along ({:.3}, {:.3}, {:.3}) (following the path past it shows where the rig goes); brace it, or reduce the load", sig6(*load_factor), sig6(load_factor * 100.0), direction[0], direction[1], direction[2])]
    Bifurcation {
        load_factor: f64,
        node: String,
        direction: [f64; 3],
    },
    /// Newton's method did not reach the tolerance.
    #[error(
        "not converged after {iterations} iterations (relative residual {residual:.3e}, load factor {load_factor:.4}); check for members near slack, very soft parts or a mechanism"
    )]
    NotConverged {
        iterations: usize,
        residual: f64,
        load_factor: f64,
    },
    /// A held node or a node query names a node that cannot be used that way.
    #[error("node `{0}`: {1}")]
    BadNode(String, String),
    /// The stiffness is not positive definite, so no condensed stiffness exists.
    #[error("no tangent stiffness at an equilibrium that is not stable: {0}")]
    NotStable(String),
    /// The rig has no members, so there is no equilibrium to find (an empty drawing).
    #[error("the rig has no members, so there is nothing to solve; draw members between the nodes")]
    NothingToSolve,
    /// The cancel flag given with [`Statics::cancel_with`] was raised before the solve ended.
    #[error("solve cancelled after {iterations} iterations (a newer request replaced it, or it was stopped); solve again for the answer")]
    Cancelled { iterations: usize },
}

impl SolveError {
    /// The load factor of a critical point, for limit points and bifurcations.
    pub fn critical_load_factor(&self) -> Option<f64> {
        match self {
            SolveError::LimitPoint { load_factor, .. } | SolveError::Bifurcation { load_factor, .. } => Some(*load_factor),
            _ => None,
        }
    }

    /// Short machine name of the kind of failure, for JSON documents.
    pub fn kind(&self) -> &'static str {
        match self {
            SolveError::UnknownCase(..) => "unknown_case",
            SolveError::Mechanism { .. } => "mechanism",
            SolveError::LimitPoint { .. } => "limit_point",
            SolveError::Bifurcation { .. } => "bifurcation",
            SolveError::NotConverged { .. } => "not_converged",
            SolveError::BadNode(..) => "bad_node",
            SolveError::NotStable(..) => "not_stable",
            SolveError::NothingToSolve => "nothing_to_solve",
            SolveError::Cancelled { .. } => "cancelled",
        }
    }
}

/// Static solver for one model and one set of held degrees of freedom.
///
/// Build once and call [`Statics::solve`] repeatedly (for example while a node is dragged):
/// the sparse pattern and its symbolic factorisation are reused.
pub struct Statics<'m> {
    pub(super) model: &'m Model,
    pub(super) system: System,
    held: Option<usize>,
    /// Largest member rate `EA/L0` or `k` (N/m): the stiffness scale when all are slack.
    pub(super) rate_scale: f64,
    pub settings: SolveSettings,
    /// Raised by another thread to abandon a solve (checked before every Newton iteration).
    cancel: Option<Arc<AtomicBool>>,
}

/// Load factor at which the load path starts when the unloaded rig is a mechanism: small
/// enough to be the start of the loading, large enough that the members it engages carry
/// forces well above round-off.
const ENGAGING_LOAD: f64 = 1e-3;
/// Newton iterations the start at the engaging load may take before the full load is tried
/// at once instead (a slack chain, say, is easier to solve under its full weight).
const ENGAGING_BUDGET: usize = 150;

/// Work done to reach an equilibrium.
struct Work {
    iterations: usize,
    steps: usize,
    route: Route,
}

impl<'m> Statics<'m> {
    /// Solver for `model` with its supports only.
    pub fn new(model: &'m Model) -> Self {
        Self::build(model, None)
    }

    /// Solver for `model` with node `node` held at a position given to [`Statics::solve_held`].
    pub fn holding(model: &'m Model, node: usize) -> Self {
        Self::build(model, Some(node))
    }

    /// A solver for `model` (a variant of `like`'s model with the same nodes and members)
    /// that holds what `like` holds, sharing its cancel flag.
    pub(super) fn holding_like(model: &'m Model, like: &Statics) -> Self {
        let mut s = Self::build(model, like.held);
        s.cancel = like.cancel.clone();
        s
    }

    /// A solver for `model` with node `held` held (if any) that reuses `system`, the
    /// structure (pattern, symbolic analysis) of a previous solver, when it fits: the same free
    /// directions and the same member ends (moving nodes, changing loads, rates or lengths
    /// keep it). Otherwise it builds its own, as [`Statics::new`] or [`Statics::holding`].
    pub fn with_system(model: &'m Model, held: Option<usize>, system: System) -> Self {
        if !system.fits(model, held) {
            return Self::build(model, held);
        }
        Self::assembled(model, system, held)
    }

    /// The solver's structure, for [`Statics::with_system`] on the next variant of the rig.
    pub fn into_system(self) -> System {
        self.system
    }

    fn build(model: &'m Model, held: Option<usize>) -> Self {
        Self::assembled(model, System::new(model, DofMap::new(model, held)), held)
    }

    fn assembled(model: &'m Model, system: System, held: Option<usize>) -> Self {
        let rate_scale = model.members.iter().map(|m| m.kind.rate()).fold(1e-300, f64::max);
        Statics {
            model,
            system,
            held,
            rate_scale,
            settings: SolveSettings::default(),
            cancel: None,
        }
    }

    /// Abandons solves when `flag` is raised: [`Statics::solve`] and
    /// [`Statics::solve_held`] then return [`SolveError::Cancelled`] before their next Newton
    /// iteration, so a long solve on a worker thread can be dropped for a newer request.
    pub fn cancel_with(mut self, flag: Arc<AtomicBool>) -> Self {
        self.cancel = Some(flag);
        self
    }

    pub(super) fn cancelled(&self) -> bool {
        self.cancel.as_ref().is_some_and(|f| f.load(Ordering::Relaxed))
    }

    /// The model being solved.
    pub fn model(&self) -> &Model {
        self.model
    }

    /// Number of free degrees of freedom.
    pub fn dof_count(&self) -> usize {
        self.system.size()
    }

    /// The assembly machinery (for the dynamics and for tests).
    pub fn system(&self) -> &System {
        &self.system
    }

    /// Index of a load case by name, with a helpful error.
    pub fn case_index(&self, name: &str) -> Result<usize, SolveError> {
        self.model.case_index(name).ok_or_else(|| {
            SolveError::UnknownCase(
                name.to_string(),
                self.model
                    .cases
                    .iter()
                    .map(|c| format!("`{}`", c.name))
                    .collect::<Vec<_>>()
                    .join(", "),
            )
        })
    }

    /// Equilibrium of load case `case` (index), starting from the drawn geometry, or from
    /// `warm` (a nearby equilibrium) when given.
    pub fn solve(&self, case: usize, warm: Option<&Warm>) -> Result<Equilibrium, SolveError> {
        if let Some(h) = self.held {
            return Err(SolveError::BadNode(
                self.model.nodes[h].id.clone(),
                "this solver holds the node; use solve_held".into(),
            ));
        }
        self.run(case, warm, None)
    }

    /// Equilibrium with the held node at `position` (m); the result's `hold` gives the force
    /// needed to hold it there.
    pub fn solve_held(&self, case: usize, position: Vec3, warm: Option<&Warm>) -> Result<Equilibrium, SolveError> {
        let Some(node) = self.held else {
            return Err(SolveError::BadNode(
                String::new(),
                "no node is held; build the solver with Statics::holding".into(),
            ));
        };
        if !position.iter().all(|v| v.is_finite()) {
            return Err(SolveError::BadNode(
                self.model.nodes[node].id.clone(),
                "hold position is not finite".into(),
            ));
        }
        self.run(case, warm, Some((node, position)))
    }

    /// Displacements with every node at its drawn position, the held node at `hold`.
    fn start(&self, hold: Option<(usize, Vec3)>) -> Vec<Vec3> {
        let mut u = vec![Vec3::zeros(); self.model.nodes.len()];
        if let Some((node, p)) = hold {
            u[node] = p - self.model.nodes[node].position;
        }
        u
    }

    fn run(&self, case: usize, warm: Option<&Warm>, hold: Option<(usize, Vec3)>) -> Result<Equilibrium, SolveError> {
        let model = self.model;
        if case >= model.cases.len() {
            return Err(SolveError::UnknownCase(format!("#{case}"), String::new()));
        }
        if model.members.is_empty() {
            return Err(SolveError::NothingToSolve);
        }
        let load = Loading::of(model, case);
        let start = self.start(hold);
        let mut iterations = 0;
        let cancelled = |iterations| SolveError::Cancelled { iterations };

        // 1. A warm start moves only free directions: a held coordinate keeps its drawn
        //    value (or the hold position), whatever the nearby state had there. A state
        //    followed past a critical point is a start only when following is asked for.
        if let Some(warm) = warm
            && warm.positions.len() == start.len()
            && (self.settings.follow || !matches!(warm.route, Route::Followed { .. }))
        {
            let w = &warm.positions;
            let mut u = start.clone();
            for (n, a, _) in self.system.dofs.free() {
                u[n][a] = w[n][a] - model.nodes[n].position[a];
            }
            let from = u.clone();
            match self.newton(&mut u, &load, 1.0, Mode::Local { strict: true }, 12, &mut iterations) {
                // Newton went straight down to a stable state (full steps, the residual
                // falling), or its result passes the load path's test against a jump to
                // another branch: the potential convex along the straight way from the start
                // and the rig stable half-way.
                Ok(c)
                    if c.definiteness == Definiteness::Positive
                        && (c.clean
                            || (self.convex_along((&from, 1.0), (&u, 1.0), &load, 32)
                                && self.stable_along((&from, 1.0), (&u, 1.0), &load, &[0.5]))) =>
                {
                    let work = Work {
                        iterations,
                        steps: 1,
                        route: warm.route.clone(),
                    };
                    return Ok(self.finish(case, u, &load, c, work, hold));
                }
                Err(NewtonFail::Cancelled) => return Err(cancelled(iterations)),
                _ => {}
            }
        }

        // 2. The unloaded equilibrium, then the load path. When the unloaded rig is a
        //    mechanism (a node hanging on unstressed cables can drift) the path starts at a
        //    small load instead, from the state the globalised methods reach under it.
        let mut u = start.clone();
        let (u, c, from) = match self.newton(&mut u, &load, 0.0, Mode::Local { strict: false }, 60, &mut iterations) {
            Ok(c) if c.definiteness == Definiteness::Positive => (u, c, 0.0),
            Err(NewtonFail::Cancelled) => return Err(cancelled(iterations)),
            _ => match self.reach(&start, &load, ENGAGING_LOAD, false, ENGAGING_BUDGET, &mut iterations) {
                Ok((u, c)) if c.definiteness == Definiteness::Positive => (u, c, ENGAGING_LOAD),
                Err(NewtonFail::Cancelled) => return Err(cancelled(iterations)),
                // 3. Not even a small load gives a stable state: the full load at once.
                _ => return self.global(case, &start, &load, hold, &mut iterations),
            },
        };
        match self.load_path(u, c, from, &load, &mut iterations) {
            PathEnd::Reached { u, converged, steps } => {
                let work = Work {
                    iterations,
                    steps,
                    route: Route::LoadPath { from },
                };
                Ok(self.finish(case, u, &load, converged, work, hold))
            }
            PathEnd::Critical(critical) => {
                if self.settings.follow {
                    self.follow(case, critical, &load, hold, &mut iterations)
                } else {
                    Err(self.critical_error(&critical))
                }
            }
            PathEnd::Stuck { load_factor, residual } => {
                // No critical point seen: the global method may still find the state.
                self.global(case, &start, &load, hold, &mut iterations).map_err(|e| match e {
                    SolveError::NotConverged { .. } => SolveError::NotConverged {
                        iterations,
                        residual,
                        load_factor,
                    },
                    other => other,
                })
            }
            PathEnd::Runaway { node, direction } => Err(self.mechanism(node, direction)),
            PathEnd::Cancelled => Err(cancelled(iterations)),
        }
    }

    /// An equilibrium under `lambda` × `load` reached from `start` by the globalised methods:
    /// the trust-region method; where it makes slow progress (a quadratic model is poor far
    /// from the answer, with many members switching between slack and taut), paying out the
    /// slack cables from a tight start, or dynamic relaxation; then the trust-region method
    /// again to finish. With `escape`, a saddle or maximum found is left for a minimum. At most
    /// `budget` Newton iterations (dynamic relaxation only with at least half the solver's).
    fn reach(
        &self,
        start: &[Vec3],
        load: &Loading,
        lambda: f64,
        escape: bool,
        budget: usize,
        iterations: &mut usize,
    ) -> Result<(Vec<Vec3>, Converged), NewtonFail> {
        let mut u = start.to_vec();
        let cap = (*iterations + budget).min(self.settings.max_iterations);
        let remaining = |done: usize| cap.saturating_sub(done);
        let mut outcome = self.newton(
            &mut u,
            load,
            lambda,
            Mode::Global { escape },
            remaining(*iterations).min(60),
            iterations,
        );
        if let Err(NewtonFail::Stalled { .. }) = outcome
            && let Some(paid) = self.pay_out(start, load, lambda, cap, iterations)
        {
            u = paid;
            outcome = self.newton(&mut u, load, lambda, Mode::Global { escape }, remaining(*iterations), iterations);
        }
        if let Err(NewtonFail::Stalled { .. }) = outcome
            && budget >= self.settings.max_iterations / 2
        {
            let budget = (2e8 / (self.model.members.len() + 1) as f64).clamp(2e4, 5e5) as usize;
            match self.relax(&mut u, load, lambda, 1e-4, budget) {
                Relaxed::Runaway { node, direction } => return Err(NewtonFail::Runaway { node, direction }),
                Relaxed::Cancelled => return Err(NewtonFail::Cancelled),
                Relaxed::Close | Relaxed::Budget => {}
            }
            outcome = self.newton(&mut u, load, lambda, Mode::Global { escape }, remaining(*iterations), iterations);
        }
        outcome.map(|c| (u, c))
    }

    /// The full load at once from `start` by the globalised methods ([`Statics::reach`]).
    fn global(
        &self,
        case: usize,
        start: &[Vec3],
        load: &Loading,
        hold: Option<(usize, Vec3)>,
        iterations: &mut usize,
    ) -> Result<Equilibrium, SolveError> {
        let budget = self.settings.max_iterations.saturating_sub(*iterations);
        let outcome = self.reach(start, load, 1.0, self.settings.follow, budget, iterations);
        match outcome {
            Ok((u, c)) => {
                let route = if c.escaped && c.definiteness == Definiteness::Positive {
                    Route::Followed {
                        critical: None,
                        crossed: "unstable equilibrium".into(),
                    }
                } else {
                    Route::GlobalStart
                };
                let work = Work {
                    iterations: *iterations,
                    steps: 1,
                    route,
                };
                Ok(self.finish(case, u, load, c, work, hold))
            }
            Err(NewtonFail::Runaway { node, direction }) => Err(self.mechanism(node, direction)),
            Err(NewtonFail::Cancelled) => Err(SolveError::Cancelled { iterations: *iterations }),
            Err(NewtonFail::Stalled { residual }) => Err(SolveError::NotConverged {
                iterations: *iterations,
                residual,
                load_factor: 1.0,
            }),
            Err(NewtonFail::Indefinite) => Err(SolveError::NotConverged {
                iterations: *iterations,
                residual: f64::NAN,
                load_factor: 1.0,
            }),
        }
    }

    /// The error for a critical point met on the load path.
    fn critical_error(&self, c: &Critical) -> SolveError {
        let (node, direction) = self.dominant_node(&c.mode);
        match c.kind {
            CriticalKind::Limit => SolveError::LimitPoint {
                load_factor: c.load_factor,
                node,
                direction,
            },
            CriticalKind::Bifurcation => SolveError::Bifurcation {
                load_factor: c.load_factor,
                node,
                direction,
            },
        }
    }

    /// Follows the rig past critical point `c` to a stable state under the full load.
    ///
    /// Past a limit point the equilibrium path is traced on by arc length until it meets the
    /// full load again at a stable state (the snapped-through equilibrium). At a bifurcation,
    /// or when the path cannot be traced far enough, the state beyond the critical point is
    /// pushed along the mode that lost its stiffness (to the side of lower potential) and the
    /// full load applied by the trust-region method, which ends at a minimum.
    fn follow(
        &self,
        case: usize,
        c: Critical,
        load: &Loading,
        hold: Option<(usize, Vec3)>,
        iterations: &mut usize,
    ) -> Result<Equilibrium, SolveError> {
        let route = Route::Followed {
            critical: Some(c.load_factor),
            crossed: c.kind.name().into(),
        };
        if c.kind == CriticalKind::Limit
            && let Some((u, conv)) = self.trace_to_full_load(&c, load, iterations)
        {
            let work = Work {
                iterations: *iterations,
                steps: 1,
                route,
            };
            return Ok(self.finish(case, u, load, conv, work, hold));
        }
        let extent = self.model.extent();
        let mut best: Option<(Vec<Vec3>, Converged)> = None;
        for sign in [1.0, -1.0] {
            let mut u = c.beyond.u.clone();
            self.system.add_scaled(&mut u, &c.mode, sign * 1e-3 * extent);
            if let Ok(conv) = self.newton(&mut u, load, 1.0, Mode::Global { escape: true }, 400, iterations)
                && conv.definiteness == Definiteness::Positive
            {
                let energy = self.system.evaluate(self.model, &u, load, 1.0).map_or(f64::INFINITY, |e| e.energy);
                let better = best
                    .as_ref()
                    .is_none_or(|(b, _)| energy < self.system.evaluate(self.model, b, load, 1.0).map_or(f64::INFINITY, |e| e.energy));
                if better {
                    best = Some((u, conv));
                }
            }
        }
        match best {
            Some((u, conv)) => {
                let work = Work {
                    iterations: *iterations,
                    steps: 1,
                    route,
                };
                Ok(self.finish(case, u, load, conv, work, hold))
            }
            None => Err(self.critical_error(&c)),
        }
    }

    /// Traces the path on from beyond a limit point until it crosses the full load at a stable
    /// state; the state and its Newton result.
    fn trace_to_full_load(&self, c: &Critical, load: &Loading, iterations: &mut usize) -> Option<(Vec<Vec3>, Converged)> {
        let t_ref = c.beyond.tangent.0.iter().map(|x| x * x).sum::<f64>().sqrt();
        let mut walker = Walker::new(self, load, 1.0);
        walker.u_ref = 1.0;
        let _ = t_ref;
        let mut here = walker.point(c.beyond.u.clone(), c.beyond.lambda, Some(&c.beyond.tangent), 0)?;
        let mut ds = walker.cap(1e-2, &here);
        for _ in 0..2000 {
            if self.cancelled() || *iterations + walker.iterations >= self.settings.max_iterations || ds < 1e-12 {
                break;
            }
            let Some(next) = walker.advance(&here, ds) else {
                ds *= 0.5;
                continue;
            };
            if (here.lambda - 1.0) * (next.lambda - 1.0) <= 0.0 && next.lambda != here.lambda {
                let frac = (1.0 - here.lambda) / (next.lambda - here.lambda);
                let mut u1 = here.u.clone();
                for (a, b) in u1.iter_mut().zip(&next.u) {
                    *a += (b - *a) * frac;
                }
                let mut its = 0;
                if let Ok(conv) = self.newton(&mut u1, load, 1.0, Mode::Local { strict: false }, 30, &mut its)
                    && conv.definiteness == Definiteness::Positive
                {
                    *iterations += walker.iterations + its;
                    return Some((u1, conv));
                }
            }
            let grow = (5.0 / next.iterations.max(1) as f64).sqrt().clamp(0.5, 2.0);
            ds = walker.cap(ds * grow, &next);
            here = next;
        }
        *iterations += walker.iterations;
        None
    }

    pub(super) fn mechanism(&self, node: usize, direction: Vec3) -> SolveError {
        let d = direction.normalize();
        SolveError::Mechanism {
            node: self.model.nodes[node].id.clone(),
            direction: [d.x, d.y, d.z],
        }
    }

    fn finish(&self, case: usize, u: Vec<Vec3>, load: &Loading, c: Converged, work: Work, hold: Option<(usize, Vec3)>) -> Equilibrium {
        let Work { iterations, steps, route } = work;
        let model = self.model;
        let gravity = load.gravity;
        let internal = System::internal(model, &u, &gravity).expect("converged state has positive lengths");
        let f = &internal.force;
        let stability = match c.definiteness {
            Definiteness::Positive => Stability::Stable,
            other => self.diagnose(&u, &gravity, other),
        };
        let nodes = model
            .nodes
            .iter()
            .enumerate()
            .map(|(i, n)| {
                let held_here = hold.is_some_and(|(h, _)| h == i);
                let reaction = (model.has_reaction(i) && !held_here).then(|| {
                    let mut r = f[i] - load.nodal[i];
                    for a in 0..3 {
                        if !n.support.fixed[a] {
                            r[a] = 0.0;
                        }
                    }
                    r
                });
                NodeResult {
                    id: n.id.clone(),
                    position: n.position + u[i],
                    displacement: u[i],
                    reaction,
                }
            })
            .collect();
        let members = model
            .members
            .iter()
            .map(|m| {
                let r = member_response(model, m, &u, &gravity).expect("converged state has positive lengths");
                let l = super::system::member_vector(model, m, &u).norm();
                let l0 = m.kind.rest_length();
                let sag = r
                    .sag
                    .as_ref()
                    .map(|s| sag_result(s, model.nodes[m.ends[0]].position + u[m.ends[0]]));
                let stretched = sag.as_ref().map_or(l, |s| s.stretched_length);
                MemberResult {
                    id: m.id.clone(),
                    kind: m.kind.class(),
                    force: r.force,
                    length: l,
                    unstressed_length: l0,
                    strain: if l0 > 0.0 { (stretched - l0) / l0 } else { l - l0 },
                    slack: r.slack,
                    sag,
                }
            })
            .collect();
        let hold = hold.map(|(node, position)| {
            let mut force = f[node] - load.nodal[node];
            // Directions the support already holds are part of its reaction, not the hand's.
            for a in 0..3 {
                if model.nodes[node].support.fixed[a] {
                    force[a] = 0.0;
                }
            }
            Hold { node, position, force }
        });
        Equilibrium {
            case: model.cases[case].name.clone(),
            nodes,
            members,
            iterations,
            load_steps: steps.max(1),
            residual: c.residual,
            stability,
            hold,
            route,
        }
    }

    /// The stability verdict at displacements `u` under gravitational acceleration `gravity`
    /// (the load case's at full load; it weighs the sagging cables): the one verdict used for
    /// every equilibrium.
    pub fn stability_at(&self, u: &[Vec3], gravity: &Vec3) -> Stability {
        match verdict_at(&self.system, self.model, u, gravity).0 {
            Definiteness::Positive => Stability::Stable,
            other => self.diagnose(u, gravity, other),
        }
    }

    /// The gravitational acceleration an equilibrium was found under (its case's, at full load).
    pub fn gravity_of(&self, eq: &Equilibrium) -> Vec3 {
        self.model
            .case_index(&eq.case)
            .map_or(self.model.gravity, |c| self.model.case_gravity(c))
    }

    /// Names the node and direction of the lowest tangent-stiffness mode.
    fn diagnose(&self, u: &[Vec3], gravity: &Vec3, d: Definiteness) -> Stability {
        let sys = &self.system;
        let values = sys.assemble_for_verdict(self.model, u, gravity, System::slack_floor(self.model, u, gravity));
        let (eig, vec) = lowest_mode(sys, &values);
        let (node, direction) = self.dominant_node(&vec);
        if d == Definiteness::Indefinite && eig < 0.0 {
            Stability::Unstable {
                node,
                direction,
                eigenvalue: eig,
            }
        } else {
            Stability::Mechanism { node, direction }
        }
    }

    fn dominant_node(&self, v: &[f64]) -> (String, [f64; 3]) {
        // Only nodes with a free direction can be named (the first of them when `v` is zero).
        let first_free = self.system.dofs.dof.iter().position(|d| d.iter().any(Option::is_some)).unwrap_or(0);
        let mut best = (first_free, Vec3::zeros());
        for (n, d) in self.system.dofs.dof.iter().enumerate() {
            let mut w = Vec3::zeros();
            for a in 0..3 {
                if let Some(k) = d[a] {
                    w[a] = v[k];
                }
            }
            if w.norm() > best.1.norm() {
                best = (n, w);
            }
        }
        let w = if best.1.norm() > 0.0 { best.1.normalize() } else { best.1 };
        (self.model.nodes[best.0].id.clone(), [w.x, w.y, w.z])
    }

    /// Tangent stiffness condensed to node `node`'s free directions at equilibrium `eq`.
    ///
    /// With `E` selecting the node's free DOFs, the flexibility is `F = Eᵀ K_T⁻¹ E` and the
    /// condensed stiffness `F⁻¹` (the Schur complement of the other free DOFs). The
    /// displacement fields `U = K_T⁻¹ E F⁻¹` for unit node displacements split it exactly
    /// into `Uᵀ K_E U + Uᵀ K_G U`: the strain-energy share of the elastic and geometric parts.
    /// Refused unless the equilibrium is stable by the one verdict.
    pub fn node_stiffness(&self, eq: &Equilibrium, node: usize) -> Result<NodeStiffness, SolveError> {
        let model = self.model;
        let id = model
            .nodes
            .get(node)
            .map(|n| n.id.clone())
            .ok_or_else(|| SolveError::BadNode(format!("#{node}"), "no such node".into()))?;
        let sys = &self.system;
        let axes: Vec<usize> = (0..3).filter(|&a| sys.dofs.dof[node][a].is_some()).collect();
        if axes.is_empty() {
            return Err(SolveError::BadNode(
                id,
                "is held in every direction, so it has no stiffness to condense".into(),
            ));
        }
        if !eq.stability.is_stable() {
            return Err(SolveError::NotStable(eq.stability.describe()));
        }
        let u = eq.displacements();
        let gravity = self.gravity_of(eq);
        let kt = sys.assemble(model, &u, &gravity, Part::Total);
        if verdict_at(sys, model, &u, &gravity).0 != Definiteness::Positive {
            return Err(SolveError::NotStable(self.stability_at(&u, &gravity).describe()));
        }
        let factor = sys
            .factor(&kt, 0.0)
            .ok_or_else(|| SolveError::NotStable("the tangent stiffness is not positive definite".into()))?;
        let n = sys.size();
        let m = axes.len();
        let cols: Vec<Vec<f64>> = axes
            .iter()
            .map(|&a| {
                let mut e = vec![0.0; n];
                e[sys.dofs.dof[node][a].expect("free axis")] = 1.0;
                factor.solve_in_place(&mut e);
                e
            })
            .collect();
        let flex = DMatrix::from_fn(m, m, |i, j| cols[j][sys.dofs.dof[node][axes[i]].expect("free axis")]);
        let flex = (&flex + flex.transpose()) * 0.5;
        let total = flex
            .clone()
            .try_inverse()
            .ok_or_else(|| SolveError::NotStable("singular flexibility".into()))?;
        // U = K⁻¹ E F⁻¹: columns are the fields for unit node displacements.
        let fields: Vec<Vec<f64>> = (0..m)
            .map(|j| (0..n).map(|r| (0..m).map(|k| cols[k][r] * total[(k, j)]).sum()).collect())
            .collect();
        let project = |part: Part| -> DMatrix<f64> {
            let v = sys.assemble(model, &u, &gravity, part);
            let ku: Vec<Vec<f64>> = fields.iter().map(|col| sys.mul(&v, col)).collect();
            DMatrix::from_fn(m, m, |i, j| fields[i].iter().zip(&ku[j]).map(|(a, b)| a * b).sum())
        };
        let elastic = project(Part::Elastic);
        let geometric = project(Part::Geometric);
        let total = (&total + total.transpose()) * 0.5;
        let eig = SymmetricEigen::new(total.clone());
        let mut principal: Vec<Principal> = (0..m)
            .map(|k| {
                let mut dir = Vec3::zeros();
                for (i, &a) in axes.iter().enumerate() {
                    dir[a] = eig.eigenvectors[(i, k)];
                }
                // A fixed sign convention: largest component positive.
                let imax = dir.iamax();
                if dir[imax] < 0.0 {
                    dir = -dir;
                }
                Principal {
                    value: eig.eigenvalues[k],
                    direction: dir,
                }
            })
            .collect();
        principal.sort_by(|a, b| a.value.total_cmp(&b.value));
        let rows = |mat: &DMatrix<f64>| (0..m).map(|i| (0..m).map(|j| mat[(i, j)]).collect()).collect();
        Ok(NodeStiffness {
            node: id,
            axes,
            total: rows(&total),
            elastic: rows(&elastic),
            geometric: rows(&geometric),
            principal,
        })
    }
}

/// Points drawn along a sagging cable.
const CURVE_POINTS: usize = 24;

/// A sagging cable's results from its solved catenary, end a at `at_a` (m).
fn sag_result(s: &crate::element::response::Sag, at_a: Vec3) -> super::result::SagResult {
    let (c, h) = (&s.cable, &s.hang);
    let vb = h.v + c.q * c.l0;
    let curve = (0..=CURVE_POINTS)
        .map(|k| s.point(&at_a, c.l0 * k as f64 / CURVE_POINTS as f64))
        .collect();
    super::result::SagResult {
        tension_a: h.h.hypot(h.v),
        tension_b: h.h.hypot(vb),
        horizontal: h.h,
        sag: c.sag(h).0,
        mid_span_sag: c.mid_span_sag(h),
        angle_a: h.v.atan2(h.h),
        angle_b: vb.atan2(h.h),
        stretched_length: c.stretched_length(h),
        weight: c.q * c.l0,
        curve,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::gallery::cable_net;

    #[test]
    fn a_raised_cancel_flag_stops_the_solve_before_its_first_iteration() {
        let model = cable_net(8, 1.0, 1e6, 1000.0, 2.0).validate().unwrap();
        let flag = Arc::new(AtomicBool::new(true));
        let statics = Statics::new(&model).cancel_with(flag.clone());
        match statics.solve(0, None) {
            Err(e @ SolveError::Cancelled { iterations: 0 }) => assert!(e.to_string().contains("solve again"), "{e}"),
            other => panic!("{other:?}"),
        }
        // Lowered again, the same solver gives the answer a solver without a flag gives.
        flag.store(false, Ordering::Relaxed);
        let plain = Statics::new(&model).solve(0, None).unwrap();
        assert_eq!(statics.solve(0, None).unwrap(), plain);
    }
}
