//! Interaction tests of the desktop app, driven through the UI by role and label with
//! egui_kittest (no display or GPU needed).
//!
//! One file on purpose, past 500 lines: every test binary of the app links all of eframe, so
//! each file split off would add a link to CI's time.

use eframe::egui::{self, Pos2};
use egui_kittest::Harness;
use egui_kittest::kittest::{NodeT, Queryable};
use rigwright::RigApp;
use rigwright::gui::{Command, Quantity, ReadoutTab, Recovery, Selection, Settings, Units, hold_jobs_spawned_here};
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};

fn harness() -> Harness<'static, RigApp> {
    Harness::builder()
        .with_size(egui::vec2(1280.0, 800.0))
        .build_eframe(|cc| RigApp::with_recovery(&cc.egui_ctx, Settings::default(), None, Recovery::off()))
}

/// Presses and releases the primary button at `p` on the Rig view.
fn click_at(h: &mut Harness<'static, RigApp>, p: Pos2) {
    h.hover_at(p);
    h.run();
    h.drag_at(p);
    h.step();
    h.drop_at(p);
    h.run();
}

fn at(h: &Harness<'static, RigApp>, x: f64, y: f64) -> Pos2 {
    h.state().screen_pos([x, y, 0.0])
}

fn tool(h: &mut Harness<'static, RigApp>, label: &str) {
    h.get_by_role_and_label(egui::accesskit::Role::Button, label).click();
    h.run();
}

/// Builds two anchors, a 10 kg node below between them and two cables, all through the UI.
fn build_small_rig(h: &mut Harness<'static, RigApp>) {
    h.get_by_label("File").click();
    h.run();
    h.get_by_label("New").click();
    h.run();
    assert!(h.state().doc.project.nodes.is_empty());
    tool(h, "Anchor");
    let (a1, a2, m) = (at(h, -2.0, 1.0), at(h, 2.0, 1.0), at(h, 0.0, -1.0));
    click_at(h, a1);
    click_at(h, a2);
    tool(h, "Node");
    click_at(h, m);
    tool(h, "Cable");
    click_at(h, a1);
    click_at(h, m);
    click_at(h, a2);
    click_at(h, m);
}

#[test]
fn a_rig_built_through_the_ui_shows_its_solved_cable_tension() {
    let mut h = harness();
    build_small_rig(&mut h);
    let app = h.state();
    assert_eq!(app.doc.project.nodes.len(), 3, "{:?}", app.doc.project.nodes);
    assert_eq!(app.doc.project.members.len(), 2);
    assert!(app.doc.problems.is_none(), "{:?}", app.doc.problems);
    let a = app.answer().expect("the rig solves");
    // Symmetric: each cable at 45°, T = m g / (2 sin 45°) (statics of a point, common practice).
    let expected = 10.0 * 9.81 / (2.0 * std::f64::consts::FRAC_1_SQRT_2);
    let force = a.eq.members[0].force;
    assert!(
        (force - expected).abs() < 0.01 * expected,
        "tension {force} N, expected about {expected} N"
    );
    let text = Units::Si.show(Quantity::Force, force);
    assert!(h.query_all_by_label(&text).count() >= 1, "the Members readout shows {text}");
}

#[test]
fn undo_removes_the_last_member_and_redo_restores_it() {
    let mut h = harness();
    build_small_rig(&mut h);
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().doc.project.members.len(), 1);
    h.key_press_modifiers(egui::Modifiers::COMMAND | egui::Modifiers::SHIFT, egui::Key::Z);
    h.run();
    assert_eq!(h.state().doc.project.members.len(), 2);
    h.get_by_label("Edit").click();
    h.run();
    h.get_by_label("Undo").click();
    h.run();
    assert_eq!(h.state().doc.project.members.len(), 1);
}

fn restoring_text(h: &Harness<'static, RigApp>) -> String {
    let node = h.get_by_label_contains("Restoring force");
    let a = node.accesskit_node();
    a.label().or_else(|| a.value()).unwrap_or_default()
}

#[test]
fn pulling_a_node_shows_a_restoring_force_that_grows_with_the_pull() {
    let mut h = harness();
    // The default sample: a sign hung from two wall cables; the sign node is at (1.8, 2.6) m.
    tool(&mut h, "Pull");
    let start = {
        let a = h.state().answer().expect("the sample solves");
        let i = a.model.node_index("sign").unwrap();
        let p = a.eq.nodes[i].position;
        h.state().screen_pos([p.x, p.y, p.z])
    };
    h.hover_at(start);
    h.run();
    h.drag_at(start);
    h.step();
    let mut texts = Vec::new();
    for k in 1..=6 {
        h.hover_at(start + egui::vec2(6.0 * k as f32, 0.0));
        h.run();
        if k == 3 || k == 6 {
            texts.push(restoring_text(&h));
        }
    }
    let pull = h.state().pull.as_ref().expect("a pull runs");
    assert!(pull.active);
    assert!(pull.samples.len() > 2);
    assert_ne!(
        texts[0], texts[1],
        "the restoring force readout changes as the node is pulled further"
    );
    assert!(texts[1].contains(" N"), "{}", texts[1]);
    h.drop_at(start + egui::vec2(36.0, 0.0));
    // Letting go starts a Pluck, which keeps repainting: step frames instead of settling.
    h.run_steps(6);
    assert!(!h.state().pull.as_ref().unwrap().active);
    assert!(h.state().answer().is_some(), "after release the rig is solved again");
    let t0 = h
        .state()
        .pluck
        .as_ref()
        .unwrap_or_else(|| panic!("letting go starts a Pluck: {:?}", h.state().message))
        .motion
        .time();
    h.run_steps(20);
    let p = h.state().pluck.as_ref().expect("the Pluck keeps running");
    assert!(p.motion.time() > t0, "the rig moves in time");
    assert!(p.history.len() > 2);
    assert!(p.failure.is_none(), "{:?}", p.failure);
    // Pause stops the clock.
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Pause").click();
    h.run_steps(2);
    let paused = h.state().pluck.as_ref().unwrap().motion.time();
    h.run_steps(5);
    assert_eq!(h.state().pluck.as_ref().unwrap().motion.time(), paused);
}

#[test]
fn the_modes_tab_lists_the_natural_frequencies_of_the_equilibrium() {
    let mut h = harness();
    show_tab(&mut h, ReadoutTab::Modes);
    h.run();
    let expected = {
        let a = h.state().answer().expect("the sample solves");
        let statics = rigwright_core::Statics::new(a.model);
        let ms = rigwright_core::dynamics::modes(&statics, a.eq, 2).unwrap();
        format!("{:.4}", ms.modes[0].frequency_hz)
    };
    assert!(
        h.query_by_label(&expected).is_some(),
        "the lowest frequency {expected} Hz is listed"
    );
    // Animating a mode keeps the view moving.
    h.get_all_by_label("Animate").next().expect("an Animate button per mode").click();
    h.run_steps(3);
    assert_eq!(h.state().modes.as_ref().unwrap().animate, Some(0));
}

#[test]
fn save_and_reopen_through_the_command_path_gives_the_same_project() {
    let dir = std::env::temp_dir().join(format!("rigwright-ui-test-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("small.rig.ron");
    let mut h = harness();
    build_small_rig(&mut h);
    let built = h.state().doc.project.clone();
    h.state_mut().queue(Command::SaveTo(path.clone()));
    h.run();
    assert!(!h.state().doc.dirty);
    assert!(h.state().title().starts_with("small.rig.ron"), "{}", h.state().title());
    // Change something, then reopen: the app asks before discarding the change.
    h.state_mut().selection = Selection::Node(0);
    h.key_press(egui::Key::Delete);
    h.run();
    assert!(h.state().doc.dirty);
    assert!(h.state().title().starts_with('●'));
    h.state_mut().queue(Command::Open(path.clone()));
    h.run();
    h.get_by_label("Discard changes").click();
    h.run();
    assert_eq!(h.state().doc.project, built);
    assert!(!h.state().doc.dirty);
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_bad_file_keeps_the_current_project_and_names_the_problem() {
    let dir = std::env::temp_dir().join(format!("rigwright-ui-bad-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("bad.rig.ron");
    std::fs::write(
        &path,
        "(version: 1, nodes: [(id: \"a\", at: (0.0, 0.0, 0.0), fixd: (true, true, true))], members: [])",
    )
    .unwrap();
    let mut h = harness();
    let before = h.state().doc.project.clone();
    h.state_mut().queue(Command::Open(path));
    h.run();
    assert_eq!(h.state().doc.project, before);
    let (msg, is_error) = h.state().message.clone().unwrap();
    assert!(is_error && msg.contains("fixd"), "{msg}");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn switching_units_shows_forces_in_pounds_force() {
    let mut h = harness();
    h.get_by_label("SI").click();
    h.run();
    assert_eq!(h.state().settings.units, Units::Us);
    assert!(h.query_all_by_label_contains(" lbf").count() > 0);
}

#[test]
fn a_mass_balanced_on_a_pinned_strut_is_reported_and_not_shown_as_an_answer() {
    use rigwright::gui::EditFn;
    use rigwright_core::model::{MemberDoc, MemberDocKind, NodeDoc, Rest};
    let mut h = harness();
    h.state_mut().queue(Command::New);
    h.run();
    let edit: EditFn = Box::new(|p| {
        p.nodes.push(NodeDoc {
            id: "ground".into(),
            at: (0.0, 0.0, 0.0),
            mass: 0.0,
            fixed: [true; 3],
        });
        p.nodes.push(NodeDoc {
            id: "top".into(),
            at: (0.0, 1.0, 0.0),
            mass: 10.0,
            fixed: [false; 3],
        });
        p.members.push(MemberDoc {
            id: "rope".into(),
            ends: ("ground".into(), "top".into()),
            kind: MemberDocKind::Strut {
                ea: 1e6,
                rest: Rest::AsDrawn,
            },
            mass_per_length: 0.0,
            design: None,
        });
    });
    h.state_mut().queue(Command::Edit { merge: None, apply: edit });
    h.run();
    assert!(h.state().answer().is_none(), "an inverted pendulum is not a usable equilibrium");
    let d = h.state().diagnostic().expect("a diagnostic is given");
    assert!(h.query_all_by_label(&d).count() >= 1, "the Readouts show the diagnostic: {d}");
    assert_eq!(h.query_all_by_label("rope").count(), 0, "no member table is shown");
}

#[test]
fn a_box_drag_selects_several_nodes_and_delete_removes_them_with_their_members() {
    let mut h = harness();
    let screen = |h: &Harness<'static, RigApp>, id: &str| {
        let n = h.state().doc.project.nodes.iter().find(|n| n.id == id).unwrap().at;
        h.state().screen_pos([n.0, n.1, n.2])
    };
    // The default sample: wall-left (0, 4), sign (1.8, 2.6), wall-right (5, 4.6). A box around
    // the last two leaves wall-left out.
    let (a, b) = (screen(&h, "sign"), screen(&h, "wall-right"));
    let from = Pos2::new(a.x.min(b.x) - 15.0, a.y.max(b.y) + 15.0);
    let to = Pos2::new(a.x.max(b.x) + 15.0, a.y.min(b.y) - 15.0);
    h.hover_at(from);
    h.run();
    h.drag_at(from);
    h.step();
    h.hover_at(from + (to - from) * 0.5);
    h.run();
    h.hover_at(to);
    h.run();
    h.drop_at(to);
    h.run();
    let mut caught: Vec<String> = h.state().boxed.iter().map(|&i| h.state().doc.project.nodes[i].id.clone()).collect();
    caught.sort();
    assert_eq!(caught, ["sign", "wall-right"]);
    h.key_press(egui::Key::Delete);
    h.run();
    let p = &h.state().doc.project;
    assert_eq!(p.nodes.iter().map(|n| n.id.as_str()).collect::<Vec<_>>(), ["wall-left"]);
    assert!(p.members.is_empty(), "members attached to deleted nodes go with them");
    // One undo step brings all of it back.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(h.state().doc.project.nodes.len(), 3);
    assert_eq!(h.state().doc.project.members.len(), 2);
}

#[test]
fn f1_opens_the_shortcut_help_and_the_about_box_carries_the_cautions() {
    let mut h = harness();
    h.key_press(egui::Key::F1);
    h.run();
    assert!(h.state().show_help, "F1 opens the keyboard-shortcut overlay");
    h.get_by_label("Help").click();
    h.run();
    h.get_by_label("About Rigwright").click();
    h.run();
    assert!(h.state().show_about);
    assert!(
        h.query_by_label_contains("can fail suddenly and hurt people").is_some(),
        "the About box shows the cautions"
    );
}

#[test]
fn the_checks_tab_shows_status_in_words_and_auto_size_fixes_a_failure() {
    let mut h = harness();
    show_tab(&mut h, ReadoutTab::Checks);
    h.run();
    let p = h.state().doc.project.clone();
    let report = rigwright_core::sizing::check_project(&p, &rigwright_core::sizing::project_catalogue(&p, &Default::default())).unwrap();
    let governing = report.members[0].governing_line().unwrap();
    let u = format!("{:.1} %", governing.utilisation.unwrap() * 100.0);
    assert!(h.query_by_label(&u).is_some(), "utilisation {u} of the first member is listed");
    assert!(h.query_all_by_label("pass").count() >= 2);
    assert!(h.query_by_label("All checks pass").is_some());
    // A design factor of 100 on 6 mm rope fails both cables; the words say so.
    h.state_mut().queue(Command::Edit {
        merge: None,
        apply: Box::new(|p| p.sizing.design_factors.cable = 100.0),
    });
    h.run();
    h.run();
    // The first row (the short rope, the more loaded) is in view; the table scrolls.
    assert!(h.query_all_by_label("FAIL").count() >= 1);
    assert!(h.query_by_label("NOT ALL CHECKS PASS").is_some());
    h.get_by_label("Auto-size cables").click();
    h.run();
    h.run();
    assert!(h.query_by_label("All checks pass").is_some(), "auto-size chose parts that pass");
    let parts: Vec<_> = h
        .state()
        .doc
        .project
        .members
        .iter()
        .map(|m| m.design.as_ref().unwrap().part.clone().unwrap())
        .collect();
    assert!(parts.iter().all(|id| id != "6x19-IWRC-6-1770"), "{parts:?}");
    // One undo step brings the old parts back.
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert_eq!(
        h.state().doc.project.members[0].design.as_ref().unwrap().part.as_deref(),
        Some("6x19-IWRC-6-1770")
    );
}

#[test]
fn the_spring_designer_assigns_its_spring_to_the_member() {
    let mut h = harness();
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample-projects/machine-on-four-springs.rig.ron");
    h.state_mut().queue(Command::Open(path));
    h.run();
    show_tab(&mut h, ReadoutTab::Checks);
    h.run();
    h.state_mut().selection = Selection::Member(0);
    h.run();
    h.get_by_label("Spring designer…").click();
    h.run();
    h.get_by_label("Assign to `isolator-1`").click();
    h.run();
    let m = &h.state().doc.project.members[0];
    let s = m.design.as_ref().unwrap().spring.expect("a spring design");
    match m.kind {
        rigwright_core::model::MemberDocKind::Spring { rate, rest } => {
            assert!((rate - s.properties().rate).abs() < 1e-9 * rate);
            assert_eq!(rest, rigwright_core::Rest::Length(s.free_length_mm * 1e-3));
        }
        _ => panic!("still a spring"),
    }
}

#[test]
fn a_sweep_run_from_the_sweep_tab_plots_its_outputs() {
    let mut h = harness();
    show_tab(&mut h, ReadoutTab::Sweep);
    h.run();
    h.get_by_label("Run Sweep").click();
    h.run();
    assert!(h.query_by_label("peak-tension (N)").is_some());
    assert!(h.query_by_label("lowest-frequency (Hz)").is_some());
}

/// The Sweep's Choose menu lists what this rig has and sets the range about its value.
#[test]
fn the_sweep_parameter_can_be_chosen_from_the_rigs_own_items() {
    let mut h = harness();
    show_tab(&mut h, ReadoutTab::Sweep);
    h.run();
    let choices = rigwright::gui::sizing::sweep_choices(&h.state().doc.project);
    let members = &choices.iter().find(|(g, _)| *g == "Member properties").unwrap().1;
    let first = h.state().doc.project.members[0].id.clone();
    let wanted = format!("member:{first}:ea");
    assert!(members.contains(&wanted), "{members:?}");
    // No rate for a cable, no z on a planar rig.
    assert!(!members.iter().any(|m| m.ends_with(":rate")), "{members:?}");
    let nodes = &choices.iter().find(|(g, _)| *g == "Node mass and position").unwrap().1;
    assert!(!nodes.iter().any(|n| n.ends_with(":z")), "{nodes:?}");
    h.get_by_label("Choose…").click();
    h.run();
    h.get_by_label("Member properties").click();
    h.run();
    h.get_by_label(&wanted).click();
    h.run();
    let ea = match h.state().doc.project.members[0].kind {
        rigwright_core::model::MemberDocKind::Cable { ea, .. } => ea,
        _ => panic!("the first member of the sample is a cable"),
    };
    let (param, from, to) = h.state().sizing.sweep_setup();
    assert_eq!(param, wanted);
    assert!(
        (from - 0.5 * ea).abs() < 1e-6 * ea && (to - 1.5 * ea).abs() < 1e-6 * ea,
        "{from}..{to}"
    );
    // A mass of zero (an anchor's) sweeps from zero up to the rig's largest mass, never below.
    let anchor = h.state().doc.project.nodes.iter().find(|n| n.mass == 0.0).unwrap().id.clone();
    let largest = h.state().doc.project.nodes.iter().map(|n| n.mass).fold(0.0, f64::max);
    h.get_by_label("Choose…").click();
    h.run();
    h.get_by_label("Node mass and position").click();
    h.run();
    h.get_by_label(&format!("node:{anchor}:mass")).click();
    h.run();
    let (_, from, to) = h.state().sizing.sweep_setup();
    assert_eq!((from, to), (0.0, largest));
}

#[test]
fn importing_a_parts_file_adds_its_parts_and_a_bad_one_changes_nothing() {
    let mut h = harness();
    let good = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample-projects/example-supplier.parts.ron");
    rigwright::gui::sizing::import_parts(h.state_mut(), &good);
    h.run();
    let ids: Vec<String> = h.state().doc.project.sizing.parts.iter().map(|p| p.id.clone()).collect();
    assert_eq!(ids, ["demo-dyneema-6", "demo-rod-m10"]);
    let bad = std::env::temp_dir().join(format!("rigwright-bad-parts-{}.parts.ron", std::process::id()));
    std::fs::write(
        &bad,
        "(version: 1, parts: [(id: \"x\", breaking_force: 0.0, ea: 1.0, mass_per_length: 0.1)])",
    )
    .unwrap();
    let before = h.state().doc.project.clone();
    rigwright::gui::sizing::import_parts(h.state_mut(), &bad);
    h.run();
    assert_eq!(h.state().doc.project, before);
    let (msg, is_error) = h.state().message.clone().unwrap();
    assert!(is_error && msg.contains("part `x`"), "{msg}");
    std::fs::remove_file(bad).ok();
}

/// Shows readout tab `tab` by clicking it, clicking again when a frame moved the tab from under
/// the click (on a large rig the window's layout can still change as results come in).
#[track_caller]
fn show_tab(h: &mut Harness<'static, RigApp>, tab: ReadoutTab) {
    for _ in 0..10 {
        h.get_by_label(tab.label()).click();
        h.step();
        if h.state().readout_tab == tab {
            return;
        }
    }
    panic!("the {tab:?} tab does not open");
}

/// Steps frames (without waiting for the UI to settle) until `done` or 60 s pass.
#[track_caller]
fn step_until(h: &mut Harness<'static, RigApp>, done: impl Fn(&RigApp) -> bool) {
    let start = std::time::Instant::now();
    while !done(h.state()) && start.elapsed().as_secs() < 60 {
        h.step();
        std::thread::sleep(std::time::Duration::from_millis(20));
    }
    assert!(done(h.state()), "timed out");
}

/// The app with a 22×22 net open (480 nodes, 1,200 free DOFs), solved; and the file's path.
fn large_net(name: &str) -> (Harness<'static, RigApp>, std::path::PathBuf) {
    let mut h = harness();
    let net = rigwright_core::gallery::cable_net(22, 1.0, 5.0e6, 5000.0, 2.0);
    let path = std::env::temp_dir().join(format!("rigwright-{name}-{}.rig.ron", std::process::id()));
    std::fs::write(&path, net.to_ron()).unwrap();
    h.state_mut().queue(Command::Open(path.clone()));
    h.step();
    step_until(&mut h, |app| app.answer().is_some());
    (h, path)
}

#[test]
fn modes_and_checks_of_a_large_rig_run_beside_the_window() {
    let (mut h, path) = large_net("large");
    // Jobs wait at the gate until it opens, so the frames below certainly see them running.
    let gate = Arc::new(AtomicBool::new(true));
    hold_jobs_spawned_here(Some(gate.clone()));
    show_tab(&mut h, ReadoutTab::Modes);
    h.step();
    // The first frames show the work in progress; the window keeps drawing meanwhile.
    assert!(h.state().modes_job.is_some(), "the modes of 1,200 free DOFs run on another thread");
    gate.store(false, Ordering::Relaxed);
    step_until(&mut h, |app| app.modes.is_some());
    assert!(h.state().modes.as_ref().unwrap().result.is_ok());
    gate.store(true, Ordering::Relaxed);
    show_tab(&mut h, ReadoutTab::Checks);
    h.step();
    assert!(h.state().sizing.checking(), "a 480-node rig is checked on another thread");
    gate.store(false, Ordering::Relaxed);
    step_until(&mut h, |app| app.sizing.report().is_some());
    assert_eq!(
        h.state().sizing.report().unwrap().members.len(),
        h.state().doc.project.members.len()
    );
    hold_jobs_spawned_here(None);
    std::fs::remove_file(path).ok();
}

fn button(h: &Harness<'static, RigApp>, label: &str) -> bool {
    h.query_by_role_and_label(egui::accesskit::Role::Button, label).is_some()
}

/// Drags node `id` 20 px down with the Pull tool (already chosen), waits for the pull force and
/// lets go.
fn pull_and_release(h: &mut Harness<'static, RigApp>, id: &str) {
    let start = {
        let a = h.state().answer().unwrap();
        let p = a.eq.nodes[a.model.node_index(id).unwrap()].position;
        h.state().screen_pos([p.x, p.y, p.z])
    };
    h.hover_at(start);
    h.step();
    h.drag_at(start);
    h.step();
    let end = start + egui::vec2(0.0, 20.0);
    h.hover_at(end);
    h.step();
    step_until(h, |app| app.pull.as_ref().is_some_and(|p| p.force.is_some()));
    h.drop_at(end);
    h.step();
    h.step();
}

#[test]
fn long_computations_of_a_large_rig_can_be_cancelled_and_started_again() {
    let (mut h, path) = large_net("cancel");
    // Jobs wait at the gate while it is closed, so each Cancel below meets a running job.
    let gate = Arc::new(AtomicBool::new(true));
    hold_jobs_spawned_here(Some(gate.clone()));
    let open = |g: &AtomicBool, v: bool| g.store(!v, Ordering::Relaxed);

    // Modes: Cancel, then compute again.
    show_tab(&mut h, ReadoutTab::Modes);
    h.step();
    assert!(h.state().modes_job.is_some());
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Cancel").click();
    h.step();
    assert!(h.state().modes_job.is_none(), "cancelled");
    h.step();
    assert!(button(&h, "Compute the modes"), "offers to compute again");
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Compute the modes").click();
    h.step();
    h.step();
    assert!(h.state().modes_job.is_some(), "computing again");
    open(&gate, true);
    step_until(&mut h, |app| app.modes.as_ref().is_some_and(|m| m.result.is_ok()));
    open(&gate, false);

    // Checks: Cancel, then check now.
    show_tab(&mut h, ReadoutTab::Checks);
    h.step();
    assert!(h.state().sizing.checking());
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Cancel").click();
    h.step();
    assert!(!h.state().sizing.checking() && h.state().sizing.report().is_none());
    h.step();
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Check now").click();
    h.step();
    h.step();
    assert!(h.state().sizing.checking());
    open(&gate, true);
    step_until(&mut h, |app| app.sizing.report().is_some());
    open(&gate, false);

    // Sweep: runs beside the window and can be cancelled.
    show_tab(&mut h, ReadoutTab::Sweep);
    h.run();
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Run Sweep").click();
    h.step();
    assert!(
        h.state().sizing.sweeping(),
        "a 480-node rig is swept on another thread: {:?}",
        h.state().sizing.sweep_result().map(|r| r.as_ref().map(|r| r.rows.len()))
    );
    h.step();
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Cancel").click();
    h.step();
    assert!(!h.state().sizing.sweeping() && h.state().sizing.sweep_result().is_none());

    // Pluck: pull the middle node, let go; it is prepared on another thread.
    tool(&mut h, "Pull");
    pull_and_release(&mut h, "n11_11");
    assert!(
        h.state().pluck_job.is_some(),
        "the Pluck of 1,200 free DOFs is prepared on another thread"
    );
    show_tab(&mut h, ReadoutTab::Pluck);
    h.step();
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Cancel").click();
    h.step();
    assert!(h.state().pluck_job.is_none() && h.state().pluck.is_none(), "not started");
    // A second pull and release runs.
    open(&gate, true);
    step_until(&mut h, |app| app.answer().is_some_and(|a| a.eq.hold.is_none()));
    pull_and_release(&mut h, "n11_11");
    step_until(&mut h, |app| app.pluck.is_some());
    assert!(h.state().pluck.as_ref().unwrap().failure.is_none());
    hold_jobs_spawned_here(None);
    std::fs::remove_file(path).ok();
}

#[test]
fn auto_size_of_a_large_rig_runs_beside_the_window_and_cancel_changes_nothing() {
    let (mut h, path) = large_net("autosize");
    show_tab(&mut h, ReadoutTab::Checks);
    h.step();
    step_until(&mut h, |app| app.sizing.report().is_some());
    h.run_steps(2);
    let before = h.state().doc.project.clone();
    // The job waits at the gate, so Cancel certainly meets it running.
    let gate = Arc::new(AtomicBool::new(true));
    hold_jobs_spawned_here(Some(gate.clone()));

    // An auto-size still running when the file is opened again (a new document with as few
    // edits) is not applied to it.
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Auto-size cables").click();
    h.step();
    assert!(h.state().task.is_some());
    h.state_mut().queue(Command::Open(path.clone()));
    h.step();
    gate.store(false, Ordering::Relaxed);
    step_until(&mut h, |app| app.task.is_none());
    assert_eq!(h.state().doc.project, before, "the reopened document is not auto-sized");
    assert!(
        h.state().message.as_ref().is_some_and(|(m, _)| m.contains("edited while it ran")),
        "{:?}",
        h.state().message
    );
    step_until(&mut h, |app| app.sizing.report().is_some());
    h.run_steps(2);
    gate.store(true, Ordering::Relaxed);
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Auto-size cables").click();
    h.step();
    assert!(h.state().task.is_some(), "auto-size of a 480-node rig runs on another thread");
    h.step();
    h.get_by_role_and_label(egui::accesskit::Role::Button, "Cancel").click();
    h.step();
    assert!(h.state().task.is_none());
    assert_eq!(h.state().doc.project, before, "a cancelled auto-size changes nothing");
    assert!(h.state().message.as_ref().is_some_and(|(m, _)| m.contains("cancelled")));
    gate.store(false, Ordering::Relaxed);
    hold_jobs_spawned_here(None);

    h.get_by_role_and_label(egui::accesskit::Role::Button, "Auto-size cables").click();
    h.step();
    step_until(&mut h, |app| app.task.is_none());
    h.run_steps(2);
    let app = h.state();
    let (msg, _) = app.message.as_ref().expect("auto-size reports");
    assert!(msg.starts_with("Auto-size:"), "{msg}");
    assert!(
        app.doc
            .project
            .members
            .iter()
            .all(|m| m.design.as_ref().is_some_and(|d| d.part.is_some())),
        "every cable got a part: {msg}"
    );
    std::fs::remove_file(path).ok();
}

#[test]
fn title_block_and_marked_nodes_edited_in_the_app_reach_the_sheet() {
    let mut h = harness();
    // The project's Sheet title block, through its text field.
    h.get_by_label("Sheet title block").click();
    h.run();
    h.get_by_label("Checked by").click();
    h.run();
    h.get_by_label("Checked by").type_text("B. Checker");
    h.run();
    assert_eq!(h.state().doc.project.sheet.checked_by, "B. Checker");
    // Mark the sign's node for a stiffness listing.
    let sign = h.state().doc.project.nodes.iter().position(|n| n.id == "sign").unwrap();
    h.state_mut().selection = Selection::Node(sign);
    h.run();
    h.get_by_label("list its tangent stiffness on the Sheet").click();
    h.run();
    assert_eq!(h.state().doc.project.sheet.stiffness_at, ["sign"]);
    let sheet = rigwright::gui::export::build_sheet(h.state()).unwrap();
    assert_eq!(sheet.info.checked_by, "B. Checker");
    assert_eq!(sheet.stiffness.len(), 1);
    assert_eq!(sheet.stiffness[0].0, "sign");
    assert!(sheet.stiffness[0].1.is_ok());
}

/// A shallow truss loaded to twice its limit (closed form 38.10872 N, see the verification
/// suite): the app shows no answer and names the limit point; the Load path tab traces the path
/// through it; ticking "Follow past limit points" shows the snapped-through state with a note
/// that it lies on another branch (issue 14).
#[test]
fn a_limit_point_is_shown_as_such_and_followed_only_when_asked() {
    let mut h = harness();
    let path = std::env::temp_dir().join(format!("rigwright-ui-truss-{}.rig.ron", std::process::id()));
    std::fs::write(
        &path,
        r#"(version: 2, planar: true, gravity: (0.0, 0.0, 0.0), nodes: [(id: "L", at: (-1.0, 0.0, 0.0), fixed: (true, true, true)), (id: "R", at: (1.0, 0.0, 0.0), fixed: (true, true, true)), (id: "C", at: (0.0, 0.1, 0.0), mass: 1.0)], members: [(id: "b1", ends: ("L", "C"), kind: Strut(ea: 100000.0, rest: AsDrawn)), (id: "b2", ends: ("R", "C"), kind: Strut(ea: 100000.0, rest: AsDrawn))], cases: [(name: "2x", loads: [(node: "C", force: (0.0, -76.2, 0.0))])])"#,
    )
    .unwrap();
    h.state_mut().queue(Command::Open(path.clone()));
    h.run_steps(3);
    assert!(h.state().answer().is_none(), "no answer past a limit point");
    let lambda = h.state().critical().expect("the limit point is known");
    assert!((lambda * 76.2 - 38.10872).abs() < 1e-4, "{lambda}");
    assert!(h.state().diagnostic().unwrap().contains("limit point at load factor 0.500114"));
    show_tab(&mut h, ReadoutTab::Path);
    h.get_by_label("Trace the load path at node C").click();
    h.run_steps(2);
    let trace = h.state().path.as_ref().unwrap().result.as_ref().unwrap().as_ref().unwrap().clone();
    assert_eq!(trace.critical[0].kind, "limit point");
    assert!(trace.reached && trace.points.iter().any(|p| !p.stable));
    h.get_by_label("Follow past limit points").click();
    h.run_steps(3);
    let a = h.state().answer().expect("followed: an answer on another branch");
    assert!(-a.eq.nodes[2].displacement.y > 0.2, "snapped through");
    assert!(h.state().route_note().unwrap().contains("another branch"));
    std::fs::remove_file(path).ok();
}

/// The Modes tab lets the user set how many links the sagging cables are cut into; the modes
/// are computed again with them (the sign sample's two ropes have mass).
#[test]
fn the_modes_tab_sets_the_cable_links() {
    let mut h = harness();
    show_tab(&mut h, ReadoutTab::Modes);
    h.run();
    let auto = h
        .state()
        .modes
        .as_ref()
        .and_then(|m| m.result.as_ref().ok())
        .map(|m| m.cables.clone())
        .expect("modes");
    assert!(!auto.is_empty(), "the sample's ropes are cut into links");
    h.get_by_label("Cable links chosen from the frequencies").click();
    h.run();
    let links = h.state().settings.cable_links.expect("links set by hand");
    assert_eq!(links, auto[0].links, "starts from the links in use");
    let now = h
        .state()
        .modes
        .as_ref()
        .and_then(|m| m.result.as_ref().ok())
        .map(|m| m.cables.clone())
        .expect("modes again");
    assert!(now.iter().all(|c| c.links == links), "{now:?}");
}
