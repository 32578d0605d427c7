//! Spring wire materials and their published constants: minimum tensile strength
//! `Sut = A / d^m` (Shigley Table 10-4), shear modulus (Table 10-5) and the allowable static
//! shear as a fraction of Sut (Table 10-6).
//!
//! Design data (a stored spring design names its material) and the spring formulas
//! (`spring.rs`) both use it; it uses neither.

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
    /// Every material, for choosers.
    pub const ALL: [SpringMaterial; 6] = [
        SpringMaterial::MusicWire,
        SpringMaterial::OilTempered,
        SpringMaterial::HardDrawn,
        SpringMaterial::ChromeVanadium,
        SpringMaterial::ChromeSilicon,
        SpringMaterial::Stainless302,
    ];

    /// Name as printed.
    pub fn name(self) -> &'static str {
        match self {
            SpringMaterial::MusicWire => "music wire A228",
            SpringMaterial::OilTempered => "oil-tempered A229",
            SpringMaterial::HardDrawn => "hard-drawn A227",
            SpringMaterial::ChromeVanadium => "chrome-vanadium A232",
            SpringMaterial::ChromeSilicon => "chrome-silicon A401",
            SpringMaterial::Stainless302 => "302 stainless A313",
        }
    }

    /// (m, A in MPa·mm^m) of `Sut = A/d^m` for wire `d` (mm) (Shigley Table 10-4; the
    /// 302 stainless bands above 2.5 mm from memory).
    pub fn strength_constants(self, d: f64) -> (f64, f64) {
        match self {
            SpringMaterial::MusicWire => (0.145, 2211.0),
            SpringMaterial::OilTempered => (0.187, 1855.0),
            SpringMaterial::HardDrawn => (0.190, 1783.0),
            SpringMaterial::ChromeVanadium => (0.168, 2005.0),
            SpringMaterial::ChromeSilicon => (0.108, 1974.0),
            SpringMaterial::Stainless302 if d <= 2.5 => (0.146, 1867.0),
            SpringMaterial::Stainless302 if d <= 5.0 => (0.263, 2065.0),
            SpringMaterial::Stainless302 => (0.478, 2911.0),
        }
    }

    /// Wire sizes (mm) for which Table 10-4's constants hold (Shigley Table 10-4, from memory).
    pub fn size_range(self) -> (f64, f64) {
        match self {
            SpringMaterial::MusicWire => (0.10, 6.5),
            SpringMaterial::OilTempered => (0.5, 12.7),
            SpringMaterial::HardDrawn => (0.7, 12.7),
            SpringMaterial::ChromeVanadium => (0.8, 11.1),
            SpringMaterial::ChromeSilicon => (1.6, 9.5),
            SpringMaterial::Stainless302 => (0.3, 10.0),
        }
    }

    /// Allowable static shear at solid as a fraction of Sut, before set removal (Shigley
    /// Table 10-6): cold-drawn carbon steel (music wire, hard-drawn) 45 %, hardened and
    /// tempered carbon and low-alloy steels 50 %, austenitic stainless 35 %.
    pub fn allowable_fraction(self) -> f64 {
        match self {
            SpringMaterial::MusicWire | SpringMaterial::HardDrawn => 0.45,
            SpringMaterial::Stainless302 => 0.35,
            _ => 0.50,
        }
    }

    /// Shear modulus G (Pa) for wire `d` (mm), Shigley Table 10-5 (from memory beyond the
    /// shared references' 79.3–81.7 GPa for music wire and 69.0 GPa for 302 stainless): music
    /// wire 82.7 / 81.7 / 81.0 / 80.0 GPa below 0.8, 1.6, 3 mm and above; hard-drawn 80.0 /
    /// 79.3 / 78.6 / 77.9 GPa in the same bands; oil-tempered, chrome-vanadium and
    /// chrome-silicon 77.2 GPa; 302 stainless 69.0 GPa.
    pub fn shear_modulus(self, d: f64) -> f64 {
        let band = |g: [f64; 4]| {
            if d < 0.8 {
                g[0]
            } else if d <= 1.6 {
                g[1]
            } else if d <= 3.0 {
                g[2]
            } else {
                g[3]
            }
        };
        1e9 * match self {
            SpringMaterial::MusicWire => band([82.7, 81.7, 81.0, 80.0]),
            SpringMaterial::HardDrawn => band([80.0, 79.3, 78.6, 77.9]),
            SpringMaterial::OilTempered | SpringMaterial::ChromeVanadium | SpringMaterial::ChromeSilicon => 77.2,
            SpringMaterial::Stainless302 => 69.0,
        }
    }
}
