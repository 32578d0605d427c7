//! The Sheet and the result exports, produced as a user would (the command line, the app's
//! File menu) and read back: the PDF through poppler's `pdftotext`/`pdfinfo` (skipped with a
//! note when they are not installed), the CSV and JSON directly. Expected numbers are
//! computed here from the core's solver, independently of the sheet code. (The Sheet's pages
//! themselves are tested in `app/report/tests/sheet.rs`.)

use std::path::{Path, PathBuf};
use std::process::Command;

use rigwright_core::{Project, Statics};
use rigwright_report::Paper;

/// The Sheet's test fixtures, kept with the report crate.
fn data(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("report/tests/data").join(name)
}

fn sample(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../sample-projects").join(name)
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

fn rigwright(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_rigwright")).args(args).output().expect("runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
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
