//! The Sheet as laid out, read from its pages' display lists, without the command line or the
//! app: no text runs past the margins, page 1 summarises a large rig, a stopped build says
//! so, a large displacement is pointed out. (The Sheet and the exports made through the
//! command line and the app, read back from the PDF, CSV and JSON, are tested in
//! `app/tests/cli.rs`.) Expected numbers are computed here from the core's solver,
//! independently of the sheet code.

use std::path::PathBuf;

use rigwright_core::{Project, Statics};
use rigwright_report::{Op, Paper, Sheet, SheetOptions, fonts};

/// The Sheet's own test fixtures (the app's tests use them too).
fn data(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/data").join(name)
}

fn sample(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../../sample-projects").join(name)
}

#[test]
fn no_text_runs_past_the_page_margins_on_any_sample_or_paper() {
    let mut files: Vec<PathBuf> = std::fs::read_dir(sample(""))
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.to_string_lossy().ends_with(".rig.ron"))
        .collect();
    files.push(data("sign-sized.rig.ron"));
    for file in files {
        let project = Project::load(&file).unwrap();
        let options = SheetOptions {
            file_name: Some("x.rig.ron".into()),
            ..Default::default()
        };
        let sheet = Sheet::build(&project, b"", &options).unwrap();
        for paper in [Paper::A4, Paper::Letter] {
            let (w, h) = paper.size();
            for (p, page) in sheet.pages(paper).iter().enumerate() {
                for op in &page.ops {
                    if let Op::Text {
                        x, y, size, weight, text, ..
                    } = op
                    {
                        let right = x + fonts::width(text, *size, *weight);
                        let inside = *x >= 27.0 && right <= w - 27.0 && *y >= 27.0 && *y <= h - 27.0;
                        assert!(
                            inside,
                            "{}, {paper:?} page {}: `{text}` at ({x}, {y}) to {right}",
                            file.display(),
                            p + 1
                        );
                    }
                }
            }
        }
    }
}

/// The texts drawn on one laid-out page.
fn texts(page: &rigwright_report::Page) -> Vec<String> {
    page.ops
        .iter()
        .filter_map(|op| match op {
            Op::Text { text, .. } => Some(text.clone()),
            _ => None,
        })
        .collect()
}

/// Page 1 is a summary of its own: on a rig too large for one page it holds the verdict, the
/// load cases, the drawing, the most utilised members (none left off that is more utilised
/// than one shown), the frequencies, the design basis and the cautions; every member and
/// every node follow on the later pages. Small samples keep every member on page 1. (What a
/// one-page summary must hold is the product's own requirement, not an outside source.)
#[test]
fn page_one_summarises_and_the_complete_tables_follow() {
    let options = SheetOptions {
        file_name: Some("x.rig.ron".into()),
        ..Default::default()
    };
    let project = Project::load(&sample("canopy-net-6x6.rig.ron")).unwrap();
    let sheet = Sheet::build(&project, b"", &options).unwrap();
    let pages = sheet.pages(Paper::A4);
    assert!(pages.len() >= 2, "{} page(s)", pages.len());
    let first = texts(&pages[0]);
    let n = sheet.report.members.len();
    let heading = first
        .iter()
        .find(|t| t.contains("Members of most concern"))
        .unwrap_or_else(|| panic!("no summary heading on page 1: {first:?}"));
    assert!(heading.contains(&format!(" of {n}:")), "{heading}");
    for must in [
        "PASSES",
        "Load cases",
        "Natural frequencies",
        "Design factors and limits",
        "CAUTION.",
    ] {
        assert!(first.iter().any(|t| t.contains(must)), "page 1 lacks `{must}`");
    }
    let utilisation = |id: &str| {
        let m = sheet.report.members.iter().find(|m| m.id == id).unwrap();
        m.utilisation.unwrap_or(f64::NEG_INFINITY)
    };
    let on_first: Vec<&str> = sheet
        .report
        .members
        .iter()
        .map(|m| m.id.as_str())
        .filter(|id| first.iter().any(|t| t == id))
        .collect();
    assert!(on_first.len() >= 6 && on_first.len() < n, "{} members on page 1", on_first.len());
    let least_shown = on_first.iter().map(|id| utilisation(id)).fold(f64::INFINITY, f64::min);
    for m in &sheet.report.members {
        if !on_first.contains(&m.id.as_str()) {
            assert!(utilisation(&m.id) <= least_shown, "`{}` is more utilised than one shown", m.id);
        }
    }
    let rest: Vec<String> = pages[1..].iter().flat_map(texts).collect();
    for m in &sheet.report.members {
        assert!(rest.contains(&m.id), "member `{}` missing from the complete table", m.id);
    }
    for node in &project.nodes {
        assert!(rest.contains(&node.id), "node `{}` missing from the complete table", node.id);
    }
    // The load cases list their point loads (the pole's wind load, as in the file).
    let pole = Project::load(&sample("guyed-pole.rig.ron")).unwrap();
    let pole_sheet = Sheet::build(&pole, b"", &options).unwrap();
    let first = texts(&pole_sheet.pages(Paper::A4)[0]);
    assert!(first.iter().any(|t| t == "top: (1200, 0, 0) N"), "{first:?}");
    // Small rigs: every member in the table on page 1 (ids in tables are bold; the drawing
    // labels members in regular type).
    for name in [
        "sign-on-two-cables.rig.ron",
        "guyed-pole.rig.ron",
        "machine-on-four-springs.rig.ron",
    ] {
        let project = Project::load(&sample(name)).unwrap();
        let sheet = Sheet::build(&project, b"", &options).unwrap();
        let pages = sheet.pages(Paper::A4);
        let bold: Vec<&str> = pages[0]
            .ops
            .iter()
            .filter_map(|op| match op {
                Op::Text { text, weight, .. } if *weight == fonts::Weight::Bold => Some(text.as_str()),
                _ => None,
            })
            .collect();
        for m in &project.members {
            assert!(
                bold.contains(&m.id.as_str()),
                "{name}: member `{}` not in the table on page 1",
                m.id
            );
        }
    }
}

/// A stopped build gives up with its own message instead of finishing the work (the app's
/// Cancel on a large rig's Sheet).
#[test]
fn a_stopped_sheet_build_says_so() {
    let project = Project::load(&sample("canopy-net-6x6.rig.ron")).unwrap();
    let watch = rigwright_core::Watch::new();
    watch.stop();
    let built = Sheet::build_watched(&project, b"", &SheetOptions::default(), &watch);
    assert_eq!(built.err().as_deref(), Some(rigwright_report::STOPPED));
    // The load cases themselves are not solved once stopped (the build's first step).
    let model = project.validate().unwrap();
    let cases = rigwright_core::sizing::solve_cases_watched(&model, &watch);
    assert!(
        cases.iter().all(|c| c.equilibrium.is_none() && c.error.is_some()),
        "solved after a stop"
    );
    assert!(Sheet::build_watched(&project, b"", &SheetOptions::default(), &rigwright_core::Watch::new()).is_ok());
}

/// A displacement of more than a quarter of the rig's size is pointed out (the tool's own
/// threshold, not a code limit); the figures in the warning are the solver's, found here
/// directly.
#[test]
fn a_large_displacement_is_pointed_out_with_the_solvers_figures() {
    let mut project = Project::load(&sample("sign-on-two-cables.rig.ron")).unwrap();
    let plain = Sheet::build(&project, b"", &SheetOptions::default()).unwrap();
    assert!(
        !plain.warnings.iter().any(|w| w.contains("Large displacement")),
        "{:?}",
        plain.warnings
    );
    // 2 kN upward on a 45 kg sign flips it over its anchors.
    project.cases.push(rigwright_core::model::CaseDoc {
        name: "uplift".into(),
        gravity: 1.0,
        loads: vec![rigwright_core::model::LoadDoc {
            node: "sign".into(),
            force: (0.0, 2000.0, 0.0),
        }],
    });
    let sheet = Sheet::build(&project, b"", &SheetOptions::default()).unwrap();
    let model = project.validate().unwrap();
    let eq = Statics::new(&model).solve(model.cases.len() - 1, None).unwrap();
    let moved = eq.nodes[model.node_index("sign").unwrap()].displacement.norm();
    let (mut lo, mut hi) = ([f64::INFINITY; 3], [f64::NEG_INFINITY; 3]);
    for n in &model.nodes {
        for a in 0..3 {
            lo[a] = lo[a].min(n.position[a]);
            hi[a] = hi[a].max(n.position[a]);
        }
    }
    let size = (0..3).map(|a| (hi[a] - lo[a]).powi(2)).sum::<f64>().sqrt();
    let warning = sheet
        .warnings
        .iter()
        .find(|w| w.contains("Large displacement in load case `uplift`"))
        .unwrap_or_else(|| panic!("{:?}", sheet.warnings));
    assert!(warning.contains("node `sign`"), "{warning}");
    assert!(warning.contains(&format!("{:.0} %", 100.0 * moved / size)), "{warning}");
}
