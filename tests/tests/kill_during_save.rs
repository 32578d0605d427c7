//! Crash-safe saving (issue 7): a child process (`src/bin/save_loop.rs`) saves two large
//! projects in turn with `save_atomic` and is killed outright (SIGKILL on unix,
//! `TerminateProcess` on Windows) at random moments, many times. After every kill the file on
//! disk must be one of the two projects, whole, byte for byte; so must the backup
//! `<name>.bak` when there is one. A save cut short may leave its temporary file behind,
//! never a damaged project.
//!
//! The moments are drawn from a seeded generator; the seed is printed, and
//! `RIGWRIGHT_KILL_SEED=<n>` draws the same moments again (the timing of the disk still varies).

use std::fs;
use std::io::{BufRead, BufReader};
use std::path::Path;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

use rigwright_core::Project;
use rigwright_core::model::backup_path;
use rigwright_verification::save_loop_projects;

/// How many times the saving child is killed.
const KILLS: usize = 80;

/// xorshift64* (Vigna 2016): enough to spread kill moments, no dependency.
struct Moments(u64);

impl Moments {
    fn next_unit(&mut self) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        (self.0.wrapping_mul(0x2545_F491_4F6C_DD1D) >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// Which of the two project texts `path` holds, byte for byte; panics naming the kill when
/// it is neither (saying whether it still parses).
fn which(path: &Path, texts: &[String; 2], kill: usize, delay: Duration) -> usize {
    let text = fs::read_to_string(path).unwrap_or_else(|e| panic!("kill {kill} after {delay:?}: {} cannot be read: {e}", path.display()));
    if let Some(i) = texts.iter().position(|t| *t == text) {
        return i;
    }
    match Project::from_ron(&text) {
        Err(e) => panic!("kill {kill} after {delay:?}: {} is not a whole project: {e}", path.display()),
        Ok(_) => panic!("kill {kill} after {delay:?}: {} parses but is neither project", path.display()),
    }
}

#[test]
fn a_save_killed_at_any_moment_leaves_the_old_or_the_new_project_on_disk() {
    let projects = save_loop_projects();
    let saved = [projects[0].to_ron(), projects[1].to_ron()];
    let dir = std::env::temp_dir().join(format!("rigwright-kill-{}", std::process::id()));
    let _ = fs::remove_dir_all(&dir);
    fs::create_dir_all(&dir).unwrap();
    let path = dir.join("loop.rig.ron");
    projects[0].save(&path).unwrap();
    // The child saves B first: the file holds A when it starts.
    let texts = [dir.join("b.txt"), dir.join("a.txt")];
    fs::write(&texts[0], &saved[1]).unwrap();
    fs::write(&texts[1], &saved[0]).unwrap();

    // Spread the kills over about one and a half save cycles (two saves) of this machine.
    let t0 = Instant::now();
    projects[1].save(&path).unwrap();
    projects[0].save(&path).unwrap();
    let cycle = t0.elapsed();
    let seed = std::env::var("RIGWRIGHT_KILL_SEED")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or_else(|| u64::from(std::process::id()) ^ t0.elapsed().as_nanos() as u64 | 1);
    eprintln!("kill-during-save: seed {seed}, one save cycle {cycle:?}");
    let mut moments = Moments(seed);

    let started = Instant::now();
    let (mut on_disk, mut backups, mut cut_short) = ([0usize; 2], [0usize; 2], 0usize);
    for kill in 0..KILLS {
        let mut child = Command::new(env!("CARGO_BIN_EXE_save_loop"))
            .arg(&path)
            .args(&texts)
            .stdout(Stdio::piped())
            .spawn()
            .expect("the save_loop helper starts");
        let mut out = BufReader::new(child.stdout.take().expect("piped stdout"));
        let mut line = String::new();
        out.read_line(&mut line).unwrap();
        assert_eq!(line.trim(), "ready", "save_loop said {line:?}");
        let delay = cycle.mul_f64(1.5 * moments.next_unit());
        std::thread::sleep(delay);
        child.kill().unwrap();
        child.wait().unwrap();
        drop(out);

        on_disk[which(&path, &saved, kill, delay)] += 1;
        if backup_path(&path).exists() {
            backups[which(&backup_path(&path), &saved, kill, delay)] += 1;
        }
        for entry in fs::read_dir(&dir).unwrap() {
            let entry = entry.unwrap();
            let name = entry.file_name().to_string_lossy().into_owned();
            if name.starts_with('.') && name.ends_with(".tmp") {
                cut_short += 1;
                fs::remove_file(entry.path()).unwrap();
            }
        }
    }
    eprintln!(
        "kill-during-save: {KILLS} kills in {:?}; file on disk A {} / B {}, backup A {} / B {}; \
         {cut_short} kills landed inside a save (temporary file left behind)",
        started.elapsed(),
        on_disk[0],
        on_disk[1],
        backups[0],
        backups[1],
    );
    fs::remove_dir_all(&dir).ok();
}
