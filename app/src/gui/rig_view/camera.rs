//! The Rig view's camera and interaction state: the model↔screen transform (pan, zoom, view
//! plane), fitting the rig into the canvas, the grid step and snapping, and what a drag is
//! doing.

use eframe::egui::{Pos2, Rect, Vec2, pos2, vec2};
use rigwright_core::{Project, Vec3};
use rigwright_report::plane::Plane;
use rigwright_report::units::{Quantity, Units};

pub(super) enum Drag {
    None,
    Pan,
    Node {
        index: usize,
        key: String,
    },
    Pull,
    /// Box selection from this screen point.
    Box {
        from: Pos2,
    },
}

/// Camera and interaction state of the Rig view.
pub struct RigView {
    pub plane: Plane,
    /// Model coordinates (u, v) at the centre of the canvas (m).
    pub(super) center: [f64; 2],
    /// Pixels per metre.
    pub(super) scale: f64,
    /// Canvas rectangle of the last frame.
    pub(super) rect: Rect,
    /// Fit the rig into the canvas on the next frame.
    pub fit_next: bool,
    pub(super) fit_frames: u8,
    /// First node picked by a member tool (document index).
    pub(super) member_start: Option<usize>,
    pub(super) drag: Drag,
    pub(super) serial: u64,
}

impl Default for RigView {
    fn default() -> Self {
        RigView {
            plane: Plane::Elevation,
            center: [0.0, 0.0],
            scale: 80.0,
            rect: Rect::from_min_size(Pos2::ZERO, vec2(800.0, 500.0)),
            fit_next: true,
            fit_frames: 0,
            member_start: None,
            drag: Drag::None,
            serial: 0,
        }
    }
}

impl RigView {
    /// Screen position of a model point.
    pub fn to_screen(&self, p: Vec3) -> Pos2 {
        let [u, v] = self.plane.uv(&p);
        let c = self.rect.center();
        pos2(
            c.x + ((u - self.center[0]) * self.scale) as f32,
            c.y - ((v - self.center[1]) * self.scale) as f32,
        )
    }

    /// Screen vector of a model vector scaled by `px_per_unit`.
    pub(super) fn dir(&self, v: &Vec3, px_per_unit: f64) -> Vec2 {
        let [u, w] = self.plane.uv(v);
        vec2((u * px_per_unit) as f32, -(w * px_per_unit) as f32)
    }

    pub(super) fn to_uv(&self, s: Pos2) -> [f64; 2] {
        let c = self.rect.center();
        [
            self.center[0] + (s.x - c.x) as f64 / self.scale,
            self.center[1] - (s.y - c.y) as f64 / self.scale,
        ]
    }

    /// Drops a half-made member and any drag.
    pub fn cancel(&mut self) {
        self.member_start = None;
        self.drag = Drag::None;
    }

    pub fn set_plane(&mut self, plane: Plane) {
        if plane != self.plane {
            self.plane = plane;
            self.fit_next = true;
        }
    }

    /// Elevation for a planar rig; for a 3D rig the view in which it spreads out most.
    pub fn choose_plane(&mut self, project: &Project) {
        self.plane = Plane::for_project(project);
        self.fit_next = true;
    }

    pub(super) fn fit(&mut self, points: &[Vec3]) {
        if points.is_empty() {
            self.center = [0.0, 0.0];
            self.scale = 80.0;
            return;
        }
        let mut lo = [f64::INFINITY; 2];
        let mut hi = [f64::NEG_INFINITY; 2];
        for p in points {
            let uv = self.plane.uv(p);
            for k in 0..2 {
                lo[k] = lo[k].min(uv[k]);
                hi[k] = hi[k].max(uv[k]);
            }
        }
        // Leave room for the banner (top), the legend (right) and the scale bar (bottom left).
        let inner = Rect::from_min_max(self.rect.min + vec2(100.0, 80.0), self.rect.max - vec2(290.0, 80.0));
        let w = (hi[0] - lo[0]).max(1e-3);
        let h = (hi[1] - lo[1]).max(1e-3);
        let sx = inner.width().max(50.0) as f64 / w;
        let sy = inner.height().max(50.0) as f64 / h;
        self.scale = sx.min(sy).clamp(1e-3, 1e7);
        if w < 1e-2 && h < 1e-2 {
            self.scale = 80.0;
        }
        let mid = [(lo[0] + hi[0]) / 2.0, (lo[1] + hi[1]) / 2.0];
        let off = inner.center() - self.rect.center();
        self.center = [mid[0] - off.x as f64 / self.scale, mid[1] + off.y as f64 / self.scale];
    }

    /// Grid step (m) and its value in display units: about 40 px, a 1-2-5 multiple of a power of ten.
    pub(super) fn grid_step(&self, units: Units) -> (f64, f64) {
        let unit_m = units.to_si(Quantity::Length, 1.0);
        let raw = 40.0 / (self.scale * unit_m);
        let step = nice_up(raw);
        (step * unit_m, step)
    }

    pub(super) fn snap(&self, uv: [f64; 2], units: Units, on: bool) -> [f64; 2] {
        if !on {
            return uv;
        }
        let (s, _) = self.grid_step(units);
        [(uv[0] / s).round() * s, (uv[1] / s).round() * s]
    }
}

/// Smallest 1, 2 or 5 × 10ⁿ at or above `x`.
fn nice_up(x: f64) -> f64 {
    let e = x.log10().floor();
    let b = 10f64.powf(e);
    for m in [1.0, 2.0, 5.0, 10.0] {
        if m * b >= x * (1.0 - 1e-9) {
            return m * b;
        }
    }
    10.0 * b
}

/// Largest 1, 2 or 5 × 10ⁿ at or below `x`.
pub(super) fn nice_down(x: f64) -> f64 {
    let e = x.log10().floor();
    let b = 10f64.powf(e);
    for m in [5.0, 2.0, 1.0] {
        if m * b <= x * (1.0 + 1e-9) {
            return m * b;
        }
    }
    b
}

pub(super) fn node_pos(p: &Project, i: usize) -> Vec3 {
    let a = p.nodes[i].at;
    Vec3::new(a.0, a.1, a.2)
}

impl RigView {
    pub(super) fn to_screen_uv(&self, uv: [f64; 2]) -> Pos2 {
        let c = self.rect.center();
        pos2(
            c.x + ((uv[0] - self.center[0]) * self.scale) as f32,
            c.y - ((uv[1] - self.center[1]) * self.scale) as f32,
        )
    }
}
