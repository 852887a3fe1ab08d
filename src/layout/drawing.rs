//! The setup drawn at 1:1 in the sheet frame (x along the axis from the entry
//! vertex, y up, mm): what the student sheet shows, and what the key adds.

use crate::draw::{Placer, text, text_box};
use crate::geom::{Arc, Point, Vec2};
use crate::kit::SheetKind;
use crate::optics::{Boundary, Face, Outcome, Outline};
use crate::plan::{SheetPlan, fmt_mm};
use crate::scene::{Anchor, Dash, Item, MarkerShape, OutlinePart, Rect, Stroke, Weight};

/// Line weights, mm: pencil lines are about 0.3–0.5 mm (common practice, no source).
pub const OUTLINE_W: f64 = 0.35;
/// Guide lines.
pub const GUIDE_W: f64 = 0.3;
/// Optical axis and construction lines.
pub const THIN_W: f64 = 0.2;
/// Traced rays on the key.
pub const RAY_W: f64 = 0.3;
/// Label size, pt.
pub const LABEL_PT: f64 = 7.5;

const AXIS_DASH: Dash = Dash::DashDot { long_mm: 6.0, short_mm: 1.0, gap_mm: 1.2 };
const LINE_DASH: Dash = Dash::Dashed { on_mm: 2.5, off_mm: 1.5 };

fn face_arc(outline: &Outline, b: Boundary, from: Point, to: Point) -> Option<OutlinePart> {
    let c = outline.center(b)?;
    let arc = Arc::short_way(c, from, to)?;
    Some(OutlinePart::ArcTo {
        center: c,
        radius_mm: arc.radius,
        start_rad: arc.start_rad,
        sweep_rad: arc.sweep_rad,
    })
}

/// The piece outline as one closed figure: entry face top→bottom, bottom edge,
/// exit face bottom→top, top edge.
pub fn outline_item(outline: &Outline, fill: Option<f64>) -> Item {
    let [et, xt, xb, eb] = outline.corners();
    let mut parts = vec![OutlinePart::MoveTo { to: et }];
    parts.push(face_arc(outline, Boundary::Entry, et, eb).unwrap_or(OutlinePart::LineTo { to: eb }));
    parts.push(OutlinePart::LineTo { to: xb });
    parts.push(face_arc(outline, Boundary::Exit, xb, xt).unwrap_or(OutlinePart::LineTo { to: xt }));
    parts.push(OutlinePart::LineTo { to: et });
    Item::Outline { parts, fill, stroke: Stroke::solid(OUTLINE_W) }
}

/// The items and label obstacles of a drawing, in the sheet frame.
pub struct Drawing {
    /// What is drawn.
    pub items: Vec<Item>,
    /// Where labels may not go.
    pub placer: Placer,
}

fn line(from: Point, to: Point, stroke: Stroke) -> Item {
    Item::Line { from, to, stroke }
}

fn place_label(d: &mut Drawing, bounds: &Rect, s: &str, size: f64, candidates: &[(Point, Anchor)]) {
    let boxes: Vec<Rect> =
        candidates.iter().map(|(p, a)| text_box(*p, s, size, Weight::Regular, *a)).collect();
    let k = d.placer.choose(&boxes, bounds);
    let (p, a) = candidates[k];
    d.items.push(text(p, s, size, Weight::Regular, a));
}

/// The student sheet's drawing: axis, outline, flat-face or centre line, ray
/// box position and guide lines with arrowheads.
///
/// `bounds` is where labels may go, in the sheet frame: the visible window.
pub fn student(plan: &SheetPlan, bounds: Rect) -> Drawing {
    let o = &plan.outline;
    let s = plan.setup;
    let a = o.a();
    let mut d = Drawing { items: Vec::new(), placer: Placer::default() };
    // Keep the student's labels off where the key will draw traced rays and
    // crossing marks, so both carry the same labels at the same places.
    for r in &plan.rays {
        let tr = &r.trace;
        d.placer.block_path(&tr.path[1.min(tr.path.len())..]);
        if let (Some(x), Some((p, _))) = (r.crossing_from_entry_mm, tr.exit) {
            d.placer.block_line(p, Point::new(x, 0.0));
            d.placer.block(Rect::from_corners(Point::new(x - 2.0, -2.0), Point::new(x + 2.0, 2.0)));
        }
    }
    if let Some(f) = plan.paraxial.rear_focus_x() {
        d.placer.block(Rect::from_corners(Point::new(f - 2.0, -2.0), Point::new(f + 2.0, 2.0)));
    }
    // Optical axis.
    let axis_a = Point::new(s.x_min + 2.0, 0.0);
    let axis_b = Point::new(s.x_max - 1.0, 0.0);
    d.items.push(line(axis_a, axis_b, Stroke::solid(THIN_W).dashed(AXIS_DASH)));
    d.placer.block_line(axis_a, axis_b);
    // The piece.
    d.items.push(outline_item(o, None));
    let (x0, x1) = o.x_range();
    d.placer.block(Rect::from_corners(Point::new(x0, -a), Point::new(x1, a)));
    // Flat-face line or centre line.
    let reach = (a + 10.0).min(s.y_half - 1.0);
    let (lx, name) = match (plan.kind, o.entry_face) {
        (SheetKind::CurvedFace, Face::Flat) => (0.0, "flat face"),
        _ => (o.t() / 2.0, "centre line"),
    };
    let top = Point::new(lx, reach);
    d.items.push(line(Point::new(lx, -reach), top, Stroke::solid(THIN_W).dashed(LINE_DASH)));
    d.placer.block_line(Point::new(lx, -reach), top);
    place_label(
        &mut d,
        &bounds,
        name,
        LABEL_PT,
        &[(Point::new(lx, reach + 1.2), Anchor::Middle), (Point::new(lx + 1.5, reach - 2.5), Anchor::Start)],
    );
    // Ray box: where it stands.
    let hmax = plan.rays.iter().map(|r| r.height_mm.abs()).fold(0.0, f64::max);
    let box_half = (hmax + 6.0).min(s.y_half - 1.0).max(10.0);
    let bx0 = s.x_min + 1.0;
    let bx1 = bx0 + 9.0;
    let rb = Rect::from_corners(Point::new(bx0, -box_half), Point::new(bx1, box_half));
    d.items.push(Item::Box {
        rect: rb,
        fill: Some(0.93),
        stroke: Some(Stroke::solid(THIN_W).dashed(LINE_DASH)),
    });
    d.placer.block(rb);
    d.items.push(Item::Text {
        at: Point::new(bx0 + 5.6, 0.0),
        text: "ray box here".into(),
        size_pt: LABEL_PT,
        weight: Weight::Regular,
        anchor: Anchor::Middle,
        rotate_deg: 90.0,
        gray: 0.0,
    });
    // Guide lines.
    for r in plan.rays_top_down() {
        let h = r.height_mm;
        let start = Point::new(bx1 + 1.0, h);
        let end = Point::new(o.entry_x(h) - 1.0, h);
        d.items.push(line(start, end, Stroke::solid(GUIDE_W)));
        d.placer.block_line(start, end);
        let mid = Point::new(start.x + (end.x - start.x) * 0.55, h);
        d.items.push(Item::Arrowhead {
            tip: mid,
            dir: Vec2::new(1.0, 0.0),
            length_mm: 3.0,
            width_mm: 1.8,
            gray: 0.0,
        });
        let label = format!("{} {}", r.letter, signed(h));
        place_label(
            &mut d,
            &bounds,
            &label,
            LABEL_PT,
            &[
                (Point::new(start.x + 1.0, h + 1.0), Anchor::Start),
                (Point::new(start.x + 1.0, h - 3.2), Anchor::Start),
                (Point::new(mid.x - 5.0, h + 1.0), Anchor::End),
                (Point::new(mid.x - 5.0, h - 3.2), Anchor::End),
                (Point::new(start.x + 1.0, h + 2.6), Anchor::Start),
                (Point::new(start.x + 1.0, h - 4.8), Anchor::Start),
            ],
        );
    }
    // The axis label last, between the ray box and the piece (where the key's
    // crossings never fall), clear of the guide labels.
    let x_left = s.x_min + 11.0;
    let x_right = o.entry_x(a).min(0.0) - 2.0;
    let mut cands = Vec::new();
    for k in 0..5 {
        let x = x_left + (x_right - x_left) * (0.5 + 0.1 * f64::from(k));
        cands.push((Point::new(x, -3.4), Anchor::Middle));
        cands.push((Point::new(x, 1.4), Anchor::Middle));
    }
    cands.push((Point::new(s.x_max - 2.0, 1.4), Anchor::End));
    place_label(&mut d, &bounds, "optical axis", LABEL_PT, &cands);
    d
}

/// A height with its sign: `+12.5 mm`, `−8 mm`, `0 mm`.
pub fn signed(h: f64) -> String {
    if h > 0.0 {
        format!("+{} mm", fmt_mm(h))
    } else if h < 0.0 {
        format!("\u{2212}{} mm", fmt_mm(-h))
    } else {
        "0 mm".into()
    }
}

/// What the key adds on top of the student drawing: traced rays, crossing
/// marks with values, the paraxial focus, the rear principal plane and, for
/// diverging pieces, the backward extensions, trace-back points and virtual focus.
pub fn key_extras(plan: &SheetPlan, base: &mut Drawing, bounds: Rect) -> Vec<Item> {
    let mut items = Vec::new();
    let s = plan.setup;
    let o = &plan.outline;
    let ray_stroke = Stroke::solid(RAY_W).gray(0.25);
    let mut marks: Vec<(f64, Vec<String>, bool)> = Vec::new();
    for r in plan.rays_top_down() {
        let tr = &r.trace;
        let mut pts: Vec<Point> = tr.path.iter().skip(1).copied().collect();
        // Start where the guide line ends, so the key overlays the sheet cleanly.
        pts.insert(0, Point::new(s.x_min + 11.0, r.height_mm));
        let last = *pts.last().unwrap_or(&tr.incoming.origin);
        let far = match tr.outcome {
            Outcome::Crosses { x_mm } => {
                let extra = 12.0_f64.min(s.x_max - x_mm - 1.0).max(0.0);
                Point::new(x_mm, 0.0) + tr.exit_dir * (extra / tr.exit_dir.x.max(0.2))
            }
            Outcome::Virtual { .. } => {
                let to_x = r.trace_back.map(|t| t[1].x + 8.0).unwrap_or(last.x + 40.0).min(s.x_max - 1.0);
                last + tr.exit_dir * ((to_x - last.x) / tr.exit_dir.x.max(0.2))
            }
            _ => last + tr.exit_dir * 30.0,
        };
        pts.push(clip_to(last, far, &bounds));
        base.placer.block_path(&pts);
        items.push(Item::Polyline { points: pts, closed: false, stroke: ray_stroke });
        if let (Outcome::Virtual { x_mm }, Some((p, _))) = (tr.outcome, tr.exit) {
            let v = Point::new(x_mm, 0.0);
            items.push(Item::Line {
                from: p,
                to: v,
                stroke: Stroke::solid(THIN_W).gray(0.25).dashed(LINE_DASH),
            });
            base.placer.block_line(p, v);
        }
        if let Some(tb) = r.trace_back {
            for (j, p) in tb.iter().enumerate() {
                items.push(Item::Marker {
                    at: *p,
                    shape: MarkerShape::Dot,
                    size_mm: 1.6,
                    stroke: Stroke::solid(THIN_W),
                });
                let lbl = format!("{}{}", r.letter, j + 1);
                let up = if r.height_mm >= 0.0 { 1.2 } else { -3.4 };
                let mut d2 = Drawing { items: Vec::new(), placer: std::mem::take(&mut base.placer) };
                place_label(
                    &mut d2,
                    &bounds,
                    &lbl,
                    6.5,
                    &[
                        (Point::new(p.x + 1.2, p.y + up), Anchor::Start),
                        (Point::new(p.x - 1.2, p.y + up), Anchor::End),
                    ],
                );
                base.placer = d2.placer;
                items.extend(d2.items);
            }
        }
        if let Some(x) = r.crossing_from_entry_mm {
            let letter = r.letter.clone();
            match marks.iter_mut().find(|(mx, _, _)| (mx - x).abs() < 0.05) {
                Some(m) => m.1.push(letter),
                None => marks.push((x, vec![letter], matches!(tr.outcome, Outcome::Virtual { .. }))),
            }
        }
    }
    // Crossing marks, labelled below the axis, stacked to stay apart.
    marks.sort_by(|a, b| a.0.total_cmp(&b.0));
    let (ref_x, ref_words) = plan.measure_from();
    let reference = (ref_words, ref_x);
    for (x, letters, is_virtual) in &marks {
        let at = Point::new(*x, 0.0);
        items.push(Item::Marker {
            at,
            shape: MarkerShape::Saltire,
            size_mm: 2.6,
            stroke: Stroke::solid(0.3),
        });
        let dist = x - reference.1;
        let value = if *is_virtual {
            format!("{}: {} mm before the exit face", letters.join(", "), fmt1(-dist))
        } else {
            format!("{}: {} mm {}", letters.join(", "), fmt1(dist), reference.0)
        };
        // A virtual crossing's dashed extensions fan out to its right, so its
        // label goes first to its left, just off the axis.
        let mut cands: Vec<(Point, Anchor)> = Vec::new();
        if *is_virtual {
            for dx in [2.0, 6.0] {
                cands.push((Point::new(x - dx, 1.2), Anchor::End));
                cands.push((Point::new(x - dx, -3.4), Anchor::End));
            }
        }
        cands.extend((0..8).flat_map(|k| {
            let dy = 3.2 + 3.4 * f64::from(k);
            [
                (Point::new(*x, -dy - 1.5), Anchor::Middle),
                (Point::new(*x, dy), Anchor::Middle),
                (Point::new(*x + 2.0, -dy - 1.5), Anchor::End),
                (Point::new(*x - 2.0, -dy - 1.5), Anchor::Start),
            ]
        }));
        let mut d2 = Drawing { items: Vec::new(), placer: std::mem::take(&mut base.placer) };
        place_label(&mut d2, &bounds, &value, 6.5, &cands);
        base.placer = d2.placer;
        items.extend(d2.items);
    }
    // Paraxial focus and rear principal plane.
    if let Some(f) = plan.paraxial.rear_focus_x() {
        let at = Point::new(f, 0.0);
        items.push(Item::Marker { at, shape: MarkerShape::Ring, size_mm: 2.4, stroke: Stroke::solid(0.25) });
        let text_s = if f < o.t() {
            format!("virtual focus (paraxial): {} mm before the exit face", fmt1(o.t() - f))
        } else {
            format!("paraxial focus: {} mm {}", fmt1(f - reference.1), reference.0)
        };
        let cands: Vec<(Point, Anchor)> = (0..8)
            .flat_map(|k| {
                let dy = 3.4 + 3.4 * f64::from(k);
                [
                    (Point::new(f, dy), Anchor::Middle),
                    (Point::new(f, -dy - 1.5), Anchor::Middle),
                    (Point::new(f + 2.0, dy), Anchor::End),
                    (Point::new(f - 2.0, dy), Anchor::Start),
                ]
            })
            .collect();
        let mut d2 = Drawing { items: Vec::new(), placer: std::mem::take(&mut base.placer) };
        place_label(&mut d2, &bounds, &text_s, 6.5, &cands);
        base.placer = d2.placer;
        items.extend(d2.items);
    }
    if let Some(h) = plan.paraxial.rear_principal_mm() {
        let x = o.t() + h;
        if (x - o.t()).abs() > 0.3 {
            let reach = o.a() * 0.6;
            items.push(Item::Line {
                from: Point::new(x, -reach),
                to: Point::new(x, reach),
                stroke: Stroke::solid(THIN_W).gray(0.4).dashed(Dash::Dashed { on_mm: 1.0, off_mm: 1.0 }),
            });
        }
    }
    items
}

fn fmt1(v: f64) -> String {
    format!("{:.1}", v + 0.0)
}

/// The point where the segment from `a` toward `b` leaves `r` (or `b` if it stays inside).
fn clip_to(a: Point, b: Point, r: &Rect) -> Point {
    if r.contains(b) {
        return b;
    }
    let mut lo = 0.0;
    let mut hi = 1.0;
    for _ in 0..40 {
        let mid = 0.5 * (lo + hi);
        let p = a + (b - a) * mid;
        if r.contains(p) {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    a + (b - a) * lo
}
