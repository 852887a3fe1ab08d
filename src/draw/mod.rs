//! Drawing helpers any sheet kind uses: text boxes and wrapping, label
//! placement with leader lines, piece outlines and protractor-like angle scales,
//! and a drawing in progress.
//!
//! Everything here works in one frame of millimetres with y up (the sheet
//! frame or the page) and hands back [`crate::scene::Item`]s; nothing here
//! knows a sheet kind, traces a ray or lays out a page.

pub mod axes;
pub mod colour;
mod fan;
pub mod labels;
mod outline;
pub mod style;
pub mod text;
pub mod words;

pub use fan::{AngleScale, AngleTicks, ScaleNumber, Tick, TickSize, angle_ticks};
pub use labels::{Placer, clip_segment, place_lines_near, place_near};
pub use outline::{path_points, shape_outline};
pub use text::{leading, text, text_box, turned_text_box, wrap};
pub use words::Words;

use crate::geom::Point;
use crate::scene::{Anchor, Item, Rect, Weight};

/// The items and label obstacles of a drawing, in the sheet frame.
#[derive(Default, Debug, Clone)]
pub struct Drawing {
    /// What is drawn.
    pub items: Vec<Item>,
    /// Where labels may not go.
    pub placer: Placer,
}

impl Drawing {
    /// Places the label `s` at the first of `candidates` (reference point and
    /// anchor) whose box is free and inside `bounds`, else at the least bad one.
    pub fn label(&mut self, bounds: &Rect, s: &str, size_pt: f64, candidates: &[(Point, Anchor)]) {
        if candidates.is_empty() {
            return;
        }
        let boxes: Vec<Rect> =
            candidates.iter().map(|(p, a)| text_box(*p, s, size_pt, Weight::Regular, *a)).collect();
        let k = self.placer.choose(&boxes, bounds);
        let (p, a) = candidates[k];
        self.items.push(text(p, s, size_pt, Weight::Regular, a));
    }
}
