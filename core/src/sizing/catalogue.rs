//! The parts cables are made of: a built-in wire-rope catalogue from the published
//! minimum-breaking-force method, plus the user's own entries (in the project, or in a
//! catalogue file `*.parts.ron`).

use std::path::Path;

use serde::{Deserialize, Serialize};

use super::rope::{Construction, Core, RopeSpec};
use crate::model::ProjectError;

/// Version of the catalogue file format.
pub const CATALOGUE_VERSION: u32 = 1;

/// Nominal wire-rope diameters in the built-in catalogue (mm): common stock sizes (common
/// practice, from memory).
pub const ROPE_DIAMETERS_MM: [f64; 23] = [
    3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0, 10.0, 11.0, 12.0, 13.0, 14.0, 16.0, 18.0, 19.0, 20.0, 22.0, 24.0, 26.0, 28.0, 32.0, 36.0, 40.0,
];

/// Rope grades in the built-in catalogue (N/mm²), EN 12385-4.
pub const ROPE_GRADES: [f64; 2] = [1770.0, 1960.0];

/// One catalogue entry: what a cable needs to be sized and analysed.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Part {
    /// Short unique id, e.g. `6x19-IWRC-10-1770`.
    pub id: String,
    /// As printed, e.g. "6×19 IWRC, 10 mm, grade 1770".
    #[serde(default)]
    pub description: String,
    /// Minimum breaking force (N).
    pub breaking_force: f64,
    /// Axial stiffness EA (N).
    pub ea: f64,
    /// Mass per length (kg/m); 0 only for parts whose weight may be neglected.
    pub mass_per_length: f64,
    /// Where the numbers come from (a standard, a supplier's data sheet).
    #[serde(default)]
    pub source: String,
}

impl Part {
    /// The entry for a steel wire rope.
    pub fn rope(spec: &RopeSpec) -> Part {
        Part {
            id: format!(
                "{}-{}-{}-{}",
                spec.construction.name().replace('×', "x"),
                spec.core.abbreviation(),
                spec.diameter_mm,
                spec.grade
            ),
            description: format!(
                "{} {}, {} mm, grade {}",
                spec.construction.name(),
                spec.core.abbreviation(),
                spec.diameter_mm,
                spec.grade
            ),
            breaking_force: spec.minimum_breaking_force(),
            ea: spec.ea(),
            mass_per_length: spec.mass_per_length(),
            source: format!(
                "EN 12385-4 method (Feyrer Table 1.9); E = {} GPa on the metallic area (common practice)",
                spec.modulus_gpa
            ),
        }
    }

    /// What is wrong with the entry, if anything.
    pub fn problem(&self) -> Option<String> {
        if self.id.trim().is_empty() {
            return Some("a catalogue entry has an empty id; give it a short unique name".into());
        }
        let positive = |v: f64| v.is_finite() && v > 0.0;
        if !positive(self.breaking_force) {
            return Some(format!("part `{}`: breaking force must be a positive number of newtons", self.id));
        }
        if !positive(self.ea) {
            return Some(format!("part `{}`: EA must be a positive number of newtons", self.id));
        }
        if !(self.mass_per_length.is_finite() && self.mass_per_length >= 0.0) {
            return Some(format!("part `{}`: mass per length must be 0 kg/m or more", self.id));
        }
        None
    }
}

/// A catalogue file as stored.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct CatalogueFile {
    version: u32,
    parts: Vec<Part>,
}

/// Parts to choose from: later entries replace earlier ones with the same id.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Catalogue {
    parts: Vec<Part>,
}

impl Catalogue {
    /// The built-in wire ropes: four constructions, two cores, two grades, the diameters in
    /// [`ROPE_DIAMETERS_MM`].
    pub fn builtin() -> Catalogue {
        let mut parts = Vec::new();
        for construction in Construction::ALL {
            for core in [Core::Fibre, Core::Steel] {
                for grade in ROPE_GRADES {
                    for d in ROPE_DIAMETERS_MM {
                        parts.push(Part::rope(&RopeSpec::new(construction, core, d, grade)));
                    }
                }
            }
        }
        Catalogue { parts }
    }

    /// A catalogue of exactly these parts.
    pub fn of(parts: Vec<Part>) -> Catalogue {
        let mut c = Catalogue::default();
        c.extend(parts);
        c
    }

    /// Adds parts; an id already present is replaced.
    pub fn extend(&mut self, parts: impl IntoIterator<Item = Part>) {
        for p in parts {
            match self.parts.iter_mut().find(|q| q.id == p.id) {
                Some(q) => *q = p,
                None => self.parts.push(p),
            }
        }
    }

    /// The entry with this id.
    pub fn find(&self, id: &str) -> Option<&Part> {
        self.parts.iter().find(|p| p.id == id)
    }

    /// Every entry.
    pub fn parts(&self) -> &[Part] {
        &self.parts
    }

    /// Entries from lightest to heaviest (ties by breaking force, then id).
    pub fn by_weight(&self) -> Vec<&Part> {
        let mut v: Vec<&Part> = self.parts.iter().collect();
        v.sort_by(|a, b| {
            a.mass_per_length
                .total_cmp(&b.mass_per_length)
                .then(a.breaking_force.total_cmp(&b.breaking_force))
                .then(a.id.cmp(&b.id))
        });
        v
    }

    /// Parses a catalogue file (`(version: 1, parts: [...])`).
    pub fn from_ron(text: &str) -> Result<Catalogue, ProjectError> {
        let file: CatalogueFile = ron::from_str(text).map_err(|e| ProjectError::Syntax {
            line: e.span.start.line,
            column: e.span.start.col,
            message: e.code.to_string(),
            hint: "a catalogue file is `(version: 1, parts: [(id: \"..\", breaking_force: N, ea: N, mass_per_length: kg/m)])`".into(),
        })?;
        if file.version > CATALOGUE_VERSION || file.version == 0 {
            return Err(ProjectError::Invalid {
                problems: vec![crate::model::Problem::new(
                    "catalogue",
                    format!("version {} is not one this Rigwright reads", file.version),
                    format!("set `version: {CATALOGUE_VERSION}`"),
                )],
            });
        }
        let problems: Vec<_> = file
            .parts
            .iter()
            .filter_map(Part::problem)
            .map(|p| crate::model::Problem::new("catalogue", p, "correct the entry"))
            .collect();
        if !problems.is_empty() {
            return Err(ProjectError::Invalid { problems });
        }
        Ok(Catalogue::of(file.parts))
    }

    /// Reads a catalogue file.
    pub fn load(path: &Path) -> Result<Catalogue, ProjectError> {
        let text = std::fs::read_to_string(path).map_err(|e| ProjectError::Io {
            path: path.display().to_string(),
            message: e.to_string(),
        })?;
        Self::from_ron(&text)
    }

    /// The catalogue as a file.
    pub fn to_ron(&self) -> String {
        let file = CatalogueFile {
            version: CATALOGUE_VERSION,
            parts: self.parts.clone(),
        };
        let config = ron::ser::PrettyConfig::new().depth_limit(2).indentor("    ".to_string());
        let mut text = ron::ser::to_string_pretty(&file, config).expect("a catalogue always serialises");
        text.push('\n');
        text
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn builtin_ids_are_unique_and_a_file_round_trips() {
        let c = Catalogue::builtin();
        let mut ids: Vec<&str> = c.parts().iter().map(|p| p.id.as_str()).collect();
        ids.sort();
        ids.dedup();
        assert_eq!(ids.len(), c.parts().len());
        let part = c.find("6x19-IWRC-10-1770").expect("in the catalogue");
        // EN 12385-4 method, K = 0.356 (Feyrer Table 1.9): 10² · 1770 · 0.356 / 1000 kN.
        assert!((part.breaking_force - 63_012.0).abs() < 1e-6);
        let back = Catalogue::from_ron(&c.to_ron()).unwrap();
        assert_eq!(back, c);
    }

    #[test]
    fn a_bad_entry_is_named() {
        let text = "(version: 1, parts: [(id: \"rod-8\", breaking_force: -1.0, ea: 1e6, mass_per_length: 0.4)])";
        let e = Catalogue::from_ron(text).unwrap_err().to_string();
        assert!(e.contains("rod-8") && e.contains("breaking force"), "{e}");
    }
}
