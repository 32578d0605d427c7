//! Rigwright: sketch, solve and size tensioned cable-and-spring rigs.
//!
//! The crate holds the desktop app ([`gui`]), the command-line entry ([`cli`]) and the
//! printable summary with its exports ([`sheet`]); the mechanics live in `rigwright-core`.

pub mod cli;
pub mod gui;
pub mod sheet;

pub use gui::RigApp;
