//! Autosave and recovery of the open document.
//!
//! While the document has unsaved changes, a copy is written every [`Recovery::interval`]
//! (30 s by default) to `recovery.rig.ron` in the user's data folder, on a worker thread with
//! the crash-safe [`save_atomic`], so the frame never waits for the disk. The copy is removed
//! once the document is clean again (saved, discarded, another opened) and on a clean exit.
//! A copy found at start means the last session did not end cleanly: the app offers to
//! recover it (Recover / Discard); a discarded copy is kept once as
//! `discarded-recovery.rig.ron`, never deleted outright.
//!
//! Several windows may run at once. Each claims a slot — `recovery.rig.ron`, then
//! `recovery-2.rig.ron`, … — by holding an exclusive lock on the slot's `.lock` file for as
//! long as it runs; the operating system drops the lock when the process ends, however it
//! ends. So a copy whose slot is locked belongs to a window still running and is never offered
//! or overwritten by another; a copy in an unlocked slot was left by a session that is gone.
//!
//! The copy is an ordinary project file with two comment lines on top naming where the
//! document came from, so it can also be opened by hand.
//!
//! Not responsible for saving the user's own file (see `RigApp::save_to`) or the settings.
//! The question offering a copy found at start is in `offer.rs`.

mod offer;

use std::ffi::OsString;
use std::fs::{File, TryLockError};
use std::path::{Path, PathBuf};
use std::sync::mpsc;
use std::time::{Duration, Instant, SystemTime};

use eframe::egui;
use rigwright_core::Project;
use rigwright_core::model::{backup_path, save_atomic};

use super::{Document, RigApp};

pub use offer::{discard, offer_modal, recover};

/// The environment variable that overrides the data folder (tests, portable installs).
pub const DATA_DIR_VAR: &str = "RIGWRIGHT_DATA_DIR";

/// Name of the recovery copy in the data folder.
pub const RECOVERY_FILE: &str = "recovery.rig.ron";

/// Name a discarded recovery copy is kept under.
pub const DISCARDED_FILE: &str = "discarded-recovery.rig.ron";

/// Most windows that keep recovery copies at the same time.
pub const SLOTS: usize = 8;

/// Time between autosaves while there are unsaved changes.
pub const DEFAULT_INTERVAL: Duration = Duration::from_secs(30);

const HEADER: &str = "// Rigwright recovery copy: unsaved changes kept by autosave.\n";

const SOURCE: &str = "// source: ";

const NEVER_SAVED: &str = "(never saved)";

/// The user's data folder for Rigwright: `$RIGWRIGHT_DATA_DIR` when set (empty: none, which
/// turns autosave off), else the platform's place (XDG data home on Linux and BSD,
/// `~/Library/Application Support` on macOS, `%APPDATA%` on Windows).
pub fn data_dir() -> Option<PathBuf> {
    data_dir_with(|k| std::env::var_os(k))
}

/// [`data_dir`] with the environment given as a lookup.
pub fn data_dir_with(var: impl Fn(&str) -> Option<OsString>) -> Option<PathBuf> {
    let set = |k: &str| var(k).filter(|v| !v.is_empty()).map(PathBuf::from);
    if let Some(v) = var(DATA_DIR_VAR) {
        return (!v.is_empty()).then(|| PathBuf::from(v));
    }
    if cfg!(windows) {
        return set("APPDATA").map(|d| d.join("Rigwright"));
    }
    if cfg!(target_os = "macos") {
        return set("HOME").map(|h| h.join("Library/Application Support/Rigwright"));
    }
    set("XDG_DATA_HOME")
        .filter(|d| d.is_absolute())
        .or_else(|| set("HOME").map(|h| h.join(".local/share")))
        .map(|d| d.join("rigwright"))
}

/// A recovery copy found at start, waiting for the user's answer.
pub struct Offer {
    /// The recovery copy.
    pub file: PathBuf,
    /// The file the document was loaded from or saved to, if any.
    pub source: Option<PathBuf>,
    /// When the copy was written.
    pub kept: Option<SystemTime>,
    /// The copy, parsed, or why it cannot be read.
    pub project: Result<Project, String>,
}

impl Offer {
    /// Name of the document, as the title bar would show it.
    pub fn name(&self) -> String {
        match (&self.source, &self.project) {
            (Some(p), _) => p.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default(),
            (None, Ok(p)) if !p.title.is_empty() => p.title.clone(),
            _ => "Untitled rig".into(),
        }
    }
}

/// The recovery copy of slot `k` (0-based) in `dir`.
pub fn slot_file(dir: &Path, k: usize) -> PathBuf {
    if k == 0 {
        dir.join(RECOVERY_FILE)
    } else {
        dir.join(format!("recovery-{}.rig.ron", k + 1))
    }
}

/// The lock file of slot `k`, held by the window that owns the slot.
fn slot_lock(dir: &Path, k: usize) -> PathBuf {
    if k == 0 {
        dir.join("recovery.lock")
    } else {
        dir.join(format!("recovery-{}.lock", k + 1))
    }
}

/// Where a discarded copy is set aside: `discarded-` before its name.
pub fn discarded_path(copy: &Path) -> PathBuf {
    let name = copy
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| RECOVERY_FILE.into());
    copy.with_file_name(format!("discarded-{name}"))
}

/// Outcome of trying to take a slot's lock.
enum Lock {
    /// Taken: the slot is this window's while the file stays open.
    Held(File),
    /// Another running window holds it.
    Busy,
    /// Locks cannot be taken in this folder (some network file systems): the slot is used
    /// without one, as a single window would.
    Unsupported,
}

fn try_lock(path: &Path) -> Lock {
    let file = match File::options().create(true).truncate(false).write(true).open(path) {
        Ok(f) => f,
        Err(_) => return Lock::Unsupported,
    };
    match file.try_lock() {
        Ok(()) => Lock::Held(file),
        Err(TryLockError::WouldBlock) => Lock::Busy,
        Err(TryLockError::Error(_)) => Lock::Unsupported,
    }
}

enum Job {
    Write { text: String },
    Remove,
    Flush(mpsc::Sender<()>),
}

/// Autosave state of the app.
pub struct Recovery {
    dir: Option<PathBuf>,
    /// This window's slot (see the module notes) and the lock that holds it.
    slot: usize,
    lock: Option<File>,
    /// Time between autosaves while there are unsaved changes.
    pub interval: Duration,
    jobs: Option<mpsc::Sender<Job>>,
    errors: Option<mpsc::Receiver<String>>,
    worker: Option<std::thread::JoinHandle<()>>,
    /// When the next autosave is due (set at the first unsaved change after the last one).
    due: Option<Instant>,
    /// Document revision last written.
    written: Option<u64>,
    /// A recovery copy of this session may be on disk.
    on_disk: bool,
    /// A copy from an earlier session, offered at start.
    pub offer: Option<Offer>,
}

impl Recovery {
    /// No autosave and no recovery.
    pub fn off() -> Self {
        Recovery {
            dir: None,
            slot: 0,
            lock: None,
            interval: DEFAULT_INTERVAL,
            jobs: None,
            errors: None,
            worker: None,
            due: None,
            written: None,
            on_disk: false,
            offer: None,
        }
    }

    /// Autosave into `dir`.
    pub fn in_dir(dir: PathBuf) -> Self {
        Recovery {
            dir: Some(dir),
            ..Self::off()
        }
    }

    /// Autosave into [`data_dir`], when there is one.
    pub fn from_env() -> Self {
        match data_dir() {
            Some(d) => Self::in_dir(d),
            None => Self::off(),
        }
    }

    /// Path of this window's recovery copy, when autosave is on.
    pub fn file(&self) -> Option<PathBuf> {
        self.dir.as_ref().map(|d| slot_file(d, self.slot))
    }

    /// Claims a slot for this window — preferring a free slot that holds a copy left by a
    /// session that did not end cleanly, and offering that copy — else the first free slot.
    /// With every slot taken by running windows, autosave is off for this one, and the
    /// returned message says so.
    pub fn look(&mut self) -> Option<String> {
        let dir = self.dir.clone()?;
        let _ = std::fs::create_dir_all(&dir);
        let mut first_free: Option<(usize, Option<File>)> = None;
        let mut claimed = None;
        for k in 0..SLOTS {
            let lock = match try_lock(&slot_lock(&dir, k)) {
                Lock::Held(f) => Some(f),
                Lock::Busy => continue,
                Lock::Unsupported => None,
            };
            if slot_file(&dir, k).exists() {
                claimed = Some((k, lock));
                break;
            }
            if first_free.is_none() {
                first_free = Some((k, lock));
            }
        }
        let Some((slot, lock)) = claimed.or(first_free) else {
            self.dir = None;
            return Some(format!(
                "Autosave is off in this window: {SLOTS} other Rigwright windows are keeping recovery copies in {}; save your work by hand, or close a window and start this one again",
                dir.display()
            ));
        };
        (self.slot, self.lock) = (slot, lock);
        // No copy left behind in the claimed slot: nothing to offer.
        let file = self.file().filter(|f| f.exists())?;
        let kept = std::fs::metadata(&file).and_then(|m| m.modified()).ok();
        let (source, project) = match std::fs::read_to_string(&file) {
            Ok(text) => (source_of(&text), Project::from_ron(&text).map_err(|e| e.to_string())),
            Err(e) => (None, Err(e.to_string())),
        };
        self.offer = Some(Offer {
            file,
            source,
            kept,
            project,
        });
        None
    }

    /// Waits until every queued write or removal is done (exit, tests).
    pub fn flush(&self) {
        if let Some(jobs) = &self.jobs {
            let (done, wait) = mpsc::channel();
            if jobs.send(Job::Flush(done)).is_ok() {
                let _ = wait.recv();
            }
        }
    }

    fn send(&mut self, job: Job) {
        let (Some(dir), Some(file)) = (self.dir.clone(), self.file()) else {
            return;
        };
        if self.jobs.is_none() {
            let (jobs, rx) = mpsc::channel();
            let (err_tx, errors) = mpsc::channel();
            let worker = std::thread::Builder::new()
                .name("autosave".into())
                .spawn(move || work(&dir, &file, &rx, &err_tx));
            match worker {
                Ok(w) => {
                    self.jobs = Some(jobs);
                    self.errors = Some(errors);
                    self.worker = Some(w);
                }
                Err(_) => return,
            }
        }
        if let Some(jobs) = &self.jobs {
            let _ = jobs.send(job);
        }
    }

    /// Writes the document now (on the worker) when it has changes not yet kept.
    fn write(&mut self, doc: &Document) {
        if self.written == Some(doc.revision) && self.on_disk {
            return;
        }
        let text = recovery_text(&doc.project, doc.path.as_deref());
        self.send(Job::Write { text });
        self.written = Some(doc.revision);
        self.on_disk = true;
        self.due = None;
    }

    fn remove(&mut self) {
        if self.on_disk {
            self.send(Job::Remove);
            self.on_disk = false;
        }
        self.written = None;
        self.due = None;
    }

    /// A clean exit: keeps a dirty document's latest changes, else removes the copy; waits
    /// for the disk either way.
    pub fn exit(&mut self, doc: &Document) {
        if self.offer.is_some() {
            // Not answered: keep the old copy for the next start.
        } else if doc.dirty {
            self.write(doc);
        } else {
            self.remove();
        }
        self.flush();
        self.jobs = None;
        if let Some(w) = self.worker.take() {
            let _ = w.join();
        }
    }
}

/// The worker: applies jobs in order until the app drops the sender.
fn work(dir: &Path, file: &Path, jobs: &mpsc::Receiver<Job>, errors: &mpsc::Sender<String>) {
    while let Ok(job) = jobs.recv() {
        match job {
            Job::Write { text } => {
                let result = std::fs::create_dir_all(dir)
                    .map_err(|e| format!("{}: {e}; check that the data folder can be created", dir.display()))
                    .and_then(|()| save_atomic(file, &text).map_err(|e| e.to_string()));
                if let Err(e) = result {
                    let _ = errors.send(e);
                }
            }
            Job::Remove => {
                let _ = std::fs::remove_file(file);
                let _ = std::fs::remove_file(backup_path(file));
            }
            Job::Flush(done) => {
                let _ = done.send(());
            }
        }
    }
}

/// The recovery copy's text: two comment lines, then the project as saved.
pub fn recovery_text(project: &Project, source: Option<&Path>) -> String {
    let source = source
        .map(|p| p.display().to_string())
        .filter(|s| !s.contains(['\n', '\r']))
        .unwrap_or_else(|| NEVER_SAVED.to_string());
    format!("{HEADER}{SOURCE}{source}\n{}", project.to_ron())
}

/// The source path named in a recovery copy's comment lines.
fn source_of(text: &str) -> Option<PathBuf> {
    text.lines()
        .take(4)
        .find_map(|l| l.strip_prefix(SOURCE))
        .filter(|s| *s != NEVER_SAVED && !s.is_empty())
        .map(PathBuf::from)
}

/// Once a frame: autosave when due, remove the copy when the document is clean, and report
/// autosave failures in the status bar.
pub fn tick(app: &mut RigApp, ctx: &egui::Context) {
    if let Some(e) = app.recovery.errors.as_ref().and_then(|r| r.try_iter().last()) {
        app.message = Some((
            format!("Autosave failed: {e}. Unsaved changes are not being kept for recovery; save the project."),
            true,
        ));
    }
    let r = &mut app.recovery;
    if r.dir.is_none() || r.offer.is_some() {
        return;
    }
    if !app.doc.dirty {
        r.remove();
        return;
    }
    if r.written == Some(app.doc.revision) {
        return;
    }
    let now = Instant::now();
    let due = *r.due.get_or_insert(now + r.interval);
    if now >= due {
        r.write(&app.doc);
    } else {
        ctx.request_repaint_after(due - now);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_override_wins_and_an_empty_override_turns_autosave_off() {
        let env = |pairs: &'static [(&'static str, &'static str)]| {
            move |k: &str| pairs.iter().find(|(n, _)| *n == k).map(|(_, v)| OsString::from(v))
        };
        assert_eq!(
            data_dir_with(env(&[(DATA_DIR_VAR, "/tmp/rw"), ("HOME", "/home/u")])),
            Some(PathBuf::from("/tmp/rw"))
        );
        assert_eq!(data_dir_with(env(&[(DATA_DIR_VAR, ""), ("HOME", "/home/u")])), None);
        if cfg!(all(unix, not(target_os = "macos"))) {
            assert_eq!(
                data_dir_with(env(&[("HOME", "/home/u")])),
                Some(PathBuf::from("/home/u/.local/share/rigwright"))
            );
            assert_eq!(
                data_dir_with(env(&[("XDG_DATA_HOME", "/d"), ("HOME", "/home/u")])),
                Some(PathBuf::from("/d/rigwright"))
            );
            // The XDG base directory specification ignores relative paths.
            assert_eq!(
                data_dir_with(env(&[("XDG_DATA_HOME", "rel"), ("HOME", "/home/u")])),
                Some(PathBuf::from("/home/u/.local/share/rigwright"))
            );
        }
    }

    #[test]
    fn a_recovery_copy_names_its_source_and_loads_as_the_project() {
        let p = Project::new("copy");
        let text = recovery_text(&p, Some(Path::new("/work/rigs/a.rig.ron")));
        assert_eq!(source_of(&text), Some(PathBuf::from("/work/rigs/a.rig.ron")));
        assert_eq!(Project::from_ron(&text).unwrap(), p);
        assert_eq!(source_of(&recovery_text(&p, None)), None);
    }
}
