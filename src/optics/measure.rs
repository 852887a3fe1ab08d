//! Measurements over a trace, each a value or the reason it is not defined:
//! axis crossing, deviation, lateral shift, angles of refraction and
//! emergence, exit point.

use super::{End, EventKind, Trace};
use crate::geom::{Point, Ray};

/// Why a measurement does not exist for a trace.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum NotDefined {
    /// The ray never met the piece.
    Missed,
    /// The ray is still inside after the bounce limit.
    Trapped,
    /// The outgoing ray runs parallel to the line it should cross.
    Parallel,
    /// The outgoing ray is not parallel to the incoming one (a lateral shift
    /// needs parallel lines).
    NotParallel,
    /// The ray did not pass through the face asked about: it was totally
    /// reflected there or never met it.
    NotAtFace,
}

impl NotDefined {
    /// Plain words for reports and answer files.
    pub fn words(self) -> &'static str {
        match self {
            NotDefined::Missed => "the ray misses the piece",
            NotDefined::Trapped => "the ray stays trapped inside the piece",
            NotDefined::Parallel => "the outgoing ray runs parallel to the line, so it never crosses it",
            NotDefined::NotParallel => "the outgoing ray is not parallel to the incoming ray",
            NotDefined::NotAtFace => "the ray does not pass through that face",
        }
    }
}

impl std::fmt::Display for NotDefined {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.words())
    }
}

/// Where an outgoing ray meets the optical axis y = 0.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct AxisCrossing {
    /// Position on the axis, mm.
    pub x_mm: f64,
    /// True when the crossing lies ahead of the ray (real); false when only
    /// its backward extension meets the axis (virtual).
    pub ahead: bool,
}

/// Directions closer to parallel than this (|sin|) count as parallel.
const PARALLEL_SIN: f64 = 1e-12;

/// Where `out` (a ray in air) meets the axis y = 0: s = −y/d_y along the ray.
/// [`NotDefined::Parallel`] when |d_y| < 1e-12.
pub fn axis_crossing(out: &Ray) -> Result<AxisCrossing, NotDefined> {
    if out.dir.y.abs() < PARALLEL_SIN {
        return Err(NotDefined::Parallel);
    }
    let s = -out.origin.y / out.dir.y;
    Ok(AxisCrossing { x_mm: out.origin.x + s * out.dir.x, ahead: s > 0.0 })
}

fn outgoing<F: Copy>(tr: &Trace<F>) -> Result<Ray, NotDefined> {
    match tr.end {
        End::Left { at, dir, .. } => Ok(Ray { origin: at, dir }),
        End::Missed => Err(NotDefined::Missed),
        End::Trapped => Err(NotDefined::Trapped),
    }
}

/// Deviation: the angle that turns the incoming direction onto the outgoing
/// one, radians, counterclockwise positive, in (−π, π].
pub fn deviation_rad<F: Copy>(tr: &Trace<F>) -> Result<f64, NotDefined> {
    let out = outgoing(tr)?;
    Ok(tr.incoming.dir.signed_angle_to(out.dir))
}

/// Lateral shift: the distance between the incoming ray's line and the
/// outgoing ray's line, mm, when the two are parallel (|sin| of the angle
/// between them below `1e-9`), as for a ray through a block with parallel faces.
pub fn lateral_shift_mm<F: Copy>(tr: &Trace<F>) -> Result<f64, NotDefined> {
    let out = outgoing(tr)?;
    if tr.incoming.dir.cross(out.dir).abs() > 1e-9 || tr.incoming.dir.dot(out.dir) < 0.0 {
        return Err(NotDefined::NotParallel);
    }
    Ok((out.origin - tr.incoming.origin).cross(tr.incoming.dir).abs())
}

/// Angle of refraction inside the piece where the ray first enters through
/// `face`, radians from that face's normal.
pub fn refraction_angle_at<F: Copy + PartialEq>(tr: &Trace<F>, face: F) -> Result<f64, NotDefined> {
    tr.events
        .iter()
        .find(|e| e.face == face && e.kind == EventKind::Enter)
        .and_then(|e| e.refraction_rad())
        .ok_or(NotDefined::NotAtFace)
}

/// Angle of incidence where the ray first meets the piece, radians from the
/// normal of that face.
pub fn incidence_angle<F: Copy>(tr: &Trace<F>) -> Result<f64, NotDefined> {
    tr.events.first().map(|e| e.incidence_rad()).ok_or(NotDefined::Missed)
}

/// Angle of emergence: the angle in air from the normal of the face the ray
/// finally leaves through, radians.
pub fn emergence_angle_rad<F: Copy>(tr: &Trace<F>) -> Result<f64, NotDefined> {
    outgoing(tr)?;
    tr.events
        .iter()
        .rev()
        .find(|e| e.kind == EventKind::Leave)
        .and_then(|e| e.refraction_rad())
        .ok_or(NotDefined::Trapped)
}

/// The face the ray leaves through and the point where it leaves.
pub fn exit_point<F: Copy>(tr: &Trace<F>) -> Result<(F, Point), NotDefined> {
    match tr.end {
        End::Left { face, at, .. } => Ok((face, at)),
        End::Missed => Err(NotDefined::Missed),
        End::Trapped => Err(NotDefined::Trapped),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use crate::geom::{Placement, Vec2};
    use crate::optics::{Block, BlockFace, Prism, PrismFace, trace};

    fn ray_at(at: Point, dir: Vec2) -> Ray {
        Ray::new(at - dir * 40.0, dir).unwrap()
    }

    #[test]
    fn block_shift_follows_the_textbook_formula() {
        // d = t·sin(i − r)/cos r (DESIGN.md, rectangular block), r from Snell's law.
        let (t, n) = (40.0, 1.49);
        let b = Block::new(t, 90.0, n).unwrap();
        for i_deg in [10.0f64, 30.0, 45.0, 60.0, 75.0] {
            let i = i_deg.to_radians();
            let tr = trace(&b.shape(), n, ray_at(Point::new(0.0, 0.0), Vec2::from_angle(-i)));
            let r = (i.sin() / n).asin();
            assert_close(refraction_angle_at(&tr, BlockFace::Entry).unwrap(), r, 1e-14);
            assert_close(lateral_shift_mm(&tr).unwrap(), t * (i - r).sin() / r.cos(), 1e-9);
            // Parallel faces: the emergent ray is parallel to the incoming one.
            assert_close(deviation_rad(&tr).unwrap(), 0.0, 1e-12);
            assert_close(emergence_angle_rad(&tr).unwrap(), i, 1e-9);
            assert_eq!(exit_point(&tr).unwrap().0, BlockFace::Exit);
        }
    }

    #[test]
    fn prism_deviation_is_i_plus_e_minus_a() {
        // δ = i + e − A (DESIGN.md, triangular prism), for an equilateral
        // acrylic prism entered at the middle of side A from the base side of the normal.
        let n = 1.49;
        let p = Prism::new(60.0, 50.0, n).unwrap();
        let [apex, left, _] = p.corners();
        let at = apex + (left - apex) * 0.5;
        let inward = (left - apex).perp().normalized().unwrap();
        for i_deg in [35.0f64, 45.0, 55.0, 70.0] {
            // Rotating the inward normal clockwise puts the ray on the base side.
            let d = Vec2::from_angle(inward.angle_rad() + i_deg.to_radians());
            let tr = trace(&p.shape(), n, ray_at(at, d));
            assert_eq!(exit_point(&tr).unwrap().0, PrismFace::SideB);
            let e = emergence_angle_rad(&tr).unwrap();
            let dev = deviation_rad(&tr).unwrap().abs();
            assert_close(dev, i_deg.to_radians() + e - 60f64.to_radians(), 1e-12);
            assert_eq!(lateral_shift_mm(&tr), Err(NotDefined::NotParallel));
        }
    }

    #[test]
    fn undefined_measurements_say_why() {
        let b = Block::new(40.0, 90.0, 1.49).unwrap();
        let miss = trace(&b.shape(), 1.49, Ray::new(Point::new(-5.0, 80.0), Vec2::new(1.0, 0.0)).unwrap());
        assert_eq!(deviation_rad(&miss), Err(NotDefined::Missed));
        assert_eq!(refraction_angle_at(&miss, BlockFace::Entry), Err(NotDefined::NotAtFace));
        assert_eq!(
            axis_crossing(&Ray::new(Point::new(0.0, 3.0), Vec2::new(1.0, 0.0)).unwrap()),
            Err(NotDefined::Parallel)
        );
        let moved = b.shape().placed(&Placement::new(0.3, Vec2::new(5.0, 5.0)));
        let trapped = trace(&moved, 1.49, Ray::new(Point::new(20.0, 10.0), Vec2::new(0.0, 1.0)).unwrap());
        assert!(matches!(trapped.end, End::Left { .. } | End::Trapped));
    }
}
