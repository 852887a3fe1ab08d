//! One face of a piece: flat, or a circular arc that bulges out or caves in.

/// The shape of one face, as seen from outside the piece.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Face {
    /// A plane face (a straight line on the sheet).
    Flat,
    /// A circular arc bulging outward, radius in mm.
    Convex {
        /// Radius of curvature, mm, > 0.
        radius_mm: f64,
    },
    /// A circular arc caving inward, radius in mm.
    Concave {
        /// Radius of curvature, mm, > 0.
        radius_mm: f64,
    },
}

impl Face {
    /// Radius of curvature; `None` for a flat face.
    pub fn radius_mm(self) -> Option<f64> {
        match self {
            Face::Flat => None,
            Face::Convex { radius_mm } | Face::Concave { radius_mm } => Some(radius_mm),
        }
    }

    /// Whether the face is curved.
    pub fn is_curved(self) -> bool {
        !matches!(self, Face::Flat)
    }

    /// Sagitta over half-height `a`: s = R − √(R² − a²) (0 for flat), computed
    /// as a²/(R + √(R − a)·√(R + a)), which neither cancels nor overflows for
    /// very large R. Caller guarantees `a ≤ R`.
    pub fn sagitta(self, a: f64) -> f64 {
        match self.radius_mm() {
            None => 0.0,
            Some(r) => a * a / (r + (r - a).max(0.0).sqrt() * (r + a).sqrt()),
        }
    }

    /// How far the face stands out from its vertex plane at height `y`, positive
    /// when the glass there is *thinner* than at the vertex (convex: +s, concave: −s).
    pub fn inset(self, y: f64) -> f64 {
        match self {
            Face::Flat => 0.0,
            Face::Convex { .. } => self.sagitta(y.abs()),
            Face::Concave { .. } => -self.sagitta(y.abs()),
        }
    }

    /// Curvature (1/R, signed) of the face when the light meets it **first**:
    /// DESIGN.md sign rule, centre on the +x side positive — convex +1/R,
    /// concave −1/R, flat 0.
    pub fn curvature_as_entry(self) -> f64 {
        match self {
            Face::Flat => 0.0,
            Face::Convex { radius_mm } => 1.0 / radius_mm,
            Face::Concave { radius_mm } => -1.0 / radius_mm,
        }
    }

    /// Curvature of the face when the light leaves through it: convex −1/R,
    /// concave +1/R, flat 0.
    pub fn curvature_as_exit(self) -> f64 {
        -self.curvature_as_entry()
    }

    /// Short words for tables: `flat`, `convex R45`, `concave R60`.
    pub fn describe(self) -> String {
        match self {
            Face::Flat => "flat".into(),
            Face::Convex { radius_mm } => format!("convex R{}", trim(radius_mm)),
            Face::Concave { radius_mm } => format!("concave R{}", trim(radius_mm)),
        }
    }
}

fn trim(v: f64) -> String {
    let s = format!("{v:.2}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}
