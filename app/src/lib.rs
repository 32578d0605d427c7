//! Rigwright: sketch, solve and size tensioned cable-and-spring rigs.
//!
//! The crate holds the desktop app ([`gui`]) and the command-line entry ([`cli`]); the
//! mechanics live in `rigwright-core`.

pub mod cli;
pub mod gui;

pub use gui::RigApp;
