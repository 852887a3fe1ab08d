//! Fitting template text into the room the layout gives it: the sizes the
//! layout draws at, measured with the shipped font, and the located error a
//! build gives when an edited template cannot fit even at the smallest size.

use crate::draw::{leading, wrap};
use crate::font::text_width_mm;
use crate::scene::Weight;

/// The smallest size any template text is set at, pt.
pub const FLOOR_PT: f64 = 6.5;
/// Heading sizes, largest first: a heading is never set below 8 pt (A5 with a long group name needs 8).
pub const HEADING_PT: [f64; 6] = [13.0, 12.0, 11.0, 10.0, 9.0, 8.0];
/// Instruction sizes, largest first.
pub const BODY_PT: [f64; 4] = [8.0, 7.5, 7.0, FLOOR_PT];
/// Sizes of the safety caution and the scale-bar labels.
pub const SMALL_PT: [f64; 2] = [7.0, FLOOR_PT];
/// The lowest a measurement table row may be, mm.
pub const MIN_ROW_MM: f64 = 3.6;
/// Lines the safety caution's band holds.
pub const CAUTION_LINES: usize = 2;

/// Template text that does not fit: which field, and why, with what would fit.
#[derive(Clone, Debug, PartialEq)]
pub struct Misfit {
    /// The template file name (`focal.toml`, `common.toml`).
    pub file: String,
    /// The field (`heading`, `instructions[3]`, `columns[2]`, `safety`).
    pub field: String,
    /// Why, with the room there is and what would fit.
    pub why: String,
}

/// A template field that cannot fit, located: `FILE:LINE:COL: field `F`: why`.
#[derive(Clone, Debug, PartialEq)]
pub struct TextFitError(pub String);

impl std::fmt::Display for TextFitError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

impl std::error::Error for TextFitError {}

/// Text wrapped into lines at one size.
#[derive(Clone, Debug, PartialEq)]
pub struct Block {
    /// The lines, each no wider than the room.
    pub lines: Vec<String>,
    /// Their size, pt.
    pub size_pt: f64,
}

/// How many characters of `s` would fit in `room_mm` at this size, roughly
/// (its average character width), for hints.
pub fn chars_that_fit(s: &str, size_pt: f64, weight: Weight, room_mm: f64) -> usize {
    let n = s.chars().count().max(1);
    let w = text_width_mm(s, size_pt, weight).max(1e-9);
    ((room_mm.max(0.0) / w) * n as f64).floor().min(n as f64) as usize
}

/// `s` cut to `n` characters with an ellipsis, for quoting in a message.
pub fn quote(s: &str, n: usize) -> String {
    if s.chars().count() <= n {
        s.to_string()
    } else {
        format!("{}…", s.chars().take(n).collect::<String>())
    }
}

/// The largest of `sizes` at which one line of `s` fits in `room_mm`, or why not:
/// its width at the smallest size and about how many characters would fit.
pub fn one_line(s: &str, sizes: &[f64], weight: Weight, room_mm: f64) -> Result<f64, String> {
    if let Some(&pt) = sizes.iter().find(|&&pt| text_width_mm(s, pt, weight) <= room_mm) {
        return Ok(pt);
    }
    let floor = sizes.last().copied().unwrap_or(FLOOR_PT);
    Err(format!(
        "\"{}\" ({} characters) is {:.0} mm wide at {floor} pt, the smallest size it is set at, and {:.0} mm is free there; shorten it to about {} characters",
        quote(s, 40),
        s.chars().count(),
        text_width_mm(s, floor, weight),
        room_mm.max(0.0),
        chars_that_fit(s, floor, weight, room_mm)
    ))
}

/// A word of `s` too wide for a line of `width_mm` even at `size_pt`, with a
/// message saying so.
fn long_word(s: &str, size_pt: f64, width_mm: f64) -> Option<String> {
    let word = s.split_whitespace().find(|w| text_width_mm(w, size_pt, Weight::Regular) > width_mm)?;
    Some(format!(
        "the word \"{}\" ({} characters) is {:.0} mm wide at {size_pt} pt, wider than the {:.0} mm line it must fit on; break it up with spaces",
        quote(word, 24),
        word.chars().count(),
        text_width_mm(word, size_pt, Weight::Regular),
        width_mm
    ))
}

/// Wraps `texts` (one entry a paragraph) at the largest of [`BODY_PT`] where
/// every line fits `width_mm` and a table at least `table_mm` high still fits
/// under them in a block `height_mm` high (the first line's baseline 3 mm
/// down, 1 mm kept under the table). On failure: the index of the entry that
/// runs out of room (or has a word too wide), and why.
pub fn paragraphs(
    texts: &[String],
    width_mm: f64,
    height_mm: f64,
    table_mm: f64,
) -> Result<Block, (usize, String)> {
    let room_for = |pt: f64| ((height_mm - 4.0 - table_mm) / leading(pt)).floor().max(0.0) as usize;
    for &pt in &BODY_PT {
        if texts.iter().any(|t| long_word(t, pt, width_mm).is_some()) {
            continue;
        }
        let lines: Vec<String> = texts.iter().flat_map(|t| wrap(t, pt, Weight::Regular, width_mm)).collect();
        if lines.len() <= room_for(pt) {
            return Ok(Block { lines, size_pt: pt });
        }
    }
    if let Some((i, why)) =
        texts.iter().enumerate().find_map(|(i, t)| Some((i, long_word(t, FLOOR_PT, width_mm)?)))
    {
        return Err((i, why));
    }
    // The entry where the lines at the smallest size run past the room.
    let room = room_for(FLOOR_PT);
    let mut used = 0;
    let mut total = 0;
    let mut over = None;
    for (i, t) in texts.iter().enumerate() {
        used += wrap(t, FLOOR_PT, Weight::Regular, width_mm).len();
        total = used;
        if used > room && over.is_none() {
            over = Some(i);
        }
    }
    let i = over.unwrap_or(texts.len().saturating_sub(1));
    Err((
        i,
        format!(
            "the instructions wrap to {total} lines at {FLOOR_PT} pt, the smallest size, on a {width_mm:.0} mm line; the text block holds {room} above the measurement table, and this entry is where they run out; shorten the instructions"
        ),
    ))
}

/// Lines a column heading may wrap to.
pub const HEAD_LINES: usize = 2;

/// Height of a heading row of [`HEAD_LINES`] lines at [`FLOOR_PT`], mm.
pub fn two_line_row_mm() -> f64 {
    HEAD_LINES as f64 * leading(FLOOR_PT) + 1.0
}

/// The table's column headings: each on one line at `preferred` pt when all
/// fit so; else all at [`FLOOR_PT`], on one line each when all fit so, else
/// wrapped to at most [`HEAD_LINES`] lines (the heading row grows, see
/// [`two_line_row_mm`]). On failure: the column that cannot fit, and why.
pub fn column_heads(cols: &[String], widths_mm: &[f64], preferred: f64) -> Result<Block2, (usize, String)> {
    let fits = |pt: f64| cols.iter().zip(widths_mm).all(|(c, w)| text_width_mm(c, pt, Weight::Bold) <= *w);
    for pt in [preferred, FLOOR_PT] {
        if fits(pt) {
            return Ok(Block2 { lines: cols.iter().map(|c| vec![c.clone()]).collect(), size_pt: pt });
        }
    }
    let mut lines = Vec::new();
    for (j, (c, &w)) in cols.iter().zip(widths_mm).enumerate() {
        let wrapped = wrap(c, FLOOR_PT, Weight::Bold, w);
        let too_wide = wrapped.iter().any(|l| text_width_mm(l, FLOOR_PT, Weight::Bold) > w);
        if too_wide || wrapped.len() > HEAD_LINES {
            return Err((
                j,
                format!(
                    "in the measurement table, \"{}\" ({} characters) needs {} lines of its {w:.0} mm column at {FLOOR_PT} pt, the smallest size, and a heading has {HEAD_LINES}; shorten it to about {} characters",
                    quote(c, 40),
                    c.chars().count(),
                    if too_wide { "more than the".to_string() } else { wrapped.len().to_string() },
                    chars_that_fit(c, FLOOR_PT, Weight::Bold, HEAD_LINES as f64 * w * 0.85)
                ),
            ));
        }
        lines.push(wrapped);
    }
    Ok(Block2 { lines, size_pt: FLOOR_PT })
}

/// Column headings, each as its lines, at one size.
#[derive(Clone, Debug, PartialEq)]
pub struct Block2 {
    /// One entry a column: its lines, top first.
    pub lines: Vec<Vec<String>>,
    /// Their size, pt.
    pub size_pt: f64,
}

impl Block2 {
    /// Whether any heading takes more than one line.
    pub fn wrapped(&self) -> bool {
        self.lines.iter().any(|l| l.len() > 1)
    }
}

/// The safety caution wrapped at the largest of [`SMALL_PT`] that keeps it to
/// [`CAUTION_LINES`] lines of `width_mm`, or why not.
pub fn caution(s: &str, width_mm: f64) -> Result<Block, String> {
    for &pt in &SMALL_PT {
        let lines = wrap(s, pt, Weight::Regular, width_mm);
        if lines.len() <= CAUTION_LINES
            && lines.iter().all(|l| text_width_mm(l, pt, Weight::Regular) <= width_mm)
        {
            return Ok(Block { lines, size_pt: pt });
        }
    }
    if let Some(why) = long_word(s, FLOOR_PT, width_mm) {
        return Err(why);
    }
    let n = wrap(s, FLOOR_PT, Weight::Regular, width_mm).len();
    Err(format!(
        "\"{}\" ({} characters) wraps to {n} lines at {FLOOR_PT} pt, the smallest size, and the caution band at the foot of the page holds {CAUTION_LINES} lines of {width_mm:.0} mm; shorten it to about {} characters",
        quote(s, 40),
        s.chars().count(),
        chars_that_fit(s, FLOOR_PT, Weight::Regular, CAUTION_LINES as f64 * width_mm * 0.9)
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn one_line_shrinks_then_refuses_with_what_fits() {
        let s = "Check before use: this bar must measure 100 mm";
        let w7 = text_width_mm(s, 7.0, Weight::Bold);
        assert_eq!(one_line(s, &SMALL_PT, Weight::Bold, w7 + 0.01), Ok(7.0));
        assert_eq!(one_line(s, &SMALL_PT, Weight::Bold, w7 - 0.01), Ok(6.5));
        let e = one_line(s, &SMALL_PT, Weight::Bold, 20.0).unwrap_err();
        let n = chars_that_fit(s, 6.5, Weight::Bold, 20.0);
        assert!(e.contains(&format!("about {n} characters")) && n > 5 && n < 25, "{e}");
    }

    #[test]
    fn paragraphs_shrink_before_refusing_and_name_the_entry() {
        let short = vec!["1. Mark the rays.".to_string(); 3];
        assert_eq!(paragraphs(&short, 100.0, 58.0, 18.0).unwrap().size_pt, 8.0);
        // 58 − 4 − 18 = 36 mm: 10 lines at 8 pt (3.53 mm), 12 at 6.5 pt (2.87 mm).
        let twelve = vec!["1. Mark the rays.".to_string(); 12];
        let b = paragraphs(&twelve, 100.0, 58.0, 18.0).unwrap();
        assert!(b.size_pt < 8.0 && b.lines.len() == 12, "{b:?}");
        let (i, why) = paragraphs(&vec!["1. Mark the rays.".to_string(); 14], 100.0, 58.0, 18.0).unwrap_err();
        assert_eq!(i, 12, "{why}");
        let word = "x".repeat(200);
        let (i, why) = paragraphs(&["ok".to_string(), word], 100.0, 58.0, 18.0).unwrap_err();
        assert!(i == 1 && why.contains("200 characters"), "{why}");
    }

    #[test]
    fn column_heads_shrink_then_wrap_to_two_lines_then_refuse() {
        let cols: Vec<String> =
            ["Ray", "Height (mm)", "Seems to come from, mm before the exit face", "Check"]
                .map(String::from)
                .to_vec();
        let wide = [20.0, 30.0, 80.0, 20.0];
        assert_eq!(column_heads(&cols, &wide, 7.5).unwrap().size_pt, 7.5);
        let narrow = [20.0, 30.0, 40.0, 20.0];
        let b = column_heads(&cols, &narrow, 7.5).unwrap();
        assert!(b.wrapped() && b.size_pt == FLOOR_PT && b.lines[2].len() == 2, "{b:?}");
        let (j, why) = column_heads(&cols, &[20.0, 30.0, 15.0, 20.0], 7.5).unwrap_err();
        assert!(j == 2 && why.contains("shorten it"), "{why}");
    }
}
