//! A chain of straight elastic links with lumped weights converges to the elastic catenary.
//!
//! Reference: Irvine, *Cable Structures* (MIT Press 1981), ch. 1, elastic catenary (from
//! memory; the closed form is re-solved here). Level supports 100 m apart, unstrained length
//! 101 m, w = 10 N/m, EA = 1e7 N: H = 2023.1664 N, V = 505 N, mid-span sag 6.20867 m
//! (values computed from Irvine's equations, see shared REFERENCES §2).

use rigwright_core::gallery::hanging_chain;
use rigwright_verification::{model, rel, solve};

const H_REF: f64 = 2023.1664;
const SAG_REF: f64 = 6.20867;

fn horizontal_tension(links: usize) -> (f64, f64) {
    let p = hanging_chain(links, 100.0, 101.0, 1e7, 10.0, 9.81, 6.0);
    let m = model(&p);
    let eq = solve(&m);
    assert!(eq.stability.is_stable(), "{:?}", eq.stability);
    let ra = eq.nodes[0].reaction.expect("anchored end");
    // Mid-span node (links even).
    let sag = -eq.nodes[links / 2].position.y;
    (ra.x.abs(), sag)
}

#[test]
fn chain_of_links_converges_to_irvine_elastic_catenary_at_second_order() {
    let (h10, s10) = horizontal_tension(10);
    let (h20, s20) = horizontal_tension(20);
    let (h40, s40) = horizontal_tension(40);
    let e10 = (h10 - H_REF).abs();
    let e20 = (h20 - H_REF).abs();
    let e40 = (h40 - H_REF).abs();
    // Error ∝ 1/N²: halving the link length quarters the error (ratio ≈ 4).
    let r1 = e10 / e20;
    let r2 = e20 / e40;
    assert!(
        (3.5..4.5).contains(&r1) && (3.5..4.5).contains(&r2),
        "ratios {r1} {r2}; H = {h10} {h20} {h40}"
    );
    assert!(rel(h40, H_REF) < 2e-3, "H(40) = {h40}");
    // Richardson extrapolation from 20 and 40 links lands on the reference to 5 figures.
    let h_inf = h40 + (h40 - h20) / 3.0;
    assert!(rel(h_inf, H_REF) < 2e-5, "extrapolated H = {h_inf}");
    let s_inf = s40 + (s40 - s20) / 3.0;
    assert!((s_inf - SAG_REF).abs() < 1e-3, "extrapolated sag = {s_inf}, 10 links {s10}");
}
