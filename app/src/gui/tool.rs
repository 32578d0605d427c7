//! The tools of the toolbar: what a press on the Rig view does, with each tool's label,
//! shortcut key and tip.

use eframe::egui;

/// What a press on the Rig view does.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Tool {
    Select,
    Pull,
    Anchor,
    Guided,
    Node,
    Cable,
    Spring,
    Strut,
    Load,
}

impl Tool {
    pub const ALL: [Tool; 9] = [
        Tool::Select,
        Tool::Pull,
        Tool::Anchor,
        Tool::Guided,
        Tool::Node,
        Tool::Cable,
        Tool::Spring,
        Tool::Strut,
        Tool::Load,
    ];

    /// Button label.
    pub fn label(self) -> &'static str {
        match self {
            Tool::Select => "Select",
            Tool::Pull => "Pull",
            Tool::Anchor => "Anchor",
            Tool::Guided => "Guided support",
            Tool::Node => "Node",
            Tool::Cable => "Cable",
            Tool::Spring => "Spring",
            Tool::Strut => "Strut",
            Tool::Load => "Point load",
        }
    }

    /// Shortcut key.
    pub fn key(self) -> egui::Key {
        use egui::Key;
        match self {
            Tool::Select => Key::V,
            Tool::Pull => Key::P,
            Tool::Anchor => Key::A,
            Tool::Guided => Key::G,
            Tool::Node => Key::N,
            Tool::Cable => Key::C,
            Tool::Spring => Key::S,
            Tool::Strut => Key::T,
            Tool::Load => Key::L,
        }
    }

    /// Tooltip.
    pub fn tip(self) -> &'static str {
        match self {
            Tool::Select => {
                "Select a node, member or load; drag a node or anchor to move it (the rig re-solves as you drag); drag on empty space to box-select nodes. [V]"
            }
            Tool::Pull => {
                "Pull: grab a free node and hold it at the cursor; the rest re-equilibrates and the restoring force is shown. [P]"
            }
            Tool::Anchor => "Add an anchor: a node held in every direction. Click on the Rig view. [A]",
            Tool::Guided => "Add a guided support: held vertically (y), free to slide along x. Click on the Rig view. [G]",
            Tool::Node => "Add a free node with a 10 kg mass. Click on the Rig view. [N]",
            Tool::Cable => "Add a cable (tension only, goes slack): click its first node, then its second. [C]",
            Tool::Spring => "Add a linear spring (tension and compression): click its first node, then its second. [S]",
            Tool::Strut => "Add a strut (bar in tension and compression): click its first node, then its second. [T]",
            Tool::Load => "Add a point load to the current load case: click a node. [L]",
        }
    }

    /// True for the tools that add a member between two nodes.
    pub fn is_member(self) -> bool {
        matches!(self, Tool::Cable | Tool::Spring | Tool::Strut)
    }
}
