//! Paraxial values: lens maker's thin-lens focal length and the thick-lens
//! focal lengths and principal planes, for one entry side.

use super::{Entry, Lens as Piece};

/// Paraxial (first-order) values of a piece in air for one entry side.
///
/// Signed radii (DESIGN.md): positive when the centre of curvature lies on the
/// +x side of the vertex. With c1 = 1/R1, c2 = 1/R2:
/// - thin lens (lens maker's formula): 1/f = (n − 1)(c1 − c2);
/// - thick lens: P1 = (n − 1)c1, P2 = (1 − n)c2, P = P1 + P2 − (t/n)P1P2,
///   EFL = 1/P, BFL = EFL(1 − tP1/n) from the exit vertex, front focal
///   distance = EFL(1 − tP2/n) before the entry vertex, rear principal plane at
///   −EFL·tP1/n from the exit vertex, front principal plane at +EFL·tP2/n from
///   the entry vertex (positive toward +x).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Paraxial {
    /// Thin-lens power (1/mm), lens maker's formula.
    pub thin_power: f64,
    /// Thick-lens power P (1/mm).
    pub power: f64,
    /// Power of the entry face P1.
    pub p1: f64,
    /// Power of the exit face P2.
    pub p2: f64,
    /// Thickness t on the axis.
    pub t: f64,
    /// Index n.
    pub n: f64,
}

/// Powers below this (1/mm, i.e. focal lengths beyond 10 km) count as afocal.
const AFOCAL_POWER: f64 = 1e-7;

impl Paraxial {
    /// Paraxial values for `piece` entered from `entry`.
    pub fn of(piece: &Piece, entry: Entry) -> Paraxial {
        let (f1, f2) = piece.faces_for(entry);
        let n = piece.index();
        let t = piece.thickness_mm();
        let c1 = f1.curvature_as_entry();
        let c2 = f2.curvature_as_exit();
        let p1 = (n - 1.0) * c1;
        let p2 = (1.0 - n) * c2;
        Paraxial { thin_power: (n - 1.0) * (c1 - c2), power: p1 + p2 - t / n * p1 * p2, p1, p2, t, n }
    }

    /// Thin-lens focal length, `None` if the thin lens is afocal.
    pub fn thin_lens_focal_mm(&self) -> Option<f64> {
        (self.thin_power.abs() > AFOCAL_POWER).then(|| 1.0 / self.thin_power)
    }

    /// Effective focal length EFL = 1/P; `None` if the piece is afocal.
    pub fn efl_mm(&self) -> Option<f64> {
        (self.power.abs() > AFOCAL_POWER).then(|| 1.0 / self.power)
    }

    /// Back focal length from the exit vertex along the light (negative: the
    /// rear focal point is virtual, before the exit vertex).
    pub fn bfl_mm(&self) -> Option<f64> {
        self.efl_mm().map(|f| f * (1.0 - self.t * self.p1 / self.n))
    }

    /// Front focal distance from the entry vertex back toward the light
    /// (positive: the front focal point lies before the piece).
    pub fn front_focal_mm(&self) -> Option<f64> {
        self.efl_mm().map(|f| f * (1.0 - self.t * self.p2 / self.n))
    }

    /// Rear principal plane, mm from the exit vertex, positive toward +x.
    pub fn rear_principal_mm(&self) -> Option<f64> {
        self.efl_mm().map(|f| -f * self.t * self.p1 / self.n)
    }

    /// Front principal plane, mm from the entry vertex, positive toward +x.
    pub fn front_principal_mm(&self) -> Option<f64> {
        self.efl_mm().map(|f| f * self.t * self.p2 / self.n)
    }

    /// Rear focal point in the sheet frame (mm from the entry vertex).
    pub fn rear_focus_x(&self) -> Option<f64> {
        self.bfl_mm().map(|b| self.t + b)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use crate::optics::{Face, Outcome, Outline, trace_parallel};

    #[test]
    fn equiconvex_12cm_faces_at_1_5_give_12cm() {
        // Common practice, no source: equiconvex, 12 cm faces, n = 1.5 → f = 12 cm (thin lens).
        let p =
            Piece::new(Face::Convex { radius_mm: 120.0 }, Face::Convex { radius_mm: 120.0 }, 8.0, 50.0, 1.5)
                .unwrap();
        assert_close(Paraxial::of(&p, Entry::Front).thin_lens_focal_mm().unwrap(), 120.0, 1e-9);
    }

    #[test]
    fn half_disc_paraxial_limits() {
        // DESIGN.md: flat face first, the paraxial focus is R/(n − 1) from the curved vertex.
        let p = Piece::new(Face::Flat, Face::Convex { radius_mm: 35.0 }, 35.0, 70.0, 1.49).unwrap();
        let px = Paraxial::of(&p, Entry::Front);
        assert_close(px.bfl_mm().unwrap(), 35.0 / 0.49, 1e-9);
        assert_close(px.rear_focus_x().unwrap(), 35.0 * 1.49 / 0.49, 1e-9);
    }

    #[test]
    fn block_is_afocal() {
        let p = Piece::new(Face::Flat, Face::Flat, 20.0, 50.0, 1.49).unwrap();
        assert_eq!(Paraxial::of(&p, Entry::Front).efl_mm(), None);
    }

    #[test]
    fn thick_lens_formulas_are_the_small_height_limit_of_the_exact_trace() {
        // As h → 0 the exact crossing tends to the rear focal point: the error of
        // the third-order (spherical aberration) term falls as h².
        let cases = [
            (Face::Convex { radius_mm: 70.0 }, Face::Convex { radius_mm: 95.0 }, 16.0, 60.0),
            (Face::Convex { radius_mm: 45.0 }, Face::Concave { radius_mm: 110.0 }, 12.0, 50.0),
            (Face::Concave { radius_mm: 55.0 }, Face::Concave { radius_mm: 80.0 }, 5.0, 40.0),
            (Face::Flat, Face::Convex { radius_mm: 42.0 }, 42.0, 84.0),
        ];
        for (f, b, t, h) in cases {
            let p = Piece::new(f, b, t, h, 1.49).unwrap();
            for entry in [Entry::Front, Entry::Back] {
                let px = Paraxial::of(&p, entry);
                let o = Outline::new(p, entry);
                let x = |h: f64| trace_parallel(&o, h, 10.0).outcome.crossing_x().unwrap();
                let focus = px.rear_focus_x().unwrap();
                let e1 = (x(0.1) - focus).abs();
                let e2 = (x(0.05) - focus).abs();
                assert!(e1 < 1e-3, "{entry:?} {f:?}: {e1}");
                // Halving h quarters the error (third-order aberration), within 10 %.
                assert_close(e1 / e2, 4.0, 0.4);
                assert!(!matches!(trace_parallel(&o, 0.1, 10.0).outcome, Outcome::Misses));
            }
        }
    }
}
