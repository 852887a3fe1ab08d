//! The drawings of block and prism sheets in the sheet frame (mm, y up): the
//! piece's outline, the normal at the entry point, the guide lines and, on the
//! key, every ray's traced path and the ray that leaves.

use super::angled::AngledPlan;
use crate::draw::{Placer, text_box};
use crate::geom::{EdgePath, Point, Shape, Vec2};
use crate::scene::{Anchor, Dash, Item, OutlinePart, Rect, Stroke, Weight};

const OUTLINE_W: f64 = 0.35;
const GUIDE_W: f64 = 0.3;
const THIN_W: f64 = 0.2;
const RAY_W: f64 = 0.3;
const LABEL_PT: f64 = 7.5;

/// The outline of a shape as one closed scene item.
pub fn shape_outline<F: Copy>(shape: &Shape<F>) -> Item {
    let edges = shape.edges();
    let mut parts = Vec::new();
    if let Some(first) = edges.first() {
        parts.push(OutlinePart::MoveTo { to: first.path.start() });
    }
    for e in edges {
        parts.push(match e.path {
            EdgePath::Line(s) => OutlinePart::LineTo { to: s.b },
            EdgePath::Arc(a) => OutlinePart::ArcTo {
                center: a.center,
                radius_mm: a.radius,
                start_rad: a.start_rad,
                sweep_rad: a.sweep_rad,
            },
        });
    }
    Item::Outline { parts, fill: None, stroke: Stroke::solid(OUTLINE_W) }
}

/// The box that must be on paper, in the sheet frame: the piece, the guide
/// lines, and every ray to its drawn length beyond the piece.
pub fn extent<F: Copy + PartialEq>(plan: &AngledPlan<F>) -> (Point, Point) {
    let (mut lo, mut hi) = plan.setup.shape.bounds();
    let mut take = |p: Point| {
        lo = Point::new(lo.x.min(p.x), lo.y.min(p.y));
        hi = Point::new(hi.x.max(p.x), hi.y.max(p.y));
    };
    take(plan.setup.entry_point + plan.setup.outward * 25.0);
    for r in &plan.rays {
        take(r.trace.incoming.origin);
        if let Some(out) = r.trace.outgoing() {
            take(out.origin + out.dir * plan.setup.out_mm);
        }
    }
    (Point::new(lo.x - 5.0, lo.y - 5.0), Point::new(hi.x + 5.0, hi.y + 5.0))
}

fn label(items: &mut Vec<Item>, placer: &mut Placer, bounds: &Rect, s: &str, cands: &[(Point, Anchor)]) {
    if cands.is_empty() {
        return;
    }
    let boxes: Vec<Rect> =
        cands.iter().map(|(p, a)| text_box(*p, s, LABEL_PT, Weight::Regular, *a)).collect();
    let k = placer.choose(&boxes, bounds);
    items.push(crate::draw::text(cands[k].0, s, LABEL_PT, Weight::Regular, cands[k].1));
}

/// The student drawing: outline, the normal at the entry point, guide lines
/// with arrowheads and their letters and angles.
pub fn student<F: Copy + PartialEq>(plan: &AngledPlan<F>, bounds: &Rect, placer: &mut Placer) -> Vec<Item> {
    let s = &plan.setup;
    let mut items = vec![shape_outline(&s.shape)];
    let (lo, hi) = s.shape.bounds();
    placer.block(Rect::from_corners(lo, hi));
    let a = s.entry_point + s.outward * 30.0;
    let b = s.entry_point - s.outward * 30.0;
    items.push(Item::Line {
        from: a,
        to: b,
        stroke: Stroke::solid(THIN_W).dashed(Dash::Dashed { on_mm: 2.5, off_mm: 1.5 }),
    });
    placer.block_line(a, b);
    label(&mut items, placer, bounds, "normal", &[(a + s.outward * 1.5, Anchor::Middle)]);
    for r in &plan.rays {
        let start = r.trace.incoming.origin;
        let end = s.entry_point;
        items.push(Item::Line { from: start, to: end, stroke: Stroke::solid(GUIDE_W) });
        placer.block_line(start, end);
        let mid = start + (end - start) * 0.55;
        items.push(Item::Arrowhead {
            tip: mid,
            dir: r.trace.incoming.dir,
            length_mm: 3.0,
            width_mm: 1.8,
            gray: 0.0,
        });
        let text = format!("{} {}", r.letter, super::angled_view::angle(r.incidence_deg));
        let n = r.trace.incoming.dir.perp();
        label(
            &mut items,
            placer,
            bounds,
            &text,
            &[
                (start + n * 2.0, Anchor::Start),
                (start - n * 4.5, Anchor::Start),
                (start + n * 4.0, Anchor::End),
                (start - n * 6.0, Anchor::End),
            ],
        );
    }
    items
}

/// What the key adds: every ray's traced path and the ray that leaves.
pub fn key<F: Copy + PartialEq>(plan: &AngledPlan<F>, _bounds: &Rect, placer: &mut Placer) -> Vec<Item> {
    let mut items = Vec::new();
    for r in &plan.rays {
        let mut pts: Vec<Point> = r.trace.points().skip(1).collect();
        if let Some(out) = r.trace.outgoing() {
            pts.push(out.origin + out.dir * plan.setup.out_mm);
        }
        if pts.len() >= 2 {
            placer.block_path(&pts);
            items.push(Item::Polyline {
                points: pts,
                closed: false,
                stroke: Stroke::solid(RAY_W).gray(0.25),
            });
        }
    }
    let _ = Vec2::new(0.0, 0.0);
    items
}

/// The deviation against the angle of incidence (page mm); empty for now.
pub fn deviation_plot<F: Copy + PartialEq>(_plan: &AngledPlan<F>, _rect: Rect) -> Vec<Item> {
    Vec::new()
}
