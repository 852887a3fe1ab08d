//! Drawing helpers any sheet kind uses: text boxes and wrapping, label
//! placement with leader lines, piece outlines and protractor-like angle scales.
//!
//! Everything here works in one frame of millimetres with y up (the sheet
//! frame or the page) and hands back [`crate::scene::Item`]s; nothing here
//! knows a sheet kind, traces a ray or lays out a page.

pub mod axes;
mod fan;
pub mod labels;
mod outline;
pub mod style;
pub mod text;

pub use fan::{AngleScale, AngleTicks, ScaleNumber, Tick, TickSize, angle_ticks};
pub use labels::{Placer, place_lines_near, place_near};
pub use outline::{path_points, shape_outline};
pub use text::{leading, text, text_box, wrap};
