//! Design data as stored in the project file: design factors, the parts a member is made of,
//! spring designs and strut sections.
//!
//! All values SI (N, m, Pa) except wire and coil diameters of springs, which the trade gives in
//! millimetres.

use serde::{Deserialize, Serialize};

use super::catalogue::Part;
use super::material::SpringMaterial;
use crate::element::MemberClass;

fn is_default<T: Default + PartialEq>(v: &T) -> bool {
    *v == T::default()
}

/// Design factors per member class: capacity ÷ working load.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DesignFactors {
    /// On the minimum breaking force of cables. Default 5: wire-rope slings and general
    /// rigging (ASME B30.9, from memory; common practice). Rigging over people is often
    /// 8–10 (common practice, depends on jurisdiction).
    #[serde(default = "DesignFactors::cable_default")]
    pub cable: f64,
    /// On the allowable static shear stress of springs (Shigley Table 10-6). Default 1.2,
    /// the static factor of safety Shigley §10-8 recommends for solid-safe springs (from
    /// memory).
    #[serde(default = "DesignFactors::spring_default")]
    pub spring: f64,
    /// On the Euler buckling load and the given capacity of struts. Default 2 (common
    /// practice for machine-design struts; structural codes use their own curves).
    #[serde(default = "DesignFactors::strut_default")]
    pub strut: f64,
}

impl DesignFactors {
    fn cable_default() -> f64 {
        5.0
    }
    fn spring_default() -> f64 {
        1.2
    }
    fn strut_default() -> f64 {
        2.0
    }

    /// The factor for a member class.
    pub fn of(&self, class: MemberClass) -> f64 {
        match class {
            MemberClass::Cable => self.cable,
            MemberClass::Spring => self.spring,
            MemberClass::Strut => self.strut,
        }
    }

    /// Where each default comes from, for labels beside the values.
    pub fn source(class: MemberClass) -> &'static str {
        match class {
            MemberClass::Cable => "common practice: 5 for wire rope in general rigging (ASME B30.9); 8–10 over people",
            MemberClass::Spring => "Shigley §10-8: at least 1.2 on the allowable stress (from memory)",
            MemberClass::Strut => "common practice, on the Euler load",
        }
    }
}

impl Default for DesignFactors {
    fn default() -> Self {
        DesignFactors {
            cable: Self::cable_default(),
            spring: Self::spring_default(),
            strut: Self::strut_default(),
        }
    }
}

/// Project-wide sizing settings and the project's own parts.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SizingDoc {
    #[serde(default, skip_serializing_if = "is_default")]
    pub design_factors: DesignFactors,
    /// A utilisation above this (and at most 1) is reported as "near limit". Default 0.9.
    #[serde(default = "SizingDoc::near_default")]
    pub near_limit: f64,
    /// A cable whose tension falls to or below this in any case fails the slack check (N),
    /// unless the cable is marked `may_slacken`. Default 0.
    #[serde(default, skip_serializing_if = "is_default")]
    pub slack_threshold: f64,
    /// Termination efficiency used where a cable does not give its own. Default 0.8: wire
    /// rope grips (common practice, from memory; swaged or poured sockets reach 1.0,
    /// ferrule-secured eyes about 0.9).
    #[serde(default = "SizingDoc::efficiency_default")]
    pub termination_efficiency: f64,
    /// The project's own catalogue entries (a supplier's rated values, synthetic ropes, rods).
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub parts: Vec<Part>,
}

impl SizingDoc {
    fn near_default() -> f64 {
        0.9
    }
    fn efficiency_default() -> f64 {
        0.8
    }

    /// True when nothing differs from the defaults (then the file leaves it out).
    pub fn is_default(&self) -> bool {
        *self == SizingDoc::default()
    }
}

impl Default for SizingDoc {
    fn default() -> Self {
        SizingDoc {
            design_factors: DesignFactors::default(),
            near_limit: Self::near_default(),
            slack_threshold: 0.0,
            termination_efficiency: Self::efficiency_default(),
            parts: Vec::new(),
        }
    }
}

/// What a member is made of and how it is checked.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MemberDesign {
    /// Catalogue entry of a cable (its id).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub part: Option<String>,
    /// Minimum breaking force of a cable (N) when no catalogue entry is named.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub breaking_force: Option<f64>,
    /// Termination efficiency of a cable (0–1]; the project default when absent.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub termination_efficiency: Option<f64>,
    /// Design factor of this member; the class default when absent.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub design_factor: Option<f64>,
    /// A cable meant to go slack (a safety or check cable): the slack check is skipped.
    #[serde(default, skip_serializing_if = "is_default")]
    pub may_slacken: bool,
    /// Helical spring behind a spring member.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub spring: Option<SpringDesign>,
    /// Section of a strut.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub section: Option<StrutSection>,
}

impl MemberDesign {
    /// True when nothing is set.
    pub fn is_empty(&self) -> bool {
        *self == MemberDesign::default()
    }
}

/// End type of a helical compression spring (Shigley Table 10-1), or an extension spring.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub enum SpringEnds {
    Plain,
    PlainGround,
    Squared,
    SquaredGround,
    /// Extension spring with hook ends: carries tension only, coils closed at rest.
    Extension,
}

impl SpringEnds {
    /// Every end type, for choosers.
    pub const ALL: [SpringEnds; 5] = [
        SpringEnds::Plain,
        SpringEnds::PlainGround,
        SpringEnds::Squared,
        SpringEnds::SquaredGround,
        SpringEnds::Extension,
    ];

    /// Name as printed.
    pub fn name(self) -> &'static str {
        match self {
            SpringEnds::Plain => "plain",
            SpringEnds::PlainGround => "plain and ground",
            SpringEnds::Squared => "squared",
            SpringEnds::SquaredGround => "squared and ground",
            SpringEnds::Extension => "extension (hooks)",
        }
    }

    /// True for a compression spring.
    pub fn is_compression(self) -> bool {
        self != SpringEnds::Extension
    }

    /// Total coils Nt for Na active coils (Shigley Table 10-1; an extension spring's body
    /// coils Nb, taken equal to Na, eq. 10-39).
    pub fn total_coils(self, na: f64) -> f64 {
        match self {
            SpringEnds::Plain | SpringEnds::Extension => na,
            SpringEnds::PlainGround => na + 1.0,
            SpringEnds::Squared | SpringEnds::SquaredGround => na + 2.0,
        }
    }

    /// Solid length (mm) for wire d (mm) and Na active coils (Shigley Table 10-1); for an
    /// extension spring the closed body length Lb = d (Nb + 1) (eq. 10-39).
    pub fn solid_length_mm(self, d: f64, na: f64) -> f64 {
        match self {
            SpringEnds::Plain | SpringEnds::Squared | SpringEnds::Extension => d * (self.total_coils(na) + 1.0),
            SpringEnds::PlainGround | SpringEnds::SquaredGround => d * self.total_coils(na),
        }
    }
}

/// A helical spring: wire, coil and ends.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SpringDesign {
    pub material: SpringMaterial,
    /// Wire diameter d (mm).
    pub wire_mm: f64,
    /// Mean coil diameter D (mm).
    pub mean_mm: f64,
    /// Active coils Na.
    pub active_coils: f64,
    pub ends: SpringEnds,
    /// Free length L0 (mm); for an extension spring the length over the hooks.
    pub free_length_mm: f64,
    /// End-condition constant α of the buckling check (Shigley Table 10-2): 1 with both ends
    /// pivoted (the default: a member's ends are pins), 0.707 with one end on a flat
    /// surface, 0.5 with both ends on flat parallel surfaces.
    #[serde(default = "one", skip_serializing_if = "is_one")]
    pub buckling_alpha: f64,
    /// Initial tension of an extension spring (N): the force before the coils open.
    #[serde(default, skip_serializing_if = "is_default")]
    pub initial_tension: f64,
}

fn is_one(v: &f64) -> bool {
    *v == 1.0
}

/// Section of a strut for the buckling check.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StrutSection {
    /// Young's modulus E (Pa).
    pub modulus: f64,
    /// Second moment of area I about the weaker axis (m⁴).
    pub second_moment: f64,
    /// Effective-length factor K (1 for pinned ends).
    #[serde(default = "one")]
    pub length_factor: f64,
    /// Axial capacity in tension and squash (N), when known.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub capacity: Option<f64>,
}

fn one() -> f64 {
    1.0
}
