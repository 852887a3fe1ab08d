//! The crossing-against-height curve a key plots (spherical aberration):
//! sampled from the exact trace once, when the plan is made, so the layout
//! only draws it.

use super::SafeBand;
use crate::optics::{Outcome, Outline, trace_parallel};

/// How many heights the curve samples between the axis and its top.
pub const CURVE_SAMPLES: u32 = 48;

/// One sample of the curve.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CurvePoint {
    /// Guide height, mm above the axis.
    pub height_mm: f64,
    /// Where that ray crosses the axis (really or virtually), mm from the entry vertex.
    pub crossing_from_entry_mm: f64,
}

/// Crossing position against guide height above the axis, from the exact trace.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct CrossingCurve {
    /// The highest height sampled, mm: the top of the safe band, or 0.6 of the
    /// half-height when no height qualifies; never past the half-height.
    pub top_height_mm: f64,
    /// Samples at top·k/[`CURVE_SAMPLES`] for k = 1 … [`CURVE_SAMPLES`], lowest
    /// first; heights whose ray does not cross the axis (total internal
    /// reflection, out through an edge, …) are left out.
    pub points: Vec<CurvePoint>,
}

/// Samples the curve for a piece placed as `outline`, up to the top of `band`.
pub fn crossing_curve(outline: &Outline, band: Option<&SafeBand>) -> CrossingCurve {
    let top = band.map(|b| b.max_mm).unwrap_or(outline.a() * 0.6).min(outline.a());
    let points = (1..=CURVE_SAMPLES)
        .filter_map(|k| {
            let h = top * f64::from(k) / f64::from(CURVE_SAMPLES);
            match trace_parallel(outline, h, 10.0).outcome {
                Outcome::Crosses { x_mm } | Outcome::Virtual { x_mm } => {
                    Some(CurvePoint { height_mm: h, crossing_from_entry_mm: x_mm })
                }
                _ => None,
            }
        })
        .collect();
    CrossingCurve { top_height_mm: top, points }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::optics::{Entry, Face, Lens as Piece};

    fn half_disc(r: f64, n: f64) -> Outline {
        Outline::new(
            Piece::new(Face::Flat, Face::Convex { radius_mm: r }, r, 2.0 * r, n).unwrap(),
            Entry::Front,
        )
    }

    #[test]
    fn half_disc_samples_follow_the_closed_form() {
        // DESIGN.md, half-disc flat face first: the ray at h meets the axis at
        // R·n·sinθ1 / sin(θ2 − θ1) from the flat face, sinθ1 = h/R, sinθ2 = n·h/R.
        let (r, n) = (30.0, 1.49);
        let o = half_disc(r, n);
        let curve = crossing_curve(&o, None);
        // No band: 0.6 of the half-height, below R/n = 20.1 mm, so every sample crosses.
        assert_eq!(curve.top_height_mm, 18.0);
        assert_eq!(curve.points.len(), CURVE_SAMPLES as usize);
        for p in &curve.points {
            let (t1, t2) = ((p.height_mm / r).asin(), (n * p.height_mm / r).asin());
            let want = r * n * t1.sin() / (t2 - t1).sin();
            assert!(
                (p.crossing_from_entry_mm - want).abs() < 1e-9,
                "h {}: {} vs {want}",
                p.height_mm,
                p.crossing_from_entry_mm
            );
        }
        // Spherical aberration: higher rays cross nearer the piece.
        assert!(curve.points.windows(2).all(|w| w[1].crossing_from_entry_mm < w[0].crossing_from_entry_mm));
    }

    #[test]
    fn heights_past_total_internal_reflection_are_left_out() {
        // Above R/n the ray is totally reflected at the curved face (DESIGN.md).
        let (r, n) = (30.0, 1.49);
        let band = SafeBand {
            min_mm: 1.0,
            max_mm: 29.0,
            ..crate::sheets::lens::safe_band(
                &half_disc(r, n),
                &crate::sheets::lens::BandRules::for_ray_width(2.0),
            )
            .unwrap()
        };
        let curve = crossing_curve(&half_disc(r, n), Some(&band));
        assert_eq!(curve.top_height_mm, 29.0);
        let highest = curve.points.last().unwrap().height_mm;
        assert!(highest < r / n && !curve.points.is_empty(), "highest sample {highest}");
        assert!(curve.points.len() < CURVE_SAMPLES as usize);
    }
}
