//! Issue 11, "a printer that scales": the calibration page's rulers print at
//! their length, and a kit's `[printer]` (or `--rulers`) stretches every page
//! by 180/long along the paper's long edge and 120/short along its short edge,
//! in one transform that reaches the PDF's content stream and the SVG exactly,
//! on landscape and portrait pages alike. Lengths are read back after every
//! `cm` (ISO 32000-1 8.4.4), 1 pt = 25.4/72 mm.

use std::path::Path;

#[allow(dead_code)]
mod common {
    pub mod cli;
    pub mod pdfread;
    pub mod tools;
}
use common::cli::{assert_code, raysheet, text};
use common::pdfread::{PT_PER_MM, Seg, Visit, load, media_box, page_ids, walk};

#[derive(Default)]
struct Seen {
    transforms: Vec<[f64; 6]>,
    /// Straight single-segment strokes: (start, end) in mm of the page.
    lines: Vec<((f64, f64), (f64, f64))>,
}

impl Visit for Seen {
    fn transform(&mut self, m: [f64; 6]) {
        self.transforms.push(m);
    }
    fn path(&mut self, segs: Vec<Seg>, _w: f64, stroked: bool) {
        if let (true, [Seg::Line(a, b)]) = (stroked, segs.as_slice()) {
            let mm = |q: &(f64, f64)| (q.0 / PT_PER_MM, q.1 / PT_PER_MM);
            self.lines.push((mm(a), mm(b)));
        }
    }
}

fn len(l: &((f64, f64), (f64, f64))) -> f64 {
    (l.1.0 - l.0.0).hypot(l.1.1 - l.0.1)
}

const LONG: f64 = 178.2;
const SHORT: f64 = 119.4;

fn build_with_printer(dir: &Path) {
    let kit = format!(
        "{}\n[printer]\nlong_ruler_mm = {LONG}\nshort_ruler_mm = {SHORT}\n",
        raysheet::demo::DEMO_KIT
    );
    std::fs::write(dir.join("kit.toml"), kit).unwrap();
    assert_code(&raysheet(&["build", "kit.toml", "--out", "out"], dir), 0);
}

#[test]
fn printer_correction_reaches_the_pdf_and_the_svg() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path();
    build_with_printer(dir);
    let (long, short) = (180.0 / LONG, 120.0 / SHORT);
    let doc = load(&std::fs::read(dir.join("out/sheets.pdf")).unwrap());
    let mut turned = [0, 0];
    for id in page_ids(&doc) {
        let [_, _, w_pt, h_pt] = media_box(&doc, id);
        let (w, h) = (w_pt / PT_PER_MM, h_pt / PT_PER_MM);
        let (sx, sy) = if w >= h { (long, short) } else { (short, long) };
        turned[usize::from(w < h)] += 1;
        let mut seen = Seen::default();
        walk(&doc, id, &mut seen);
        // The page's mm→pt map, then the correction about the page's centre.
        let m = seen.transforms[1];
        for (got, want) in
            [(m[0], sx), (m[3], sy), (m[4], w / 2.0 * (1.0 - sx)), (m[5], h / 2.0 * (1.0 - sy))]
        {
            assert!((got - want).abs() < 2e-5, "{got} vs {want} on a {w:.0} × {h:.0} page");
        }
        assert_eq!((m[1], m[2]), (0.0, 0.0));
        // The 100 mm scale bar leaves the PDF 100·sx mm long, which the printer
        // shrinks back to 100 mm.
        let bar =
            seen.lines.iter().find(|l| (len(l) - 100.0 * sx).abs() < 0.01 && (l.0.1 - l.1.1).abs() < 1e-6);
        assert!(bar.is_some(), "no {} mm bar on a {w:.0} × {h:.0} page", 100.0 * sx);
    }
    assert!(turned[0] > 0 && turned[1] > 0, "landscape and portrait pages: {turned:?}");
    // Every SVG: one matrix with both factors, to 1e-6.
    for e in std::fs::read_dir(dir.join("out/svg")).unwrap() {
        let svg = std::fs::read_to_string(e.unwrap().path()).unwrap();
        let m = svg.split("transform=\"matrix(").nth(1).expect("a matrix").split(')').next().unwrap();
        let v: Vec<f64> = m.split(' ').map(|x| x.parse().unwrap()).collect();
        let landscape = svg.contains("width=\"297mm\"");
        let (sx, sy) = if landscape { (long, short) } else { (short, long) };
        assert!((v[0] - sx).abs() < 1e-6 && (v[3] - sy).abs() < 1e-6, "{m}");
    }
}

#[test]
fn the_calibration_rulers_measure_true() {
    let tmp = tempfile::tempdir().unwrap();
    for paper in ["A4", "A5", "Letter"] {
        let out = raysheet(&["calibrate", "--out", paper, "--paper", paper], tmp.path());
        assert_code(&out, 0);
        let doc = load(&std::fs::read(tmp.path().join(paper).join("calibration.pdf")).unwrap());
        let id = page_ids(&doc)[0];
        let mut seen = Seen::default();
        walk(&doc, id, &mut seen);
        let [_, _, w_pt, h_pt] = media_box(&doc, id);
        assert!(h_pt > w_pt, "{paper}: portrait, the long ruler up the long edge");
        let long = seen.lines.iter().find(|l| (len(l) - 180.0).abs() < 0.01).expect("the 180 mm ruler");
        let short = seen.lines.iter().find(|l| (len(l) - 120.0).abs() < 0.01).expect("the 120 mm ruler");
        assert!((long.0.0 - long.1.0).abs() < 1e-6, "{paper}: the long ruler runs up the page");
        assert!((short.0.1 - short.1.1).abs() < 1e-6, "{paper}: the short ruler runs across");
        // 181 ticks on the long ruler and 121 on the short one, a millimetre apart.
        let ticks_up = seen
            .lines
            .iter()
            .filter(|l| {
                (l.0.0 - long.0.0).abs() < 1e-6 && (l.0.1 - l.1.1).abs() < 1e-6 && len(l) <= 5.0 + 1e-6
            })
            .count();
        assert_eq!(ticks_up, 181, "{paper}");
        // Everything inside the 10 mm margins.
        let (w, h) = (w_pt / PT_PER_MM, h_pt / PT_PER_MM);
        for l in &seen.lines {
            for p in [l.0, l.1] {
                assert!(p.0 >= 10.0 && p.0 <= w - 10.0 && p.1 >= 10.0 && p.1 <= h - 10.0, "{paper}: {p:?}");
            }
        }
    }
}

#[test]
fn rulers_beyond_a_printers_error_are_refused_and_large_ones_warned() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path();
    let kit =
        format!("{}\n[printer]\nlong_ruler_mm = 150\nshort_ruler_mm = 119.6\n", raysheet::demo::DEMO_KIT);
    std::fs::write(dir.join("kit.toml"), &kit).unwrap();
    let out = raysheet(&["check", "kit.toml"], dir);
    assert_code(&out, 2);
    let line = kit.lines().position(|l| l.starts_with("long_ruler_mm")).unwrap() + 1;
    let err = text(&out.stderr);
    assert!(
        err.contains(&format!("kit.toml:{line}:"))
            && err.contains("printer.long_ruler_mm")
            && err.contains("162 to 198"),
        "{err}"
    );
    // --rulers overrides the kit's own [printer], checked alike.
    std::fs::write(dir.join("kit.toml"), kit.replace("long_ruler_mm = 150", "long_ruler_mm = 179.4"))
        .unwrap();
    let out = raysheet(&["check", "kit.toml", "--rulers", "179,119.5"], dir);
    assert_code(&out, 0);
    let out = raysheet(&["check", "kit.toml", "--rulers", "one,two"], dir);
    assert_code(&out, 2);
    assert!(text(&out.stderr).contains("--rulers: \"one,two\" is not two lengths"), "{}", text(&out.stderr));
    // 172 mm for 180 mm is 4.7 %: more like "fit to page" than a printer.
    let out = raysheet(&["check", "kit.toml", "--rulers", "172,119.5"], dir);
    assert_code(&out, 0);
    assert!(text(&out.stdout).contains("warning: a correction of 4.7 %"), "{}", text(&out.stdout));
    let out = raysheet(&["check", "kit.toml", "--rulers", "179,119.5"], dir);
    assert!(!text(&out.stdout).contains("warning: a correction"), "{}", text(&out.stdout));
}
