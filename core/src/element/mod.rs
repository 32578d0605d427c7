//! Force laws of the member kinds and their tangent stiffness.
//!
//! Every member is a pin-ended two-force member between nodes `a` and `b`. With current
//! length `L = |x_b − x_a|` and unit vector `ê = (x_b − x_a)/L`, its strain energy `U(L)`
//! depends on `L` alone, so the axial force is `N = dU/dL` (tension positive) and the nodal
//! internal forces are `−N ê` at `a` and `+N ê` at `b`.
//!
//! Differentiating once more gives the 3×3 tangent block
//!
//! ```text
//! K = k_a ê êᵀ + (N/L)(I − ê êᵀ),   element matrix [K −K; −K K]
//! ```
//!
//! with `k_a = d²U/dL²`. The first term is the elastic stiffness, the second the geometric
//! stiffness: tension stiffens the member against rotation, compression softens it
//! (Crisfield, *Non-linear Finite Element Analysis of Solids and Structures*, vol. 1, ch. 3).
//!
//! Strain is engineering strain `ε = (L − L0)/L0`, so a cable or strut has
//! `N = EA (L − L0)/L0` and a spring `N = k (L − L0)`. A cable is slack, carries nothing and
//! adds no stiffness when `L ≤ L0`.

pub mod catenary;
pub mod response;

use nalgebra::Matrix3;
use serde::{Deserialize, Serialize};

/// The force law of a member, with its unstressed length resolved.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum MemberKind {
    /// Tension only; `ea` (N) axial stiffness, `l0` (m) unstressed length.
    Cable { ea: f64, l0: f64 },
    /// Tension and compression; `k` (N/m) rate, `l0` (m) free length (may be 0).
    Spring { k: f64, l0: f64 },
    /// Bar in tension and compression; `ea` (N), `l0` (m).
    Strut { ea: f64, l0: f64 },
}

/// The three member classes, as named in files, tables and JSON.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum MemberClass {
    Cable,
    Spring,
    Strut,
}

impl MemberClass {
    /// Lower-case name used in tables and JSON.
    pub fn name(self) -> &'static str {
        match self {
            MemberClass::Cable => "cable",
            MemberClass::Spring => "spring",
            MemberClass::Strut => "strut",
        }
    }
}

/// Axial state of a member at a given current length.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MemberState {
    /// Axial force N (N), tension positive.
    pub force: f64,
    /// Axial tangent `k_a = dN/dL` (N/m); zero for a slack cable.
    pub axial_stiffness: f64,
    /// Strain energy U (J).
    pub energy: f64,
    /// True for a cable with `L ≤ L0`.
    pub slack: bool,
}

impl MemberKind {
    /// Unstressed (or free) length `L0` (m).
    pub fn rest_length(&self) -> f64 {
        match *self {
            MemberKind::Cable { l0, .. } | MemberKind::Spring { l0, .. } | MemberKind::Strut { l0, .. } => l0,
        }
    }

    /// Class of the member.
    pub fn class(&self) -> MemberClass {
        match self {
            MemberKind::Cable { .. } => MemberClass::Cable,
            MemberKind::Spring { .. } => MemberClass::Spring,
            MemberKind::Strut { .. } => MemberClass::Strut,
        }
    }

    /// Axial rate `EA/L0` or `k` (N/m) when the member is active.
    pub fn rate(&self) -> f64 {
        match *self {
            MemberKind::Cable { ea, l0 } | MemberKind::Strut { ea, l0 } => ea / l0,
            MemberKind::Spring { k, .. } => k,
        }
    }

    /// Force, axial tangent and energy at current length `l` (m).
    pub fn state(&self, l: f64) -> MemberState {
        let l0 = self.rest_length();
        let k = self.rate();
        let stretch = l - l0;
        let slack = matches!(self, MemberKind::Cable { .. }) && stretch <= 0.0;
        if slack {
            return MemberState {
                force: 0.0,
                axial_stiffness: 0.0,
                energy: 0.0,
                slack: true,
            };
        }
        MemberState {
            force: k * stretch,
            axial_stiffness: k,
            energy: 0.5 * k * stretch * stretch,
            slack: false,
        }
    }

    /// Secant slope of the strain energy between lengths `la` and `lb` (m):
    /// `(U(lb) − U(la)) / (lb − la)` (N), evaluated without cancellation; equals the force
    /// `N` when `la = lb`. For `U = ½k(L − L0)²` it is `½k(la + lb − 2L0)`.
    pub fn energy_slope(&self, la: f64, lb: f64) -> f64 {
        let l0 = self.rest_length();
        let k = self.rate();
        let cable = matches!(self, MemberKind::Cable { .. });
        let (lo, hi) = if la <= lb { (la, lb) } else { (lb, la) };
        if !cable || lo >= l0 {
            0.5 * k * (la + lb - 2.0 * l0)
        } else if hi <= l0 {
            0.0
        } else {
            // Slack at `lo`, taut at `hi`.
            0.5 * k * (hi - l0).powi(2) / (hi - lo)
        }
    }

    /// Elastic and geometric 3×3 tangent blocks `(k_a ê êᵀ, (N/L)(I − ê êᵀ))` for unit
    /// vector `e` and current length `l`.
    pub fn tangent_blocks(&self, e: &nalgebra::Vector3<f64>, l: f64) -> (Matrix3<f64>, Matrix3<f64>) {
        let s = self.state(l);
        let eet = e * e.transpose();
        let elastic = eet * s.axial_stiffness;
        let geometric = (Matrix3::identity() - eet) * (s.force / l);
        (elastic, geometric)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use nalgebra::Vector3;

    /// Internal force on end b as a function of the end positions: N(L) ê.
    fn end_force(kind: &MemberKind, xa: Vector3<f64>, xb: Vector3<f64>) -> Vector3<f64> {
        let d = xb - xa;
        let l = d.norm();
        d / l * kind.state(l).force
    }

    /// The analytic tangent must equal a central finite-difference Jacobian of the end force
    /// (the standard check of a consistent linearisation, common practice).
    #[test]
    fn analytic_tangent_matches_central_differences_for_every_kind() {
        let kinds = [
            MemberKind::Cable { ea: 2.0e6, l0: 1.9 },
            MemberKind::Spring { k: 3.0e3, l0: 0.7 },
            MemberKind::Spring { k: 3.0e3, l0: 2.6 },
            MemberKind::Strut { ea: 5.0e7, l0: 2.05 },
        ];
        let xa = Vector3::new(0.1, -0.2, 0.3);
        let xb = Vector3::new(1.3, 1.1, -0.4);
        for kind in kinds {
            let l = (xb - xa).norm();
            let e = (xb - xa) / l;
            let (ke, kg) = kind.tangent_blocks(&e, l);
            let k = ke + kg;
            let h = 1e-6;
            for j in 0..3 {
                let mut dp = xb;
                let mut dm = xb;
                dp[j] += h;
                dm[j] -= h;
                let col = (end_force(&kind, xa, dp) - end_force(&kind, xa, dm)) / (2.0 * h);
                for i in 0..3 {
                    let scale = k.abs().max().max(1.0);
                    assert!(
                        (col[i] - k[(i, j)]).abs() < 1e-6 * scale,
                        "{kind:?} ({i},{j}): fd {} vs {}",
                        col[i],
                        k[(i, j)]
                    );
                }
            }
        }
    }

    #[test]
    fn slack_cable_carries_nothing() {
        let c = MemberKind::Cable { ea: 1e6, l0: 2.0 };
        let s = c.state(1.5);
        assert!(s.slack);
        assert_eq!(s.force, 0.0);
        assert_eq!(s.axial_stiffness, 0.0);
        let t = c.state(2.002);
        assert!(!t.slack);
        assert!((t.force - 1000.0).abs() < 1e-6);
    }
}
