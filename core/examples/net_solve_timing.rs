//! Times the cold gravity equilibrium of pretensioned nets (N×N, EA 5 MN, 5 kN, 2 kg per node):
//! `cargo run --release -p rigwright-core --example net_solve_timing -- 32 100`.
use std::time::Instant;

use rigwright_core::Statics;
use rigwright_core::gallery::cable_net;

fn main() {
    for n in std::env::args().skip(1).filter_map(|a| a.parse::<usize>().ok()) {
        let model = cable_net(n, 1.0, 5.0e6, 5000.0, 2.0).validate().expect("valid");
        let statics = Statics::new(&model);
        let reps = if n <= 40 { 20 } else { 3 };
        let mut best = f64::INFINITY;
        let mut iterations = 0;
        for _ in 0..reps {
            let t = Instant::now();
            let eq = statics.solve(0, None).expect("converges");
            best = best.min(t.elapsed().as_secs_f64());
            iterations = eq.iterations;
        }
        println!(
            "{n}x{n}: {} DOF, best of {reps}: {:.2} ms, {iterations} iterations",
            statics.dof_count(),
            best * 1e3
        );
    }
}
