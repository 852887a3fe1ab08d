//! Closed shapes made of straight and circular-arc edges, each edge tagged
//! with the face it belongs to; exact ray–edge hits and outward normals.
//!
//! A shape runs counterclockwise (the inside lies to the left of every edge),
//! so a convex bulge is an arc swept counterclockwise (positive sweep) and a
//! hollow is an arc swept clockwise (negative sweep).

use std::f64::consts::{PI, TAU};

use super::{Arc, Placement, Point, Ray, Segment, Vec2, ray_circle_hits};

/// The path of one edge, from its start point to its end point.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum EdgePath {
    /// A straight line.
    Line(Segment),
    /// A circular arc; positive sweep is counterclockwise.
    Arc(Arc),
}

impl EdgePath {
    /// Start point.
    pub fn start(&self) -> Point {
        match self {
            EdgePath::Line(s) => s.a,
            EdgePath::Arc(a) => a.start(),
        }
    }

    /// End point.
    pub fn end(&self) -> Point {
        match self {
            EdgePath::Line(s) => s.b,
            EdgePath::Arc(a) => a.end(),
        }
    }

    /// Length along the edge, mm.
    pub fn length(&self) -> f64 {
        match self {
            EdgePath::Line(s) => s.length(),
            EdgePath::Arc(a) => a.radius * a.sweep_rad.abs(),
        }
    }

    /// The point halfway along the edge.
    pub fn midpoint(&self) -> Point {
        match self {
            EdgePath::Line(s) => s.a + (s.b - s.a) * 0.5,
            EdgePath::Arc(a) => a.point_at_angle(a.start_rad + a.sweep_rad / 2.0),
        }
    }

    /// The same path moved by `placement`.
    pub fn placed(&self, placement: &Placement) -> EdgePath {
        match self {
            EdgePath::Line(s) => EdgePath::Line(Segment::new(placement.apply(s.a), placement.apply(s.b))),
            EdgePath::Arc(a) => EdgePath::Arc(Arc {
                center: placement.apply(a.center),
                radius: a.radius,
                start_rad: a.start_rad + placement.rotation_rad,
                sweep_rad: a.sweep_rad,
            }),
        }
    }
}

/// One edge of a shape and the face it belongs to.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Edge<F> {
    /// Where the edge runs.
    pub path: EdgePath,
    /// The face it belongs to (several edges may share a face).
    pub face: F,
}

/// Where a ray meets a shape.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Hit<F> {
    /// Distance along the ray, mm.
    pub s: f64,
    /// Which edge (index into [`Shape::edges`]).
    pub edge: usize,
    /// The face of that edge.
    pub face: F,
    /// The point hit.
    pub point: Point,
    /// Unit normal of the edge at the point, pointing out of the shape.
    pub outward: Vec2,
}

/// Why a list of edges is not a closed shape.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ShapeError {
    /// No edges of positive length.
    Empty,
    /// Edge `index` does not end where the next one starts (gap in mm).
    Gap {
        /// The edge whose end is off.
        index: usize,
        /// Distance between its end and the next start, mm.
        gap_mm: f64,
    },
    /// The edges run clockwise or enclose no area.
    Orientation,
    /// An arc with a radius or sweep that is not finite and positive.
    BadArc {
        /// The edge.
        index: usize,
    },
}

impl std::fmt::Display for ShapeError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            ShapeError::Empty => write!(f, "the shape has no edges"),
            ShapeError::Gap { index, gap_mm } => {
                write!(f, "edge {index} ends {gap_mm:e} mm away from where the next one starts")
            }
            ShapeError::Orientation => write!(f, "the edges do not run counterclockwise round an area"),
            ShapeError::BadArc { index } => write!(f, "edge {index} is not a usable arc"),
        }
    }
}

impl std::error::Error for ShapeError {}

/// Largest gap between consecutive edges that still counts as joined, mm
/// (for shapes of everyday size; see [`Shape::new`]).
const JOIN_TOL_MM: f64 = 1e-6;
/// Edges shorter than this are dropped (a knife edge), mm.
const MIN_EDGE_MM: f64 = 1e-9;
/// How far past an edge's end a hit still counts as on the edge, mm.
const END_TOL_MM: f64 = 1e-12;

/// A closed counterclockwise outline of line and arc edges.
#[derive(Clone, Debug, PartialEq)]
pub struct Shape<F> {
    edges: Vec<Edge<F>>,
    /// Bounding box, worked out once: (lower-left, upper-right).
    bounds: (Point, Point),
    /// Each arc edge's end points, worked out once (`None` for lines).
    arc_ends: Vec<Option<(Point, Point)>>,
}

impl<F: Copy> Shape<F> {
    /// Checks and builds a shape. Edges shorter than 1e-9 mm are dropped; each
    /// remaining edge must end where the next begins (to 1e-6 mm, the last
    /// joining the first) and the whole must run counterclockwise.
    pub fn new(edges: Vec<Edge<F>>) -> Result<Shape<F>, ShapeError> {
        for (i, e) in edges.iter().enumerate() {
            if let EdgePath::Arc(a) = e.path
                && !(a.radius.is_finite()
                    && a.radius > 0.0
                    && a.sweep_rad.is_finite()
                    && a.start_rad.is_finite()
                    && a.sweep_rad.abs() <= TAU)
            {
                return Err(ShapeError::BadArc { index: i });
            }
        }
        let edges: Vec<Edge<F>> = edges.into_iter().filter(|e| e.path.length() > MIN_EDGE_MM).collect();
        if edges.is_empty() {
            return Err(ShapeError::Empty);
        }
        // Joins are checked to 1e-6 mm, or to 1e-12 of the coordinates' size for
        // very large shapes, where rounding alone exceeds a micrometre.
        let scale = edges.iter().fold(0.0f64, |m, e| {
            let c = match e.path {
                EdgePath::Arc(a) => a.center.x.abs().max(a.center.y.abs()) + a.radius,
                EdgePath::Line(s) => s.a.x.abs().max(s.a.y.abs()),
            };
            m.max(c)
        });
        let tol = JOIN_TOL_MM.max(scale * 1e-12);
        for i in 0..edges.len() {
            let next = &edges[(i + 1) % edges.len()];
            let gap = edges[i].path.end().distance(next.path.start());
            if gap.is_nan() || gap > tol {
                return Err(ShapeError::Gap { index: i, gap_mm: gap });
            }
        }
        let mut shape =
            Shape { edges, bounds: (Point::new(0.0, 0.0), Point::new(0.0, 0.0)), arc_ends: Vec::new() };
        shape.cache();
        let area = shape.signed_area();
        if area.is_nan() || area <= 0.0 {
            return Err(ShapeError::Orientation);
        }
        Ok(shape)
    }

    /// The edges in counterclockwise order.
    pub fn edges(&self) -> &[Edge<F>] {
        &self.edges
    }

    /// Enclosed area, mm² (positive for a counterclockwise shape): the shoelace
    /// sum over the chords plus, for each arc, its circular segment
    /// r²(θ − sin θ)/2, signed with the sweep.
    pub fn signed_area(&self) -> f64 {
        let mut area = 0.0;
        for e in &self.edges {
            let (a, b) = (e.path.start(), e.path.end());
            area += 0.5 * (a.x * b.y - b.x * a.y);
            if let EdgePath::Arc(arc) = e.path {
                let th = arc.sweep_rad;
                area += 0.5 * arc.radius * arc.radius * (th - th.sin());
            }
        }
        area
    }

    /// The shape moved by `placement` (a rotation and a translation keep arcs
    /// exact circles).
    pub fn placed(&self, placement: &Placement) -> Shape<F> {
        let mut shape = Shape {
            edges: self.edges.iter().map(|e| Edge { path: e.path.placed(placement), face: e.face }).collect(),
            bounds: self.bounds,
            arc_ends: Vec::new(),
        };
        shape.cache();
        shape
    }

    /// Works out what hit tests reuse: the bounding box and the arcs' end points.
    fn cache(&mut self) {
        self.arc_ends = self
            .edges
            .iter()
            .map(|e| match e.path {
                EdgePath::Arc(a) => Some((a.start(), a.end())),
                EdgePath::Line(_) => None,
            })
            .collect();
        self.bounds = self.compute_bounds();
    }

    /// Every hit of `ray` with the outline beyond `min_s`, in no order.
    fn hits(&self, ray: &Ray, min_s: f64, mut f: impl FnMut(Hit<F>)) {
        for (i, e) in self.edges.iter().enumerate() {
            match e.path {
                EdgePath::Line(seg) => {
                    if let Some(s) = seg.ray_hit(ray, min_s)
                        && let Some(inward) = seg.normal()
                    {
                        f(Hit { s, edge: i, face: e.face, point: ray.at(s), outward: -inward });
                    }
                }
                EdgePath::Arc(arc) => {
                    for s in ray_circle_hits(ray, arc.center, arc.radius).into_iter().flatten() {
                        if s <= min_s {
                            continue;
                        }
                        let p = ray.at(s);
                        let inside = match self.arc_ends[i] {
                            Some(ends) if arc.sweep_rad.abs() <= PI => in_wedge(&arc, ends, p),
                            _ => on_arc(&arc, p),
                        };
                        if inside {
                            let radial = (p - arc.center) * (1.0 / arc.radius);
                            let outward = if arc.sweep_rad > 0.0 { radial } else { -radial };
                            f(Hit { s, edge: i, face: e.face, point: p, outward });
                        }
                    }
                }
            }
        }
    }

    /// The nearest hit of `ray` with the outline beyond distance `min_s`;
    /// `None` when the ray meets nothing ahead.
    pub fn nearest_hit(&self, ray: &Ray, min_s: f64) -> Option<Hit<F>> {
        let mut best: Option<Hit<F>> = None;
        self.hits(ray, min_s, |h| {
            if best.is_none_or(|b| h.s < b.s) {
                best = Some(h);
            }
        });
        best
    }

    /// Whether `p` lies strictly inside (even–odd rule along a ray whose
    /// direction avoids the shape's vertices).
    pub fn contains(&self, p: Point) -> bool {
        let (lo, hi) = self.bounds;
        if p.x < lo.x || p.x > hi.x || p.y < lo.y || p.y > hi.y {
            return false;
        }
        // An irrational-looking direction keeps the test ray off corners and tangents.
        let Some(ray) = Ray::new(p, Vec2::new(0.853_094_2, 0.521_756_3)) else { return false };
        let mut n = 0usize;
        self.hits(&ray, 0.0, |_| n += 1);
        n % 2 == 1
    }

    /// Bounding box of the outline: (lower-left, upper-right).
    pub fn bounds(&self) -> (Point, Point) {
        self.bounds
    }

    fn compute_bounds(&self) -> (Point, Point) {
        let mut lo = Point::new(f64::INFINITY, f64::INFINITY);
        let mut hi = Point::new(f64::NEG_INFINITY, f64::NEG_INFINITY);
        let mut take = |p: Point| {
            lo = Point::new(lo.x.min(p.x), lo.y.min(p.y));
            hi = Point::new(hi.x.max(p.x), hi.y.max(p.y));
        };
        for e in &self.edges {
            take(e.path.start());
            take(e.path.end());
            if let EdgePath::Arc(arc) = e.path {
                // The arc's extreme points at 0°, 90°, 180° and 270°, where it reaches them.
                for k in 0..4 {
                    let ang = f64::from(k) * TAU / 4.0;
                    let p = arc.point_at_angle(ang);
                    if on_arc(&arc, p) {
                        take(p);
                    }
                }
            }
        }
        (lo, hi)
    }

    /// The edges of one face.
    pub fn face_edges(&self, face: F) -> impl Iterator<Item = &Edge<F>>
    where
        F: PartialEq,
    {
        self.edges.iter().filter(move |e| e.face == face)
    }
}

/// Whether `p` (on the circle of an arc sweeping at most π) lies within the
/// arc: between its end points in the sense of the sweep, by cross products
/// (no trigonometry), to [`END_TOL_MM`] along the circle.
/// The tolerance on a cross product of two radii is r·tol (r² times the angle).
fn in_wedge(arc: &Arc, (start, end): (Point, Point), p: Point) -> bool {
    let sense = arc.sweep_rad.signum();
    let tol = END_TOL_MM * arc.radius;
    let (a, b, q) = (start - arc.center, end - arc.center, p - arc.center);
    // For a sweep θ ≤ π (counterclockwise; clockwise mirrors it): a × q ≥ 0
    // puts q at angles [0, π] from a, q × b ≥ 0 at [θ − π, θ]; together [0, θ].
    sense * a.cross(q) >= -tol && sense * q.cross(b) >= -tol
}

/// Whether `p` (on the arc's circle) lies within the arc's sweep, to
/// [`END_TOL_MM`] along the circle.
fn on_arc(arc: &Arc, p: Point) -> bool {
    let phi = (p - arc.center).angle_rad();
    let tol = END_TOL_MM / arc.radius;
    let t = if arc.sweep_rad >= 0.0 { phi - arc.start_rad } else { arc.start_rad - phi };
    let t = t.rem_euclid(TAU);
    t <= arc.sweep_rad.abs() + tol || t >= TAU - tol
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use std::f64::consts::PI;

    fn line(a: (f64, f64), b: (f64, f64), face: u8) -> Edge<u8> {
        Edge { path: EdgePath::Line(Segment::new(Point::new(a.0, a.1), Point::new(b.0, b.1))), face }
    }

    fn square() -> Shape<u8> {
        Shape::new(vec![
            line((0.0, 0.0), (10.0, 0.0), 0),
            line((10.0, 0.0), (10.0, 10.0), 1),
            line((10.0, 10.0), (0.0, 10.0), 2),
            line((0.0, 10.0), (0.0, 0.0), 3),
        ])
        .unwrap()
    }

    /// A half-disc of radius r: the flat face on the y axis, the arc to the right.
    fn half_disc(r: f64) -> Shape<u8> {
        Shape::new(vec![
            line((0.0, r), (0.0, -r), 0),
            Edge {
                path: EdgePath::Arc(Arc {
                    center: Point::new(0.0, 0.0),
                    radius: r,
                    start_rad: -PI / 2.0,
                    sweep_rad: PI,
                }),
                face: 1,
            },
        ])
        .unwrap()
    }

    #[test]
    fn area_of_square_and_half_disc() {
        assert_close(square().signed_area(), 100.0, 1e-12);
        // Half a disc: πr²/2 (closed form).
        assert_close(half_disc(3.0).signed_area(), PI * 9.0 / 2.0, 1e-12);
    }

    #[test]
    fn clockwise_or_open_outlines_are_refused() {
        let cw = Shape::new(vec![
            line((0.0, 0.0), (0.0, 10.0), 0),
            line((0.0, 10.0), (10.0, 10.0), 0),
            line((10.0, 10.0), (0.0, 0.0), 0),
        ]);
        assert_eq!(cw, Err(ShapeError::Orientation));
        let open = Shape::new(vec![line((0.0, 0.0), (10.0, 0.0), 0), line((10.0, 0.0), (10.0, 10.0), 0)]);
        assert!(matches!(open, Err(ShapeError::Gap { index: 1, .. })));
        assert_eq!(Shape::<u8>::new(vec![]), Err(ShapeError::Empty));
    }

    #[test]
    fn hits_carry_face_and_outward_normal() {
        let s = square();
        let ray = Ray::new(Point::new(-5.0, 4.0), Vec2::new(1.0, 0.0)).unwrap();
        let h = s.nearest_hit(&ray, 1e-9).unwrap();
        assert_eq!(h.face, 3);
        assert_close(h.s, 5.0, 1e-12);
        assert_close(h.outward.x, -1.0, 1e-15);
        let inside = Ray::new(Point::new(5.0, 4.0), Vec2::new(1.0, 0.0)).unwrap();
        let h = s.nearest_hit(&inside, 1e-9).unwrap();
        assert_eq!(h.face, 1);
        assert_close(h.outward.x, 1.0, 1e-15);
    }

    #[test]
    fn arc_hits_only_within_its_sweep() {
        let hd = half_disc(10.0);
        // From the left at height 6: the flat face first, then the arc at x = 8.
        let ray = Ray::new(Point::new(-5.0, 6.0), Vec2::new(1.0, 0.0)).unwrap();
        let h = hd.nearest_hit(&ray, 1e-9).unwrap();
        assert_eq!(h.face, 0);
        let h2 = hd.nearest_hit(&Ray { origin: h.point, dir: ray.dir }, 1e-9).unwrap();
        assert_eq!(h2.face, 1);
        assert_close(h2.point.x, 8.0, 1e-12);
        assert_close(h2.outward.x, 0.8, 1e-12);
        // A ray at x = −5 going up meets only the circle's left half, which is not part of the shape.
        let up = Ray::new(Point::new(-5.0, -20.0), Vec2::new(0.0, 1.0)).unwrap();
        assert_eq!(hd.nearest_hit(&up, 1e-9), None);
    }

    #[test]
    fn concave_arc_normal_points_out_of_the_shape() {
        // A 10 × 10 square whose right side caves in with radius 10.
        let (a, b) = (Point::new(10.0, 0.0), Point::new(10.0, 10.0));
        let c = Point::new(10.0 + 75f64.sqrt(), 5.0);
        let arc = Arc::short_way(c, a, b).unwrap();
        assert!(arc.sweep_rad < 0.0);
        let s = Shape::new(vec![
            line((0.0, 0.0), (10.0, 0.0), 0),
            Edge { path: EdgePath::Arc(arc), face: 1 },
            line((10.0, 10.0), (0.0, 10.0), 2),
            line((0.0, 10.0), (0.0, 0.0), 3),
        ])
        .unwrap();
        let ray = Ray::new(Point::new(2.0, 5.0), Vec2::new(1.0, 0.0)).unwrap();
        let h = s.nearest_hit(&ray, 1e-9).unwrap();
        assert_eq!(h.face, 1);
        assert_close(h.point.x, c.x - 10.0, 1e-12);
        assert_close(h.outward.x, 1.0, 1e-12);
    }

    #[test]
    fn contains_and_bounds() {
        let hd = half_disc(10.0);
        assert!(hd.contains(Point::new(5.0, 0.0)));
        assert!(hd.contains(Point::new(1.0, 9.0)));
        assert!(!hd.contains(Point::new(-1.0, 0.0)));
        assert!(!hd.contains(Point::new(8.0, 8.0)));
        let (lo, hi) = hd.bounds();
        assert_close(lo.x, 0.0, 1e-12);
        assert_close(hi.x, 10.0, 1e-12);
        assert_close(lo.y, -10.0, 1e-12);
        assert_close(hi.y, 10.0, 1e-12);
    }

    proptest::proptest! {
        #![proptest_config(proptest::prelude::ProptestConfig::with_cases(512))]
        /// The trigonometry-free wedge test agrees with the angle test for
        /// every arc of at most half a turn, away from its end points.
        #[test]
        fn wedge_test_agrees_with_the_angle_test(start in -7.0f64..7.0, sweep in -PI..PI, at in -7.0f64..7.0, r in 0.5f64..500.0) {
            let arc = Arc { center: Point::new(3.0, -2.0), radius: r, start_rad: start, sweep_rad: sweep };
            let p = arc.point_at_angle(at);
            let near_end = [arc.start(), arc.end()].iter().any(|e| e.distance(p) < 1e-6 * r);
            proptest::prop_assume!(!near_end);
            proptest::prop_assert_eq!(in_wedge(&arc, (arc.start(), arc.end()), p), on_arc(&arc, p));
        }
    }

    #[test]
    fn placement_moves_hits_rigidly() {
        let p = Placement::new(0.7, Vec2::new(3.0, -2.0));
        let hd = half_disc(10.0);
        let moved = hd.placed(&p);
        assert_close(moved.signed_area(), hd.signed_area(), 1e-9);
        let ray = Ray::new(Point::new(-5.0, 3.0), Vec2::new(1.0, 0.2)).unwrap();
        let ray2 = Ray::new(p.apply(ray.origin), p.apply_vec(ray.dir)).unwrap();
        let h1 = hd.nearest_hit(&ray, 1e-9).unwrap();
        let h2 = moved.nearest_hit(&ray2, 1e-9).unwrap();
        assert_close(h1.s, h2.s, 1e-12);
        assert_eq!(h1.face, h2.face);
        let n = p.apply_vec(h1.outward);
        assert_close(n.x, h2.outward.x, 1e-12);
        assert_close(n.y, h2.outward.y, 1e-12);
    }
}
