//! The shipped faces embedded as subset Type0 / CIDFontType2 fonts.
//!
//! Each face that some text uses is embedded once per document, shared by all
//! pages: subset to the glyphs the set of documents shows (the `subsetter`
//! crate; a class set's documents share one subset, made and compressed once),
//! with Identity-H encoding. The subset's glyph ids are used as CIDs, so the
//! CIDToGIDMap is `/Identity`. Widths come from the face's advances (`/W`), and
//! a `/ToUnicode` CMap maps every CID back to its character so that text can be
//! copied and searched.

use std::collections::BTreeMap;

use pdf_writer::types::{CidFontType, FontFlags, SystemInfo, UnicodeCmap};
use pdf_writer::{Filter, Finish, Name, Pdf, Rect, Str};
use subsetter::GlyphRemapper;

use crate::font;
use crate::scene::{Item, Scene, Weight};

use super::{Deflater, IdHash, Refs};
use crate::render::{RenderError, check_text};

/// `Adobe-Identity-0`: the character collection of an Identity-H CIDFont.
const IDENTITY: SystemInfo<'static> =
    SystemInfo { registry: Str(b"Adobe"), ordering: Str(b"Identity"), supplement: 0 };

/// The glyphs one face has to show in a document.
#[derive(Debug)]
struct FaceGlyphs {
    /// Original glyph id → the first character seen that uses it.
    chars: BTreeMap<u16, char>,
    /// Original glyph id → CID (the glyph id in the subset), in glyph id order.
    remapper: GlyphRemapper,
}

/// The faces a document uses and how its text is encoded in them.
#[derive(Debug)]
pub(super) struct Fonts {
    faces: BTreeMap<Weight, FaceGlyphs>,
}

impl Fonts {
    /// Walks every text of the scenes, refusing characters a face cannot show,
    /// and gathers the glyphs each face needs.
    pub(super) fn collect<'a>(scenes: impl IntoIterator<Item = &'a Scene>) -> Result<Fonts, RenderError> {
        let mut chars: BTreeMap<Weight, BTreeMap<u16, char>> = BTreeMap::new();
        for page in scenes.into_iter().flat_map(|s| &s.pages) {
            collect_items(&page.items, &mut chars)?;
        }
        let faces = chars
            .into_iter()
            .map(|(weight, chars)| {
                let gids: Vec<u16> = chars.keys().copied().collect();
                (weight, FaceGlyphs { chars, remapper: GlyphRemapper::new_from_glyphs_sorted(&gids) })
            })
            .collect();
        Ok(Fonts { faces })
    }

    /// The resource name of a face on every page that uses it.
    pub(super) fn resource_name(weight: Weight) -> Name<'static> {
        match weight {
            Weight::Regular => Name(b"F1"),
            Weight::Bold => Name(b"F2"),
        }
    }

    /// `text` as a string of two-byte CIDs (big-endian) for Identity-H.
    pub(super) fn encode(&self, weight: Weight, text: &str) -> Result<Vec<u8>, RenderError> {
        let mut out = Vec::with_capacity(text.len() * 2);
        for ch in text.chars() {
            let cid = self
                .faces
                .get(&weight)
                .zip(font::glyph_id(weight, ch))
                .and_then(|(face, gid)| face.remapper.get(gid))
                .ok_or_else(|| RenderError::UnsupportedChar { ch, text: text.to_owned() })?;
            out.extend_from_slice(&cid.to_be_bytes());
        }
        Ok(out)
    }

    /// Subsets every used face and compresses its font file and ToUnicode map,
    /// ready to be embedded in any number of documents.
    pub(super) fn prepare(&self, z: &mut Deflater) -> Result<Vec<(Weight, EmbeddedFace)>, RenderError> {
        self.faces.iter().map(|(&weight, glyphs)| Ok((weight, prepare_face(z, weight, glyphs)?))).collect()
    }
}

/// One face's subset and everything written about it, made once for a set of
/// documents.
#[derive(Debug)]
pub(super) struct EmbeddedFace {
    weight: Weight,
    /// `TAG+PostScriptName`.
    base: String,
    /// Advance of each CID, in 1/1000 em.
    widths: Vec<f32>,
    /// The subset, compressed.
    file: Vec<u8>,
    /// The subset's length before compression (`/Length1`).
    length1: i32,
    /// The ToUnicode CMap, compressed.
    cmap: Vec<u8>,
    /// A fingerprint of the subset, for the file identifier.
    pub(super) fingerprint: [u8; 16],
}

impl EmbeddedFace {
    /// About how many bytes the face adds to a document.
    pub(super) fn size(&self) -> usize {
        self.file.len() + self.cmap.len() + 8 * self.widths.len() + 1024
    }

    /// Writes the Type0 font, its CIDFont, descriptor, font file and ToUnicode
    /// CMap; returns the Type0 font.
    pub(super) fn embed(&self, pdf: &mut Pdf, refs: &mut Refs) -> pdf_writer::Ref {
        let (type0, cid_font, descriptor, file, cmap) =
            (refs.next(), refs.next(), refs.next(), refs.next(), refs.next());
        let weight = self.weight;
        let face = font::face(weight);
        let to_1000 = 1000.0 / f32::from(font::units_per_em(weight));
        let base = self.base.as_str();

        pdf.type0_font(type0)
            .base_font(Name(format!("{base}-Identity-H").as_bytes()))
            .encoding_predefined(Name(b"Identity-H"))
            .descendant_font(cid_font)
            .to_unicode(cmap);

        let mut cid = pdf.cid_font(cid_font);
        cid.subtype(CidFontType::Type2)
            .base_font(Name(base.as_bytes()))
            .system_info(IDENTITY)
            .font_descriptor(descriptor)
            .cid_to_gid_map_predefined(Name(b"Identity"));
        cid.widths().consecutive(0, self.widths.iter().copied());
        cid.finish();

        let bbox = face.global_bounding_box();
        let mut flags = FontFlags::SYMBOLIC;
        flags.set(FontFlags::FIXED_PITCH, face.is_monospaced());
        flags.set(FontFlags::ITALIC, face.is_italic());
        let ascent = f32::from(face.ascender());
        pdf.font_descriptor(descriptor)
            .name(Name(base.as_bytes()))
            .flags(flags)
            .bbox(Rect::new(
                f32::from(bbox.x_min) * to_1000,
                f32::from(bbox.y_min) * to_1000,
                f32::from(bbox.x_max) * to_1000,
                f32::from(bbox.y_max) * to_1000,
            ))
            .italic_angle(face.italic_angle())
            .ascent(ascent * to_1000)
            .descent(f32::from(face.descender()) * to_1000)
            .cap_height(face.capital_height().map_or(ascent, f32::from) * to_1000)
            .stem_v(stem_v_units(weight) * to_1000)
            .font_file2(file);

        pdf.stream(file, &self.file).filter(Filter::FlateDecode).pair(Name(b"Length1"), self.length1);
        pdf.stream(cmap, &self.cmap).filter(Filter::FlateDecode);
        type0
    }
}

/// Gathers the glyphs of every text in `items` (and in groups, recursively).
fn collect_items(
    items: &[Item],
    chars: &mut BTreeMap<Weight, BTreeMap<u16, char>>,
) -> Result<(), RenderError> {
    for it in items {
        match it {
            Item::Text { text, weight, .. } => {
                check_text(text, *weight)?;
                let face = chars.entry(*weight).or_default();
                for ch in text.chars() {
                    if let Some(gid) = font::glyph_id(*weight, ch) {
                        face.entry(gid).or_insert(ch);
                    }
                }
            }
            Item::Group { items, .. } | Item::Scale { items, .. } => collect_items(items, chars)?,
            Item::Line { .. }
            | Item::Polyline { .. }
            | Item::Arc { .. }
            | Item::Outline { .. }
            | Item::Marker { .. }
            | Item::Arrowhead { .. }
            | Item::Box { .. } => {}
        }
    }
    Ok(())
}

/// Subsets one face to `glyphs` and compresses what every document embeds of it.
fn prepare_face(z: &mut Deflater, weight: Weight, glyphs: &FaceGlyphs) -> Result<EmbeddedFace, RenderError> {
    let to_1000 = 1000.0 / f32::from(font::units_per_em(weight));
    let subset = subsetter::subset(font::font_bytes(weight), 0, &glyphs.remapper)
        .map_err(|e| RenderError::FontSubset { weight, reason: e.to_string() })?;
    let mut id = IdHash::new();
    id.update(&subset);
    let base = format!("{}+{}", subset_tag(weight, &glyphs.remapper), postscript_name(weight));
    // CIDs are 0..n in the order the remapper gives; .notdef is CID 0.
    let widths: Vec<f32> = glyphs
        .remapper
        .remapped_gids()
        .map(|gid| f32::from(font::advance_units(weight, gid)) * to_1000)
        .collect();
    let length1 = i32::try_from(subset.len()).map_err(|_| RenderError::FontSubset {
        weight,
        reason: String::from("the subset is larger than a PDF integer"),
    })?;
    let mut unicode = UnicodeCmap::new(Name(b"Custom"), IDENTITY);
    for (&gid, &ch) in &glyphs.chars {
        if let Some(cid) = glyphs.remapper.get(gid) {
            unicode.pair(cid, ch);
        }
    }
    Ok(EmbeddedFace {
        weight,
        base,
        widths,
        file: z.deflate(&subset),
        length1,
        cmap: z.deflate(&unicode.finish()),
        fingerprint: id.bytes(),
    })
}

/// The face's PostScript name from its `name` table (`DejaVuSans`, `DejaVuSans-Bold`).
fn postscript_name(weight: Weight) -> String {
    font::face(weight)
        .names()
        .into_iter()
        .filter(|n| n.name_id == ttf_parser::name_id::POST_SCRIPT_NAME)
        .find_map(|n| n.to_string())
        .unwrap_or_else(|| match weight {
            Weight::Regular => String::from("DejaVuSans"),
            Weight::Bold => String::from("DejaVuSans-Bold"),
        })
}

/// Width of a vertical stem in font units, for `/StemV`: the ink width of `l`,
/// which in a sans face is a single upright stem. 80 units if there is no `l`.
fn stem_v_units(weight: Weight) -> f32 {
    font::glyph_id(weight, 'l')
        .and_then(|gid| font::face(weight).glyph_bounding_box(ttf_parser::GlyphId(gid)))
        .map_or(80.0, |b| f32::from(b.x_max) - f32::from(b.x_min))
}

/// The six capital letters that name a subset (ISO 32000-1, 9.6.4): taken from
/// a hash of the face and its glyphs, so the same subset gets the same tag in
/// every run and different subsets almost surely differ.
fn subset_tag(weight: Weight, remapper: &GlyphRemapper) -> String {
    let mut h = IdHash::new();
    h.update(postscript_name(weight).as_bytes());
    for gid in remapper.remapped_gids() {
        h.update(&gid.to_be_bytes());
    }
    let mut n = h.first();
    (0..6)
        .map(|_| {
            let letter = b'A' + (n % 26) as u8;
            n /= 26;
            char::from(letter)
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::Point;
    use crate::scene::{Anchor, Page};

    fn text_scene(texts: &[(&str, Weight)]) -> Scene {
        let items = texts
            .iter()
            .map(|&(t, weight)| Item::Text {
                at: Point::new(10.0, 10.0),
                text: t.into(),
                size_pt: 10.0,
                weight,
                anchor: Anchor::Start,
                rotate_deg: 0.0,
                gray: 0.0,
            })
            .collect();
        Scene {
            title: "t".into(),
            pages: vec![Page { width_mm: 100.0, height_mm: 100.0, name: "p".into(), items }],
        }
    }

    #[test]
    fn only_used_faces_are_collected_and_cids_follow_glyph_order() {
        let fonts = Fonts::collect([&text_scene(&[("ba", Weight::Regular)])]).unwrap();
        assert_eq!(fonts.faces.keys().copied().collect::<Vec<_>>(), vec![Weight::Regular]);
        // 'a' has a lower glyph id than 'b' in DejaVu Sans, so CID 1 is 'a', CID 2 'b'.
        assert_eq!(fonts.encode(Weight::Regular, "ab").unwrap(), vec![0, 1, 0, 2]);
        assert!(fonts.encode(Weight::Bold, "a").is_err());
    }

    #[test]
    fn subset_tags_are_six_capitals_and_stable() {
        let fonts = Fonts::collect([&text_scene(&[("θ", Weight::Bold)])]).unwrap();
        let tag = subset_tag(Weight::Bold, &fonts.faces[&Weight::Bold].remapper);
        assert_eq!(tag.len(), 6);
        assert!(tag.chars().all(|c| c.is_ascii_uppercase()), "{tag}");
        assert_eq!(tag, subset_tag(Weight::Bold, &fonts.faces[&Weight::Bold].remapper));
    }

    #[test]
    fn postscript_names_come_from_the_font() {
        assert_eq!(postscript_name(Weight::Regular), "DejaVuSans");
        assert_eq!(postscript_name(Weight::Bold), "DejaVuSans-Bold");
    }
}
