//! Drawing helpers any sheet kind uses: text boxes and wrapping, and label
//! placement.
//!
//! Everything here works in one frame of millimetres with y up (the sheet
//! frame or the page) and hands back [`crate::scene::Item`]s; nothing here
//! knows a sheet kind, traces a ray or lays out a page.

pub mod labels;
pub mod text;

pub use labels::Placer;
pub use text::{leading, text, text_box, wrap};
