//! Helical compression springs: rate, stress and strength.
//!
//! Budynas & Nisbett, *Shigley's Mechanical Engineering Design*, ch. 10: index `C = D/d`,
//! rate `k = d⁴ G / (8 D³ Na)` (eq. 10-9), Bergsträsser factor `KB = (4C + 2)/(4C − 3)`
//! (eq. 10-5), shear stress `τ = KB · 8 F D / (π d³)` (eq. 10-7), minimum tensile strength
//! `Sut = A / d^m` (Table 10-4), allowable static shear at solid as a fraction of Sut
//! (Table 10-6).

use serde::{Deserialize, Serialize};

use super::design::{SpringDesign, SpringEnds};
pub use super::material::SpringMaterial;

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
    let g = material.shear_modulus(d);
    let c = dm / d;
    let rate = (d * 1e-3).powi(4) * g / (8.0 * (dm * 1e-3).powi(3) * na);
    let kb = (4.0 * c + 2.0) / (4.0 * c - 3.0);
    let stress = kb * 8.0 * f * dm * 1e-3 / (std::f64::consts::PI * (d * 1e-3).powi(3));
    let (m, a) = material.strength_constants(d);
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

/// Wire diameters the designer chooses from (mm): common stock sizes (from memory).
pub const WIRE_DIAMETERS_MM: [f64; 30] = [
    0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2, 1.4, 1.6, 1.8, 2.0, 2.2, 2.5, 2.8, 3.0, 3.2, 3.5, 4.0, 4.5, 5.0, 5.5, 6.0, 6.5, 7.0, 8.0, 9.0,
    10.0, 11.0, 12.0,
];

/// Density of spring steel (kg/m³), common practice.
const STEEL_DENSITY: f64 = 7850.0;
/// Fractional overrun to closure ξ: the solid length sits (1 + ξ) × working deflection
/// below the free length (Shigley §10-8 recommends ξ ≥ 0.15).
pub const OVERRUN: f64 = 0.15;

/// Everything about a designed spring that does not depend on the load.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct SpringProperties {
    /// Rate (N/m).
    pub rate: f64,
    /// Spring index C = D/d.
    pub index: f64,
    /// Bergsträsser factor.
    pub kb: f64,
    /// Minimum tensile strength (Pa).
    pub sut: f64,
    /// Allowable static shear (Pa).
    pub allowable: f64,
    /// Solid length (m).
    pub solid_length: f64,
    /// Outside diameter (m).
    pub outside_diameter: f64,
    /// Mass of the active and end coils (kg).
    pub mass: f64,
    /// First surge frequency with both ends against flat plates (Hz), Shigley eq. 10-25.
    pub surge_hz: f64,
    /// Longest free length that does not buckle, `2.63 D / α` (Shigley eq. 10-13, α of the
    /// design), compression springs (m).
    pub buckling_free_length: Option<f64>,
    /// Preferred initial-tension band of an extension spring (N), Shigley eq. 10-41.
    pub initial_tension: Option<(f64, f64)>,
}

impl SpringDesign {
    /// The design's properties.
    pub fn properties(&self) -> SpringProperties {
        let d = self.wire_mm;
        let dm = self.mean_mm;
        let na = self.active_coils;
        let r = helical_spring(self.material, d, dm, na, 0.0);
        let nt = self.ends.total_coils(na);
        // Shigley eq. 10-26: W = π² d² D Na γ / 4 (active coils); surge f = ½ √(k/m), eq. 10-25.
        let active_mass = std::f64::consts::PI.powi(2) * (d * 1e-3).powi(2) * dm * 1e-3 * na * STEEL_DENSITY / 4.0;
        let mass = active_mass * nt / na;
        let c = r.index;
        let initial_tension = (!self.ends.is_compression()).then(|| {
            // Shigley eq. 10-41 in SI (from memory): τi = 231/exp(0.105 C) ± 6.9 (4 − (C − 3)/6.5) MPa,
            // uncorrected stress τi = 8 Fi D / (π d³).
            let mid = 231.0 / (0.105 * c).exp();
            let half = 6.9 * (4.0 - (c - 3.0) / 6.5);
            let force = |tau_mpa: f64| tau_mpa * 1e6 * std::f64::consts::PI * (d * 1e-3).powi(3) / (8.0 * dm * 1e-3);
            (force(mid - half), force(mid + half))
        });
        SpringProperties {
            rate: r.rate,
            index: c,
            kb: r.kb,
            sut: r.sut,
            allowable: r.allowable,
            solid_length: self.ends.solid_length_mm(d, na) * 1e-3,
            outside_diameter: (dm + d) * 1e-3,
            mass,
            surge_hz: 0.5 * (r.rate / active_mass).sqrt(),
            buckling_free_length: self.ends.is_compression().then_some(2.63 * dm * 1e-3 / self.buckling_alpha),
            initial_tension,
        }
    }

    /// Corrected shear stress at an axial force (Pa), either sign.
    pub fn stress(&self, force: f64) -> f64 {
        helical_spring(self.material, self.wire_mm, self.mean_mm, self.active_coils, force.abs()).stress
    }
}

/// What a spring must do, for [`design_spring`].
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct SpringRequirement {
    /// Rate (N/m).
    pub rate: f64,
    /// Largest working force (N).
    pub max_force: f64,
    pub material: SpringMaterial,
    pub ends: SpringEnds,
    /// Largest outside diameter that fits (mm).
    pub max_outside_mm: Option<f64>,
    /// Smallest inside diameter (over a rod or bolt) (mm).
    pub min_inside_mm: Option<f64>,
    /// Longest free length that fits (mm).
    pub max_free_length_mm: Option<f64>,
    /// Factor on the allowable stress.
    pub design_factor: f64,
    /// End-condition constant of the buckling check (1: both ends pivoted).
    pub buckling_alpha: f64,
}

/// Proposes the lightest spring from [`WIRE_DIAMETERS_MM`] that gives the rate (to a quarter
/// coil) and keeps to Shigley's §10-8 recommendations: 4 ≤ C ≤ 12, 3 ≤ Na ≤ 15, solid-safe with
/// ξ = 0.15 and the design factor (compression springs; extension springs at the working
/// force, with the middle of the preferred initial-tension band and two machine hooks), and no
/// buckling with the requirement's α. Says which limit stops it when none fits.
pub fn design_spring(req: &SpringRequirement) -> Result<SpringDesign, String> {
    if !(req.rate.is_finite() && req.rate > 0.0 && req.max_force.is_finite() && req.max_force > 0.0) {
        return Err("give a positive rate and working force".into());
    }
    // Shigley's 3 ≤ Na ≤ 15 is for compression springs; extension springs, which cannot
    // buckle, are commonly wound with more (up to 40 here, common practice, from memory).
    let max_coils = if req.ends.is_compression() { 15.0 } else { 40.0 };
    let mut best: Option<(f64, SpringDesign)> = None;
    let mut limits = [0usize; 4]; // space, coils, stress, length/buckling
    let (smallest, largest) = req.material.size_range();
    for d in WIRE_DIAMETERS_MM.into_iter().filter(|d| (smallest..=largest).contains(d)) {
        let mut c = 12.0;
        while c >= 4.0 - 1e-9 {
            let dm = c * d;
            c -= 0.25;
            if req.max_outside_mm.is_some_and(|od| dm + d > od) || req.min_inside_mm.is_some_and(|id| dm - d < id) {
                limits[0] += 1;
                continue;
            }
            let g = req.material.shear_modulus(d);
            let exact = (d * 1e-3).powi(4) * g / (8.0 * (dm * 1e-3).powi(3) * req.rate);
            let na = (exact * 4.0).round() / 4.0;
            if !(3.0..=max_coils).contains(&na) {
                limits[1] += 1;
                continue;
            }
            let mut design = SpringDesign {
                material: req.material,
                wire_mm: d,
                mean_mm: dm,
                active_coils: na,
                ends: req.ends,
                free_length_mm: 0.0,
                buckling_alpha: req.buckling_alpha,
                initial_tension: 0.0,
            };
            let p = design.properties();
            let working = req.max_force / p.rate * 1e3; // mm
            let (check_force, free) = if req.ends.is_compression() {
                let to_solid = (1.0 + OVERRUN) * working;
                (p.rate * to_solid * 1e-3, p.solid_length * 1e3 + to_solid)
            } else {
                // Shigley eq. 10-39: L0 = 2(D − d) + Lb with two machine hooks.
                let (lo, hi) = p.initial_tension.unwrap_or((0.0, 0.0));
                design.initial_tension = (0.5 * (lo + hi)).clamp(0.0, 0.5 * req.max_force);
                (req.max_force, p.solid_length * 1e3 + 2.0 * (dm - d))
            };
            if design.stress(check_force) * req.design_factor > p.allowable {
                limits[2] += 1;
                continue;
            }
            design.free_length_mm = free;
            let buckles = p.buckling_free_length.is_some_and(|l| free * 1e-3 >= l);
            if buckles || req.max_free_length_mm.is_some_and(|l| free > l) {
                limits[3] += 1;
                continue;
            }
            if best.as_ref().is_none_or(|(m, _)| p.mass < *m) {
                best = Some((p.mass, design));
            }
        }
    }
    best.map(|(_, d)| d).ok_or_else(|| {
        let names = [
            "the diameter limits",
            "3 to 15 active coils",
            "the stress limit",
            "the free-length or buckling limit",
        ];
        let worst = (0..4).max_by_key(|i| limits[*i]).unwrap_or(0);
        format!(
            "no {} wire from {} to {} mm fits; most sizes fail {}: allow more space, a lower rate or force, or a stronger material",
            req.material.name(),
            smallest,
            largest,
            names[worst]
        )
    })
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

    /// Shigley Table 10-1 end types: a squared-and-ground spring of d = 2 mm with Na = 10 has
    /// Nt = 12 and Ls = d·Nt = 24 mm; plain ends Nt = Na, Ls = d(Nt + 1) = 22 mm.
    #[test]
    fn solid_length_follows_the_end_type_table() {
        assert_eq!(SpringEnds::SquaredGround.solid_length_mm(2.0, 10.0), 24.0);
        assert_eq!(SpringEnds::Plain.solid_length_mm(2.0, 10.0), 22.0);
        assert_eq!(SpringEnds::Squared.solid_length_mm(2.0, 10.0), 26.0);
        assert_eq!(SpringEnds::PlainGround.solid_length_mm(2.0, 10.0), 22.0);
    }

    /// The designer's proposal keeps to the recommendations it claims (Shigley §10-8, from
    /// memory: 4 ≤ C ≤ 12, 3 ≤ Na ≤ 15, ξ ≥ 0.15, ns ≥ 1.2), fits the space, gives the rate to
    /// a quarter coil, and is the lightest such spring (checked by brute force here).
    #[test]
    fn designer_proposes_a_spring_that_meets_every_limit() {
        let req = SpringRequirement {
            rate: 5000.0,
            max_force: 200.0,
            material: SpringMaterial::OilTempered,
            ends: SpringEnds::SquaredGround,
            max_outside_mm: Some(40.0),
            min_inside_mm: None,
            max_free_length_mm: Some(150.0),
            design_factor: 1.2,
            buckling_alpha: 0.5,
        };
        let s = design_spring(&req).unwrap();
        let p = s.properties();
        assert!((4.0..=12.0).contains(&p.index));
        assert!((3.0..=15.0).contains(&s.active_coils));
        assert!(p.outside_diameter * 1e3 <= 40.0 + 1e-9);
        assert!(s.free_length_mm <= 150.0);
        // Quarter-coil rounding moves the rate by at most 0.125/Na.
        assert!((p.rate / req.rate - 1.0).abs() <= 0.125 / s.active_coils + 1e-12, "k = {}", p.rate);
        let to_solid = s.free_length_mm - p.solid_length * 1e3;
        assert!(to_solid >= 1.15 * req.max_force / p.rate * 1e3 - 1e-9);
        assert!(s.stress(p.rate * to_solid * 1e-3) * 1.2 <= p.allowable);
        assert!(s.free_length_mm * 1e-3 < p.buckling_free_length.unwrap());
    }

    #[test]
    fn an_impossible_spring_says_what_stops_it() {
        let req = SpringRequirement {
            rate: 1e6,
            max_force: 1e5,
            material: SpringMaterial::MusicWire,
            ends: SpringEnds::Squared,
            max_outside_mm: Some(10.0),
            min_inside_mm: None,
            max_free_length_mm: None,
            design_factor: 1.2,
            buckling_alpha: 1.0,
        };
        let e = design_spring(&req).unwrap_err();
        assert!(e.contains("no music wire A228 wire"), "{e}");
    }

    /// Surge frequency, Shigley eqs. 10-25 and 10-26, by hand for the reference spring (music
    /// wire d = 2 mm, D = 16 mm, Na = 10): m = π²·0.002²·0.016·10·7850/4
    /// m = 12.396 g,
    /// f = ½ √(3955.1 / 0.012396) = 282.43 Hz.
    #[test]
    fn surge_frequency_matches_the_hand_calculation() {
        let s = SpringDesign {
            material: SpringMaterial::MusicWire,
            wire_mm: 2.0,
            mean_mm: 16.0,
            active_coils: 10.0,
            ends: SpringEnds::SquaredGround,
            free_length_mm: 60.0,
            buckling_alpha: 1.0,
            initial_tension: 0.0,
        };
        let p = s.properties();
        assert!((p.surge_hz - 282.43).abs() < 0.02, "f = {}", p.surge_hz);
    }
}
