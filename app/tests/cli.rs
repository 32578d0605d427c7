//! The command line, run as a user would: output formats and exit codes; and the Sheet and
//! the result exports, produced as a user would (the command line, the app's File menu) and
//! read back: the PDF through poppler's `pdftotext`/`pdfinfo` (skipped with a note when they
//! are not installed), the CSV and JSON directly. Expected numbers are computed here from the
//! core's solver, independently of the sheet code. (The Sheet's pages themselves are tested
//! in `app/report/tests/sheet.rs`.)
//!
//! One file on purpose, past 500 lines: every test binary of the app links all of eframe, so
//! a second file for the Sheet's command-line tests would add a link to CI's time.

use std::path::{Path, PathBuf};
use std::process::Command;

use rigwright_core::{Project, Statics};
use rigwright_report::Paper;

fn sample(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../sample-projects").join(name)
}

fn rigwright(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_rigwright")).args(args).output().expect("runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

#[test]
fn solve_json_has_the_documented_fields_and_balanced_reactions() {
    let file = sample("sign-on-two-cables.rig.ron");
    let (code, out, err) = rigwright(&["solve", file.to_str().unwrap(), "--case", "dead + gust", "--json"]);
    assert_eq!(code, 0, "{err}");
    let doc: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(doc["format"], "rigwright.solve/1");
    assert_eq!(doc["case"], "dead + gust");
    assert_eq!(doc["converged"], true);
    assert_eq!(doc["stable"], true);
    assert!(doc["residual"].as_f64().unwrap() <= 1e-10);
    let members = doc["members"].as_array().unwrap();
    assert_eq!(members.len(), 2);
    for m in members {
        assert_eq!(m["kind"], "cable");
        assert!(m["force"].as_f64().unwrap() > 0.0);
        assert!(m["length"].as_f64().unwrap() > m["unstressed_length"].as_f64().unwrap());
        assert_eq!(m["slack"], false);
    }
    // Reactions plus loads (45 kg sign, 250 N gust, 0.144 kg/m of rope) sum to zero.
    let rope: f64 = members.iter().map(|m| m["unstressed_length"].as_f64().unwrap() * 0.144).sum();
    let mut sum = [250.0, -(45.0 + rope) * 9.81, 0.0];
    for n in doc["nodes"].as_array().unwrap() {
        if let Some(r) = n["reaction"].as_array() {
            for (s, v) in sum.iter_mut().zip(r) {
                *s += v.as_f64().unwrap();
            }
        } else {
            assert_eq!(n["id"], "sign");
        }
    }
    assert!(sum.iter().all(|s| s.abs() < 1e-6), "{sum:?}");
}

#[test]
fn solve_table_shows_units_and_stiffness() {
    let file = sample("canopy-net-6x6.rig.ron");
    let (code, out, _) = rigwright(&["solve", file.to_str().unwrap(), "--stiffness", "n3_3"]);
    assert_eq!(code, 0);
    assert!(out.contains("force [N]") && out.contains("tangent stiffness at node `n3_3` [N/m]") && out.contains("geometric"));
}

#[test]
fn bad_input_exits_2_with_the_problem_on_stderr() {
    let bad = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../tests/bad-input/negative-ea.rig.ron");
    let (code, out, err) = rigwright(&["solve", bad.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(out.is_empty());
    assert!(err.contains("member `left`") && err.contains("positive"), "{err}");
    let (code, _, err) = rigwright(&["solve", "/nonexistent/rig.rig.ron"]);
    assert_eq!(code, 2);
    assert_eq!(err.matches("/nonexistent/rig.rig.ron").count(), 1, "the file named once: {err}");
    assert!(err.contains("check the file's name"), "{err}");
    let file = sample("sign-on-two-cables.rig.ron");
    let (code, _, err) = rigwright(&["solve", file.to_str().unwrap(), "--case", "hurricane"]);
    assert_eq!(code, 2);
    assert!(err.contains("`hurricane`") && err.contains("`dead`"), "{err}");
    assert!(err.contains("sign-on-two-cables.rig.ron"), "names the file: {err}");
    let (code, _, err) = rigwright(&["modes", file.to_str().unwrap(), "--count", "0"]);
    assert_eq!(code, 2);
    assert!(err.contains("at least one mode"), "{err}");
}

/// Parts from a catalogue file count the same in `check`, `sheet` and `export`.
#[test]
fn sheet_and_export_find_parts_in_catalogue_files_as_check_does() {
    let supplier = sample("example-supplier.parts.ron");
    let file = edited_sample("sign-on-two-cables.rig.ron", "supplier", |p| {
        for m in &mut p.members {
            m.design.get_or_insert_with(Default::default).part = Some("demo-dyneema-6".into());
        }
    });
    let (f, cat) = (file.to_str().unwrap(), supplier.to_str().unwrap());
    let (code, out, err) = rigwright(&["check", f, "--catalogue", cat]);
    assert_eq!(code, 0, "{out}{err}");
    let json = std::env::temp_dir().join(format!("rigwright-cli-{}-supplier.json", std::process::id()));
    let j = json.to_str().unwrap();
    let (code, _, err) = rigwright(&["export", f, "--json", j, "--catalogue", cat]);
    assert_eq!(code, 0, "{err}");
    let passes = |path: &std::path::Path| {
        let doc: serde_json::Value = serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap();
        doc["passes"].as_bool().unwrap()
    };
    assert!(passes(&json), "the supplier's parts are found");
    // Without the catalogue file the part is unknown to the export too.
    let (code, _, err) = rigwright(&["export", f, "--json", j]);
    assert_eq!(code, 0, "{err}");
    assert!(!passes(&json), "without the catalogue file the part is not found");
    let pdf = std::env::temp_dir().join(format!("rigwright-cli-{}-supplier.pdf", std::process::id()));
    let (code, _, err) = rigwright(&["sheet", f, "-o", pdf.to_str().unwrap(), "--catalogue", cat]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("PASSES"), "{err}");
    for p in [file, json, pdf] {
        std::fs::remove_file(p).ok();
    }
}

#[test]
fn no_valid_equilibrium_exits_3_and_json_says_not_stable() {
    let dir = std::env::temp_dir().join(format!("rigwright-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("pendulum.rig.ron");
    std::fs::write(
        &file,
        r#"(version: 1, planar: true,
            nodes: [(id: "base", at: (0.0, 0.0, 0.0), fixed: (true, true, true)), (id: "top", at: (0.0, 2.0, 0.0), mass: 50.0)],
            members: [(id: "post", ends: ("base", "top"), kind: Strut(ea: 100000000.0, rest: AsDrawn))])"#,
    )
    .unwrap();
    let (code, out, err) = rigwright(&["solve", file.to_str().unwrap(), "--json"]);
    assert_eq!(code, 3);
    let doc: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(doc["stable"], false);
    assert!(err.contains("unstable") && err.contains("`top`"), "{err}");
    let (code, _, err) = rigwright(&["modes", file.to_str().unwrap()]);
    assert_eq!(code, 3, "{err}");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn modes_json_lists_frequencies_periods_and_shapes() {
    let file = sample("guyed-pole.rig.ron");
    let (code, out, err) = rigwright(&["modes", file.to_str().unwrap(), "--count", "3", "--json"]);
    assert_eq!(code, 0, "{err}");
    let doc: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(doc["format"], "rigwright.modes/1");
    let modes = doc["modes"].as_array().unwrap();
    assert_eq!(modes.len(), 3);
    for m in modes {
        let f = m["frequency_hz"].as_f64().unwrap();
        let t = m["period_s"].as_f64().unwrap();
        assert!((f * t - 1.0).abs() < 1e-12);
        assert_eq!(m["shape"].as_array().unwrap().len(), 5);
    }
}

#[test]
fn pluck_reports_frequency_energy_and_writes_csv() {
    let dir = std::env::temp_dir().join(format!("rigwright-pluck-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let csv = dir.join("h.csv");
    let file = sample("lamp-counterbalance.rig.ron");
    let (code, out, err) = rigwright(&[
        "pluck",
        file.to_str().unwrap(),
        "--node",
        "carriage",
        "--offset",
        "0,-0.02",
        "--duration",
        "3",
        "--csv",
        csv.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("dominant frequency") && out.contains("Hz"), "{out}");
    let text = std::fs::read_to_string(&csv).unwrap();
    let header = text.lines().next().unwrap();
    assert_eq!(
        header,
        "time_s,ux_m,uy_m,uz_m,balancer_force_N,safety_force_N,kinetic_J,strain_J,load_potential_J,damped_J,numerical_J"
    );
    assert!(text.lines().count() > 100);
    let (code, _, err) = rigwright(&[
        "pluck",
        file.to_str().unwrap(),
        "--node",
        "nowhere",
        "--offset",
        "0,-0.02",
        "--duration",
        "1",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("`nowhere`"));
    std::fs::remove_dir_all(&dir).ok();
}

/// A temporary copy of a sample, edited by `edit`.
fn edited_sample(name: &str, tag: &str, edit: impl FnOnce(&mut rigwright_core::Project)) -> PathBuf {
    let mut p = rigwright_core::Project::load(&sample(name)).unwrap();
    edit(&mut p);
    let path = std::env::temp_dir().join(format!("rigwright-cli-{}-{tag}.rig.ron", std::process::id()));
    std::fs::write(&path, p.to_ron()).unwrap();
    path
}

#[test]
fn check_exits_0_when_all_pass_1_when_one_fails_and_2_on_bad_input() {
    let file = sample("sign-on-two-cables.rig.ron");
    let (code, out, err) = rigwright(&["check", file.to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("short-rope") && out.contains("utilisation") && out.contains("All checks pass"),
        "{out}"
    );
    assert!(out.contains("licensed engineer"), "the cautions follow the checks");
    // A design factor of 400 on 6 mm rope (22.7 kN) cannot hold 543 N: fails, exit 1.
    let failing = edited_sample("sign-on-two-cables.rig.ron", "df", |p| p.sizing.design_factors.cable = 400.0);
    let (code, out, _) = rigwright(&["check", failing.to_str().unwrap(), "--json"]);
    assert_eq!(code, 1);
    let doc: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(doc["format"], "rigwright.check/1");
    assert_eq!(doc["passes"], false);
    assert_eq!(doc["report"]["members"][0]["status"], "fail");
    let (code, _, err) = rigwright(&["check", "/nonexistent.rig.ron"]);
    assert_eq!(code, 2, "{err}");
}

#[test]
fn sweep_csv_has_units_in_its_header_and_one_row_per_step() {
    let file = sample("sign-on-two-cables.rig.ron");
    let (code, out, err) = rigwright(&[
        "sweep",
        file.to_str().unwrap(),
        "--param",
        "node:sign:mass",
        "--from",
        "20",
        "--to",
        "80",
        "--steps",
        "4",
        "--output",
        "force:short-rope",
        "--output",
        "lowest-frequency",
        "--csv",
    ]);
    assert_eq!(code, 0, "{err}");
    let lines: Vec<&str> = out.lines().collect();
    assert_eq!(
        lines[0],
        "\"node:sign:mass (kg)\",\"force:short-rope (N)\",\"lowest-frequency (Hz)\",\"note\""
    );
    assert_eq!(lines.len(), 5);
    // Heavier sign, more tension: the rope force grows with the mass.
    let force = |l: &str| l.split(',').nth(1).unwrap().parse::<f64>().unwrap();
    assert!(force(lines[4]) > 3.0 * force(lines[1]));
    let (code, _, err) = rigwright(&[
        "sweep",
        file.to_str().unwrap(),
        "--param",
        "node:sign:colour",
        "--from",
        "0",
        "--to",
        "1",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("not a parameter"), "{err}");
}

#[test]
fn autosize_writes_a_project_that_passes_check() {
    let failing = edited_sample("sign-on-two-cables.rig.ron", "auto", |p| p.sizing.design_factors.cable = 60.0);
    let out_file = failing.with_extension("sized.rig.ron");
    let (code, out, err) = rigwright(&["autosize", failing.to_str().unwrap(), "-o", out_file.to_str().unwrap()]);
    assert_eq!(code, 0, "{out}{err}");
    assert!(out.contains("short-rope") && out.contains("choice stable"), "{out}");
    let (code, out, _) = rigwright(&["check", out_file.to_str().unwrap()]);
    assert_eq!(code, 0, "{out}");
}

#[test]
fn spring_proposes_a_design_with_units() {
    let (code, out, err) = rigwright(&[
        "spring",
        "--rate",
        "5000",
        "--force",
        "200",
        "--material",
        "music-wire",
        "--max-od",
        "40",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("wire diameter d") && out.contains(" mm") && out.contains("N/m") && out.contains("MPa"),
        "{out}"
    );
    let (code, _, err) = rigwright(&["spring", "--rate", "5000", "--force", "200", "--material", "unobtainium"]);
    assert_eq!(code, 2);
    assert!(err.contains("music-wire"), "{err}");
}

/// A reader that closes the pipe early (`| head -1`) ends every command quietly: exit 0, no
/// panic message (issue 14).
#[test]
fn a_closed_pipe_ends_the_command_quietly() {
    use std::io::{BufRead, BufReader};
    use std::process::Stdio;
    // A 40×40 net: its outputs are far larger than a pipe's buffer, so the writer meets the
    // closed pipe.
    let file = std::env::temp_dir().join(format!("rigwright-cli-pipe-{}.rig.ron", std::process::id()));
    std::fs::write(&file, rigwright_core::gallery::cable_net(40, 1.0, 1e6, 1000.0, 1.0).to_ron()).unwrap();
    for args in [
        vec!["modes", file.to_str().unwrap(), "--json", "--count", "20"],
        vec!["solve", file.to_str().unwrap()],
    ] {
        let mut child = Command::new(env!("CARGO_BIN_EXE_rigwright"))
            .args(&args)
            .stdout(Stdio::piped())
            .stderr(Stdio::piped())
            .spawn()
            .unwrap();
        let mut line = String::new();
        BufReader::new(child.stdout.take().unwrap()).read_line(&mut line).unwrap();
        // The reader is gone now; the program must notice and stop.
        let out = child.wait_with_output().unwrap();
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(0), "{args:?}: {err}");
        assert!(!err.contains("panicked"), "{args:?}: {err}");
    }
    std::fs::remove_file(file).ok();
}

/// The shallow truss loaded past its limit (closed form 38.10872 N, see the verification
/// suite's no_wrong_answer.rs): `solve` stops at the limit point, naming its load factor to six
/// digits in text and JSON; `--follow` gives the snapped-through state and says so; `path`
/// writes the curve through the limit.
#[test]
fn limit_points_are_reported_with_their_load_factor_and_followed_on_request() {
    let dir = std::env::temp_dir().join(format!("rigwright-cli-limit-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("truss.rig.ron");
    std::fs::write(
        &file,
        r#"(version: 2, planar: true, gravity: (0.0, 0.0, 0.0), nodes: [(id: "L", at: (-1.0, 0.0, 0.0), fixed: (true, true, true)), (id: "R", at: (1.0, 0.0, 0.0), fixed: (true, true, true)), (id: "C", at: (0.0, 0.1, 0.0), mass: 1.0)], members: [(id: "b1", ends: ("L", "C"), kind: Strut(ea: 100000.0, rest: AsDrawn)), (id: "b2", ends: ("R", "C"), kind: Strut(ea: 100000.0, rest: AsDrawn))], cases: [(name: "2x", loads: [(node: "C", force: (0.0, -76.2, 0.0))])])"#,
    )
    .unwrap();
    let f = file.to_str().unwrap();
    let (code, out, err) = rigwright(&["solve", f, "--json"]);
    assert_eq!(code, 3, "{err}");
    let doc: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(doc["kind"], "limit_point");
    let factor = doc["critical_load_factor"].as_f64().unwrap();
    assert!((factor * 76.2 - 38.10872).abs() < 1e-4, "{factor}");
    assert!(err.contains("load factor 0.500114"), "{err}");
    let (code, out, err) = rigwright(&["solve", f, "--follow"]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("stable equilibrium") && out.contains("followed past a limit point at load factor 0.500114"),
        "{out}"
    );
    let (code, out, err) = rigwright(&["path", f, "--node", "C", "--csv"]);
    assert_eq!(code, 0, "{err}");
    let rows: Vec<&str> = out.lines().collect();
    assert_eq!(rows[0], "load_factor,ux_m,uy_m,uz_m,stable");
    assert!(rows.iter().any(|r| r.ends_with("false")), "the path passes an unstable stretch");
    assert!(
        rows.last().unwrap().starts_with("1,") && rows.last().unwrap().ends_with("true"),
        "{}",
        rows.last().unwrap()
    );
    std::fs::remove_dir_all(&dir).ok();
}

/// The Sheet's test fixtures, kept with the report crate.
fn data(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("report/tests/data").join(name)
}

fn out_dir() -> PathBuf {
    let d = PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join("sheet-tests");
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// Splits one CSV line into fields (RFC 4180 quoting).
fn fields(line: &str) -> Vec<String> {
    let mut out = vec![String::new()];
    let mut quoted = false;
    let mut chars = line.chars().peekable();
    while let Some(c) = chars.next() {
        match c {
            '"' if quoted && chars.peek() == Some(&'"') => {
                chars.next();
                out.last_mut().unwrap().push('"');
            }
            '"' => quoted = !quoted,
            ',' if !quoted => out.push(String::new()),
            c => out.last_mut().unwrap().push(c),
        }
    }
    out
}

/// Runs a poppler tool, or `None` (with a note) when it is not installed.
fn poppler(tool: &str, args: &[&str]) -> Option<String> {
    match Command::new(tool).args(args).output() {
        Ok(out) if out.status.success() => Some(String::from_utf8_lossy(&out.stdout).into_owned()),
        Ok(out) => panic!("{tool} failed: {}", String::from_utf8_lossy(&out.stderr)),
        Err(_) => {
            println!("note: `{tool}` (poppler-utils) is not installed; this part of the test is skipped");
            None
        }
    }
}

/// Number of pages and page size line from `pdfinfo`.
fn pdfinfo(pdf: &Path) -> Option<(usize, String)> {
    let info = poppler("pdfinfo", &[pdf.to_str().unwrap()])?;
    let pages = info
        .lines()
        .find_map(|l| l.strip_prefix("Pages:"))
        .map(|v| v.trim().parse().unwrap())
        .unwrap();
    let size = info.lines().find(|l| l.starts_with("Page size:")).unwrap_or("").to_string();
    Some((pages, size))
}

fn pdftext(pdf: &Path) -> Option<String> {
    poppler("pdftotext", &["-layout", pdf.to_str().unwrap(), "-"])
}

/// Four significant digits, as a calc sheet prints a force in newtons below 10 kN.
fn four(v: f64) -> String {
    let mag = v.abs().log10().floor() as i32;
    let decimals = (3 - mag).max(0) as usize;
    format!("{v:.decimals$}")
}

/// Largest member force over all cases, solved here with the core directly.
fn peak_forces(file: &Path) -> Vec<(String, f64)> {
    let (_, model) = Project::load_model(file).unwrap();
    let statics = Statics::new(&model);
    let mut peak: Vec<(String, f64)> = model.members.iter().map(|m| (m.id.clone(), f64::NEG_INFINITY)).collect();
    for c in 0..model.cases.len() {
        let eq = statics.solve(c, None).unwrap();
        assert!(eq.stability.is_stable());
        for (p, m) in peak.iter_mut().zip(&eq.members) {
            p.1 = p.1.max(m.force);
        }
    }
    peak
}

#[test]
fn sheet_of_the_sized_sign_is_one_page_with_ids_peak_forces_cautions_and_the_file_hash() {
    let file = data("sign-sized.rig.ron");
    let pdf = out_dir().join("sign-sized.pdf");
    let (code, _, err) = rigwright(&[
        "sheet",
        file.to_str().unwrap(),
        "-o",
        pdf.to_str().unwrap(),
        "--checked-by",
        "B. Checker",
    ]);
    assert_eq!(code, 0, "{err}");
    let bytes = std::fs::read(&pdf).unwrap();
    assert!(bytes.starts_with(b"%PDF-"));
    let Some((pages, size)) = pdfinfo(&pdf) else { return };
    assert_eq!(pages, 1);
    assert!(size.contains("595.") && size.contains("841."), "{size}");
    let Some(text) = pdftext(&pdf) else { return };
    for id in ["short-rope", "long-rope", "wall-left", "wall-right", "sign"] {
        assert!(text.contains(id), "{id} missing");
    }
    // Peak tensions over both cases, from the solver, printed in N to four digits.
    for (id, f) in peak_forces(&file) {
        assert!(f > 0.0 && f < 10_000.0, "{id}: {f}");
        assert!(text.contains(&four(f)), "{id}: peak force {} N not on the sheet", four(f));
    }
    // Title block from the project file and the command line.
    for s in [
        "J-0412 High Street signage",
        "Example Bakery Ltd",
        "A. Engineer",
        "B. Checker",
        "2025-03-14",
        "1 of 1",
        "SI (m, N, kg)",
    ] {
        assert!(text.contains(s), "`{s}` missing");
    }
    // The cautions, the design-factor source and the hash of the file's bytes.
    let flat = text.split_whitespace().collect::<Vec<_>>().join(" ");
    assert!(flat.contains("Rigging and tensioned structures can fail suddenly and hurt people."));
    assert!(flat.contains("review by a licensed engineer"));
    assert!(flat.contains("common practice"));
    let hash = rigwright_report::sha256_hex(&std::fs::read(&file).unwrap());
    assert!(text.contains(&hash), "SHA-256 {hash} missing");
    assert!(text.contains(env!("CARGO_PKG_VERSION")));
}

#[test]
fn a_large_rig_runs_onto_more_pages_each_with_its_title_block_and_page_count() {
    let file = sample("canopy-net-6x6.rig.ron");
    let pdf = out_dir().join("canopy-letter.pdf");
    let (code, _, err) = rigwright(&[
        "sheet",
        file.to_str().unwrap(),
        "-o",
        pdf.to_str().unwrap(),
        "--paper",
        "letter",
        "--stiffness",
        "n3_3",
        "--date",
        "2025-01-02",
    ]);
    assert_eq!(code, 0, "{err}");
    let Some((pages, size)) = pdfinfo(&pdf) else { return };
    assert!(pages >= 2, "{pages} page(s)");
    assert!(size.contains("612 x 792"), "{size}");
    let Some(text) = pdftext(&pdf) else { return };
    for p in 1..=pages {
        assert!(text.contains(&format!("{p} of {pages}")), "page {p}");
    }
    assert_eq!(text.matches("RIGWRIGHT").count(), pages);
    assert_eq!(text.matches("CAUTION.").count(), pages);
    assert!(text.contains("(continued)"));
    assert!(text.contains("Tangent stiffness at marked nodes"));
}

#[test]
fn a_case_without_equilibrium_is_stated_plainly_and_the_command_exits_3() {
    // A mass on one cable; without gravity the cable is exactly unstressed and nothing holds
    // the node: a mechanism, so that case has no result.
    let text = r#"(
    version: 2,
    title: "Mass on one cable",
    planar: true,
    nodes: [
        (id: "anchor", at: (0.0, 0.0, 0.0), fixed: (true, true, true)),
        (id: "weight", at: (0.0, -1.0, 0.0), mass: 10.0),
    ],
    members: [(id: "hanger", ends: ("anchor", "weight"), kind: Cable(ea: 100000.0, rest: AsDrawn))],
    cases: [
        (name: "hanging", gravity: 1.0, loads: []),
        (name: "weightless", gravity: 0.0, loads: []),
    ],
)
"#;
    let file = out_dir().join("weightless.rig.ron");
    std::fs::write(&file, text).unwrap();
    let pdf = out_dir().join("weightless.pdf");
    let (code, _, err) = rigwright(&["sheet", file.to_str().unwrap(), "-o", pdf.to_str().unwrap(), "--case", "weightless"]);
    assert_eq!(code, 3, "{err}");
    assert!(err.contains("weightless"), "{err}");
    let Some(text) = pdftext(&pdf) else { return };
    assert!(text.contains("NO EQUILIBRIUM"));
    assert!(text.contains("DOES NOT PASS"));
    assert!(
        !text.contains("Displacements drawn"),
        "a deformed shape was drawn for a case without equilibrium"
    );
    // The node CSV of that case is refused; the members CSV is written.
    let members = out_dir().join("weightless-members.csv");
    let nodes = out_dir().join("weightless-nodes.csv");
    let _ = std::fs::remove_file(&nodes);
    let (code, _, err) = rigwright(&[
        "export",
        file.to_str().unwrap(),
        "--case",
        "weightless",
        "--csv-members",
        members.to_str().unwrap(),
        "--csv-nodes",
        nodes.to_str().unwrap(),
    ]);
    assert_eq!(code, 3, "{err}");
    assert!(members.exists());
    assert!(!nodes.exists());
}

#[test]
fn csv_columns_carry_units_and_hold_the_solver_forces() {
    let file = data("sign-sized.rig.ron");
    let dir = out_dir();
    let (members, nodes, json) = (dir.join("m.csv"), dir.join("n.csv"), dir.join("r.json"));
    let (code, _, err) = rigwright(&[
        "export",
        file.to_str().unwrap(),
        "--case",
        "dead + gust",
        "--csv-members",
        members.to_str().unwrap(),
        "--csv-nodes",
        nodes.to_str().unwrap(),
        "--json",
        json.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    // Every numeric column names its unit; the others are text or dimensionless.
    let dimensionless = ["design_factor", "utilisation"];
    let text_columns = [
        "member",
        "node",
        "kind",
        "node_a",
        "node_b",
        "made_of",
        "slack",
        "force_min_case",
        "force_max_case",
        "capacity_what",
        "governing_check",
        "governing_case",
        "status",
        "support",
    ];
    let m = std::fs::read_to_string(&members).unwrap();
    let n = std::fs::read_to_string(&nodes).unwrap();
    for csv in [&m, &n] {
        for col in csv.lines().next().unwrap().split(',') {
            let unit = ["_N", "_m", "_Pa", "_kg"].iter().any(|u| col.ends_with(u));
            assert!(
                unit || dimensionless.contains(&col) || text_columns.contains(&col),
                "column `{col}` has no unit"
            );
        }
    }
    // Peak forces match the solver's.
    let head: Vec<&str> = m.lines().next().unwrap().split(',').collect();
    let col = |name: &str| head.iter().position(|h| *h == name).unwrap();
    for (id, f) in peak_forces(&file) {
        let row = fields(m.lines().find(|l| l.starts_with(&format!("{id},"))).unwrap());
        let got: f64 = row[col("force_max_N")].parse().unwrap();
        assert!((got - f).abs() <= 1e-9 * f, "{id}: {got} vs {f}");
        assert_eq!(row[col("design_factor")], "5");
    }
    // Reactions balance the loads of the case (45 kg sign, the ropes' own weight over their
    // unstressed lengths, 250 N gust): statics of the whole rig.
    let (project, model) = Project::load_model(&file).unwrap();
    let ropes: f64 = project
        .members
        .iter()
        .zip(&model.members)
        .map(|(d, m)| d.mass_per_length * m.kind.rest_length())
        .sum();
    assert!(ropes > 0.0, "the fixture's ropes carry their weight");
    let head: Vec<&str> = n.lines().next().unwrap().split(',').collect();
    let col = |name: &str| head.iter().position(|h| *h == name).unwrap();
    let mut sum = [250.0, -(45.0 + ropes) * 9.81];
    for l in n.lines().skip(1) {
        let row = fields(l);
        for (k, c) in ["rx_N", "ry_N"].iter().enumerate() {
            if let Ok(v) = row[col(c)].parse::<f64>() {
                sum[k] += v;
            }
        }
    }
    assert!(sum[0].abs() < 1e-6 && sum[1].abs() < 1e-6, "{sum:?}");
    let doc: serde_json::Value = serde_json::from_str(&std::fs::read_to_string(&json).unwrap()).unwrap();
    assert_eq!(doc["format"], "rigwright.result/1");
    assert_eq!(doc["case"], "dead + gust");
    assert_eq!(doc["cases"].as_array().unwrap().len(), 2);
    assert_eq!(doc["checks"].as_array().unwrap().len(), 2);
    assert_eq!(
        doc["project"]["sha256"],
        rigwright_report::sha256_hex(&std::fs::read(&file).unwrap())
    );
}

#[test]
fn bad_input_exits_2_with_the_reason() {
    let file = data("sign-sized.rig.ron");
    let pdf = out_dir().join("bad.pdf");
    let f = file.to_str().unwrap();
    let o = pdf.to_str().unwrap();
    for (args, says) in [
        (vec!["sheet", f, "-o", o, "--case", "hail"], "no load case named `hail`"),
        (vec!["sheet", f, "-o", o, "--paper", "a3"], "use a4 or letter"),
        (vec!["sheet", f, "-o", o, "--stiffness", "nowhere"], "node `nowhere` does not exist"),
        (vec!["export", f], "nothing to export"),
    ] {
        let (code, _, err) = rigwright(&args);
        assert_eq!(code, 2, "{args:?}: {err}");
        assert!(err.contains(says), "{args:?}: {err}");
    }
}

#[test]
fn the_app_writes_the_sheet_and_csv_of_its_document_and_reports_a_failed_write() {
    use rigwright::RigApp;
    use rigwright::gui::Settings;
    use rigwright::gui::export::{ExportKind, write};
    let ctx = eframe::egui::Context::default();
    let app = RigApp::with_settings(&ctx, Settings::default(), Some(data("sign-sized.rig.ron")));
    let dir = out_dir();
    let pdf = dir.join("app-sheet.pdf");
    let said = write(&app, ExportKind::Sheet(Paper::Letter), &pdf).unwrap();
    assert!(said.contains("PASSES"), "{said}");
    assert!(std::fs::read(&pdf).unwrap().starts_with(b"%PDF-"));
    let csv = dir.join("app-members.csv");
    write(&app, ExportKind::Csv, &csv).unwrap();
    assert!(dir.join("app-nodes.csv").exists());
    let err = write(&app, ExportKind::Json, &dir.join("no-such-folder").join("r.json")).unwrap_err();
    assert!(err.contains("could not write"), "{err}");
}

/// A guy that sags under its own weight carries a `sag` object in `solve --json` and a second
/// table in the text, whose numbers keep the statics of the free cable (common practice): the
/// horizontal component is the same at both ends, the vertical components differ by the
/// cable's weight (0.576 kg/m × g × its unstressed length, from the file), the anchor's
/// reaction is the tension at that end, and the curve runs from end to end.
#[test]
fn solve_reports_the_sag_of_a_weighted_guy_and_its_statics_hold() {
    let file = sample("guyed-pole.rig.ron");
    let (code, out, err) = rigwright(&["solve", file.to_str().unwrap(), "--json"]);
    assert_eq!(code, 0, "{err}");
    let doc: serde_json::Value = serde_json::from_str(&out).unwrap();
    let guy = doc["members"].as_array().unwrap().iter().find(|m| m["id"] == "guy-a").unwrap();
    let s = &guy["sag"];
    let f = |k: &str| s[k].as_f64().unwrap_or_else(|| panic!("{k} missing"));
    let weight = 0.576 * 9.81 * guy["unstressed_length"].as_f64().unwrap();
    assert!((f("weight") - weight).abs() <= 1e-12 * weight);
    let (ta, tb) = (f("tension_a"), f("tension_b"));
    let (aa, ab) = (f("angle_a_deg").to_radians(), f("angle_b_deg").to_radians());
    let h = f("horizontal");
    assert!((ta * aa.cos() - h).abs() <= 1e-9 * h && (tb * ab.cos() - h).abs() <= 1e-9 * h);
    assert!(
        (tb * ab.sin() - ta * aa.sin() - weight).abs() <= 1e-9 * tb,
        "vertical balance of the cable"
    );
    assert_eq!(guy["force"].as_f64().unwrap(), ta.max(tb));
    assert!(f("sag") > 0.0 && f("mid_span_sag") >= f("sag"));
    let nodes = doc["nodes"].as_array().unwrap();
    let at = |id: &str| nodes.iter().find(|n| n["id"] == id).unwrap();
    let reaction: Vec<f64> = at("anchor-a")["reaction"]
        .as_array()
        .unwrap()
        .iter()
        .map(|v| v.as_f64().unwrap())
        .collect();
    let r = reaction.iter().map(|v| v * v).sum::<f64>().sqrt();
    assert!((r - ta).abs() <= 1e-9 * ta, "anchor reaction {r} vs tension {ta} N");
    let curve = s["curve"].as_array().unwrap();
    for (point, id) in [(&curve[0], "anchor-a"), (curve.last().unwrap(), "top")] {
        for k in 0..3 {
            let (p, q) = (point[k].as_f64().unwrap(), at(id)["position"][k].as_f64().unwrap());
            assert!((p - q).abs() <= 1e-9, "curve end {p} vs node {id} {q}");
        }
    }
    let (_, text, _) = rigwright(&["solve", file.to_str().unwrap()]);
    assert!(
        text.contains("cables that sag under their own weight") && text.contains("mid-span [m]"),
        "{text}"
    );
}

/// A long level cable given no mass per length gets a warning that its real weight would
/// soften it (here a steel rope of EA 1e7 N at 10 kN over 100 m: Ernst's factor 1/(1 + (w l)²
/// EA/(12 T³)) is about 0.67), and none once its mass per length is given.
#[test]
fn a_long_weightless_cable_is_asked_for_its_mass_per_length() {
    let rig = |mass: f64| {
        format!(
            "(version: 2, planar: true, gravity: (0.0, -9.81, 0.0), nodes: [(id: \"a\", at: (0.0, 0.0, 0.0), fixed: (true, true, true)), (id: \"b\", at: (100.0, 0.0, 0.0), fixed: (true, true, true))], members: [(id: \"span\", ends: (\"a\", \"b\"), kind: Cable(ea: 1e7, rest: Horizontal(10000.0)), mass_per_length: {mass:?})])"
        )
    };
    for (mass, warned) in [(0.0, true), (0.8, false)] {
        let path = std::env::temp_dir().join(format!("rigwright-cli-{}-span.rig.ron", std::process::id()));
        std::fs::write(&path, rig(mass)).unwrap();
        let (code, out, err) = rigwright(&["export", path.to_str().unwrap(), "--json", "-"]);
        assert_eq!(code, 0, "{err}");
        let doc: serde_json::Value = serde_json::from_str(&out).unwrap();
        let text = doc["warnings"].to_string();
        let _ = std::fs::remove_file(&path);
        assert_eq!(text.contains("Cable `span` has no mass per length"), warned, "{text}");
    }
}

/// `sheet --sag` dimensions each sagging guy of the guyed pole with its sag, as `solve` gives
/// it (mm to the Sheet's precision); without it the drawing has none.
#[test]
fn sheet_dimensions_the_sag_on_request() {
    let file = sample("guyed-pole.rig.ron");
    let dir = std::env::temp_dir().join(format!("rigwright-cli-{}-sag", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let (with, without) = (dir.join("with.pdf"), dir.join("without.pdf"));
    let (code, _, err) = rigwright(&["sheet", file.to_str().unwrap(), "-o", with.to_str().unwrap(), "--sag"]);
    assert_eq!(code, 0, "{err}");
    let (code, _, err) = rigwright(&["sheet", file.to_str().unwrap(), "-o", without.to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
    if let (Some(a), Some(b)) = (pdftext(&with), pdftext(&without)) {
        assert!(a.contains("sag 0.0"), "{a}");
        assert!(!b.contains("sag 0.0"), "{b}");
    }
    let _ = std::fs::remove_dir_all(&dir);
}

/// An output that is the project being read is refused (exit 2, the file unchanged), as is
/// replacing another project file by a PDF or CSV unless `--force` is given (issue 21).
#[test]
fn outputs_never_replace_the_project_read_or_another_project() {
    let dir = std::env::temp_dir().join(format!("rigwright-cli-{}-same", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let project = dir.join("sign.rig.ron");
    std::fs::copy(sample("sign-on-two-cables.rig.ron"), &project).unwrap();
    let other = dir.join("other.rig.ron");
    std::fs::copy(sample("guyed-pole.rig.ron"), &other).unwrap();
    let before = std::fs::read(&project).unwrap();
    let p = project.to_str().unwrap();
    for args in [
        vec!["sheet", p, "-o", p],
        vec!["export", p, "--json", p],
        vec!["autosize", p, "-o", p],
        vec!["sheet", p, "-o", other.to_str().unwrap()],
        vec!["export", p, "--csv-members", other.to_str().unwrap()],
    ] {
        let (code, _, err) = rigwright(&args);
        assert_eq!(code, 2, "{args:?}: {err}");
        assert!(err.contains("choose another") || err.contains("another file"), "{args:?}: {err}");
    }
    assert_eq!(std::fs::read(&project).unwrap(), before, "the project read is unchanged");
    assert!(
        std::fs::read_to_string(&other).unwrap().contains("three guys"),
        "the other project is unchanged"
    );
    // With --force the other project file may be replaced; the one read never.
    let (code, _, err) = rigwright(&["sheet", p, "-o", other.to_str().unwrap(), "--force"]);
    assert_eq!(code, 0, "{err}");
    assert!(std::fs::read(&other).unwrap().starts_with(b"%PDF"));
    let (code, _, _) = rigwright(&["sheet", p, "-o", p, "--force"]);
    assert_eq!(code, 2);
    assert_eq!(std::fs::read(&project).unwrap(), before);
    let _ = std::fs::remove_dir_all(&dir);
}

/// Plucking an anchor is refused with a message that names it (issue 21), as `--stiffness`
/// refuses one.
#[test]
fn pluck_refuses_an_anchor() {
    let file = sample("sign-on-two-cables.rig.ron");
    let (code, _, err) = rigwright(&[
        "pluck",
        file.to_str().unwrap(),
        "--node",
        "wall-left",
        "--offset",
        "0.01,0",
        "--duration",
        "1",
    ]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("`wall-left` is held in every direction"), "{err}");
}
