//! Renderers: `&Scene` in, bytes out (SVG and PDF).
//!
//! Both renderers draw every item exactly where the scene puts it: they own the
//! unit conversion (mm → pt for PDF), the flip to a downward y axis (SVG) and,
//! for PDF, arcs as cubic Béziers at a stated tolerance. They never move, drop
//! or measure items. Both refuse text the shipped font cannot show, so the two
//! formats of one sheet always agree.
//!
//! Painting conventions shared by both formats:
//! - line caps are **butt**: a line ends exactly at its end point, so a 100 mm
//!   line measures 100 mm on paper, not 100 mm plus a line width;
//! - line joins are **round**: at any angle the ink of a corner stays within
//!   half a line width of the true vertex. A miter join would put a spike past
//!   the vertex at shallow angles (a ray grazing a face), which a student could
//!   take for part of the path when placing a pencil on it.

use std::fmt;

use crate::font;
use crate::geom::{Point, Vec2};
use crate::scene::Weight;

pub mod pdf;
pub mod svg;

pub use pdf::render_pdf;
pub use svg::render_svg_page;

/// Why a scene could not be rendered.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum RenderError {
    /// A text item holds a character the shipped font (DejaVu Sans) has no glyph
    /// for. Rendering it would print a box or a `?`, so the renderer refuses.
    UnsupportedChar {
        /// The character.
        ch: char,
        /// The whole text it appeared in.
        text: String,
    },
    /// Subsetting a shipped font for embedding failed (a defect in the font
    /// file or in the subsetter, never in the scene).
    FontSubset {
        /// Which face.
        weight: Weight,
        /// What the subsetter reported.
        reason: String,
    },
}

impl fmt::Display for RenderError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            RenderError::UnsupportedChar { ch, text } => write!(
                f,
                "the character '{ch}' (U+{code:04X}) in the text {text:?} cannot be shown: \
                 the shipped font {family} has no glyph for it; \
                 hint: replace it or spell it out",
                code = u32::from(*ch),
                family = font::FAMILY,
            ),
            RenderError::FontSubset { weight, reason } => write!(
                f,
                "could not subset the shipped font {family} ({weight:?}) for embedding: {reason}",
                family = font::FAMILY,
            ),
        }
    }
}

impl std::error::Error for RenderError {}

/// Checks that the `weight` face can show every character of `text`; the first
/// one it cannot show is the error.
pub(crate) fn check_text(text: &str, weight: Weight) -> Result<(), RenderError> {
    match text.chars().find(|&ch| font::glyph_id(weight, ch).is_none()) {
        Some(ch) => Err(RenderError::UnsupportedChar { ch, text: text.to_owned() }),
        None => Ok(()),
    }
}

/// The corners of an arrowhead: its tip, then the two ends of its base, which
/// lies `length_mm` behind the tip across `dir`. A zero `dir` has no direction:
/// the triangle collapses onto the tip and paints nothing.
pub(crate) fn arrowhead_corners(tip: Point, dir: Vec2, length_mm: f64, width_mm: f64) -> [Point; 3] {
    let along = dir.normalized().unwrap_or_default();
    let base = tip - along * length_mm;
    let half = along.perp() * (width_mm / 2.0);
    [tip, base + half, base - half]
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn arrowhead_pointing_right_has_its_base_behind_the_tip() {
        let [t, a, b] = arrowhead_corners(Point::new(10.0, 5.0), Vec2::new(2.0, 0.0), 3.0, 2.0);
        assert_eq!(t, Point::new(10.0, 5.0));
        assert_eq!(a, Point::new(7.0, 6.0));
        assert_eq!(b, Point::new(7.0, 4.0));
    }

    #[test]
    fn unsupported_char_message_names_char_code_text_and_font() {
        let err = check_text("a漢b", Weight::Regular).unwrap_err();
        assert_eq!(err, RenderError::UnsupportedChar { ch: '漢', text: "a漢b".into() });
        let msg = err.to_string();
        // U+6F22 is the code point of 漢 (Unicode Character Database, CJK Unified Ideographs).
        for part in ["'漢'", "U+6F22", "\"a漢b\"", "DejaVu Sans"] {
            assert!(msg.contains(part), "{msg}");
        }
    }

    #[test]
    fn greek_arrow_and_nordic_letters_pass_in_both_faces() {
        for w in [Weight::Regular, Weight::Bold] {
            assert_eq!(check_text("θ₁ → n = 1.49", w), Ok(()));
            assert_eq!(check_text("Ærø Ångström", w), Ok(()));
        }
    }
}
