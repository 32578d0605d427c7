//! Rigwright: sketch, solve and size tensioned cable-and-spring rigs.
//!
//! The crate holds the desktop app ([`gui`]) and the command-line entry ([`cli`]); the
//! mechanics live in `rigwright-core`, the Sheet and the exports in `rigwright-report`.

pub mod cli;
pub mod gui;

/// The Sheet and the exports (the `rigwright-report` crate), at the path this crate has
/// always offered them.
pub use rigwright_report as sheet;

pub use gui::RigApp;
