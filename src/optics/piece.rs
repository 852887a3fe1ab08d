//! What every piece is: a lens shape, a rectangular block or a prism, made of
//! one material; its outline as a closed shape with named faces.

use std::f64::consts::PI;

use super::Lens;
use crate::geom::{Edge, EdgePath, Point, Segment, Shape};

/// Smallest block or prism length raysheet draws, mm: a few ray widths
/// (common practice, no source).
pub const MIN_PIECE_MM: f64 = 10.0;
/// Largest thickness, height or side of a piece, mm: tray pieces fit in a
/// hand and on one sheet of A3 (our bound, common practice, no source).
pub const MAX_PIECE_MM: f64 = 300.0;

/// A checked piece of the kit.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Piece {
    /// Two faces (flat, convex or concave) and two straight edges: lens shapes and half-discs.
    Lens(Lens),
    /// A rectangular block.
    Block(Block),
    /// An isosceles triangular prism.
    Prism(Prism),
}

impl Piece {
    /// Index of refraction (air outside is 1).
    pub fn index(&self) -> f64 {
        match self {
            Piece::Lens(l) => l.index(),
            Piece::Block(b) => b.index,
            Piece::Prism(p) => p.index,
        }
    }

    /// The lens shape, if this piece is one.
    pub fn lens(&self) -> Option<&Lens> {
        match self {
            Piece::Lens(l) => Some(l),
            _ => None,
        }
    }

    /// The kit word for the shape: `lens`, `block` or `prism`.
    pub fn shape_word(&self) -> &'static str {
        match self {
            Piece::Lens(_) => "lens",
            Piece::Block(_) => "block",
            Piece::Prism(_) => "prism",
        }
    }

    /// Critical angle inside the piece against air, radians: asin(1/n).
    pub fn critical_angle_rad(&self) -> f64 {
        (1.0 / self.index()).asin()
    }
}

/// A face of a block.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum BlockFace {
    /// The face the light meets first (x = 0 in the block's frame).
    Entry,
    /// The face opposite it (x = t).
    Exit,
    /// One of the two short ends joining them.
    End,
}

impl BlockFace {
    /// Answer-file word.
    pub fn as_str(self) -> &'static str {
        match self {
            BlockFace::Entry => "entry",
            BlockFace::Exit => "exit",
            BlockFace::End => "end",
        }
    }
}

/// A rectangular block: `thickness_mm` between the two faces the light
/// crosses, `height_mm` the length of those faces.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Block {
    /// Distance between the entry and exit faces, mm.
    pub thickness_mm: f64,
    /// Length of the entry and exit faces, mm.
    pub height_mm: f64,
    /// Index of refraction.
    pub index: f64,
}

impl Block {
    /// Checks and builds a block: index finite and above 1, both lengths
    /// within [`MIN_PIECE_MM`]–[`MAX_PIECE_MM`].
    pub fn new(thickness_mm: f64, height_mm: f64, index: f64) -> Result<Block, PieceError> {
        check_index(index)?;
        check_size("thickness", thickness_mm)?;
        check_size("height", height_mm)?;
        Ok(Block { thickness_mm, height_mm, index })
    }

    /// The outline in the block's frame: entry face on x = 0 from y = +h/2 to
    /// −h/2, exit face on x = t, counterclockwise.
    pub fn shape(&self) -> Shape<BlockFace> {
        let (t, a) = (self.thickness_mm, self.height_mm / 2.0);
        let corners = [Point::new(0.0, a), Point::new(0.0, -a), Point::new(t, -a), Point::new(t, a)];
        let faces = [BlockFace::Entry, BlockFace::End, BlockFace::Exit, BlockFace::End];
        polygon(&corners, &faces)
    }
}

/// A face of a prism.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum PrismFace {
    /// The equal face on the left of the apex (the light's way in on a side-entry sheet).
    SideA,
    /// The equal face on the right of the apex.
    SideB,
    /// The face opposite the apex.
    Base,
}

impl PrismFace {
    /// Answer-file word.
    pub fn as_str(self) -> &'static str {
        match self {
            PrismFace::SideA => "first-side",
            PrismFace::SideB => "second-side",
            PrismFace::Base => "base",
        }
    }
}

/// An isosceles triangular prism: apex angle between two equal faces of
/// length `side_mm`; the third face is the base.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Prism {
    /// Apex angle, radians, in (0, π).
    pub apex_rad: f64,
    /// Length of each equal face, mm.
    pub side_mm: f64,
    /// Index of refraction.
    pub index: f64,
}

impl Prism {
    /// Checks and builds a prism: index finite and above 1, apex strictly
    /// between 0° and 180°, side and base within [`MIN_PIECE_MM`]–[`MAX_PIECE_MM`].
    pub fn new(apex_deg: f64, side_mm: f64, index: f64) -> Result<Prism, PieceError> {
        check_index(index)?;
        if !(apex_deg.is_finite() && apex_deg > 0.0 && apex_deg < 180.0) {
            return Err(PieceError::Apex(apex_deg));
        }
        check_size("side", side_mm)?;
        let p = Prism { apex_rad: apex_deg.to_radians(), side_mm, index };
        check_size("base", p.base_mm())?;
        Ok(p)
    }

    /// Length of the base: 2·s·sin(A/2).
    pub fn base_mm(&self) -> f64 {
        2.0 * self.side_mm * (self.apex_rad / 2.0).sin()
    }

    /// Height from the base to the apex: s·cos(A/2).
    pub fn height_mm(&self) -> f64 {
        self.side_mm * (self.apex_rad / 2.0).cos()
    }

    /// Whether this is a right-angle prism (apex 90° to 1e-9 rad).
    pub fn is_right_angle(&self) -> bool {
        (self.apex_rad - PI / 2.0).abs() < 1e-9
    }

    /// The corners in the prism's frame: apex on the y axis, base on y = 0:
    /// (apex, left base corner, right base corner).
    pub fn corners(&self) -> [Point; 3] {
        let half = self.base_mm() / 2.0;
        [Point::new(0.0, self.height_mm()), Point::new(-half, 0.0), Point::new(half, 0.0)]
    }

    /// The outline in the prism's frame, counterclockwise: side A from the
    /// apex down to the left base corner, the base, side B back up.
    pub fn shape(&self) -> Shape<PrismFace> {
        polygon(&self.corners(), &[PrismFace::SideA, PrismFace::Base, PrismFace::SideB])
    }
}

/// A closed polygon through `corners` (counterclockwise), edge i from corner i
/// to corner i + 1 tagged `faces[i]`.
fn polygon<F: Copy>(corners: &[Point], faces: &[F]) -> Shape<F> {
    let n = corners.len();
    let edges = (0..n)
        .map(|i| Edge {
            path: EdgePath::Line(Segment::new(corners[i], corners[(i + 1) % n])),
            face: faces[i],
        })
        .collect();
    Shape::new(edges).expect("a checked block or prism is a counterclockwise polygon")
}

fn check_index(index: f64) -> Result<(), PieceError> {
    if index.is_finite() && index > 1.0 { Ok(()) } else { Err(PieceError::Index(index)) }
}

fn check_size(what: &'static str, v: f64) -> Result<(), PieceError> {
    if v.is_finite() && (MIN_PIECE_MM..=MAX_PIECE_MM).contains(&v) {
        Ok(())
    } else {
        Err(PieceError::Size { what, value_mm: v })
    }
}

/// Why a piece description is not a real piece.
#[derive(Clone, Debug, PartialEq)]
pub enum PieceError {
    /// Index not finite or not above 1.
    Index(f64),
    /// Thickness not finite or not positive.
    Thickness(f64),
    /// Height not finite or not positive.
    Height(f64),
    /// A face radius not finite or not positive.
    Radius {
        /// Which face ("front" or "back").
        face: &'static str,
        /// The value given.
        radius_mm: f64,
    },
    /// A curved face whose radius is below half the height.
    RadiusBelowHalfHeight {
        /// Which face.
        face: &'static str,
        /// The radius given.
        radius_mm: f64,
        /// Half the piece's height.
        half_height_mm: f64,
    },
    /// The faces meet before the edges: edge thickness below zero.
    NegativeEdge {
        /// The edge thickness that results, mm (< 0).
        edge_mm: f64,
    },
    /// A prism's apex angle outside (0°, 180°).
    Apex(f64),
    /// A block or prism length outside what can be printed and placed on it.
    Size {
        /// Which length (`thickness`, `height`, `side`).
        what: &'static str,
        /// The value given, mm.
        value_mm: f64,
    },
}

impl PieceError {
    /// What is wrong, without the advice.
    pub fn problem(&self) -> String {
        match self {
            PieceError::Index(n) => format!("index {n} is not a usable index of refraction"),
            PieceError::Thickness(t) => format!("thickness {t} mm is not a usable thickness"),
            PieceError::Height(h) => format!("height {h} mm is not a usable height"),
            PieceError::Radius { face, radius_mm } => {
                format!("{face} radius {radius_mm} mm is not a usable radius")
            }
            PieceError::RadiusBelowHalfHeight { face, radius_mm, half_height_mm } => format!(
                "{face} radius {radius_mm} mm is smaller than half the height ({half_height_mm} mm), so the arc cannot reach the edges"
            ),
            PieceError::NegativeEdge { edge_mm } => {
                format!("the faces cross before the edges (edge thickness would be {edge_mm:.3} mm)")
            }
            PieceError::Apex(a) => format!("an apex angle of {a}° is not a prism"),
            PieceError::Size { what, value_mm } => {
                format!("a {what} of {value_mm} mm is outside what a sheet can show")
            }
        }
    }

    /// What would be accepted instead.
    pub fn advice(&self) -> String {
        match self {
            PieceError::Index(_) => "give a finite number above 1 (acrylic is about 1.49)".into(),
            PieceError::Thickness(_) | PieceError::Height(_) | PieceError::Radius { .. } => {
                "give a finite number of millimetres above 0".into()
            }
            PieceError::RadiusBelowHalfHeight { radius_mm, half_height_mm, .. } => format!(
                "use a radius of at least {half_height_mm} mm, or a height of at most {} mm",
                2.0 * radius_mm
            ),
            PieceError::NegativeEdge { edge_mm } => format!(
                "make the piece at least {:.3} mm thicker on the axis, its faces flatter, or its height smaller",
                -edge_mm
            ),
            PieceError::Apex(_) => {
                "give an angle above 0 and below 180 degrees (60 for an equilateral prism, 90 for a right-angle prism)"
                    .into()
            }
            PieceError::Size { .. } => format!(
                "give a length from {MIN_PIECE_MM} to {MAX_PIECE_MM} mm: smaller pieces cannot be traced round with a ray a few millimetres wide"
            ),
        }
    }
}

impl std::fmt::Display for PieceError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}; {}", self.problem(), self.advice())
    }
}

impl std::error::Error for PieceError {}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    #[test]
    fn prism_lengths_follow_the_isosceles_triangle() {
        // Equilateral: base = side, height = side·√3/2 (closed form).
        let p = Prism::new(60.0, 50.0, 1.49).unwrap();
        assert_close(p.base_mm(), 50.0, 1e-12);
        assert_close(p.height_mm(), 25.0 * 3f64.sqrt(), 1e-12);
        assert_close(p.shape().signed_area(), 625.0 * 3f64.sqrt(), 1e-9);
        // Right-angle prism: base (hypotenuse) = side·√2.
        let r = Prism::new(90.0, 40.0, 1.49).unwrap();
        assert!(r.is_right_angle());
        assert_close(r.base_mm(), 40.0 * 2f64.sqrt(), 1e-12);
    }

    #[test]
    fn block_outline_is_its_rectangle() {
        let b = Block::new(40.0, 90.0, 1.49).unwrap();
        assert_close(b.shape().signed_area(), 3600.0, 1e-9);
        assert_eq!(b.shape().edges()[0].face, BlockFace::Entry);
    }

    #[test]
    fn impossible_blocks_and_prisms_are_refused() {
        assert_eq!(Prism::new(0.0, 50.0, 1.49), Err(PieceError::Apex(0.0)));
        assert_eq!(Prism::new(180.0, 50.0, 1.49), Err(PieceError::Apex(180.0)));
        assert!(matches!(Prism::new(60.0, 5.0, 1.49), Err(PieceError::Size { what: "side", .. })));
        // A 2° apex on a 50 mm side leaves a 1.7 mm base: too small to print.
        assert!(matches!(Prism::new(2.0, 50.0, 1.49), Err(PieceError::Size { what: "base", .. })));
        assert!(matches!(Block::new(f64::NAN, 50.0, 1.49), Err(PieceError::Size { .. })));
        assert_eq!(Block::new(40.0, 50.0, 0.9), Err(PieceError::Index(0.9)));
    }
}
