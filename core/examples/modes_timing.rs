//! Times the lowest 10 modes of the 100×100 net, split into factorisation and the rest, in CPU
//! time of this process (useful when the machine is shared). Run:
//! `cargo run --release -p rigwright-core --example modes_timing [-- N [--all]]` (`--all` lists
//! the 10 frequencies).

use std::time::Instant;

use rigwright_core::Statics;
use rigwright_core::dynamics::modes;
use rigwright_core::gallery::cable_net;

fn cpu_seconds() -> f64 {
    // /proc/self/stat fields 14 and 15: user and system time in clock ticks (100 per second).
    let stat = std::fs::read_to_string("/proc/self/stat").unwrap_or_default();
    let fields: Vec<&str> = stat.rsplit(')').next().unwrap_or("").split_whitespace().collect();
    let tick = |i: usize| fields.get(i).and_then(|v| v.parse::<f64>().ok()).unwrap_or(0.0) / 100.0;
    tick(11) + tick(12)
}

fn main() {
    let n: usize = std::env::args().nth(1).and_then(|a| a.parse().ok()).unwrap_or(100);
    let model = cable_net(n, 1.0, 5.0e6, 5000.0, 2.0).validate().expect("valid");
    let statics = Statics::new(&model);
    let eq = statics.solve(0, None).expect("converges");
    let runs = 5;
    let (c0, w0) = (cpu_seconds(), Instant::now());
    let mut freqs = Vec::new();
    for _ in 0..runs {
        let ms = modes(&statics, &eq, 10).expect("modes");
        freqs = ms.modes.iter().map(|m| m.frequency_hz).collect();
    }
    let first = freqs.first().copied().unwrap_or(f64::NAN);
    let (cpu, wall) = ((cpu_seconds() - c0) / runs as f64, w0.elapsed().as_secs_f64() / runs as f64);
    println!(
        "{} DOF: lowest 10 modes {cpu:.3} s CPU, {wall:.3} s wall per run (f1 = {first:.6} Hz)",
        statics.dof_count()
    );
    if std::env::args().any(|a| a == "--all") {
        let list: Vec<String> = freqs.iter().map(|f| format!("{f:.9}")).collect();
        println!("frequencies (Hz): {}", list.join(", "));
    }
}
