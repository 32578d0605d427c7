//! The bad-input catalogue: every malformed or meaningless project in `tests/bad-input/` is
//! refused with a message that names the item and suggests a fix (line and column for syntax
//! errors). Each file states what its message must contain on a first line
//! `// expect: a | b | c` (or in a sibling `NAME.expect` file for files that cannot hold a
//! comment).

use std::path::Path;

use rigwright_core::Project;

fn expectations(path: &Path) -> Vec<String> {
    let sibling = path.with_file_name(path.file_name().unwrap().to_string_lossy().replace(".rig.ron", ".expect"));
    let line = match std::fs::read_to_string(&sibling) {
        Ok(t) => t,
        Err(_) => {
            let text = std::fs::read_to_string(path).expect("a file with an expect line");
            text.lines()
                .next()
                .and_then(|l| l.strip_prefix("// expect:"))
                .unwrap_or_else(|| panic!("{}: no expect line", path.display()))
                .to_string()
        }
    };
    line.split('|').map(|s| s.trim().to_string()).filter(|s| !s.is_empty()).collect()
}

#[test]
fn every_bad_project_is_refused_with_a_message_naming_the_item_and_the_fix() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("bad-input");
    let mut files: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.to_string_lossy().ends_with(".rig.ron"))
        .collect();
    files.sort();
    assert!(files.len() >= 30, "the catalogue has {} files", files.len());
    for path in files {
        let err = Project::load_model(&path)
            .err()
            .unwrap_or_else(|| panic!("{} was accepted", path.display()));
        let message = err.to_string();
        for want in expectations(&path) {
            assert!(
                message.contains(&want),
                "{}: message lacks `{want}`:\n{message}",
                path.file_name().unwrap().to_string_lossy()
            );
        }
    }
}
