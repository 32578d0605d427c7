//! Pluck as a whole: pull a node, release it, record the motion, and the amplitude–frequency
//! (backbone) curve from plucks of growing amplitude.

use serde::Serialize;

use super::motion::{Energy, Motion, MotionError, MotionSettings};
use super::spectrum::spectrum;
use super::subdivide::{CableLinks, pluck_rig};
use crate::model::{Model, Vec3};
use crate::solve::{Equilibrium, SolveError, Statics};

/// Why a Pluck could not run.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum PluckError {
    #[error("could not hold the pulled node: {0}")]
    Pull(#[from] SolveError),
    #[error("{0}")]
    Motion(#[from] MotionError),
}

/// Time histories of a Pluck, sampled every `sample_interval` seconds.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Record {
    /// Sampling interval (s).
    pub sample_interval: f64,
    /// Sample times (s).
    pub time: Vec<f64>,
    /// Displacement of the plucked node from its equilibrium position (m).
    pub displacement: Vec<Vec3>,
    /// Axial force history of each member (N), indexed `[member][sample]`.
    pub member_force: Vec<Vec<f64>>,
    /// Energy audit at each sample (J).
    pub energy: Vec<Energy>,
    /// Cable slack events over the whole run.
    pub slack_events: usize,
}

impl Record {
    /// Dominant frequency (Hz) of the plucked node's motion along unit direction `d`.
    pub fn dominant_frequency(&self, d: &Vec3) -> Option<f64> {
        let s: Vec<f64> = self.displacement.iter().map(|u| u.dot(d)).collect();
        spectrum(&s, self.sample_interval).dominant
    }

    /// Largest energy not accounted for by physical damping, relative to the largest energy
    /// in play: the energy error of the energy-conserving scheme, or the numerical
    /// dissipation of generalized-α.
    pub fn energy_error(&self) -> f64 {
        let scale = self
            .energy
            .iter()
            .map(|e| e.kinetic.abs() + e.strain.abs() + e.load.abs())
            .fold(0.0, f64::max)
            .max(1e-300);
        self.energy.iter().map(|e| e.numerical.abs()).fold(0.0, f64::max) / scale
    }
}

/// Positions of the rig with `node` pulled by `offset` (m) from equilibrium `eq` and held.
pub fn pulled_positions(model: &Model, case: usize, eq: &Equilibrium, node: usize, offset: Vec3) -> Result<Vec<Vec3>, SolveError> {
    let statics = Statics::holding(model, node);
    let at = eq.nodes[node].position + offset;
    let held = statics.solve_held(case, at, Some(&eq.into()))?;
    if !held.stability.is_stable() {
        return Err(SolveError::NotStable(held.stability.describe()));
    }
    Ok(held.positions())
}

/// Runs `motion` for `duration` seconds, sampling at most `max_samples` times, and records
/// node `node`'s displacement from `about` (m).
pub fn record(
    motion: &mut Motion,
    model: &Model,
    node: usize,
    about: Vec3,
    duration: f64,
    max_samples: usize,
) -> Result<Record, MotionError> {
    let dt = motion.settings().dt;
    let total_steps = (duration / dt).round().max(1.0) as usize;
    let every = total_steps.div_ceil(max_samples.max(2)).max(1);
    let mut rec = Record {
        sample_interval: dt * every as f64,
        time: Vec::new(),
        displacement: Vec::new(),
        member_force: vec![Vec::new(); model.members.len()],
        energy: Vec::new(),
        slack_events: 0,
    };
    let about = about - model.nodes[node].position;
    let sample = |m: &Motion, rec: &mut Record| {
        rec.time.push(m.time());
        rec.displacement.push(m.displacements()[node] - about);
        for (h, f) in rec.member_force.iter_mut().zip(m.member_forces()) {
            h.push(f);
        }
        rec.energy.push(m.energy());
    };
    sample(motion, &mut rec);
    for k in 1..=total_steps {
        motion.step()?;
        if k % every == 0 {
            sample(motion, &mut rec);
        }
    }
    rec.slack_events = motion.slack_events();
    Ok(rec)
}

/// One point of the backbone curve.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct BackbonePoint {
    /// Pull offset (m) along the chosen direction.
    pub amplitude: f64,
    /// Dominant frequency of the free vibration (Hz), if one was found.
    pub frequency_hz: Option<f64>,
}

/// What to pluck and how long to watch.
#[derive(Debug, Clone, PartialEq)]
pub struct PluckSpec {
    /// Load case index.
    pub case: usize,
    /// Plucked node index.
    pub node: usize,
    /// Unit direction of the pull.
    pub direction: Vec3,
    /// Length of each run (s).
    pub duration: f64,
    pub settings: MotionSettings,
}

/// Frequencies of plucks of growing `amplitudes` (m) from equilibrium `eq`, sagging cables cut
/// into links ([`pluck_rig`]).
pub fn backbone(model: &Model, eq: &Equilibrium, spec: &PluckSpec, amplitudes: &[f64]) -> Result<Vec<BackbonePoint>, PluckError> {
    let about = eq.positions();
    amplitudes
        .iter()
        .map(|&a| {
            let start = pulled_positions(model, spec.case, eq, spec.node, spec.direction * a)?;
            let rig = pluck_rig(model, spec.case, eq, &start, spec.node, CableLinks::Auto)?;
            let mut motion = Motion::new(&rig.model, spec.case, &rig.start, None, &rig.about, spec.settings.clone())?;
            let rec = record(&mut motion, &rig.model, spec.node, about[spec.node], spec.duration, 20_000)?;
            Ok(BackbonePoint {
                amplitude: a,
                frequency_hz: rec.dominant_frequency(&spec.direction),
            })
        })
        .collect()
}
