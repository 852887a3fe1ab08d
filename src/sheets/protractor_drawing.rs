//! The drawings of index and critical-angle sheets in the sheet frame (mm, y
//! up): a true-scale protractor round the flat face's centre, the normal, the
//! flat-face line, the half-disc's outline and the lettered guide lines; the
//! key's traced rays on top. Every value printed comes from the plan; nothing
//! here traces a ray.

use std::f64::consts::PI;

use super::angled_drawing::{block_spot, fmt1, label};
use super::angled_view::angle;
use super::protractor::{ProtractorPlan, RayOutcome, Side};
use crate::draw::style::{
    EXTENSION_DASH, GUIDE_W, LABEL_PT, LINE_DASH, OUTLINE_W, RAY_GRAY, RAY_W, THIN_W, VALUE_PT,
};
use crate::draw::{
    AngleScale, AngleTicks, Placer, Words, angle_ticks, path_points, place_near, shape_outline,
};
use crate::geom::{Point, Vec2};
use crate::scene::{Dash, Item, Rect, Stroke};

/// Length of the ray-box bar across each guide line's start, mm (shorter
/// than on block sheets: guides 10° apart are 10 mm apart at the bars).
const BAR_MM: f64 = 6.0;
/// Room kept round everything for labels, mm (sideways: the key's values at
/// the rays' ends; up and down).
const LABEL_ROOM_MM: (f64, f64) = (24.0, 6.0);
/// Dashes of the leader from a guide's start to its label.
const LEADER_DASH: Dash = Dash::Dashed { on_mm: 0.8, off_mm: 0.7 };

/// The two halves of the protractor: counted from the normal on the air side
/// (−x, including the 90° ticks) and on the curved side (+x), each both ways.
pub fn scales(plan: &ProtractorPlan) -> [AngleTicks; 2] {
    let r = plan.setup.scale_radius_mm;
    let c = Point::new(0.0, 0.0);
    [
        angle_ticks(&AngleScale {
            center: c,
            zero: Vec2::new(-1.0, 0.0),
            radius_mm: r,
            from_deg: -90.0,
            to_deg: 90.0,
        }),
        angle_ticks(&AngleScale {
            center: c,
            zero: Vec2::new(1.0, 0.0),
            radius_mm: r,
            from_deg: -89.0,
            to_deg: 89.0,
        }),
    ]
}

/// Everything the key draws for one ray: the path (guide start excluded) and
/// the reflected ray, each as a polyline.
struct KeyRay {
    letter: String,
    /// From where it enters the piece through the centre and on.
    path: Vec<Point>,
    /// The ray reflected at the flat face's centre (dashed unless total).
    reflected: Vec<Point>,
    outcome: RayOutcome,
}

/// A path from its points and final direction, carried on until it is
/// `reach` mm from the centre.
fn carried(points: &[Point], dir: Vec2, reach: f64) -> Vec<Point> {
    let mut out = points.to_vec();
    if let Some(&last) = points.last() {
        // Solve |last + s·dir| = reach for s ≥ 0.
        let b = last.to_vec().dot(dir);
        let c = last.to_vec().dot(last.to_vec()) - reach * reach;
        let disc = b * b - c;
        let s = if disc > 0.0 { (-b + disc.sqrt()).max(0.0) } else { 0.0 };
        if s > 1e-9 {
            out.push(last + dir * s);
        }
    }
    out
}

/// Every guide ray's path as the key draws it (from where it enters to
/// where it leaves the protractor's reach: refracted, or totally reflected),
/// as (letter, points in the sheet frame): what a colour of the ray box
/// draws on an `all_colours` key.
pub fn ray_paths(plan: &ProtractorPlan) -> Vec<(String, Vec<Point>)> {
    key_rays(plan).into_iter().map(|k| (k.letter, k.path)).collect()
}

fn key_rays(plan: &ProtractorPlan) -> Vec<KeyRay> {
    let reach = plan.setup.lead_mm;
    plan.rays
        .iter()
        .map(|r| {
            let entry: Vec<Point> = r.trace.events.first().map(|e| vec![e.at]).unwrap_or_default();
            let path = match &r.onward {
                Some((pts, dir)) => {
                    let mut p = entry.clone();
                    p.extend(carried(pts, *dir, reach));
                    p
                }
                None => {
                    let mut p: Vec<Point> = r.trace.points().collect();
                    if let Some(o) = r.trace.outgoing() {
                        p = carried(&p, o.dir, reach);
                    }
                    p
                }
            };
            let reflected = if r.outcome == RayOutcome::Refracts {
                carried(&r.reflected.0, r.reflected.1, reach)
            } else {
                Vec::new()
            };
            KeyRay { letter: r.letter.clone(), path, reflected, outcome: r.outcome }
        })
        .collect()
}

/// The box (sheet frame) both drawings need: the protractor with its
/// numbers, the guide lines and bars, the key's rays, and room for labels.
pub fn extent(plan: &ProtractorPlan) -> (Point, Point) {
    let s = &plan.setup;
    let mut pts = Vec::new();
    for t in scales(plan) {
        pts.extend(t.ticks.iter().map(|t| t.outer));
        for n in &t.numbers {
            pts.extend([n.center + Vec2::new(2.5, 1.5), n.center - Vec2::new(2.5, 1.5)]);
        }
    }
    for r in &plan.rays {
        let g = r.trace.incoming;
        let across = g.dir.perp() * (BAR_MM / 2.0);
        pts.extend([g.origin + across, g.origin - across]);
    }
    for k in key_rays(plan) {
        pts.extend(k.path.iter().chain(&k.reflected));
    }
    let (lo, hi) = s.shape.bounds();
    pts.extend([lo, hi]);
    let (mut min, mut max) =
        (Point::new(f64::INFINITY, f64::INFINITY), Point::new(f64::NEG_INFINITY, f64::NEG_INFINITY));
    for p in pts.iter().filter(|p| p.x.is_finite() && p.y.is_finite()) {
        min = Point::new(min.x.min(p.x), min.y.min(p.y));
        max = Point::new(max.x.max(p.x), max.y.max(p.y));
    }
    (
        Point::new(min.x - LABEL_ROOM_MM.0, min.y - LABEL_ROOM_MM.1),
        Point::new(max.x + LABEL_ROOM_MM.0, max.y + LABEL_ROOM_MM.1),
    )
}

fn line(from: Point, to: Point, stroke: Stroke) -> Item {
    Item::Line { from, to, stroke }
}

/// Blocks what the key will draw, so the sheet's labels keep off it too.
fn block_key(placer: &mut Placer, keys: &[KeyRay]) {
    for k in keys {
        placer.block_path(&k.path);
        placer.block_soft_path(&k.reflected);
    }
}

/// The student drawing: the half-disc's outline; the protractor (a circle,
/// a tick every degree, longer every 5°, numbers every 10° counted from the
/// normal both ways on both sides); the normal and the flat-face line across
/// it; each guide line from its ray-box bar to the centre, with an arrowhead
/// and its letter and angle ("A 30°"). Numbers crossed by a guide move aside.
pub fn student(plan: &ProtractorPlan, bounds: &Rect, placer: &mut Placer, w: &Words) -> Vec<Item> {
    let s = &plan.setup;
    let c = Point::new(0.0, 0.0);
    let p = s.scale_radius_mm;
    let mut items = vec![shape_outline(&s.shape, Stroke::solid(OUTLINE_W))];
    placer.block_soft_path(&path_points(&s.shape));
    items.push(Item::Arc {
        center: c,
        radius_mm: p,
        start_rad: 0.0,
        sweep_rad: 2.0 * PI,
        stroke: Stroke::solid(THIN_W),
    });
    let ring: Vec<Point> =
        (0..=72).map(|k| c + Vec2::from_angle(f64::from(k) * 5f64.to_radians()) * p).collect();
    placer.block_path(&ring);
    // The normal (dashed) and the flat-face line, each across the protractor.
    let normal = (Point::new(-p, 0.0), Point::new(p, 0.0));
    items.push(line(normal.0, normal.1, Stroke::solid(THIN_W).dashed(LINE_DASH)));
    placer.block_soft_line(normal.0, normal.1);
    let flat = (Point::new(0.0, -p), Point::new(0.0, p));
    items.push(line(flat.0, flat.1, Stroke::solid(THIN_W)));
    placer.block_line(flat.0, flat.1);
    let sc = scales(plan);
    for t in &sc {
        items.extend(t.tick_items());
        t.block_ticks(placer);
    }
    for r in &plan.rays {
        let g = r.trace.incoming;
        items.push(line(g.origin, c, Stroke::solid(GUIDE_W)));
        placer.block_line(g.origin, c);
        let across = g.dir.perp() * (BAR_MM / 2.0);
        items.push(line(g.origin + across, g.origin - across, Stroke::solid(0.8).gray(0.3)));
        placer.block(Rect::from_corners(g.origin + across, g.origin - across));
        // The arrowhead between the bar and the scale's numbers.
        let tip = g.origin + g.dir * 6.0;
        items.push(Item::Arrowhead { tip, dir: g.dir, length_mm: 3.0, width_mm: 1.8, gray: 0.0 });
        block_spot(placer, tip - g.dir * 1.5, 1.6);
    }
    block_key(placer, &key_rays(plan));
    for t in &sc {
        items.extend(t.place_numbers(placer, bounds));
    }
    for r in &plan.rays {
        let g = r.trace.incoming;
        let s = format!("{} {}", r.letter, angle(r.incidence_deg));
        guide_label(&mut items, placer, bounds, &s, g.origin, g.dir);
    }
    let inner = p * 0.72;
    let air = if s.side == Side::Curved { -1.0 } else { 1.0 };
    label(
        &mut items,
        placer,
        bounds,
        w.say("normal"),
        LABEL_PT,
        Point::new(-air * inner, 0.0),
        Vec2::new(0.0, -1.0),
    );
    label(
        &mut items,
        placer,
        bounds,
        w.say("flat_face"),
        LABEL_PT,
        Point::new(0.0, -s.radius_mm * 0.8),
        Vec2::new(1.0, 0.0),
    );
    if let Some(r) = plan.rays.last() {
        let g = r.trace.incoming;
        label(&mut items, placer, bounds, w.say("ray_box"), LABEL_PT, g.origin - g.dir * 0.5, -g.dir);
    }
    items
}

/// A guide's label beside its start, else behind it along the guide (with a
/// dotted leader), else left out.
fn guide_label(items: &mut Vec<Item>, placer: &mut Placer, bounds: &Rect, s: &str, start: Point, dir: Vec2) {
    // Away from the normal: the guides come in above it.
    let side = if dir.perp().y > 0.0 { dir.perp() } else { -dir.perp() };
    if let Some(mut it) = place_near(placer, bounds, s, LABEL_PT, start, side) {
        items.append(&mut it);
        return;
    }
    for k in 1..=6 {
        let at = start - dir * (3.0 + 4.0 * f64::from(k));
        if !placer.is_line_free(start, at) {
            continue;
        }
        if let Some(mut it) = place_near(placer, bounds, s, LABEL_PT, at, -dir) {
            items.push(line(start, at, Stroke::solid(THIN_W).dashed(LEADER_DASH)));
            placer.block_line(start, at);
            items.append(&mut it);
            return;
        }
    }
}

/// What the key adds: each ray's exact path through the centre and on to the
/// edge of the drawing, its letter and angle ("A: r = 19.6° ± 2.1°"), the ray
/// reflected at the flat face (thin dashes where part of the light is
/// reflected; the path itself where all of it is), named where it is total.
pub fn key(plan: &ProtractorPlan, bounds: &Rect, placer: &mut Placer, w: &Words) -> Vec<Item> {
    let keys = key_rays(plan);
    block_key(placer, &keys);
    let mut items = Vec::new();
    let ray_stroke = Stroke::solid(RAY_W).gray(RAY_GRAY);
    let part_stroke = Stroke::solid(THIN_W).gray(0.35).dashed(EXTENSION_DASH);
    for k in &keys {
        if k.path.len() >= 2 {
            items.push(Item::Polyline { points: k.path.clone(), closed: false, stroke: ray_stroke });
        }
        if k.reflected.len() >= 2 {
            items.push(Item::Polyline { points: k.reflected.clone(), closed: false, stroke: part_stroke });
        }
    }
    for (k, r) in keys.iter().zip(&plan.rays) {
        let Some((&end, &before)) = k.path.last().zip(k.path.iter().rev().nth(1)) else { continue };
        let u = (end - before).normalized().unwrap_or(Vec2::new(-1.0, 0.0));
        let s = match (k.outcome, r.refraction_deg) {
            (RayOutcome::Refracts, Ok(v)) => w.fill(
                "protractor_ray_label",
                &[("ray", &k.letter), ("value", &fmt1(v)), ("range", &fmt1(r.tolerance.total_deg))],
            ),
            (RayOutcome::TotalReflection, _) => w.fill("total_reflection_label", &[("rays", &k.letter)]),
            _ => w.fill("what_happened", &[("ray", &k.letter), ("what", w.say("happened_off_path"))]),
        };
        // At the ray's end, else further back along it (still outside the scale).
        let back = end.distance(before).min(plan.setup.lead_mm - plan.setup.scale_radius_mm);
        for t in [0.0, 0.25, 0.5, 0.75] {
            if let Some(mut it) = place_near(placer, bounds, &s, VALUE_PT, end - u * (t * back), u.perp()) {
                items.append(&mut it);
                break;
            }
        }
    }
    items
}

/// The sine plot's frame (page mm, inside `rect`), its axes' ticks and
/// numbers and titles, and the map from (sin in acrylic, sin in air) to the page.
fn sine_frame(rect: Rect, title: &str, w: &Words, grid: bool) -> (Vec<Item>, Rect) {
    // The title on one line at 7 pt, else at 6.5 pt, else wrapped at 6.5 pt.
    let bold = crate::scene::Weight::Bold;
    let (title_pt, title_lines) = if crate::font::text_width_mm(title, VALUE_PT, bold) <= rect.width() {
        (VALUE_PT, vec![title.to_string()])
    } else {
        let small = crate::draw::style::SMALL_PT;
        (small, crate::draw::wrap(title, small, bold, rect.width()))
    };
    let title_lead = crate::draw::leading(title_pt);
    let title_room = title_lead * title_lines.len() as f64;
    let inner = Rect {
        min: Point::new(rect.min.x + 11.0, rect.min.y + 9.0),
        max: Point::new(rect.max.x - 3.0, rect.max.y - 3.0 - title_room),
    };
    // Keep the plot no wider than twice its height, so its slope reads true enough.
    let inner = Rect {
        min: inner.min,
        max: Point::new(inner.max.x.min(inner.min.x + 2.2 * inner.height()), inner.max.y),
    };
    let frame = Stroke::solid(0.2);
    let mut items = vec![Item::Box { rect: inner, fill: None, stroke: Some(frame) }];
    let map = |x: f64, y: f64| Point::new(inner.min.x + x * inner.width(), inner.min.y + y * inner.height());
    for k in 0..=10 {
        let v = f64::from(k) / 10.0;
        let (px, py) = (map(v, 0.0), map(0.0, v));
        if grid && k > 0 && k < 10 {
            let g = Stroke::solid(0.1).gray(0.55);
            items.push(line(px, map(v, 1.0), g));
            items.push(line(py, map(1.0, v), g));
        }
        items.push(line(px, Point::new(px.x, px.y - 1.0), frame));
        items.push(line(py, Point::new(py.x - 1.0, py.y), frame));
        if k % 2 == 0 {
            let t = format!("{v:.1}");
            items.push(crate::draw::text(
                Point::new(px.x, px.y - 3.6),
                &t,
                crate::draw::style::SMALL_PT,
                crate::scene::Weight::Regular,
                crate::scene::Anchor::Middle,
            ));
            items.push(crate::draw::text(
                Point::new(py.x - 1.5, py.y - 0.8),
                &t,
                crate::draw::style::SMALL_PT,
                crate::scene::Weight::Regular,
                crate::scene::Anchor::End,
            ));
        }
    }
    for (k, l) in title_lines.iter().enumerate() {
        let y = rect.max.y - 1.0 - title_lead * (k as f64 + 1.0) + title_lead * 0.25;
        items.push(crate::draw::text(
            Point::new(rect.min.x, y),
            l,
            title_pt,
            bold,
            crate::scene::Anchor::Start,
        ));
    }
    items.push(crate::draw::text(
        Point::new((inner.min.x + inner.max.x) / 2.0, rect.min.y + 1.2),
        w.say("plot_sine_acrylic_axis"),
        crate::draw::style::SMALL_PT,
        crate::scene::Weight::Regular,
        crate::scene::Anchor::Middle,
    ));
    items.push(Item::Text {
        at: Point::new(rect.min.x + 2.4, (inner.min.y + inner.max.y) / 2.0),
        text: w.say("plot_sine_air_axis").into(),
        size_pt: crate::draw::style::SMALL_PT,
        weight: crate::scene::Weight::Regular,
        anchor: crate::scene::Anchor::Middle,
        rotate_deg: 90.0,
        gray: 0.0,
    });
    (items, inner)
}

/// The student's blank grid for sin (air) against sin (acrylic), both 0 to 1.
pub fn student_plot(rect: Rect, w: &Words) -> Vec<Item> {
    if rect.width() < 40.0 || rect.height() < 25.0 {
        return Vec::new();
    }
    sine_frame(rect, w.say("plot_sine_title_student"), w, true).0
}

/// The key's plot on the same axes: the line of slope n up to the critical
/// angle (sin = 1 in air), each refracted ray's point with its letter, and
/// the critical angle marked where the line meets the top.
pub fn key_plot(plan: &ProtractorPlan, rect: Rect, w: &Words) -> Vec<Item> {
    if rect.width() < 40.0 || rect.height() < 25.0 {
        return Vec::new();
    }
    let n = plan.setup.index;
    let title = w.fill("plot_sine_title_key", &[("index", &crate::plan::fmt_index(n))]);
    let (mut items, inner) = sine_frame(rect, &title, w, false);
    let map = |x: f64, y: f64| Point::new(inner.min.x + x * inner.width(), inner.min.y + y * inner.height());
    let mut placer = Placer::default();
    placer.block_path(&[
        inner.min,
        Point::new(inner.max.x, inner.min.y),
        inner.max,
        Point::new(inner.min.x, inner.max.y),
        inner.min,
    ]);
    let top = map(1.0 / n, 1.0);
    items.push(line(map(0.0, 0.0), top, Stroke::solid(0.35)));
    placer.block_line(map(0.0, 0.0), top);
    let room = Rect {
        min: Point::new(inner.min.x + 0.5, inner.min.y + 0.5),
        max: Point::new(inner.max.x - 0.5, inner.max.y - 0.5),
    };
    items.push(Item::Marker {
        at: top,
        shape: crate::scene::MarkerShape::Ring,
        size_mm: 2.4,
        stroke: Stroke::solid(0.25),
    });
    block_spot(&mut placer, top, 1.3);
    let dots: Vec<(Point, &str)> = plan
        .rays
        .iter()
        .filter_map(|r| r.sines(plan.setup.side).map(|(x, y)| (map(x, y), r.letter.as_str())))
        .collect();
    for &(at, _) in &dots {
        items.push(Item::Marker {
            at,
            shape: crate::scene::MarkerShape::Dot,
            size_mm: 1.4,
            stroke: Stroke::solid(0.2),
        });
        block_spot(&mut placer, at, 0.8);
    }
    let crit = w.fill("plot_critical", &[("critical", &fmt1(plan.critical_deg()))]);
    label(&mut items, &mut placer, &room, &crit, crate::draw::style::SMALL_PT, top, Vec2::new(1.0, -0.6));
    for &(at, letter) in &dots {
        label(&mut items, &mut placer, &room, letter, crate::draw::style::SMALL_PT, at, Vec2::new(1.0, -1.0));
    }
    items
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::optics::{Face, Lens};
    use crate::sheets::angled::AngleRules;
    use crate::sheets::protractor::ProtractorSetup;

    fn plan(side: Side, angles: &[f64]) -> ProtractorPlan {
        let lens = Lens::new(Face::Flat, Face::Convex { radius_mm: 38.0 }, 38.0, 76.0, 1.491).unwrap();
        ProtractorPlan::new(
            ProtractorSetup::new(&lens, side).unwrap(),
            AngleRules::for_ray_width(2.0),
            angles,
        )
    }

    /// The printed numbers of the student drawing and every label of both drawings.
    fn draw(p: &ProtractorPlan) -> (Vec<String>, Vec<String>) {
        let (lo, hi) = extent(p);
        let bounds = Rect { min: lo, max: hi };
        let mut placer = Placer::default();
        let w = Words::shipped();
        let s = student(p, &bounds, &mut placer, &w);
        let k = key(p, &bounds, &mut placer, &w);
        let texts = |items: &[Item]| -> Vec<String> {
            items
                .iter()
                .filter_map(|i| match i {
                    Item::Text { text, .. } => Some(text.clone()),
                    _ => None,
                })
                .collect()
        };
        let numbers = texts(&s).into_iter().filter(|t| t.parse::<u32>().is_ok()).collect();
        (numbers, [texts(&s), texts(&k)].concat())
    }

    #[test]
    fn every_number_round_the_protractor_prints_even_where_guides_cross_it() {
        // 19 numbers on the air side (90, 80 … 0 … 80, 90), 17 on the other (80 … 0 … 80).
        for (side, angles) in [
            (Side::Curved, vec![10.0, 20.0, 30.0, 50.0]),
            (Side::Flat, vec![10.0, 20.0, 30.0, 40.0, 50.0, 60.0]),
            // The critical-angle sheet's guides lie 1° apart.
            (Side::Curved, vec![39.0, 40.0, 44.0, 45.0]),
            (Side::Curved, vec![40.0, 41.0, 43.0, 44.0]),
        ] {
            let p = plan(side, &angles);
            let (numbers, labels) = draw(&p);
            assert_eq!(numbers.len(), 36, "{side:?} {angles:?}: {numbers:?}");
            for r in &p.rays {
                let guide = format!("{} {}", r.letter, angle(r.incidence_deg));
                assert!(labels.contains(&guide), "{guide:?} in {labels:?}");
                assert!(
                    labels.iter().any(|l| l.starts_with(&format!("{}: ", r.letter))),
                    "{} named on the key: {side:?} {angles:?} {labels:?}",
                    r.letter
                );
            }
        }
    }

    #[test]
    fn staggered_guides_start_apart() {
        let p = plan(Side::Curved, &[39.0, 40.0, 44.0, 45.0]);
        let starts: Vec<Point> = p.rays.iter().map(|r| r.trace.incoming.origin).collect();
        for (k, a) in starts.iter().enumerate() {
            for b in &starts[k + 1..] {
                assert!(a.distance(*b) > BAR_MM, "{starts:?}");
            }
        }
    }
}
