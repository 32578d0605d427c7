//! Any bytes as a project file: load and validate, never panic; a valid project saves and
//! loads back unchanged.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let _ = rigwright_verification::robustness::load_bytes(data);
});
