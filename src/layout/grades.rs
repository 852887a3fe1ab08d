//! The marks as pages (`grades.pdf`): a class overview, one line per group,
//! then for each sheet with a curve every group's measurements plotted
//! against the exact curve, so the class sees spherical aberration, Snell's
//! law or the minimum of deviation in its own data.

use crate::draw::axes::nice_step;
use crate::draw::{Words, text};
use crate::geom::Point;
use crate::scene::{Anchor, Dash, Item, MarkerShape, Page, Rect, Scene, Stroke, Weight};

/// One group's line of the overview.
#[derive(Clone, Debug, PartialEq)]
pub struct GroupMarks {
    /// The group's name ("" for a build without groups).
    pub group: String,
    /// Answers within their accept range.
    pub within: usize,
    /// Answers measured.
    pub measured: usize,
    /// Answers asked.
    pub asked: usize,
}

/// One plot: a sheet's exact curve and the class's measurements.
#[derive(Clone, Debug, PartialEq)]
pub struct ClassPlotData {
    /// The sheet number.
    pub sheet: u64,
    /// The setting along x and the quantity along y, as the answer file names them.
    pub x: String,
    /// See `x`.
    pub y: String,
    /// The exact curve, settings rising.
    pub curve: Vec<(f64, f64)>,
    /// The paraxial value, if any.
    pub paraxial: Option<f64>,
    /// Every measured point: setting, value, within its accept range.
    pub points: Vec<(f64, f64, bool)>,
}

const PAGE: (f64, f64) = (210.0, 297.0);
const MARGIN: f64 = 12.0;

/// The pages of grades.pdf (A4 portrait: ISO 216, 210 × 297 mm).
pub fn grades_scene(kit_title: &str, groups: &[GroupMarks], plots: &[ClassPlotData], w: &Words) -> Scene {
    let mut pages = Vec::new();
    let (pw, ph) = PAGE;
    let top = ph - MARGIN;
    let mut items = vec![text(
        Point::new(MARGIN, top - 6.0),
        &w.fill("grades_title", &[("kit", kit_title)]),
        13.0,
        Weight::Bold,
        Anchor::Start,
    )];
    let mut y = top - 16.0;
    let cols = [MARGIN, MARGIN + 90.0, MARGIN + 140.0];
    let heads = [w.say("grades_group"), w.say("grades_within"), w.say("grades_asked")];
    let head = |items: &mut Vec<Item>, y: f64| {
        for (x, h) in cols.iter().zip(heads) {
            items.push(text(Point::new(*x, y), h, 8.5, Weight::Bold, Anchor::Start));
        }
        items.push(Item::Line {
            from: Point::new(MARGIN, y - 1.8),
            to: Point::new(pw - MARGIN, y - 1.8),
            stroke: Stroke::solid(0.2),
        });
    };
    head(&mut items, y);
    y -= 6.0;
    for g in groups {
        if y < MARGIN + 6.0 {
            pages.push(Page {
                width_mm: pw,
                height_mm: ph,
                name: format!("grades-{}", pages.len() + 1),
                items,
            });
            items = Vec::new();
            y = top - 6.0;
            head(&mut items, y);
            y -= 6.0;
        }
        let name = if g.group.is_empty() { w.say("grades_no_group").to_string() } else { g.group.clone() };
        let pct = if g.measured > 0 {
            format!(" ({:.0} %)", 100.0 * g.within as f64 / g.measured as f64)
        } else {
            String::new()
        };
        items.push(text(Point::new(cols[0], y), &name, 8.5, Weight::Regular, Anchor::Start));
        items.push(text(
            Point::new(cols[1], y),
            &format!("{} / {}{pct}", g.within, g.measured),
            8.5,
            Weight::Regular,
            Anchor::Start,
        ));
        items.push(text(Point::new(cols[2], y), &g.asked.to_string(), 8.5, Weight::Regular, Anchor::Start));
        y -= 5.0;
    }
    pages.push(Page { width_mm: pw, height_mm: ph, name: format!("grades-{}", pages.len() + 1), items });
    // Two plots a page.
    for pair in plots.chunks(2) {
        let mut items = Vec::new();
        for (k, plot) in pair.iter().enumerate() {
            let area = Rect {
                min: Point::new(MARGIN, top - 135.0 * (k as f64 + 1.0)),
                max: Point::new(pw - MARGIN, top - 135.0 * k as f64 - 5.0),
            };
            items.extend(class_plot(plot, area, w));
        }
        pages.push(Page { width_mm: pw, height_mm: ph, name: format!("grades-{}", pages.len() + 1), items });
    }
    Scene { title: w.fill("grades_title", &[("kit", kit_title)]), pages }
}

/// One plot in `area`: title, axes, the exact curve, the paraxial line, and
/// every measurement (a filled dot within its range, a ring outside).
fn class_plot(p: &ClassPlotData, area: Rect, w: &Words) -> Vec<Item> {
    let mut out = vec![text(
        Point::new(area.min.x, area.max.y - 4.0),
        &w.fill("grades_plot_title", &[("sheet", &p.sheet.to_string()), ("y", &p.y), ("x", &p.x)]),
        9.0,
        Weight::Bold,
        Anchor::Start,
    )];
    let xs = p.curve.iter().map(|c| c.0).chain(p.points.iter().map(|q| q.0));
    let ys = p.curve.iter().map(|c| c.1).chain(p.points.iter().map(|q| q.1)).chain(p.paraxial);
    let (x0, x1) = xs.fold((0.0f64, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)));
    let (mut y0, mut y1) = ys.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)));
    if !(x1.is_finite() && y0.is_finite() && y1.is_finite()) {
        return out;
    }
    let xstep = nice_step((x1 - x0).max(1e-6), 6.0);
    let x1 = (x1 / xstep).ceil() * xstep;
    let ystep = nice_step((y1 - y0).max(1e-6), 5.0);
    y0 = (y0 / ystep).floor() * ystep;
    y1 = ((y1 / ystep).ceil() * ystep).max(y0 + ystep);
    let inner = Rect {
        min: Point::new(area.min.x + 14.0, area.min.y + 16.0),
        max: Point::new(area.max.x - 4.0, area.max.y - 10.0),
    };
    let map = |x: f64, y: f64| {
        Point::new(
            inner.min.x + (x - x0) / (x1 - x0) * inner.width(),
            inner.min.y + (y - y0) / (y1 - y0) * inner.height(),
        )
    };
    let frame = Stroke::solid(0.2);
    out.push(Item::Box { rect: inner, fill: None, stroke: Some(frame) });
    let mut v = x0;
    while v <= x1 + 1e-9 {
        let at = map(v, y0);
        out.push(Item::Line { from: at, to: Point::new(at.x, at.y - 1.2), stroke: frame });
        out.push(text(Point::new(at.x, at.y - 4.2), &trim(v), 7.0, Weight::Regular, Anchor::Middle));
        v += xstep;
    }
    let mut v = y0;
    while v <= y1 + 1e-9 {
        let at = map(x0, v);
        out.push(Item::Line { from: at, to: Point::new(at.x - 1.2, at.y), stroke: frame });
        out.push(text(Point::new(at.x - 2.0, at.y - 1.0), &trim(v), 7.0, Weight::Regular, Anchor::End));
        v += ystep;
    }
    out.push(text(
        Point::new((inner.min.x + inner.max.x) / 2.0, inner.min.y - 9.5),
        &p.x,
        7.5,
        Weight::Regular,
        Anchor::Middle,
    ));
    out.push(Item::Text {
        at: Point::new(inner.min.x - 11.0, (inner.min.y + inner.max.y) / 2.0),
        text: p.y.clone(),
        size_pt: 7.5,
        weight: Weight::Regular,
        anchor: Anchor::Middle,
        rotate_deg: 90.0,
        gray: 0.0,
    });
    if let Some(px) = p.paraxial {
        out.push(Item::Line {
            from: map(x0, px),
            to: map(x1, px),
            stroke: Stroke::solid(0.2).gray(0.4).dashed(Dash::Dashed { on_mm: 2.0, off_mm: 1.5 }),
        });
    }
    out.push(Item::Polyline {
        points: p.curve.iter().map(|&(x, y)| map(x, y)).collect(),
        closed: false,
        stroke: Stroke::solid(0.35),
    });
    for &(x, y, within) in &p.points {
        let shape = if within { MarkerShape::Dot } else { MarkerShape::Ring };
        out.push(Item::Marker { at: map(x, y), shape, size_mm: 1.6, stroke: Stroke::solid(0.25) });
    }
    out.push(text(
        Point::new(inner.min.x, area.min.y + 1.5),
        w.say("grades_legend"),
        7.0,
        Weight::Regular,
        Anchor::Start,
    ));
    out
}

fn trim(v: f64) -> String {
    let s = format!("{:.2}", v + 0.0);
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}
