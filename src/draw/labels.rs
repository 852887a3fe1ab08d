//! Placing labels where they overlap neither other labels nor drawn lines.

use crate::geom::Point;
use crate::scene::Rect;

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

    /// The first candidate (index) whose box is free (0.3 mm clear) and inside
    /// `bounds`; failing that, the first inside `bounds` (a label that touches
    /// a line is better than one cut off by the page), then the first free
    /// one, or 0. The chosen box is then taken.
    pub fn choose(&mut self, candidates: &[Rect], bounds: &Rect) -> usize {
        let inside = |r: &Rect| bounds.contains(r.min) && bounds.contains(r.max);
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
}
