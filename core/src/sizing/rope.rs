//! Steel wire rope: minimum breaking force, metallic area and axial stiffness.
//!
//! EN 12385-4 / ISO 2408 method as given by Feyrer, *Wire Ropes* (Springer), eqs. 1.5–1.5b
//! and Table 1.9: `F_min [kN] = d² R_r K / 1000` (d in mm, rope grade R_r in N/mm²), metallic
//! area `A = C d²` (mm²).

use serde::{Deserialize, Serialize};

/// Rope construction class.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum Construction {
    /// 6×7 class.
    SixBySeven,
    /// 6×19 class (Seale, Warrington, Filler).
    SixByNineteen,
    /// 6×36 class (Warrington-Seale).
    SixByThirtySix,
    /// 8×19 class.
    EightByNineteen,
}

/// Rope core.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum Core {
    /// Fibre core (FC).
    Fibre,
    /// Independent wire rope core (IWRC).
    Steel,
}

impl Construction {
    /// Minimum breaking force factor K and metallic area factor C (Feyrer, *Wire Ropes*,
    /// Table 1.9).
    pub fn factors(self, core: Core) -> (f64, f64) {
        use Construction::*;
        match (self, core) {
            (SixBySeven, Core::Fibre) => (0.332, 0.369),
            (SixBySeven, Core::Steel) => (0.359, 0.432),
            (SixByNineteen, Core::Fibre) => (0.330, 0.384),
            (SixByNineteen, Core::Steel) => (0.356, 0.449),
            (SixByThirtySix, Core::Fibre) => (0.330, 0.393),
            (SixByThirtySix, Core::Steel) => (0.356, 0.460),
            (EightByNineteen, Core::Fibre) => (0.293, 0.349),
            (EightByNineteen, Core::Steel) => (0.356, 0.457),
        }
    }

    /// Mass factor W of `m [kg/m] = W d² / 100` (EN 12385-4 tables, from memory: the shared
    /// references list K and C only). Each is 1.1–1.25 times the metallic mass `C d² ρ`
    /// (lay and core), which the tests check.
    pub fn mass_factor(self, core: Core) -> f64 {
        use Construction::*;
        match (self, core) {
            (SixBySeven, Core::Fibre) => 0.345,
            (SixBySeven, Core::Steel) => 0.384,
            (SixByNineteen, Core::Fibre) => 0.359,
            (SixByNineteen, Core::Steel) => 0.400,
            (SixByThirtySix, Core::Fibre) => 0.367,
            (SixByThirtySix, Core::Steel) => 0.409,
            (EightByNineteen, Core::Fibre) => 0.340,
            (EightByNineteen, Core::Steel) => 0.407,
        }
    }

    /// Every construction.
    pub const ALL: [Construction; 4] = [
        Construction::SixBySeven,
        Construction::SixByNineteen,
        Construction::SixByThirtySix,
        Construction::EightByNineteen,
    ];

    /// Name as printed, e.g. "6×19".
    pub fn name(self) -> &'static str {
        match self {
            Construction::SixBySeven => "6×7",
            Construction::SixByNineteen => "6×19",
            Construction::SixByThirtySix => "6×36",
            Construction::EightByNineteen => "8×19",
        }
    }
}

impl Core {
    /// "FC" or "IWRC".
    pub fn abbreviation(self) -> &'static str {
        match self {
            Core::Fibre => "FC",
            Core::Steel => "IWRC",
        }
    }
}

/// `F_min = d² R_r K / 1000` (kN), d in mm, grade in N/mm².
pub fn minimum_breaking_force_kn(d_mm: f64, grade: f64, k: f64) -> f64 {
    d_mm * d_mm * grade * k / 1000.0
}

/// A rope size with its derived properties.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct RopeSpec {
    pub construction: Construction,
    pub core: Core,
    /// Nominal diameter (mm).
    pub diameter_mm: f64,
    /// Rope grade R_r (N/mm²): 1570, 1770, 1960 or 2160.
    pub grade: f64,
    /// Effective modulus on the metallic area (GPa). Default: 100 GPa with a steel core,
    /// 90 GPa with a fibre core (common practice, from memory; editable).
    pub modulus_gpa: f64,
}

impl RopeSpec {
    /// A rope with the default modulus for its core.
    pub fn new(construction: Construction, core: Core, diameter_mm: f64, grade: f64) -> Self {
        let modulus_gpa = match core {
            Core::Steel => 100.0,
            Core::Fibre => 90.0,
        };
        RopeSpec {
            construction,
            core,
            diameter_mm,
            grade,
            modulus_gpa,
        }
    }

    /// Minimum breaking force (N).
    pub fn minimum_breaking_force(&self) -> f64 {
        let (k, _) = self.construction.factors(self.core);
        minimum_breaking_force_kn(self.diameter_mm, self.grade, k) * 1000.0
    }

    /// Metallic cross-section (m²).
    pub fn metallic_area(&self) -> f64 {
        let (_, c) = self.construction.factors(self.core);
        c * self.diameter_mm * self.diameter_mm * 1e-6
    }

    /// Mass per length (kg/m).
    pub fn mass_per_length(&self) -> f64 {
        self.construction.mass_factor(self.core) * self.diameter_mm * self.diameter_mm / 100.0
    }

    /// Axial stiffness EA (N).
    pub fn ea(&self) -> f64 {
        self.modulus_gpa * 1e9 * self.metallic_area()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Feyrer, *Wire Ropes*, eq. 1.5 with Table 1.9: d = 10 mm, grade 1770, 6×7 FC (K = 0.332)
    /// gives 58.8 kN, agreeing with API Spec 9A Table C.1 to three figures (shared REFERENCES §3).
    #[test]
    fn six_by_seven_fibre_core_ten_mm_grade_1770_breaks_at_58_8_kn() {
        let r = RopeSpec::new(Construction::SixBySeven, Core::Fibre, 10.0, 1770.0);
        assert!((r.minimum_breaking_force() / 1000.0 - 58.764).abs() < 1e-9);
        assert!((r.metallic_area() * 1e6 - 36.9).abs() < 1e-9);
    }

    /// The mass factors are from memory; check each against the metallic mass `C d² ρ`
    /// (ρ = 7850 kg/m³, common practice): lay and core make a rope 10–25 % heavier than its
    /// straight metallic area (common practice), never lighter.
    #[test]
    fn mass_factors_are_plausible_against_the_metallic_area() {
        for c in Construction::ALL {
            for core in [Core::Fibre, Core::Steel] {
                let (_, area) = c.factors(core);
                let metallic = area * 7850.0 * 1e-6 * 100.0;
                let ratio = c.mass_factor(core) / metallic;
                assert!((1.08..1.25).contains(&ratio), "{} {:?}: {ratio}", c.name(), core);
            }
        }
    }
}
