//! The outline of a piece on the sheet, placed for one entry side: two faces
//! and two straight edges, with exact ray intersection and surface normals.

use super::{Entry, Face, Lens};
use crate::geom::{Arc, Edge, EdgePath, Hit, Point, Ray, Segment, Shape};

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

/// A lens shape placed in the sheet frame for one entry side.
#[derive(Clone, Debug, PartialEq)]
pub struct Outline {
    /// The piece.
    pub piece: Lens,
    /// Which of the piece's faces the light meets first.
    pub entry: Entry,
    /// Entry face shape.
    pub entry_face: Face,
    /// Exit face shape.
    pub exit_face: Face,
    /// The outline as a closed shape: entry face top to bottom, bottom edge,
    /// exit face bottom to top, top edge (knife edges dropped).
    shape: Shape<Boundary>,
}

impl Outline {
    /// Places `piece` with its `entry` face toward the light.
    pub fn new(piece: Lens, entry: Entry) -> Outline {
        let (entry_face, exit_face) = piece.faces_for(entry);
        let shape = build_shape(&piece, entry_face, exit_face);
        Outline { piece, entry, entry_face, exit_face, shape }
    }

    /// The outline as a closed shape of line and arc edges.
    pub fn shape(&self) -> &Shape<Boundary> {
        &self.shape
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

    /// The nearest hit of `ray` with any boundary beyond `min_s`; `None` when
    /// the ray misses the piece.
    pub fn nearest_hit(&self, ray: &Ray, min_s: f64) -> Option<Hit<Boundary>> {
        self.shape.nearest_hit(ray, min_s)
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

/// The closed outline of `piece` entered through `entry_face`: entry face top
/// to bottom, bottom edge, exit face bottom to top, top edge.
fn build_shape(piece: &Lens, entry_face: Face, exit_face: Face) -> Shape<Boundary> {
    let (t, a) = (piece.thickness_mm(), piece.half_height_mm());
    let entry_x = |y: f64| entry_face.inset(y);
    let exit_x = |y: f64| t - exit_face.inset(y);
    let (et, xt, xb, eb) = (
        Point::new(entry_x(a), a),
        Point::new(exit_x(a), a),
        Point::new(exit_x(-a), -a),
        Point::new(entry_x(-a), -a),
    );
    let entry_center = match entry_face {
        Face::Flat => None,
        Face::Convex { radius_mm } => Some(Point::new(radius_mm, 0.0)),
        Face::Concave { radius_mm } => Some(Point::new(-radius_mm, 0.0)),
    };
    let exit_center = match exit_face {
        Face::Flat => None,
        Face::Convex { radius_mm } => Some(Point::new(t - radius_mm, 0.0)),
        Face::Concave { radius_mm } => Some(Point::new(t + radius_mm, 0.0)),
    };
    // An arc through the face's vertex: convex faces run counterclockwise,
    // concave ones clockwise, sweeping 2·asin(a/R) either way.
    let face = |b: Boundary, f: Face, center: Option<Point>, from: Point, to: Point| {
        let path = match (center, f.radius_mm()) {
            // A face whose sagitta is below a nanometre is drawn and traced as flat:
            // an arc of such a radius cannot be placed to better than its own depth.
            (Some(c), Some(r)) if f.sagitta(a) > 1e-9 => {
                let half = (a / r).min(1.0).asin();
                let sign = if matches!(f, Face::Convex { .. }) { 1.0 } else { -1.0 };
                EdgePath::Arc(Arc {
                    center: c,
                    radius: r,
                    start_rad: (from - c).angle_rad(),
                    sweep_rad: sign * 2.0 * half,
                })
            }
            _ => EdgePath::Line(Segment::new(from, to)),
        };
        Edge { path, face: b }
    };
    let line =
        |b: Boundary, from: Point, to: Point| Edge { path: EdgePath::Line(Segment::new(from, to)), face: b };
    let edges = vec![
        face(Boundary::Entry, entry_face, entry_center, et, eb),
        line(Boundary::BottomEdge, eb, xb),
        face(Boundary::Exit, exit_face, exit_center, xb, xt),
        line(Boundary::TopEdge, xt, et),
    ];
    Shape::new(edges).expect("a checked lens shape has a closed counterclockwise outline")
}
