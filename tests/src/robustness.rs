//! What the fuzz targets (`fuzz/`) do with one input, shared with the regression test that
//! replays the inputs they found (`tests/fuzz_regressions.rs`).
//!
//! The promise checked (issue 7, common practice for fuzzing): any bytes either load or are
//! refused with a message; a project that validates saves and loads back unchanged; a valid
//! model either solves to finite numbers in every load case, with finite, non-negative
//! natural frequencies when the equilibrium is stable, or returns a named diagnostic. Any
//! panic, hang or NaN is a finding.

use rigwright_core::dynamics::modes;
use rigwright_core::{Equilibrium, Model, Project, Stability, Statics};

/// Largest rig the solve target solves (nodes), so one input stays well under a second.
pub const SOLVE_NODE_LIMIT: usize = 150;

/// Modes asked for about each stable equilibrium.
const MODE_COUNT: usize = 3;

/// Loads `bytes` as a project file and validates it; the model when it is valid.
pub fn load_bytes(bytes: &[u8]) -> Option<Model> {
    let text = std::str::from_utf8(bytes).ok()?;
    let project = match Project::from_ron(text) {
        Ok(p) => p,
        Err(e) => {
            assert!(!e.to_string().trim().is_empty(), "a refusal without a message");
            return None;
        }
    };
    let model = match project.validate() {
        Ok(m) => m,
        Err(e) => {
            assert!(!e.to_string().trim().is_empty(), "a refusal without a message");
            return None;
        }
    };
    let saved = project.to_ron();
    let again = Project::from_ron(&saved).unwrap_or_else(|e| panic!("a valid project saved as\n{saved}\ndoes not load: {e}"));
    assert_eq!(again, project, "a valid project changed on save and load");
    Some(model)
}

/// Solves every load case of `model` (up to [`SOLVE_NODE_LIMIT`] nodes) and the modes about
/// each stable equilibrium, checking that every number returned is finite.
pub fn solve_all(model: &Model) {
    if model.nodes.len() > SOLVE_NODE_LIMIT {
        return;
    }
    let statics = Statics::new(model);
    for case in 0..model.cases.len() {
        let eq = match statics.solve(case, None) {
            Ok(eq) => eq,
            Err(e) => {
                assert!(!e.to_string().trim().is_empty(), "a solve error without a message");
                continue;
            }
        };
        check_finite(&eq);
        if !eq.stability.is_stable() {
            continue;
        }
        match modes(&statics, &eq, MODE_COUNT) {
            Ok(m) => {
                for (i, mode) in m.modes.iter().enumerate() {
                    assert!(
                        mode.frequency_hz.is_finite() && mode.frequency_hz >= 0.0,
                        "case {case}: mode {} has frequency {} Hz",
                        i + 1,
                        mode.frequency_hz
                    );
                    assert!(
                        mode.shape.iter().all(|v| v.iter().all(|x| x.is_finite())),
                        "case {case}: mode {} has a shape that is not finite",
                        i + 1
                    );
                }
            }
            Err(e) => assert!(!e.to_string().trim().is_empty(), "a modes error without a message"),
        }
    }
}

fn check_finite(eq: &Equilibrium) {
    let case = &eq.case;
    assert!(eq.residual.is_finite(), "case `{case}`: residual {}", eq.residual);
    for n in &eq.nodes {
        let ok = n.position.iter().chain(n.displacement.iter()).all(|x| x.is_finite())
            && n.reaction.is_none_or(|r| r.iter().all(|x| x.is_finite()));
        assert!(ok, "case `{case}`: node `{}` has a number that is not finite: {n:?}", n.id);
    }
    for m in &eq.members {
        let ok = [m.force, m.length, m.unstressed_length, m.strain].iter().all(|x| x.is_finite());
        assert!(ok, "case `{case}`: member `{}` has a number that is not finite: {m:?}", m.id);
    }
    match &eq.stability {
        Stability::Stable => {}
        Stability::Mechanism { direction, .. } => assert!(direction.iter().all(|x| x.is_finite())),
        Stability::Unstable { direction, eigenvalue, .. } => {
            assert!(direction.iter().all(|x| x.is_finite()) && eigenvalue.is_finite())
        }
    }
}
