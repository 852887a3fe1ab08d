//! The setup drawn at 1:1 in the sheet frame (x along the axis from the entry
//! vertex, y up, mm): what the student sheet shows, and what the key adds.

use super::LensPlan as SheetPlan;
use crate::draw::{Drawing, Placer, Words, place_near, text, text_box};
use crate::geom::{Point, Vec2};
use crate::optics::{Boundary, Face, Outcome, Outline};
use crate::plan::fmt_mm;
use crate::scene::{Anchor, Dash, Item, MarkerShape, Rect, Stroke, Weight};
use crate::sheets::SheetKind;

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

/// The piece outline as one closed figure, from the traced shape's own edges
/// (entry face top→bottom, bottom edge, exit face bottom→top, top edge), so
/// a half-disc's 180° face is drawn the way it is traced. (Issue 9: the arcs
/// were once rebuilt "the short way" between their ends, which is ambiguous
/// for a semicircle and drew some half-discs' curved face on the wrong side.)
pub fn outline_item(outline: &Outline, fill: Option<f64>) -> Item {
    match crate::draw::shape_outline(outline.shape(), Stroke::solid(OUTLINE_W)) {
        Item::Outline { parts, stroke, .. } => Item::Outline { parts, fill, stroke },
        other => other,
    }
}

fn line(from: Point, to: Point, stroke: Stroke) -> Item {
    Item::Line { from, to, stroke }
}

fn place_label(d: &mut Drawing, bounds: &Rect, s: &str, size: f64, candidates: &[(Point, Anchor)]) {
    d.label(bounds, s, size, candidates);
}

/// The student sheet's drawing: axis, outline, flat-face or centre line, ray
/// box position and guide lines with arrowheads.
///
/// `bounds` is where labels may go, in the sheet frame: the visible window.
pub fn student(plan: &SheetPlan, bounds: Rect, w: &Words) -> Drawing {
    let o = &plan.outline;
    let s = plan.setup;
    let a = o.a();
    let mut d = Drawing { items: Vec::new(), placer: Placer::default() };
    // Keep the student's labels off where the key will draw traced rays and
    // crossing marks, so both carry the same labels at the same places.
    for r in &plan.rays {
        let tr = &r.trace;
        d.placer.block_path(&tr.path[1.min(tr.path.len())..]);
        // The key draws the outgoing ray on toward the window's edge, with its trace-back points.
        if let Some((p, _)) = tr.exit {
            d.placer.block_line(p, clip_to(p, p + tr.exit_dir * 5000.0, &bounds));
        }
        for p in r.trace_back.iter().flatten() {
            d.placer.block(Rect::from_corners(*p - Vec2::new(0.8, 0.8), *p + Vec2::new(0.8, 0.8)));
        }
        if let (Some(x), Some((p, _))) = (r.crossing_from_entry_mm, tr.exit) {
            d.placer.block_line(p, Point::new(x, 0.0));
            d.placer.block(Rect::from_corners(Point::new(x - 2.0, -2.0), Point::new(x + 2.0, 2.0)));
        }
    }
    if let Some(f) = plan.paraxial.rear_focus_x() {
        d.placer.block(Rect::from_corners(Point::new(f - 2.0, -2.0), Point::new(f + 2.0, 2.0)));
    }
    // Ray box: where it stands.
    let hmax = plan.rays.iter().map(|r| r.height_mm.abs()).fold(0.0, f64::max);
    let box_half = (hmax + 6.0).min(s.y_max - 1.0).max(10.0);
    let bx0 = s.x_min + 1.0;
    let bx1 = bx0 + 9.0;
    // Optical axis, from the ray box on (through the box it would cross the box's words).
    let axis_a = Point::new(bx1, 0.0);
    let axis_b = Point::new(s.x_max - 1.0, 0.0);
    d.items.push(line(axis_a, axis_b, Stroke::solid(THIN_W).dashed(AXIS_DASH)));
    d.placer.block_line(axis_a, axis_b);
    // The piece.
    d.items.push(outline_item(o, None));
    let (x0, x1) = o.x_range();
    d.placer.block(Rect::from_corners(Point::new(x0, -a), Point::new(x1, a)));
    // Flat-face line or centre line.
    let reach = (a + 10.0).min(s.y_max - 1.0);
    let (lx, name) = match (plan.kind, o.entry_face) {
        (SheetKind::CurvedFace, Face::Flat) => (0.0, w.say("flat_face")),
        _ => (centre_line_x(o), w.say("centre_line")),
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
    let rb = Rect::from_corners(Point::new(bx0, -box_half), Point::new(bx1, box_half));
    d.items.push(Item::Box {
        rect: rb,
        fill: Some(0.93),
        stroke: Some(Stroke::solid(THIN_W).dashed(LINE_DASH)),
    });
    d.placer.block(rb);
    d.items.push(Item::Text {
        at: Point::new(bx0 + 5.6, 0.0),
        text: w.say("ray_box_here").into(),
        size_pt: LABEL_PT,
        weight: Weight::Regular,
        anchor: Anchor::Middle,
        rotate_deg: 90.0,
        gray: 0.0,
    });
    // Guide lines, with the arrowhead near the piece so the label has the
    // line's start to itself.
    let guides: Vec<(f64, Point, Point)> = plan
        .rays_top_down()
        .iter()
        .map(|r| {
            (
                r.height_mm,
                Point::new(bx1 + 1.0, r.height_mm),
                Point::new(o.entry_x(r.height_mm) - 1.0, r.height_mm),
            )
        })
        .collect();
    for &(h, start, end) in &guides {
        d.items.push(line(start, end, Stroke::solid(GUIDE_W)));
        d.placer.block_line(start, end);
        let tip = Point::new(start.x + (end.x - start.x) * 0.85, h);
        d.items.push(Item::Arrowhead {
            tip,
            dir: Vec2::new(1.0, 0.0),
            length_mm: 3.0,
            width_mm: 1.8,
            gray: 0.0,
        });
        d.placer.block(Rect::from_corners(Point::new(tip.x - 3.0, h - 0.9), Point::new(tip.x, h + 0.9)));
    }
    // The lines a guide label could be read against: every guide and the axis.
    let mut across: Vec<f64> = guides.iter().map(|g| g.0).collect();
    across.push(0.0);
    for (r, &(h, start, end)) in plan.rays_top_down().iter().zip(&guides) {
        let label = format!("{} {}", r.letter, signed(h));
        guide_label(&mut d, &bounds, &label, (h, start, end), &across);
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
    cands.push((Point::new(s.x_max - 2.0, -3.4), Anchor::End));
    // Only where it is free: the axis is named in the instructions too.
    let axis_name = w.say("optical_axis");
    let boxes: Vec<Rect> =
        cands.iter().map(|(p, a)| text_box(*p, axis_name, LABEL_PT, Weight::Regular, *a)).collect();
    if let Some(k) = d.placer.try_choose(&boxes, &bounds) {
        d.items.push(text(cands[k].0, axis_name, LABEL_PT, Weight::Regular, cands[k].1));
    }
    d
}

/// A guide line's label, beside the line (above it, else below it, from the
/// line's start onward) and nearer to its own line than to any other guide or
/// the axis, so it cannot be read against the wrong line. When no such place
/// is free, the letter alone goes at the line's start, just above it; the
/// height is in the table.
fn guide_label(d: &mut Drawing, bounds: &Rect, label: &str, guide: (f64, Point, Point), across: &[f64]) {
    let (h, start, end) = guide;
    let gap = |r: &Rect, y: f64| (r.min.y - y).max(y - r.max.y).max(0.0);
    let own_side =
        |r: &Rect| across.iter().filter(|&&y| (y - h).abs() > 1e-9).all(|&y| gap(r, y) > gap(r, h) + 0.3);
    let room = (end.x - start.x - 4.0).max(0.0);
    let mut cands: Vec<(Point, Anchor)> = Vec::new();
    for k in 0..6 {
        let x = start.x + 1.0 + room * f64::from(k) / 8.0;
        for dy in [1.0, -3.2, 1.6, -3.8] {
            cands.push((Point::new(x, h + dy), Anchor::Start));
        }
    }
    let fits = |s: &str, c: &(Point, Anchor)| own_side(&text_box(c.0, s, LABEL_PT, Weight::Regular, c.1));
    let near: Vec<(Point, Anchor)> = cands.iter().copied().filter(|c| fits(label, c)).collect();
    let boxes: Vec<Rect> =
        near.iter().map(|(p, a)| text_box(*p, label, LABEL_PT, Weight::Regular, *a)).collect();
    if let Some(k) = d.placer.try_choose(&boxes, bounds) {
        d.items.push(text(near[k].0, label, LABEL_PT, Weight::Regular, near[k].1));
        return;
    }
    let letter: String = label.split(' ').next().unwrap_or(label).to_string();
    let near: Vec<(Point, Anchor)> = cands.iter().copied().filter(|c| fits(&letter, c)).collect();
    if !near.is_empty() {
        place_label(d, bounds, &letter, LABEL_PT, &near);
    }
}

/// Where a lens shape's centre line is drawn: a half-disc's (one flat face,
/// the other's centre of curvature on it) at that centre, on the flat face;
/// any other piece at mid-thickness.
pub fn centre_line_x(o: &Outline) -> f64 {
    for b in [Boundary::Entry, Boundary::Exit] {
        if let Some(c) = o.center(b)
            && (c.x.abs() < 1e-6 && o.entry_face == Face::Flat
                || (c.x - o.t()).abs() < 1e-6 && o.exit_face == Face::Flat)
        {
            return c.x;
        }
    }
    o.t() / 2.0
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

/// A traced ray's path as the key draws it: from where the guide line ends,
/// through every point where it met the outline, to its far end (12 mm past
/// a real crossing, past the second trace-back point of a virtual one, else
/// 30 mm on), unclipped.
pub fn key_path(s: &super::super::Setup, r: &super::RayAnswer) -> Vec<Point> {
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
    pts.push(far);
    pts
}

/// What the key adds on top of the student drawing: traced rays, crossing
/// marks with values, the paraxial focus, the rear principal plane and, for
/// diverging pieces, the backward extensions, trace-back points and virtual focus.
pub fn key_extras(plan: &SheetPlan, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item> {
    let mut items = Vec::new();
    let s = plan.setup;
    let o = &plan.outline;
    let ray_stroke = Stroke::solid(RAY_W).gray(0.25);
    let mut marks: Vec<(f64, Vec<String>, bool)> = Vec::new();
    for r in plan.rays_top_down() {
        let tr = &r.trace;
        let mut pts = key_path(&s, r);
        let far = pts.pop().expect("a key path has its far end");
        let last = *pts.last().unwrap_or(&tr.incoming.origin);
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
                base.placer.block(Rect::from_corners(*p - Vec2::new(0.8, 0.8), *p + Vec2::new(0.8, 0.8)));
                let lbl = format!("{}{}", r.letter, j + 1);
                let up = if r.height_mm >= 0.0 { 1.6 } else { -3.8 };
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
    // Crossing marks. Marks closer together than a label is tall share one
    // label (a cluster): its letters in ray order and the range of their
    // values, each value being in the key's table. Labels go below the axis
    // where there is room, with a leader to their mark when they stand off.
    marks.sort_by(|a, b| a.0.total_cmp(&b.0));
    let (ref_x, ref_words) = plan.measure_from(w);
    for (x, _, _) in &marks {
        items.push(Item::Marker {
            at: Point::new(*x, 0.0),
            shape: MarkerShape::Saltire,
            size_mm: 2.6,
            stroke: Stroke::solid(0.3),
        });
    }
    let label_h = LABEL_PT * crate::scene::MM_PER_PT;
    let mut clusters: Vec<Vec<&(f64, Vec<String>, bool)>> = Vec::new();
    for m in &marks {
        match clusters.last_mut() {
            Some(c) if c.last().is_some_and(|l| m.0 - l.0 < label_h && l.2 == m.2) => c.push(m),
            _ => clusters.push(vec![m]),
        }
    }
    // Every cluster's full label (letters, value, reference), tried on a copy
    // of the placer: all placed, they stand; else the crossings are shown
    // magnified in an inset where each mark has room for its own label.
    let label_of = |c: &[&(f64, Vec<String>, bool)]| {
        let mut letters: Vec<String> = c.iter().flat_map(|m| m.1.iter().cloned()).collect();
        letters.sort();
        let is_virtual = c[0].2;
        let dists: Vec<f64> = c.iter().map(|m| if is_virtual { ref_x - m.0 } else { m.0 - ref_x }).collect();
        let (lo, hi) =
            (dists.iter().copied().fold(f64::MAX, f64::min), dists.iter().copied().fold(f64::MIN, f64::max));
        let value = if c.len() == 1 { fmt1(lo) } else { format!("{}\u{2013}{}", fmt1(lo), fmt1(hi)) };
        let words = if is_virtual { w.say("before_exit_face") } else { ref_words };
        let full =
            w.fill("crossing_label", &[("rays", &letters.join(", ")), ("value", &value), ("where", words)]);
        (full, letters, is_virtual)
    };
    let mut trial = base.placer.clone();
    let mut trial_items = Vec::new();
    let mut all_full = true;
    for c in &clusters {
        let (full, _, is_virtual) = label_of(c);
        let at = Point::new((c[0].0 + c[c.len() - 1].0) / 2.0, 0.0);
        // A virtual crossing's dashed extensions fan out to its right: its label goes left.
        let prefer = if is_virtual { Vec2::new(-1.0, -0.3) } else { Vec2::new(0.0, -1.0) };
        match stacked_label(&mut trial, &bounds, &full, at)
            .or_else(|| place_near(&mut trial, &bounds, &full, 6.5, at, prefer))
        {
            Some(placed) => trial_items.extend(placed),
            None => {
                all_full = false;
                break;
            }
        }
    }
    let focus_x = plan.paraxial.rear_focus_x();
    if all_full {
        base.placer = trial;
        items.extend(trial_items);
    } else if let Some(inset) = crossing_inset(plan, base, &bounds, &marks, focus_x, &label_of, w) {
        items.extend(inset);
    } else {
        // No room for an inset either: the letters alone (the values are in
        // the key's table), in the first free direction round the mark.
        for c in &clusters {
            let (_, letters, is_virtual) = label_of(c);
            let at = Point::new((c[0].0 + c[c.len() - 1].0) / 2.0, 0.0);
            let prefer = if is_virtual { Vec2::new(-1.0, -0.3) } else { Vec2::new(0.0, -1.0) };
            let placed = [
                prefer,
                Vec2::new(0.0, -1.0),
                Vec2::new(0.0, 1.0),
                Vec2::new(-1.0, 0.0),
                Vec2::new(1.0, 0.0),
            ]
            .into_iter()
            .find_map(|d| place_near(&mut base.placer, &bounds, &letters.join(","), 6.5, at, d));
            items.extend(placed.unwrap_or_default());
        }
    }
    // Paraxial focus: its value is in the key's text; the label goes where it is free.
    if let Some(f) = focus_x {
        let at = Point::new(f, 0.0);
        items.push(Item::Marker { at, shape: MarkerShape::Ring, size_mm: 2.4, stroke: Stroke::solid(0.25) });
        let text_s = if f < o.t() {
            w.fill("virtual_focus_label", &[("value", &fmt1(o.t() - f))])
        } else {
            w.fill("paraxial_focus_label", &[("value", &fmt1(f - ref_x)), ("where", ref_words)])
        };
        let placed = stacked_label(&mut base.placer, &bounds, &text_s, at)
            .or_else(|| place_near(&mut base.placer, &bounds, &text_s, 6.5, at, Vec2::new(0.0, 1.0)))
            .or_else(|| {
                place_near(&mut base.placer, &bounds, w.say("paraxial_focus"), 6.5, at, Vec2::new(0.0, 1.0))
            });
        items.extend(placed.unwrap_or_default());
    }
    if let Some(h) = plan.paraxial.rear_principal_mm() {
        let x = o.t() + h;
        if (x - o.t()).abs() > 0.3 {
            let reach = o.a() * 0.6;
            let (a, b) = (Point::new(x, -reach), Point::new(x, reach));
            items.push(Item::Line {
                from: a,
                to: b,
                stroke: Stroke::solid(THIN_W).gray(0.4).dashed(Dash::Dashed { on_mm: 1.0, off_mm: 1.0 }),
            });
            base.placer.block_soft_line(a, b);
            let placed = place_near(
                &mut base.placer,
                &bounds,
                w.say("rear_principal_plane"),
                6.0,
                b,
                Vec2::new(0.3, 1.0),
            )
            .or_else(|| place_near(&mut base.placer, &bounds, "H\u{2032}", 6.0, b, Vec2::new(0.3, 1.0)));
            items.extend(placed.unwrap_or_default());
        }
    }
    items
}

/// A crossing mark: its x, the letters of its rays, whether it is virtual.
type Mark = (f64, Vec<String>, bool);
/// A group of marks' full label, its letters and whether it is virtual.
type LabelOf<'a> = dyn Fn(&[&Mark]) -> (String, Vec<String>, bool) + 'a;

/// Heights tried for the magnified inset of crossings, mm, tallest first, and
/// the smallest spacing its marks get (room for a label between neighbours).
const INSET_H_MM: [f64; 3] = [34.0, 28.0, 24.0];
const INSET_GAP_MM: f64 = 9.0;

/// The crossings magnified in a framed inset placed where the drawing is free:
/// the axis, the rays' last segments and dashed extensions, every mark and the
/// paraxial focus, spread by a whole-number factor so each mark (or group of
/// marks that coincide) has its own full label with a leader. A thin box in the
/// drawing shows the region magnified, and the inset's title states the factor
/// and that it is not to scale. `None` when no factor or free place works.
fn crossing_inset(
    plan: &SheetPlan,
    base: &mut Drawing,
    bounds: &Rect,
    marks: &[(f64, Vec<String>, bool)],
    focus_x: Option<f64>,
    label_of: &LabelOf<'_>,
    w: &Words,
) -> Option<Vec<Item>> {
    INSET_H_MM.iter().find_map(|&ih| {
        let mut trial = Drawing { items: Vec::new(), placer: base.placer.clone() };
        let out = inset_of_height(plan, &mut trial, bounds, marks, focus_x, label_of, w, ih)?;
        base.placer = trial.placer;
        Some(out)
    })
}

/// [`crossing_inset`] with the inset `ih` mm tall.
#[allow(clippy::too_many_arguments)]
fn inset_of_height(
    plan: &SheetPlan,
    base: &mut Drawing,
    bounds: &Rect,
    marks: &[(f64, Vec<String>, bool)],
    focus_x: Option<f64>,
    label_of: &LabelOf<'_>,
    w: &Words,
    ih: f64,
) -> Option<Vec<Item>> {
    let (lo, hi) = marks.iter().fold((f64::MAX, f64::MIN), |(lo, hi), m| (lo.min(m.0), hi.max(m.0)));
    if marks.is_empty() {
        return None;
    }
    // The focus joins the region when it lies among or next to the marks.
    let near_focus = focus_x.filter(|f| *f > lo - 6.0 && *f < hi + 6.0);
    let mut xs: Vec<f64> = marks.iter().map(|m| m.0).chain(near_focus).collect();
    xs.sort_by(f64::total_cmp);
    xs.dedup_by(|a, b| (*a - *b).abs() < 0.05);
    let (x0, x1) = (xs[0] - 2.5, xs[xs.len() - 1] + 2.5);
    let gap = xs.windows(2).map(|p| p[1] - p[0]).fold(f64::MAX, f64::min);
    let want = if gap.is_finite() && gap < f64::MAX { (INSET_GAP_MM / gap).ceil() } else { 2.0 };
    let widest = bounds.width() * 0.6;
    let k = want.clamp(2.0, 12.0).min((widest / (x1 - x0)).floor());
    if k < 2.0 {
        return None;
    }
    // The frame holds the magnified region, and is at least as wide as its title.
    let title = w.fill("inset_title", &[("factor", &format!("{k:.0}"))]);
    let title_w = crate::font::text_width_mm(&title, 6.5, Weight::Bold);
    let iw = (k * (x1 - x0)).max(title_w + 3.0);
    let pad = (iw - k * (x1 - x0)) / 2.0;
    // A free place for the inset: along the bottom, then the top, of the
    // drawing's room, nearest the marks first.
    let centre = (x0 + x1) / 2.0;
    let mut spots = Vec::new();
    let mut x = bounds.min.x + 1.0;
    while x + iw <= bounds.max.x - 1.0 {
        for y in [bounds.min.y + 1.0, bounds.max.y - ih - 1.0] {
            spots.push(Rect { min: Point::new(x, y), max: Point::new(x + iw, y + ih) });
        }
        x += 2.0;
    }
    spots.sort_by(|a, b| {
        let d = |r: &Rect| ((r.min.x + r.max.x) / 2.0 - centre).abs();
        d(a).total_cmp(&d(b))
    });
    let frame = *spots.iter().find(|r| base.placer.is_free(r, 2.0))?;
    // The sheet-frame region shown, and the map into the inset.
    let half = ih / k / 2.0;
    let region = Rect { min: Point::new(x0, -half), max: Point::new(x1, half) };
    let map = |p: Point| {
        Point::new(frame.min.x + pad + (p.x - region.min.x) * k, frame.min.y + (p.y - region.min.y) * k)
    };
    // In the drawing, a thin box round the marks shows what is magnified.
    let shown = Rect { min: Point::new(x0, -2.5), max: Point::new(x1, 2.5) };
    let mut out = vec![
        Item::Box { rect: frame, fill: Some(1.0), stroke: Some(Stroke::solid(0.3)) },
        Item::Box { rect: shown, fill: None, stroke: Some(Stroke::solid(0.15).gray(0.4)) },
    ];
    base.placer.block(frame);
    base.placer.block(shown);
    let mut local = crate::draw::Placer::default();
    let inner = Rect {
        min: Point::new(frame.min.x + 1.0, frame.min.y + 1.0),
        max: Point::new(frame.max.x - 1.0, frame.max.y - 5.5),
    };
    // The axis, then the rays' parts inside the region, thin.
    let axis = (map(Point::new(x0, 0.0)), map(Point::new(x1, 0.0)));
    out.push(Item::Line { from: axis.0, to: axis.1, stroke: Stroke::solid(THIN_W).dashed(AXIS_DASH) });
    local.block_soft_line(axis.0, axis.1);
    for r in plan.rays_top_down() {
        let tr = &r.trace;
        // Each ray as a short stub through its own crossing (6 mm either side
        // in the inset), enough to show how it meets the axis.
        let mut segs: Vec<(Point, Point, f64, bool)> = Vec::new();
        if let (Outcome::Virtual { x_mm }, Some((p, _))) = (tr.outcome, tr.exit) {
            segs.push((p, Point::new(x_mm, 0.0), x_mm, true));
        }
        if let Outcome::Crosses { x_mm } = tr.outcome {
            let last = *tr.path.last().unwrap_or(&tr.incoming.origin);
            let far = Point::new(x_mm, 0.0) + tr.exit_dir * 20.0;
            segs.push((last, far, x_mm, false));
        }
        for (a, b, x_mm, dashed) in segs {
            let c = map(Point::new(x_mm, 0.0));
            let stub = Rect {
                min: Point::new((c.x - 6.0).max(frame.min.x + 0.5), c.y - 6.0),
                max: Point::new((c.x + 6.0).min(frame.max.x - 0.5), c.y + 6.0),
            };
            let Some((a, b)) = crate::draw::clip_segment(map(a), map(b), &stub) else { continue };
            let stroke = if dashed {
                Stroke::solid(THIN_W).gray(0.25).dashed(LINE_DASH)
            } else {
                Stroke::solid(RAY_W).gray(0.25)
            };
            out.push(Item::Line { from: a, to: b, stroke });
            local.block_line(a, b);
        }
    }
    if let Some(f) = near_focus {
        let at = map(Point::new(f, 0.0));
        out.push(Item::Marker { at, shape: MarkerShape::Ring, size_mm: 2.4, stroke: Stroke::solid(0.25) });
        local.block(Rect::from_corners(at - Vec2::new(1.4, 1.4), at + Vec2::new(1.4, 1.4)));
    }
    let focus_at = near_focus.map(|f| map(Point::new(f, 0.0)));
    for m in marks {
        let at = map(Point::new(m.0, 0.0));
        out.push(Item::Marker { at, shape: MarkerShape::Saltire, size_mm: 2.6, stroke: Stroke::solid(0.3) });
        local.block(Rect::from_corners(at - Vec2::new(1.4, 1.4), at + Vec2::new(1.4, 1.4)));
    }
    // Each mark's full label, from the left (shifted to the inset's frame).
    for m in marks {
        let (full, _, _) = label_of(&[m]);
        let at = map(Point::new(m.0, 0.0));
        out.extend(inset_label(&mut local, &inner, &full, at)?);
    }
    // The focus's word (its value is in the key's text) after the marks' labels.
    if let Some(at) = focus_at {
        out.extend(inset_label(&mut local, &inner, w.say("paraxial_focus"), at)?);
    }
    out.push(text(
        Point::new(frame.min.x + 1.5, frame.max.y - 3.8),
        &title,
        6.5,
        Weight::Bold,
        Anchor::Start,
    ));
    Some(out)
}

/// A label in the inset above or below its mark, stacked further off until
/// it is free, centred on the mark or running off to either side of it, with
/// a leader from the mark once it stands 3 mm or more away.
fn inset_label(placer: &mut Placer, bounds: &Rect, s: &str, at: Point) -> Option<Vec<Item>> {
    for k in 0..6 {
        let dy = 3.2 + 3.4 * f64::from(k);
        for (y, up) in [(at.y + dy, true), (at.y - dy - 1.5, false)] {
            for (x, anchor) in
                [(at.x, Anchor::Middle), (at.x - 1.5, Anchor::Start), (at.x + 1.5, Anchor::End)]
            {
                let p = Point::new(x, y);
                let b = text_box(p, s, 6.5, Weight::Regular, anchor);
                if !(bounds.contains(b.min) && bounds.contains(b.max) && placer.is_free(&b, 0.3)) {
                    continue;
                }
                let near_y = if up { b.min.y } else { b.max.y };
                let dir = if up { 1.0 } else { -1.0 };
                let leader = ((near_y - at.y).abs() >= 3.0)
                    .then(|| (Point::new(at.x, at.y + dir * 1.6), Point::new(at.x, near_y - dir * 0.3)));
                if let Some((from, to)) = leader
                    && !placer.is_line_free(from, to)
                {
                    continue;
                }
                placer.block(b);
                let mut items = vec![text(p, s, 6.5, Weight::Regular, anchor)];
                if let Some((from, to)) = leader {
                    placer.block_line(from, to);
                    items.push(Item::Line { from, to, stroke: Stroke::solid(0.15).gray(0.35) });
                }
                return Some(items);
            }
        }
    }
    None
}

/// A value label straight above or below its mark on the axis, stacked
/// further off until it is free, with a leader (which may cross the traced
/// rays) once it stands 3 mm or more away; `None` when nothing is free.
fn stacked_label(placer: &mut Placer, bounds: &Rect, s: &str, at: Point) -> Option<Vec<Item>> {
    for k in 0..8 {
        let dy = 3.2 + 3.4 * f64::from(k);
        for p in [Point::new(at.x, at.y - dy - 1.5), Point::new(at.x, at.y + dy)] {
            let b = text_box(p, s, 6.5, Weight::Regular, Anchor::Middle);
            let inside = bounds.contains(b.min) && bounds.contains(b.max);
            if !inside || !placer.is_free(&b, 0.3) {
                continue;
            }
            let (near_y, dir) = if b.min.y > at.y { (b.min.y, 1.0) } else { (b.max.y, -1.0) };
            let leader = ((near_y - at.y).abs() >= 3.0)
                .then(|| (Point::new(at.x, at.y + dir * 1.6), Point::new(at.x, near_y - dir * 0.3)));
            // A leader runs straight to the label, past no other label.
            if let Some((from, to)) = leader {
                let span = Rect::from_corners(from, to);
                let clear = |r: &Rect| r.max.x < at.x || r.min.x > at.x || !r.overlaps(&span);
                if !placer.boxes().iter().all(clear) {
                    continue;
                }
            }
            placer.block(b);
            let mut items = vec![text(p, s, 6.5, Weight::Regular, Anchor::Middle)];
            if let Some((from, to)) = leader {
                placer.block_line(from, to);
                items.push(Item::Line { from, to, stroke: Stroke::solid(0.15).gray(0.35) });
            }
            return Some(items);
        }
    }
    None
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
