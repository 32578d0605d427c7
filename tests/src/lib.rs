//! Shared helpers for the verification suite; the checks live in `tests/`, one file per topic.

use rigwright_core::{Equilibrium, Model, Project, Statics};

pub mod independent;
pub mod robustness;

/// Validates a project, panicking with the problems listed.
pub fn model(p: &Project) -> Model {
    p.validate().unwrap_or_else(|e| panic!("invalid project: {e}"))
}

/// Solves the first load case, panicking on failure.
pub fn solve(m: &Model) -> Equilibrium {
    Statics::new(m).solve(0, None).unwrap_or_else(|e| panic!("solve failed: {e}"))
}

/// Relative difference |a − b| / |b|.
pub fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs()
}

/// The sample projects shipped in `sample-projects/`.
pub const SAMPLES: [&str; 5] = [
    "sign-on-two-cables.rig.ron",
    "lamp-counterbalance.rig.ron",
    "guyed-pole.rig.ron",
    "canopy-net-6x6.rig.ron",
    "machine-on-four-springs.rig.ron",
];

/// Path of a sample project, from the tests crate.
pub fn sample(name: &str) -> std::path::PathBuf {
    std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("../sample-projects")
        .join(name)
}

use rigwright_core::model::{CaseDoc, LoadDoc, MemberDoc, MemberDocKind, NodeDoc, Rest};

/// A free node at `at` (m) with mass (kg).
pub fn node(id: &str, at: (f64, f64, f64), mass: f64) -> NodeDoc {
    NodeDoc {
        id: id.into(),
        at,
        mass,
        fixed: [false; 3],
    }
}

/// A node guided along y (x and z held) at `at` (m) with mass (kg).
pub fn guided_y(id: &str, at: (f64, f64, f64), mass: f64) -> NodeDoc {
    NodeDoc {
        id: id.into(),
        at,
        mass,
        fixed: [true, false, true],
    }
}

/// An anchor at `at` (m).
pub fn anchor(id: &str, at: (f64, f64, f64)) -> NodeDoc {
    NodeDoc {
        id: id.into(),
        at,
        mass: 0.0,
        fixed: [true; 3],
    }
}

/// A member between two node ids.
pub fn member(id: &str, a: &str, b: &str, kind: MemberDocKind) -> MemberDoc {
    MemberDoc {
        id: id.into(),
        ends: (a.into(), b.into()),
        kind,
        mass_per_length: 0.0,
        design: None,
    }
}

/// A cable of axial stiffness `ea` (N).
pub fn cable(ea: f64, rest: Rest) -> MemberDocKind {
    MemberDocKind::Cable { ea, rest }
}

/// A spring of rate `k` (N/m).
pub fn spring(k: f64, rest: Rest) -> MemberDocKind {
    MemberDocKind::Spring { rate: k, rest }
}

/// A strut of axial stiffness `ea` (N).
pub fn strut(ea: f64, rest: Rest) -> MemberDocKind {
    MemberDocKind::Strut { ea, rest }
}

/// A load case with the given gravity multiplier and point loads (node id, force in N).
pub fn case(name: &str, gravity: f64, loads: &[(&str, (f64, f64, f64))]) -> CaseDoc {
    CaseDoc {
        name: name.into(),
        gravity,
        loads: loads
            .iter()
            .map(|(n, f)| LoadDoc {
                node: (*n).into(),
                force: *f,
            })
            .collect(),
    }
}

/// The two projects of the kill-during-save test: the same 24×24 cable net (about 100 KB of
/// text) with different titles and pretensions, so the test can tell which one is on disk.
pub fn save_loop_projects() -> [Project; 2] {
    let mut a = rigwright_core::gallery::cable_net(24, 0.5, 2e6, 800.0, 0.5);
    a.title = "save loop A".into();
    let mut b = rigwright_core::gallery::cable_net(24, 0.5, 2e6, 1200.0, 0.5);
    b.title = "save loop B".into();
    [a, b]
}
