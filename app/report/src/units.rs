//! Display units: SI or US customary, for every number shown and typed (in the app) or printed
//! (on the Sheet).
//!
//! Responsible for converting between the SI values the core works in and the values the user
//! sees, and for formatting a value with its unit. Not responsible for any mechanics.

use serde::{Deserialize, Serialize};

/// The unit system used for display and input. Files always store SI.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum Units {
    /// Metres, newtons, kilograms.
    #[default]
    Si,
    /// Feet, pounds-force, pounds (mass); stiffness in lbf/in.
    Us,
}

/// A kind of physical quantity the app shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    /// m or ft.
    Length,
    /// N or lbf.
    Force,
    /// kg or lb.
    Mass,
    /// Stiffness or spring rate: N/m or lbf/in.
    Stiffness,
    /// Mass per length: kg/m or lb/ft.
    MassPerLength,
    /// Stress: MPa or ksi.
    Stress,
}

const FT: f64 = 0.3048;
const LBF: f64 = 4.448_221_615_260_5;
const LB: f64 = 0.453_592_37;
const INCH: f64 = 0.0254;
const KSI: f64 = 1000.0 * LBF / (INCH * INCH);

impl Quantity {
    /// Size of one display unit in SI.
    fn si_per_unit(self, units: Units) -> f64 {
        match (self, units) {
            (Quantity::Stress, Units::Si) => 1e6,
            (Quantity::Stress, Units::Us) => KSI,
            (_, Units::Si) => 1.0,
            (Quantity::Length, Units::Us) => FT,
            (Quantity::Force, Units::Us) => LBF,
            (Quantity::Mass, Units::Us) => LB,
            (Quantity::Stiffness, Units::Us) => LBF / INCH,
            (Quantity::MassPerLength, Units::Us) => LB / FT,
        }
    }

    /// Unit symbol.
    pub fn symbol(self, units: Units) -> &'static str {
        match (self, units) {
            (Quantity::Length, Units::Si) => "m",
            (Quantity::Length, Units::Us) => "ft",
            (Quantity::Force, Units::Si) => "N",
            (Quantity::Force, Units::Us) => "lbf",
            (Quantity::Mass, Units::Si) => "kg",
            (Quantity::Mass, Units::Us) => "lb",
            (Quantity::Stiffness, Units::Si) => "N/m",
            (Quantity::Stiffness, Units::Us) => "lbf/in",
            (Quantity::MassPerLength, Units::Si) => "kg/m",
            (Quantity::MassPerLength, Units::Us) => "lb/ft",
            (Quantity::Stress, Units::Si) => "MPa",
            (Quantity::Stress, Units::Us) => "ksi",
        }
    }
}

impl Units {
    /// Name for menus.
    pub fn name(self) -> &'static str {
        match self {
            Units::Si => "SI (m, N, kg)",
            Units::Us => "US customary (ft, lbf, lb)",
        }
    }

    /// SI value → display value.
    pub fn to_display(self, q: Quantity, si: f64) -> f64 {
        si / q.si_per_unit(self)
    }

    /// Display value → SI value.
    pub fn to_si(self, q: Quantity, shown: f64) -> f64 {
        shown * q.si_per_unit(self)
    }

    /// Unit symbol of `q`.
    pub fn symbol(self, q: Quantity) -> &'static str {
        q.symbol(self)
    }

    /// An SI value formatted in display units with its symbol, e.g. "1.234 kN" style
    /// (four significant digits, plain unit).
    pub fn show(self, q: Quantity, si: f64) -> String {
        format!("{} {}", significant(self.to_display(q, si), 4), q.symbol(self))
    }
}

/// `v` with about `digits` significant digits; scientific notation for very large or small values.
pub fn significant(v: f64, digits: i32) -> String {
    if !v.is_finite() {
        return format!("{v}");
    }
    if v == 0.0 {
        return "0".into();
    }
    let mag = v.abs().log10().floor() as i32;
    if !(-3..6).contains(&mag) {
        return format!("{:.*e}", (digits - 1).max(0) as usize, v);
    }
    let decimals = (digits - 1 - mag).max(0) as usize;
    format!("{v:.decimals$}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn conversions_round_trip_for_every_quantity() {
        for q in [
            Quantity::Length,
            Quantity::Force,
            Quantity::Mass,
            Quantity::Stiffness,
            Quantity::MassPerLength,
            Quantity::Stress,
        ] {
            let si = 123.456;
            let back = Units::Us.to_si(q, Units::Us.to_display(q, si));
            assert!((back - si).abs() < 1e-9, "{q:?}");
        }
    }

    #[test]
    fn one_foot_is_0_3048_m_and_one_lbf_per_inch_is_175_n_per_m() {
        assert!((Units::Us.to_si(Quantity::Length, 1.0) - 0.3048).abs() < 1e-12);
        assert!((Units::Us.to_si(Quantity::Stiffness, 1.0) - 175.126_835_3).abs() < 1e-6);
    }

    /// NIST SP 811, Appendix B (from memory): 1 ksi = 6.894 757 MPa.
    #[test]
    fn one_ksi_is_6_894757_mpa() {
        assert!((Units::Us.to_si(Quantity::Stress, 1.0) / 1e6 - 6.894_757).abs() < 1e-6);
        assert_eq!(Units::Si.show(Quantity::Stress, 597.11e6), "597.1 MPa");
    }

    #[test]
    fn significant_digits_format() {
        assert_eq!(significant(441.45, 4), "441.4");
        assert_eq!(significant(0.012345, 4), "0.01235");
        assert_eq!(significant(1234567.0, 4), "1.235e6");
        assert_eq!(Units::Si.show(Quantity::Force, 12.0), "12.00 N");
    }
}
