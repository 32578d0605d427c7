//! Pluck: the rig in motion.
//!
//! Responsible for running a Pluck (the nonlinear free vibration after a pulled node is let
//! go) in real time and for the clock of an animated mode; the positions the Rig view draws
//! while either moves. The mechanics — time integration, frequencies, spectra — all come
//! from `rigwright_core::dynamics`. Drawn by `rig_view/moving.rs`, tabulated by the Pluck
//! and Modes tabs of the Readouts.

use std::sync::Arc;
use std::time::Instant;

use rigwright_core::dynamics::subdivide::pluck_rig;
use rigwright_core::dynamics::{CableLinks, Motion, MotionSettings, modes_watched, spectrum::spectrum};
use rigwright_core::{Equilibrium, Model, Statics, Vec3, Warm, Watch};

use super::RigApp;
use super::background::{BACKGROUND_DOF, Background, free_dofs, model_key};

/// Longest history kept for the plots (samples).
const HISTORY: usize = 20_000;

/// Compute allowed per frame for time stepping (s), so the window stays responsive.
const FRAME_BUDGET: f64 = 0.030;

/// A Pluck in progress.
pub struct PluckSession {
    /// The rig plucked (an edit to it ends the Pluck).
    pub model: Arc<Model>,
    /// The rig in motion: the rig itself, or with its sagging cables cut into links (their
    /// joints after its `original_nodes` nodes).
    pub rig: Arc<Model>,
    pub original_nodes: usize,
    /// Sagging cables cut into links, and how many.
    pub cables: Vec<(String, usize)>,
    /// Why the cables were left whole, when they were.
    pub note: Option<String>,
    pub node: usize,
    pub node_id: String,
    /// Unit direction of the pull, for the displacement history.
    pub direction: Vec3,
    /// Equilibrium positions the rig vibrates about (m).
    pub about: Vec<Vec3>,
    pub motion: Motion,
    pub playing: bool,
    /// Rig seconds per wall-clock second.
    pub speed: f64,
    /// Rig time not yet stepped (s).
    debt: f64,
    /// (time s, displacement along the pull m).
    pub history: Vec<[f64; 2]>,
    /// (time s, kinetic, strain + load potential J).
    pub energy: Vec<[f64; 3]>,
    /// Lowest linear natural frequency about the equilibrium (Hz).
    pub linear_hz: Option<f64>,
    /// Dominant frequency of the motion so far (Hz).
    pub dominant_hz: Option<f64>,
    pub failure: Option<String>,
    /// Energy error relative to the energy in play.
    pub energy_error: f64,
    /// Rig time of the last spectrum (s).
    spectrum_at: f64,
}

impl PluckSession {
    /// Starts the motion from `start` (positions of the pulled, held rig) about `eq`.
    pub fn start(model: Arc<Model>, case: usize, eq: &Equilibrium, start: Vec<Vec3>, node: usize, watch: &Watch) -> Result<Self, String> {
        let offset = start[node] - eq.positions()[node];
        let direction = if offset.norm() > 0.0 { offset.normalize() } else { Vec3::y() };
        let statics = Statics::new(&model);
        let linear = modes_watched(&statics, eq, 1, watch)
            .ok()
            .and_then(|m| m.modes.first().map(|m| (m.frequency_hz, m.period_s)));
        // Step: 1/100 of the lowest period, at most 2 ms.
        let dt = linear.map(|(_, t)| t / 100.0).unwrap_or(1e-3).min(2e-3);
        if watch.stopped() {
            return Err("cancelled".into());
        }
        // Sagging cables cut into links so that their own mass moves (drawn link by link).
        let rig = pluck_rig(&model, case, eq, &start, node, CableLinks::Auto).map_err(|e| e.to_string())?;
        let original_nodes = model.nodes.len();
        let motion = Motion::new(
            &rig.model,
            case,
            &rig.start,
            None,
            &rig.about,
            MotionSettings { dt, ..Default::default() },
        )
        .map_err(|e| e.to_string())?;
        let node_id = model.nodes[node].id.clone();
        let cables = rig.cables.iter().map(|c| (c.member.clone(), c.links)).collect();
        let about = rig.about;
        let note = rig.note;
        let mut s = PluckSession {
            note,
            rig: if rig.cables.is_empty() {
                model.clone()
            } else {
                Arc::new(rig.model)
            },
            model,
            original_nodes,
            cables,
            node,
            node_id,
            direction,
            about,
            motion,
            playing: true,
            speed: 1.0,
            debt: 0.0,
            history: Vec::new(),
            energy: Vec::new(),
            linear_hz: linear.map(|(f, _)| f),
            dominant_hz: None,
            failure: None,
            energy_error: 0.0,
            spectrum_at: 0.0,
        };
        s.sample();
        Ok(s)
    }

    fn sample(&mut self) {
        let u = self.motion.positions()[self.node] - self.about[self.node];
        let e = self.motion.energy();
        let t = self.motion.time();
        self.history.push([t, u.dot(&self.direction)]);
        self.energy.push([t, e.kinetic, e.strain + e.load]);
        if self.history.len() > HISTORY {
            self.history.drain(..HISTORY / 4);
            self.energy.drain(..HISTORY / 4);
        }
        let scale = (e.kinetic.abs() + e.strain.abs() + e.load.abs()).max(1e-300);
        self.energy_error = self.energy_error.max(e.numerical.abs() / scale);
    }

    /// Advances by `wall` seconds of wall-clock time (times the speed), within the frame budget.
    pub fn tick(&mut self, wall: f64) {
        if !self.playing || self.failure.is_some() {
            return;
        }
        let dt = self.motion.settings().dt;
        self.debt = (self.debt + wall.min(0.1) * self.speed).min(0.25);
        let began = Instant::now();
        while self.debt >= dt {
            if let Err(e) = self.motion.step() {
                self.failure = Some(e.to_string());
                self.playing = false;
                return;
            }
            self.debt -= dt;
            self.sample();
            if began.elapsed().as_secs_f64() > FRAME_BUDGET {
                // Slower than real time: drop the backlog rather than freeze.
                self.debt = 0.0;
                break;
            }
        }
        let n = self.history.len();
        // Refresh the spectrum about twice a second of rig time.
        if n > 64 && self.motion.time() - self.spectrum_at >= 0.5 {
            self.spectrum_at = self.motion.time();
            let s: Vec<f64> = self.history.iter().map(|h| h[1]).collect();
            let dt_s = (self.history[n - 1][0] - self.history[0][0]) / (n - 1) as f64;
            self.dominant_hz = spectrum(&s, dt_s).dominant;
        }
    }
}

/// A Pluck being prepared on another thread (large rigs), keyed by the model and load case it
/// belongs to.
pub type PluckJob = Background<(usize, usize), Result<PluckSession, String>>;

/// Prepares a Pluck released from `start` (the held shape of a Pull of `node`): the
/// equilibrium it vibrates about, found from the held shape, then the session.
pub fn prepare(model: Arc<Model>, case: usize, start: Warm, node: usize, watch: &Watch) -> Result<PluckSession, String> {
    let statics = Statics::new(&model).cancel_with(watch.flag());
    let about = match statics.solve(case, Some(&start)) {
        Ok(eq) if eq.stability.is_stable() => eq,
        Ok(eq) => return Err(eq.stability.describe()),
        Err(e) => return Err(e.to_string()),
    };
    PluckSession::start(model, case, &about, start.positions, node, watch)
}

/// Starts a Pluck: at once on a small rig, on another thread on a large one (the Pluck tab
/// shows it being prepared, with a Cancel button).
pub fn begin(app: &mut RigApp, model: Arc<Model>, start: Warm, node: usize) {
    let case = app.case;
    app.pluck = None;
    app.pluck_job = None;
    app.readout_tab = super::ReadoutTab::Pluck;
    if free_dofs(&model) <= BACKGROUND_DOF {
        match prepare(model, case, start, node, &Watch::new()) {
            Ok(session) => app.pluck = Some(session),
            Err(e) => app.message = Some((format!("Pluck: {e}"), true)),
        }
        return;
    }
    let key = (model_key(&model), case);
    app.pluck_job = Some(Background::spawn(key, move |watch| prepare(model, case, start, node, &watch)));
}

/// Positions to draw in place of the static answer, with member forces if known.
pub fn moving_positions(app: &RigApp) -> Option<(Vec<Vec3>, Option<Vec<f64>>)> {
    if let Some(p) = &app.pluck {
        return Some((p.motion.positions().to_vec(), Some(p.motion.member_forces())));
    }
    let m = app.modes.as_ref()?;
    let k = m.animate?;
    let a = app.answer()?;
    let mode = m.result.as_ref().ok()?.modes.get(k)?;
    // Largest node motion: 8 % of the rig's size, at the mode's own frequency slowed to ≤ 1 Hz.
    let peak = mode.shape.iter().map(|v| v.norm()).fold(0.0, f64::max).max(1e-300);
    let amp = 0.08 * a.model.extent() / peak;
    let shown_hz = mode.frequency_hz.min(1.0);
    let s = (std::f64::consts::TAU * shown_hz * m.clock).sin() * amp;
    Some((a.eq.nodes.iter().zip(&mode.shape).map(|(n, v)| n.position + v * s).collect(), None))
}

/// Advances Pluck and mode animation clocks; returns true when the view must keep repainting.
pub fn tick(app: &mut RigApp, wall: f64) -> bool {
    // An edit ends the Pluck: the motion belongs to the rig as it was.
    if app.pluck.as_ref().is_some_and(|p| !Arc::ptr_eq(&p.model, &app.doc.model)) {
        app.pluck = None;
    }
    let mut moving = false;
    if let Some(job) = &app.pluck_job {
        if job.key != (model_key(&app.doc.model), app.case) {
            // Edited or another load case meanwhile: the Pluck belonged to the rig as it was.
            app.pluck_job = None;
        } else if let Some(r) = job.poll() {
            app.pluck_job = None;
            match r.and_then(|r| r) {
                Ok(session) => app.pluck = Some(session),
                Err(e) => app.message = Some((format!("Pluck: {e}"), true)),
            }
        } else {
            moving = true;
        }
    }
    if let Some(p) = app.pluck.as_mut() {
        p.tick(wall);
        moving |= p.playing;
    }
    if let Some(m) = app.modes.as_mut()
        && m.animate.is_some()
    {
        m.clock += wall;
        moving = true;
    }
    moving
}

impl RigApp {
    /// Starts a Pluck from the held shape of the Pull that was just let go.
    pub(super) fn start_pluck(&mut self) {
        let Some(pull) = self.pull.as_ref() else { return };
        let Some(held) = self.solved.as_ref().filter(|o| Arc::ptr_eq(&o.model, &pull.model)) else {
            return;
        };
        let Ok(held_eq) = held.result.as_ref() else { return };
        if held_eq.hold.is_none() || !held_eq.stability.is_stable() {
            return;
        }
        let (model, node) = (pull.model.clone(), pull.node);
        let start = Warm::from(held_eq);
        begin(self, model, start, node);
    }
}
