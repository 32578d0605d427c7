//! Benchmarks of the dynamics: lowest natural modes of large nets and Pluck time steps.
//!
//! Run: `cargo bench -p rigwright-core --bench dynamics`. Targets on the 2-core reference
//! machine: lowest 10 modes of the 100×100 net ≤ 0.3 s; Pluck steps on a 1,000-node rig fast
//! enough for real time at 60 frames per second with a stable step.

use criterion::{BenchmarkId, Criterion, criterion_group, criterion_main};
use rigwright_core::dynamics::{Motion, MotionSettings, modes, pulled_positions};
use rigwright_core::gallery::cable_net;
use rigwright_core::{Statics, Vec3};

fn benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("dynamics");
    g.sample_size(10);
    for n in [32usize, 100] {
        let model = cable_net(n, 1.0, 5.0e6, 5000.0, 2.0).validate().expect("valid");
        let statics = Statics::new(&model);
        let eq = statics.solve(0, None).expect("converges");
        g.bench_with_input(BenchmarkId::new("lowest_10_modes", statics.dof_count()), &n, |b, _| {
            b.iter(|| modes(&statics, &eq, 10).expect("modes"))
        });
        if n == 32 {
            // Pull the middle node of the 1,022-node net 0.2 m up, release it and time single
            // steps of 1/50 of the lowest natural period.
            let about = eq.positions();
            let mid = model.node_index(&format!("n{}_{}", n / 2, n / 2)).expect("middle node");
            let start = pulled_positions(&model, 0, &eq, mid, Vec3::new(0.0, 0.2, 0.0)).expect("pull");
            let ms = modes(&statics, &eq, 1).expect("modes");
            let dt = ms.modes[0].period_s / 50.0;
            let mut motion = Motion::new(&model, 0, &start, None, &about, MotionSettings { dt, ..Default::default() }).expect("motion");
            g.bench_with_input(BenchmarkId::new("pluck_step", statics.dof_count()), &n, |b, _| {
                b.iter(|| motion.step().expect("step"))
            });
        }
    }
    g.finish();
}

criterion_group!(dynamics_benches, benches);
criterion_main!(dynamics_benches);
