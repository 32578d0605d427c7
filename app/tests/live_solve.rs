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

/// An app with a 24×24 cable net (572 nodes, solved on the worker) open from a file in a
/// scratch folder named after `name`; returns the app and the folder.
fn app_with_large_net(ctx: &egui::Context, name: &str) -> (RigApp, std::path::PathBuf) {
    let mut app = RigApp::with_settings(ctx, Settings::default(), None);
    let dir = std::env::temp_dir().join(format!("rigwright-{name}-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("net.rig.ron");
    let net = rigwright_core::gallery::cable_net(24, 1.0, 5.0e6, 5000.0, 4.0);
    std::fs::write(&path, net.to_ron()).unwrap();
    app.queue(Command::Open(path));
    app.apply_commands();
    (app, dir)
}

#[test]
fn a_large_net_solves_on_the_worker_thread_without_blocking_the_frame() {
    use std::time::{Duration, Instant};
    let ctx = egui::Context::default();
    let (mut app, dir) = app_with_large_net(&ctx, "large");
    let start = Instant::now();
    app.solve_if_needed();
    let queued = start.elapsed();
    assert!(app.solver_busy(), "a rig this size goes to the worker");
    let deadline = Instant::now() + Duration::from_secs(60);
    while app.answer().is_none() && Instant::now() < deadline {
        std::thread::sleep(Duration::from_millis(5));
        app.solve_if_needed();
    }
    assert!(app.answer().is_some(), "{:?}", app.diagnostic());
    println!(
        "24×24 net ({} nodes): the frame spent {:.2} ms sending the request; the worker solved it in {:.1} ms",
        app.doc.model.nodes.len(),
        queued.as_secs_f64() * 1e3,
        app.solve_times.last().copied().unwrap_or(f64::NAN)
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_newer_request_cancels_the_large_solve_in_flight_and_only_the_newest_answer_is_shown() {
    use std::sync::Arc;
    use std::time::{Duration, Instant};
    let ctx = egui::Context::default();
    let (mut app, dir) = app_with_large_net(&ctx, "cancel");
    app.solve_if_needed();
    assert!(app.solver_busy(), "a rig this size goes to the worker");
    // Three quick edits while the first solve runs: each new request cancels the one before.
    for step in 1..=3 {
        app.queue(Command::Edit {
            merge: Some("drag".into()),
            apply: Box::new(move |p| p.nodes[0].at.1 = 0.01 * f64::from(step)),
        });
        app.apply_commands();
        app.solve_if_needed();
    }
    let deadline = Instant::now() + Duration::from_secs(60);
    while app.answer().is_none() && Instant::now() < deadline {
        if let Some(d) = app.diagnostic() {
            assert!(!d.contains("cancelled"), "a cancelled solve reached the screen: {d}");
        }
        std::thread::sleep(Duration::from_millis(5));
        app.solve_if_needed();
    }
    assert!(app.answer().is_some(), "{:?}", app.diagnostic());
    let shown = app.solved.as_ref().unwrap();
    assert!(Arc::ptr_eq(&shown.model, &app.doc.model), "the answer shown is of the newest edit");
    std::fs::remove_dir_all(&dir).ok();
}

/// Moving an anchor in the app shows exactly the equilibrium a cold solve of the edited file
/// gives, and so do undo and redo (issue 14: wall-right at x = 5.5 m gives 429.39 N and
/// 385.70 N at the upper ends of the two ropes, their own weight in their catenaries (428.40 N
/// and 384.28 N with it lumped at the ends); before, the warm start put the anchor back and
/// showed 374.9 N and 294.5 N).
#[test]
fn moving_an_anchor_shows_the_equilibrium_of_the_edited_rig_and_undo_redo_agree() {
    use rigwright_core::Statics;
    let ctx = egui::Context::default();
    let settings = Settings {
        last_sample: Some(0),
        ..Settings::default()
    };
    let mut app = RigApp::with_settings(&ctx, settings, None);
    app.solve_if_needed();
    let right = app.doc.project.nodes.iter().position(|n| n.id == "wall-right").unwrap();
    let check = |app: &RigApp, expect: Option<(f64, f64)>| {
        let cold_model = app.doc.project.validate().unwrap();
        let cold = Statics::new(&cold_model).solve(0, None).unwrap();
        let shown = app.answer().expect("a stable answer is shown");
        assert_eq!(shown.eq.nodes[right].position.x, app.doc.project.nodes[right].at.0);
        assert_eq!(shown.eq.nodes[right].displacement.norm(), 0.0, "an anchor never moves");
        for (a, b) in shown.eq.members.iter().zip(&cold.members) {
            assert!(
                (a.force - b.force).abs() <= 1e-9 * b.force.abs(),
                "{}: shown {} vs cold {}",
                a.id,
                a.force,
                b.force
            );
        }
        if let Some((f0, f1)) = expect {
            assert!((shown.eq.members[0].force - f0).abs() < 0.01 && (shown.eq.members[1].force - f1).abs() < 0.01);
        }
    };
    check(&app, None);
    app.queue(Command::Edit {
        merge: None,
        apply: Box::new(move |p| p.nodes[right].at.0 = 5.5),
    });
    app.apply_commands();
    app.solve_if_needed();
    check(&app, Some((429.39, 385.70)));
    app.queue(Command::Undo);
    app.apply_commands();
    app.solve_if_needed();
    check(&app, None);
    app.queue(Command::Redo);
    app.apply_commands();
    app.solve_if_needed();
    check(&app, Some((429.39, 385.70)));
}
