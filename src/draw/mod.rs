//! Drawing helpers any sheet kind uses: text items and wrapping, label
//! placement clear of lines and other labels, and a drawing in progress.

mod labels;
mod text;

pub use labels::Placer;
pub use text::{leading, text, text_box, wrap};

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
