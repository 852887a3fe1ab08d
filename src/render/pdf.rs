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

use std::collections::BTreeSet;

use miniz_oxide::deflate::core::{
    CompressorOxide, TDEFLFlush, TDEFLStatus, compress, create_comp_flags_from_zip_params,
};
use pdf_writer::{Filter, Finish, Name, Pdf, Rect, Ref, TextStr};

use crate::scene::{Page, Scene, Weight};

use super::RenderError;
use content::page_content;
use fonts::{EmbeddedFace, Fonts};

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
    let mut z = Deflater::new();
    let fonts = PdfFonts::new([scene], &mut z)?;
    let pages = scene.pages.iter().map(|p| PdfPage::new(p, &fonts, &mut z)).collect::<Result<Vec<_>, _>>()?;
    Ok(pdf_document(&scene.title, &pages, &fonts))
}

/// The faces a set of documents uses, each subset once to every glyph any of
/// them shows, its font file and `/ToUnicode` map compressed once. Every
/// document of the set embeds these same bytes, and every page's content
/// stream, encoded against them, can go into any document of the set
/// ([`PdfPage`], [`pdf_document`]).
#[derive(Debug)]
pub struct PdfFonts {
    fonts: Fonts,
    faces: Vec<(Weight, EmbeddedFace)>,
}

impl PdfFonts {
    /// Gathers the glyphs of every text of `scenes`, refusing characters a face
    /// cannot show, and subsets and compresses each face used.
    pub fn new<'a>(
        scenes: impl IntoIterator<Item = &'a Scene>,
        z: &mut Deflater,
    ) -> Result<PdfFonts, RenderError> {
        let fonts = Fonts::collect(scenes)?;
        let faces = fonts.prepare(z)?;
        Ok(PdfFonts { fonts, faces })
    }
}

/// One page ready for any document of its set: its size and its content
/// stream, built and compressed once.
#[derive(Clone, Debug)]
pub struct PdfPage {
    width_mm: f64,
    height_mm: f64,
    /// The content stream, FlateDecode-compressed.
    stream: Vec<u8>,
    /// A fingerprint of the uncompressed stream, for the file identifier.
    fingerprint: [u8; 16],
    /// Faces to list in the page's font resources.
    weights: BTreeSet<Weight>,
}

impl PdfPage {
    /// The page's content stream against the set's `fonts`, compressed with `z`.
    /// Fails as [`render_pdf`] does.
    pub fn new(page: &Page, fonts: &PdfFonts, z: &mut Deflater) -> Result<PdfPage, RenderError> {
        super::check_finite(page)?;
        let content = page_content(page, &fonts.fonts)?;
        let mut id = IdHash::new();
        id.update(&content.bytes);
        let stream = z.deflate(&content.bytes);
        Ok(PdfPage {
            width_mm: page.width_mm,
            height_mm: page.height_mm,
            stream,
            fingerprint: id.bytes(),
            weights: content.weights,
        })
    }
}

/// A PDF document titled `title` of `pages`, in order, embedding the faces of
/// `fonts` that those pages use. Pages made against other fonts would show the
/// wrong glyphs: give every page of a document the same `fonts`.
pub fn pdf_document<'a>(
    title: &str,
    pages: impl IntoIterator<Item = &'a PdfPage>,
    fonts: &PdfFonts,
) -> Vec<u8> {
    let pages: Vec<&PdfPage> = pages.into_iter().collect();
    let used: BTreeSet<Weight> = pages.iter().flat_map(|p| p.weights.iter().copied()).collect();
    let size = pages.iter().map(|p| p.stream.len() + 200).sum::<usize>()
        + fonts.faces.iter().map(|(_, f)| f.size()).sum::<usize>();

    let mut refs = Refs::default();
    let (catalog, tree, info) = (refs.next(), refs.next(), refs.next());
    let mut pdf = Pdf::with_capacity(size + 1024);
    let mut id = IdHash::new();
    id.update(title.as_bytes());

    let mut font_refs = Vec::new();
    for (weight, face) in fonts.faces.iter().filter(|(w, _)| used.contains(w)) {
        id.update(&face.fingerprint);
        font_refs.push((*weight, face.embed(&mut pdf, &mut refs)));
    }

    let mut page_refs = Vec::with_capacity(pages.len());
    for page in &pages {
        let (page_ref, content_ref) = (refs.next(), refs.next());
        page_refs.push(page_ref);
        id.update(&page.width_mm.to_le_bytes());
        id.update(&page.height_mm.to_le_bytes());
        id.update(&page.fingerprint);

        let mut p = pdf.page(page_ref);
        p.parent(tree)
            .media_box(Rect::new(0.0, 0.0, mm_to_pt(page.width_mm) as f32, mm_to_pt(page.height_mm) as f32))
            .contents(content_ref);
        let mut resources = p.resources();
        let mut font_dict = resources.fonts();
        for weight in &page.weights {
            if let Some(&(_, r)) = font_refs.iter().find(|(w, _)| w == weight) {
                font_dict.pair(Fonts::resource_name(*weight), r);
            }
        }
        font_dict.finish();
        resources.finish();
        p.finish();
        pdf.stream(content_ref, &page.stream).filter(Filter::FlateDecode);
    }

    let count = i32::try_from(page_refs.len()).unwrap_or(i32::MAX);
    pdf.pages(tree).kids(page_refs).count(count);
    let mut cat = pdf.catalog(catalog);
    cat.pages(tree);
    // pdf-writer has no method for /PrintScaling: write the entry by hand.
    cat.viewer_preferences().pair(Name(b"PrintScaling"), Name(b"None"));
    cat.finish();
    pdf.document_info(info).title(TextStr(title)).creator(TextStr("raysheet"));

    let file_id = id.bytes().to_vec();
    pdf.set_file_id((file_id.clone(), file_id));
    pdf.finish()
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

/// The zlib level of every stream: the same input always gives the same bytes.
const DEFLATE_LEVEL: u8 = 4;

/// FlateDecode (zlib) at a fixed level, with one compressor kept for every
/// stream it packs (setting one up costs more than packing a small page).
/// Gives exactly the bytes of `miniz_oxide::deflate::compress_to_vec_zlib`.
pub struct Deflater {
    compressor: Box<CompressorOxide>,
}

impl std::fmt::Debug for Deflater {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str("Deflater")
    }
}

impl Default for Deflater {
    fn default() -> Self {
        Deflater::new()
    }
}

impl Deflater {
    /// A compressor at the fixed level with the zlib wrapper.
    pub fn new() -> Deflater {
        let flags = create_comp_flags_from_zip_params(i32::from(DEFLATE_LEVEL), 1, 0);
        Deflater { compressor: Box::new(CompressorOxide::new(flags)) }
    }

    /// `data` compressed as one zlib stream.
    pub fn deflate(&mut self, data: &[u8]) -> Vec<u8> {
        self.compressor.reset();
        let mut input = data;
        let mut output = vec![0; (data.len() / 2).max(64)];
        let mut at = 0;
        loop {
            let (status, read, written) =
                compress(&mut self.compressor, input, &mut output[at..], TDEFLFlush::Finish);
            at += written;
            match status {
                TDEFLStatus::Done => break,
                TDEFLStatus::Okay => {
                    input = &input[read.min(input.len())..];
                    if output.len() - at < 64 {
                        output.resize(output.len() * 2, 0);
                    }
                }
                // The only failures are a bad parameter or a call after the
                // end, neither of which this loop makes.
                TDEFLStatus::BadParam | TDEFLStatus::PutBufFailed => {
                    unreachable!("deflate refused its input: {status:?}")
                }
            }
        }
        output.truncate(at);
        output
    }
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
    fn bytes(&self) -> [u8; 16] {
        let mut out = [0; 16];
        out[..8].copy_from_slice(&self.a.to_be_bytes());
        out[8..].copy_from_slice(&self.b.to_be_bytes());
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
        let packed = Deflater::new().deflate(&data);
        assert_eq!(packed[0], 0x78, "zlib header");
        assert_eq!(miniz_oxide::inflate::decompress_to_vec_zlib(&packed).unwrap(), data);
    }

    #[test]
    fn a_reused_compressor_gives_the_one_shot_bytes() {
        // The reference is miniz_oxide's own one-shot zlib function at the
        // same level; one compressor packs streams of every size in turn,
        // large ones (output grown past its first guess) included.
        let mut z = Deflater::new();
        let mut seed = 7_u64;
        for n in [0_usize, 1, 17, 5_000, 200_000, 3, 70_000] {
            let data: Vec<u8> = (0..n)
                .map(|i| {
                    seed = seed.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1);
                    if i % 3 == 0 { (seed >> 59) as u8 } else { b"0123456789 .\nmlS"[(seed >> 60) as usize] }
                })
                .collect();
            let want = miniz_oxide::deflate::compress_to_vec_zlib(&data, DEFLATE_LEVEL);
            assert!(z.deflate(&data) == want, "{n} bytes");
        }
    }
}
