//! Settings kept between runs (units, the last project and recent files, what the Rig view
//! shows); everything else is runtime state. Saved by eframe under [`SETTINGS_KEY`].

use std::path::PathBuf;

use rigwright_report::units::Units;
use serde::{Deserialize, Serialize};

use super::samples;

/// Key of the persisted settings.
pub(super) const SETTINGS_KEY: &str = "rigwright-settings";

/// Settings kept between runs (everything else is runtime state).
#[derive(Debug, Clone, Serialize, Deserialize)]
#[serde(default)]
pub struct Settings {
    pub units: Units,
    /// The last project file open (reopened on start).
    pub last_file: Option<PathBuf>,
    /// Or the last sample open, when it was never saved.
    pub last_sample: Option<usize>,
    pub recent: Vec<PathBuf>,
    /// Snap new and dragged nodes to the grid.
    pub snap: bool,
    /// Force values written beside members and arrows.
    pub force_labels: bool,
    /// Reaction arrows at supports.
    pub reactions: bool,
    /// Faint drawn geometry under the solved shape.
    pub drawn_geometry: bool,
    /// Node ids written beside the nodes.
    pub node_ids: bool,
    /// The sag of each cable that sags under its own weight dimensioned on the Rig view.
    pub sag_dimensions: bool,
    /// Links each sagging cable is cut into for the modes (`None`: chosen from the frequency
    /// range).
    pub cable_links: Option<usize>,
}

impl Default for Settings {
    fn default() -> Self {
        Settings {
            units: Units::Si,
            last_file: None,
            last_sample: Some(samples::DEFAULT_SAMPLE),
            recent: Vec::new(),
            snap: true,
            force_labels: true,
            reactions: true,
            drawn_geometry: true,
            node_ids: false,
            sag_dimensions: false,
            cable_links: None,
        }
    }
}
