//! Numbers as the sheet prints them: in the project's unit system, each with its unit (in
//! the cell or in the column heading).

use crate::units::{Quantity, Units, significant};

const LBF: f64 = 4.448_221_615_260_5;
const INCH: f64 = 0.0254;
const PSI: f64 = LBF / (INCH * INCH);

/// Formats SI values for one sheet.
#[derive(Debug, Clone, Copy)]
pub struct Fmt {
    pub units: Units,
    /// Forces in kN (or kip) rather than N (or lbf), chosen from the largest force.
    pub kilo: bool,
    /// Forces below this (N) are round-off of the solver and print as 0.
    pub noise: f64,
}

impl Fmt {
    /// A formatter whose force unit suits forces up to `largest` (N).
    pub fn new(units: Units, largest: f64) -> Fmt {
        let shown = units.to_display(Quantity::Force, largest.abs());
        Fmt {
            units,
            kilo: shown >= 10_000.0,
            noise: 1e-9 * largest.abs(),
        }
    }

    pub fn force_unit(&self) -> &'static str {
        match (self.units, self.kilo) {
            (Units::Si, false) => "N",
            (Units::Si, true) => "kN",
            (Units::Us, false) => "lbf",
            (Units::Us, true) => "kip",
        }
    }

    /// A force (N) in the sheet's force unit, without the unit.
    pub fn force(&self, si: f64) -> String {
        if si.abs() <= self.noise {
            return "0".into();
        }
        let v = self.units.to_display(Quantity::Force, si) / if self.kilo { 1000.0 } else { 1.0 };
        fixed4(v)
    }

    /// A force with its unit.
    pub fn force_u(&self, si: f64) -> String {
        format!("{} {}", self.force(si), self.force_unit())
    }

    pub fn length_unit(&self) -> &'static str {
        self.units.symbol(Quantity::Length)
    }

    /// A length or coordinate (m) in m or ft, without the unit.
    pub fn length(&self, si: f64) -> String {
        format!("{:.3}", self.units.to_display(Quantity::Length, si))
    }

    /// Metres per display unit of length (1 for m, 0.3048 for ft).
    pub fn metres_per_length_unit(&self) -> f64 {
        1.0 / self.units.to_display(Quantity::Length, 1.0)
    }

    pub fn length_u(&self, si: f64) -> String {
        format!("{} {}", self.length(si), self.length_unit())
    }

    pub fn small_unit(&self) -> &'static str {
        match self.units {
            Units::Si => "mm",
            Units::Us => "in",
        }
    }

    /// A displacement (m) in mm or in, without the unit.
    pub fn small(&self, si: f64) -> String {
        let s = match self.units {
            Units::Si => format!("{:.2}", si * 1e3),
            Units::Us => format!("{:.3}", si / INCH),
        };
        unsigned_zero(s)
    }

    pub fn stiffness_unit(&self) -> &'static str {
        match self.units {
            Units::Si => "kN/m",
            Units::Us => "lbf/in",
        }
    }

    /// A stiffness (N/m) in kN/m or lbf/in, without the unit.
    pub fn stiffness(&self, si: f64) -> String {
        match self.units {
            Units::Si => significant(si / 1e3, 4),
            Units::Us => significant(self.units.to_display(Quantity::Stiffness, si), 4),
        }
    }

    /// A stress (Pa) with its unit: MPa or psi.
    pub fn stress_u(&self, si: f64) -> String {
        match self.units {
            Units::Si => format!("{} MPa", significant(si / 1e6, 4)),
            Units::Us => format!("{} psi", significant(si / PSI, 4)),
        }
    }

    /// The mass unit's symbol.
    pub fn mass_unit(&self) -> &'static str {
        self.units.symbol(Quantity::Mass)
    }

    /// A mass (kg) in the display unit, two decimals, without the unit.
    pub fn mass(&self, si: f64) -> String {
        format!("{:.2}", self.units.to_display(Quantity::Mass, si))
    }

    /// A mass (kg) with its unit.
    pub fn mass_u(&self, si: f64) -> String {
        self.units.show(Quantity::Mass, si)
    }

    /// A value of a check line in its own unit ("N", "Pa" or "m"), with the unit.
    pub fn in_unit(&self, si: f64, unit: &str) -> String {
        match unit {
            "N" => self.force_u(si),
            "Pa" => self.stress_u(si),
            "m" => match self.units {
                Units::Si => format!("{} mm", self.small(si)),
                Units::Us => format!("{} in", self.small(si)),
            },
            other => format!("{} {other}", significant(si, 4)),
        }
    }
}

/// "-0.00" printed as "0.00".
fn unsigned_zero(s: String) -> String {
    match s.strip_prefix('-') {
        Some(rest) if rest.chars().all(|c| c == '0' || c == '.') => rest.to_string(),
        _ => s,
    }
}

/// Four significant digits, but never in exponent form for ordinary forces.
fn fixed4(v: f64) -> String {
    if v == 0.0 {
        return "0".into();
    }
    let mag = v.abs().log10().floor() as i32;
    if (-3..9).contains(&mag) {
        let decimals = (3 - mag).max(0) as usize;
        format!("{v:.decimals$}")
    } else {
        significant(v, 4)
    }
}

/// A utilisation as a percentage with its sign.
pub fn percent(u: f64) -> String {
    format!("{:.1} %", u * 100.0)
}

/// `n` and the noun, in the plural unless `n` is 1: "1 load step", "3 load steps".
pub fn count(n: usize, noun: &str) -> String {
    if n == 1 { format!("1 {noun}") } else { format!("{n} {noun}s") }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn forces_switch_to_kilo_units_above_ten_thousand() {
        let small = Fmt::new(Units::Si, 2500.0);
        assert_eq!(small.force_u(441.45), "441.4 N");
        let big = Fmt::new(Units::Si, 25_000.0);
        assert_eq!(big.force_u(12_345.0), "12.35 kN");
        assert_eq!(big.force_unit(), "kN");
        assert_eq!(Fmt::new(Units::Us, 100.0).force_unit(), "lbf");
    }

    #[test]
    fn displacements_print_in_millimetres_or_inches() {
        assert_eq!(Fmt::new(Units::Si, 1.0).small(0.012_345), "12.35");
        assert_eq!(Fmt::new(Units::Us, 1.0).small(0.0254), "1.000");
        assert_eq!(Fmt::new(Units::Si, 1.0).small(-1e-6), "0.00");
        assert_eq!(Fmt::new(Units::Si, 5000.0).force(-2.0e-9), "0");
    }
}
