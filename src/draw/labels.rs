//! Placing labels where they overlap neither other labels nor drawn lines,
//! with a leader line when a label has to stand off from what it names.

use super::text::{text, text_box};
use crate::geom::{Point, Vec2};
use crate::scene::{Anchor, Item, Rect, Stroke, Weight};

/// Occupied space on a page: label boxes and line segments.
#[derive(Default, Debug, Clone)]
pub struct Placer {
    boxes: Vec<Rect>,
    segments: Vec<(Point, Point)>,
}

fn segment_hits_rect(a: Point, b: Point, r: &Rect) -> bool {
    // Liang–Barsky clipping: does any part of a→b lie inside r?
    let (dx, dy) = (b.x - a.x, b.y - a.y);
    let mut t0: f64 = 0.0;
    let mut t1: f64 = 1.0;
    for (p, q) in [(-dx, a.x - r.min.x), (dx, r.max.x - a.x), (-dy, a.y - r.min.y), (dy, r.max.y - a.y)] {
        if p == 0.0 {
            if q < 0.0 {
                return false;
            }
        } else {
            let t = q / p;
            if p < 0.0 {
                t0 = t0.max(t);
            } else {
                t1 = t1.min(t);
            }
            if t0 > t1 {
                return false;
            }
        }
    }
    true
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
    (0.0..=1.0).contains(&t) && (0.0..=1.0).contains(&u)
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

    /// Whether a box is free of everything taken (with `pad` mm around it).
    pub fn is_free(&self, r: &Rect, pad: f64) -> bool {
        let g = Rect {
            min: Point::new(r.min.x - pad, r.min.y - pad),
            max: Point::new(r.max.x + pad, r.max.y + pad),
        };
        !self.boxes.iter().any(|b| b.overlaps(&g))
            && !self.segments.iter().any(|(a, b)| segment_hits_rect(*a, *b, &g))
    }

    /// Whether the line a–b crosses no taken box and no taken line.
    pub fn is_line_free(&self, a: Point, b: Point) -> bool {
        !self.boxes.iter().any(|r| segment_hits_rect(a, b, r))
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

/// Grey of leader lines: lighter than the lines they point from.
const LEADER_GRAY: f64 = 0.35;
/// Width of leader lines, mm.
const LEADER_W: f64 = 0.15;
/// Gap between a leader's end and the point it names, mm.
const LEADER_GAP_MM: f64 = 0.6;
/// Distances from the named point to the nearest side of the label's box
/// tried in turn, mm; from the third on, a leader line joins them.
const STANDOFFS_MM: [f64; 8] = [0.8, 1.8, 3.5, 5.5, 8.0, 11.0, 15.0, 20.0];
/// Standoffs at least this long get a leader line, mm.
const LEADER_FROM_MM: f64 = 3.0;

/// Places the one-line label `s` near the point `at`, where it is free of the
/// placer's boxes and lines and wholly inside `bounds`, and takes its box (and
/// its leader). Tries standoffs of 0.8 mm upward in 16 directions, starting
/// with `prefer` (any length; zero for no preference) and turning away from it
/// both ways; a label 3 mm or more away gets a thin leader line from near `at`
/// to the box, itself clear of everything taken. Returns the text (and the
/// leader), or `None` when no place is free: the caller then leaves the
/// label out rather than draw it over something.
pub fn place_near(
    placer: &mut Placer,
    bounds: &Rect,
    s: &str,
    size_pt: f64,
    at: Point,
    prefer: Vec2,
) -> Option<Vec<Item>> {
    // The box of the text with its baseline reference at the origin, centred.
    let b0 = text_box(Point::new(0.0, 0.0), s, size_pt, Weight::Regular, Anchor::Middle);
    let (half_w, half_h) = (b0.width() / 2.0, b0.height() / 2.0);
    let mid_y = (b0.min.y + b0.max.y) / 2.0;
    let start = prefer.normalized().map_or(90f64.to_radians(), Vec2::angle_rad);
    for &standoff in &STANDOFFS_MM {
        for k in 0..16 {
            // 0, +1, −1, +2, −2, … steps of 22.5° from the preferred side.
            let step = f64::from((k + 1) / 2) * if k % 2 == 1 { 1.0 } else { -1.0 };
            let u = Vec2::from_angle(start + step * 22.5f64.to_radians());
            // Centre the box so its nearest side is `standoff` away along u.
            let reach = u.x.abs() * half_w + u.y.abs() * half_h;
            let c = at + u * (standoff + reach);
            let r = Rect {
                min: Point::new(c.x - half_w, c.y - half_h),
                max: Point::new(c.x + half_w, c.y + half_h),
            };
            if !inside(bounds, &r) || !placer.is_free(&r, 0.3) {
                continue;
            }
            let leader =
                (standoff >= LEADER_FROM_MM).then(|| (at + u * LEADER_GAP_MM, c - u * (reach + 0.3)));
            if let Some((a, b)) = leader
                && !placer.is_line_free(a, b)
            {
                continue;
            }
            placer.block(r);
            let mut items =
                vec![text(Point::new(c.x, c.y - mid_y), s, size_pt, Weight::Regular, Anchor::Middle)];
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
        let b = text_box(*t, "r = 19.6°", 7.0, Weight::Regular, Anchor::Middle);
        assert!(b.min.y > 50.0 && b.min.y < 52.0, "{b:?}");
        let taken = p.boxes().last().unwrap();
        assert!(taken.min.distance(b.min) < 1e-9 && taken.max.distance(b.max) < 1e-9, "{taken:?} {b:?}");
        // A second label at the same point cannot take the same place.
        let again = place_near(&mut p, &bounds, "r = 19.6°", 7.0, at, Vec2::new(0.0, 1.0)).unwrap();
        let Item::Text { at: t2, .. } = &again[0] else { panic!("text first") };
        assert!(!text_box(*t2, "r = 19.6°", 7.0, Weight::Regular, Anchor::Middle).overlaps(&b));
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
}
