//! The drawing's scale: a standard scale (1:1, 1:2, 1:2.5, 1:5 × 10ⁿ) that fits, a round
//! length for the scale bar, the magnification of displacements, and how those numbers print.

/// Points per millimetre of paper.
pub(super) const PT_PER_MM: f64 = 72.0 / 25.4;

/// The smallest standard scale 1:N that fits `needed` (paper mm per model m needed ≥ …).
pub(super) fn standard_scale(mm_per_m: f64) -> f64 {
    // 1:N puts 1000/N mm of paper on a metre.
    let n_min = 1000.0 / mm_per_m;
    let mut decade = 10f64.powf(n_min.log10().floor() - 1.0);
    loop {
        for m in [1.0, 2.0, 2.5, 5.0] {
            let n = m * decade;
            if n >= n_min * (1.0 - 1e-9) {
                return n;
            }
        }
        decade *= 10.0;
    }
}

/// A round length for the scale bar, at most a fifth of `span` (m).
pub(super) fn bar_length(span: f64) -> f64 {
    let target = span / 5.0;
    let decade = 10f64.powf(target.log10().floor());
    [1.0, 2.0, 5.0, 10.0]
        .into_iter()
        .map(|m| m * decade)
        .rfind(|l| *l <= target * 1.01)
        .unwrap_or(decade)
}

/// The magnification of displacements: the largest of 1, 2, 5, 10, … that keeps the largest
/// displacement within 6 % of the rig's size.
pub(super) fn magnification(largest: f64, extent: f64) -> f64 {
    if largest <= 0.0 || largest >= 0.06 * extent {
        return 1.0;
    }
    let mut best = 1.0;
    let mut decade = 1.0;
    while decade < 1e6 {
        for m in [1.0, 2.0, 5.0] {
            if m * decade * largest <= 0.06 * extent {
                best = m * decade;
            }
        }
        decade *= 10.0;
    }
    best
}

/// "50" for 50.0, "2.5" for 2.5.
pub(super) fn fonts_free_number(v: f64) -> String {
    if (v - v.round()).abs() < 1e-9 {
        format!("{}", v.round() as i64)
    } else {
        format!("{v}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scales_are_standard_and_fit() {
        // 30 mm of paper per metre needed → 1:50 gives 20 mm (fits), 1:25 gives 40 (too big).
        assert_eq!(standard_scale(30.0), 50.0);
        assert_eq!(standard_scale(40.0), 25.0);
        assert_eq!(standard_scale(1000.0), 1.0);
        assert_eq!(bar_length(5.0), 1.0);
        assert_eq!(bar_length(12.0), 2.0);
        assert_eq!(magnification(0.001, 5.0), 200.0);
        assert_eq!(magnification(1.0, 5.0), 1.0);
    }
}
