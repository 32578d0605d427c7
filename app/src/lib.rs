//! Rigwright: sketch, solve and size tensioned cable-and-spring rigs.
//!
//! The crate holds the command-line entry ([`cli`]); the mechanics live in `rigwright-core`.

pub mod cli;
