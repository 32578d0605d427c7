//! One drag step as the app does it, on the pretensioned N×N net: a free node moved 1 cm,
//! then validate → build the solver → warm solve from the previous equilibrium. Splits the
//! time into validation, solver build (pattern and symbolic analysis) and solve, and times
//! the same step with the solver's structure reused from the previous step.
//!
//! Run: `cargo run --release -p rigwright-core --example drag_timing [N]` (default 32).

use std::time::Instant;

use rigwright_core::gallery::cable_net;
use rigwright_core::{Statics, Warm};

fn main() {
    let n: usize = std::env::args().nth(1).and_then(|a| a.parse().ok()).unwrap_or(32);
    let mut project = cable_net(n, 1.0, 5.0e6, 5000.0, 2.0);
    let model = project.validate().expect("valid");
    let mut eq = Statics::new(&model).solve(0, None).expect("converges");
    let id = format!("n{}_{}", n / 2, n / 2);
    let node = project.nodes.iter().position(|x| x.id == id).expect("centre node");
    // Held as the app's drag holds it: the centre node moves with the cursor.
    let (mut validate, mut build, mut solve, mut reuse_build, mut reuse_solve, mut iters) = (0.0, 0.0, 0.0, 0.0, 0.0, 0);
    let steps = 20;
    let mut system = None;
    for k in 0..steps {
        project.nodes[node].at.0 += 0.01;
        let t = Instant::now();
        let m = project.validate().expect("valid");
        validate += t.elapsed().as_secs_f64();
        let warm = Warm::from(&eq);
        // Fresh solver, as the app does today.
        let t = Instant::now();
        let statics = Statics::new(&m);
        build += t.elapsed().as_secs_f64();
        let t = Instant::now();
        let fresh = statics.solve(0, Some(&warm)).expect("converges");
        solve += t.elapsed().as_secs_f64();
        // The same step with the previous step's structure.
        let t = Instant::now();
        let reused = match system.take() {
            Some(s) => Statics::with_system(&m, None, s),
            None => Statics::new(&m),
        };
        reuse_build += t.elapsed().as_secs_f64();
        let t = Instant::now();
        let again = reused.solve(0, Some(&warm)).expect("converges");
        reuse_solve += t.elapsed().as_secs_f64();
        assert_eq!(again, fresh, "step {k}: a reused structure gives the same answer");
        iters += fresh.iterations;
        system = Some(reused.into_system());
        eq = fresh;
    }
    let ms = |t: f64| t * 1e3 / steps as f64;
    println!(
        "{n}×{n} net, {} DOF, per drag step: validate {:.2} ms, build {:.2} ms, solve {:.2} ms ({:.1} Newton iterations); reused structure: build {:.3} ms, solve {:.2} ms",
        Statics::new(&model).dof_count(),
        ms(validate),
        ms(build),
        ms(solve),
        iters as f64 / steps as f64,
        ms(reuse_build),
        ms(reuse_solve)
    );
}
