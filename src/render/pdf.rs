//! A whole scene as one PDF document at true scale, one PDF page per page.
//!
//! Written with pdf-writer, which writes exactly the objects asked for: no
//! dates, no random ids, no process-wide state. The same scene gives the same
//! bytes in every run and however many documents one process renders.
//!
//! - Page size: the MediaBox is the paper in points, by [`mm_to_pt`] (ISO
//!   32000-1: 1 pt = 1/72 in = 25.4/72 mm), so A4 is 595.2756 × 841.8898 pt.
//! - Scale: each content stream opens with one `cm` that scales mm to pt, so
//!   every item is drawn in page millimetres ([`content`]).
//! - Printing: the catalog asks viewers to print at actual size with the viewer
//!   preference `/PrintScaling /None` (ISO 32000-1, table 150).
//! - Arcs: cubic Béziers within [`bezier::ARC_TOLERANCE_MM`] of the circle.
//! - Text: the shipped DejaVu faces, subset and embedded ([`fonts`]); a
//!   character they cannot show is an error, never a `?`.
//! - Streams are compressed with FlateDecode at a fixed level.
//! - The file identifier (`/ID`) is a hash of the document's content, so it too
//!   is the same for the same scene.

pub mod bezier;
mod content;
mod fonts;

use pdf_writer::{Filter, Finish, Name, Pdf, Rect, Ref, TextStr};

use crate::scene::Scene;

use super::RenderError;
use content::page_content;
use fonts::Fonts;

/// Millimetres to PDF points: `mm · 72 / 25.4` (ISO 32000-1: 1 pt = 1/72 in).
/// The one place where page units change.
pub fn mm_to_pt(mm: f64) -> f64 {
    mm * 72.0 / 25.4
}

/// Renders every page of `scene` into one PDF document.
///
/// Fails with [`RenderError::UnsupportedChar`] before writing anything when a
/// text holds a character its face cannot show, and with
/// [`RenderError::FontSubset`] if a shipped font cannot be subset, and with
/// [`RenderError::NotFinite`] when a number on a page is NaN, infinite or
/// absurdly large.
pub fn render_pdf(scene: &Scene) -> Result<Vec<u8>, RenderError> {
    for page in &scene.pages {
        super::check_finite(page)?;
    }
    let fonts = Fonts::collect(scene)?;
    let contents = scene.pages.iter().map(|p| page_content(p, &fonts)).collect::<Result<Vec<_>, _>>()?;

    let mut refs = Refs::default();
    let (catalog, tree, info) = (refs.next(), refs.next(), refs.next());
    let mut pdf = Pdf::new();
    let mut id = IdHash::new();
    id.update(scene.title.as_bytes());

    let font_refs = fonts.embed(&mut pdf, &mut refs, &mut id)?;

    let mut page_refs = Vec::with_capacity(scene.pages.len());
    for (page, content) in scene.pages.iter().zip(&contents) {
        let (page_ref, content_ref) = (refs.next(), refs.next());
        page_refs.push(page_ref);
        id.update(&page.width_mm.to_le_bytes());
        id.update(&page.height_mm.to_le_bytes());
        id.update(&content.bytes);

        let mut p = pdf.page(page_ref);
        p.parent(tree)
            .media_box(Rect::new(0.0, 0.0, mm_to_pt(page.width_mm) as f32, mm_to_pt(page.height_mm) as f32))
            .contents(content_ref);
        let mut resources = p.resources();
        let mut font_dict = resources.fonts();
        for weight in &content.weights {
            if let Some(&r) = font_refs.get(weight) {
                font_dict.pair(Fonts::resource_name(*weight), r);
            }
        }
        font_dict.finish();
        resources.finish();
        p.finish();
        pdf.stream(content_ref, &deflate(&content.bytes)).filter(Filter::FlateDecode);
    }

    let count = i32::try_from(page_refs.len()).unwrap_or(i32::MAX);
    pdf.pages(tree).kids(page_refs).count(count);
    let mut cat = pdf.catalog(catalog);
    cat.pages(tree);
    // pdf-writer has no method for /PrintScaling: write the entry by hand.
    cat.viewer_preferences().pair(Name(b"PrintScaling"), Name(b"None"));
    cat.finish();
    pdf.document_info(info).title(TextStr(&scene.title)).creator(TextStr("raysheet"));

    let file_id = id.bytes();
    pdf.set_file_id((file_id.clone(), file_id));
    Ok(pdf.finish())
}

/// Hands out object numbers 1, 2, 3… for one document.
#[derive(Debug)]
struct Refs(Ref);

impl Default for Refs {
    fn default() -> Self {
        Refs(Ref::new(1))
    }
}

impl Refs {
    fn next(&mut self) -> Ref {
        self.0.bump()
    }
}

/// FlateDecode (zlib) at a fixed level: the same input always gives the same bytes.
fn deflate(data: &[u8]) -> Vec<u8> {
    miniz_oxide::deflate::compress_to_vec_zlib(data, 4)
}

/// Two 64-bit FNV-1a hashes (different starting values) over the same bytes:
/// a stable fingerprint for the file identifier and subset tags. Not a
/// cryptographic hash; nothing here needs one.
#[derive(Clone, Debug)]
struct IdHash {
    a: u64,
    b: u64,
}

impl IdHash {
    const PRIME: u64 = 0x0000_0100_0000_01b3;

    fn new() -> IdHash {
        // The FNV-1a 64-bit offset basis, and the same with its halves swapped.
        IdHash { a: 0xcbf2_9ce4_8422_2325, b: 0x8422_2325_cbf2_9ce4 }
    }

    fn update(&mut self, bytes: &[u8]) {
        for &byte in bytes {
            self.a = (self.a ^ u64::from(byte)).wrapping_mul(Self::PRIME);
            self.b = (self.b ^ u64::from(byte)).wrapping_mul(Self::PRIME);
        }
        // Mark the end of each piece, so ("ab", "c") and ("a", "bc") differ.
        self.a = (self.a ^ 0xff).wrapping_mul(Self::PRIME);
        self.b = (self.b ^ 0xfe).wrapping_mul(Self::PRIME);
    }

    fn first(&self) -> u64 {
        self.a
    }

    /// 16 bytes for `/ID`.
    fn bytes(&self) -> Vec<u8> {
        let mut out = self.a.to_be_bytes().to_vec();
        out.extend_from_slice(&self.b.to_be_bytes());
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    #[test]
    fn a4_and_letter_in_points() {
        // ISO 216 A4 210 × 297 mm = 595.276 × 841.890 pt; US Letter 8.5 × 11 in
        // = 612 × 792 pt (ISO 32000-1: 1 pt = 1/72 in).
        assert_close(mm_to_pt(210.0), 595.275_590_6, 1e-6);
        assert_close(mm_to_pt(297.0), 841.889_763_8, 1e-6);
        assert_close(mm_to_pt(215.9), 612.0, 1e-9);
        assert_close(mm_to_pt(279.4), 792.0, 1e-9);
    }

    #[test]
    fn the_fingerprint_depends_on_order_and_boundaries() {
        let mut x = IdHash::new();
        x.update(b"ab");
        x.update(b"c");
        let mut y = IdHash::new();
        y.update(b"a");
        y.update(b"bc");
        assert_ne!(x.bytes(), y.bytes());
        assert_eq!(x.bytes().len(), 16);
    }

    #[test]
    fn deflate_is_zlib_and_round_trips() {
        let data = b"0 0 m 100 0 l S\n".repeat(50);
        let packed = deflate(&data);
        assert_eq!(packed[0], 0x78, "zlib header");
        assert_eq!(miniz_oxide::inflate::decompress_to_vec_zlib(&packed).unwrap(), data);
    }
}
