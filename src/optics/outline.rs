//! The outline of a piece on the sheet, placed for one entry side: two faces
//! and two straight edges, with exact ray intersection and surface normals.

use super::{Entry, Face, Piece};
use crate::geom::{Point, Ray, Segment, Vec2, ray_circle_hits};

/// One part of the outline.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Boundary {
    /// The face the light meets first (vertex at x = 0).
    Entry,
    /// The face opposite (vertex at x = t).
    Exit,
    /// The straight edge at y = +H/2.
    TopEdge,
    /// The straight edge at y = −H/2.
    BottomEdge,
}

/// A piece placed in the sheet frame for one entry side.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Outline {
    /// The piece.
    pub piece: Piece,
    /// Which of the piece's faces the light meets first.
    pub entry: Entry,
    /// Entry face shape.
    pub entry_face: Face,
    /// Exit face shape.
    pub exit_face: Face,
}

impl Outline {
    /// Places `piece` with its `entry` face toward the light.
    pub fn new(piece: Piece, entry: Entry) -> Outline {
        let (entry_face, exit_face) = piece.faces_for(entry);
        Outline { piece, entry, entry_face, exit_face }
    }

    /// Thickness on the axis (x of the exit vertex), mm.
    pub fn t(&self) -> f64 {
        self.piece.thickness_mm()
    }

    /// Half-height, mm.
    pub fn a(&self) -> f64 {
        self.piece.half_height_mm()
    }

    /// x of the entry face at height y: +sagitta for convex, −sagitta for concave.
    pub fn entry_x(&self, y: f64) -> f64 {
        self.entry_face.inset(y)
    }

    /// x of the exit face at height y: t − sagitta for convex, t + sagitta for concave.
    pub fn exit_x(&self, y: f64) -> f64 {
        self.t() - self.exit_face.inset(y)
    }

    /// Centre of curvature of a face, `None` for a flat face or an edge.
    pub fn center(&self, b: Boundary) -> Option<Point> {
        match b {
            Boundary::Entry => match self.entry_face {
                Face::Flat => None,
                Face::Convex { radius_mm } => Some(Point::new(radius_mm, 0.0)),
                Face::Concave { radius_mm } => Some(Point::new(-radius_mm, 0.0)),
            },
            Boundary::Exit => match self.exit_face {
                Face::Flat => None,
                Face::Convex { radius_mm } => Some(Point::new(self.t() - radius_mm, 0.0)),
                Face::Concave { radius_mm } => Some(Point::new(self.t() + radius_mm, 0.0)),
            },
            Boundary::TopEdge | Boundary::BottomEdge => None,
        }
    }

    /// The face shape of a face boundary.
    pub fn face(&self, b: Boundary) -> Option<Face> {
        match b {
            Boundary::Entry => Some(self.entry_face),
            Boundary::Exit => Some(self.exit_face),
            Boundary::TopEdge | Boundary::BottomEdge => None,
        }
    }

    /// The edge segment, `None` when the edge has zero length (a knife edge).
    pub fn edge(&self, b: Boundary) -> Option<Segment> {
        let y = match b {
            Boundary::TopEdge => self.a(),
            Boundary::BottomEdge => -self.a(),
            Boundary::Entry | Boundary::Exit => return None,
        };
        let seg = Segment::new(Point::new(self.entry_x(y), y), Point::new(self.exit_x(y), y));
        (seg.length() > 1e-9).then_some(seg)
    }

    /// The four corners: entry-top, exit-top, exit-bottom, entry-bottom.
    pub fn corners(&self) -> [Point; 4] {
        let a = self.a();
        [
            Point::new(self.entry_x(a), a),
            Point::new(self.exit_x(a), a),
            Point::new(self.exit_x(-a), -a),
            Point::new(self.entry_x(-a), -a),
        ]
    }

    /// Smallest and largest x of the outline.
    pub fn x_range(&self) -> (f64, f64) {
        let a = self.a();
        (self.entry_x(0.0).min(self.entry_x(a)), self.exit_x(0.0).max(self.exit_x(a)))
    }

    /// The nearest hit of `ray` with any boundary beyond `min_s`: (distance,
    /// which boundary, point, unit normal). `None` when the ray misses the piece.
    pub fn nearest_hit(&self, ray: &Ray, min_s: f64) -> Option<(f64, Boundary, Point, Vec2)> {
        let mut best: Option<(f64, Boundary, Point, Vec2)> = None;
        let mut consider = |s: f64, b: Boundary, n: Vec2| {
            if best.is_none_or(|(bs, ..)| s < bs) {
                best = Some((s, b, ray.at(s), n));
            }
        };
        for b in [Boundary::Entry, Boundary::Exit] {
            let vertex_x = if b == Boundary::Entry { 0.0 } else { self.t() };
            match self.center(b) {
                None => {
                    let seg = Segment::new(Point::new(vertex_x, -self.a()), Point::new(vertex_x, self.a()));
                    if let Some(s) = seg.ray_hit(ray, min_s) {
                        consider(s, b, Vec2::new(1.0, 0.0));
                    }
                }
                Some(c) => {
                    let r = self.face(b).and_then(Face::radius_mm).unwrap_or(1.0);
                    // The face is the branch of the circle on the vertex's side of the centre.
                    let side = (vertex_x - c.x).signum();
                    for s in ray_circle_hits(ray, c, r).into_iter().flatten() {
                        if s <= min_s {
                            continue;
                        }
                        let p = ray.at(s);
                        if p.y.abs() <= self.a() + 1e-12 && (p.x - c.x) * side >= 0.0 {
                            consider(s, b, (p - c) * (1.0 / r));
                        }
                    }
                }
            }
        }
        for b in [Boundary::TopEdge, Boundary::BottomEdge] {
            if let Some(seg) = self.edge(b)
                && let Some(s) = seg.ray_hit(ray, min_s)
            {
                consider(s, b, Vec2::new(0.0, 1.0));
            }
        }
        best
    }

    /// Whether `p` lies strictly inside the glass.
    pub fn contains(&self, p: Point) -> bool {
        p.y.abs() < self.a() && p.x > self.entry_x(p.y) && p.x < self.exit_x(p.y)
    }

    /// The name of a boundary for answer files: the piece's own face names
    /// (`front`, `back`) or `edge`.
    pub fn boundary_name(&self, b: Boundary) -> &'static str {
        match b {
            Boundary::Entry => self.entry.as_str(),
            Boundary::Exit => self.entry.flipped().as_str(),
            Boundary::TopEdge | Boundary::BottomEdge => "edge",
        }
    }
}
