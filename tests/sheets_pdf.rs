//! Whole sheets and keys built from a kit, read back as PDF with lopdf: page
//! sizes, print scaling, the scale checks measured after the content's `cm`
//! transforms, the outline of a known piece, identical bytes, and tiling of a
//! setup longer than the page. When poppler's `pdftoppm` is installed, the
//! outline's height is also measured in the pixels of a 300 dpi rendering.

use lopdf::{Document, ObjectId};
use raysheet::layout::{self, TILE_OVERLAP_MM};
use raysheet::output::{Formats, Output};
use raysheet::paper::Orientation;
use raysheet::sheets::plan_lesson;

mod common {
    pub mod pdfread;
    pub mod sheets;
    pub mod tools;
}
use common::pdfread::{
    PT_PER_MM, Seg, Visit, dict, have_pdftoppm, load, media_box, page_ids, pdftoppm_page_1, walk,
};
use common::sheets::{build, file, fixture, group, paper, scenes};

/// Radius of the half-disc `hd27` in `sheets_halfdisc.toml` (the fixture's own number).
const HALF_DISC_R_MM: f64 = 27.0;

/// Line width of piece outlines and of the scale bars, mm (`OUTLINE_W` in
/// src/layout/drawing.rs and the `bar` stroke in `side_block`, src/layout/mod.rs).
const OUTLINE_W_MM: f64 = 0.35;

const PDF_ONLY: Formats = Formats { pdf: true, svg: false };

/// A stroked path: its pieces and its line width, both in device space.
#[derive(Clone, Debug)]
struct Stroked {
    segs: Vec<Seg>,
    width_pt: f64,
}

/// Collects the stroked paths of a walk.
impl Visit for Vec<Stroked> {
    fn path(&mut self, segs: Vec<Seg>, width_pt: f64, stroked: bool) {
        if stroked {
            self.push(Stroked { segs, width_pt });
        }
    }
}

/// Every stroked path on a page, in device space.
fn stroked_paths(doc: &Document, page: ObjectId) -> Vec<Stroked> {
    let mut out = Vec::new();
    walk(doc, page, &mut out);
    out
}

/// A straight stroke: start and end in mm, then its line width in mm.
type StraightStroke = ((f64, f64), (f64, f64), f64);

/// Straight single-segment strokes whose length is within `lo..hi` mm, with
/// their start and end in mm.
fn single_lines(paths: &[Stroked], lo: f64, hi: f64) -> Vec<StraightStroke> {
    paths
        .iter()
        .filter_map(|p| match p.segs.as_slice() {
            [Seg::Line(a, b)] => {
                let len = (b.0 - a.0).hypot(b.1 - a.1) / PT_PER_MM;
                let mm = |q: (f64, f64)| (q.0 / PT_PER_MM, q.1 / PT_PER_MM);
                (lo..hi).contains(&len).then_some((mm(*a), mm(*b), p.width_pt / PT_PER_MM))
            }
            _ => None,
        })
        .collect()
}

/// Candidate scale bars: single straight strokes at the bar width, `lo..hi` mm long.
fn bars(paths: &[Stroked], lo: f64, hi: f64) -> Vec<StraightStroke> {
    single_lines(paths, lo, hi).into_iter().filter(|l| (l.2 - OUTLINE_W_MM).abs() < 1e-4).collect()
}

/// A cubic Bézier at parameter `t`.
fn bezier(c: [(f64, f64); 4], t: f64) -> (f64, f64) {
    let u = 1.0 - t;
    let w = [u * u * u, 3.0 * u * u * t, 3.0 * u * t * t, t * t * t];
    (
        w[0] * c[0].0 + w[1] * c[1].0 + w[2] * c[2].0 + w[3] * c[3].0,
        w[0] * c[0].1 + w[1] * c[1].1 + w[2] * c[2].1 + w[3] * c[3].1,
    )
}

/// The drawn extent `(x_min, y_min, x_max, y_max)` of a path in mm: line ends
/// and each cubic sampled at 257 parameters (the curve itself, not its control points).
fn extent_mm(p: &Stroked) -> (f64, f64, f64, f64) {
    let mut e = (f64::INFINITY, f64::INFINITY, f64::NEG_INFINITY, f64::NEG_INFINITY);
    let mut add = |q: (f64, f64)| {
        let (x, y) = (q.0 / PT_PER_MM, q.1 / PT_PER_MM);
        e = (e.0.min(x), e.1.min(y), e.2.max(x), e.3.max(y));
    };
    for s in &p.segs {
        match *s {
            Seg::Line(a, b) => {
                add(a);
                add(b);
            }
            Seg::Cubic(c) => (0..=256).for_each(|k| add(bezier(c, f64::from(k) / 256.0))),
        }
    }
    e
}

#[test]
fn page_sizes_match_iso_216_and_us_letter_in_points_for_sheets_and_keys() {
    let kit = fixture("sheets_halfdisc.toml");
    // ISO 216: A4 is 210 × 297 mm = 595.276 × 841.890 pt and A3 is 297 × 420 mm
    // = 841.890 × 1190.551 pt; US Letter is 8.5 × 11 in = 612 × 792 pt
    // (ISO 32000-1: 1 pt = 1/72 in). Landscape swaps the sides; auto is
    // landscape (src/paper.rs, `page_mm`: the axis runs along the long side).
    let cases = [
        ("A4", Orientation::Landscape, 841.890, 595.276),
        ("A4", Orientation::Auto, 841.890, 595.276),
        ("A4", Orientation::Portrait, 595.276, 841.890),
        ("A3", Orientation::Landscape, 1190.551, 841.890),
        ("Letter", Orientation::Portrait, 612.0, 792.0),
        ("Letter", Orientation::Landscape, 792.0, 612.0),
    ];
    for (size, orientation, w_pt, h_pt) in cases {
        let out = build(&kit, &paper(size, orientation), PDF_ONLY);
        for name in ["sheets.pdf", "keys.pdf"] {
            let doc = load(file(&out, name));
            let ids = page_ids(&doc);
            assert!(!ids.is_empty(), "{size} {orientation:?} {name}: no pages");
            for id in ids {
                let [x0, y0, x1, y1] = media_box(&doc, id);
                assert_eq!((x0, y0), (0.0, 0.0), "{size} {orientation:?} {name}");
                assert!(
                    (x1 - w_pt).abs() < 0.01,
                    "{size} {orientation:?} {name}: width {x1} pt, want {w_pt}"
                );
                assert!(
                    (y1 - h_pt).abs() < 0.01,
                    "{size} {orientation:?} {name}: height {y1} pt, want {h_pt}"
                );
            }
        }
    }
}

#[test]
fn catalog_asks_viewers_to_print_at_actual_size() {
    // ISO 32000-1 table 150: /ViewerPreferences << /PrintScaling /None >>.
    let out = build(&fixture("sheets_halfdisc.toml"), &paper("A4", Orientation::Auto), PDF_ONLY);
    for name in ["sheets.pdf", "keys.pdf"] {
        let doc = load(file(&out, name));
        let catalog = doc.catalog().expect("a catalog");
        let prefs = dict(&doc, catalog, b"ViewerPreferences");
        let scaling = prefs.get(b"PrintScaling").expect("PrintScaling").as_name().expect("a name");
        assert_eq!(scaling, b"None", "{name}");
    }
}

#[test]
fn scale_bars_measure_100_mm_across_and_50_mm_up_after_the_cm_transforms() {
    let kit = fixture("sheets_halfdisc.toml");
    // The stacked layout (portrait) and the side-by-side one (landscape) place
    // the bars differently (src/layout/mod.rs, `regions`); both must measure true.
    for orientation in [Orientation::Landscape, Orientation::Portrait] {
        let out = build(&kit, &paper("A4", orientation), PDF_ONLY);
        for name in ["sheets.pdf", "keys.pdf"] {
            let doc = load(file(&out, name));
            for id in page_ids(&doc) {
                let paths = stroked_paths(&doc, id);
                // The scale check is the only single straight stroke at the bar
                // width between 95 and 105 mm long (the table's rules, the axis
                // and the header rule are far longer for this kit, and the key's
                // plot axes are thinner).
                let across = bars(&paths, 95.0, 105.0);
                assert_eq!(across.len(), 1, "{orientation:?} {name}: one 100 mm bar, found {across:?}");
                let (a, b, w) = across[0];
                // The issue asks for 100 mm across; 100.00 ± 0.01 mm is what a
                // steel rule cannot tell apart.
                assert!(
                    (a.1 - b.1).abs() < 1e-6,
                    "{orientation:?} {name}: the bar is horizontal: {a:?} {b:?}"
                );
                assert!(
                    ((b.0 - a.0).abs() - 100.0).abs() < 0.01,
                    "{orientation:?} {name}: {} mm",
                    (b.0 - a.0).abs()
                );
                assert!((w - OUTLINE_W_MM).abs() < 1e-4, "{orientation:?} {name}: bar width {w} mm");
                // Likewise the 50 mm vertical bar: the only such stroke 45–55 mm long.
                let up = bars(&paths, 45.0, 55.0);
                assert_eq!(up.len(), 1, "{orientation:?} {name}: one 50 mm bar, found {up:?}");
                let (a, b, _) = up[0];
                assert!((a.0 - b.0).abs() < 1e-6, "{orientation:?} {name}: the bar is vertical: {a:?} {b:?}");
                assert!(
                    ((b.1 - a.1).abs() - 50.0).abs() < 0.01,
                    "{orientation:?} {name}: {} mm",
                    (b.1 - a.1).abs()
                );
            }
        }
    }
}

/// Why the PDF operators and not only the scene: the scene holds one arc item
/// whose extent is trivially 2R; what prints is the renderer's Béziers after the
/// `cm` transforms, so the extent is measured on those (sampled curves, not
/// control points). The group offset from the scene ties the PDF to the layout:
/// the flat face (x = 0 in the sheet frame) must sit at the offset.
#[test]
fn the_half_disc_outline_spans_its_diameter_on_the_page() {
    let kit = fixture("sheets_halfdisc.toml");
    let p = paper("A4", Orientation::Auto);
    let plans = plan_lesson(&kit, &p);
    let set = scenes(&kit, &plans, &p);
    let out = build(&kit, &p, PDF_ONLY);
    for (name, scene) in [("sheets.pdf", &set.sheets), ("keys.pdf", &set.keys)] {
        let doc = load(file(&out, name));
        let ids = page_ids(&doc);
        assert_eq!(ids.len(), scene.pages.len(), "{name}");
        let offset = group(&scene.pages[0]).0;
        // The outline is the only stroke with curves at the outline width (the
        // key's rings are 0.25 mm; its dots are filled, not stroked).
        let outlines: Vec<Stroked> = stroked_paths(&doc, ids[0])
            .into_iter()
            .filter(|s| (s.width_pt / PT_PER_MM - OUTLINE_W_MM).abs() < 1e-4)
            .filter(|s| s.segs.iter().any(|g| matches!(g, Seg::Cubic(_))))
            .collect();
        assert_eq!(outlines.len(), 1, "{name}: one curved outline, found {}", outlines.len());
        let (x0, y0, x1, y1) = extent_mm(&outlines[0]);
        // A half-disc of radius R is R wide and 2R high (DESIGN.md, geometry: t = R, H = 2R).
        let r = HALF_DISC_R_MM;
        assert!(((y1 - y0) - 2.0 * r).abs() < 0.01, "{name}: height {} mm, want {}", y1 - y0, 2.0 * r);
        assert!(((x1 - x0) - r).abs() < 0.01, "{name}: width {} mm, want {r}", x1 - x0);
        assert!((x0 - offset.x).abs() < 0.01, "{name}: flat face at {x0} mm, group offset {}", offset.x);
        assert!(
            ((y0 + y1) / 2.0 - offset.y).abs() < 0.01,
            "{name}: centred at {} mm, axis at {}",
            (y0 + y1) / 2.0,
            offset.y
        );
    }
}

/// What the printer's rasterizer makes of the outline: poppler renders page 1 at
/// 300 dpi and the dark run down one pixel column just inside the flat face must
/// span the disc's chord there plus one line width. Skipped without `pdftoppm`
/// outside CI; under CI a missing `pdftoppm` fails the test.
#[test]
fn pdftoppm_shows_the_half_disc_at_true_height() {
    if !have_pdftoppm() {
        return;
    }
    let kit = fixture("sheets_halfdisc.toml");
    let p = paper("A4", Orientation::Auto);
    let plans = plan_lesson(&kit, &p);
    let offset = group(&scenes(&kit, &plans, &p).sheets.pages[0]).0;
    let dir = tempfile::tempdir().unwrap();
    let pdf = dir.path().join("sheets.pdf");
    std::fs::write(&pdf, file(&build(&kit, &p, PDF_ONLY), "sheets.pdf")).unwrap();
    // 300 dpi: 300/25.4 px per mm (1 in = 25.4 mm).
    let px_per_mm = 300.0 / 25.4;
    let page_h = 210.0; // A4 landscape height, ISO 216
    let r = HALF_DISC_R_MM;
    // Column 0.6 mm inside the flat face: clear of the flat-face line and the
    // dashed flat-face marker (0.35 and 0.2 mm wide, centred on x = 0), and the
    // only things above and below it within R + 3 mm are the arc and the axis.
    let dx = 0.6;
    let x_px = ((offset.x + dx) * px_per_mm).round() as u32;
    let top_mm = page_h - (offset.y + r + 3.0); // SVG-like y down from the top edge
    let (top_px, rows) = ((top_mm * px_per_mm) as u32, ((2.0 * r + 6.0) * px_per_mm) as u32);
    let png = pdftoppm_page_1(&pdf, x_px, top_px, 1, rows);
    let dark: Vec<u32> = (0..png.height()).filter(|&y| png.pixel(0, y).unwrap().red() < 128).collect();
    let (first, last) = (dark.first().expect("dark pixels"), dark.last().unwrap());
    let span_mm = f64::from(last - first + 1) / px_per_mm;
    // The arc's centre line is at ±sqrt(R² − dx²) there; the stroke adds half a
    // width each side (it runs almost level so close to the disc's top).
    let want = 2.0 * (r * r - dx * dx).sqrt() + OUTLINE_W_MM;
    // ±2 px: one for each edge's anti-aliasing threshold.
    println!("dark run {span_mm:.3} mm, want {want:.3} mm");
    assert!((span_mm - want).abs() <= 2.0 / px_per_mm, "dark run {span_mm:.3} mm, want {want:.3} mm");
}

#[test]
fn the_same_kit_gives_identical_bytes_even_after_another_build_in_the_same_process() {
    let p = paper("A4", Orientation::Auto);
    let both = Formats { pdf: true, svg: true };
    let kit = fixture("sheets_halfdisc.toml");
    let first = build(&kit, &p, both);
    // Another kit in between: any process-wide state (a counter in an id, a
    // font-subset cache) would show up as a difference below.
    let other = build(&fixture("sheets_weak_lens.toml"), &p, both);
    assert_ne!(file(&other, "sheets.pdf"), file(&first, "sheets.pdf"));
    let again = build(&fixture("sheets_halfdisc.toml"), &p, both);
    let names = |o: &[Output]| o.iter().map(|f| f.path.clone()).collect::<Vec<_>>();
    assert_eq!(names(&first), names(&again));
    for (a, b) in first.iter().zip(&again) {
        assert!(a.bytes == b.bytes, "{} differs between two builds of one kit", a.path);
    }
    assert!(first.iter().any(|o| o.path.ends_with(".svg")), "the SVGs are compared too");
}

#[test]
fn a_setup_longer_than_the_page_tiles_into_the_hand_computed_page_count() {
    let kit = fixture("sheets_weak_lens.toml");
    let p = paper("A4", Orientation::Auto);
    let plans = plan_lesson(&kit, &p);
    assert_eq!(plans.len(), 1);
    let s = plans[0].setup();
    let one_page = layout::regions(&p).drawing;
    let window = layout::tiles::tile_regions(&p).common.drawing;
    let (w, l) = (window.width(), s.x_max - s.x_min);
    // By hand (DESIGN.md, lens maker's formula and thick lens): plano-convex
    // R = 260 mm, n = 1.50, t = 5 mm: f = R/(n − 1) = 520 mm, BFL = f − t/n =
    // 516.7 mm, so the paraxial focus is at x = 5 + 516.7 = 521.7 mm from the
    // entry vertex. The setup runs from the ray-box lead-in at x = −45 mm
    // (LEAD_IN_MM, src/plan/mod.rs) to 12 mm past the focus (TAIL_MM):
    // L ≈ 45 + 521.7 + 12 = 578.7 mm, longer than a one-page sheet's window
    // (277 mm: A4 landscape is 297 mm wide, ISO 216, less 10 mm margins).
    assert!((l - 578.7).abs() < 1.0, "L = {l} mm");
    assert!((one_page.width() - 277.0).abs() < 1e-9 && l > one_page.width());
    // So the text goes on a cover page and the drawing on pages whose window is
    // the printable width less the 11 mm strip for the 50 mm bar and a 1 mm gap
    // (src/layout/tiles.rs): 277 − 12 = 265 mm.
    assert!((w - 265.0).abs() < 1e-9, "W = {w} mm");
    // The drawing pages cover the setup and 10 mm round it for labels
    // (LABEL_MARGIN_MM): L' = L + 20 = 598.7 mm. n = ⌈(L' − o)/(W − o)⌉ with
    // o = 12 mm overlap (issue 3: tiles overlap): ⌈586.7/253⌉ = ⌈2.32⌉ = 3
    // drawing pages, one row since the setup is less tall than the window;
    // with the cover, 4 pages.
    let o = TILE_OVERLAP_MM;
    assert_eq!(o, 12.0);
    assert_eq!(layout::tiles::LABEL_MARGIN_MM, 10.0);
    let l = l + 20.0;
    let n = ((l - o) / (w - o)).ceil() as usize;
    assert_eq!(n, 3);
    assert!(
        s.height() <= window.height(),
        "one row: {} mm across, window {} mm",
        s.height(),
        window.height()
    );

    let out = build(&kit, &p, PDF_ONLY);
    for name in ["sheets.pdf", "keys.pdf"] {
        let doc = load(file(&out, name));
        let ids = page_ids(&doc);
        assert_eq!(ids.len(), n + 1, "{name}");
        // Never shrunk: every page is a full A4 landscape page with a true 100 mm bar.
        for id in ids {
            let [_, _, x1, y1] = media_box(&doc, id);
            assert!((x1 - 841.890).abs() < 0.01 && (y1 - 595.276).abs() < 0.01, "{name}: {x1} × {y1} pt");
            let across = bars(&stroked_paths(&doc, id), 95.0, 105.0);
            assert_eq!(across.len(), 1, "{name}: {across:?}");
            assert!(((across[0].1.0 - across[0].0.0).abs() - 100.0).abs() < 0.01, "{name}: {across:?}");
        }
    }
    // Issue 9 (no sliver): the drawing pages are spread evenly, each shifted
    // from the last by (L' − W)/(n − 1) = (598.7 − 265)/2 ≈ 166.9 mm, an
    // overlap of W − 166.9 ≈ 98 mm, well over the 12 mm minimum.
    let set = scenes(&kit, &plans, &p);
    let offsets: Vec<f64> = set.sheets.pages.iter().skip(1).map(|pg| group(pg).0.x).collect();
    assert_eq!(offsets.len(), n);
    let advance = (l - w) / (n - 1) as f64;
    assert!((advance - 166.85).abs() < 0.6, "advance {advance}");
    for pair in offsets.windows(2) {
        assert!(((pair[0] - pair[1]) - advance).abs() < 1.0, "tile offsets {offsets:?}");
    }
}

/// The block and prism outlines print at 1:1: after the `cm` transforms the
/// stroke drawn at the outline width spans the piece's own sizes, to 0.01 mm.
/// A block is t × H; an equilateral prism of side s is s wide and s·√3/2 high
/// (closed form). Both sheets and keys, with the page each lands on.
#[test]
fn block_and_prism_outlines_print_at_their_own_size() {
    let kit = fixture("sheets_angles.toml");
    let p = paper("A4", Orientation::Auto);
    let plans = plan_lesson(&kit, &p);
    let set = scenes(&kit, &plans, &p);
    let out = build(&kit, &p, PDF_ONLY);
    let want = [(35.0, 70.0), (45.0, 45.0 * 3f64.sqrt() / 2.0)];
    for (name, scene) in [("sheets.pdf", &set.sheets), ("keys.pdf", &set.keys)] {
        let doc = load(file(&out, name));
        let ids = page_ids(&doc);
        assert_eq!(ids.len(), scene.pages.len(), "{name}: one page a sheet");
        for (k, (w, h)) in want.iter().enumerate() {
            // The piece is the stroke at the outline width inside the drawing
            // window (the key's plot frame elsewhere on the page is drawn alike).
            let window = layout::regions(&layout::paper_for(&plans[k], &p)).drawing;
            let outlines: Vec<Stroked> = stroked_paths(&doc, ids[k])
                .into_iter()
                .filter(|s| (s.width_pt / PT_PER_MM - OUTLINE_W_MM).abs() < 1e-4 && s.segs.len() >= 3)
                .filter(|s| {
                    let (x0, y0, x1, y1) = extent_mm(s);
                    x0 >= window.min.x && x1 <= window.max.x && y0 >= window.min.y && y1 <= window.max.y
                })
                .collect();
            assert_eq!(outlines.len(), 1, "{name} page {}: one outline, found {}", k + 1, outlines.len());
            let (x0, y0, x1, y1) = extent_mm(&outlines[0]);
            assert!(((x1 - x0) - w).abs() < 0.01, "{name} page {}: width {} mm, want {w}", k + 1, x1 - x0);
            assert!(((y1 - y0) - h).abs() < 0.01, "{name} page {}: height {} mm, want {h}", k + 1, y1 - y0);
        }
    }
}
