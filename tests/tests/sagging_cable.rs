//! In-plane vibration of a sagging cable against Irvine's theory.
//!
//! Irvine & Caughey (1974, Proc. R. Soc. Lond. A 341:299–315) and Irvine, *Cable Structures*
//! (MIT Press 1981), ch. 3 (from memory, shared REFERENCES §2): for a shallow level cable with
//! horizontal tension H, mass per length m, span l and Irvine's parameter
//! λ² = (w l / H)² · l / (H Le / EA), Le ≈ l (1 + 8 (d/l)²), the first symmetric in-plane mode
//! satisfies tan(ω̄/2) = ω̄/2 − (4/λ²)(ω̄/2)³ with ω̄ = ω l / √(H/m), and the first
//! antisymmetric in-plane mode has ω̄ = 2π whatever λ². A chain of many elastic links with
//! lumped masses approaches the theory (which itself neglects terms of order (d/l)²).

use std::f64::consts::PI;

use rigwright_core::Statics;
use rigwright_core::dynamics::modes;
use rigwright_core::gallery::hanging_chain;
use rigwright_verification::{model, rel};

/// Root of Irvine's symmetric-mode equation on (π, 3π), by bisection.
fn irvine_symmetric(lambda2: f64) -> f64 {
    let f = |x: f64| (x / 2.0).tan() - x / 2.0 + 4.0 / lambda2 * (x / 2.0).powi(3);
    let (mut lo, mut hi) = (PI + 1e-9, 3.0 * PI - 1e-9);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if f(mid) < 0.0 { lo = mid } else { hi = mid }
    }
    0.5 * (lo + hi)
}

#[test]
fn irvines_equation_has_its_published_limits() {
    // λ² → 0: π (taut string); λ² = 4π²: 2π (the crossover); λ² → ∞: 8.98682.
    assert!((irvine_symmetric(1e-6) - PI).abs() < 1e-4);
    assert!((irvine_symmetric(4.0 * PI * PI) - 2.0 * PI).abs() < 1e-9);
    assert!((irvine_symmetric(1e12) - 8.98682).abs() < 1e-4);
}

/// (ω̄ of the first symmetric mode, ω̄ of the first antisymmetric mode, λ²) of a chain.
fn chain_modes(ea: f64, links: usize) -> (f64, f64, f64) {
    let (l, d, w, g): (f64, f64, f64, f64) = (100.0, 2.5, 10.0, 9.81);
    let h_guess = w * l * l / (8.0 * d);
    let arc = l * (1.0 + 8.0 / 3.0 * (d / l).powi(2));
    let le = l * (1.0 + 8.0 * (d / l).powi(2));
    let length = arc - h_guess * le / ea;
    let m = model(&hanging_chain(links, l, length, ea, w, g, d));
    let statics = Statics::new(&m);
    let eq = statics.solve(0, None).unwrap();
    let h = eq.nodes[0].reaction.unwrap().x.abs();
    let sag = -eq.nodes[links / 2].position.y;
    let le = l * (1.0 + 8.0 * (sag / l).powi(2));
    let lambda2 = (w * l / h).powi(2) * l / (h * le / ea);
    let mass_per_length = w / g;
    let scale = l / (h / mass_per_length).sqrt();
    let ms = modes(&statics, &eq, 6).unwrap();
    let symmetry = |shape: &[rigwright_core::Vec3]| {
        let num: f64 = (0..=links).map(|k| shape[k].y * shape[links - k].y).sum();
        let den: f64 = (0..=links).map(|k| shape[k].y * shape[k].y).sum();
        num / den
    };
    let sym = ms.modes.iter().find(|md| symmetry(&md.shape) > 0.9).unwrap().omega * scale;
    let anti = ms.modes.iter().find(|md| symmetry(&md.shape) < -0.9).unwrap().omega * scale;
    (sym, anti, lambda2)
}

#[test]
fn chain_model_of_a_sagging_cable_matches_irvines_first_in_plane_modes() {
    // λ² ≈ 20 (below the crossover 4π²) and ≈ 100 (above it).
    for ea in [2.5e6, 1.25e7] {
        let (sym, anti, lambda2) = chain_modes(ea, 80);
        let theory = irvine_symmetric(lambda2);
        eprintln!("λ² = {lambda2:.3}: chain symmetric ω̄ = {sym:.5}, Irvine {theory:.5}; antisymmetric {anti:.5} vs 2π");
        assert!(rel(sym, theory) < 1e-3, "λ² = {lambda2:.2}: chain {sym:.5} vs Irvine {theory:.5}");
        assert!(rel(anti, 2.0 * PI) < 5e-3, "λ² = {lambda2:.2}: antisymmetric {anti:.5} vs 2π");
    }
}
