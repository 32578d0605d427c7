//! Inputs the fuzzers found (`tests/fuzz-regressions/`), replayed through the same checks as
//! the fuzz targets (`rigwright_verification::robustness`): each must load or be refused
//! with a message, and when valid solve to finite numbers or name its diagnostic. The sample
//! projects and the bad-input catalogue, which seed the fuzzers' corpus, go through the same
//! checks. See DEVELOPERS.md for running the fuzzers.

use std::path::{Path, PathBuf};

use rigwright_verification::robustness::{load_bytes, solve_all};

fn files(folder: &str) -> Vec<PathBuf> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join(folder);
    let mut list: Vec<PathBuf> = std::fs::read_dir(&dir)
        .unwrap_or_else(|e| panic!("{}: {e}", dir.display()))
        .map(|e| e.unwrap().path())
        .filter(|p| p.is_file() && p.extension().is_none_or(|x| x != "expect" && x != "md"))
        .collect();
    list.sort();
    list
}

fn replay(path: &Path) {
    let bytes = std::fs::read(path).unwrap();
    let outcome = std::panic::catch_unwind(|| {
        if let Some(model) = load_bytes(&bytes) {
            solve_all(&model);
        }
    });
    assert!(outcome.is_ok(), "{} panics (see the message above)", path.display());
}

#[test]
fn every_input_the_fuzzers_found_loads_or_is_refused_and_solves_or_says_why() {
    let found = files("fuzz-regressions");
    for path in &found {
        replay(path);
    }
}

#[test]
fn the_fuzz_seeds_pass_the_fuzz_checks() {
    for path in files("../sample-projects").iter().chain(&files("bad-input")) {
        replay(path);
    }
}
