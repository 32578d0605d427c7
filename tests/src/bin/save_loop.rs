//! Child process of the kill-during-save test (`tests/tests/kill_during_save.rs`).
//!
//! `save_loop TARGET FIRST SECOND`: reads the texts of FIRST and SECOND, then saves them in
//! turn to TARGET with `save_atomic`, for ever, until the test kills it. Prints `ready` once
//! both texts are read.

use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

fn main() -> ExitCode {
    let args: Vec<PathBuf> = std::env::args_os().skip(1).map(PathBuf::from).collect();
    let [target, first, second] = args.as_slice() else {
        eprintln!("usage: save_loop TARGET FIRST SECOND  (saves the texts of FIRST and SECOND to TARGET in turn until killed)");
        return ExitCode::from(2);
    };
    let mut texts = Vec::new();
    for source in [first, second] {
        match std::fs::read_to_string(source) {
            Ok(t) => texts.push(t),
            Err(e) => {
                eprintln!("save_loop: {}: {e}; give two readable text files", source.display());
                return ExitCode::from(2);
            }
        }
    }
    let mut out = std::io::stdout();
    let _ = writeln!(out, "ready");
    let _ = out.flush();
    for text in texts.iter().cycle() {
        if let Err(e) = rigwright_core::model::save_atomic(target, text) {
            eprintln!("save_loop: {e}");
            return ExitCode::FAILURE;
        }
    }
    ExitCode::SUCCESS
}
