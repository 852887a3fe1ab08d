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
use crate::scene::{Dash, Item, OutlinePart, Page, Paint, Rect, Stroke, Weight};

pub mod pdf;
pub mod svg;

pub use pdf::{Deflater, PdfFonts, PdfPage, pdf_document, render_pdf};
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
    /// A number in the drawing is not finite (NaN or infinite) or lies beyond
    /// [`MAX_COORDINATE_MM`]: writing it would put `NaN` or `inf` into the
    /// file, which readers reject or draw wrongly. It comes from a defect or
    /// from input no check caught, so the renderer refuses.
    NotFinite {
        /// The page's name.
        page: String,
        /// Which item and field (`line end`, `text size`).
        what: &'static str,
        /// The value, as written (`NaN`, `inf`, `1e300`).
        value: String,
    },
}

/// The largest coordinate or size a renderer writes, mm (1000 km): far past any
/// sheet, well inside PDF's single-precision reals.
pub const MAX_COORDINATE_MM: f64 = 1e9;

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
            RenderError::NotFinite { page, what, value } => write!(
                f,
                "page {page}: the drawing has {value} as a {what}, which cannot be printed (a number beyond ±{MAX_COORDINATE_MM} mm or not a number); nothing was written. \
                 hint: check the kit's numbers; if they are ordinary, this is a raysheet bug worth reporting"
            ),
        }
    }
}

impl std::error::Error for RenderError {}

/// Checks every number a page would write: finite and within
/// ±[`MAX_COORDINATE_MM`]. The first one that is not is the error.
pub(crate) fn check_finite(page: &Page) -> Result<(), RenderError> {
    let mut bad: Option<(&'static str, f64)> = None;
    let mut num = |what: &'static str, v: f64| {
        if bad.is_none() && !(v.is_finite() && v.abs() <= MAX_COORDINATE_MM) {
            bad = Some((what, v));
        }
    };
    num("page width", page.width_mm);
    num("page height", page.height_mm);
    walk_items(&page.items, &mut num);
    match bad {
        None => Ok(()),
        Some((what, value)) => {
            Err(RenderError::NotFinite { page: page.name.clone(), what, value: value.to_string() })
        }
    }
}

fn walk_items(items: &[Item], num: &mut impl FnMut(&'static str, f64)) {
    let point = |what: &'static str, p: Point, num: &mut dyn FnMut(&'static str, f64)| {
        num(what, p.x);
        num(what, p.y);
    };
    let stroke = |s: &Stroke, num: &mut dyn FnMut(&'static str, f64)| {
        num("line width", s.width_mm);
        if let Paint::Grey(g) = s.paint {
            num("grey level", g);
        }
        match s.dash {
            Dash::Solid => {}
            Dash::Beads { dash_mm, bead_mm, gap_mm, beads: _ } => {
                [dash_mm, bead_mm, gap_mm].into_iter().for_each(|v| num("dash length", v))
            }
            Dash::Dashed { on_mm, off_mm } => [on_mm, off_mm].into_iter().for_each(|v| num("dash length", v)),
            Dash::DashDot { long_mm, short_mm, gap_mm } => {
                [long_mm, short_mm, gap_mm].into_iter().for_each(|v| num("dash length", v))
            }
        }
    };
    let rect = |r: &Rect, num: &mut dyn FnMut(&'static str, f64)| {
        [r.min.x, r.min.y, r.max.x, r.max.y].into_iter().for_each(|v| num("box corner", v))
    };
    for item in items {
        match item {
            Item::Line { from, to, stroke: s } => {
                point("line end", *from, num);
                point("line end", *to, num);
                stroke(s, num);
            }
            Item::Polyline { points, closed: _, stroke: s } => {
                points.iter().for_each(|p| point("polyline point", *p, num));
                stroke(s, num);
            }
            Item::Arc { center, radius_mm, start_rad, sweep_rad, stroke: s } => {
                point("arc centre", *center, num);
                num("arc radius", *radius_mm);
                num("arc angle", *start_rad);
                num("arc angle", *sweep_rad);
                stroke(s, num);
            }
            Item::Outline { parts, fill, stroke: s } => {
                for part in parts {
                    match part {
                        OutlinePart::MoveTo { to } | OutlinePart::LineTo { to } => {
                            point("outline point", *to, num)
                        }
                        OutlinePart::ArcTo { center, radius_mm, start_rad, sweep_rad } => {
                            point("outline arc centre", *center, num);
                            num("outline arc radius", *radius_mm);
                            num("outline arc angle", *start_rad);
                            num("outline arc angle", *sweep_rad);
                        }
                    }
                }
                if let Some(g) = fill {
                    num("grey level", *g);
                }
                stroke(s, num);
            }
            Item::Marker { at, shape: _, size_mm, stroke: s } => {
                point("marker position", *at, num);
                num("marker size", *size_mm);
                stroke(s, num);
            }
            Item::Arrowhead { tip, dir, length_mm, width_mm, gray } => {
                point("arrowhead tip", *tip, num);
                num("arrowhead direction", dir.x);
                num("arrowhead direction", dir.y);
                num("arrowhead size", *length_mm);
                num("arrowhead size", *width_mm);
                num("grey level", *gray);
            }
            Item::Text { at, text: _, size_pt, weight: _, anchor: _, rotate_deg, gray } => {
                point("text position", *at, num);
                num("text size", *size_pt);
                num("text angle", *rotate_deg);
                num("grey level", *gray);
            }
            Item::Box { rect: r, fill, stroke: s } => {
                rect(r, num);
                if let Some(g) = fill {
                    num("grey level", *g);
                }
                if let Some(s) = s {
                    stroke(s, num);
                }
            }
            Item::Group { clip, offset, items } => {
                rect(clip, num);
                num("group offset", offset.x);
                num("group offset", offset.y);
                walk_items(items, num);
            }
            Item::Scale { sx, sy, about, items } => {
                num("scale", *sx);
                num("scale", *sy);
                num("scale centre", about.x);
                num("scale centre", about.y);
                walk_items(items, num);
            }
        }
    }
}

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
