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
}

impl ReadoutTab {
    pub const ALL: [ReadoutTab; 8] = [
        ReadoutTab::Members,
        ReadoutTab::Nodes,
        ReadoutTab::Stiffness,
        ReadoutTab::Pull,
        ReadoutTab::Modes,
        ReadoutTab::Pluck,
        ReadoutTab::Checks,
        ReadoutTab::Sweep,
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
        }
    }
}
