//! Circular arcs as cubic Bézier segments, at a stated radial tolerance.
//!
//! PDF has no arc operator. An arc of sweep θ is drawn as a cubic whose end
//! points lie on the circle and whose control points sit on the end tangents at
//! the control distance `k = 4/3 · tan(θ/4) · R` (the construction that puts the
//! cubic's midpoint on the circle too; see A. Riškus, "Approximation of a cubic
//! Bézier curve by circular arcs and vice versa", Information Technology and
//! Control 35 (2006)). Such a cubic lies just outside the circle; its largest
//! radial error is
//!
//! `e(θ, R) = R · (√(1 + (4/27) · sin⁶(θ/4) / cos²(θ/4)) − 1)`,
//!
//! reached at t = 1/2 ± √3/6: a closed form (squared distance to the centre,
//! maximised over t) that the tests below check against dense sampling. A single
//! 90° segment is off by 2.7·10⁻⁴·R, which is 0.055 mm at R = 200 mm: too much
//! for a sheet that is measured with a ruler. So each arc is cut into equal
//! segments of at most 90° **and** few enough degrees that `e` stays within
//! [`ARC_TOLERANCE_MM`] (1 µm); at R = 200 mm a quarter circle becomes two
//! 45° segments, off by 0.85 µm.

use std::f64::consts::FRAC_PI_2;

use crate::geom::{Point, Vec2};

/// Largest radial distance, mm, between a drawn arc and the true circle.
pub const ARC_TOLERANCE_MM: f64 = 0.001;

/// The most segments one arc is cut into. With [`ARC_TOLERANCE_MM`] this limit
/// is only reached for radii of kilometres; it guards against bad input.
const MAX_SEGMENTS: u32 = 256;

/// One cubic segment; its start is the end of the previous one (or the arc's start).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Cubic {
    /// First control point.
    pub c1: Point,
    /// Second control point.
    pub c2: Point,
    /// End point, on the circle.
    pub to: Point,
}

/// The largest radial error, mm, of one cubic segment of sweep `theta_rad` on a
/// circle of `radius_mm` (see the module notes for the formula).
pub fn max_radial_error_mm(theta_rad: f64, radius_mm: f64) -> f64 {
    let q = theta_rad.abs() / 4.0;
    let excess = 4.0 / 27.0 * q.sin().powi(6) / q.cos().powi(2);
    // √(1 + x) − 1, written so that it keeps its digits for tiny x.
    radius_mm.abs() * excess / ((1.0 + excess).sqrt() + 1.0)
}

/// How many equal segments an arc is cut into: at least one per started 90°,
/// and enough that each stays within [`ARC_TOLERANCE_MM`]. No sweep, no segment.
pub fn segment_count(radius_mm: f64, sweep_rad: f64) -> u32 {
    let s = sweep_rad.abs();
    if !s.is_finite() || s == 0.0 {
        return 0;
    }
    // The 1e-9 keeps an exact quarter from becoming two pieces through rounding.
    let quarters = (s / FRAC_PI_2 - 1e-9).ceil().clamp(1.0, f64::from(MAX_SEGMENTS));
    #[expect(clippy::cast_possible_truncation, clippy::cast_sign_loss, reason = "a whole number in 1..=256")]
    let mut n = quarters as u32;
    while n < MAX_SEGMENTS && max_radial_error_mm(s / f64::from(n), radius_mm) > ARC_TOLERANCE_MM {
        n += 1;
    }
    n
}

/// The cubic segments of an arc about `center` of `radius_mm`, from the angle
/// `start_rad` through the signed `sweep_rad` (counterclockwise positive, y up).
/// The first segment starts at `center + radius·(cos start, sin start)`.
pub fn arc_cubics(center: Point, radius_mm: f64, start_rad: f64, sweep_rad: f64) -> Vec<Cubic> {
    let n = segment_count(radius_mm, sweep_rad);
    let step = if n == 0 { 0.0 } else { sweep_rad / f64::from(n) };
    // Signed: a clockwise step turns the tangents round with it.
    let k = 4.0 / 3.0 * (step / 4.0).tan() * radius_mm;
    (0..n)
        .map(|i| {
            let a0 = start_rad + step * f64::from(i);
            let a1 = a0 + step;
            let (u0, u1) = (Vec2::from_angle(a0), Vec2::from_angle(a1));
            let p0 = center + u0 * radius_mm;
            let p3 = center + u1 * radius_mm;
            Cubic { c1: p0 + u0.perp() * k, c2: p3 - u1.perp() * k, to: p3 }
        })
        .collect()
}

/// The point at parameter `t` of the cubic from `p0` through `c`.
pub fn cubic_point(p0: Point, c: &Cubic, t: f64) -> Point {
    let u = 1.0 - t;
    let (b0, b1, b2, b3) = (u * u * u, 3.0 * u * u * t, 3.0 * u * t * t, t * t * t);
    Point::new(
        b0 * p0.x + b1 * c.c1.x + b2 * c.c2.x + b3 * c.to.x,
        b0 * p0.y + b1 * c.c1.y + b2 * c.c2.y + b3 * c.to.y,
    )
}

#[cfg(test)]
mod tests {
    use std::f64::consts::PI;

    use super::*;
    use crate::geom::testutil::assert_close;

    /// Largest |distance to centre − R| over 2001 samples of each segment.
    fn sampled_error(center: Point, r: f64, start: f64, cubics: &[Cubic]) -> f64 {
        let mut p0 = center + Vec2::from_angle(start) * r;
        let mut worst: f64 = 0.0;
        for c in cubics {
            for i in 0..=2000 {
                let p = cubic_point(p0, c, f64::from(i) / 2000.0);
                worst = worst.max((p.distance(center) - r).abs());
            }
            p0 = c.to;
        }
        worst
    }

    #[test]
    fn closed_form_error_matches_sampling() {
        let c = Point::new(0.0, 0.0);
        for deg in [10.0_f64, 30.0, 45.0, 60.0, 90.0] {
            let theta = deg.to_radians();
            let k = 4.0 / 3.0 * (theta / 4.0).tan();
            let one = Cubic {
                c1: Point::new(1.0, k),
                c2: Point::new(theta.cos() + k * theta.sin(), theta.sin() - k * theta.cos()),
                to: Point::new(theta.cos(), theta.sin()),
            };
            let sampled = sampled_error(c, 1.0, 0.0, &[one]);
            let formula = max_radial_error_mm(theta, 1.0);
            // Sampling can only miss the peak, never exceed it.
            assert!(sampled <= formula * (1.0 + 1e-9), "{deg}°: {sampled} > {formula}");
            // 1e-5: the samples straddle the peak; 1e-14: rounding in the distances.
            assert_close(sampled, formula, formula * 1e-5 + 1e-14);
        }
    }

    #[test]
    fn a_single_quarter_circle_cubic_is_off_by_2_7e_minus_4_r() {
        // The classic figure for the 4/3·(√2 − 1) quarter circle: max radius
        // 1.000273 R, here from the closed form (checked by sampling above).
        assert_close(max_radial_error_mm(FRAC_PI_2, 1.0), 2.7253e-4, 1e-8);
        // At R = 200 mm that is 0.0545 mm, more than the 0.01 mm we allow.
        assert!(max_radial_error_mm(FRAC_PI_2, 200.0) > 0.05);
    }

    #[test]
    fn quarter_circle_of_200_mm_is_two_segments_within_tolerance() {
        let c = Point::new(105.0, 20.0);
        let cubics = arc_cubics(c, 200.0, 0.3, FRAC_PI_2);
        assert_eq!(cubics.len(), 2);
        let err = sampled_error(c, 200.0, 0.3, &cubics);
        assert!(err <= ARC_TOLERANCE_MM, "{err}");
        assert!(err < 0.01, "{err}");
    }

    #[test]
    fn segments_never_exceed_90_degrees_and_stay_within_tolerance() {
        for r in [0.5, 5.0, 30.0, 120.0, 400.0, 2000.0] {
            for sweep in [0.01, 1.0, -FRAC_PI_2, 3.0, -5.5, 2.0 * PI] {
                let n = segment_count(r, sweep);
                assert!(sweep.abs() / f64::from(n) <= FRAC_PI_2 + 1e-12, "r {r} sweep {sweep}");
                let err = sampled_error(
                    Point::new(0.0, 0.0),
                    r,
                    0.7,
                    &arc_cubics(Point::new(0.0, 0.0), r, 0.7, sweep),
                );
                assert!(err <= ARC_TOLERANCE_MM, "r {r} sweep {sweep}: {err}");
            }
        }
    }

    #[test]
    fn small_radii_use_one_segment_per_quarter() {
        // Below R = 1 µm / 2.7257e-4 = 3.67 mm a 90° segment is within tolerance.
        assert_eq!(segment_count(3.0, FRAC_PI_2), 1);
        assert_eq!(segment_count(3.0, 2.0 * PI), 4);
        assert_eq!(segment_count(4.0, FRAC_PI_2), 2);
        assert_eq!(segment_count(3.0, 0.0), 0);
        assert_eq!(segment_count(3.0, f64::NAN), 0);
    }

    #[test]
    fn clockwise_arcs_end_where_they_should() {
        let c = Point::new(1.0, 2.0);
        let cubics = arc_cubics(c, 3.0, FRAC_PI_2, -PI);
        let end = cubics.last().unwrap().to;
        assert_close(end.x, 1.0, 1e-12);
        assert_close(end.y, -1.0, 1e-12);
        // The first control point of a clockwise arc from the top heads to +x.
        assert!(cubics[0].c1.x > 1.0);
    }
}
