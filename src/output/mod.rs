//! What a run hands back, as values: the answer file (JSON), the class summary
//! (CSV), the `check`/`solve` text tables, and a whole build as a list of files.

pub mod answer_file;
pub mod answers;
pub mod build;
pub mod fit;
pub mod grade;
pub mod report;
pub mod results;
pub mod summary;

pub use build::{
    BuildError, Formats, MAX_PAGES, MAX_SHEET_PAGES, Output, build_class, build_class_on, build_class_with,
    build_plans, build_plans_with, default_threads, preflight,
};
