//! Points and vectors in millimetres; a point is not a vector.

use std::ops::{Add, Mul, Neg, Sub};

/// A position in the plane, millimetres.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
pub struct Point {
    /// Along the optical axis (or across the page).
    pub x: f64,
    /// Across the axis (or up the page).
    pub y: f64,
}

/// A displacement or direction in the plane.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
pub struct Vec2 {
    /// x component.
    pub x: f64,
    /// y component.
    pub y: f64,
}

impl Point {
    /// A point at `(x, y)`.
    pub const fn new(x: f64, y: f64) -> Point {
        Point { x, y }
    }

    /// Distance to another point.
    pub fn distance(self, other: Point) -> f64 {
        (self - other).length()
    }

    /// The vector from the origin to this point.
    pub fn to_vec(self) -> Vec2 {
        Vec2::new(self.x, self.y)
    }
}

impl Vec2 {
    /// A vector `(x, y)`.
    pub const fn new(x: f64, y: f64) -> Vec2 {
        Vec2 { x, y }
    }

    /// Unit vector at `angle_rad` from +x, counterclockwise.
    pub fn from_angle(angle_rad: f64) -> Vec2 {
        Vec2::new(angle_rad.cos(), angle_rad.sin())
    }

    /// Dot product.
    pub fn dot(self, o: Vec2) -> f64 {
        self.x * o.x + self.y * o.y
    }

    /// z component of the cross product (positive when `o` is counterclockwise of `self`).
    pub fn cross(self, o: Vec2) -> f64 {
        self.x * o.y - self.y * o.x
    }

    /// Euclidean length.
    pub fn length(self) -> f64 {
        self.x.hypot(self.y)
    }

    /// This vector scaled to unit length; `None` when it is zero or not finite.
    pub fn normalized(self) -> Option<Vec2> {
        let len = self.length();
        (len > 0.0 && len.is_finite()).then(|| Vec2::new(self.x / len, self.y / len))
    }

    /// Rotated a quarter turn counterclockwise.
    pub fn perp(self) -> Vec2 {
        Vec2::new(-self.y, self.x)
    }

    /// Angle from +x, counterclockwise, in (-π, π].
    pub fn angle_rad(self) -> f64 {
        self.y.atan2(self.x)
    }

    /// The angle that turns `self` onto `o`, counterclockwise positive, in (−π, π].
    pub fn signed_angle_to(self, o: Vec2) -> f64 {
        self.cross(o).atan2(self.dot(o))
    }
}

impl Add<Vec2> for Point {
    type Output = Point;
    fn add(self, v: Vec2) -> Point {
        Point::new(self.x + v.x, self.y + v.y)
    }
}

impl Sub<Vec2> for Point {
    type Output = Point;
    fn sub(self, v: Vec2) -> Point {
        Point::new(self.x - v.x, self.y - v.y)
    }
}

impl Sub for Point {
    type Output = Vec2;
    fn sub(self, o: Point) -> Vec2 {
        Vec2::new(self.x - o.x, self.y - o.y)
    }
}

impl Add for Vec2 {
    type Output = Vec2;
    fn add(self, o: Vec2) -> Vec2 {
        Vec2::new(self.x + o.x, self.y + o.y)
    }
}

impl Sub for Vec2 {
    type Output = Vec2;
    fn sub(self, o: Vec2) -> Vec2 {
        Vec2::new(self.x - o.x, self.y - o.y)
    }
}

impl Mul<f64> for Vec2 {
    type Output = Vec2;
    fn mul(self, s: f64) -> Vec2 {
        Vec2::new(self.x * s, self.y * s)
    }
}

impl Neg for Vec2 {
    type Output = Vec2;
    fn neg(self) -> Vec2 {
        Vec2::new(-self.x, -self.y)
    }
}
