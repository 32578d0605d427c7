//! Cold gravity equilibrium of N×N nets whose cables sag under their own weight (elastic
//! catenaries) against the same nets with weightless straight cables and the same total
//! weight at the nodes — the reference measured in the same run, the two interleaved.
//!
//! Run: `cargo run --release -p rigwright-core --example catenary_net_timing [N ...]`
//! (default 32 100). Target (BENCHMARKS.md): catenary within 2× the straight time.

use std::time::Instant;

use rigwright_core::Statics;
use rigwright_core::gallery::cable_net;

/// Straight: 2 kg per free node. Catenary: 0.6 kg/m on every cable (two 1 m cables per free
/// node: 1.2 kg) plus 0.8 kg per free node.
fn nets(n: usize) -> (rigwright_core::Model, rigwright_core::Model) {
    let straight = cable_net(n, 1.0, 5.0e6, 5000.0, 2.0).validate().expect("valid");
    let mut p = cable_net(n, 1.0, 5.0e6, 5000.0, 0.8);
    for m in &mut p.members {
        m.mass_per_length = 0.6;
    }
    (straight, p.validate().expect("valid"))
}

fn time(model: &rigwright_core::Model) -> (f64, usize) {
    let t = Instant::now();
    let eq = Statics::new(model).solve(0, None).expect("converges");
    assert!(eq.stability.is_stable());
    (t.elapsed().as_secs_f64(), eq.iterations)
}

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    v[v.len() / 2]
}

fn main() {
    let sizes: Vec<usize> = std::env::args().skip(1).filter_map(|a| a.parse().ok()).collect();
    let sizes = if sizes.is_empty() { vec![32, 100] } else { sizes };
    println!("| net | free DOF | straight (median of 5) | catenary (median of 5) | ratio | Newton iterations straight / catenary |");
    println!("|---|---|---|---|---|---|");
    for n in sizes {
        let (straight, catenary) = nets(n);
        let dofs = Statics::new(&straight).dof_count();
        let (mut a, mut b) = (Vec::new(), Vec::new());
        let (mut ia, mut ib) = (0, 0);
        for _ in 0..5 {
            let (t, i) = time(&straight);
            a.push(t);
            ia = i;
            let (t, i) = time(&catenary);
            b.push(t);
            ib = i;
        }
        let (ma, mb) = (median(a), median(b));
        println!(
            "| {n}×{n} | {dofs} | {:.1} ms | {:.1} ms | {:.2} | {ia} / {ib} |",
            ma * 1e3,
            mb * 1e3,
            mb / ma
        );
    }
}
