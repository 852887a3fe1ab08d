//! Placing labels where they overlap neither other labels nor drawn lines,
//! with a leader line when a label has to stand off from what it names.

use super::text::{leading, text, text_box};
use crate::geom::{Point, Vec2};
use crate::scene::{Anchor, Item, MM_PER_PT, Rect, Stroke, Weight};

/// Occupied space on a page: label boxes and line segments. Labels keep off
/// all of them; a leader line keeps off the boxes and the lines, except the
/// "soft" lines (outlines, normals, extensions) it may cross.
#[derive(Default, Debug, Clone)]
pub struct Placer {
    boxes: Vec<Rect>,
    segments: Vec<(Point, Point)>,
    soft: Vec<(Point, Point)>,
}

/// The part of the segment a–b inside `r` (Liang–Barsky clipping), if any.
pub fn clip_segment(a: Point, b: Point, r: &Rect) -> Option<(Point, Point)> {
    let (dx, dy) = (b.x - a.x, b.y - a.y);
    let (mut t0, mut t1) = (0.0f64, 1.0f64);
    for (p, q) in [(-dx, a.x - r.min.x), (dx, r.max.x - a.x), (-dy, a.y - r.min.y), (dy, r.max.y - a.y)] {
        if p == 0.0 {
            if q < 0.0 {
                return None;
            }
        } else {
            let t = q / p;
            if p < 0.0 {
                t0 = t0.max(t);
            } else {
                t1 = t1.min(t);
            }
            if t0 > t1 {
                return None;
            }
        }
    }
    Some((a + (b - a) * t0, a + (b - a) * t1))
}

/// Whether any part of a–b lies inside `r`.
fn segment_hits_rect(a: Point, b: Point, r: &Rect) -> bool {
    clip_segment(a, b, r).is_some()
}

/// Whether the segments a–b and c–d cross or touch.
fn segments_meet(a: Point, b: Point, c: Point, d: Point) -> bool {
    let (r, s) = (b - a, d - c);
    let denom = r.cross(s);
    let ac = c - a;
    if denom.abs() < 1e-12 {
        // Parallel: they meet only when collinear and overlapping.
        if ac.cross(r).abs() > 1e-9 {
            return false;
        }
        let len2 = r.dot(r);
        if len2 == 0.0 {
            return a.distance(c) < 1e-9 || a.distance(d) < 1e-9;
        }
        let (t0, t1) = (ac.dot(r) / len2, (d - a).dot(r) / len2);
        return t0.min(t1) <= 1.0 && t0.max(t1) >= 0.0;
    }
    let t = ac.cross(s) / denom;
    let u = ac.cross(r) / denom;
    // A little slack, so a line through a corner of a path meets it.
    let on = |v: f64| (-1e-9..=1.0 + 1e-9).contains(&v);
    on(t) && on(u)
}

impl Placer {
    /// Marks a box as taken.
    pub fn block(&mut self, r: Rect) {
        self.boxes.push(r);
    }

    /// Marks a line as taken.
    pub fn block_line(&mut self, a: Point, b: Point) {
        self.segments.push((a, b));
    }

    /// Marks a polyline as taken.
    pub fn block_path(&mut self, pts: &[Point]) {
        for w in pts.windows(2) {
            self.block_line(w[0], w[1]);
        }
    }

    /// Marks a line as taken for labels but not for leader lines, which may cross it.
    pub fn block_soft_line(&mut self, a: Point, b: Point) {
        self.soft.push((a, b));
    }

    /// Marks a polyline as taken for labels but not for leader lines.
    pub fn block_soft_path(&mut self, pts: &[Point]) {
        for w in pts.windows(2) {
            self.block_soft_line(w[0], w[1]);
        }
    }

    /// Whether a box is free of everything taken (with `pad` mm around it).
    pub fn is_free(&self, r: &Rect, pad: f64) -> bool {
        let g = Rect {
            min: Point::new(r.min.x - pad, r.min.y - pad),
            max: Point::new(r.max.x + pad, r.max.y + pad),
        };
        !self.boxes.iter().any(|b| b.overlaps(&g))
            && !self.segments.iter().chain(&self.soft).any(|(a, b)| segment_hits_rect(*a, *b, &g))
    }

    /// Whether the line a–b crosses no taken box and no taken line (soft
    /// lines aside).
    pub fn is_line_free(&self, a: Point, b: Point) -> bool {
        self.is_leader_free(a, b, None)
    }

    /// [`Placer::is_line_free`], ignoring the boxes that contain `from` (the
    /// mark a leader starts at).
    fn is_leader_free(&self, a: Point, b: Point, from: Option<Point>) -> bool {
        !self.boxes.iter().any(|r| from.is_none_or(|p| !r.contains(p)) && segment_hits_rect(a, b, r))
            && !self.segments.iter().any(|(c, d)| segments_meet(a, b, *c, *d))
    }

    /// The label boxes taken so far, in order.
    pub fn boxes(&self) -> &[Rect] {
        &self.boxes
    }

    /// The first candidate (index) whose box is free (0.3 mm clear) and lies
    /// inside `bounds`, which is then taken; `None` (nothing taken) when no
    /// candidate is both.
    pub fn try_choose(&mut self, candidates: &[Rect], bounds: &Rect) -> Option<usize> {
        let pick = candidates.iter().position(|r| inside(bounds, r) && self.is_free(r, 0.3))?;
        self.block(candidates[pick]);
        Some(pick)
    }

    /// The first candidate (index) whose box is free (0.3 mm clear) and inside
    /// `bounds`; failing that, the first inside `bounds` (a label that touches
    /// a line is better than one cut off by the page), then the first free
    /// one, or 0. The chosen box is then taken.
    pub fn choose(&mut self, candidates: &[Rect], bounds: &Rect) -> usize {
        let inside = |r: &Rect| inside(bounds, r);
        let pick = candidates
            .iter()
            .position(|r| inside(r) && self.is_free(r, 0.3))
            .or_else(|| candidates.iter().position(inside))
            .or_else(|| candidates.iter().position(|r| self.is_free(r, 0.0)))
            .unwrap_or(0);
        if let Some(r) = candidates.get(pick) {
            self.block(*r);
        }
        pick
    }
}

/// Whether `r` lies wholly inside `bounds`.
fn inside(bounds: &Rect, r: &Rect) -> bool {
    bounds.contains(r.min) && bounds.contains(r.max)
}

/// Distance from `p` to the nearest point of `r` (0 inside).
fn rect_distance(r: &Rect, p: Point) -> f64 {
    let dx = (r.min.x - p.x).max(p.x - r.max.x).max(0.0);
    let dy = (r.min.y - p.y).max(p.y - r.max.y).max(0.0);
    dx.hypot(dy)
}

/// Grey of leader lines: lighter than the lines they point from.
const LEADER_GRAY: f64 = 0.35;
/// Width of leader lines, mm.
const LEADER_W: f64 = 0.15;
/// Gap between a leader's end and the point it names, mm.
const LEADER_GAP_MM: f64 = 0.6;
/// Distances from the named point to the label's box along the direction
/// tried, in turn, mm.
const STANDOFFS_MM: [f64; 9] = [0.8, 1.8, 3.5, 5.5, 8.0, 11.0, 15.0, 20.0, 26.0];
/// A label whose box lies at least this far from its point gets a leader line, mm.
const LEADER_FROM_MM: f64 = 3.0;

/// Places the one-line label `s` near the point `at`: [`place_lines_near`]
/// with one line.
pub fn place_near(
    placer: &mut Placer,
    bounds: &Rect,
    s: &str,
    size_pt: f64,
    at: Point,
    prefer: Vec2,
) -> Option<Vec<Item>> {
    place_lines_near(placer, bounds, &[s], size_pt, at, prefer)
}

/// Places a label of one or more left-aligned lines near the point `at`,
/// where its box is free of the placer's boxes and lines and wholly inside
/// `bounds`, and takes its box (and its leader). Tries standoffs of 0.8 mm
/// upward in 16 directions, starting with `prefer` (any length; zero for no
/// preference) and turning away from it both ways; a box 3 mm or more from
/// the point gets a thin leader line from near `at` toward the box, itself clear of
/// everything taken but soft lines and the marks round `at`. Returns the text lines (and the leader), or `None` when
/// no place is free (or there are no lines): the caller then leaves the label
/// out rather than draw it over something.
pub fn place_lines_near(
    placer: &mut Placer,
    bounds: &Rect,
    lines: &[&str],
    size_pt: f64,
    at: Point,
    prefer: Vec2,
) -> Option<Vec<Item>> {
    if lines.is_empty() {
        return None;
    }
    // The block's size: the widest line; one em for the first line and one
    // line spacing for each further one.
    let width = lines
        .iter()
        .map(|l| text_box(Point::new(0.0, 0.0), l, size_pt, Weight::Regular, Anchor::Start).width())
        .fold(0.0, f64::max);
    let em = size_pt * MM_PER_PT;
    let step = leading(size_pt);
    let height = em + step * (lines.len() - 1) as f64;
    let (half_w, half_h) = (width / 2.0, height / 2.0);
    let start = prefer.normalized().map_or(90f64.to_radians(), Vec2::angle_rad);
    for &standoff in &STANDOFFS_MM {
        for k in 0..16 {
            // 0, +1, −1, +2, −2, … steps of 22.5° from the preferred side.
            let turn = f64::from((k + 1) / 2) * if k % 2 == 1 { 1.0 } else { -1.0 };
            let u = Vec2::from_angle(start + turn * 22.5f64.to_radians());
            // Centre the box so its nearest corner or side is `standoff` away along u.
            let reach = u.x.abs() * half_w + u.y.abs() * half_h;
            let c = at + u * (standoff + reach);
            let r = Rect {
                min: Point::new(c.x - half_w, c.y - half_h),
                max: Point::new(c.x + half_w, c.y + half_h),
            };
            if !inside(bounds, &r) || !placer.is_free(&r, 0.3) {
                continue;
            }
            // The leader runs toward the box's centre and stops just short of its border.
            let to_border = (half_w / u.x.abs()).min(half_h / u.y.abs());
            let leader = (rect_distance(&r, at) >= LEADER_FROM_MM)
                .then(|| (at + u * LEADER_GAP_MM, c - u * (to_border + 0.3)));
            if let Some((a, b)) = leader
                && !placer.is_leader_free(a, b, Some(at))
            {
                continue;
            }
            placer.block(r);
            // Baselines: the first line's ascent below the top, then one line spacing apart.
            let mut items: Vec<Item> = lines
                .iter()
                .enumerate()
                .map(|(n, l)| {
                    let y = r.max.y - 0.76 * em - step * n as f64;
                    text(Point::new(r.min.x, y), l, size_pt, Weight::Regular, Anchor::Start)
                })
                .collect();
            if let Some((a, b)) = leader {
                placer.block_line(a, b);
                items.push(Item::Line { from: a, to: b, stroke: Stroke::solid(LEADER_W).gray(LEADER_GRAY) });
            }
            return Some(items);
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_line_through_a_box_blocks_it() {
        let mut p = Placer::default();
        p.block_line(Point::new(0.0, 0.0), Point::new(10.0, 10.0));
        let r = Rect::from_corners(Point::new(4.0, 4.0), Point::new(6.0, 6.0));
        assert!(!p.is_free(&r, 0.0));
        let away = Rect::from_corners(Point::new(6.0, 0.0), Point::new(9.0, 2.0));
        assert!(p.is_free(&away, 0.0));
    }

    #[test]
    fn crossing_lines_meet_and_parallel_ones_do_not() {
        let o = Point::new(0.0, 0.0);
        assert!(segments_meet(o, Point::new(4.0, 4.0), Point::new(0.0, 4.0), Point::new(4.0, 0.0)));
        assert!(!segments_meet(o, Point::new(4.0, 0.0), Point::new(0.0, 1.0), Point::new(4.0, 1.0)));
        assert!(segments_meet(o, Point::new(4.0, 0.0), Point::new(3.0, 0.0), Point::new(6.0, 0.0)));
        assert!(!segments_meet(o, Point::new(1.0, 1.0), Point::new(2.0, 0.0), Point::new(3.0, -5.0)));
    }

    #[test]
    fn a_label_near_a_point_avoids_a_line_through_it() {
        let mut p = Placer::default();
        // A horizontal line through the point: the label goes above it (the
        // preferred side), its box clear of the line.
        let at = Point::new(50.0, 50.0);
        p.block_line(Point::new(0.0, 50.0), Point::new(100.0, 50.0));
        let bounds = Rect::from_corners(Point::new(0.0, 0.0), Point::new(100.0, 100.0));
        let items = place_near(&mut p, &bounds, "r = 19.6°", 7.0, at, Vec2::new(0.0, 1.0)).unwrap();
        let Item::Text { at: t, .. } = &items[0] else { panic!("text first") };
        let b = text_box(*t, "r = 19.6°", 7.0, Weight::Regular, Anchor::Start);
        assert!(b.min.y > 50.0 && b.min.y < 52.0, "{b:?}");
        let taken = p.boxes().last().unwrap();
        assert!(taken.min.distance(b.min) < 1e-9 && taken.max.distance(b.max) < 1e-9, "{taken:?} {b:?}");
        // A second label at the same point cannot take the same place.
        let again = place_near(&mut p, &bounds, "r = 19.6°", 7.0, at, Vec2::new(0.0, 1.0)).unwrap();
        let Item::Text { at: t2, .. } = &again[0] else { panic!("text first") };
        assert!(!text_box(*t2, "r = 19.6°", 7.0, Weight::Regular, Anchor::Start).overlaps(&b));
    }

    #[test]
    fn a_block_of_lines_stacks_down_from_its_top() {
        let mut p = Placer::default();
        let bounds = Rect::from_corners(Point::new(0.0, 0.0), Point::new(100.0, 100.0));
        let lines = ["A: e = 60.2°", "B: e = 48.0°", "C: e = 41.7°"];
        let items =
            place_lines_near(&mut p, &bounds, &lines, 7.0, Point::new(50.0, 50.0), Vec2::new(0.0, 1.0))
                .unwrap();
        assert_eq!(items.len(), 3);
        let at: Vec<Point> = items
            .iter()
            .map(|i| match i {
                Item::Text { at, .. } => *at,
                other => panic!("text only, got {other:?}"),
            })
            .collect();
        for w in at.windows(2) {
            assert!((w[0].x - w[1].x).abs() < 1e-12);
            assert!((w[0].y - w[1].y - leading(7.0)).abs() < 1e-12);
        }
        // The block sits above the point, its lowest line's box inside the taken box.
        let taken = p.boxes()[0];
        assert!(taken.min.y >= 50.8 - 1e-9, "{taken:?}");
        let last = text_box(at[2], lines[2], 7.0, Weight::Regular, Anchor::Start);
        assert!((last.min.y - taken.min.y).abs() < 1e-9);
    }

    #[test]
    fn no_room_means_no_label() {
        let mut p = Placer::default();
        let bounds = Rect::from_corners(Point::new(0.0, 0.0), Point::new(5.0, 3.0));
        assert_eq!(
            place_near(&mut p, &bounds, "a long label", 7.0, Point::new(2.5, 1.5), Vec2::default()),
            None
        );
        assert!(p.boxes().is_empty());
    }

    #[test]
    fn a_leader_may_cross_a_soft_line_but_not_a_hard_one() {
        let bounds = Rect::from_corners(Point::new(0.0, 0.0), Point::new(100.0, 100.0));
        // The point sits in a 12 mm square too small for the label: the label
        // must stand off, its leader crossing the square's side.
        let at = Point::new(50.0, 50.0);
        let square = [
            Point::new(44.0, 44.0),
            Point::new(56.0, 44.0),
            Point::new(56.0, 56.0),
            Point::new(44.0, 56.0),
            Point::new(44.0, 44.0),
        ];
        let s = "a longer label";
        let mut soft = Placer::default();
        soft.block_soft_path(&square);
        let items = place_near(&mut soft, &bounds, s, 7.0, at, Vec2::new(0.0, 1.0)).unwrap();
        assert_eq!(items.len(), 2, "text and leader: {items:?}");
        let mut hard = Placer::default();
        hard.block_path(&square);
        assert_eq!(place_near(&mut hard, &bounds, s, 7.0, at, Vec2::new(0.0, 1.0)), None);
    }
}
