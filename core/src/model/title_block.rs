//! The title-block fields of the Sheet, as stored in the project file.
//!
//! Plain text the engineer fills in; nothing here is computed. The command line can override
//! each field for one sheet.

use serde::{Deserialize, Serialize};

/// Who and what a sheet is for. Every field is optional free text (empty when not given).
#[derive(Debug, Clone, PartialEq, Eq, Default, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct SheetInfo {
    /// Project name or job number (the rig's title is printed beside it).
    #[serde(skip_serializing_if = "String::is_empty")]
    pub project: String,
    /// Site or building.
    #[serde(skip_serializing_if = "String::is_empty")]
    pub location: String,
    #[serde(skip_serializing_if = "String::is_empty")]
    pub client: String,
    #[serde(skip_serializing_if = "String::is_empty")]
    pub prepared_by: String,
    #[serde(skip_serializing_if = "String::is_empty")]
    pub checked_by: String,
    /// Date of the sheet as the engineer writes it; today's date when empty.
    #[serde(skip_serializing_if = "String::is_empty")]
    pub date: String,
    #[serde(skip_serializing_if = "String::is_empty")]
    pub revision: String,
    /// Nodes whose tangent stiffness the sheet lists (marked by the user).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub stiffness_at: Vec<String>,
}

impl SheetInfo {
    /// True when no field is filled in (then the project file leaves the block out).
    pub fn is_empty(&self) -> bool {
        *self == SheetInfo::default()
    }
}
