//! Large-displacement static equilibrium by Newton's method on the exact tangent stiffness.
//!
//! The equilibrium minimises the total potential `Π(x) = Σ U_m(L_m) − λ fᵀ(x − X)` over the
//! free node positions `x`. Its gradient is the out-of-balance force `r = f_int − λ f` and its
//! Hessian the tangent stiffness `K_T = K_E + K_G`. Each Newton step solves
//! `(K_T + μ I) Δ = −r` with a sparse Cholesky factorisation; `μ` stays 0 while `K_T` is
//! positive definite and grows (Levenberg–Marquardt) where it is singular or the step is
//! poor. A backtracking line search on `Π` (Armijo condition, Nocedal & Wright, *Numerical
//! Optimization*, §3.1) makes each step go downhill.
//!
//! Loads are applied in adaptive steps of the load factor `λ`, starting with the full load.
//! Once a step starts from a stable state, its Newton iterations must not meet a tangent with
//! a negative eigenvalue: crossing one means the load path has passed a limit point and the
//! nearest minimum is on another branch (a snap-through). The step is then cut, and when it
//! cannot be cut further the limit is reported instead of a silently different answer.

use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};

use nalgebra::{DMatrix, SymmetricEigen};

use super::result::{Equilibrium, Hold, MemberResult, NodeResult, NodeStiffness, Principal, Stability};
use super::system::{DofMap, Factor, Part, System};
use crate::model::{Model, Vec3};

/// Settings of the equilibrium solver.
#[derive(Debug, Clone, PartialEq)]
pub struct SolveSettings {
    /// Relative residual `‖r‖ / scale` at which Newton stops (default: 1e-10).
    pub tolerance: f64,
    /// Newton iterations allowed in one load step (default: 60).
    pub max_iterations_per_step: usize,
    /// Newton iterations allowed in all (default: 1000).
    pub max_iterations: usize,
    /// Smallest load-factor step before a limit is reported (default: 1e-4).
    pub min_load_step: f64,
    /// A displacement larger than this multiple of the rig's size means it runs away as a
    /// mechanism (default: 1e3).
    pub runaway_factor: f64,
}

impl Default for SolveSettings {
    fn default() -> Self {
        SolveSettings {
            tolerance: 1e-10,
            max_iterations_per_step: 60,
            max_iterations: 1000,
            min_load_step: 1e-4,
            runaway_factor: 1e3,
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
    #[error("limit point: the rig carries only {:.1} % of the load case before it snaps through or collapses; stiffen or brace it, or reduce the load", load_factor * 100.0)]
    LimitPoint { load_factor: f64 },
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
    /// The cancel flag given with [`Statics::cancel_with`] was raised before the solve ended.
    #[error("solve cancelled after {iterations} iterations (a newer request replaced it, or it was stopped); solve again for the answer")]
    Cancelled { iterations: usize },
}

/// How one Newton solve ended.
enum NewtonFail {
    /// Met a tangent with a negative eigenvalue while following the load path.
    Indefinite,
    /// Iteration cap or no further progress.
    Stalled { residual: f64 },
    /// A node ran away (mechanism).
    Runaway { node: usize, direction: Vec3 },
    /// The cancel flag was raised.
    Cancelled,
}

struct Converged {
    residual: f64,
    definiteness: Definiteness,
}

/// Work done along the load path.
struct LoadPath {
    iterations: usize,
    steps: usize,
}

#[derive(Debug, Clone, Copy, PartialEq)]
enum Definiteness {
    Positive,
    /// Singular to working precision.
    Semi,
    Indefinite,
}

/// Static solver for one model and one set of held degrees of freedom.
///
/// Build once and call [`Statics::solve`] repeatedly (for example while a node is dragged):
/// the sparse pattern and its symbolic factorisation are reused.
pub struct Statics<'m> {
    model: &'m Model,
    system: System,
    held: Option<usize>,
    /// Largest member rate `EA/L0` or `k` (N/m): the stiffness scale when all are slack.
    rate_scale: f64,
    pub settings: SolveSettings,
    /// Raised by another thread to abandon a solve (checked before every Newton iteration).
    cancel: Option<Arc<AtomicBool>>,
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

    fn build(model: &'m Model, held: Option<usize>) -> Self {
        let system = System::new(model, DofMap::new(model, held));
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

    fn cancelled(&self) -> bool {
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
    /// `warm` (node positions of a nearby equilibrium) when given.
    pub fn solve(&self, case: usize, warm: Option<&[Vec3]>) -> Result<Equilibrium, SolveError> {
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
    pub fn solve_held(&self, case: usize, position: Vec3, warm: Option<&[Vec3]>) -> Result<Equilibrium, SolveError> {
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

    fn run(&self, case: usize, warm: Option<&[Vec3]>, hold: Option<(usize, Vec3)>) -> Result<Equilibrium, SolveError> {
        let model = self.model;
        if case >= model.cases.len() {
            return Err(SolveError::UnknownCase(format!("#{case}"), String::new()));
        }
        let load = model.case_forces(case);
        let drawn = drawn_again(model, hold);
        let mut iterations = 0;

        // A warm start tries the full load directly from the nearby state.
        if let Some(w) = warm
            && w.len() == drawn.len()
        {
            let mut pos = w.to_vec();
            if let Some((node, p)) = hold {
                pos[node] = p;
            }
            match self.newton(&mut pos, &load, 1.0, false, &mut iterations) {
                Ok(c) if c.definiteness != Definiteness::Indefinite => {
                    return Ok(self.finish(case, pos, &load, c, LoadPath { iterations, steps: 1 }, hold));
                }
                Err(NewtonFail::Cancelled) => return Err(SolveError::Cancelled { iterations }),
                _ => {}
            }
        }

        // Equilibrium without load (pretension alone), then load steps.
        let mut pos = drawn;
        let mut state = match self.newton(&mut pos, &load, 0.0, false, &mut iterations) {
            Ok(c) => c,
            Err(NewtonFail::Runaway { node, direction }) => return Err(self.mechanism(node, direction)),
            Err(NewtonFail::Cancelled) => return Err(SolveError::Cancelled { iterations }),
            // No balanced unloaded state (e.g. every cable slack): step the load from the
            // drawn geometry without path-following checks.
            Err(_) => {
                pos = drawn_again(model, hold);
                Converged {
                    residual: f64::INFINITY,
                    definiteness: Definiteness::Semi,
                }
            }
        };
        let mut lambda = 0.0;
        let mut step: f64 = 1.0;
        let mut steps = 0;
        while lambda < 1.0 {
            if iterations >= self.settings.max_iterations {
                return Err(SolveError::NotConverged {
                    iterations,
                    residual: state.residual,
                    load_factor: lambda,
                });
            }
            if self.cancelled() {
                return Err(SolveError::Cancelled { iterations });
            }
            let target = (lambda + step).min(1.0);
            let strict = state.definiteness == Definiteness::Positive;
            let mut trial = pos.clone();
            match self.newton(&mut trial, &load, target, strict, &mut iterations) {
                Ok(c) if !strict || c.definiteness != Definiteness::Indefinite => {
                    pos = trial;
                    lambda = target;
                    state = c;
                    steps += 1;
                    step = (step * 2.0).min(1.0);
                }
                Err(NewtonFail::Runaway { node, direction }) => return Err(self.mechanism(node, direction)),
                Err(NewtonFail::Cancelled) => return Err(SolveError::Cancelled { iterations }),
                other => {
                    step *= 0.5;
                    if step < self.settings.min_load_step {
                        return Err(match other {
                            Err(NewtonFail::Stalled { residual }) if !strict => SolveError::NotConverged {
                                iterations,
                                residual,
                                load_factor: lambda,
                            },
                            _ => SolveError::LimitPoint { load_factor: lambda },
                        });
                    }
                }
            }
        }
        Ok(self.finish(case, pos, &load, state, LoadPath { iterations, steps }, hold))
    }

    fn mechanism(&self, node: usize, direction: Vec3) -> SolveError {
        let d = direction.normalize();
        SolveError::Mechanism {
            node: self.model.nodes[node].id.clone(),
            direction: [d.x, d.y, d.z],
        }
    }

    /// Newton's method at fixed load factor, updating `pos` in place.
    fn newton(&self, pos: &mut [Vec3], load: &[Vec3], lambda: f64, strict: bool, total: &mut usize) -> Result<Converged, NewtonFail> {
        let model = self.model;
        let sys = &self.system;
        let s = &self.settings;
        let limit = s.runaway_factor * model.extent();
        let mut eval = sys
            .evaluate(model, pos, load, lambda)
            .ok_or(NewtonFail::Stalled { residual: f64::INFINITY })?;
        let mut mu = 0.0;
        for it in 0..=s.max_iterations_per_step {
            let rnorm = norm(&eval.residual);
            let rel = rnorm / eval.scale;
            let values = sys.assemble(model, pos, Part::Total);
            // Stiffness scale for shifts: the largest diagonal entry, or the stiffest member's
            // rate when every member is slack.
            let dmax = sys.max_diagonal(&values).max(self.rate_scale);
            if rel <= s.tolerance || sys.size() == 0 {
                let definiteness = definiteness(sys, &values, sys.max_diagonal(&values));
                let _ = it;
                return Ok(Converged {
                    residual: rel,
                    definiteness,
                });
            }
            if it == s.max_iterations_per_step || *total >= s.max_iterations {
                return Err(NewtonFail::Stalled { residual: rel });
            }
            if self.cancelled() {
                return Err(NewtonFail::Cancelled);
            }
            *total += 1;
            // Direction: (K + μI) Δ = −r.
            let factor = match sys.factor(&values, mu) {
                Some(f) => f,
                None => {
                    if mu == 0.0 && strict && sys.factor(&values, 1e-9 * dmax).is_none() {
                        return Err(NewtonFail::Indefinite);
                    }
                    mu = mu.max(1e-6 * dmax);
                    loop {
                        if let Some(f) = sys.factor(&values, mu) {
                            break f;
                        }
                        mu *= 10.0;
                        if mu > 1e12 * dmax {
                            return Err(NewtonFail::Stalled { residual: rel });
                        }
                    }
                }
            };
            let mut dx: Vec<f64> = eval.residual.iter().map(|r| -r).collect();
            factor.solve_in_place(&mut dx);
            let slope: f64 = dx.iter().zip(&eval.residual).map(|(d, r)| d * r).sum();
            // Backtracking line search on the total potential, accepting also a clear drop of
            // the residual (which round-off in Π cannot show near convergence).
            let mut alpha = 1.0;
            let mut accepted = None;
            for _ in 0..40 {
                let mut trial = pos.to_vec();
                sys.add_scaled(&mut trial, &dx, alpha);
                if let Some(e) = sys.evaluate(model, &trial, load, lambda) {
                    let armijo = e.energy <= eval.energy + 1e-4 * alpha * slope.min(0.0);
                    let drop = norm(&e.residual) <= (1.0 - 1e-4 * alpha) * rnorm;
                    if (armijo && slope < 0.0) || drop {
                        accepted = Some((trial, e));
                        break;
                    }
                }
                alpha *= 0.5;
            }
            match accepted {
                Some((trial, e)) => {
                    pos.copy_from_slice(&trial);
                    eval = e;
                    if alpha == 1.0 {
                        mu = if mu < 1e-8 * dmax { 0.0 } else { mu * 0.1 };
                    } else if alpha < 1e-3 {
                        mu = (mu * 100.0).max(1e-4 * dmax);
                    } else if alpha < 0.1 {
                        mu = (mu * 10.0).max(1e-6 * dmax);
                    }
                }
                None => {
                    if mu > 1e10 * dmax {
                        return Err(NewtonFail::Stalled { residual: rel });
                    }
                    mu = (mu * 10.0).max(1e-6 * dmax);
                }
            }
            // Runaway: a node far beyond the rig's own size.
            if let Some((node, d)) = model
                .nodes
                .iter()
                .enumerate()
                .map(|(i, n)| (i, pos[i] - n.position))
                .max_by(|a, b| a.1.norm().total_cmp(&b.1.norm()))
                && d.norm() > limit
            {
                return Err(NewtonFail::Runaway { node, direction: d });
            }
        }
        Err(NewtonFail::Stalled { residual: f64::INFINITY })
    }

    fn finish(&self, case: usize, pos: Vec<Vec3>, load: &[Vec3], c: Converged, path: LoadPath, hold: Option<(usize, Vec3)>) -> Equilibrium {
        let LoadPath { iterations, steps } = path;
        let model = self.model;
        let (f, _, _) = System::internal(model, &pos).expect("converged state has positive lengths");
        let stability = match c.definiteness {
            Definiteness::Positive => Stability::Stable,
            other => self.diagnose(&pos, other),
        };
        let nodes = model
            .nodes
            .iter()
            .enumerate()
            .map(|(i, n)| {
                let held_here = hold.is_some_and(|(h, _)| h == i);
                let reaction = (model.has_reaction(i) && !held_here).then(|| {
                    let mut r = f[i] - load[i];
                    for a in 0..3 {
                        if !n.support.fixed[a] {
                            r[a] = 0.0;
                        }
                    }
                    r
                });
                NodeResult {
                    id: n.id.clone(),
                    position: pos[i],
                    displacement: pos[i] - n.position,
                    reaction,
                }
            })
            .collect();
        let members = model
            .members
            .iter()
            .map(|m| {
                let [a, b] = m.ends;
                let l = (pos[b] - pos[a]).norm();
                let st = m.kind.state(l);
                let l0 = m.kind.rest_length();
                MemberResult {
                    id: m.id.clone(),
                    kind: m.kind.class(),
                    force: st.force,
                    length: l,
                    unstressed_length: l0,
                    strain: if l0 > 0.0 { (l - l0) / l0 } else { l - l0 },
                    slack: st.slack,
                }
            })
            .collect();
        let hold = hold.map(|(node, position)| {
            let mut force = f[node] - load[node];
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
        }
    }

    /// Names the node and direction of the lowest tangent-stiffness mode.
    fn diagnose(&self, pos: &[Vec3], d: Definiteness) -> Stability {
        let sys = &self.system;
        let values = sys.assemble(self.model, pos, Part::Total);
        let (eig, vec) = lowest_mode(sys, &values);
        let (node, dir) = self.dominant_node(&vec);
        let dmax = sys.max_diagonal(&values).max(self.rate_scale);
        if d == Definiteness::Indefinite && eig < -1e-10 * dmax {
            Stability::Unstable {
                node,
                direction: dir,
                eigenvalue: eig,
            }
        } else {
            Stability::Mechanism { node, direction: dir }
        }
    }

    fn dominant_node(&self, v: &[f64]) -> (String, [f64; 3]) {
        let mut best = (0, Vec3::zeros());
        for (n, d) in self.system.dofs.dof.iter().enumerate() {
            let mut u = Vec3::zeros();
            for a in 0..3 {
                if let Some(k) = d[a] {
                    u[a] = v[k];
                }
            }
            if u.norm() > best.1.norm() {
                best = (n, u);
            }
        }
        let u = if best.1.norm() > 0.0 { best.1.normalize() } else { best.1 };
        (self.model.nodes[best.0].id.clone(), [u.x, u.y, u.z])
    }

    /// Tangent stiffness condensed to node `node`'s free directions at equilibrium `eq`.
    ///
    /// With `E` selecting the node's free DOFs, the flexibility is `F = Eᵀ K_T⁻¹ E` and the
    /// condensed stiffness `F⁻¹` (the Schur complement of the other free DOFs). The
    /// displacement fields `U = K_T⁻¹ E F⁻¹` for unit node displacements split it exactly
    /// into `Uᵀ K_E U + Uᵀ K_G U`: the strain-energy share of the elastic and geometric parts.
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
        let pos = eq.positions();
        let kt = sys.assemble(model, &pos, Part::Total);
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
        let u: Vec<Vec<f64>> = (0..m)
            .map(|j| (0..n).map(|r| (0..m).map(|k| cols[k][r] * total[(k, j)]).sum()).collect())
            .collect();
        let project = |part: Part| -> DMatrix<f64> {
            let v = sys.assemble(model, &pos, part);
            let ku: Vec<Vec<f64>> = u.iter().map(|col| sys.mul(&v, col)).collect();
            DMatrix::from_fn(m, m, |i, j| dot(&u[i], &ku[j]))
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

fn drawn_again(model: &Model, hold: Option<(usize, Vec3)>) -> Vec<Vec3> {
    let mut pos: Vec<Vec3> = model.nodes.iter().map(|n| n.position).collect();
    if let Some((node, p)) = hold {
        pos[node] = p;
    }
    pos
}

fn norm(v: &[f64]) -> f64 {
    v.iter().map(|x| x * x).sum::<f64>().sqrt()
}

fn dot(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

fn definiteness(sys: &System, values: &[f64], dmax: f64) -> Definiteness {
    if sys.size() == 0 || sys.factor(values, 0.0).is_some() {
        Definiteness::Positive
    } else if sys.factor(values, 1e-9 * dmax).is_some() {
        Definiteness::Semi
    } else {
        Definiteness::Indefinite
    }
}

/// Lowest eigenpair of the stored symmetric matrix by shifted inverse iteration.
///
/// The shift `σ` is the smallest of 0, 1e-9·d, 1e-8·d, … (d the largest diagonal entry) at
/// which `K + σI` factorises, so `(K + σI)⁻¹` is positive definite and its dominant eigenvector
/// is the lowest mode of `K`. Returns the Rayleigh quotient and the unit vector.
pub fn lowest_mode(sys: &System, values: &[f64]) -> (f64, Vec<f64>) {
    let n = sys.size();
    let dmax = sys.max_diagonal(values);
    if dmax <= 1e-250 {
        // Nothing is stiff at all (e.g. one slack, unstressed cable): every free direction is a
        // zero mode; report the first.
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
    // Deterministic start with every component non-zero.
    let mut v: Vec<f64> = (0..n).map(|i| 1.0 + ((i * 7919) % 13) as f64 * 0.01).collect();
    let mut rq = f64::NAN;
    for _ in 0..200 {
        let nv = norm(&v);
        v.iter_mut().for_each(|x| *x /= nv);
        let kv = sys.mul(values, &v);
        let new_rq = dot(&v, &kv);
        if (new_rq - rq).abs() <= 1e-12 * dmax {
            rq = new_rq;
            break;
        }
        rq = new_rq;
        factor.solve_in_place(&mut v);
    }
    let nv = norm(&v);
    v.iter_mut().for_each(|x| *x /= nv);
    (rq, v)
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
