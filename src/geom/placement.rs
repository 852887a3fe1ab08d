//! A rigid placement on the sheet: a rotation about the origin, then a
//! translation. Rigid so that arcs stay exact circles.

use super::{Point, Vec2};

/// Rotate by `rotation_rad` (counterclockwise) about the origin, then move by `offset`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Placement {
    /// Counterclockwise rotation, radians.
    pub rotation_rad: f64,
    /// Translation applied after the rotation, mm.
    pub offset: Vec2,
    cos: f64,
    sin: f64,
}

impl Default for Placement {
    fn default() -> Placement {
        Placement::IDENTITY
    }
}

impl Placement {
    /// No movement.
    pub const IDENTITY: Placement =
        Placement { rotation_rad: 0.0, offset: Vec2::new(0.0, 0.0), cos: 1.0, sin: 0.0 };

    /// A rotation by `rotation_rad` followed by a move by `offset`.
    pub fn new(rotation_rad: f64, offset: Vec2) -> Placement {
        Placement { rotation_rad, offset, cos: rotation_rad.cos(), sin: rotation_rad.sin() }
    }

    /// A pure translation.
    pub fn translation(offset: Vec2) -> Placement {
        Placement { offset, ..Placement::IDENTITY }
    }

    /// Where the point `p` goes.
    pub fn apply(&self, p: Point) -> Point {
        Point::new(
            self.cos * p.x - self.sin * p.y + self.offset.x,
            self.sin * p.x + self.cos * p.y + self.offset.y,
        )
    }

    /// Where the direction `v` goes (rotation only).
    pub fn apply_vec(&self, v: Vec2) -> Vec2 {
        Vec2::new(self.cos * v.x - self.sin * v.y, self.sin * v.x + self.cos * v.y)
    }

    /// This placement followed by `then`.
    pub fn then(&self, then: &Placement) -> Placement {
        let o = then.apply(Point::new(self.offset.x, self.offset.y));
        Placement::new(self.rotation_rad + then.rotation_rad, Vec2::new(o.x, o.y))
    }

    /// The placement that undoes this one.
    pub fn inverse(&self) -> Placement {
        let back = Placement::new(-self.rotation_rad, Vec2::new(0.0, 0.0));
        let o = back.apply_vec(-self.offset);
        Placement::new(-self.rotation_rad, o)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    #[test]
    fn quarter_turn_then_move() {
        let p = Placement::new(std::f64::consts::FRAC_PI_2, Vec2::new(1.0, 2.0));
        let q = p.apply(Point::new(3.0, 0.0));
        assert_close(q.x, 1.0, 1e-15);
        assert_close(q.y, 5.0, 1e-15);
    }

    #[test]
    fn inverse_and_composition_round_trip() {
        let p = Placement::new(0.9, Vec2::new(-4.0, 7.5));
        let q = Placement::new(-2.1, Vec2::new(1.0, 0.25));
        let x = Point::new(12.0, -3.0);
        let back = p.inverse().apply(p.apply(x));
        assert_close(back.x, x.x, 1e-12);
        assert_close(back.y, x.y, 1e-12);
        let both = p.then(&q).apply(x);
        let step = q.apply(p.apply(x));
        assert_close(both.x, step.x, 1e-12);
        assert_close(both.y, step.y, 1e-12);
    }
}
