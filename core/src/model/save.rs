//! Crash-safe saving: the file on disk is always the old document or the new one, whole.
//!
//! [`save_atomic`] writes the text to a temporary file beside the target, flushes it to the
//! disk, keeps the previous version as `<name>.bak`, and only then renames the temporary file
//! over the target. A rename within one folder replaces the name in one step (POSIX
//! `rename(2)`; `MoveFileEx` with replace on Windows), so a crash or a kill at any moment
//! leaves either the complete old file or the complete new one under the target's name.
//! On unix the folder itself is synced last, so the rename survives a power cut.
//!
//! Not responsible for formatting the document (see [`Project::to_ron`]) or for choosing
//! where the app keeps its recovery files.

use std::fs::{self, File, OpenOptions};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

use super::error::ProjectError;
use super::project::Project;

/// Ending added to the file name of the previous version kept by [`save_atomic`].
pub const BACKUP_SUFFIX: &str = ".bak";

/// Distinguishes temporary files of saves running at the same time in one process.
static SAVE_COUNTER: AtomicU64 = AtomicU64::new(0);

/// The name of the backup [`save_atomic`] keeps for `path`: `name.rig.ron` → `name.rig.ron.bak`.
pub fn backup_path(path: &Path) -> PathBuf {
    let mut name = path.file_name().map(|n| n.to_os_string()).unwrap_or_default();
    name.push(BACKUP_SUFFIX);
    path.with_file_name(name)
}

/// Writes `text` to `path` so that the file is never seen half written.
///
/// Steps: write a temporary file in the same folder (`.name.<pid>-<n>.tmp`), `sync_all` it,
/// keep the current file (if any) as [`backup_path`] by a hard link (a copy where links are
/// not supported), rename the temporary file over `path`, then sync the folder (unix).
/// A symbolic link at `path` is followed, so the link stays and its target is replaced.
///
/// On failure the file at `path` is unchanged and the temporary file is removed; the error
/// names the path and suggests what to check.
pub fn save_atomic(path: &Path, text: &str) -> Result<(), ProjectError> {
    replace_atomic(path, text.as_bytes(), true)
}

/// Writes `bytes` to `path` as [`save_atomic`] does, without keeping a backup: for the files
/// the commands and the app produce (the Sheet, CSV, JSON), which are never seen half
/// written either. On failure the file at `path` is unchanged.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), ProjectError> {
    replace_atomic(path, bytes, false)
}

/// True when `output` names the same file as `input` (after following links), or would.
pub fn same_file(input: &Path, output: &Path) -> bool {
    match (fs::canonicalize(input), fs::canonicalize(output)) {
        (Ok(a), Ok(b)) => a == b,
        _ => false,
    }
}

fn replace_atomic(path: &Path, bytes: &[u8], backup: bool) -> Result<(), ProjectError> {
    let target = resolve_link(path);
    let Some(file_name) = target.file_name().map(|n| n.to_string_lossy().into_owned()) else {
        return Err(io_error(path, "is not a file name", "choose a file name ending in .rig.ron"));
    };
    let dir = match target.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let n = SAVE_COUNTER.fetch_add(1, Ordering::Relaxed);
    let tmp = dir.join(format!(".{file_name}.{}-{n}.tmp", std::process::id()));

    let written = write_synced(&tmp, bytes, &target);
    if let Err(e) = written {
        let _ = fs::remove_file(&tmp);
        return Err(io_error(
            path,
            &format!("could not write the temporary file {}: {e}", tmp.display()),
            "check that the folder exists and is writable and that the disk has space; the file on disk is unchanged",
        ));
    }
    // A failed backup does not stop the save: the new file is what the user asked for.
    if backup && target.exists() {
        let _ = keep_backup(&target);
    }
    if let Err(e) = fs::rename(&tmp, &target) {
        let _ = fs::remove_file(&tmp);
        return Err(io_error(
            path,
            &format!("could not replace the file: {e}"),
            "check that the file is not read-only or open elsewhere; the file on disk is unchanged",
        ));
    }
    sync_dir(&dir);
    Ok(())
}

impl Project {
    /// Saves the document to `path` with [`save_atomic`], keeping the previous file as
    /// `<name>.bak`.
    pub fn save(&self, path: &Path) -> Result<(), ProjectError> {
        save_atomic(path, &self.to_ron())
    }
}

fn io_error(path: &Path, what: &str, hint: &str) -> ProjectError {
    ProjectError::Io {
        path: path.display().to_string(),
        message: format!("{what}; {hint}"),
    }
}

/// Follows a symbolic link at `path` (one that resolves), else returns `path`.
fn resolve_link(path: &Path) -> PathBuf {
    match fs::symlink_metadata(path) {
        Ok(m) if m.file_type().is_symlink() => fs::canonicalize(path).unwrap_or_else(|_| path.to_path_buf()),
        _ => path.to_path_buf(),
    }
}

/// Creates `tmp` (never overwriting), writes `bytes`, copies the permissions of `like` when
/// it exists, and flushes data and metadata to the disk.
fn write_synced(tmp: &Path, bytes: &[u8], like: &Path) -> std::io::Result<()> {
    let mut file = OpenOptions::new().write(true).create_new(true).open(tmp)?;
    file.write_all(bytes)?;
    if let Ok(meta) = fs::metadata(like) {
        // Best effort: a read-only original makes a read-only copy, which is still renamable.
        let _ = file.set_permissions(meta.permissions());
    }
    file.sync_all()
}

/// Makes `<target>.bak` the current content of `target`, replacing any older backup in one
/// step (link or copy to a temporary `.name.bak.<pid>.tmp`, then rename).
fn keep_backup(target: &Path) -> std::io::Result<()> {
    let backup = backup_path(target);
    let backup_name = backup.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    let staging = backup.with_file_name(format!(".{backup_name}.{}.tmp", std::process::id()));
    let _ = fs::remove_file(&staging);
    if fs::hard_link(target, &staging).is_err() {
        fs::copy(target, &staging)?;
        File::open(&staging)?.sync_all()?;
    }
    fs::rename(&staging, &backup).inspect_err(|_| {
        let _ = fs::remove_file(&staging);
    })
}

/// Flushes the folder entry of a rename to the disk (unix; elsewhere a no-op).
fn sync_dir(dir: &Path) {
    #[cfg(unix)]
    if let Ok(d) = File::open(dir) {
        let _ = d.sync_all();
    }
    #[cfg(not(unix))]
    let _ = dir;
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scratch(name: &str) -> PathBuf {
        let dir = std::env::temp_dir().join(format!("rigwright-save-{name}-{}", std::process::id()));
        let _ = fs::remove_dir_all(&dir);
        fs::create_dir_all(&dir).unwrap();
        dir
    }

    fn leftovers(dir: &Path) -> Vec<String> {
        fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .filter(|n| n.ends_with(".tmp"))
            .collect()
    }

    #[test]
    fn a_second_save_keeps_the_first_as_the_backup_and_leaves_no_temporary_file() {
        let dir = scratch("backup");
        let path = dir.join("rig.rig.ron");
        save_atomic(&path, "first\n").unwrap();
        assert!(!backup_path(&path).exists(), "no backup before there was an old file");
        save_atomic(&path, "second\n").unwrap();
        assert_eq!(fs::read_to_string(&path).unwrap(), "second\n");
        assert_eq!(fs::read_to_string(backup_path(&path)).unwrap(), "first\n");
        save_atomic(&path, "third\n").unwrap();
        assert_eq!(fs::read_to_string(backup_path(&path)).unwrap(), "second\n");
        assert!(leftovers(&dir).is_empty(), "{:?}", leftovers(&dir));
        fs::remove_dir_all(&dir).unwrap();
    }

    #[test]
    fn a_project_saved_and_loaded_is_the_same_project() {
        let dir = scratch("roundtrip");
        let path = dir.join("net.rig.ron");
        let p = crate::gallery::cable_net(4, 1.0, 1e6, 500.0, 1.0);
        p.save(&path).unwrap();
        assert_eq!(Project::load(&path).unwrap(), p);
        fs::remove_dir_all(&dir).unwrap();
    }

    #[test]
    fn saving_into_a_missing_folder_names_the_file_and_changes_nothing() {
        let dir = scratch("missing");
        let path = dir.join("no-such-folder").join("rig.rig.ron");
        let e = save_atomic(&path, "x").unwrap_err();
        let text = e.to_string();
        assert!(text.contains("rig.rig.ron"), "{text}");
        assert!(text.contains("writable"), "{text}");
        assert!(!path.exists());
        fs::remove_dir_all(&dir).unwrap();
    }

    #[cfg(unix)]
    #[test]
    fn saving_through_a_symbolic_link_replaces_the_linked_file_and_keeps_the_link() {
        let dir = scratch("link");
        let real = dir.join("real.rig.ron");
        let link = dir.join("link.rig.ron");
        fs::write(&real, "old\n").unwrap();
        std::os::unix::fs::symlink(&real, &link).unwrap();
        save_atomic(&link, "new\n").unwrap();
        assert!(fs::symlink_metadata(&link).unwrap().file_type().is_symlink());
        assert_eq!(fs::read_to_string(&real).unwrap(), "new\n");
        fs::remove_dir_all(&dir).unwrap();
    }
}
