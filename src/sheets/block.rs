//! The rectangular-block sheet's optics: a guide ray into the middle of the
//! entry face, its angle of refraction and its lateral shift.

use super::angled::{AngledSetup, Expected};
use crate::geom::{Point, Vec2};
use crate::optics::{Block, BlockFace};

/// Length of the printed guide line before the entry point, mm.
pub const LEAD_MM: f64 = 60.0;
/// Length of the emergent ray a student draws, mm (common practice, no source).
pub const OUT_MM: f64 = 50.0;

/// A block on the sheet: its entry face on x = 0 from y = +h/2 down to −h/2,
/// the light coming from the left and meeting the face's middle (the origin).
/// A positive angle of incidence has the incoming ray above the normal, going
/// down to the right.
pub fn setup(block: &Block) -> AngledSetup<BlockFace> {
    AngledSetup {
        shape: block.shape(),
        index: block.index,
        entry_face: BlockFace::Entry,
        entry_point: Point::new(0.0, 0.0),
        outward: Vec2::new(-1.0, 0.0),
        sense: -1.0,
        toward: None,
        expected: Expected::Refract { exit: BlockFace::Exit },
        lead_mm: LEAD_MM,
        out_mm: OUT_MM,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use crate::sheets::angled::{AngleLimit, AngleRules};

    #[test]
    fn shift_and_angles_follow_the_textbook_formulas() {
        // Snell's law sin i = n sin r; d = t·sin(i − r)/cos r; the emergent ray
        // is parallel to the incoming one, so e = i and the deviation is 0
        // (DESIGN.md, rectangular block).
        let (t, n) = (40.0, 1.49);
        let s = setup(&Block::new(t, 90.0, n).unwrap());
        let rules = AngleRules::for_ray_width(2.0);
        for i in [20.0f64, 30.0, 45.0, 60.0] {
            let ray = s.answer(&rules, i, "A".into(), true);
            assert!(ray.path_ok);
            let r = (i.to_radians().sin() / n).asin();
            assert_close(ray.refraction_deg.unwrap(), r.to_degrees(), 1e-9);
            assert_close(ray.emergence_deg.unwrap(), i, 1e-9);
            assert_close(ray.deviation_deg.unwrap(), 0.0, 1e-9);
            assert_close(ray.lateral_shift_mm.unwrap(), t * (i.to_radians() - r).sin() / r.cos(), 1e-9);
            assert_eq!(ray.exit.unwrap().0, BlockFace::Exit);
        }
    }

    #[test]
    fn band_ends_at_a_measurable_shift_and_at_grazing_incidence() {
        let s = setup(&Block::new(40.0, 90.0, 1.49).unwrap());
        let rules = AngleRules::for_ray_width(2.0);
        let band = s.band(&rules, 0.0, 89.0, 45.0, true).unwrap();
        // The textbook angles 30°, 45° and 60° are all worth printing.
        assert!(band.contains(30.0) && band.contains(45.0) && band.contains(60.0), "{band:?}");
        assert_eq!(band.min_limit, AngleLimit::SmallShift);
        // w / cos i = 3 w at i = acos(1/3) = 70.53°.
        assert_eq!(band.max_limit, AngleLimit::Grazing);
        assert_close(band.max, (1.0f64 / 3.0).acos().to_degrees(), 0.01);
        // Below the band the shift is under three accept ranges (3 × 1.5 mm).
        let low = s.answer(&rules, band.min - 0.1, "A".into(), false);
        assert!(low.lateral_shift_mm.unwrap() < 4.5);
    }
}
