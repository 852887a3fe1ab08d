//! Plane geometry underneath everything: points, vectors, rays, segments,
//! circles, closed shapes of line and arc edges, and rigid placements.
//!
//! Knows nothing of light or paper. Degenerate cases (parallel lines, a ray that
//! misses) come back as `None`, never as NaN.

mod circle;
mod placement;
mod point;
mod segment;
mod shape;

pub use circle::{Arc, ray_circle_hits};
pub use placement::Placement;
pub use point::{Point, Vec2};
pub use segment::Segment;
pub use shape::{Edge, EdgePath, Hit, Shape, ShapeError};

/// A half-line: an origin and a unit direction.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Ray {
    /// Where the ray starts.
    pub origin: Point,
    /// Unit direction of travel.
    pub dir: Vec2,
}

impl Ray {
    /// A ray from `origin` along `dir`; `dir` is normalized here. Returns `None`
    /// for a zero or non-finite direction.
    pub fn new(origin: Point, dir: Vec2) -> Option<Ray> {
        dir.normalized().map(|dir| Ray { origin, dir })
    }

    /// The point at distance `s` along the ray.
    pub fn at(&self, s: f64) -> Point {
        self.origin + self.dir * s
    }
}

#[cfg(test)]
pub(crate) mod testutil {
    /// Asserts `|actual - expected| <= tol`, printing both values on failure.
    #[track_caller]
    pub fn assert_close(actual: f64, expected: f64, tol: f64) {
        assert!(
            (actual - expected).abs() <= tol,
            "expected {expected} ± {tol}, got {actual} (off by {:e})",
            actual - expected
        );
    }
}
