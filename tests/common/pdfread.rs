//! raysheet's PDFs read back with lopdf: documents, pages, dictionaries, the
//! MediaBox, and a walk over a page's content stream that applies every `cm`
//! and reports what is drawn in device space (points on the page). And, when
//! poppler's `pdftoppm` is installed, a page as a printer's rasterizer sees it.

use std::path::Path;
use std::process::Command;

use lopdf::{Dictionary, Document, Object, ObjectId};
use resvg::tiny_skia::Pixmap;

/// ISO 32000-1: 1 pt = 1/72 in, and 1 in = 25.4 mm.
pub const PT_PER_MM: f64 = 72.0 / 25.4;

pub fn load(bytes: &[u8]) -> Document {
    Document::load_mem(bytes).expect("lopdf reads the PDF")
}

/// The document's pages, in page order.
pub fn page_ids(doc: &Document) -> Vec<ObjectId> {
    doc.get_pages().into_values().collect()
}

pub fn num(o: &Object) -> f64 {
    f64::from(o.as_float().expect("a number"))
}

pub fn deref<'a>(doc: &'a Document, o: &'a Object) -> &'a Object {
    doc.dereference(o).expect("reference resolves").1
}

/// The dictionary under `key` in `d`, through a reference if need be.
pub fn dict<'a>(doc: &'a Document, d: &'a Dictionary, key: &[u8]) -> &'a Dictionary {
    let name = String::from_utf8_lossy(key);
    let value = d.get(key).unwrap_or_else(|_| panic!("/{name} present"));
    deref(doc, value).as_dict().unwrap_or_else(|_| panic!("/{name} is a dictionary"))
}

/// The page's MediaBox `[x0 y0 x1 y1]`, in points.
pub fn media_box(doc: &Document, page: ObjectId) -> [f64; 4] {
    let d = doc.get_dictionary(page).expect("page dictionary");
    let arr = deref(doc, d.get(b"MediaBox").expect("MediaBox on the page")).as_array().expect("an array");
    [num(&arr[0]), num(&arr[1]), num(&arr[2]), num(&arr[3])]
}

/// A 2D affine map `[a b c d e f]`, as PDF writes matrices.
#[derive(Clone, Copy, Debug)]
struct Matrix([f64; 6]);

impl Matrix {
    const IDENTITY: Matrix = Matrix([1.0, 0.0, 0.0, 1.0, 0.0, 0.0]);

    /// `self` applied first, then `outer` (ISO 32000-1 8.4.4: `cm` makes
    /// CTM' = M × CTM).
    fn then(self, outer: Matrix) -> Matrix {
        let [a, b, c, d, e, f] = self.0;
        let [oa, ob, oc, od, oe, of] = outer.0;
        Matrix([
            a * oa + b * oc,
            a * ob + b * od,
            c * oa + d * oc,
            c * ob + d * od,
            e * oa + f * oc + oe,
            e * ob + f * od + of,
        ])
    }

    fn apply(self, x: f64, y: f64) -> (f64, f64) {
        let [a, b, c, d, e, f] = self.0;
        (a * x + c * y + e, b * x + d * y + f)
    }

    /// How much the map scales lengths (for a uniform scale and rotation).
    fn scale(self) -> f64 {
        let [a, b, c, d, ..] = self.0;
        (a * d - b * c).abs().sqrt()
    }
}

/// One piece of a path, in device space (points on the page).
#[derive(Clone, Copy, Debug)]
pub enum Seg {
    Line((f64, f64), (f64, f64)),
    /// Start, first control point, second control point, end.
    Cubic([(f64, f64); 4]),
}

/// What [`walk`] reports, in stream order.
pub trait Visit {
    /// A `cm` operator's six operands, as written.
    fn transform(&mut self, _m: [f64; 6]) {}

    /// A finished path in device space and the line width it was painted at,
    /// in points; `stroked` for `S s B B* b b*`, false for fill-only `f F f*`
    /// and for the `n` that ends a clipping path.
    fn path(&mut self, segs: Vec<Seg>, width_pt: f64, stroked: bool);
}

/// Walks a page's operators with a graphics-state stack (`q`/`Q` save and
/// restore the CTM and the line width; `cm` pre-multiplies the CTM) and tells
/// `visit` every `cm` and every painted path, in device space.
pub fn walk(doc: &Document, page: ObjectId, visit: &mut impl Visit) {
    let bytes = doc.get_page_content(page).expect("page content");
    let content = lopdf::content::Content::decode(&bytes).expect("content parses");
    let mut ctm = Matrix::IDENTITY;
    let mut width = 1.0; // ISO 32000-1 table 52: the initial line width is 1.0
    let mut stack = Vec::new();
    let mut segs = Vec::new();
    let (mut current, mut start) = ((0.0, 0.0), (0.0, 0.0));
    for op in &content.operations {
        let v: Vec<f64> = op.operands.iter().filter_map(|o| o.as_float().ok().map(f64::from)).collect();
        match op.operator.as_str() {
            "q" => stack.push((ctm, width)),
            "Q" => (ctm, width) = stack.pop().expect("balanced q/Q"),
            "cm" => {
                let m = [v[0], v[1], v[2], v[3], v[4], v[5]];
                visit.transform(m);
                ctm = Matrix(m).then(ctm);
            }
            "w" => width = v[0],
            "m" => {
                current = ctm.apply(v[0], v[1]);
                start = current;
            }
            "l" => {
                let to = ctm.apply(v[0], v[1]);
                segs.push(Seg::Line(current, to));
                current = to;
            }
            "c" => {
                let to = ctm.apply(v[4], v[5]);
                segs.push(Seg::Cubic([current, ctm.apply(v[0], v[1]), ctm.apply(v[2], v[3]), to]));
                current = to;
            }
            "re" => {
                let (x, y, w, h) = (v[0], v[1], v[2], v[3]);
                let c = [(x, y), (x + w, y), (x + w, y + h), (x, y + h)].map(|(a, b)| ctm.apply(a, b));
                for k in 0..4 {
                    segs.push(Seg::Line(c[k], c[(k + 1) % 4]));
                }
                current = c[0];
                start = c[0];
            }
            "h" => {
                if current != start {
                    segs.push(Seg::Line(current, start));
                }
                current = start;
            }
            paint @ ("S" | "s" | "B" | "B*" | "b" | "b*" | "f" | "F" | "f*" | "n") => {
                let stroked = !matches!(paint, "f" | "F" | "f*" | "n");
                let width_pt = width * ctm.scale();
                visit.path(std::mem::take(&mut segs), width_pt, stroked);
            }
            _ => {}
        }
    }
}

/// Whether poppler's `pdftoppm` runs. When it does not, the pixel check is
/// skipped with a note, except under CI, where the test fails (`tools.rs`).
pub fn have_pdftoppm() -> bool {
    super::tools::have_tool("pdftoppm", "-v", "poppler-utils")
}

/// Page 1 of the PDF at `pdf` rendered by `pdftoppm` at 300 dpi in grey, only
/// the `w` × `h` pixels whose top-left corner is `(x, y)` pixels from the
/// page's top-left corner. The PNG is written beside `pdf`.
pub fn pdftoppm_page_1(pdf: &Path, x: u32, y: u32, w: u32, h: u32) -> Pixmap {
    let stem = pdf.with_file_name("pdftoppm-page-1");
    let status = Command::new("pdftoppm")
        .args(["-r", "300", "-f", "1", "-l", "1", "-png", "-singlefile", "-gray"])
        .args(["-x", &x.to_string(), "-y", &y.to_string(), "-W", &w.to_string(), "-H", &h.to_string()])
        .arg(pdf)
        .arg(&stem)
        .status()
        .unwrap();
    assert!(status.success());
    Pixmap::load_png(stem.with_extension("png")).unwrap()
}
