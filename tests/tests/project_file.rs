//! Project files: samples load, validate and solve; save → load → save is byte-identical.
//!
//! Set `UPDATE_SAMPLES=1` to rewrite the samples in canonical form (and regenerate the net).

use rigwright_core::gallery::cable_net;
use rigwright_core::sizing::{MemberDesign, Part};
use rigwright_core::{Project, Statics};
use rigwright_verification::{SAMPLES, sample};

fn net_sample() -> Project {
    let mut p = cable_net(8, 1.25, 4.0e6, 6000.0, 6.0);
    p.title = "Canopy net: 6×6 free nodes on a pretensioned cable grid".into();
    p.notes = "Invented example: a flat net of 8 mm stainless 1×19 strand (an example supplier entry in the project's own parts; swaged ends, efficiency 0.9) on a 1.25 m grid, each pretensioned to 6 kN, anchored along a square frame; 6 kg of clamps and panel at each free node.".into();
    p.sizing.termination_efficiency = 0.9;
    p.sizing.parts.push(Part {
        id: "ss-1x19-8".into(),
        description: "stainless 1×19 strand, 8 mm (example supplier entry)".into(),
        breaking_force: 50_000.0,
        ea: 4.0e6,
        mass_per_length: 0.31,
        source: "invented for this example; use your supplier's rated values".into(),
    });
    for m in &mut p.members {
        m.mass_per_length = 0.31;
        m.design = Some(MemberDesign {
            part: Some("ss-1x19-8".into()),
            ..MemberDesign::default()
        });
    }
    p.cases[0].name = "self-weight".into();
    p.cases.push(rigwright_core::model::CaseDoc {
        name: "maintenance load".into(),
        gravity: 1.0,
        loads: vec![rigwright_core::model::LoadDoc {
            node: "n3_3".into(),
            force: (0.0, -1000.0, 0.0),
        }],
    });
    p
}

#[test]
fn samples_are_canonical_and_round_trip_byte_identical() {
    let update = std::env::var_os("UPDATE_SAMPLES").is_some();
    if update {
        std::fs::write(sample("canopy-net-6x6.rig.ron"), net_sample().to_ron()).unwrap();
    }
    for name in SAMPLES {
        let path = sample(name);
        let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{name}: {e}"));
        let p = Project::from_ron(&text).unwrap_or_else(|e| panic!("{name}: {e}"));
        let once = p.to_ron();
        let twice = Project::from_ron(&once).unwrap().to_ron();
        assert_eq!(once, twice, "{name}: save → load → save changed the bytes");
        if update {
            std::fs::write(&path, &once).unwrap();
        } else {
            assert_eq!(text, once, "{name} is not in canonical form; run with UPDATE_SAMPLES=1");
        }
    }
}

#[test]
fn every_sample_solves_every_case_to_a_stable_equilibrium() {
    for name in SAMPLES {
        let (_, model) = Project::load_model(&sample(name)).unwrap_or_else(|e| panic!("{name}: {e}"));
        let statics = Statics::new(&model);
        for (c, case) in model.cases.iter().enumerate() {
            let eq = statics.solve(c, None).unwrap_or_else(|e| panic!("{name} / {}: {e}", case.name));
            assert!(eq.stability.is_stable(), "{name} / {}: {}", case.name, eq.stability.describe());
            assert!(eq.residual <= 1e-10, "{name} / {}: residual {}", case.name, eq.residual);
        }
    }
}

/// A file written by the released version 1 format (before design data) still opens, keeps
/// every value, and is saved as the current version.
#[test]
fn a_version_1_file_still_opens_and_saves_as_the_current_version() {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("fixtures/version-1-sign.rig.ron");
    let text = std::fs::read_to_string(&path).unwrap();
    assert!(text.contains("version: 1,"));
    let p = Project::from_ron(&text).unwrap();
    p.validate().unwrap();
    assert_eq!(p.version, rigwright_core::FORMAT_VERSION);
    assert_eq!(p.members.len(), 2);
    assert!(p.members.iter().all(|m| m.design.is_none()));
    let saved = p.to_ron();
    assert!(saved.contains(&format!("version: {},", rigwright_core::FORMAT_VERSION)));
    assert_eq!(saved.replace("version: 2,", "version: 1,"), text, "nothing else changes");
}
