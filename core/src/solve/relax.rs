//! Dynamic relaxation with kinetic damping: a start that needs no factorisation and cannot
//! stall at a zero pivot.
//!
//! The rig is given fictitious masses and let go under the full load; every time its kinetic
//! energy passes a peak the motion is stopped, so it creeps down the potential to a minimum
//! (Barnes, "Form finding and analysis of tension structures by dynamic relaxation", *Int. J.
//! Space Struct.* 14 (1999); Day 1965; from memory). With unit time step, explicit central
//! differences are stable when each fictitious mass exceeds a quarter of the largest tangent
//! eigenvalue it sees; a bound on the row sums of `|K_T|` (Gershgorin's, recomputed as the
//! members stretch) gives that with margin. It is slow to polish but robust far from the answer — a
//! chain drawn straight whose links are all slack, a net drawn flat — which is where Newton's
//! quadratic model is poor. Newton then finishes from the state it reaches.

use super::statics::Statics;
use super::system::{Loading, member_vector};
use crate::model::Vec3;

/// How relaxation ended.
pub(super) enum Relaxed {
    /// Reached the relative residual asked for.
    Close,
    /// Used its budget first; the state is the best reached.
    Budget,
    /// A node ran away.
    Runaway {
        node: usize,
        direction: Vec3,
    },
    Cancelled,
}

fn norm(v: &[f64]) -> f64 {
    v.iter().map(|x| x * x).sum::<f64>().sqrt()
}

impl Statics<'_> {
    /// Relaxes `u` under `lambda` × `load` until the relative residual is at most `target`,
    /// for at most `budget` explicit steps.
    pub(super) fn relax(&self, u: &mut [Vec3], load: &Loading, lambda: f64, target: f64, budget: usize) -> Relaxed {
        let model = self.model;
        let sys = &self.system;
        let n = sys.size();
        let limit = self.settings.runaway_factor * model.extent();
        let mut vel = vec![0.0; n];
        let mut mass = vec![0.0; n];
        let mut kinetic_before = 0.0;
        for step in 0..budget {
            if step % 64 == 0 {
                if self.cancelled() {
                    return Relaxed::Cancelled;
                }
                self.fictitious_masses(u, &load.gravity_at(lambda), &mut mass);
            }
            let Some(eval) = sys.evaluate(model, u, load, lambda) else {
                return Relaxed::Budget;
            };
            if norm(&eval.residual) <= target * eval.scale {
                return Relaxed::Close;
            }
            let mut kinetic = 0.0;
            for k in 0..n {
                vel[k] -= eval.residual[k] / mass[k];
                kinetic += 0.5 * mass[k] * vel[k] * vel[k];
            }
            if kinetic < kinetic_before {
                // Past a peak of kinetic energy: stop the motion where it was (near the peak).
                sys.add_scaled(u, &vel, -0.5);
                vel.iter_mut().for_each(|v| *v = 0.0);
                kinetic_before = 0.0;
                continue;
            }
            kinetic_before = kinetic;
            sys.add_scaled(u, &vel, 1.0);
            if let Some((node, d)) = u.iter().enumerate().max_by(|a, b| a.1.norm().total_cmp(&b.1.norm()))
                && d.norm() > limit
            {
                return Relaxed::Runaway { node, direction: *d };
            }
        }
        Relaxed::Budget
    }

    /// Fictitious mass per free DOF: a bound on the row sums of `|K_T|` that holds for every
    /// orientation of the members (`√3 k_a + 2|N|/L` per member end, each cable counted taut),
    /// so neither a member turning nor a slack cable becoming taut between updates can make a
    /// step unstable.
    fn fictitious_masses(&self, u: &[Vec3], gravity: &Vec3, mass: &mut [f64]) {
        let model = self.model;
        let sys = &self.system;
        let mut row = vec![0.0; u.len()];
        for m in &model.members {
            let [a, b] = m.ends;
            let l = member_vector(model, m, u).norm().max(1e-300);
            let force = super::system::member_response(model, m, u, gravity).map_or(0.0, |r| r.force);
            let g = force.abs() / l;
            // The element couples two nodes: each end's row sees the block twice.
            let s = 2.0 * (3f64.sqrt() * m.kind.rate() + 2.0 * g);
            row[a] += s;
            row[b] += s;
        }
        let floor = 1e-12 * self.rate_scale;
        for (node, _, k) in sys.dofs.free() {
            // Unit time step: stable for m ≥ λ_max/4; the bound gives λ_max ≤ row.
            mass[k] = (0.5 * row[node]).max(floor);
        }
    }
}

impl Statics<'_> {
    /// Paying out (under `lambda` × `load`): when cables are slack in the drawn geometry (a chain drawn straight, a net
    /// drawn flat with its cables longer than drawn), the rig is first solved with those cables
    /// installed tight — shortened to `(1 − δ)` of their drawn length, so it is a taut,
    /// stable net — and their unstressed lengths are then let out step by step to the real
    /// ones, each step a Newton solve from the last (a continuation in the unstressed lengths,
    /// as a rigger pays out rope). Returns the displacements at the real lengths, or `None`
    /// when no cable is slack, a step cannot be made or the iterations reach `cap` in all.
    pub(super) fn pay_out(&self, start: &[Vec3], load: &Loading, lambda: f64, cap: usize, total: &mut usize) -> Option<Vec<Vec3>> {
        use super::newton::Mode;
        use crate::element::MemberKind;
        let model = self.model;
        let slack: Vec<(usize, f64, f64)> = model
            .members
            .iter()
            .enumerate()
            .filter_map(|(i, m)| match m.kind {
                MemberKind::Cable { l0, .. } => {
                    let l = member_vector(model, m, start).norm();
                    (l <= l0 * (1.0 + 1e-9)).then_some((i, l * (1.0 - 1e-3), l0))
                }
                _ => None,
            })
            .collect();
        if slack.is_empty() {
            return None;
        }
        let at = |t: f64| -> crate::model::Model {
            let mut m = model.clone();
            for &(i, tight, real) in &slack {
                if let MemberKind::Cable { l0, .. } = &mut m.members[i].kind {
                    *l0 = tight + (real - tight) * t;
                }
            }
            m
        };
        let mut u = start.to_vec();
        let mut previous: Option<(Vec<Vec3>, f64)> = None;
        let mut t = 0.0;
        let mut dt: f64 = 0.05;
        let mut first = true;
        while t < 1.0 {
            if self.cancelled() || *total >= cap {
                return None;
            }
            let next = if first { 0.0 } else { (t + dt).min(1.0) };
            let m = at(next);
            let mut s = super::statics::Statics::holding_like(&m, self);
            s.settings = self.settings.clone();
            // Secant predictor from the last two states.
            let mut trial = u.clone();
            if let Some((p, tp)) = &previous {
                let f = (next - t) / (t - tp);
                for (x, (a, b)) in trial.iter_mut().zip(u.iter().zip(p)) {
                    *x = a + (a - b) * f;
                }
            }
            let before = *total;
            let ok = s.newton(&mut trial, load, lambda, Mode::Local { strict: false }, 25, total).is_ok();
            let used = *total - before;
            if ok {
                if !first {
                    previous = Some((u, t));
                    t = next;
                    dt *= if used <= 4 {
                        2.0
                    } else if used <= 8 {
                        1.25
                    } else {
                        0.7
                    };
                    dt = dt.min(0.5);
                }
                u = trial;
                first = false;
            } else if first {
                return None;
            } else {
                dt *= 0.25;
                if dt < 1e-7 {
                    return None;
                }
            }
        }
        Some(u)
    }
}
