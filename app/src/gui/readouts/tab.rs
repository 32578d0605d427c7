//! The tabs of the Readouts, with their labels and tips. A new tab is a variant here, a file
//! beside this one with its `ui`, and an arm in the `match` of `readouts::ui`.

/// The tabs of the Readouts area.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ReadoutTab {
    Members,
    Nodes,
    Stiffness,
    Pull,
    Modes,
    Pluck,
    Checks,
    Sweep,
    Path,
}

impl ReadoutTab {
    pub const ALL: [ReadoutTab; 9] = [
        ReadoutTab::Members,
        ReadoutTab::Nodes,
        ReadoutTab::Stiffness,
        ReadoutTab::Pull,
        ReadoutTab::Modes,
        ReadoutTab::Pluck,
        ReadoutTab::Checks,
        ReadoutTab::Sweep,
        ReadoutTab::Path,
    ];

    pub fn label(self) -> &'static str {
        match self {
            ReadoutTab::Members => "Members",
            ReadoutTab::Nodes => "Nodes",
            ReadoutTab::Stiffness => "Stiffness",
            ReadoutTab::Pull => "Pull curve",
            ReadoutTab::Modes => "Modes",
            ReadoutTab::Pluck => "Pluck",
            ReadoutTab::Checks => "Checks",
            ReadoutTab::Sweep => "Sweep",
            ReadoutTab::Path => "Load path",
        }
    }

    pub(super) fn tip(self) -> &'static str {
        match self {
            ReadoutTab::Members => "Force, length, strain and state of every member",
            ReadoutTab::Nodes => "Displacement of every node and reactions at supports",
            ReadoutTab::Stiffness => "Condensed tangent stiffness of the selected free node",
            ReadoutTab::Pull => "Restoring force and force–displacement curve of the last Pull",
            ReadoutTab::Modes => "Natural frequencies and mode shapes about the equilibrium; animate any mode",
            ReadoutTab::Pluck => "The free vibration after a pulled node is let go: time history, frequency, energy",
            ReadoutTab::Checks => "Every member checked in every load case: utilisation, status and the governing check; auto-size",
            ReadoutTab::Sweep => "Vary one parameter over a range and plot an output",
            ReadoutTab::Path => {
                "Load factor against a node's displacement through limit points; follow the rig past a limit point on request"
            }
        }
    }
}
