//! The drawings of block and prism sheets in the sheet frame (mm, y up): the
//! student's outline, normal, angle scale and guide lines, what the key adds
//! on top. The key's plot of deviation against the angle of incidence is in
//! `deviation_plot.rs`, re-exported here.
//!
//! Every value printed comes from the plan; nothing here traces a ray.

use super::angled::{AngledPlan, AngledRay, Expected};
use super::angled_view::FaceName;
pub use super::deviation_plot::deviation_plot;
use crate::draw::style::{
    EXTENSION_DASH, GUIDE_W, LABEL_PT, LINE_DASH, OUTLINE_W, RAY_GRAY, RAY_W, THIN_W, VALUE_PT,
};
use crate::draw::{
    AngleScale, AngleTicks, Placer, Words, angle_ticks, path_points, place_lines_near, place_near,
    shape_outline,
};
use crate::geom::{Point, Ray, Vec2};
use crate::optics::{End, EventKind};
use crate::scene::{Dash, Item, MarkerShape, Rect, Stroke};

/// Half the range of the student's angle scale when some ray is more than
/// 10° from the normal, degrees (the scale then spans the usual protractor
/// readings; our choice).
const FAN_WIDE_DEG: f64 = 80.0;
/// Half the range when every ray is within 10° of the normal (a right-angle
/// prism), degrees: a narrow scale keeps the drawing uncluttered. A sheet
/// without rays gets the wide scale.
const FAN_NARROW_DEG: f64 = 20.0;
/// Distance of the scale's ticks from the entry point, as a share of the guide
/// line's length (so the scale lies between the ray box and the piece).
const FAN_RADIUS_SHARE: f64 = 0.55;
/// How far the normal reaches past the scale's numbers, mm.
const NORMAL_PAST_SCALE_MM: f64 = 5.0;
/// Longest part of the normal drawn inside the piece, mm.
const NORMAL_INSIDE_MM: f64 = 30.0;
/// Length of the ray-box bar across each guide line's start, mm.
const BAR_MM: f64 = 8.0;
/// Radius of the smallest arc for the angle of refraction, mm; each further
/// ray's arc (in order of the angle) is [`ARC_STEP_MM`] larger.
const R_ARC_MM: f64 = 9.0;
/// Step between the refraction arcs of successive rays, mm.
const ARC_STEP_MM: f64 = 3.5;
/// Radius of the smallest emergence-angle arc, mm (further ones step by [`ARC_STEP_MM`]).
const E_ARC_MM: f64 = 7.0;
/// Gap between the largest emergence arc and the smallest deviation arc, mm.
const DEV_ARC_GAP_MM: f64 = 5.0;
/// Length of the normal drawn inside the piece at the exit point, mm.
const EXIT_NORMAL_IN_MM: f64 = 4.0;
/// How far the incoming line's extension reaches past the lateral shift's dimension line, mm.
const SHIFT_PAST_MM: f64 = 6.0;
/// The exit normals: shorter dashes than the entry normal, as they are short and may lie close together.
const EXIT_NORMAL_DASH: Dash = Dash::Dashed { on_mm: 1.5, off_mm: 1.0 };
/// Angles smaller than this get no arc (only their value), degrees.
const MIN_ARC_DEG: f64 = 0.5;
/// Room kept round everything for labels, mm (sideways, up and down).
const LABEL_ROOM_MM: (f64, f64) = (12.0, 6.0);

/// A circular arc to draw, angles counterclockwise from +x.
#[derive(Clone, Copy, Debug, PartialEq)]
struct ArcSpec {
    center: Point,
    radius: f64,
    start_rad: f64,
    sweep_rad: f64,
}

impl ArcSpec {
    /// The point a share `t` (0 to 1) of the way along the arc.
    fn point(&self, t: f64) -> Point {
        self.center + Vec2::from_angle(self.start_rad + t * self.sweep_rad) * self.radius
    }

    /// Unit direction from the centre to the arc's middle.
    fn mid_dir(&self) -> Vec2 {
        Vec2::from_angle(self.start_rad + self.sweep_rad / 2.0)
    }

    /// The arc cut into chords of at most 5°.
    fn chords(&self) -> Vec<Point> {
        let n = (self.sweep_rad.abs() / 5f64.to_radians()).ceil().clamp(1.0, 72.0);
        let mut pts = Vec::new();
        let mut k = 0.0;
        while k <= n {
            pts.push(self.point(k / n));
            k += 1.0;
        }
        pts
    }

    fn item(&self) -> Item {
        Item::Arc {
            center: self.center,
            radius_mm: self.radius,
            start_rad: self.start_rad,
            sweep_rad: self.sweep_rad,
            stroke: Stroke::solid(THIN_W),
        }
    }
}

/// A guide line on the student sheet.
struct Guide {
    letter: String,
    incidence_deg: f64,
    start: Point,
    dir: Vec2,
}

/// What the student drawing is made of, before labels.
struct Sketch {
    entry: Point,
    outward: Vec2,
    ticks: AngleTicks,
    /// Inside end, outside end.
    normal: (Point, Point),
    guides: Vec<Guide>,
    /// Distance of the guide arrowheads' tips from the entry point, mm.
    arrow_mm: f64,
}

/// Half the angle scale's range for these rays, degrees.
fn fan_half_deg<F>(plan: &AngledPlan<F>) -> f64 {
    let widest =
        plan.rays.iter().map(|r| r.incidence_deg.abs()).filter(|a| a.is_finite()).fold(0.0, f64::max);
    if !plan.rays.is_empty() && widest <= 10.0 {
        FAN_NARROW_DEG
    } else {
        FAN_WIDE_DEG.max((widest / 5.0).ceil() * 5.0).min(89.0)
    }
}

fn sketch<F: Copy + PartialEq>(plan: &AngledPlan<F>) -> Sketch {
    let s = &plan.setup;
    let outward = s.outward.normalized().unwrap_or(Vec2::new(-1.0, 0.0));
    let half = fan_half_deg(plan);
    let radius = (FAN_RADIUS_SHARE * s.lead_mm).max(15.0);
    let ticks = angle_ticks(&AngleScale {
        center: s.entry_point,
        zero: outward,
        radius_mm: radius,
        from_deg: -half,
        to_deg: half,
    });
    // The numbers' outer reach along the normal.
    let scale_reach =
        ticks.numbers.iter().map(|n| n.center.distance(s.entry_point) + 2.0).fold(radius + 4.0, f64::max);
    // Inside: across the piece along the normal, at most NORMAL_INSIDE_MM.
    let inward = -outward;
    let chord = s
        .shape
        .nearest_hit(&Ray { origin: s.entry_point, dir: inward }, 1e-6)
        .map_or(NORMAL_INSIDE_MM, |h| h.s);
    let normal = (
        s.entry_point + inward * chord.min(NORMAL_INSIDE_MM),
        s.entry_point + outward * (scale_reach + NORMAL_PAST_SCALE_MM),
    );
    let guides = plan
        .rays
        .iter()
        .map(|r| Guide {
            letter: r.letter.clone(),
            incidence_deg: r.incidence_deg,
            start: r.trace.incoming.origin,
            dir: r.trace.incoming.dir,
        })
        .collect();
    let arrow_mm = (s.lead_mm + scale_reach) / 2.0;
    Sketch { entry: s.entry_point, outward, ticks, normal, guides, arrow_mm }
}

/// Everything the key draws for one ray, before labels.
#[derive(Clone, Debug, Default)]
struct KeyRay {
    letter: String,
    /// Entry point, every event, exit point.
    inside: Vec<Point>,
    /// The emergent ray to its drawn length.
    emergent: Option<(Point, Point)>,
    /// The incoming line extended forward (dashed).
    extension: Option<(Point, Point)>,
    /// The emergent ray extended backward to where it meets the incoming line (dashed).
    back: Option<(Point, Point)>,
    /// The refraction arc at the entry point.
    r_arc: Option<ArcSpec>,
    /// The deviation arc between the extended incoming line and the emergent ray.
    dev_arc: Option<ArcSpec>,
    /// Where the ray leaves (a prism): the point, the face's outward normal, the emergent direction.
    exit: Option<(Point, Vec2, Vec2)>,
    /// The normal at the exit point (dashed) and the emergence arc.
    exit_normal: Option<(Point, Point)>,
    e_arc: Option<ArcSpec>,
    /// Where the extended incoming line meets the emergent ray (a prism).
    vertex: Option<Point>,
    /// Total reflections.
    rings: Vec<Point>,
    /// The lateral shift's dimension line: on the emergent ray, on the extension.
    shift: Option<(Point, Point)>,
    /// Whether this ray shows a lateral shift, a deviation or a turn.
    show: Show,
}

#[derive(Clone, Copy, Debug, Default, PartialEq)]
enum Show {
    /// Nothing beyond the path (the ray took another path, or missed).
    #[default]
    Path,
    /// A parallel emergent ray: the lateral shift.
    Shift,
    /// A prism's deviation.
    Deviation,
    /// A right-angle prism's turn.
    Turn,
}

impl KeyRay {
    /// The rays, arcs and dimension line (arcs as chords): leaders keep off them.
    fn hard_segments(&self) -> Vec<(Point, Point)> {
        let mut out: Vec<(Point, Point)> = self.inside.windows(2).map(|w| (w[0], w[1])).collect();
        out.extend(self.emergent);
        out.extend(self.shift);
        for a in [self.r_arc, self.dev_arc, self.e_arc].into_iter().flatten() {
            out.extend(a.chords().windows(2).map(|w| (w[0], w[1])));
        }
        out
    }

    /// The dashed construction lines: leaders may cross them.
    fn soft_segments(&self) -> Vec<(Point, Point)> {
        [self.extension, self.back, self.exit_normal].into_iter().flatten().collect()
    }

    /// Every straight piece this ray's key drawing puts on paper.
    fn segments(&self) -> Vec<(Point, Point)> {
        let mut out = self.hard_segments();
        out.extend(self.soft_segments());
        out
    }
}

/// Where the lines `a + s·u` and `b + t·v` meet, as (s, t); `None` when parallel.
fn meet(a: Point, u: Vec2, b: Point, v: Vec2) -> Option<(f64, f64)> {
    let den = u.cross(v);
    if den.abs() < 1e-9 {
        return None;
    }
    let w = b - a;
    Some((w.cross(v) / den, w.cross(u) / den))
}

/// The arc from direction `from` to direction `to` about `center`, or `None`
/// when the angle between them is below [`MIN_ARC_DEG`].
fn angle_arc(center: Point, radius: f64, from: Vec2, to: Vec2) -> Option<ArcSpec> {
    let sweep = from.signed_angle_to(to);
    (sweep.abs().to_degrees() >= MIN_ARC_DEG && radius > 0.0).then(|| ArcSpec {
        center,
        radius,
        start_rad: from.angle_rad(),
        sweep_rad: sweep,
    })
}

/// Indices of the rays with a value, ordered by its size: arcs sharing a
/// vertex (or nearly) grow in this order, so they nest without crossing.
fn by_size(values: impl Iterator<Item = (usize, Option<f64>)>) -> Vec<usize> {
    let mut v: Vec<(usize, f64)> = values.filter_map(|(k, a)| a.map(|a| (k, a.abs()))).collect();
    v.sort_by(|a, b| a.1.total_cmp(&b.1));
    v.into_iter().map(|(k, _)| k).collect()
}

/// Each guide ray's path as the key draws it (letter, points): from the entry
/// point through every event to the emergent ray's drawn end.
pub fn ray_paths<F: Copy + PartialEq>(plan: &AngledPlan<F>) -> Vec<(String, Vec<Point>)> {
    key_rays(plan)
        .into_iter()
        .map(|k| {
            let mut pts = k.inside;
            if let Some((a, b)) = k.emergent {
                if pts.last().is_none_or(|p| p.distance(a) > 1e-9) {
                    pts.push(a);
                }
                pts.push(b);
            }
            (k.letter, pts)
        })
        .collect()
}

fn key_rays<F: Copy + PartialEq>(plan: &AngledPlan<F>) -> Vec<KeyRay> {
    let s = &plan.setup;
    let mut out: Vec<KeyRay> = plan.rays.iter().map(|r| one_key_ray(plan, r)).collect();
    // Refraction arcs at the shared entry point.
    let order = by_size(plan.rays.iter().enumerate().map(|(k, r)| (k, r.refraction_deg.ok())));
    for (rank, k) in order.into_iter().enumerate() {
        let Some(first) = plan.rays[k].trace.events.first().filter(|e| e.kind == EventKind::Enter) else {
            continue;
        };
        let radius = R_ARC_MM + ARC_STEP_MM * rank as f64;
        out[k].r_arc = angle_arc(first.at, radius, -first.outward, first.dir_out);
    }
    // Emergence arcs at the exit points (close together on a prism's second side).
    let order =
        by_size(plan.rays.iter().enumerate().map(|(k, r)| (k, out[k].exit.and(r.emergence_deg.ok()))));
    let mut e_outer: f64 = 0.0;
    for (rank, k) in order.into_iter().enumerate() {
        let Some((at, n, d_out)) = out[k].exit else { continue };
        let radius = E_ARC_MM + ARC_STEP_MM * rank as f64;
        e_outer = e_outer.max(radius);
        out[k].exit_normal = Some((at - n * EXIT_NORMAL_IN_MM, at + n * (radius + 3.0)));
        out[k].e_arc = angle_arc(at, radius, n, d_out);
    }
    // Deviation arcs where each incoming line meets its emergent ray, beyond
    // the emergence arcs.
    let reach = out.iter().filter_map(|k| Some(k.vertex?.distance(k.exit?.0))).fold(0.0, f64::max);
    let order =
        by_size(plan.rays.iter().enumerate().map(|(k, r)| (k, out[k].vertex.and(r.deviation_deg.ok()))));
    for (rank, k) in order.into_iter().enumerate() {
        let (Some(x), Some((exit, _, d_out))) = (out[k].vertex, out[k].exit) else { continue };
        let d_in = plan.rays[k].trace.incoming.dir;
        let entry = out[k].inside.first().copied().unwrap_or(s.entry_point);
        let radius = reach + e_outer + DEV_ARC_GAP_MM + ARC_STEP_MM * rank as f64;
        out[k].extension = Some((entry, x + d_in * (radius + 3.0)));
        if (x - exit).dot(d_out) < 0.0 {
            out[k].back = Some((exit, x));
        }
        out[k].dev_arc = angle_arc(x, radius, d_in, d_out);
    }
    choose_shift_lines(&mut out, s.out_mm, &path_points(&s.shape));
    out
}

fn one_key_ray<F: Copy + PartialEq>(plan: &AngledPlan<F>, r: &AngledRay<F>) -> KeyRay {
    let s = &plan.setup;
    let tr = &r.trace;
    let mut k = KeyRay { letter: r.letter.clone(), ..KeyRay::default() };
    k.inside = tr.events.iter().map(|e| e.at).collect();
    k.rings = tr.events.iter().filter(|e| e.kind == EventKind::TotalReflection).map(|e| e.at).collect();
    let End::Left { at: exit, dir: d_out, .. } = tr.end else { return k };
    let em_end = exit + d_out * s.out_mm;
    k.emergent = Some((exit, em_end));
    if !r.path_ok {
        return k;
    }
    let entry = tr.events.first().map_or(s.entry_point, |e| e.at);
    let d_in = tr.incoming.dir;
    if r.lateral_shift_mm.is_ok() {
        // The incoming line carried on through and past the piece (cut short
        // once the dimension line is placed).
        let reach = (em_end - entry).dot(d_in) + 3.0;
        if reach > 0.0 {
            k.extension = Some((entry, entry + d_in * reach));
            k.show = Show::Shift;
        }
        return k;
    }
    if let Some(e) = tr.events.iter().rev().find(|e| e.kind == EventKind::Leave) {
        k.exit = Some((e.at, e.outward, e.dir_out));
    }
    match s.expected {
        Expected::Turn { .. } => k.show = Show::Turn,
        Expected::Refract { .. } if r.deviation_deg.is_ok() => {
            k.show = Show::Deviation;
            k.vertex = meet(entry, d_in, exit, d_out).map(|(t_in, _)| entry + d_in * t_in);
        }
        Expected::Refract { .. } => {}
    }
    k
}

/// Picks, for each ray showing a lateral shift, where along its emergent ray
/// the dimension line goes: the first of a few spots where it crosses no other
/// ray's lines, no other dimension line and not the outline. The incoming
/// line's extension is then cut to end a little past the dimension line.
fn choose_shift_lines(rays: &mut [KeyRay], out_mm: f64, outline: &[Point]) {
    for k in 0..rays.len() {
        let (Some((exit, em_end)), Some((a, b))) = (rays[k].emergent, rays[k].extension) else { continue };
        if rays[k].show != Show::Shift {
            continue;
        }
        let mut others = Placer::default();
        others.block_path(outline);
        for (j, o) in rays.iter().enumerate() {
            let segs =
                if j == k { o.inside.windows(2).map(|w| (w[0], w[1])).collect() } else { o.segments() };
            for (p, q) in segs {
                others.block_line(p, q);
            }
        }
        let dir = (em_end - exit).normalized().unwrap_or(Vec2::new(1.0, 0.0));
        let ext = (b - a).normalized().unwrap_or(dir);
        let spot = |f: f64| {
            let p = exit + dir * (f * out_mm);
            let q = a + ext * (p - a).dot(ext);
            (p, q)
        };
        let fractions = [0.35, 0.5, 0.25, 0.65, 0.8];
        let free = |&f: &f64| {
            let (p, q) = spot(f);
            let Some(u) = (q - p).normalized() else { return false };
            others.is_line_free(p + u * 0.8, q - u * 0.8)
        };
        let f = fractions.iter().copied().find(free).unwrap_or(fractions[0]);
        let (p, q) = spot(f);
        rays[k].shift = Some((p, q));
        // The extension needs to reach only a little past the dimension line.
        rays[k].extension = Some((a, a + ext * ((q - a).dot(ext) + SHIFT_PAST_MM)));
    }
}

/// A value with one decimal, a true minus sign for negatives and no "−0.0".
pub fn fmt1(v: f64) -> String {
    let s = format!("{:.1}", v + 0.0);
    if s == "-0.0" { "0.0".into() } else { s.replace('-', "\u{2212}") }
}

fn line(from: Point, to: Point, stroke: Stroke) -> Item {
    Item::Line { from, to, stroke }
}

fn arrow(tip: Point, dir: Vec2, length_mm: f64, width_mm: f64, gray: f64) -> Item {
    Item::Arrowhead { tip, dir, length_mm, width_mm, gray }
}

/// Where the arrowhead on an emergent ray from `a` to `b` (direction `u`) has its tip.
fn emergent_arrow_tip(a: Point, b: Point, u: Vec2) -> Point {
    a + (b - a) * 0.4 + u * 1.5
}

/// Marks the square round a point as taken (arrowheads, rings).
pub(super) fn block_spot(placer: &mut Placer, at: Point, half: f64) {
    placer.block(Rect::from_corners(
        Point::new(at.x - half, at.y - half),
        Point::new(at.x + half, at.y + half),
    ));
}

/// Blocks everything the key will draw, so labels keep off it.
fn block_key_lines(placer: &mut Placer, rays: &[KeyRay]) {
    for k in rays {
        for (a, b) in k.hard_segments() {
            placer.block_line(a, b);
        }
        for (a, b) in k.soft_segments() {
            placer.block_soft_line(a, b);
        }
        for p in &k.rings {
            block_spot(placer, *p, 1.8);
        }
        if let Some((a, b)) = k.emergent
            && let Some(u) = (b - a).normalized()
        {
            block_spot(placer, emergent_arrow_tip(a, b, u) - u * 1.3, 1.6);
        }
        if let Some((p, q)) = k.shift {
            block_spot(placer, p, 0.9);
            block_spot(placer, q, 0.9);
        }
    }
}

/// Places a label or, when no place is free, leaves it out.
pub(super) fn label(
    items: &mut Vec<Item>,
    placer: &mut Placer,
    bounds: &Rect,
    s: &str,
    size: f64,
    at: Point,
    prefer: Vec2,
) {
    if let Some(mut it) = place_near(placer, bounds, s, size, at, prefer) {
        items.append(&mut it);
    }
}

/// A guide line's label, which every guide must have: beside its start if
/// there is room, else further back along the line's extension behind the ray
/// box (guides through one entry point spread apart there), else at the least
/// crowded of those places.
fn guide_label(
    items: &mut Vec<Item>,
    placer: &mut Placer,
    bounds: &Rect,
    s: &str,
    start: Point,
    dir: Vec2,
    side: Vec2,
) {
    let mut tries: Vec<(Point, Vec2)> = vec![(start + dir * 4.0, side)];
    for k in 1..=7 {
        tries.push((start - dir * (3.0 + 4.0 * f64::from(k)), -dir));
    }
    let leader = |items: &mut Vec<Item>, placer: &mut Placer, to: Point| {
        // A dotted leader continues the guide back to its label.
        items.push(line(start, to, Stroke::solid(THIN_W).dashed(Dash::Dashed { on_mm: 0.8, off_mm: 0.7 })));
        placer.block_line(start, to);
    };
    for (k, &(at, prefer)) in tries.iter().enumerate() {
        if k > 0 && !placer.is_line_free(start, at) {
            continue;
        }
        if let Some(mut it) = place_near(placer, bounds, s, LABEL_PT, at, prefer) {
            if k > 0 {
                leader(items, placer, at);
            }
            items.append(&mut it);
            return;
        }
    }
    let candidates: Vec<(Point, crate::scene::Anchor)> = tries[1..]
        .iter()
        .map(|(at, _)| {
            (*at, if dir.x > 0.0 { crate::scene::Anchor::End } else { crate::scene::Anchor::Start })
        })
        .collect();
    let boxes: Vec<Rect> = candidates
        .iter()
        .map(|(p, a)| crate::draw::text_box(*p, s, LABEL_PT, crate::scene::Weight::Regular, *a))
        .collect();
    let k = placer.choose(&boxes, bounds);
    // Outside the visible window a label would be cut off: leave it out there.
    if !(bounds.contains(boxes[k].min) && bounds.contains(boxes[k].max)) {
        return;
    }
    placer.block(boxes[k]);
    leader(items, placer, candidates[k].0 + dir * 1.0);
    items.push(crate::draw::text(
        candidates[k].0,
        s,
        LABEL_PT,
        crate::scene::Weight::Regular,
        candidates[k].1,
    ));
}

/// The box (sheet frame) that must be on paper for both drawings: the piece,
/// the guide lines and ray-box bars, the angle scale with its numbers, the
/// normal, the traced rays with their emergent parts, extensions and arcs,
/// and room round all that for labels.
pub fn extent<F: Copy + PartialEq>(plan: &AngledPlan<F>) -> (Point, Point) {
    let sk = sketch(plan);
    let (lo, hi) = plan.setup.shape.bounds();
    let mut pts = vec![lo, hi, sk.normal.0, sk.normal.1];
    for g in &sk.guides {
        let across = g.dir.perp() * (BAR_MM / 2.0);
        pts.extend([g.start + across, g.start - across]);
    }
    for t in &sk.ticks.ticks {
        pts.push(t.outer);
    }
    for n in &sk.ticks.numbers {
        pts.extend([n.center + Vec2::new(2.5, 1.5), n.center - Vec2::new(2.5, 1.5)]);
    }
    for k in key_rays(plan) {
        for (a, b) in k.segments() {
            pts.extend([a, b]);
        }
    }
    let finite = pts.iter().filter(|p| p.x.is_finite() && p.y.is_finite());
    let (mut min, mut max) =
        (Point::new(f64::INFINITY, f64::INFINITY), Point::new(f64::NEG_INFINITY, f64::NEG_INFINITY));
    for p in finite {
        min = Point::new(min.x.min(p.x), min.y.min(p.y));
        max = Point::new(max.x.max(p.x), max.y.max(p.y));
    }
    (
        Point::new(min.x - LABEL_ROOM_MM.0, min.y - LABEL_ROOM_MM.1),
        Point::new(max.x + LABEL_ROOM_MM.0, max.y + LABEL_ROOM_MM.1),
    )
}

/// The student sheet's drawing in the sheet frame: the piece's outline at
/// 1:1; the normal at the entry point (dashed, labelled); the angle scale on
/// the air side round the entry point (a tick every degree, numbers every
/// 10°, ±80° from the normal, or ±20° when every ray is within 10° of it);
/// each guide line from the ray-box bar to the entry point with an arrowhead
/// toward the piece and its letter and signed angle ("A 30°", "B −5°").
///
/// Labels go only inside `bounds` and keep off every line, tick and label,
/// the key's lines included (so the key can be laid over the sheet); one that
/// finds no room is left out. The placer keeps what was taken, for [`key`].
pub fn student<F: Copy + PartialEq>(
    plan: &AngledPlan<F>,
    bounds: &Rect,
    placer: &mut Placer,
    w: &Words,
) -> Vec<Item> {
    let sk = sketch(plan);
    let keys = key_rays(plan);
    let mut items = vec![shape_outline(&plan.setup.shape, Stroke::solid(OUTLINE_W))];
    placer.block_soft_path(&path_points(&plan.setup.shape));
    // The normal.
    let (n_in, n_out) = sk.normal;
    items.push(line(n_in, n_out, Stroke::solid(THIN_W).dashed(LINE_DASH)));
    placer.block_soft_line(n_in, n_out);
    // The angle scale.
    items.extend(sk.ticks.tick_items());
    sk.ticks.block_ticks(placer);
    // Guide lines, ray-box bars and arrowheads.
    for g in &sk.guides {
        items.push(line(g.start, sk.entry, Stroke::solid(GUIDE_W)));
        placer.block_line(g.start, sk.entry);
        let across = g.dir.perp() * (BAR_MM / 2.0);
        items.push(line(g.start + across, g.start - across, Stroke::solid(0.8).gray(0.3)));
        placer.block(Rect::from_corners(g.start + across, g.start - across));
        placer.block_line(g.start + across, g.start - across);
        let tip = sk.entry - g.dir * sk.arrow_mm;
        items.push(arrow(tip, g.dir, 3.0, 1.8, 0.0));
        block_spot(placer, tip - g.dir * 1.5, 1.6);
    }
    block_key_lines(placer, &keys);
    // Labels: the scale's numbers first (they belong at their ticks), then the
    // guides', the ray box's and the normal's.
    items.extend(sk.ticks.place_numbers(placer, bounds));
    for g in &sk.guides {
        // Beside the guide's start, on the side away from the normal.
        let off = g.start - sk.entry;
        let side = off - sk.outward * off.dot(sk.outward);
        let prefer = side.normalized().unwrap_or(g.dir.perp());
        let s = format!("{} {}", g.letter, super::angled_view::angle(g.incidence_deg));
        guide_label(&mut items, placer, bounds, &s, g.start, g.dir, prefer);
    }
    if let Some(g) = sk.guides.iter().max_by(|a, b| a.incidence_deg.abs().total_cmp(&b.incidence_deg.abs())) {
        label(&mut items, placer, bounds, w.say("ray_box"), LABEL_PT, g.start - g.dir * 0.5, -g.dir);
    }
    label(&mut items, placer, bounds, w.say("normal"), LABEL_PT, n_out, sk.outward);
    items
}

/// What the key adds on top of [`student`], at the same coordinates: each
/// ray's traced path inside the piece and its emergent ray to the plan's
/// drawn length, with its letter; the angle of refraction at the entry face
/// (an arc from the inward normal, its value); for a parallel emergent ray (a
/// block) the incoming line carried on (dashed) and the lateral shift as a
/// dimension line with its value and accept range ("A: d = 13.0 ± 1.5 mm");
/// for a prism the deviation between the extended incoming line and the
/// emergent ray (value and range) and the emergence angle at the exit face;
/// for a right-angle prism a ring at every total reflection, named once per
/// ray, and the turn. A ray that does not take the sheet's path is drawn as
/// it goes, with plain words for what happens ("A: totally reflected at the
/// second side"). Values are the plan's, with one decimal.
///
/// Pass the placer [`student`] filled, so the key's labels keep off the
/// sheet's lines and labels too.
pub fn key<F: FaceName + PartialEq>(
    plan: &AngledPlan<F>,
    bounds: &Rect,
    placer: &mut Placer,
    w: &Words,
) -> Vec<Item> {
    let keys = key_rays(plan);
    block_key_lines(placer, &keys);
    let mut items = Vec::new();
    let ray_stroke = Stroke::solid(RAY_W).gray(RAY_GRAY);
    let ext_stroke = Stroke::solid(THIN_W).gray(0.3).dashed(EXTENSION_DASH);
    for k in &keys {
        if k.inside.len() >= 2 {
            items.push(Item::Polyline { points: k.inside.clone(), closed: false, stroke: ray_stroke });
        }
        if let Some((a, b)) = k.emergent {
            items.push(line(a, b, ray_stroke));
            if let Some(u) = (b - a).normalized() {
                items.push(arrow(emergent_arrow_tip(a, b, u), u, 2.6, 1.6, RAY_GRAY));
            }
        }
        for (a, b) in [k.extension, k.back].into_iter().flatten() {
            items.push(line(a, b, ext_stroke));
        }
        if let Some((a, b)) = k.exit_normal {
            items.push(line(a, b, Stroke::solid(THIN_W).dashed(EXIT_NORMAL_DASH)));
        }
        for a in [k.r_arc, k.dev_arc, k.e_arc].into_iter().flatten() {
            items.push(a.item());
        }
        for p in &k.rings {
            items.push(Item::Marker {
                at: *p,
                shape: MarkerShape::Ring,
                size_mm: 3.2,
                stroke: Stroke::solid(0.25),
            });
        }
        if let Some((p, q)) = k.shift {
            items.push(line(p, q, Stroke::solid(THIN_W)));
            if let Some(u) = (q - p).normalized()
                && p.distance(q) > 4.0
            {
                items.push(arrow(q, u, 1.6, 1.0, 0.0));
                items.push(arrow(p, -u, 1.6, 1.0, 0.0));
            }
        }
    }
    // Letters at the emergent rays' ends first: they name the rays.
    for k in &keys {
        if let Some((a, b)) = k.emergent {
            let u = (b - a).normalized().unwrap_or(Vec2::new(1.0, 0.0));
            label(&mut items, placer, bounds, &k.letter, LABEL_PT, b, u);
        }
    }
    // Each lateral shift beside its own dimension line; each turn beside its emergent ray.
    for (k, r) in keys.iter().zip(&plan.rays) {
        match (k.show, k.shift, k.emergent) {
            (Show::Shift, Some((p, q)), _) => {
                if let Ok(d) = r.lateral_shift_mm {
                    // Beyond the emergent ray's end of the dimension line, else
                    // beside its middle, else beyond the extension's end.
                    let s = vec![format!("{}: d = {} ± {} mm", k.letter, fmt1(d), fmt1(r.tolerance_mm))];
                    let tries = [(p, p - q), (p + (q - p) * 0.5, p - q), (q, q - p)];
                    label_block(&mut items, placer, bounds, &s, &tries);
                }
            }
            (Show::Turn, _, Some((a, b))) => {
                if let Ok(d) = r.deviation_deg {
                    let s = w.fill(
                        "turned_label",
                        &[("ray", &k.letter), ("value", &fmt1(d)), ("range", &fmt1(r.tolerance_deg))],
                    );
                    let u = (b - a).normalized().unwrap_or(Vec2::new(1.0, 0.0));
                    label(&mut items, placer, bounds, &s, VALUE_PT, a + (b - a) * 0.7, u.perp());
                }
            }
            _ => {}
        }
    }
    // Deviations, angles of refraction and of emergence: their arcs nest, so
    // each set is one block of lines, one line a ray, beside the outermost arc.
    let deviations: Vec<String> = keys
        .iter()
        .zip(&plan.rays)
        .filter(|(k, _)| k.show == Show::Deviation)
        .filter_map(|(k, r)| {
            r.deviation_deg
                .ok()
                .map(|d| format!("{}: δ = {}° ± {}°", k.letter, fmt1(d), fmt1(r.tolerance_deg)))
        })
        .collect();
    if let Some(outer) = keys.iter().filter_map(|k| k.dev_arc).max_by(|a, b| a.radius.total_cmp(&b.radius)) {
        label_block(&mut items, placer, bounds, &deviations, &[(outer.point(0.5), outer.mid_dir())]);
    } else if let Some(p) = keys.iter().find_map(|k| k.emergent.filter(|_| k.show == Show::Deviation)) {
        label_block(&mut items, placer, bounds, &deviations, &[(p.0 + (p.1 - p.0) * 0.5, Vec2::default())]);
    }
    refraction_label(&mut items, placer, bounds, plan, &keys);
    let emergences: Vec<String> = keys
        .iter()
        .zip(&plan.rays)
        .filter(|(k, _)| k.exit_normal.is_some())
        .filter_map(|(k, r)| r.emergence_deg.ok().map(|e| format!("{}: e = {}°", k.letter, fmt1(e))))
        .collect();
    // Beside the longest exit normal: inside the piece first (the air beyond
    // the exit face is full of emergent rays and deviation arcs), then outside.
    if let Some((inner, outer)) = keys
        .iter()
        .filter_map(|k| k.exit_normal)
        .max_by(|a, b| a.0.distance(a.1).total_cmp(&b.0.distance(b.1)))
    {
        let n = (outer - inner).normalized().unwrap_or_default();
        label_block(&mut items, placer, bounds, &emergences, &[(inner, -n), (outer, n)]);
    }
    total_reflection_labels(&mut items, placer, bounds, plan, &keys, w);
    for (k, r) in keys.iter().zip(&plan.rays) {
        if !r.path_ok {
            let (words, at) = what_happened(plan, r, w);
            label(
                &mut items,
                placer,
                bounds,
                &w.fill("what_happened", &[("ray", &k.letter), ("what", &words)]),
                VALUE_PT,
                at,
                Vec2::default(),
            );
        }
    }
    items
}

/// Places a block of value lines (nothing for none) near the first of the
/// given points (each with its preferred side) where it finds room.
fn label_block(
    items: &mut Vec<Item>,
    placer: &mut Placer,
    bounds: &Rect,
    lines: &[String],
    tries: &[(Point, Vec2)],
) {
    let refs: Vec<&str> = lines.iter().map(String::as_str).collect();
    for &(at, prefer) in tries {
        if let Some(mut it) = place_lines_near(placer, bounds, &refs, VALUE_PT, at, prefer) {
            items.append(&mut it);
            return;
        }
    }
}

/// The angles of refraction, one line a ray ("A: r = 19.6°"), beside where
/// the outermost refraction arc leaves the normal, on the side of the normal
/// no ray takes.
fn refraction_label<F: Copy>(
    items: &mut Vec<Item>,
    placer: &mut Placer,
    bounds: &Rect,
    plan: &AngledPlan<F>,
    keys: &[KeyRay],
) {
    let lines: Vec<String> = plan
        .rays
        .iter()
        .filter_map(|r| r.refraction_deg.ok().map(|v| format!("{}: r = {}°", r.letter, fmt1(v))))
        .collect();
    let inward = -plan.setup.outward;
    let radius = keys.iter().filter_map(|k| k.r_arc).map(|a| a.radius).fold(R_ARC_MM, f64::max);
    // The side of the normal the rays inside lean away from.
    let lean: f64 =
        plan.rays.iter().filter_map(|r| r.trace.events.first()).map(|ev| inward.cross(ev.dir_out)).sum();
    let free_side = if lean > 0.0 { -inward.perp() } else { inward.perp() };
    label_block(items, placer, bounds, &lines, &[(plan.setup.entry_point + inward * radius, free_side)]);
}

/// "total internal reflection" once for each group of rays whose first total
/// reflections lie within 5 mm of each other ("A, B: total internal reflection").
fn total_reflection_labels<F: Copy>(
    items: &mut Vec<Item>,
    placer: &mut Placer,
    bounds: &Rect,
    plan: &AngledPlan<F>,
    keys: &[KeyRay],
    w: &Words,
) {
    let mut groups: Vec<(Point, Vec<&str>)> = Vec::new();
    for (k, r) in keys.iter().zip(&plan.rays) {
        let Some(&p) = k.rings.first().filter(|_| r.path_ok) else { continue };
        match groups.iter_mut().find(|(q, _)| q.distance(p) < 5.0) {
            Some(g) => g.1.push(&k.letter),
            None => groups.push((p, vec![&k.letter])),
        }
    }
    for (p, letters) in groups {
        let s = w.fill("total_reflection_label", &[("rays", &letters.join(", "))]);
        label(items, placer, bounds, &s, VALUE_PT, p, Vec2::default());
    }
}

/// Plain words for where a ray leaves the sheet's expected path, and the
/// point where it does so.
fn what_happened<F: FaceName + PartialEq>(
    plan: &AngledPlan<F>,
    r: &AngledRay<F>,
    w: &Words,
) -> (String, Point) {
    let s = &plan.setup;
    let ev = &r.trace.events;
    let Some(first) = ev.first() else { return (w.say("happened_misses").into(), s.entry_point) };
    if first.kind != EventKind::Enter || first.face != s.entry_face {
        return (w.fill("happened_meets_first", &[("face", first.face.words(w))]), first.at);
    }
    let (reflect_at, exit): (&[F], F) = match &s.expected {
        Expected::Refract { exit } => (&[], *exit),
        Expected::Turn { reflect_at, exit } => (reflect_at.as_slice(), *exit),
    };
    let want: Vec<(F, EventKind)> = reflect_at
        .iter()
        .map(|f| (*f, EventKind::TotalReflection))
        .chain(std::iter::once((exit, EventKind::Leave)))
        .collect();
    for (k, e) in ev[1..].iter().enumerate() {
        let expected = want.get(k).copied();
        if expected == Some((e.face, e.kind)) {
            continue;
        }
        let words = match (e.kind, expected) {
            (EventKind::TotalReflection, _) => w.fill("happened_reflected", &[("face", e.face.words(w))]),
            (EventKind::Leave, Some((f, EventKind::TotalReflection))) if f == e.face => {
                w.fill("happened_escapes", &[("face", e.face.words(w))])
            }
            (EventKind::Leave, _) => w.fill("happened_leaves", &[("face", e.face.words(w))]),
            (EventKind::Enter, _) => w.fill("happened_enters_again", &[("face", e.face.words(w))]),
        };
        return (words, e.at);
    }
    let last = ev[ev.len() - 1].at;
    match r.trace.end {
        End::Trapped => (w.say("happened_trapped").into(), last),
        End::Missed | End::Left { .. } => (w.say("happened_off_path").into(), last),
    }
}

#[cfg(test)]
pub(super) mod tests {
    use super::*;
    use crate::draw::text_box;
    use crate::geom::Placement;
    use crate::optics::{Block, BlockFace, Prism, PrismFace};
    use crate::scene::OutlinePart;
    use crate::sheets::angled::{AngleRange, AngleRules};
    use crate::sheets::block;
    use crate::sheets::prism::{self, PrismEntry};

    fn plan_of<F: Copy + PartialEq>(
        setup: super::super::angled::AngledSetup<F>,
        angles: &[f64],
        from: f64,
        to: f64,
    ) -> AngledPlan<F> {
        let range = AngleRange { from, to, prefer: (from + to) / 2.0, need_shift: false };
        AngledPlan::new(setup, AngleRules::for_ray_width(2.0), range, Some(angles), |_| Vec::new())
    }

    pub(in crate::sheets) fn block_plan() -> AngledPlan<BlockFace> {
        plan_of(block::setup(&Block::new(40.0, 90.0, 1.491).unwrap()), &[30.0, 45.0, 60.0], 0.0, 89.0)
    }

    pub(in crate::sheets) fn prism_plan(angles: &[f64]) -> AngledPlan<PrismFace> {
        plan_of(prism::setup(&Prism::new(60.0, 50.0, 1.491).unwrap(), PrismEntry::Side), angles, -30.0, 89.0)
    }

    pub(in crate::sheets) fn right_plan(entry: PrismEntry, angles: &[f64]) -> AngledPlan<PrismFace> {
        plan_of(prism::setup(&Prism::new(90.0, 40.0, 1.491).unwrap(), entry), angles, -30.0, 30.0)
    }

    /// Both drawings with labels allowed anywhere in the extent.
    fn draw<F: FaceName + PartialEq>(plan: &AngledPlan<F>) -> (Rect, Vec<Item>, Vec<Item>) {
        let (lo, hi) = extent(plan);
        let bounds = Rect { min: lo, max: hi };
        let mut placer = Placer::default();
        let w = Words::shipped();
        let s = student(plan, &bounds, &mut placer, &w);
        let k = key(plan, &bounds, &mut placer, &w);
        (bounds, s, k)
    }

    pub(in crate::sheets) fn texts(items: &[Item]) -> Vec<(String, Rect, f64)> {
        items
            .iter()
            .filter_map(|i| match i {
                Item::Text { at, text, size_pt, weight, anchor, rotate_deg, .. } => {
                    let b = text_box(*at, text, *size_pt, *weight, *anchor);
                    // A quarter turn counterclockwise about `at` (the plot's axis title).
                    let b = if (*rotate_deg - 90.0).abs() < 1e-9 {
                        let turn = |p: Point| Point::new(at.x - (p.y - at.y), at.y + (p.x - at.x));
                        Rect::from_corners(turn(b.min), turn(b.max))
                    } else {
                        b
                    };
                    Some((text.clone(), b, *size_pt))
                }
                _ => None,
            })
            .collect()
    }

    /// Every drawn line as straight pieces (arcs as chords); markers and
    /// arrowheads as the boxes round them.
    fn drawn(items: &[Item]) -> Placer {
        let mut p = Placer::default();
        for i in items {
            match i {
                Item::Line { from, to, .. } => p.block_line(*from, *to),
                Item::Polyline { points, .. } => p.block_path(points),
                Item::Arc { center, radius_mm, start_rad, sweep_rad, .. } => {
                    let a = ArcSpec {
                        center: *center,
                        radius: *radius_mm,
                        start_rad: *start_rad,
                        sweep_rad: *sweep_rad,
                    };
                    p.block_path(&a.chords());
                }
                Item::Outline { parts, .. } => {
                    let mut at = Point::default();
                    for part in parts {
                        match part {
                            OutlinePart::MoveTo { to } => at = *to,
                            OutlinePart::LineTo { to } => {
                                p.block_line(at, *to);
                                at = *to;
                            }
                            OutlinePart::ArcTo { center, radius_mm, start_rad, sweep_rad } => {
                                let a = ArcSpec {
                                    center: *center,
                                    radius: *radius_mm,
                                    start_rad: *start_rad,
                                    sweep_rad: *sweep_rad,
                                };
                                p.block_path(&a.chords());
                                at = a.point(1.0);
                            }
                        }
                    }
                }
                Item::Marker { at, size_mm, .. } => {
                    let h = size_mm / 2.0;
                    p.block(Rect::from_corners(*at - Vec2::new(h, h), *at + Vec2::new(h, h)));
                }
                Item::Arrowhead { tip, dir, length_mm, width_mm, .. } => {
                    let base = *tip - *dir * *length_mm;
                    let side = dir.perp() * (width_mm / 2.0);
                    p.block_path(&[*tip, base + side, base - side, *tip]);
                }
                Item::Text { .. } | Item::Box { .. } | Item::Group { .. } | Item::Scale { .. } => {}
            }
        }
        p
    }

    /// The checks every drawing must pass: labels inside `bounds`, apart from
    /// each other, off every line and mark, and no smaller than 6.5 pt.
    fn assert_readable(name: &str, bounds: &Rect, items: &[Item]) {
        let labels = texts(items);
        assert!(!labels.is_empty(), "{name}: no labels at all");
        let lines = drawn(items);
        for (k, (s, b, size)) in labels.iter().enumerate() {
            assert!(*size >= 6.5, "{name}: {s:?} at {size} pt");
            assert!(
                bounds.contains(b.min) && bounds.contains(b.max),
                "{name}: {s:?} {b:?} outside {bounds:?}"
            );
            assert!(lines.is_free(b, 0.0), "{name}: {s:?} {b:?} touches a line or mark");
            for (t, c, _) in &labels[k + 1..] {
                assert!(!b.overlaps(c), "{name}: {s:?} {b:?} overlaps {t:?} {c:?}");
            }
        }
    }

    #[test]
    fn labels_stay_inside_apart_and_off_the_lines_on_every_sheet() {
        let (b, s, k) = draw(&block_plan());
        assert_readable("block student", &b, &s);
        assert_readable("block key", &b, &[s, k].concat());
        let (b, s, k) = draw(&prism_plan(&[35.0, 45.0, 55.0, 65.0]));
        assert_readable("prism key", &b, &[s, k].concat());
        let (b, s, k) = draw(&prism_plan(&[20.0, 48.0]));
        assert_readable("prism with a ray reflected", &b, &[s, k].concat());
        let (b, s, k) = draw(&right_plan(PrismEntry::Side, &[0.0, 3.0]));
        assert_readable("right-angle side", &b, &[s, k].concat());
        let (b, s, k) = draw(&right_plan(PrismEntry::Base, &[0.0]));
        assert_readable("right-angle base", &b, &[s, k].concat());
    }

    #[test]
    fn labels_keep_to_a_tight_window_or_are_left_out() {
        // A window cutting through the drawing: whatever is labelled stays inside it.
        let plan = block_plan();
        let bounds = Rect::from_corners(Point::new(-40.0, -40.0), Point::new(60.0, 40.0));
        let mut placer = Placer::default();
        let w = Words::shipped();
        let s = student(&plan, &bounds, &mut placer, &w);
        let k = key(&plan, &bounds, &mut placer, &w);
        for (t, b, _) in texts(&[s, k].concat()) {
            assert!(bounds.contains(b.min) && bounds.contains(b.max), "{t:?} {b:?}");
        }
    }

    #[test]
    fn the_scale_has_161_ticks_for_80_degrees_each_way_and_41_on_a_right_angle_prism() {
        let plan = block_plan();
        let sk = sketch(&plan);
        assert_eq!(sk.ticks.ticks.len(), 161);
        let (_, s, _) = draw(&plan);
        for t in &sk.ticks.ticks {
            assert!(
                s.iter()
                    .any(|i| matches!(i, Item::Line { from, to, .. } if *from == t.inner && *to == t.outer)),
                "tick at {}° drawn",
                t.angle_deg
            );
        }
        // Centred on the outward normal (−x for the block).
        let zero = sk.ticks.ticks.iter().find(|t| t.angle_deg == 0).unwrap();
        assert!(zero.inner.x < 0.0 && zero.inner.y.abs() < 1e-9);
        // Every ray within 10° of the normal: ±20°.
        assert_eq!(sketch(&right_plan(PrismEntry::Side, &[0.0, 3.0])).ticks.ticks.len(), 41);
    }

    #[test]
    fn guide_labels_give_letter_and_signed_angle() {
        let (_, s, _) = draw(&block_plan());
        let t: Vec<String> = texts(&s).into_iter().map(|t| t.0).collect();
        for want in ["A 30°", "B 45°", "C 60°", "normal", "ray box"] {
            assert!(t.iter().any(|x| x == want), "{want:?} in {t:?}");
        }
        let plan = right_plan(PrismEntry::Base, &[-3.0, 0.0]);
        let (_, s, _) = draw(&plan);
        let t: Vec<String> = texts(&s).into_iter().map(|t| t.0).collect();
        assert!(t.iter().any(|x| x == "A \u{2212}3°"), "{t:?}");
        // Each guide runs from its start to the entry point with an arrowhead toward the piece.
        for r in &plan.rays {
            let start = r.trace.incoming.origin;
            assert!(s.iter().any(|i| matches!(i, Item::Line { from, to, .. }
                if *from == start && *to == plan.setup.entry_point)));
            assert!(
                s.iter().any(|i| matches!(i, Item::Arrowhead { dir, .. } if *dir == r.trace.incoming.dir))
            );
        }
    }

    #[test]
    fn the_key_prints_the_plans_shift_refraction_and_deviation() {
        let plan = block_plan();
        let (_, _, k) = draw(&plan);
        let t: Vec<String> = texts(&k).into_iter().map(|t| t.0).collect();
        for r in &plan.rays {
            let d = format!(
                "{}: d = {} ± {} mm",
                r.letter,
                fmt1(r.lateral_shift_mm.unwrap()),
                fmt1(r.tolerance_mm)
            );
            assert!(t.contains(&d), "{d:?} in {t:?}");
            let rr = format!("{}: r = {}°", r.letter, fmt1(r.refraction_deg.unwrap()));
            assert!(t.contains(&rr), "{rr:?} in {t:?}");
        }
        // d = t·sin(i − r)/cos r for B at 45° in the 40 mm block (DESIGN.md): 13.0 mm.
        assert!(t.iter().any(|x| x.starts_with("B: d = 13.0 ± ")), "{t:?}");
        // The dimension line is as long as the shift and square to the rays.
        let keys = key_rays(&plan);
        for (kr, r) in keys.iter().zip(&plan.rays) {
            let (p, q) = kr.shift.unwrap();
            assert!((p.distance(q) - r.lateral_shift_mm.unwrap()).abs() < 1e-9);
            assert!((q - p).dot(r.trace.incoming.dir).abs() < 1e-9);
        }

        let plan = prism_plan(&[35.0, 45.0, 55.0, 65.0]);
        let (_, _, k) = draw(&plan);
        let t: Vec<String> = texts(&k).into_iter().map(|t| t.0).collect();
        for r in &plan.rays {
            let d =
                format!("{}: δ = {}° ± {}°", r.letter, fmt1(r.deviation_deg.unwrap()), fmt1(r.tolerance_deg));
            assert!(t.contains(&d), "{d:?} in {t:?}");
            let e = format!("{}: e = {}°", r.letter, fmt1(r.emergence_deg.unwrap()));
            assert!(t.contains(&e), "{e:?} in {t:?}");
        }
        // Each deviation arc turns the incoming direction onto the emergent one.
        for (kr, r) in key_rays(&plan).iter().zip(&plan.rays) {
            let a = kr.dev_arc.unwrap();
            assert!((a.sweep_rad.abs().to_degrees() - r.deviation_deg.unwrap().abs()).abs() < 1e-9);
        }
    }

    #[test]
    fn right_angle_prisms_show_total_reflection_and_the_turn() {
        let plan = right_plan(PrismEntry::Base, &[0.0]);
        let (_, _, k) = draw(&plan);
        let rings = k.iter().filter(|i| matches!(i, Item::Marker { shape: MarkerShape::Ring, .. })).count();
        assert_eq!(rings, 2, "two total reflections on the way back");
        let t: Vec<String> = texts(&k).into_iter().map(|t| t.0).collect();
        assert_eq!(t.iter().filter(|x| x.contains("total internal reflection")).count(), 1, "{t:?}");
        assert!(t.iter().any(|x| x.starts_with("A: turned through 180.0° ± ")), "{t:?}");
        let plan = right_plan(PrismEntry::Side, &[0.0, 3.0]);
        let (_, _, k) = draw(&plan);
        let t: Vec<String> = texts(&k).into_iter().map(|t| t.0).collect();
        assert!(t.contains(&"A, B: total internal reflection".to_string()), "{t:?}");
        assert!(t.iter().any(|x| x.starts_with("A: turned through 90.0° ± ")), "{t:?}");
    }

    #[test]
    fn a_ray_off_the_sheets_path_is_drawn_as_it_goes_and_named() {
        // Below the limiting incidence (about 28° here) the ray is totally
        // reflected at the second side and leaves through the base.
        let plan = prism_plan(&[20.0, 48.0]);
        assert!(!plan.rays[0].path_ok);
        let (_, _, k) = draw(&plan);
        let t: Vec<String> = texts(&k).into_iter().map(|t| t.0).collect();
        assert!(t.contains(&"A: totally reflected at the second side".to_string()), "{t:?}");
        // Its whole path is drawn, and no deviation is claimed for it.
        let path: Vec<Point> = plan.rays[0].trace.events.iter().map(|e| e.at).collect();
        assert!(k.iter().any(|i| matches!(i, Item::Polyline { points, .. } if *points == path)));
        assert!(!t.iter().any(|x| x.starts_with("A: δ")), "{t:?}");
        // Below n = √2 the right-angle prism's hypotenuse lets the light out.
        let weak = Prism::new(90.0, 40.0, 1.40).unwrap();
        let plan = plan_of(prism::setup(&weak, PrismEntry::Side), &[0.0], -30.0, 30.0);
        let (_, _, k) = draw(&plan);
        let t: Vec<String> = texts(&k).into_iter().map(|t| t.0).collect();
        assert!(
            t.contains(&"A: leaves through the base instead of being totally reflected".to_string()),
            "{t:?}"
        );
    }

    #[test]
    fn odd_plans_draw_without_panicking() {
        // No rays at all.
        let empty = plan_of(block::setup(&Block::new(40.0, 90.0, 1.491).unwrap()), &[], 0.0, 89.0);
        let (b, s, k) = draw(&empty);
        assert!(k.is_empty());
        assert_readable("empty block", &b, &s);
        // Rays aimed at a point off the piece: they miss it.
        let mut setup = block::setup(&Block::new(40.0, 90.0, 1.491).unwrap());
        setup.entry_point = Point::new(0.0, 100.0);
        let missing = plan_of(setup, &[30.0], 0.0, 89.0);
        assert!(missing.rays[0].trace.events.is_empty());
        let (_, _, k) = draw(&missing);
        let t: Vec<String> = texts(&k).into_iter().map(|t| t.0).collect();
        assert!(t.contains(&"A: misses the piece".to_string()), "{t:?}");
        // A piece turned and moved: the drawing follows its placed outline.
        let mut setup = block::setup(&Block::new(40.0, 90.0, 1.491).unwrap());
        setup.shape = setup.shape.placed(&Placement::new(0.0, Vec2::new(0.0, 0.0)));
        let (b, s, k) = draw(&plan_of(setup, &[89.0], 0.0, 89.0));
        assert_readable("grazing", &b, &[s, k].concat());
    }

    #[test]
    fn the_extent_holds_every_line_of_both_drawings() {
        for (name, plan) in [("block", &block_plan())] {
            let (b, s, k) = draw(plan);
            for i in s.iter().chain(&k) {
                let pts: Vec<Point> = match i {
                    Item::Line { from, to, .. } => vec![*from, *to],
                    Item::Polyline { points, .. } => points.clone(),
                    _ => continue,
                };
                for p in pts {
                    assert!(b.contains(p), "{name}: {p:?} outside {b:?}");
                }
            }
        }
        let plan = prism_plan(&[35.0, 45.0, 55.0, 65.0]);
        let (lo, hi) = extent(&plan);
        let (slo, shi) = plan.setup.shape.bounds();
        assert!(lo.x < slo.x && lo.y < slo.y && hi.x > shi.x && hi.y > shi.y);
    }

    #[test]
    fn values_print_with_one_decimal_and_a_true_minus() {
        assert_eq!(fmt1(13.04), "13.0");
        assert_eq!(fmt1(-3.0), "\u{2212}3.0");
        assert_eq!(fmt1(-0.04), "0.0");
        assert_eq!(crate::sheets::angled_view::angle(30.0), "30°");
        assert_eq!(crate::sheets::angled_view::angle(-2.5), "\u{2212}2.5°");
        assert_eq!(crate::sheets::angled_view::angle(-0.0), "0°");
    }
}
