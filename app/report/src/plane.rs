//! The projection of a rig onto a drawing plane: which two axes a drawing shows, and the
//! plane chosen for a rig. The Rig view and the Sheet both draw through it.
//!
//! Geometry only: screen pixels belong to the Rig view, page points to the Sheet.

use rigwright_core::{Project, Vec3};

/// Which two axes a drawing of the rig shows (the Rig view, the Sheet).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Plane {
    /// x to the right, y up.
    Elevation,
    /// z to the right, y up.
    Side,
    /// x to the right, z down (seen from above).
    Plan,
}

impl Plane {
    pub const ALL: [Plane; 3] = [Plane::Elevation, Plane::Side, Plane::Plan];

    pub fn label(self) -> &'static str {
        match self {
            Plane::Elevation => "Elevation (x–y)",
            Plane::Side => "Side (z–y)",
            Plane::Plan => "Plan (x–z)",
        }
    }

    /// Screen-plane coordinates (u right, v up) of a point or vector.
    pub fn uv(self, p: &Vec3) -> [f64; 2] {
        match self {
            Plane::Elevation => [p.x, p.y],
            Plane::Side => [p.z, p.y],
            Plane::Plan => [p.x, -p.z],
        }
    }

    /// The point with screen-plane coordinates `uv` and the out-of-plane coordinate of `base`.
    pub fn from_uv(self, uv: [f64; 2], base: &Vec3) -> Vec3 {
        match self {
            Plane::Elevation => Vec3::new(uv[0], uv[1], base.z),
            Plane::Side => Vec3::new(base.x, uv[1], uv[0]),
            Plane::Plan => Vec3::new(uv[0], base.y, -uv[1]),
        }
    }

    /// (u fixed, v fixed) for a support's held axes.
    pub fn held(self, fixed: [bool; 3]) -> (bool, bool) {
        match self {
            Plane::Elevation => (fixed[0], fixed[1]),
            Plane::Side => (fixed[2], fixed[1]),
            Plane::Plan => (fixed[0], fixed[2]),
        }
    }

    /// Elevation for a planar rig; for a 3D rig the plane in which it spreads out most.
    pub fn for_project(project: &Project) -> Plane {
        let mut lo = [f64::INFINITY; 3];
        let mut hi = [f64::NEG_INFINITY; 3];
        for n in &project.nodes {
            for (k, v) in [n.at.0, n.at.1, n.at.2].into_iter().enumerate() {
                lo[k] = lo[k].min(v);
                hi[k] = hi[k].max(v);
            }
        }
        let e: Vec<f64> = (0..3).map(|k| (hi[k] - lo[k]).max(1e-6)).collect();
        if project.planar || project.nodes.is_empty() {
            Plane::Elevation
        } else if e[0] * e[2] > 1.5 * (e[0] * e[1]).max(e[2] * e[1]) {
            Plane::Plan
        } else if e[2] * e[1] > e[0] * e[1] {
            Plane::Side
        } else {
            Plane::Elevation
        }
    }
}
