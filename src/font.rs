//! The two typefaces shipped in `fonts/` (DejaVu Sans, Bitstream Vera licence):
//! glyph lookup and advance widths, shared by layout (to measure) and the PDF
//! renderer (to embed).

use std::sync::OnceLock;

/// Font weight: the two faces shipped in `fonts/`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Weight {
    /// DejaVu Sans.
    Regular,
    /// DejaVu Sans Bold.
    Bold,
}

/// Millimetres per PDF point (ISO 32000-1: 1 pt = 1/72 in; 1 in = 25.4 mm).
/// Text sizes are given in points; this is the one factor that turns them into
/// the millimetres everything else uses.
pub const MM_PER_PT: f64 = 25.4 / 72.0;

static REGULAR: &[u8] = include_bytes!("../fonts/DejaVuSans.ttf");
static BOLD: &[u8] = include_bytes!("../fonts/DejaVuSans-Bold.ttf");

/// The raw TrueType bytes of a face.
pub fn font_bytes(weight: Weight) -> &'static [u8] {
    match weight {
        Weight::Regular => REGULAR,
        Weight::Bold => BOLD,
    }
}

/// The PostScript-style family name the SVG renderer asks for.
pub const FAMILY: &str = "DejaVu Sans";

/// The value kept for `weight` in one of a pair of once-set cells (regular,
/// bold), made by `init` on first use.
fn per_weight<T>(weight: Weight, cells: [&'static OnceLock<T>; 2], init: impl FnOnce() -> T) -> &'static T {
    let cell = match weight {
        Weight::Regular => cells[0],
        Weight::Bold => cells[1],
    };
    cell.get_or_init(init)
}

/// The parsed face. The shipped files are known-good, so a parse failure is a
/// build defect and is reported by the `shipped_fonts_parse` test.
pub fn face(weight: Weight) -> &'static ttf_parser::Face<'static> {
    static R: OnceLock<ttf_parser::Face<'static>> = OnceLock::new();
    static B: OnceLock<ttf_parser::Face<'static>> = OnceLock::new();
    per_weight(weight, [&R, &B], || {
        #[expect(clippy::expect_used, reason = "the font is compiled in and checked by a test")]
        ttf_parser::Face::parse(font_bytes(weight), 0).expect("shipped font parses")
    })
}

/// Characters below this code point are looked up once and kept in a table
/// (Latin, Greek, Cyrillic, punctuation, arrows and maths operators).
const TABLE_CHARS: u32 = 0x2400;

/// Glyph ids for the characters below [`TABLE_CHARS`], by face (0 = missing).
fn table(weight: Weight) -> &'static [u16] {
    static R: OnceLock<Vec<u16>> = OnceLock::new();
    static B: OnceLock<Vec<u16>> = OnceLock::new();
    per_weight(weight, [&R, &B], || {
        (0..TABLE_CHARS)
            .map(|c| char::from_u32(c).and_then(|ch| face(weight).glyph_index(ch)).map_or(0, |g| g.0))
            .collect()
    })
    .as_slice()
}

/// Glyph id of `ch` in the face, `None` if the font cannot show it.
pub fn glyph_id(weight: Weight, ch: char) -> Option<u16> {
    let code = ch as u32;
    if code < TABLE_CHARS {
        let g = table(weight)[code as usize];
        return (g != 0).then_some(g);
    }
    face(weight).glyph_index(ch).map(|g| g.0)
}

/// Characters of `text` that either shipped face cannot show, in order of
/// first appearance (names and titles may be set in bold).
pub fn unsupported_chars(text: &str) -> Vec<char> {
    let mut out = Vec::new();
    for ch in text.chars() {
        let missing = glyph_id(Weight::Regular, ch).is_none() || glyph_id(Weight::Bold, ch).is_none();
        if missing && !out.contains(&ch) {
            out.push(ch);
        }
    }
    out
}

/// Advance widths in font units by glyph id, read from the face once.
fn advances(weight: Weight) -> &'static [u16] {
    static R: OnceLock<Vec<u16>> = OnceLock::new();
    static B: OnceLock<Vec<u16>> = OnceLock::new();
    per_weight(weight, [&R, &B], || {
        let face = face(weight);
        (0..face.number_of_glyphs())
            .map(|g| face.glyph_hor_advance(ttf_parser::GlyphId(g)).unwrap_or(0))
            .collect()
    })
    .as_slice()
}

/// Advance width of glyph `gid` in font units (0 for a glyph the face lacks).
pub fn advance_units(weight: Weight, gid: u16) -> u16 {
    advances(weight).get(usize::from(gid)).copied().unwrap_or(0)
}

/// Font units per em.
pub fn units_per_em(weight: Weight) -> u16 {
    face(weight).units_per_em()
}

/// Width of `text` set at `size_pt`, in millimetres (no kerning; characters the
/// font lacks count as the width of the missing-glyph box).
pub fn text_width_mm(text: &str, size_pt: f64, weight: Weight) -> f64 {
    units_to_mm(text_units(text, weight), size_pt, weight)
}

/// Width of `text` in font units: a sum of whole advances, exact in `f64`,
/// so widths of pieces add up to the width of the whole (line wrapping keeps
/// a running sum instead of measuring each trial line again).
pub fn text_units(text: &str, weight: Weight) -> f64 {
    let (advances, by_char) = (advances(weight), char_advances(weight));
    let width = |ch: char| match by_char.get(ch as usize) {
        Some(&units) => f64::from(units),
        None => f64::from(advances.get(usize::from(glyph_id(weight, ch).unwrap_or(0))).copied().unwrap_or(0)),
    };
    text.chars().map(width).sum()
}

/// A width in font units (see [`text_units`]) set at `size_pt`, in millimetres.
pub fn units_to_mm(units: f64, size_pt: f64, weight: Weight) -> f64 {
    units / f64::from(units_per_em(weight)) * size_pt * MM_PER_PT
}

/// Advance widths in font units of the characters below [`TABLE_CHARS`] (a
/// missing character has the missing-glyph box's width), for measuring text
/// with one look-up a character.
fn char_advances(weight: Weight) -> &'static [u16] {
    static R: OnceLock<Vec<u16>> = OnceLock::new();
    static B: OnceLock<Vec<u16>> = OnceLock::new();
    per_weight(weight, [&R, &B], || table(weight).iter().map(|&gid| advance_units(weight, gid)).collect())
        .as_slice()
}

/// The first character of `text` that prints as nothing or reorders what
/// follows: zero-width spaces and joiners, bidirectional marks, embeddings,
/// overrides and isolates, the word joiner and invisible operators, the byte
/// order mark, the soft hyphen and the interlinear annotation marks (Unicode
/// format characters, general category Cf, as listed in the Unicode Character
/// Database for these blocks). `a\u{200B}b` prints like `ab`, and a
/// right-to-left override turns the rest of a line round, so such text cannot
/// be told apart from other text on paper.
pub fn invisible_char(text: &str) -> Option<char> {
    text.chars().find(|&c| {
        matches!(c,
            '\u{00AD}' | '\u{061C}' | '\u{180E}' | '\u{200B}'..='\u{200F}' | '\u{202A}'..='\u{202E}'
            | '\u{2060}'..='\u{2064}' | '\u{2066}'..='\u{206F}' | '\u{FEFF}' | '\u{FFF9}'..='\u{FFFB}')
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shipped_fonts_parse() {
        for w in [Weight::Regular, Weight::Bold] {
            assert!(ttf_parser::Face::parse(font_bytes(w), 0).is_ok());
        }
    }

    #[test]
    fn greek_arrows_and_accents_are_covered() {
        assert!(unsupported_chars("θ μ → ± ° é ü ł Ω").is_empty());
        assert_eq!(unsupported_chars("a漢b"), vec!['漢']);
    }

    #[test]
    fn the_advance_table_agrees_with_the_face_for_every_glyph() {
        // The table is a copy of the face's hmtx advances (read by ttf-parser);
        // past the last glyph both say nothing, here 0.
        for w in [Weight::Regular, Weight::Bold] {
            let f = face(w);
            for g in 0..=f.number_of_glyphs() {
                let want = f.glyph_hor_advance(ttf_parser::GlyphId(g)).unwrap_or(0);
                assert_eq!(advance_units(w, g), want, "{w:?} glyph {g}");
            }
            // Text widths read the per-character table; every character of it,
            // and one past it, measures as its glyph's advance from the face.
            let upem = f64::from(f.units_per_em());
            for code in (0..=TABLE_CHARS).step_by(7) {
                let Some(ch) = char::from_u32(code) else { continue };
                let gid = f.glyph_index(ch).map_or(0, |g| g.0);
                let want = f64::from(f.glyph_hor_advance(ttf_parser::GlyphId(gid)).unwrap_or(0));
                let got = text_width_mm(&ch.to_string(), 72.0, w) / 25.4 * upem;
                assert!((got - want).abs() < 1e-9, "{w:?} U+{code:04X}: {got} vs {want}");
            }
        }
    }

    #[test]
    fn ten_point_em_is_about_3_5_mm() {
        // One em at 10 pt is 10/72 in = 3.5278 mm (ISO 32000-1 point).
        // DejaVu Sans "M" advance is 1767/2048 em: its hmtx table as read by
        // Python fontTools 4.x (`TTFont('DejaVuSans.ttf')['hmtx']['M']`).
        let w = text_width_mm("M", 10.0, Weight::Regular);
        assert!((w - 3.5278 * 1767.0 / 2048.0).abs() < 1e-3, "{w}");
    }
}
