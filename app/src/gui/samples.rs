//! The sample projects, embedded so they open from any working directory.

/// (menu name, file name, RON text) of every sample project.
pub const SAMPLES: &[(&str, &str, &str)] = &[
    (
        "Sign on two cables",
        "sign-on-two-cables.rig.ron",
        include_str!("../../../sample-projects/sign-on-two-cables.rig.ron"),
    ),
    (
        "Lamp counterbalance",
        "lamp-counterbalance.rig.ron",
        include_str!("../../../sample-projects/lamp-counterbalance.rig.ron"),
    ),
    (
        "Machine on four springs",
        "machine-on-four-springs.rig.ron",
        include_str!("../../../sample-projects/machine-on-four-springs.rig.ron"),
    ),
    (
        "Canopy net 6×6",
        "canopy-net-6x6.rig.ron",
        include_str!("../../../sample-projects/canopy-net-6x6.rig.ron"),
    ),
    (
        "Guyed pole (3D)",
        "guyed-pole.rig.ron",
        include_str!("../../../sample-projects/guyed-pole.rig.ron"),
    ),
];

/// Index of the sample opened on first start.
pub const DEFAULT_SAMPLE: usize = 0;

#[cfg(test)]
mod tests {
    use rigwright_core::Project;

    #[test]
    fn every_embedded_sample_parses_and_validates() {
        for (name, _, text) in super::SAMPLES {
            let p = Project::from_ron(text).unwrap_or_else(|e| panic!("{name}: {e}"));
            p.validate().unwrap_or_else(|e| panic!("{name}: {e}"));
        }
    }
}
