//! The application on top of the library: the command-line flags (`cli`), the
//! job they resolve into before any work (`job`), and running a job into text
//! to print and files to write (`run`). `main.rs` does the reading, printing
//! and writing around it.

pub mod cli;
pub mod job;
pub mod run;

pub use job::{Inputs, Job, Source, Wanted};
pub use run::{Outcome, SCHEMA_FILE, Writing, run, schema_text};

/// What went wrong, and which kind of exit it earns.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Failure {
    /// Bad input or usage (exit code 2).
    Input(String),
    /// Anything else: I/O while writing, an internal problem (exit code 1).
    Other(String),
}

impl std::fmt::Display for Failure {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Failure::Input(msg) | Failure::Other(msg) => f.write_str(msg),
        }
    }
}

impl std::error::Error for Failure {}
