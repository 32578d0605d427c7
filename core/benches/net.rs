//! Benchmarks on N×N pretensioned cable nets (N grid points per side, edges anchored):
//! assembly, factorisation, one Newton iteration and the full gravity equilibrium.
//!
//! Run: `cargo bench -p rigwright-core --bench net`. Targets on the 2-core reference machine:
//! one Newton iteration at 2.7k DOF (N = 32) ≤ 2.5 ms; N = 100 (29k DOF) from the flat
//! pretensioned state to converged gravity equilibrium ≤ 0.5 s.

use criterion::{BenchmarkId, Criterion, criterion_group, criterion_main};
use rigwright_core::Statics;
use rigwright_core::gallery::cable_net;
use rigwright_core::solve::system::{Loading, Part};

fn net(n: usize) -> rigwright_core::Model {
    cable_net(n, 1.0, 5.0e6, 5000.0, 2.0).validate().expect("net is valid")
}

fn benches(c: &mut Criterion) {
    let mut g = c.benchmark_group("net");
    g.sample_size(10);
    for n in [10usize, 32, 100] {
        let model = net(n);
        let statics = Statics::new(&model);
        let sys = statics.system();
        let pos = vec![rigwright_core::Vec3::zeros(); model.nodes.len()];
        let load = Loading::of(&model, 0);
        let dofs = sys.size();
        g.bench_with_input(BenchmarkId::new("assembly", dofs), &n, |b, _| {
            b.iter(|| sys.assemble(&model, &pos, &load.gravity, Part::Total))
        });
        let values = sys.assemble(&model, &pos, &load.gravity, Part::Total);
        g.bench_with_input(BenchmarkId::new("factorisation", dofs), &n, |b, _| {
            b.iter(|| sys.factor(&values, 0.0).expect("positive definite"))
        });
        g.bench_with_input(BenchmarkId::new("newton_iteration", dofs), &n, |b, _| {
            b.iter(|| {
                let e = sys.evaluate(&model, &pos, &load, 1.0).expect("finite");
                let k = sys.assemble(&model, &pos, &load.gravity, Part::Total);
                let f = sys.factor(&k, 0.0).expect("positive definite");
                let mut dx: Vec<f64> = e.residual.iter().map(|r| -r).collect();
                f.solve_in_place(&mut dx);
                dx
            })
        });
        g.bench_with_input(BenchmarkId::new("gravity_equilibrium", dofs), &n, |b, _| {
            b.iter(|| Statics::new(&model).solve(0, None).expect("converges"))
        });
    }
    g.finish();
}

criterion_group!(net_benches, benches);
criterion_main!(net_benches);
