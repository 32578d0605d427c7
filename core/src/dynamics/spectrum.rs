//! Amplitude spectrum of a sampled signal and its dominant frequency.
//!
//! The signal's mean is removed, a Hann window applied and the record zero-padded to at
//! least 8× its length (a power of two) before the FFT (rustfft). The dominant frequency is
//! the highest bin refined by fitting a parabola through it and its neighbours on the
//! log-magnitude (common practice for windowed peaks).

use rustfft::FftPlanner;
use rustfft::num_complex::Complex;
use serde::Serialize;

/// One-sided amplitude spectrum.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Spectrum {
    /// Bin frequencies (Hz).
    pub frequency: Vec<f64>,
    /// Amplitude of each bin (signal units, window-corrected).
    pub amplitude: Vec<f64>,
    /// Frequency of the largest peak (Hz), refined between bins; `None` for a flat signal.
    pub dominant: Option<f64>,
}

/// Spectrum of `samples` taken every `dt` seconds.
pub fn spectrum(samples: &[f64], dt: f64) -> Spectrum {
    let n = samples.len();
    if n < 4 || dt.partial_cmp(&0.0) != Some(std::cmp::Ordering::Greater) {
        return Spectrum {
            frequency: Vec::new(),
            amplitude: Vec::new(),
            dominant: None,
        };
    }
    let mean = samples.iter().sum::<f64>() / n as f64;
    let padded = (8 * n).next_power_of_two();
    let mut buf: Vec<Complex<f64>> = vec![Complex::new(0.0, 0.0); padded];
    let mut wsum = 0.0;
    for (i, s) in samples.iter().enumerate() {
        let w = 0.5 - 0.5 * (std::f64::consts::TAU * i as f64 / (n - 1) as f64).cos();
        wsum += w;
        buf[i] = Complex::new((s - mean) * w, 0.0);
    }
    FftPlanner::new().plan_fft_forward(padded).process(&mut buf);
    let half = padded / 2 + 1;
    let df = 1.0 / (padded as f64 * dt);
    let frequency: Vec<f64> = (0..half).map(|k| k as f64 * df).collect();
    let amplitude: Vec<f64> = buf[..half].iter().map(|c| 2.0 * c.norm() / wsum).collect();
    let peak = (1..half - 1).max_by(|&a, &b| amplitude[a].total_cmp(&amplitude[b]));
    let dominant = peak.and_then(|k| {
        if amplitude[k] <= 1e-300 {
            return None;
        }
        let (a, b, c) = (
            amplitude[k - 1].max(1e-300).ln(),
            amplitude[k].ln(),
            amplitude[k + 1].max(1e-300).ln(),
        );
        let denom = a - 2.0 * b + c;
        let shift = if denom.abs() > 0.0 { 0.5 * (a - c) / denom } else { 0.0 };
        Some((k as f64 + shift.clamp(-0.5, 0.5)) * df)
    });
    Spectrum {
        frequency,
        amplitude,
        dominant,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dominant_frequency_of_a_pure_sine_is_found_between_bins() {
        let dt = 0.01;
        let f = 3.217;
        let s: Vec<f64> = (0..2000).map(|i| (std::f64::consts::TAU * f * i as f64 * dt).sin() + 0.3).collect();
        let sp = spectrum(&s, dt);
        let d = sp.dominant.unwrap();
        assert!((d - f).abs() < 1e-3, "found {d}");
    }
}
