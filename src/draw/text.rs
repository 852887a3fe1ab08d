//! Text helpers: items, measured boxes and word wrapping with the shipped font.

use crate::font::{text_units, text_width_mm, units_to_mm};
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

/// The upright box round a text turned `rotate_deg` counterclockwise about
/// its anchor point `at` (page frame, y up): [`text_box`] when it is not
/// turned.
pub fn turned_text_box(
    at: Point,
    s: &str,
    size_pt: f64,
    weight: Weight,
    anchor: Anchor,
    rotate_deg: f64,
) -> Rect {
    let b = text_box(at, s, size_pt, weight, anchor);
    if rotate_deg == 0.0 {
        return b;
    }
    let (sin, cos) = rotate_deg.to_radians().sin_cos();
    let turned = [b.min, Point::new(b.max.x, b.min.y), b.max, Point::new(b.min.x, b.max.y)].map(|p| {
        let (x, y) = (p.x - at.x, p.y - at.y);
        Point::new(at.x + x * cos - y * sin, at.y + x * sin + y * cos)
    });
    let (mut min, mut max) = (turned[0], turned[0]);
    for p in &turned[1..] {
        min = Point::new(min.x.min(p.x), min.y.min(p.y));
        max = Point::new(max.x.max(p.x), max.y.max(p.y));
    }
    Rect { min, max }
}

/// Closing punctuation: a token of only these ends the word before it.
const CLOSING: &str = ".,;:!?)]}»›”’\"'…%";
/// Opening punctuation: a token of only these belongs to the word after it.
const OPENING: &str = "([{«‹„“‘¿¡";

/// The words of `s` with a token of closing punctuation only (`».`, `).`)
/// joined to the word before it and one of opening punctuation only (`«`)
/// to the word after it, by a space, so no line starts with closing or ends
/// with opening punctuation.
fn units(s: &str) -> Vec<String> {
    let only = |t: &str, set: &str| t.chars().all(|c| set.contains(c));
    let mut out: Vec<String> = Vec::new();
    let mut opening = String::new();
    for t in s.split_whitespace() {
        if only(t, CLOSING)
            && opening.is_empty()
            && let Some(last) = out.last_mut()
        {
            last.push(' ');
            last.push_str(t);
        } else if only(t, OPENING) {
            opening.push_str(t);
            opening.push(' ');
        } else {
            out.push(format!("{}{t}", std::mem::take(&mut opening)));
        }
    }
    if !opening.is_empty() {
        out.push(opening.trim_end().to_string());
    }
    out
}

/// Splits `s` into lines no wider than `width_mm` at `size_pt`, at spaces,
/// never leaving punctuation alone at the start of a line (see [`units`]).
/// Leading spaces (an indent in a template) are kept on every line.
pub fn wrap(s: &str, size_pt: f64, weight: Weight, width_mm: f64) -> Vec<String> {
    let indent: String = s.chars().take_while(|c| *c == ' ').collect();
    let (indent_units, space_units) = (text_units(&indent, weight), text_units(" ", weight));
    let mut lines = Vec::new();
    let mut line = indent.clone();
    // The line's width as a running sum of whole font units: the same number
    // as measuring the trial line itself, without measuring it again.
    let mut line_units = indent_units;
    let mut empty = true;
    for word in units(s) {
        let word_units = text_units(&word, weight);
        let trial_units = if empty { line_units + word_units } else { line_units + space_units + word_units };
        if !empty && units_to_mm(trial_units, size_pt, weight) > width_mm {
            lines.push(std::mem::replace(&mut line, format!("{indent}{word}")));
            line_units = indent_units + word_units;
        } else {
            if !empty {
                line.push(' ');
            }
            line.push_str(&word);
            line_units = trial_units;
        }
        empty = false;
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

    /// Issue 9: a translated line ending in a spaced closing mark (French
    /// "rayon »." or "(voir la figure )." with a space) wrapped that mark onto
    /// a line of its own.
    #[test]
    fn closing_punctuation_never_wraps_onto_its_own_line() {
        for s in ["Mesurez la déviation du rayon ».", "Tracez la normale (voir la figure )."] {
            let (head, tail) = s.rsplit_once(' ').expect("two words");
            // Room for everything but the final mark: it used to go to a line of its own.
            let w = text_width_mm(head, 8.0, Weight::Regular) + 0.2;
            assert!(text_width_mm(s, 8.0, Weight::Regular) > w);
            let lines = wrap(s, 8.0, Weight::Regular, w);
            for l in &lines {
                assert!(l.chars().any(char::is_alphanumeric), "a line of punctuation only: {lines:?}");
                assert!(text_width_mm(l, 8.0, Weight::Regular) <= w, "{l}");
            }
            assert!(lines.last().is_some_and(|l| l.ends_with(tail) && l.len() > tail.len()), "{lines:?}");
            assert_eq!(lines.join(" "), s);
        }
        assert_eq!(units("a « b » c ( d )."), ["a", "« b »", "c", "( d ).",]);
        assert_eq!(units("». a («"), ["».", "a", "(«"]);
    }
}
