//! Live re-solve while a node is dragged: every step of the drag gives a fresh, stable
//! equilibrium, warm-started from the last one. Prints the solve times (run with
//! `--nocapture` to see them).

use eframe::egui;
use rigwright::RigApp;
use rigwright::gui::{Command, Settings};

#[test]
fn dragging_an_anchor_of_the_canopy_net_resolves_every_step() {
    let ctx = egui::Context::default();
    let settings = Settings {
        last_sample: Some(3),
        ..Settings::default()
    };
    let mut app = RigApp::with_settings(&ctx, settings, None);
    assert_eq!(app.doc.project.nodes.len(), 60, "the canopy net sample is open");
    let anchor = app.doc.project.nodes.iter().position(|n| n.fixed == [true; 3]).unwrap();
    let y0 = app.doc.project.nodes[anchor].at.1;
    app.solve_times.clear();
    for step in 1..=40 {
        let y = y0 + 0.005 * step as f64;
        app.queue(Command::Edit {
            merge: Some("drag".into()),
            apply: Box::new(move |p| p.nodes[anchor].at.1 = y),
        });
        app.apply_commands();
        app.solve_if_needed();
        assert!(app.answer().is_some(), "step {step}: {:?}", app.diagnostic());
    }
    let mut t = app.solve_times.clone();
    t.sort_by(f64::total_cmp);
    println!(
        "canopy net (60 nodes, 84 cables), {} warm-started solves while dragging an anchor: median {:.2} ms, max {:.2} ms",
        t.len(),
        t[t.len() / 2],
        t[t.len() - 1]
    );
    // One drag is one undo step.
    app.queue(Command::Undo);
    app.apply_commands();
    assert_eq!(app.doc.project.nodes[anchor].at.1, y0);
}
