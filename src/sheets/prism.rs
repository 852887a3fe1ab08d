//! The prism sheets' optics: a guide ray into a prism's side (deviation,
//! minimum deviation, limiting incidence) or into a right-angle prism's side or
//! base (turned through 90° or 180° by total internal reflection).

use super::angled::{AngledSetup, Expected};
use crate::geom::{Placement, Point, Vec2};
use crate::optics::{Prism, PrismFace};

/// Length of the printed guide line before the entry point, mm.
pub const LEAD_MM: f64 = 60.0;
/// Length of the emergent ray a student draws, mm (common practice, no source).
pub const OUT_MM: f64 = 50.0;

/// Which face the light enters.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PrismEntry {
    /// In at one equal face (side A), out at the other.
    Side,
    /// In at the base of a right-angle prism, a quarter of the base from one end.
    Base,
}

impl PrismEntry {
    /// The kit word.
    pub fn as_str(self) -> &'static str {
        match self {
            PrismEntry::Side => "side",
            PrismEntry::Base => "base",
        }
    }
}

/// Outward unit normal of the edge from `a` to `b` of a counterclockwise outline.
fn outward(a: Point, b: Point) -> Vec2 {
    let v = b - a;
    Vec2::new(v.y, -v.x).normalized().unwrap_or(Vec2::new(-1.0, 0.0))
}

/// A prism on the sheet. Side entry: the guide ray meets the middle of side A;
/// a positive angle of incidence puts the incoming ray on the base side of the
/// normal (the textbook drawing, where the light bends toward the base), and
/// the emergence angle and deviation are positive toward the base too. A prism
/// other than a right-angle one stands on its base (apex up); a right-angle
/// prism is turned so that the face the light enters is upright with the light
/// coming from the left. Base entry (right-angle prisms): the ray meets the
/// base a quarter of its length from the end nearer side A; positive angles
/// lean toward that end.
pub fn setup(prism: &Prism, entry: PrismEntry) -> AngledSetup<PrismFace> {
    let [apex, left, right] = prism.corners();
    let base_mid = Point::new(0.0, 0.0);
    let (face, point, normal, toward, expected) = match entry {
        PrismEntry::Side => {
            let expected = if prism.is_right_angle() {
                Expected::Turn { reflect_at: vec![PrismFace::Base], exit: PrismFace::SideB }
            } else {
                Expected::Refract { exit: PrismFace::SideB }
            };
            (PrismFace::SideA, apex + (left - apex) * 0.5, outward(apex, left), base_mid, expected)
        }
        PrismEntry::Base => (
            PrismFace::Base,
            left + (right - left) * 0.25,
            outward(left, right),
            left,
            Expected::Turn { reflect_at: vec![PrismFace::SideA, PrismFace::SideB], exit: PrismFace::Base },
        ),
    };
    // Right-angle prisms: turn the entry face upright, the light arriving from the left.
    let place = if prism.is_right_angle() {
        let turn = Vec2::new(-1.0, 0.0).angle_rad() - normal.angle_rad();
        let r = Placement::new(turn, Vec2::new(0.0, 0.0));
        let p = r.apply(point);
        Placement::new(turn, Vec2::new(-p.x, -p.y))
    } else {
        Placement::translation(Vec2::new(-point.x, -point.y))
    };
    let (point, normal, toward) = (place.apply(point), place.apply_vec(normal), place.apply(toward));
    // The sense that turns the outward normal toward `toward` makes the incoming
    // ray's side positive.
    let sense = if normal.cross(toward - point) >= 0.0 { 1.0 } else { -1.0 };
    AngledSetup {
        shape: prism.shape().placed(&place),
        index: prism.index,
        entry_face: face,
        entry_point: point,
        outward: normal,
        sense,
        toward: Some(toward),
        expected,
        lead_mm: LEAD_MM,
        out_mm: OUT_MM,
    }
}

/// Why a prism formula has no value.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum NoValue {
    /// n·sin(A/2) > 1: no ray passes symmetrically.
    NoSymmetricPassage,
    /// A > 2θc: every ray that enters one side is totally reflected at the other.
    ApexBeyondTwiceCritical,
}

impl NoValue {
    /// Plain words.
    pub fn words(self) -> &'static str {
        match self {
            NoValue::NoSymmetricPassage => "n·sin(A/2) exceeds 1, so no ray crosses the prism symmetrically",
            NoValue::ApexBeyondTwiceCritical => {
                "the apex angle exceeds twice the critical angle, so no ray passes from one side to the other"
            }
        }
    }
}

/// Minimum deviation and the incidence that gives it, degrees:
/// i = asin(n·sin(A/2)), δmin = 2i − A (DESIGN.md: n = sin((A + δmin)/2)/sin(A/2)).
pub fn minimum_deviation_deg(prism: &Prism) -> Result<(f64, f64), NoValue> {
    if prism.apex_rad > 2.0 * (1.0 / prism.index).asin() {
        return Err(NoValue::ApexBeyondTwiceCritical);
    }
    let s = prism.index * (prism.apex_rad / 2.0).sin();
    if s > 1.0 {
        return Err(NoValue::NoSymmetricPassage);
    }
    let i = s.asin();
    Ok(((2.0 * i - prism.apex_rad).to_degrees(), i.to_degrees()))
}

/// Limiting incidence, degrees: below asin(n·sin(A − θc)) the ray is totally
/// reflected at the second side (DESIGN.md). Negative when rays from the apex
/// side of the normal still pass.
pub fn limiting_incidence_deg(prism: &Prism) -> Result<f64, NoValue> {
    let crit = (1.0 / prism.index).asin();
    if prism.apex_rad > 2.0 * crit {
        return Err(NoValue::ApexBeyondTwiceCritical);
    }
    Ok((prism.index * (prism.apex_rad - crit).sin()).clamp(-1.0, 1.0).asin().to_degrees())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use crate::optics::EventKind;
    use crate::sheets::angled::AngleRules;

    fn rules() -> AngleRules {
        AngleRules::for_ray_width(2.0)
    }

    #[test]
    fn deviation_is_i_plus_e_minus_a_with_signed_angles() {
        // δ = i + e − A (DESIGN.md, triangular prism).
        let p = Prism::new(60.0, 50.0, 1.49).unwrap();
        let s = setup(&p, PrismEntry::Side);
        for i in [30.0, 40.0, 48.0, 55.0, 65.0] {
            let r = s.answer(&rules(), i, "A".into(), true);
            assert!(r.path_ok, "i = {i}: {:?}", r.trace.events);
            let (e, d) = (r.emergence_deg.unwrap(), r.deviation_deg.unwrap());
            assert_close(d, i + e - 60.0, 1e-9);
            assert!(d > 0.0, "the light bends toward the base");
            // Snell's law at the entry side with the angle of refraction signed alike.
            assert_close(r.refraction_deg.unwrap().to_radians().sin() * 1.49, i.to_radians().sin(), 1e-12);
        }
    }

    #[test]
    fn traced_minimum_deviation_matches_the_formula() {
        // Minimum deviation at symmetric passage: n = sin((A + δmin)/2)/sin(A/2) (DESIGN.md).
        for (apex, n) in [(60.0, 1.49), (45.0, 1.586), (30.0, 1.52)] {
            let p = Prism::new(apex, 50.0, n).unwrap();
            let s = setup(&p, PrismEntry::Side);
            let (dmin, imin) = minimum_deviation_deg(&p).unwrap();
            assert_close(
                ((apex + dmin) / 2.0f64).to_radians().sin() / (apex / 2.0f64).to_radians().sin(),
                n,
                1e-12,
            );
            // Golden-section search on the traced deviation.
            let dev = |i: f64| s.answer(&rules(), i, "A".into(), true).deviation_deg.unwrap();
            let (mut a, mut b) = (imin - 15.0, imin + 15.0);
            let g = (5f64.sqrt() - 1.0) / 2.0;
            for _ in 0..80 {
                let (c, d) = (b - g * (b - a), a + g * (b - a));
                if dev(c) < dev(d) { b = d } else { a = c }
            }
            let i_found = (a + b) / 2.0;
            assert_close(dev(i_found), dmin, 1e-9);
            assert_close(i_found, imin, 1e-4);
            // At minimum deviation the passage is symmetric: e = i.
            let r = s.answer(&rules(), imin, "A".into(), true);
            assert_close(r.emergence_deg.unwrap(), imin, 1e-9);
        }
    }

    #[test]
    fn limiting_incidence_separates_refraction_from_total_reflection() {
        // asin(n·sin(A − θc)) (DESIGN.md): 60° acrylic prism, n = 1.49.
        let p = Prism::new(60.0, 50.0, 1.49).unwrap();
        let s = setup(&p, PrismEntry::Side);
        let lim = limiting_incidence_deg(&p).unwrap();
        assert_close(
            lim,
            (1.49 * (60f64.to_radians() - (1.0f64 / 1.49).asin()).sin()).asin().to_degrees(),
            1e-12,
        );
        let above = s.answer(&rules(), lim + 0.01, "A".into(), true);
        let below = s.answer(&rules(), lim - 0.01, "A".into(), true);
        assert!(above.path_ok);
        assert!(!below.path_ok);
        assert_eq!(below.trace.events[1].kind, EventKind::TotalReflection);
        assert_eq!(below.trace.events[1].face, PrismFace::SideB);
    }

    #[test]
    fn right_angle_prism_turns_through_90_and_180_degrees() {
        // DESIGN.md, sheet 5: in at a leg → 90°; in at the hypotenuse → 180°, for n > √2.
        let p = Prism::new(90.0, 40.0, 1.49).unwrap();
        let side = setup(&p, PrismEntry::Side);
        let r = side.answer(&rules(), 0.0, "A".into(), true);
        assert!(r.path_ok);
        assert_close(r.deviation_deg.unwrap(), 90.0, 1e-9);
        // The face the light enters is upright and the ray runs left to right.
        assert_close(side.guide(0.0).dir.x, 1.0, 1e-12);
        let base = setup(&p, PrismEntry::Base);
        let r = base.answer(&rules(), 0.0, "A".into(), true);
        assert!(r.path_ok, "{:?}", r.trace.events);
        assert_close(r.deviation_deg.unwrap(), 180.0, 1e-9);
        assert_eq!(r.trace.reflections(), 2);
        // Below n = √2 the hypotenuse no longer reflects totally at 45°.
        let weak = Prism::new(90.0, 40.0, 1.40).unwrap();
        let r = setup(&weak, PrismEntry::Side).answer(&rules(), 0.0, "A".into(), true);
        assert!(!r.path_ok);
        assert_eq!(r.trace.reflections(), 0);
        // A right-angle prism's apex exceeds twice the critical angle (2 × 42.2°).
        assert_eq!(limiting_incidence_deg(&p), Err(NoValue::ApexBeyondTwiceCritical));
        assert_eq!(minimum_deviation_deg(&p), Err(NoValue::ApexBeyondTwiceCritical));
    }

    #[test]
    fn the_180_degree_turn_holds_within_about_four_degrees_for_acrylic() {
        // DESIGN.md: "the 180° turn holds only within about ±4° of normal incidence for n = 1.49".
        let p = Prism::new(90.0, 40.0, 1.49).unwrap();
        let base = setup(&p, PrismEntry::Base);
        let band = base.band(&rules(), -30.0, 30.0, 0.0, false).unwrap();
        // The turn itself holds to asin(n·sin(45° − θc)) = 4.24°; the band keeps 0.5° inside that.
        let edge = (1.49 * (45f64.to_radians() - (1.0f64 / 1.49).asin()).sin()).asin().to_degrees();
        assert_close(edge, 4.24, 0.01);
        assert!(band.max < edge && band.max > edge - 1.0, "{band:?}");
        assert!(band.min > -edge && band.min < -edge + 1.0, "{band:?}");
    }
}
