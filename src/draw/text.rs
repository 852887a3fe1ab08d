//! Text helpers: items, measured boxes and word wrapping with the shipped font.

use crate::font::text_width_mm;
use crate::geom::Point;
use crate::scene::{Anchor, Item, MM_PER_PT, Rect, Weight};

/// A horizontal text item.
pub fn text(at: Point, s: &str, size_pt: f64, weight: Weight, anchor: Anchor) -> Item {
    Item::Text { at, text: s.to_string(), size_pt, weight, anchor, rotate_deg: 0.0, gray: 0.0 }
}

/// The box a horizontal line of text covers (ascent 0.76 em, descent 0.24 em
/// of DejaVu Sans, rounded).
pub fn text_box(at: Point, s: &str, size_pt: f64, weight: Weight, anchor: Anchor) -> Rect {
    let w = text_width_mm(s, size_pt, weight);
    let em = size_pt * MM_PER_PT;
    let x0 = match anchor {
        Anchor::Start => at.x,
        Anchor::Middle => at.x - w / 2.0,
        Anchor::End => at.x - w,
    };
    Rect { min: Point::new(x0, at.y - 0.24 * em), max: Point::new(x0 + w, at.y + 0.76 * em) }
}

/// Splits `s` into lines no wider than `width_mm` at `size_pt`, at spaces.
/// Leading spaces (an indent in a template) are kept on every line.
pub fn wrap(s: &str, size_pt: f64, weight: Weight, width_mm: f64) -> Vec<String> {
    let indent: String = s.chars().take_while(|c| *c == ' ').collect();
    let mut lines = Vec::new();
    let mut line = indent.clone();
    for word in s.split_whitespace() {
        let trial = if line.trim().is_empty() { format!("{line}{word}") } else { format!("{line} {word}") };
        if !line.trim().is_empty() && text_width_mm(&trial, size_pt, weight) > width_mm {
            lines.push(std::mem::replace(&mut line, format!("{indent}{word}")));
        } else {
            line = trial;
        }
    }
    if !line.trim().is_empty() {
        lines.push(line);
    }
    lines
}

/// Line spacing for a size, mm (1.25 × the em).
pub fn leading(size_pt: f64) -> f64 {
    size_pt * MM_PER_PT * 1.25
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn wrapped_lines_fit() {
        let s = "Safety: ray-box lamps get hot; acrylic edges can be sharp; follow your school's rules.";
        let lines = wrap(s, 8.0, Weight::Regular, 60.0);
        assert!(lines.len() >= 2);
        for l in &lines {
            assert!(text_width_mm(l, 8.0, Weight::Regular) <= 60.0, "{l}");
        }
        assert_eq!(lines.join(" "), s);
    }
}
