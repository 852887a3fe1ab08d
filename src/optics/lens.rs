//! A lens shape (half-discs included): two faces, thickness, height and index, checked once.

use super::{Face, PieceError};

/// Which face the light meets first.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Entry {
    /// The light meets the piece's `front` face first.
    Front,
    /// The piece is turned round: the light meets its `back` face first.
    Back,
}

impl Entry {
    /// `"front"` or `"back"`.
    pub fn as_str(self) -> &'static str {
        match self {
            Entry::Front => "front",
            Entry::Back => "back",
        }
    }

    /// The other side.
    pub fn flipped(self) -> Entry {
        match self {
            Entry::Front => Entry::Back,
            Entry::Back => Entry::Front,
        }
    }
}

/// A validated cylindrical lens shape. Construct with [`Lens::new`].
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Lens {
    front: Face,
    back: Face,
    thickness_mm: f64,
    height_mm: f64,
    index: f64,
}

fn positive(v: f64) -> bool {
    v.is_finite() && v > 0.0
}

impl Lens {
    /// Checks and builds a piece. Errors: index ≤ 1 or not finite; thickness,
    /// height or a radius not finite or ≤ 0; thickness or height above
    /// [`super::MAX_PIECE_MM`]; a radius below half the height;
    /// edge thickness t − inset(front) − inset(back) below 0 (DESIGN.md).
    pub fn new(
        front: Face,
        back: Face,
        thickness_mm: f64,
        height_mm: f64,
        index: f64,
    ) -> Result<Lens, PieceError> {
        if !(index.is_finite() && index > 1.0) {
            return Err(PieceError::Index(index));
        }
        if !positive(thickness_mm) {
            return Err(PieceError::Thickness(thickness_mm));
        }
        if !positive(height_mm) {
            return Err(PieceError::Height(height_mm));
        }
        for (what, v) in [("thickness", thickness_mm), ("height", height_mm)] {
            if v > super::MAX_PIECE_MM {
                return Err(PieceError::Size { what, value_mm: v });
            }
        }
        let a = height_mm / 2.0;
        for (name, face) in [("front", front), ("back", back)] {
            if let Some(r) = face.radius_mm() {
                if !positive(r) {
                    return Err(PieceError::Radius { face: name, radius_mm: r });
                }
                if r < a {
                    return Err(PieceError::RadiusBelowHalfHeight {
                        face: name,
                        radius_mm: r,
                        half_height_mm: a,
                    });
                }
            }
        }
        let piece = Lens { front, back, thickness_mm, height_mm, index };
        let edge = piece.edge_thickness_mm();
        if edge < -1e-9 {
            return Err(PieceError::NegativeEdge { edge_mm: edge });
        }
        Ok(piece)
    }

    /// The front face.
    pub fn front(&self) -> Face {
        self.front
    }

    /// The back face.
    pub fn back(&self) -> Face {
        self.back
    }

    /// Thickness on the axis, mm.
    pub fn thickness_mm(&self) -> f64 {
        self.thickness_mm
    }

    /// Height across the axis, mm.
    pub fn height_mm(&self) -> f64 {
        self.height_mm
    }

    /// Half the height, mm.
    pub fn half_height_mm(&self) -> f64 {
        self.height_mm / 2.0
    }

    /// Index of refraction (air outside is 1).
    pub fn index(&self) -> f64 {
        self.index
    }

    /// Thickness at the edges: t − inset(front) − inset(back), DESIGN.md.
    pub fn edge_thickness_mm(&self) -> f64 {
        let a = self.half_height_mm();
        self.thickness_mm - self.front.inset(a) - self.back.inset(a)
    }

    /// The faces in the order the light meets them: (entry face, exit face).
    pub fn faces_for(&self, entry: Entry) -> (Face, Face) {
        match entry {
            Entry::Front => (self.front, self.back),
            Entry::Back => (self.back, self.front),
        }
    }

    /// Critical angle inside the piece against air, radians: asin(1/n).
    pub fn critical_angle_rad(&self) -> f64 {
        (1.0 / self.index).asin()
    }

    /// Whether the piece is a half-disc: one flat face, one convex face of
    /// radius R, thickness R and height 2R (to 1 µm).
    pub fn is_half_disc(&self) -> bool {
        let check = |flat: Face, curved: Face| match (flat, curved) {
            (Face::Flat, Face::Convex { radius_mm }) => {
                (self.thickness_mm - radius_mm).abs() < 1e-3
                    && (self.height_mm - 2.0 * radius_mm).abs() < 1e-3
            }
            _ => false,
        };
        check(self.front, self.back) || check(self.back, self.front)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    #[test]
    fn edge_thickness_of_biconvex_follows_the_sagitta() {
        // s = R − √(R² − a²) (DESIGN.md); R = 50, a = 30: s = 50 − 40 = 10 (3-4-5 triangle).
        let p =
            Lens::new(Face::Convex { radius_mm: 50.0 }, Face::Convex { radius_mm: 50.0 }, 24.0, 60.0, 1.49)
                .unwrap();
        assert_close(p.edge_thickness_mm(), 4.0, 1e-12);
    }

    #[test]
    fn concave_faces_thicken_the_edge() {
        let p = Lens::new(Face::Concave { radius_mm: 50.0 }, Face::Flat, 3.0, 60.0, 1.49).unwrap();
        assert_close(p.edge_thickness_mm(), 13.0, 1e-12);
    }

    #[test]
    fn rejects_bad_values() {
        assert!(matches!(Lens::new(Face::Flat, Face::Flat, 10.0, 10.0, 1.0), Err(PieceError::Index(_))));
        assert!(matches!(Lens::new(Face::Flat, Face::Flat, 10.0, 10.0, f64::NAN), Err(PieceError::Index(_))));
        assert!(matches!(Lens::new(Face::Flat, Face::Flat, 0.0, 10.0, 1.5), Err(PieceError::Thickness(_))));
        assert!(matches!(Lens::new(Face::Flat, Face::Flat, 1.0, -3.0, 1.5), Err(PieceError::Height(_))));
        assert!(matches!(
            Lens::new(Face::Flat, Face::Convex { radius_mm: 20.0 }, 30.0, 50.0, 1.5),
            Err(PieceError::RadiusBelowHalfHeight { .. })
        ));
        assert!(matches!(
            Lens::new(Face::Convex { radius_mm: 25.0 }, Face::Convex { radius_mm: 25.0 }, 10.0, 50.0, 1.5),
            Err(PieceError::NegativeEdge { .. })
        ));
    }

    #[test]
    fn half_disc_is_recognised() {
        let p = Lens::new(Face::Flat, Face::Convex { radius_mm: 40.0 }, 40.0, 80.0, 1.49).unwrap();
        assert!(p.is_half_disc());
        assert_close(p.edge_thickness_mm(), 0.0, 1e-12);
    }
}
