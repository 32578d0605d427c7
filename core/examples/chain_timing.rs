//! Times the solve of a long chain drawn far from its shape (a globalised start).
//! `cargo run --release -p rigwright-core --example chain_timing -- 400 0`
use std::time::Instant;

use rigwright_core::Statics;
use rigwright_core::gallery::hanging_chain;

fn main() {
    let args: Vec<String> = std::env::args().collect();
    let links: usize = args.get(1).and_then(|s| s.parse().ok()).unwrap_or(400);
    let sag: f64 = args.get(2).and_then(|s| s.parse().ok()).unwrap_or(0.0);
    let model = hanging_chain(links, 100.0, 101.0, 1e7, 10.0, 9.81, sag).validate().expect("valid");
    let t = Instant::now();
    let eq = Statics::new(&model).solve(0, None);
    let dt = t.elapsed();
    match eq {
        Ok(eq) => println!(
            "{links} links, drawn sag {sag} m: {:?}, {} iterations, route {:?}, H = {:.4} N, {:.1} ms",
            eq.stability,
            eq.iterations,
            eq.route,
            eq.nodes[0].reaction.unwrap().x.abs(),
            dt.as_secs_f64() * 1e3
        ),
        Err(e) => println!("{links} links: {e} ({:.1} ms)", dt.as_secs_f64() * 1e3),
    }
}
