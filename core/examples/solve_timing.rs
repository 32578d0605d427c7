//! Times sparse triangular solves with 1, 2, 4 and 8 right-hand sides on the 100×100 net's
//! tangent stiffness (a scratch measurement for the modes benchmark).

use std::time::Instant;

use rigwright_core::Statics;
use rigwright_core::gallery::cable_net;
use rigwright_core::solve::system::Part;

fn main() {
    let model = cable_net(100, 1.0, 5.0e6, 5000.0, 2.0).validate().expect("valid");
    let t = Instant::now();
    let statics = Statics::new(&model);
    println!("pattern and symbolic analysis {:.1} ms", t.elapsed().as_secs_f64() * 1e3);
    let eq = statics.solve(0, None).expect("converges");
    let sys = statics.system();
    let k = sys.assemble(&model, &eq.displacements(), &model.case_gravity(0), Part::Total);
    let t = Instant::now();
    let f = sys.factor(&k, 0.0).expect("factor");
    println!("factor {:.1} ms ({} DOF)", t.elapsed().as_secs_f64() * 1e3, sys.size());
    let n = sys.size();
    for c in [1usize, 2, 4, 8, 16] {
        let mut b = vec![1.0; n * c];
        let reps = 20;
        let t = Instant::now();
        for _ in 0..reps {
            f.solve_columns_in_place(&mut b, c);
        }
        let ms = t.elapsed().as_secs_f64() * 1e3 / reps as f64;
        println!("{c} rhs: {ms:.2} ms per call, {:.2} ms per rhs", ms / c as f64);
    }
}
