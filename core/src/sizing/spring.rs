//! Helical compression springs: rate, stress and strength.
//!
//! Budynas & Nisbett, *Shigley's Mechanical Engineering Design*, ch. 10: index `C = D/d`,
//! rate `k = d⁴ G / (8 D³ Na)` (eq. 10-9), Bergsträsser factor `KB = (4C + 2)/(4C − 3)`
//! (eq. 10-5), shear stress `τ = KB · 8 F D / (π d³)` (eq. 10-7), minimum tensile strength
//! `Sut = A / d^m` (Table 10-4), allowable static shear at solid as a fraction of Sut
//! (Table 10-6).

use serde::{Deserialize, Serialize};

/// Spring wire materials with Shigley's Table 10-4 constants (A in MPa·mm^m) and shear
/// modulus G (Table 10-5).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum SpringMaterial {
    /// Music wire, ASTM A228.
    MusicWire,
    /// Oil-tempered wire, A229.
    OilTempered,
    /// Hard-drawn wire, A227.
    HardDrawn,
    /// Chrome-vanadium, A232.
    ChromeVanadium,
    /// Chrome-silicon, A401.
    ChromeSilicon,
    /// 302 stainless, A313.
    Stainless302,
}

impl SpringMaterial {
    /// (m, A in MPa·mm^m) of `Sut = A/d^m` (Shigley Table 10-4).
    pub fn strength_constants(self) -> (f64, f64) {
        match self {
            SpringMaterial::MusicWire => (0.145, 2211.0),
            SpringMaterial::OilTempered => (0.187, 1855.0),
            SpringMaterial::HardDrawn => (0.190, 1783.0),
            SpringMaterial::ChromeVanadium => (0.168, 2005.0),
            SpringMaterial::ChromeSilicon => (0.108, 1974.0),
            SpringMaterial::Stainless302 => (0.146, 1867.0),
        }
    }

    /// Allowable static shear at solid as a fraction of Sut, before set removal (Shigley
    /// Table 10-6): music wire 45 %, hardened carbon and low-alloy steels 50 %, austenitic
    /// stainless 35 %.
    pub fn allowable_fraction(self) -> f64 {
        match self {
            SpringMaterial::MusicWire => 0.45,
            SpringMaterial::Stainless302 => 0.35,
            _ => 0.50,
        }
    }

    /// Shear modulus G (Pa): 81.0 GPa for the steels (music wire 79.3–81.7 by diameter),
    /// 69.0 GPa for 302 stainless (Shigley Table 10-5).
    pub fn shear_modulus(self) -> f64 {
        match self {
            SpringMaterial::Stainless302 => 69.0e9,
            _ => 81.0e9,
        }
    }
}

/// Properties and stress of one helical spring.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SpringReport {
    /// Spring index C = D/d.
    pub index: f64,
    /// Rate (N/m).
    pub rate: f64,
    /// Bergsträsser correction factor.
    pub kb: f64,
    /// Corrected shear stress at the force (Pa).
    pub stress: f64,
    /// Minimum tensile strength (Pa).
    pub sut: f64,
    /// Allowable shear stress (Pa).
    pub allowable: f64,
    /// stress / allowable.
    pub utilisation: f64,
}

/// Rate and stress of a spring of wire `d` (mm), mean coil diameter `dm` (mm), `na` active
/// coils, carrying force `f` (N).
pub fn helical_spring(material: SpringMaterial, d: f64, dm: f64, na: f64, f: f64) -> SpringReport {
    let g = material.shear_modulus();
    let c = dm / d;
    let rate = (d * 1e-3).powi(4) * g / (8.0 * (dm * 1e-3).powi(3) * na);
    let kb = (4.0 * c + 2.0) / (4.0 * c - 3.0);
    let stress = kb * 8.0 * f * dm * 1e-3 / (std::f64::consts::PI * (d * 1e-3).powi(3));
    let (m, a) = material.strength_constants();
    let sut = a / d.powf(m) * 1e6;
    let allowable = material.allowable_fraction() * sut;
    SpringReport {
        index: c,
        rate,
        kb,
        stress,
        sut,
        allowable,
        utilisation: stress / allowable,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Shared REFERENCES §5 (calc from Shigley eqs. 10-5, 10-7, 10-9 and Table 10-4): music
    /// wire d = 2 mm, D = 16 mm, Na = 10, G = 81.0 GPa → k = 3.9551 N/mm, C = 8,
    /// KB = 1.17241, Sut = 1999.6 MPa, τ(100 N) = 597.11 MPa.
    #[test]
    fn music_wire_spring_matches_the_reference_calculation() {
        let r = helical_spring(SpringMaterial::MusicWire, 2.0, 16.0, 10.0, 100.0);
        assert!((r.rate / 1000.0 - 3.9551).abs() < 5e-5, "k = {}", r.rate);
        assert!((r.index - 8.0).abs() < 1e-12);
        assert!((r.kb - 1.17241).abs() < 5e-6);
        assert!((r.sut / 1e6 - 1999.6).abs() < 0.05, "Sut = {}", r.sut);
        assert!((r.stress / 1e6 - 597.11).abs() < 0.005, "τ = {}", r.stress);
    }
}
