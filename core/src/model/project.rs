//! The project file as stored: a versioned RON document, `*.rig.ron`.
//!
//! Saving is deterministic (fixed formatting, shortest round-trip floats), so
//! save → load → save gives the same bytes.

use serde::{Deserialize, Serialize};
use std::path::Path;

use super::error::{Problem, ProjectError};
use super::title_block::SheetInfo;
use crate::sizing::{MemberDesign, SizingDoc};

/// Current version of the project file format. Version 2 added design data (`sizing`,
/// member `design`); version 1 files read unchanged.
pub const FORMAT_VERSION: u32 = 2;
/// File name ending of project files.
pub const FILE_EXTENSION: &str = ".rig.ron";

/// Display and input units. Files always store SI.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum UnitSystem {
    #[default]
    SI,
    US,
}

/// A rig project as stored on disk. All values SI: m, N, kg, m/s².
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Project {
    /// File format version; files newer than [`FORMAT_VERSION`] are refused.
    pub version: u32,
    /// Title shown in the window and on the sheet.
    #[serde(default)]
    pub title: String,
    /// Free text: purpose, assumptions, references.
    #[serde(default)]
    pub notes: String,
    /// Preferred display units (values in the file are SI regardless).
    #[serde(default)]
    pub units: UnitSystem,
    /// A planar rig lies in the x–y plane and keeps every z fixed.
    #[serde(default)]
    pub planar: bool,
    /// Gravitational acceleration (m/s²), default (0, −9.81, 0).
    #[serde(default = "default_gravity")]
    pub gravity: (f64, f64, f64),
    pub nodes: Vec<NodeDoc>,
    pub members: Vec<MemberDoc>,
    /// Load cases; an empty list means one case, "gravity", with gravity only.
    #[serde(default)]
    pub cases: Vec<CaseDoc>,
    /// Design factors, limits and the project's own catalogue entries.
    #[serde(default, skip_serializing_if = "SizingDoc::is_default")]
    pub sizing: SizingDoc,
    /// Title-block fields of the Sheet (project, client, prepared by, …).
    #[serde(default, skip_serializing_if = "SheetInfo::is_empty")]
    pub sheet: SheetInfo,
}

fn default_gravity() -> (f64, f64, f64) {
    (0.0, -9.81, 0.0)
}

fn is_zero(v: &f64) -> bool {
    *v == 0.0
}

fn is_free(s: &[bool; 3]) -> bool {
    *s == [false; 3]
}

/// A node: a point where members meet, with optional lumped mass and support.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NodeDoc {
    pub id: String,
    /// Position as drawn (m).
    pub at: (f64, f64, f64),
    /// Lumped mass (kg).
    #[serde(default, skip_serializing_if = "is_zero")]
    pub mass: f64,
    /// Which of x, y, z are held: `(true, true, true)` is an anchor, none is a free node,
    /// any other combination is a guided support.
    #[serde(default, skip_serializing_if = "is_free")]
    pub fixed: [bool; 3],
}

/// How a member's unstressed (cable, strut) or free (spring) length is given.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum Rest {
    /// Stress-free in the geometry as drawn.
    AsDrawn,
    /// Unstressed length of a cable or strut, free length of a spring (m).
    Length(f64),
    /// Force in the geometry as drawn (N, tension positive): a cable's pretension,
    /// a spring's preload (negative for a compression preload). For a cable that sags under
    /// its own weight, the largest tension, at its upper end, under the project's gravity.
    Tension(f64),
    /// A cable's pretension given as its horizontal component in the geometry as drawn (N):
    /// for a sagging cable the same all along the span.
    Horizontal(f64),
}

/// Member law as stored.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub enum MemberDocKind {
    /// Tension-only member; `ea` axial stiffness (N).
    Cable { ea: f64, rest: Rest },
    /// Linear spring; `rate` (N/m).
    Spring { rate: f64, rest: Rest },
    /// Bar in tension and compression; `ea` (N).
    Strut { ea: f64, rest: Rest },
}

/// A member between two nodes.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MemberDoc {
    pub id: String,
    /// Ids of the end nodes.
    pub ends: (String, String),
    pub kind: MemberDocKind,
    /// Mass per unstressed length (kg/m), lumped half to each end; 0 to ignore self-weight.
    #[serde(default, skip_serializing_if = "is_zero")]
    pub mass_per_length: f64,
    /// What the member is made of, for the checks.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub design: Option<MemberDesign>,
}

/// A point load on a node (N).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LoadDoc {
    pub node: String,
    pub force: (f64, f64, f64),
}

/// A named load case: a multiple of gravity plus point loads.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CaseDoc {
    pub name: String,
    /// Multiplier on gravity (1 = self-weight and masses, 0 = none).
    #[serde(default = "one")]
    pub gravity: f64,
    #[serde(default)]
    pub loads: Vec<LoadDoc>,
}

fn one() -> f64 {
    1.0
}

impl Project {
    /// An empty planar project.
    pub fn new(title: &str) -> Self {
        Project {
            version: FORMAT_VERSION,
            title: title.to_string(),
            notes: String::new(),
            units: UnitSystem::SI,
            planar: true,
            gravity: default_gravity(),
            nodes: Vec::new(),
            members: Vec::new(),
            cases: Vec::new(),
            sizing: SizingDoc::default(),
            sheet: SheetInfo::default(),
        }
    }

    /// Parses a project document. Syntax errors carry line and column.
    pub fn from_ron(text: &str) -> Result<Self, ProjectError> {
        if text.trim().is_empty() {
            return Err(ProjectError::Syntax {
                line: 1,
                column: 1,
                message: "the file is empty".into(),
                hint: "it may have been cut short while saving; open the backup or a sample project".into(),
            });
        }
        // Check the version first, so a newer file gets the right message even when its
        // fields are unknown to this version.
        #[derive(Deserialize)]
        struct VersionOnly {
            #[serde(default)]
            version: u32,
        }
        if let Ok(VersionOnly { version: v }) = ron::from_str::<VersionOnly>(text)
            && v > FORMAT_VERSION
        {
            return Err(ProjectError::TooNew {
                found: v,
                supported: FORMAT_VERSION,
            });
        }
        let mut project: Project = ron::from_str(text).map_err(|e| {
            // An error on the last line of a file that stops inside the document means the
            // file was cut short.
            let last_line = text.trim_end().lines().count();
            let cut_short = e.span.start.line >= last_line && !text.trim_end().ends_with(')');
            ProjectError::Syntax {
                line: e.span.start.line,
                column: e.span.start.col,
                message: e.code.to_string(),
                hint: if cut_short {
                    syntax_hint(&ron::Error::Eof)
                } else {
                    syntax_hint(&e.code)
                },
            }
        })?;
        if project.version == 0 {
            return Err(ProjectError::Invalid {
                problems: vec![Problem::new(
                    "project",
                    "version 0 is not a released format",
                    format!("set `version: {FORMAT_VERSION}`"),
                )],
            });
        }
        // Older versions are subsets of this one: read as is, saved as the current version.
        project.version = FORMAT_VERSION;
        Ok(project)
    }

    /// The document as RON text, formatted the same way every time.
    pub fn to_ron(&self) -> String {
        let config = ron::ser::PrettyConfig::new()
            .depth_limit(2)
            .indentor("    ".to_string())
            .struct_names(false)
            .separate_tuple_members(false);
        let mut text = ron::ser::to_string_pretty(self, config).expect("a project always serialises");
        text.push('\n');
        text
    }

    /// Reads and parses a file.
    pub fn load(path: &Path) -> Result<Self, ProjectError> {
        let bytes = std::fs::read(path).map_err(|e| ProjectError::Io {
            path: path.display().to_string(),
            message: e.to_string(),
        })?;
        let text = String::from_utf8(bytes).map_err(|e| ProjectError::Syntax {
            line: 1,
            column: 1,
            message: format!("not UTF-8 text (byte {})", e.utf8_error().valid_up_to()),
            hint: "a project file is plain text; check that this is a .rig.ron file".to_string(),
        })?;
        Self::from_ron(&text)
    }

    /// Names of the load cases (the implicit "gravity" case when none are given).
    pub fn case_names(&self) -> Vec<String> {
        if self.cases.is_empty() {
            vec!["gravity".to_string()]
        } else {
            self.cases.iter().map(|c| c.name.clone()).collect()
        }
    }
}

fn syntax_hint(code: &ron::Error) -> String {
    use ron::Error as E;
    match code {
        E::Eof => "the file ends early; it may be truncated (open the backup, or restore it from version control)".into(),
        E::MissingStructField { field, .. } => format!("add the field `{field}`"),
        E::NoSuchStructField { expected, .. } => format!("check the spelling; fields allowed here: {}", expected.join(", ")),
        E::NoSuchEnumVariant { expected, .. } => format!("use one of: {}", expected.join(", ")),
        E::DuplicateStructField { field, .. } => format!("remove the second `{field}`"),
        _ => "compare with a sample project in sample-projects/".into(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_newer_file_is_refused_by_version_before_its_unknown_fields() {
        let text = "// a comment\n(\n    version: 7,\n    title: \"x\",\n    future_field: 3,\n    nodes: [(id: \"a\", at: (0.0, 0.0, 0.0))],\n)\n";
        match Project::from_ron(text) {
            Err(ProjectError::TooNew {
                found: 7,
                supported: FORMAT_VERSION,
            }) => {}
            other => panic!("{other:?}"),
        }
    }
}
