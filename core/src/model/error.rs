//! Why a project cannot be read or used: the error of loading and validating a project, and
//! the problems validation lists (each naming the item and suggesting a fix).
//!
//! Below both the stored document (`project.rs`) and the validated model (`validated.rs`):
//! each reports through these types, and neither needs the other for it.

use std::fmt;

/// One thing wrong with a project, naming the item and suggesting a fix.
#[derive(Debug, Clone, PartialEq)]
pub struct Problem {
    /// The item at fault, e.g. "member `stay-3`".
    pub item: String,
    /// What is wrong.
    pub problem: String,
    /// How to fix it.
    pub hint: String,
}

impl Problem {
    pub fn new(item: impl Into<String>, problem: impl Into<String>, hint: impl Into<String>) -> Self {
        Problem {
            item: item.into(),
            problem: problem.into(),
            hint: hint.into(),
        }
    }
}

impl fmt::Display for Problem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}; {}", self.item, self.problem, self.hint)
    }
}

/// Why a project could not be read or used.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ProjectError {
    /// The file could not be read or written.
    #[error("{path}: {message}")]
    Io { path: String, message: String },
    /// The text is not a well-formed project document.
    #[error("line {line}, column {column}: {message}; {hint}")]
    Syntax {
        line: usize,
        column: usize,
        message: String,
        hint: String,
    },
    /// Written by a newer Rigwright.
    #[error("file format version {found} is newer than this Rigwright reads (up to {supported}); open it with a newer Rigwright")]
    TooNew { found: u32, supported: u32 },
    /// Well-formed, but describes a rig that cannot be analysed.
    #[error("{}", ProblemList(problems))]
    Invalid { problems: Vec<Problem> },
}

struct ProblemList<'a>(&'a [Problem]);

impl fmt::Display for ProblemList<'_> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, p) in self.0.iter().enumerate() {
            if i > 0 {
                writeln!(f)?;
            }
            write!(f, "{p}")?;
        }
        Ok(())
    }
}
