//! Pluck and Modes: the rig in motion.
//!
//! Responsible for running a Pluck (the nonlinear free vibration after a pulled node is let
//! go) in real time, animating one natural mode, drawing the moving rig on the Rig view and
//! the Pluck and Modes tabs of the Readouts. The mechanics — time integration, frequencies,
//! spectra — all come from `rigwright_core::dynamics`.

use std::sync::Arc;
use std::time::Instant;

use eframe::egui::{self, RichText};
use egui_plot::{Legend, Line, Plot, PlotPoints};
use rigwright_core::dynamics::{Modes, Motion, MotionSettings, modes, modes_watched, spectrum::spectrum};
use rigwright_core::{Equilibrium, Model, Statics, Vec3, Watch};

use super::RigApp;
use super::background::{BACKGROUND_DOF, Background, progress_row};
use super::palette as pal;
use rigwright_report::units::{Quantity, Units};

/// Longest history kept for the plots (samples).
const HISTORY: usize = 20_000;
/// Compute allowed per frame for time stepping (s), so the window stays responsive.
const FRAME_BUDGET: f64 = 0.030;

/// A Pluck in progress.
pub struct PluckSession {
    pub model: Arc<Model>,
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
        let about = eq.positions();
        let offset = start[node] - about[node];
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
        let motion =
            Motion::new(&model, case, &start, None, &about, MotionSettings { dt, ..Default::default() }).map_err(|e| e.to_string())?;
        let node_id = model.nodes[node].id.clone();
        let mut s = PluckSession {
            model,
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

/// Free degrees of freedom of `model` (cheap: no sparse analysis, unlike `Statics::new`).
fn free_dofs(model: &Model) -> usize {
    rigwright_core::solve::system::DofMap::new(model, None).count
}

/// The key of a model: its address, which changes with every edit.
pub fn model_key(model: &Model) -> usize {
    model as *const Model as usize
}

/// Prepares a Pluck released from `start` (the held shape of a Pull of `node`): the
/// equilibrium it vibrates about, found from the held shape, then the session.
pub fn prepare(model: Arc<Model>, case: usize, start: Vec<Vec3>, node: usize, watch: &Watch) -> Result<PluckSession, String> {
    let statics = Statics::new(&model).cancel_with(watch.flag());
    let about = match statics.solve(case, Some(&start)) {
        Ok(eq) if eq.stability.is_stable() => eq,
        Ok(eq) => return Err(eq.stability.describe()),
        Err(e) => return Err(e.to_string()),
    };
    PluckSession::start(model, case, &about, start, node, watch)
}

/// Starts a Pluck: at once on a small rig, on another thread on a large one (the Pluck tab
/// shows it being prepared, with a Cancel button).
pub fn begin(app: &mut RigApp, model: Arc<Model>, start: Vec<Vec3>, node: usize) {
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

/// Natural modes of the current equilibrium, and the one being animated.
/// Modes being computed on another thread, keyed like [`ModesState`].
pub type ModesJob = Background<(usize, usize), Result<Modes, String>>;

pub struct ModesState {
    /// Which solve the modes belong to (model pointer and case).
    pub key: (usize, usize),
    pub result: Result<Modes, String>,
    pub animate: Option<usize>,
    /// Animation clock (s).
    pub clock: f64,
    /// The computation was cancelled by the user (no result; offer to compute again).
    pub cancelled: bool,
}

/// Computes the modes of the current answer if they are missing or stale: at once for small
/// rigs, on another thread for large ones (the window keeps running meanwhile).
pub fn refresh_modes(app: &mut RigApp) {
    let Some(a) = app.answer() else {
        app.modes = None;
        app.modes_job = None;
        return;
    };
    let key = (model_key(a.model), app.case);
    if app.modes.as_ref().is_some_and(|m| m.key == key) {
        return;
    }
    let done = |result| ModesState {
        key,
        result,
        animate: None,
        clock: 0.0,
        cancelled: false,
    };
    if let Some(job) = app.modes_job.as_ref().filter(|j| j.key == key) {
        if let Some(r) = job.poll() {
            app.modes = Some(done(r.and_then(|r| r)));
            app.modes_job = None;
        }
        return;
    }
    if free_dofs(a.model) <= BACKGROUND_DOF {
        let result = modes(&Statics::new(a.model), a.eq, 12).map_err(|e| e.to_string());
        app.modes = Some(done(result));
        return;
    }
    let (Some(model), eq) = (app.solved.as_ref().map(|s| s.model.clone()), a.eq.clone()) else {
        return;
    };
    app.modes = None;
    app.modes_job = Some(Background::spawn(key, move |watch| {
        let statics = Statics::new(&model);
        modes_watched(&statics, &eq, 12, &watch).map_err(|e| e.to_string())
    }));
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

/// The Pluck tab of the Readouts.
pub fn pluck_ui(app: &mut RigApp, ui: &mut egui::Ui) {
    let units = app.settings.units;
    if let Some(job) = &app.pluck_job {
        let text = format!(
            "Preparing the Pluck of this large rig (the equilibrium it vibrates about and its lowest mode)… {:.1} s",
            job.started.elapsed().as_secs_f64()
        );
        if progress_row(ui, text, "Do not start this Pluck") {
            app.pluck_job = None;
        }
        return;
    }
    let Some(p) = app.pluck.as_mut() else {
        ui.label("No Pluck running. Choose the Pull tool, drag a free node and let go: the rig vibrates from where you released it.");
        return;
    };
    let mut stop = false;
    ui.horizontal(|ui| {
        let label = if p.playing { "Pause" } else { "Play" };
        if ui.button(label).on_hover_text("Pause or resume the motion").clicked() {
            p.playing = !p.playing;
        }
        ui.label("Speed");
        ui.add(egui::Slider::new(&mut p.speed, 0.05..=2.0).logarithmic(true).suffix(" ×"))
            .on_hover_text("Rig seconds per second of wall-clock time");
        if ui
            .button("Stop")
            .on_hover_text("End the Pluck and show the equilibrium again")
            .clicked()
        {
            stop = true;
        }
    });
    ui.separator();
    ui.columns(2, |cols| {
        let ui = &mut cols[0];
        ui.label(RichText::new(format!("Pluck of `{}`", p.node_id)).strong());
        ui.label(format!("time {:.3} s, step {:.2e} s", p.motion.time(), p.motion.settings().dt));
        match p.dominant_hz {
            Some(f) => ui.label(format!("dominant frequency {f:.3} Hz")),
            None => ui.label("dominant frequency: needs a longer record"),
        };
        if let Some(f) = p.linear_hz {
            ui.label(format!("lowest linear natural frequency {f:.3} Hz"));
        }
        let e = p.motion.energy();
        ui.label(format!(
            "kinetic {}, strain + load {}",
            joules(e.kinetic),
            joules(e.strain + e.load)
        ));
        ui.label(format!("energy error {:.1e} of the energy in play", p.energy_error));
        ui.label(format!("cable slack events {}", p.motion.slack_events()));
        let u = p.motion.positions()[p.node] - p.about[p.node];
        ui.label(format!(
            "displacement of `{}` {}",
            p.node_id,
            units.show(Quantity::Length, u.norm())
        ));
        if let Some(f) = &p.failure {
            ui.colored_label(pal::ALARM, format!("stopped: {f}"));
        }
        let ui = &mut cols[1];
        let pts: Vec<[f64; 2]> = p.history.iter().map(|h| [h[0], units.to_display(Quantity::Length, h[1])]).collect();
        Plot::new("pluck-history")
            .legend(Legend::default())
            .x_axis_label("time (s)")
            .y_axis_label(format!("displacement along the pull ({})", units.symbol(Quantity::Length)))
            .show(ui, |plot| {
                plot.line(Line::new(format!("`{}`", p.node_id), PlotPoints::from(pts)).color(pal::PULL))
            });
    });
    if stop {
        app.pluck = None;
    }
}

fn joules(e: f64) -> String {
    format!("{} J", rigwright_report::units::significant(e, 4))
}

/// The Modes tab of the Readouts.
pub fn modes_ui(app: &mut RigApp, ui: &mut egui::Ui) {
    refresh_modes(app);
    let units: Units = app.settings.units;
    if let Some(job) = &app.modes_job {
        let key = job.key;
        let text = format!(
            "Computing the natural modes of this large rig… {:.1} s, {} Lanczos blocks",
            job.started.elapsed().as_secs_f64(),
            job.steps_done()
        );
        if progress_row(ui, text, "Stop computing the modes") {
            app.modes_job = None;
            app.modes = Some(ModesState {
                key,
                result: Err("cancelled".into()),
                animate: None,
                clock: 0.0,
                cancelled: true,
            });
        }
        return;
    }
    let Some(state) = app.modes.as_mut() else {
        ui.label("No stable equilibrium: natural frequencies exist only about a stable state.");
        return;
    };
    if state.cancelled {
        ui.horizontal(|ui| {
            ui.label("The computation of the natural modes was cancelled.");
            if ui
                .button("Compute the modes")
                .on_hover_text("Start computing the modes again")
                .clicked()
            {
                app.modes = None;
            }
        });
        return;
    }
    let list = match &state.result {
        Ok(m) => m,
        Err(e) => {
            ui.colored_label(pal::ALARM, e);
            return;
        }
    };
    let mass_unit = units.symbol(Quantity::Mass);
    let mut choice = state.animate;
    egui::ScrollArea::vertical().show(ui, |ui| {
        egui::Grid::new("modes-table").striped(true).show(ui, |ui| {
            for h in [
                "mode",
                "frequency (Hz)",
                "period (s)",
                &format!("effective mass x, y, z ({mass_unit})"),
                "",
            ] {
                ui.label(RichText::new(h).strong());
            }
            ui.end_row();
            for (k, m) in list.modes.iter().enumerate() {
                ui.label(format!("{}", k + 1));
                ui.label(format!("{:.4}", m.frequency_hz));
                ui.label(format!("{:.5}", m.period_s));
                let em = m.effective_mass.map(|v| units.to_display(Quantity::Mass, v));
                ui.label(format!("{:.2}, {:.2}, {:.2}", em[0], em[1], em[2]));
                let on = choice == Some(k);
                if ui
                    .selectable_label(on, if on { "Animating" } else { "Animate" })
                    .on_hover_text("Show this mode shape moving on the Rig view")
                    .clicked()
                {
                    choice = if on { None } else { Some(k) };
                }
                ui.end_row();
            }
        });
    });
    if choice != state.animate {
        state.animate = choice;
        state.clock = 0.0;
    }
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
        let start = held_eq.positions();
        begin(self, model, start, node);
    }
}
