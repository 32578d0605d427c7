//! Writes the N×N pretensioned cable net of the benchmarks to a project file, for trying the
//! app on a large rig: `cargo run -p rigwright-core --example write_net -- 60 net-60.rig.ron`.

use rigwright_core::gallery::cable_net;

fn main() {
    let mut args = std::env::args().skip(1);
    let n: usize = args.next().and_then(|a| a.parse().ok()).unwrap_or(40).max(3);
    let out = args.next().unwrap_or_else(|| format!("net-{n}.rig.ron"));
    let project = cable_net(n, 1.0, 5.0e6, 5000.0, 2.0);
    match std::fs::write(&out, project.to_ron()) {
        Ok(()) => println!("wrote {out}: {} nodes, {} members", project.nodes.len(), project.members.len()),
        Err(e) => {
            eprintln!("could not write {out}: {e}");
            std::process::exit(1);
        }
    }
}
