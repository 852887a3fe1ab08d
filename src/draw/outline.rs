//! A piece's outline as one drawable figure, and its edges as points for label avoidance.

use crate::geom::{EdgePath, Shape};
use crate::geom::{Point, Vec2};
use crate::scene::{Item, OutlinePart, Stroke};

/// The closed outline of `shape` as an [`Item::Outline`]: a move to the first
/// edge's start, then a straight part for each line edge and an arc part for
/// each arc edge, in the shape's counterclockwise order. Unfilled.
pub fn shape_outline<F: Copy>(shape: &Shape<F>, stroke: Stroke) -> Item {
    let edges = shape.edges();
    let mut parts = Vec::with_capacity(edges.len() + 1);
    if let Some(first) = edges.first() {
        parts.push(OutlinePart::MoveTo { to: first.path.start() });
    }
    for e in edges {
        parts.push(match e.path {
            EdgePath::Line(s) => OutlinePart::LineTo { to: s.b },
            EdgePath::Arc(a) => OutlinePart::ArcTo {
                center: a.center,
                radius_mm: a.radius,
                start_rad: a.start_rad,
                sweep_rad: a.sweep_rad,
            },
        });
    }
    Item::Outline { parts, fill: None, stroke }
}

/// The outline of `shape` as a closed list of points: each line edge's start,
/// and each arc cut into chords of at most 5°, so that label placement can
/// treat the outline as straight segments. The first point is repeated at the end.
pub fn path_points<F: Copy>(shape: &Shape<F>) -> Vec<Point> {
    let mut pts = Vec::new();
    for e in shape.edges() {
        match e.path {
            EdgePath::Line(s) => pts.push(s.a),
            EdgePath::Arc(a) => {
                let n = (a.sweep_rad.abs() / 5f64.to_radians()).ceil().max(1.0);
                // n is a small whole number (at most 72 for a full turn).
                #[expect(clippy::cast_possible_truncation, clippy::cast_sign_loss, reason = "n is in 1..=72")]
                let steps = n as usize;
                for k in 0..steps {
                    let t = a.start_rad + a.sweep_rad * (k as f64) / n;
                    pts.push(a.center + Vec2::from_angle(t) * a.radius);
                }
            }
        }
    }
    if let Some(&p) = pts.first() {
        pts.push(p);
    }
    pts
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::{Arc, Edge, Segment};

    fn half_disc() -> Shape<u8> {
        // Flat face on x = 0 from (0, 10) down to (0, −10), then a convex arc
        // of radius 10 round (0, 0) back up.
        let flat = Edge {
            path: EdgePath::Line(Segment::new(Point::new(0.0, 10.0), Point::new(0.0, -10.0))),
            face: 0,
        };
        let arc = Edge {
            path: EdgePath::Arc(Arc {
                center: Point::new(0.0, 0.0),
                radius: 10.0,
                start_rad: -std::f64::consts::FRAC_PI_2,
                sweep_rad: std::f64::consts::PI,
            }),
            face: 1,
        };
        Shape::new(vec![flat, arc]).unwrap()
    }

    #[test]
    fn outline_follows_the_edges_with_arcs_as_arcs() {
        let Item::Outline { parts, fill, .. } = shape_outline(&half_disc(), Stroke::solid(0.35)) else {
            panic!("an outline item");
        };
        assert_eq!(fill, None);
        assert_eq!(parts.len(), 3);
        assert_eq!(parts[0], OutlinePart::MoveTo { to: Point::new(0.0, 10.0) });
        assert_eq!(parts[1], OutlinePart::LineTo { to: Point::new(0.0, -10.0) });
        let OutlinePart::ArcTo { center, radius_mm, sweep_rad, .. } = parts[2] else { panic!("an arc part") };
        assert_eq!((center, radius_mm, sweep_rad), (Point::new(0.0, 0.0), 10.0, std::f64::consts::PI));
    }

    #[test]
    fn path_points_close_and_stay_on_the_arc() {
        let pts = path_points(&half_disc());
        assert_eq!(pts.first(), pts.last());
        // 1 flat start + 36 chords of 5° over 180°, plus the closing point.
        assert_eq!(pts.len(), 1 + 36 + 1);
        for p in &pts[1..pts.len() - 1] {
            assert!((p.distance(Point::new(0.0, 0.0)) - 10.0).abs() < 1e-9, "{p:?}");
        }
    }
}
