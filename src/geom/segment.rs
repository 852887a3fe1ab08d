//! Straight segments and their intersection with rays.

use super::{Point, Ray, Vec2};

/// A straight segment from `a` to `b`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Segment {
    /// Start point.
    pub a: Point,
    /// End point.
    pub b: Point,
}

impl Segment {
    /// A segment from `a` to `b`.
    pub const fn new(a: Point, b: Point) -> Segment {
        Segment { a, b }
    }

    /// Length of the segment.
    pub fn length(&self) -> f64 {
        self.a.distance(self.b)
    }

    /// Distance along `ray` to where it crosses this segment, if it does so
    /// beyond `min_s`. `None` when the ray is parallel to the segment, misses it,
    /// or the segment has zero length.
    pub fn ray_hit(&self, ray: &Ray, min_s: f64) -> Option<f64> {
        let e = self.b - self.a;
        let denom = ray.dir.cross(e);
        if denom.abs() < 1e-15 * e.length().max(1.0) {
            return None;
        }
        let w = self.a - ray.origin;
        let s = w.cross(e) / denom;
        let u = w.cross(ray.dir) / denom;
        (s > min_s && (-1e-12..=1.0 + 1e-12).contains(&u)).then_some(s)
    }

    /// Unit normal: the segment direction turned a quarter turn counterclockwise.
    /// `None` for a zero-length segment.
    pub fn normal(&self) -> Option<Vec2> {
        (self.b - self.a).normalized().map(Vec2::perp)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    #[test]
    fn horizontal_ray_meets_vertical_segment() {
        let seg = Segment::new(Point::new(5.0, -1.0), Point::new(5.0, 1.0));
        let ray = Ray::new(Point::new(0.0, 0.5), Vec2::new(1.0, 0.0)).unwrap();
        assert_close(seg.ray_hit(&ray, 1e-9).unwrap(), 5.0, 1e-12);
    }

    #[test]
    fn parallel_ray_misses() {
        let seg = Segment::new(Point::new(0.0, 1.0), Point::new(5.0, 1.0));
        let ray = Ray::new(Point::new(0.0, 0.0), Vec2::new(1.0, 0.0)).unwrap();
        assert_eq!(seg.ray_hit(&ray, 1e-9), None);
    }

    #[test]
    fn segment_behind_ray_is_not_hit() {
        let seg = Segment::new(Point::new(-5.0, -1.0), Point::new(-5.0, 1.0));
        let ray = Ray::new(Point::new(0.0, 0.0), Vec2::new(1.0, 0.0)).unwrap();
        assert_eq!(seg.ray_hit(&ray, 1e-9), None);
    }
}
