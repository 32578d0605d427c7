//! Autosave and recovery (issue 7), driven through the app with egui_kittest: unsaved changes
//! are copied to the data folder, a clean save removes the copy, and a copy left behind by a
//! session that did not end cleanly is offered at the next start. Each test autosaves into
//! its own folder (`Recovery::in_dir`, what `RIGWRIGHT_DATA_DIR` selects in the app).

use std::path::{Path, PathBuf};
use std::time::Duration;

use eframe::egui;
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;
use rigwright::RigApp;
use rigwright::gui::recovery::{DISCARDED_FILE, RECOVERY_FILE, recovery_text};
use rigwright::gui::{Command, Recovery, Settings};
use rigwright_core::Project;
use rigwright_core::model::NodeDoc;

fn scratch(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("rigwright-recovery-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// The app autosaving into `dir` every `interval`.
fn harness(dir: &Path, interval: Duration) -> Harness<'static, RigApp> {
    let dir = dir.to_path_buf();
    Harness::builder().with_size(egui::vec2(1280.0, 800.0)).build_eframe(move |cc| {
        let mut recovery = Recovery::in_dir(dir.clone());
        recovery.interval = interval;
        RigApp::with_recovery(&cc.egui_ctx, Settings::default(), None, recovery)
    })
}

/// Adds an anchor through the command path (the document becomes dirty).
fn add_anchor(h: &mut Harness<'static, RigApp>, id: &str) {
    let id = id.to_string();
    h.state_mut().queue(Command::Edit {
        merge: None,
        apply: Box::new(move |p: &mut Project| {
            p.nodes.push(NodeDoc {
                id,
                at: (5.0, 5.0, 0.0),
                mass: 0.0,
                fixed: [true; 3],
            })
        }),
    });
    h.run();
}

#[test]
fn unsaved_changes_are_copied_when_due_and_a_save_removes_the_copy() {
    let dir = scratch("autosave");
    let copy = dir.join(RECOVERY_FILE);
    // Not yet due: nothing is written at the first change.
    let mut h = harness(&dir, Duration::from_secs(3600));
    add_anchor(&mut h, "early");
    h.state().recovery.flush();
    assert!(!copy.exists(), "autosave waits for its interval");
    drop(h);

    let mut h = harness(&dir, Duration::ZERO);
    add_anchor(&mut h, "extra-anchor");
    h.run();
    h.state().recovery.flush();
    let kept = Project::from_ron(&std::fs::read_to_string(&copy).expect("a recovery copy is written")).unwrap();
    assert_eq!(kept, h.state().doc.project);

    let saved = dir.join("mine.rig.ron");
    h.state_mut().queue(Command::SaveTo(saved.clone()));
    h.run();
    h.state().recovery.flush();
    assert!(!h.state().doc.dirty);
    assert!(!copy.exists(), "a clean save removes the recovery copy");
    assert_eq!(Project::load(&saved).unwrap(), kept);
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn after_a_crash_the_next_start_offers_the_copy_and_recover_opens_it_unsaved() {
    let dir = scratch("crash");
    let source = dir.join("canopy.rig.ron");
    // A session edits a saved file, autosaves, and ends without on_exit (a crash).
    let edited = {
        let mut h = harness(&dir, Duration::ZERO);
        h.state_mut().queue(Command::SaveTo(source.clone()));
        h.run();
        add_anchor(&mut h, "unsaved-anchor");
        h.state().recovery.flush();
        h.state().doc.project.clone()
    };

    let mut h = harness(&dir, Duration::ZERO);
    h.run();
    h.get_by_label("Recover unsaved changes?");
    h.get_by_label_contains("Unsaved changes to `canopy.rig.ron` were kept on ");
    h.get_by_label_contains(RECOVERY_FILE);
    assert_ne!(h.state().doc.project, edited, "nothing is replaced before the answer");
    h.get_by_label("Recover").click();
    h.run();
    let app = h.state();
    assert_eq!(app.doc.project, edited);
    assert!(app.doc.dirty, "recovered changes are unsaved until saved");
    assert_eq!(app.doc.path.as_deref(), Some(source.as_path()));
    assert!(dir.join(RECOVERY_FILE).exists(), "the copy stays until the changes are saved");
    assert!(h.query_by_label("Recover unsaved changes?").is_none());
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn discard_keeps_the_current_project_and_sets_the_copy_aside_once() {
    let dir = scratch("discard");
    let mut left = Project::new("left behind");
    left.notes = "from a session that crashed".into();
    std::fs::write(dir.join(RECOVERY_FILE), recovery_text(&left, None)).unwrap();

    let mut h = harness(&dir, Duration::ZERO);
    h.run();
    h.get_by_label_contains("Unsaved changes to `left behind` were kept");
    let before = h.state().doc.project.clone();
    h.get_by_label("Discard").click();
    h.run();
    assert_eq!(h.state().doc.project, before);
    assert!(!dir.join(RECOVERY_FILE).exists());
    let aside = std::fs::read_to_string(dir.join(DISCARDED_FILE)).expect("the discarded copy is kept once");
    assert_eq!(Project::from_ron(&aside).unwrap(), left);
    let (msg, is_error) = h.state().message.clone().unwrap();
    assert!(!is_error && msg.contains(DISCARDED_FILE), "{msg}");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_copy_that_cannot_be_read_is_named_and_cannot_be_recovered() {
    let dir = scratch("unreadable");
    std::fs::write(dir.join(RECOVERY_FILE), "(version: 1, nodes: [(id: \"a\"").unwrap();
    let mut h = harness(&dir, Duration::ZERO);
    h.run();
    h.get_by_label_contains("The copy cannot be read: line 1");
    h.get_by_label("Discard").click();
    h.run();
    assert!(dir.join(DISCARDED_FILE).exists());
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn closing_with_unsaved_changes_asks_first() {
    let dir = scratch("close");
    let mut h = harness(&dir, Duration::from_secs(3600));
    add_anchor(&mut h, "unsaved");
    h.state_mut().queue(Command::Close);
    h.run();
    h.get_by_label("Unsaved changes");
    h.get_by_label("Keep editing").click();
    h.run();
    assert!(h.state().doc.dirty);
    assert!(h.query_by_label("Unsaved changes").is_none());
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn two_windows_keep_separate_copies_and_a_running_windows_copy_is_never_offered() {
    let dir = scratch("windows");
    let mut first = harness(&dir, Duration::ZERO);
    add_anchor(&mut first, "first-window");
    first.state().recovery.flush();
    let first_copy = first.state().recovery.file().unwrap();
    assert!(first_copy.exists());

    // A second window while the first runs: nothing offered, and a copy of its own.
    let mut second = harness(&dir, Duration::ZERO);
    second.run();
    assert!(second.query_by_label("Recover unsaved changes?").is_none());
    assert!(second.state().recovery.offer.is_none(), "the running window's copy is not offered");
    add_anchor(&mut second, "second-window");
    second.state().recovery.flush();
    let second_copy = second.state().recovery.file().unwrap();
    assert_ne!(first_copy, second_copy);
    let first_text = std::fs::read_to_string(&first_copy).unwrap();
    assert!(first_text.contains("first-window") && !first_text.contains("second-window"));
    assert!(std::fs::read_to_string(&second_copy).unwrap().contains("second-window"));

    // The first window dies (its lock goes with it): the next start offers its copy, not the
    // copy of the second window, which is still running.
    drop(first);
    let mut third = harness(&dir, Duration::ZERO);
    third.run();
    let offer = third.state().recovery.offer.as_ref().expect("the dead window's copy is offered");
    assert_eq!(offer.file, first_copy);
    drop((second, third));
    std::fs::remove_dir_all(&dir).ok();
}
