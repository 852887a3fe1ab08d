//! The drawings of radius sheets: the student's axis, centre line and chord
//! heights (no outline: students trace the real piece), the key's true
//! outline with each face's chord and sagitta, and the gauge page's
//! true-scale arcs.

use super::angled_drawing::{block_spot, fmt1, label};
use super::radius::RadiusView;
use crate::draw::style::{
    EXTENSION_DASH, LABEL_PT, LINE_DASH, OUTLINE_W, RAY_GRAY, SMALL_PT, THIN_W, VALUE_PT,
};
use crate::draw::{Placer, Words, leading, path_points, shape_outline, text, wrap};
use crate::geom::{Point, Vec2};
use crate::optics::{Entry, Lens, Outline};
use crate::scene::{Anchor, Item, MarkerShape, Rect, Stroke, Weight};

/// How far the axis and the chord-height lines reach past the piece, mm.
const REACH_MM: f64 = 25.0;
/// How far the centre line reaches past the piece's edges, mm.
const CENTRE_PAST_MM: f64 = 8.0;
/// Length of the marks at ±h on the centre line, mm.
const MARK_MM: f64 = 5.0;
/// Room kept round everything for labels, mm (sideways, up and down).
const LABEL_ROOM_MM: (f64, f64) = (30.0, 8.0);

/// The box (sheet frame) both drawings need.
pub fn extent(lens: &Lens) -> (Point, Point) {
    let (t, a) = (lens.thickness_mm(), lens.half_height_mm());
    let outline = Outline::new(*lens, Entry::Front);
    let (x0, x1) = outline.x_range();
    (
        Point::new(x0.min(0.0) - REACH_MM - LABEL_ROOM_MM.0, -a - CENTRE_PAST_MM - LABEL_ROOM_MM.1),
        Point::new(x1.max(t) + REACH_MM + LABEL_ROOM_MM.0, a + CENTRE_PAST_MM + LABEL_ROOM_MM.1),
    )
}

fn line(from: Point, to: Point, stroke: Stroke) -> Item {
    Item::Line { from, to, stroke }
}

/// The student drawing: the optical axis, the centre line to centre the
/// piece on, the chord heights ±h marked on the centre line and drawn as
/// dashed lines across the piece's place, and where to trace. No outline:
/// students measure their own tracing.
pub fn student(v: &RadiusView, bounds: &Rect, placer: &mut Placer, w: &Words) -> Vec<Item> {
    let lens = &v.lens;
    let (t, a, h) = (lens.thickness_mm(), lens.half_height_mm(), v.half_chord_mm);
    let outline = Outline::new(*lens, Entry::Front);
    let (x0, x1) = outline.x_range();
    let (left, right) = (x0.min(0.0) - REACH_MM, x1.max(t) + REACH_MM);
    let cx = t / 2.0;
    let mut items = Vec::new();
    let axis = (Point::new(left, 0.0), Point::new(right, 0.0));
    items.push(line(axis.0, axis.1, Stroke::solid(THIN_W).dashed(LINE_DASH)));
    placer.block_soft_line(axis.0, axis.1);
    let centre = (Point::new(cx, -a - CENTRE_PAST_MM), Point::new(cx, a + CENTRE_PAST_MM));
    items.push(line(centre.0, centre.1, Stroke::solid(THIN_W)));
    placer.block_line(centre.0, centre.1);
    for y in [h, -h] {
        let (p, q) = (Point::new(left, y), Point::new(right, y));
        items.push(line(p, q, Stroke::solid(THIN_W).gray(0.35).dashed(EXTENSION_DASH)));
        placer.block_soft_line(p, q);
        let (m0, m1) = (Point::new(cx - MARK_MM / 2.0, y), Point::new(cx + MARK_MM / 2.0, y));
        items.push(line(m0, m1, Stroke::solid(0.35)));
        placer.block_line(m0, m1);
    }
    // What the key draws, so the sheet's labels keep off it.
    placer.block_soft_path(&path_points(outline.shape()));
    for f in &v.faces {
        placer.block_line(Point::new(f.chord_x, -h), Point::new(f.chord_x, h));
    }
    let hv = fmt1(h);
    label(
        &mut items,
        placer,
        bounds,
        &w.fill("radius_h", &[("value", &hv)]),
        LABEL_PT,
        Point::new(right, h),
        Vec2::new(1.0, 0.0),
    );
    label(
        &mut items,
        placer,
        bounds,
        &w.fill("radius_minus_h", &[("value", &hv)]),
        LABEL_PT,
        Point::new(right, -h),
        Vec2::new(1.0, 0.0),
    );
    label(
        &mut items,
        placer,
        bounds,
        w.say("optical_axis"),
        LABEL_PT,
        Point::new(left, 0.0),
        Vec2::new(-1.0, 0.0),
    );
    label(&mut items, placer, bounds, w.say("centre_line"), LABEL_PT, centre.1, Vec2::new(0.0, 1.0));
    label(&mut items, placer, bounds, w.say("radius_trace_here"), LABEL_PT, centre.0, Vec2::new(0.0, -1.0));
    items
}

/// What the key adds: the true outline at the same coordinates, each curved
/// face's chord between the outline's points at ±h and its sagitta along the
/// axis, named with c, s and R.
pub fn key(v: &RadiusView, bounds: &Rect, placer: &mut Placer, w: &Words) -> Vec<Item> {
    let outline = Outline::new(v.lens, Entry::Front);
    let h = v.half_chord_mm;
    let mut items = vec![shape_outline(outline.shape(), Stroke::solid(OUTLINE_W).gray(RAY_GRAY))];
    for f in &v.faces {
        let (p, q) = (Point::new(f.chord_x, -h), Point::new(f.chord_x, h));
        items.push(line(p, q, Stroke::solid(THIN_W)));
        // The sagitta, just above the axis so the axis's dashes do not hide it.
        let y = 1.2;
        let (s0, s1) = (Point::new(f.chord_x, y), Point::new(f.vertex.x, y));
        items.push(line(s0, s1, Stroke::solid(THIN_W)));
        if let Some(u) = (s1 - s0).normalized()
            && s0.distance(s1) > 3.0
        {
            items.push(Item::Arrowhead { tip: s1, dir: u, length_mm: 1.4, width_mm: 0.9, gray: 0.0 });
            items.push(Item::Arrowhead { tip: s0, dir: -u, length_mm: 1.4, width_mm: 0.9, gray: 0.0 });
        }
        placer.block_line(s0, s1);
        block_spot(placer, s0, 0.8);
        block_spot(placer, s1, 0.8);
    }
    for f in &v.faces {
        let face = if f.face == "front" { w.say("entry_front") } else { w.say("entry_back") };
        let s = w.fill(
            "radius_face_label",
            &[
                ("face", face),
                ("chord", &fmt1(f.chord_mm)),
                ("sagitta", &fmt1(f.sagitta_mm)),
                ("radius", &fmt1(f.radius_from_chord_mm)),
            ],
        );
        let out = if f.face == "front" { Vec2::new(-1.0, 0.6) } else { Vec2::new(1.0, -0.6) };
        let at = Point::new(f.chord_x, if f.face == "front" { h } else { -h });
        label(&mut items, placer, bounds, &s, VALUE_PT, at, out);
    }
    items
}

/// The gauge page's drawing inside `rect` (page mm): a title, then arcs of
/// the given radii at true scale through one vertex on a common axis, each
/// over the piece's height (at most the room there is), numbered with its
/// radius in millimetres at alternate ends.
///
/// `faces` holds the piece's own curved faces (the printed face word and the
/// radius, mm). With `show_key` (the key's page) each is drawn dashed through
/// the same vertex and named, and a line per face under the arcs says which
/// gauge arcs it lies between; the room for those lines is kept on the
/// student's page too, so the arcs print at the same coordinates on both.
pub fn gauge(
    radii: &[f64],
    half_height_mm: f64,
    faces: &[(&str, f64)],
    show_key: bool,
    rect: Rect,
    w: &Words,
) -> Vec<Item> {
    if radii.is_empty() || rect.width() < 60.0 || rect.height() < 40.0 {
        return Vec::new();
    }
    let mut items = Vec::new();
    let mut y = rect.max.y - 4.0;
    for (k, (s, size, weight)) in [
        (w.say("gauge_title"), VALUE_PT + 2.0, Weight::Bold),
        (w.say("gauge_how"), LABEL_PT, Weight::Regular),
    ]
    .into_iter()
    .enumerate()
    {
        for l in wrap(s, size, weight, rect.width()) {
            items.push(text(Point::new(rect.min.x, y), &l, size, weight, Anchor::Start));
            y -= leading(size);
        }
        if k == 0 {
            y -= 1.0;
        }
    }
    // The key's lines go under the arcs. Their room is kept on the student's
    // page too, so the arcs sit at the same place on both.
    let key_lines: Vec<String> = faces
        .iter()
        .flat_map(|&(face, r)| wrap(&face_between(face, r, radii, w), LABEL_PT, Weight::Bold, rect.width()))
        .collect();
    let key_h = key_lines.len() as f64 * leading(LABEL_PT);
    if show_key {
        let mut ky = rect.min.y + key_h - leading(LABEL_PT) + 1.0;
        for l in &key_lines {
            items.push(text(Point::new(rect.min.x, ky), l, LABEL_PT, Weight::Bold, Anchor::Start));
            ky -= leading(LABEL_PT);
        }
    }
    let room =
        Rect { min: Point::new(rect.min.x, rect.min.y + key_h + 1.0), max: Point::new(rect.max.x, y - 2.0) };
    let span = half_height_mm.min((room.height() - 16.0) / 2.0).max(5.0);
    let cy = (room.min.y + room.max.y) / 2.0;
    let vx = room.min.x + 25.0;
    let vertex = Point::new(vx, cy);
    let mut placer = Placer::default();
    for it in &items {
        if let Item::Text { at, text: s, size_pt, weight, anchor, .. } = it {
            placer.block(crate::draw::text_box(*at, s, *size_pt, *weight, *anchor));
        }
    }
    let axis = (
        Point::new(room.min.x + 2.0, cy),
        Point::new(room.min.x + 2.0 + (room.width() - 4.0).min(160.0), cy),
    );
    items.push(line(axis.0, axis.1, Stroke::solid(THIN_W).dashed(LINE_DASH)));
    placer.block_soft_line(axis.0, axis.1);
    items.push(Item::Marker {
        at: vertex,
        shape: MarkerShape::Cross,
        size_mm: 4.0,
        stroke: Stroke::solid(0.25),
    });
    block_spot(&mut placer, vertex, 2.2);
    let mut sorted = radii.to_vec();
    sorted.sort_by(f64::total_cmp);
    let mut ends = Vec::new();
    for (k, &r) in sorted.iter().enumerate() {
        let y_max = span.min(0.97 * r);
        let theta = (y_max / r).asin();
        let c = Point::new(vx + r, cy);
        items.push(Item::Arc {
            center: c,
            radius_mm: r,
            start_rad: std::f64::consts::PI - theta,
            sweep_rad: 2.0 * theta,
            stroke: Stroke::solid(0.25),
        });
        let pts: Vec<Point> = (0..=24)
            .map(|j| {
                c + Vec2::from_angle(std::f64::consts::PI - theta + 2.0 * theta * f64::from(j) / 24.0) * r
            })
            .collect();
        placer.block_path(&pts);
        let up = k % 2 == 0;
        let end = if up { pts[0] } else { pts[24] };
        ends.push((end, up, r));
    }
    // The key's own faces: dashed, a little heavier and grey. Their paths are
    // kept clear of labels on the student's page too, so the numbers sit at
    // the same places on both pages.
    let mut face_labels = Vec::new();
    for (k, &(face, r)) in faces.iter().enumerate() {
        let y_max = span.min(0.97 * r);
        let theta = (y_max / r).asin();
        let c = Point::new(vx + r, cy);
        let pts: Vec<Point> = (0..=24)
            .map(|j| {
                c + Vec2::from_angle(std::f64::consts::PI - theta + 2.0 * theta * f64::from(j) / 24.0) * r
            })
            .collect();
        placer.block_path(&pts);
        if show_key {
            items.push(Item::Arc {
                center: c,
                radius_mm: r,
                start_rad: std::f64::consts::PI - theta,
                sweep_rad: 2.0 * theta,
                stroke: Stroke::solid(OUTLINE_W).gray(RAY_GRAY).dashed(EXTENSION_DASH),
            });
            let s = w.fill("gauge_face_arc", &[("face", face), ("radius", &fmt1(r))]);
            // Named at the end away from the axis, the faces on opposite sides.
            face_labels.push((pts, s, k % 2 == 0));
        }
    }
    for (end, up, r) in ends {
        let s = format!("{r:.0}");
        label(&mut items, &mut placer, &room, &s, SMALL_PT, end, Vec2::new(0.0, if up { 1.0 } else { -1.0 }));
    }
    for (face_arc, s, up) in face_labels {
        let end = if up { face_arc[0] } else { face_arc[24] };
        label(&mut items, &mut placer, &room, &s, LABEL_PT, end, Vec2::new(1.0, if up { 0.4 } else { -0.4 }));
    }
    label(&mut items, &mut placer, &room, w.say("gauge_vertex"), LABEL_PT, vertex, Vec2::new(-1.0, -1.0));
    items
}

/// The key's line for one face: the gauge arcs its radius lies between (or
/// the one it is, to half a millimetre; the gauge's radii are whole mm).
fn face_between(face: &str, r: f64, radii: &[f64], w: &Words) -> String {
    let radius = fmt1(r);
    if let Some(g) = radii.iter().find(|g| (*g - r).abs() < 0.5) {
        return w.fill("gauge_face_on", &[("face", face), ("radius", &radius), ("arc", &format!("{g:.0}"))]);
    }
    let below = radii
        .iter()
        .copied()
        .filter(|g| *g < r)
        .fold(None, |m: Option<f64>, g| Some(m.map_or(g, |m| m.max(g))));
    let above = radii
        .iter()
        .copied()
        .filter(|g| *g > r)
        .fold(None, |m: Option<f64>, g| Some(m.map_or(g, |m| m.min(g))));
    match (below, above) {
        (Some(lo), Some(hi)) => w.fill(
            "gauge_face_between",
            &[
                ("face", face),
                ("radius", &radius),
                ("lower", &format!("{lo:.0}")),
                ("upper", &format!("{hi:.0}")),
            ],
        ),
        (Some(g), None) | (None, Some(g)) => {
            w.fill("gauge_face_beyond", &[("face", face), ("radius", &radius), ("arc", &format!("{g:.0}"))])
        }
        (None, None) => w.fill("gauge_face_beyond", &[("face", face), ("radius", &radius), ("arc", "—")]),
    }
}
