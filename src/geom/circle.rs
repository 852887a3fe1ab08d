//! Circles and circular arcs: exact ray–circle intersection.

use super::{Point, Ray, Vec2};

/// Distances along `ray` (ascending) where it meets the circle of `radius` about
/// `center`. `None` entries: the ray misses or is tangent (a tangent touch is
/// reported once, as the first entry).
pub fn ray_circle_hits(ray: &Ray, center: Point, radius: f64) -> [Option<f64>; 2] {
    // |o + s d - c|² = r²  with |d| = 1:  s² + 2 b s + c0 = 0
    let oc = ray.origin - center;
    let b = oc.dot(ray.dir);
    let c0 = oc.dot(oc) - radius * radius;
    let disc = b * b - c0;
    if disc < 0.0 || !disc.is_finite() {
        return [None, None];
    }
    if disc == 0.0 {
        return [Some(-b), None];
    }
    let root = disc.sqrt();
    // Numerically stable pair: avoid cancellation in -b ± root.
    let q = if b > 0.0 { -b - root } else { -b + root };
    let s1 = q;
    let s2 = if q != 0.0 { c0 / q } else { -b - root };
    let (lo, hi) = if s1 < s2 { (s1, s2) } else { (s2, s1) };
    [Some(lo), Some(hi)]
}

/// A circular arc: centre, radius, start angle and signed sweep (counterclockwise
/// positive), angles in radians from +x.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Arc {
    /// Centre of curvature.
    pub center: Point,
    /// Radius, > 0.
    pub radius: f64,
    /// Angle of the start point from the centre.
    pub start_rad: f64,
    /// Signed sweep from the start point to the end point.
    pub sweep_rad: f64,
}

impl Arc {
    /// The arc about `center` from point `from` to point `to` (both on the
    /// circle) going the short way round. `None` if the points coincide or are
    /// not at a common distance from the centre (to 1e-9 relative).
    pub fn short_way(center: Point, from: Point, to: Point) -> Option<Arc> {
        let r1 = from.distance(center);
        let r2 = to.distance(center);
        if r1 <= 0.0 || (r1 - r2).abs() > 1e-9 * r1.max(1.0) || from == to {
            return None;
        }
        let a0 = (from - center).angle_rad();
        let a1 = (to - center).angle_rad();
        let mut sweep = a1 - a0;
        while sweep > std::f64::consts::PI {
            sweep -= std::f64::consts::TAU;
        }
        while sweep <= -std::f64::consts::PI {
            sweep += std::f64::consts::TAU;
        }
        Some(Arc { center, radius: r1, start_rad: a0, sweep_rad: sweep })
    }

    /// The point at angle `angle_rad` on the arc's circle.
    pub fn point_at_angle(&self, angle_rad: f64) -> Point {
        self.center + Vec2::from_angle(angle_rad) * self.radius
    }

    /// Start point.
    pub fn start(&self) -> Point {
        self.point_at_angle(self.start_rad)
    }

    /// End point.
    pub fn end(&self) -> Point {
        self.point_at_angle(self.start_rad + self.sweep_rad)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    #[test]
    fn ray_through_centre_hits_at_distance_minus_and_plus_radius() {
        let ray = Ray::new(Point::new(-10.0, 0.0), Vec2::new(1.0, 0.0)).unwrap();
        let [a, b] = ray_circle_hits(&ray, Point::new(0.0, 0.0), 3.0);
        assert_close(a.unwrap(), 7.0, 1e-12);
        assert_close(b.unwrap(), 13.0, 1e-12);
    }

    #[test]
    fn ray_above_circle_misses() {
        let ray = Ray::new(Point::new(-10.0, 3.5), Vec2::new(1.0, 0.0)).unwrap();
        assert_eq!(ray_circle_hits(&ray, Point::new(0.0, 0.0), 3.0), [None, None]);
    }

    #[test]
    fn chord_hit_matches_pythagoras() {
        // A horizontal ray at height h meets a circle of radius r at x = ±sqrt(r² − h²).
        let ray = Ray::new(Point::new(-10.0, 1.8), Vec2::new(1.0, 0.0)).unwrap();
        let [a, _] = ray_circle_hits(&ray, Point::new(0.0, 0.0), 3.0);
        assert_close(a.unwrap(), 10.0 - (9.0f64 - 1.8 * 1.8).sqrt(), 1e-12);
    }

    #[test]
    fn short_way_arc_spans_the_quarter() {
        let arc = Arc::short_way(Point::new(0.0, 0.0), Point::new(1.0, 0.0), Point::new(0.0, 1.0)).unwrap();
        assert_close(arc.sweep_rad, std::f64::consts::FRAC_PI_2, 1e-12);
        assert_close(arc.end().x, 0.0, 1e-12);
    }
}
