//! Any bytes as a project file; when it is valid, solve every load case and the modes about
//! each stable equilibrium: never panic, never return a number that is not finite.
#![no_main]

use libfuzzer_sys::fuzz_target;
use rigwright_verification::robustness::{load_bytes, solve_all};

fuzz_target!(|data: &[u8]| {
    if let Some(model) = load_bytes(data) {
        solve_all(&model);
    }
});
