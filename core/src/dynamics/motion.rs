//! Pluck: nonlinear free vibration of a rig, `M ẍ + C ẋ + f_int(x) = f_ext`.
//!
//! Two implicit schemes, each solved by Newton iterations every step:
//!
//! * [`Scheme::EnergyConserving`] (default): the implicit midpoint rule with the discrete
//!   gradient of each member's strain energy. Writing `U` as a function of `q = L²`, the
//!   internal force on end b is `2 (U(q₁) − U(q₀))/(q₁ − q₀) · (d₀ + d₁)/2` (d = x_b − x_a),
//!   whose work over the step is exactly `U(q₁) − U(q₀)`; with `ẋ` at the midpoint this
//!   conserves kinetic + strain + load energy exactly when undamped, slack cables included
//!   (Gonzalez 1996, *J. Nonlinear Sci.* 6; Simo & Tarnow 1992, *ZAMP* 43; from memory).
//!   On a linear rig it is the average-acceleration Newmark rule.
//! * [`Scheme::GeneralizedAlpha`]: Chung & Hulbert (1993, *J. Appl. Mech.* 60), with the
//!   spectral radius at infinite frequency `ρ∞` setting the numerical dissipation
//!   (ρ∞ = 1: none).
//!
//! The state is the displacement `u` of every node from its drawn position, and each step
//! solves for its own increment `Δ = u₁ − u₀`: the inertia term `M (2Δ/Δt − 2v₀)/Δt` is then
//! formed from a number known to full relative precision, so very small time steps lose
//! nothing to the round-off of absolute coordinates (which would grow as `|x| ε / Δt²`).
//!
//! Physical damping is Rayleigh damping `C = a₀ M + a₁ K₀` with `K₀` the tangent stiffness at
//! the equilibrium the motion is about; see [`rayleigh_coefficients`].

use serde::Serialize;

use crate::model::{Model, Vec3};
use crate::solve::factor::Factor;
use crate::solve::system::{DofMap, Loading, Part, System, member_response, member_vector};

/// Time-integration scheme.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Scheme {
    /// Energy-conserving midpoint rule (default).
    EnergyConserving,
    /// Generalized-α with spectral radius `rho_inf` in [0, 1].
    GeneralizedAlpha { rho_inf: f64 },
}

/// Settings of a Pluck.
#[derive(Debug, Clone, PartialEq)]
pub struct MotionSettings {
    /// Time step (s) (default: 1e-3).
    pub dt: f64,
    /// Scheme (default: energy-conserving).
    pub scheme: Scheme,
    /// Rayleigh coefficients `(a₀ [1/s], a₁ [s])` (default: (0, 0), undamped).
    pub rayleigh: (f64, f64),
    /// Relative residual tolerance of each step's Newton iterations (default: 1e-10).
    pub tolerance: f64,
    /// Newton iterations allowed per step (default: 40).
    pub max_iterations: usize,
}

impl Default for MotionSettings {
    fn default() -> Self {
        MotionSettings {
            dt: 1e-3,
            scheme: Scheme::EnergyConserving,
            rayleigh: (0.0, 0.0),
            tolerance: 1e-10,
            max_iterations: 30,
        }
    }
}

/// Rayleigh coefficients `(a₀, a₁)` giving damping ratio `zeta` at circular frequencies
/// `w1` and `w2` (rad/s): `a₀ = 2ζ ω₁ω₂/(ω₁+ω₂)`, `a₁ = 2ζ/(ω₁+ω₂)` (Chopra, *Dynamics of
/// Structures*, §11.4, from memory).
pub fn rayleigh_coefficients(zeta: f64, w1: f64, w2: f64) -> (f64, f64) {
    (2.0 * zeta * w1 * w2 / (w1 + w2), 2.0 * zeta / (w1 + w2))
}

/// Energy audit (J), relative to the drawn geometry.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct Energy {
    pub kinetic: f64,
    pub strain: f64,
    /// Potential of the (constant) loads, `−fᵀ(x − X)`.
    pub load: f64,
    /// Work done against physical (Rayleigh) damping since the start, `Σ Δt v̄ᵀ C v̄`.
    pub damped: f64,
    /// Mechanical energy lost since the start beyond `damped`: the scheme's numerical
    /// dissipation (generalized-α), or its energy error (round-off for the
    /// energy-conserving scheme).
    pub numerical: f64,
}

impl Energy {
    /// Kinetic + strain + load potential.
    pub fn mechanical(&self) -> f64 {
        self.kinetic + self.strain + self.load
    }
}

/// Why a step failed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum MotionError {
    #[error("time step {0} s is not positive and finite")]
    BadStep(f64),
    #[error(
        "the step at t = {time:.6} s did not converge (relative residual {residual:.3e}), even cut to 1/64 of the time step; a member may be snapping violently: use a smaller time step or some damping"
    )]
    NotConverged { time: f64, residual: f64 },
    #[error("node `{0}` is not part of the rig")]
    BadNode(String),
}

/// A rig in motion. Owns its copy of the model, so the app can keep it between frames.
pub struct Motion {
    model: Model,
    system: System,
    settings: MotionSettings,
    load: Loading,
    mass: Vec<f64>,
    /// Current displacements of all nodes from the drawn geometry (m).
    disp: Vec<Vec3>,
    /// Velocity on free DOFs (m/s).
    vel: Vec<f64>,
    /// Acceleration on free DOFs (m/s²), used by generalized-α.
    acc: Vec<f64>,
    /// Stiffness values of K₀ (for Rayleigh damping).
    k0: Vec<f64>,
    time: f64,
    /// Mechanical energy at the start (J).
    initial: f64,
    damped: f64,
    slack: Vec<bool>,
    slack_events: usize,
    /// Factorised step Jacobian and the step size it was built for, reused across Newton
    /// iterations and steps (modified Newton) until convergence slows.
    jacobian: Option<(f64, Factor)>,
}

impl Motion {
    /// Starts a motion of load case `case` from node positions `start` (m) — typically a
    /// pulled state — with velocities `velocity` (m/s per node; `None` for rest). `about` are
    /// the positions of the equilibrium the motion is about, where `K₀` for damping is taken.
    pub fn new(
        model: &Model,
        case: usize,
        start: &[Vec3],
        velocity: Option<&[Vec3]>,
        about: &[Vec3],
        settings: MotionSettings,
    ) -> Result<Self, MotionError> {
        if !(settings.dt > 0.0 && settings.dt.is_finite()) {
            return Err(MotionError::BadStep(settings.dt));
        }
        let model = model.clone();
        let system = System::new(&model, DofMap::new(&model, None));
        let n = system.size();
        let masses = model.dynamic_masses();
        let mut mass = vec![0.0; n];
        let mut vel = vec![0.0; n];
        for (node, a, i) in system.dofs.free() {
            mass[i] = masses[node];
            if let Some(v) = velocity {
                vel[i] = v[node][a];
            }
        }
        let load = Loading::of(&model, case);
        let to_disp = |p: &[Vec3]| -> Vec<Vec3> { p.iter().zip(&model.nodes).map(|(x, n)| x - n.position).collect() };
        let start = to_disp(start);
        let k0 = system.assemble(&model, &to_disp(about), &load.gravity, Part::Total);
        let slack = member_slack(&model, &start, &load.gravity);
        let mut motion = Motion {
            model,
            system,
            settings,
            load,
            mass,
            disp: start,
            vel,
            acc: vec![0.0; n],
            k0,
            time: 0.0,
            initial: 0.0,
            damped: 0.0,
            slack,
            slack_events: 0,
            jacobian: None,
        };
        motion.acc = motion.initial_acceleration();
        motion.initial = motion.energy().mechanical();
        Ok(motion)
    }

    /// `a₀ = M⁻¹ (f_ext − f_int − C v₀)` on massive DOFs, 0 on massless ones.
    fn initial_acceleration(&self) -> Vec<f64> {
        let r = self
            .system
            .evaluate(&self.model, &self.disp, &self.load, 1.0)
            .map(|e| e.residual)
            .unwrap_or_else(|| vec![0.0; self.mass.len()]);
        let cv = self.damping_times(&self.vel);
        r.iter()
            .zip(&cv)
            .zip(&self.mass)
            .map(|((r, c), m)| if *m > 0.0 { -(r + c) / m } else { 0.0 })
            .collect()
    }

    /// `C v` for Rayleigh damping.
    fn damping_times(&self, v: &[f64]) -> Vec<f64> {
        let (a0, a1) = self.settings.rayleigh;
        if a0 == 0.0 && a1 == 0.0 {
            return vec![0.0; v.len()];
        }
        let kv = self.system.mul(&self.k0, v);
        v.iter().zip(&kv).zip(&self.mass).map(|((v, kv), m)| a0 * m * v + a1 * kv).collect()
    }

    /// The settings in force.
    pub fn settings(&self) -> &MotionSettings {
        &self.settings
    }

    /// Elapsed time (s).
    pub fn time(&self) -> f64 {
        self.time
    }

    /// Current node positions (m).
    pub fn positions(&self) -> Vec<Vec3> {
        self.disp.iter().zip(&self.model.nodes).map(|(u, n)| n.position + u).collect()
    }

    /// Current node displacements from the drawn geometry (m).
    pub fn displacements(&self) -> &[Vec3] {
        &self.disp
    }

    /// Current node velocities (m/s).
    pub fn velocities(&self) -> Vec<Vec3> {
        let mut out = vec![Vec3::zeros(); self.disp.len()];
        for (node, a, i) in self.system.dofs.free() {
            out[node][a] = self.vel[i];
        }
        out
    }

    /// Axial force of every member now (N, tension positive).
    pub fn member_forces(&self) -> Vec<f64> {
        self.model
            .members
            .iter()
            .map(|m| member_response(&self.model, m, &self.disp, &self.load.gravity).map_or(0.0, |r| r.force))
            .collect()
    }

    /// Number of times a cable went from taut to slack so far.
    pub fn slack_events(&self) -> usize {
        self.slack_events
    }

    /// Energy audit now.
    pub fn energy(&self) -> Energy {
        let kinetic = 0.5 * self.vel.iter().zip(&self.mass).map(|(v, m)| m * v * v).sum::<f64>();
        let strain = self
            .model
            .members
            .iter()
            .filter_map(|m| member_response(&self.model, m, &self.disp, &self.load.gravity).map(|r| r.energy))
            .sum();
        let load = -self.disp.iter().zip(&self.load.nodal).map(|(u, f)| f.dot(u)).sum::<f64>();
        let numerical = self.initial - (kinetic + strain + load) - self.damped;
        Energy {
            kinetic,
            strain,
            load,
            damped: self.damped,
            numerical,
        }
    }

    /// Advances by `interval` seconds in whole steps of `dt` (at least one); returns the
    /// number of steps taken.
    pub fn advance(&mut self, interval: f64) -> Result<usize, MotionError> {
        let steps = ((interval / self.settings.dt).round() as usize).max(1);
        for _ in 0..steps {
            self.step()?;
        }
        Ok(steps)
    }

    /// One time step.
    ///
    /// A step whose Newton iterations fail (a violent snap, a cable catching) is retried as two
    /// half steps, down to 1/64 of `dt`, before an error is returned.
    pub fn step(&mut self) -> Result<(), MotionError> {
        self.step_split(self.settings.dt, 0)
    }

    fn step_split(&mut self, dt: f64, depth: u32) -> Result<(), MotionError> {
        let saved = (self.disp.clone(), self.vel.clone(), self.acc.clone());
        match self.step_once(dt) {
            Ok(()) => Ok(()),
            Err(e) if depth >= 6 => Err(e),
            Err(_) => {
                (self.disp, self.vel, self.acc) = saved;
                self.step_split(0.5 * dt, depth + 1)?;
                self.step_split(0.5 * dt, depth + 1)
            }
        }
    }

    fn step_once(&mut self, dt: f64) -> Result<(), MotionError> {
        let v0 = self.vel.clone();
        match self.settings.scheme {
            Scheme::EnergyConserving => self.step_midpoint(dt)?,
            Scheme::GeneralizedAlpha { rho_inf } => self.step_alpha(dt, rho_inf.clamp(0.0, 1.0))?,
        }
        // Damping work with the mean velocity of the step (exact for the midpoint rule).
        let vm: Vec<f64> = v0.iter().zip(&self.vel).map(|(a, b)| 0.5 * (a + b)).collect();
        let cv = self.damping_times(&vm);
        self.damped += dt * vm.iter().zip(&cv).map(|(v, c)| v * c).sum::<f64>();
        self.time += dt;
        let slack = member_slack(&self.model, &self.disp, &self.load.gravity);
        self.slack_events += slack.iter().zip(&self.slack).filter(|(now, was)| **now && !**was).count();
        self.slack = slack;
        Ok(())
    }

    fn step_midpoint(&mut self, dt: f64) -> Result<(), MotionError> {
        let x0 = self.disp.clone();
        let v0 = self.vel.clone();
        let n = self.system.size();
        // Unknown: the step's increment Δ on free DOFs; predictor: constant velocity.
        let mut inc: Vec<f64> = v0.iter().map(|v| v * dt).collect();
        let (a0, a1) = self.settings.rayleigh;
        let mut prev_rel = f64::INFINITY;
        for it in 0..=self.settings.max_iterations {
            let mut x1 = x0.clone();
            self.system.add_scaled(&mut x1, &inc, 1.0);
            let v1: Vec<f64> = inc.iter().zip(&v0).map(|(d, v)| 2.0 * d / dt - v).collect();
            let vm: Vec<f64> = v1.iter().zip(&v0).map(|(a, b)| 0.5 * (a + b)).collect();
            let cvm = self.damping_times(&vm);
            let (g, scale) = discrete_gradient(&self.model, &self.system, &x0, &x1, &self.load.gravity);
            let mut r = vec![0.0; n];
            let mut rscale2 = 0.0;
            for (node, a, i) in self.system.dofs.free() {
                let inertia = self.mass[i] * (v1[i] - v0[i]) / dt;
                r[i] = inertia + cvm[i] + g[i] - self.load.nodal[node][a];
                rscale2 += inertia.powi(2) + self.load.nodal[node][a].powi(2) + scale[i].powi(2);
            }
            let rel = norm(&r) / rscale2.sqrt().max(1e-12);
            if rel <= self.settings.tolerance || n == 0 {
                self.disp = x1;
                self.vel = v1;
                return Ok(());
            }
            if it == self.settings.max_iterations {
                return Err(MotionError::NotConverged {
                    time: self.time,
                    residual: rel,
                });
            }
            // Jacobian ≈ 2M/Δt² + C/Δt + ½ K_T(x_mid), refactorised only when needed.
            let slow = rel > 0.25 * prev_rel;
            prev_rel = rel;
            let mid: Vec<Vec3> = x0.iter().zip(&x1).map(|(a, b)| (a + b) * 0.5).collect();
            let form = JacobianForm {
                stiffness: 0.5,
                k0: a1 / dt,
                mass: 2.0 / (dt * dt) + a0 / dt,
            };
            let delta = self.correction(&mid, form, dt, slow, r, rel)?;
            inc.iter_mut().zip(&delta).for_each(|(d, c)| *d -= c);
            let size = norm(&inc).max(1e-300);
            if rel <= 1e3 * self.settings.tolerance && norm(&delta) <= 1e-14 * size {
                // Converged to round-off: the residual cannot drop further.
                let mut x1 = x0.clone();
                self.system.add_scaled(&mut x1, &inc, 1.0);
                self.vel = inc.iter().zip(&v0).map(|(d, v)| 2.0 * d / dt - v).collect();
                self.disp = x1;
                return Ok(());
            }
        }
        unreachable!("loop returns")
    }

    fn step_alpha(&mut self, dt: f64, rho: f64) -> Result<(), MotionError> {
        let am = (2.0 * rho - 1.0) / (rho + 1.0);
        let af = rho / (rho + 1.0);
        let gamma = 0.5 - am + af;
        let beta = 0.25 * (1.0 - am + af).powi(2);
        let n = self.system.size();
        let x0 = self.disp.clone();
        let (v0, acc0) = (self.vel.clone(), self.acc.clone());
        let (a0r, a1r) = self.settings.rayleigh;
        let mut inc: Vec<f64> = v0.iter().map(|v| v * dt).collect();
        let mut prev_rel = f64::INFINITY;
        for it in 0..=self.settings.max_iterations {
            let dx = &inc;
            let acc1: Vec<f64> = (0..n)
                .map(|i| (dx[i] - dt * v0[i] - dt * dt * (0.5 - beta) * acc0[i]) / (beta * dt * dt))
                .collect();
            let v1: Vec<f64> = (0..n).map(|i| v0[i] + dt * ((1.0 - gamma) * acc0[i] + gamma * acc1[i])).collect();
            let mut xa = x0.clone();
            self.system.add_scaled(&mut xa, &inc, 1.0 - af);
            let va: Vec<f64> = (0..n).map(|i| af * v0[i] + (1.0 - af) * v1[i]).collect();
            let aa: Vec<f64> = (0..n).map(|i| am * acc0[i] + (1.0 - am) * acc1[i]).collect();
            let eval = self
                .system
                .evaluate(&self.model, &xa, &self.load, 1.0)
                .ok_or(MotionError::NotConverged {
                    time: self.time,
                    residual: f64::INFINITY,
                })?;
            let cv = self.damping_times(&va);
            let r: Vec<f64> = (0..n).map(|i| self.mass[i] * aa[i] + cv[i] + eval.residual[i]).collect();
            let inertia = norm(&(0..n).map(|i| self.mass[i] * aa[i]).collect::<Vec<_>>());
            let rel = norm(&r) / eval.scale.max(inertia).max(1e-12);
            if rel <= self.settings.tolerance || n == 0 {
                let mut x1 = x0.clone();
                self.system.add_scaled(&mut x1, &inc, 1.0);
                self.disp = x1;
                self.vel = v1;
                self.acc = acc1;
                return Ok(());
            }
            if it == self.settings.max_iterations {
                return Err(MotionError::NotConverged {
                    time: self.time,
                    residual: rel,
                });
            }
            let slow = rel > 0.25 * prev_rel;
            prev_rel = rel;
            let c = (1.0 - af) * gamma / (beta * dt);
            let form = JacobianForm {
                stiffness: 1.0 - af,
                k0: c * a1r,
                mass: (1.0 - am) / (beta * dt * dt) + c * a0r,
            };
            let delta = self.correction(&xa, form, dt, slow, r, rel)?;
            inc.iter_mut().zip(&delta).for_each(|(d, c)| *d -= c);
        }
        unreachable!("loop returns")
    }
}

/// Step Jacobian `stiffness · K_T(x) + k0 · K₀ + mass · M` as coefficients.
#[derive(Debug, Clone, Copy)]
struct JacobianForm {
    stiffness: f64,
    k0: f64,
    mass: f64,
}

impl Motion {
    /// Newton correction `J⁻¹ r` with `J` of `form` at `at`. The factorisation is reused across
    /// iterations and steps (modified Newton) and rebuilt when none exists for this step size
    /// or the last iteration was `slow`.
    fn correction(
        &mut self,
        at: &[Vec3],
        form: JacobianForm,
        dt: f64,
        slow: bool,
        mut r: Vec<f64>,
        rel: f64,
    ) -> Result<Vec<f64>, MotionError> {
        if slow || self.jacobian.as_ref().is_none_or(|(h, _)| *h != dt) {
            let mut jac: Vec<f64> = self
                .system
                .assemble(&self.model, at, &self.load.gravity, Part::Total)
                .iter()
                .map(|v| form.stiffness * v)
                .collect();
            if form.k0 != 0.0 {
                jac.iter_mut().zip(&self.k0).for_each(|(j, k)| *j += form.k0 * k);
            }
            let diag: Vec<f64> = self.mass.iter().map(|m| m * form.mass).collect();
            let factor = factor_shifted(&self.system, &jac, &diag).ok_or(MotionError::NotConverged {
                time: self.time,
                residual: rel,
            })?;
            self.jacobian = Some((dt, factor));
        }
        if let Some((_, f)) = &self.jacobian {
            f.solve_in_place(&mut r);
        }
        Ok(r)
    }
}

fn norm(v: &[f64]) -> f64 {
    v.iter().map(|x| x * x).sum::<f64>().sqrt()
}

fn member_slack(model: &Model, disp: &[Vec3], gravity: &Vec3) -> Vec<bool> {
    model
        .members
        .iter()
        .map(|m| member_response(model, m, disp, gravity).is_none_or(|r| r.slack))
        .collect()
}

/// Factorises `J + diag`, with `J` stored in the system's pattern.
fn factor_shifted(sys: &System, jac: &[f64], diag: &[f64]) -> Option<Factor> {
    let mut values = jac.to_vec();
    sys.add_to_diagonal(&mut values, diag);
    sys.factor(&values, 0.0).or_else(|| {
        let s = 1e-9 * sys.max_diagonal(&values);
        sys.factor(&values, s)
    })
}

/// Discrete gradient of the members' potential between displacements `x0` and `x1`, on free
/// DOFs, and a per-DOF force scale. A straight member's uses its energy as a function of
/// `q = L²`; a sagging cable's (whose potential depends on its chord and its height) is
/// Gonzalez's: the gradient at the mid-point corrected along the step so that its work is the
/// exact change of potential (Gonzalez 1996, *J. Nonlinear Sci.* 6; from memory).
fn discrete_gradient(model: &Model, sys: &System, x0: &[Vec3], x1: &[Vec3], gravity: &Vec3) -> (Vec<f64>, Vec<f64>) {
    let mut g = vec![Vec3::zeros(); x0.len()];
    let mut s = vec![Vec3::zeros(); x0.len()];
    for m in &model.members {
        let [a, b] = m.ends;
        if m.sags() && gravity.norm() > 0.0 {
            // The mean of the catenary's end forces along the step, by three-point
            // Gauss–Legendre quadrature: its work is the energy change to O(step⁶), with no
            // difference of nearly equal energies (which the closed form gives only to its
            // round-off, far too coarse for the small steps at the start of a release).
            const GAUSS: [(f64, f64); 3] = [
                (0.5 - 0.387_298_334_620_741_7, 5.0 / 18.0),
                (0.5, 8.0 / 18.0),
                (0.5 + 0.387_298_334_620_741_7, 5.0 / 18.0),
            ];
            let (mut fa, mut fb) = (Vec3::zeros(), Vec3::zeros());
            let mut at = x0.to_vec();
            let mut whole = true;
            for (t, w) in GAUSS {
                for k in [a, b] {
                    at[k] = x0[k] + (x1[k] - x0[k]) * t;
                }
                let Some(r) = member_response(model, m, &at, gravity) else {
                    whole = false;
                    break;
                };
                fa += r.end_a * w;
                fb += r.end_b * w;
            }
            if !whole {
                continue;
            }
            g[a] += fa;
            g[b] += fb;
            s[a] += fa.abs();
            s[b] += fb.abs();
            continue;
        }
        let d0 = member_vector(model, m, x0);
        let d1 = member_vector(model, m, x1);
        let (l0, l1) = (d0.norm(), d1.norm());
        // 2 (U(q1) − U(q0))/(q1 − q0) with q = L², q1 − q0 = (L1 − L0)(L1 + L0).
        let coef = 2.0 * m.kind.energy_slope(l0, l1) / (l0 + l1);
        let f = (d0 + d1) * (0.5 * coef);
        g[b] += f;
        g[a] -= f;
        s[b] += f.abs();
        s[a] += f.abs();
    }
    let mut out = vec![0.0; sys.size()];
    let mut scale = vec![0.0; sys.size()];
    for (node, k, i) in sys.dofs.free() {
        out[i] = g[node][k];
        scale[i] = s[node][k];
    }
    (out, scale)
}
