//! A lens shape's trace read against its optical axis: where the outgoing ray
//! crosses the axis, really or virtually, or why it does not.

use super::measure::axis_crossing;
use super::{Boundary, End, Event, EventKind, Outline, trace};
use crate::geom::{Point, Ray, Vec2};

/// How a traced ray ends up.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Outcome {
    /// The outgoing ray crosses the axis at `x_mm` (sheet frame, from the entry vertex).
    Crosses {
        /// Crossing position on the axis, mm from the entry vertex.
        x_mm: f64,
    },
    /// The outgoing ray moves away from the axis; its backward extension meets
    /// the axis at `x_mm` (a virtual crossing).
    Virtual {
        /// Virtual crossing position, mm from the entry vertex.
        x_mm: f64,
    },
    /// The ray was totally internally reflected at least once.
    TotalInternalReflection,
    /// The ray left through one of the straight edges.
    LeavesThroughEdge,
    /// The ray leaves parallel to the axis (no crossing, real or virtual).
    Parallel,
    /// The ray runs along the axis itself.
    OnAxis,
    /// The ray does not meet the piece at all.
    Misses,
    /// The ray was still inside after the bounce limit (repeated reflections).
    Trapped,
}

impl Outcome {
    /// The answer-file word for this outcome.
    pub fn as_str(&self) -> &'static str {
        match self {
            Outcome::Crosses { .. } => "crosses",
            Outcome::Virtual { .. } => "virtual",
            Outcome::TotalInternalReflection => "total-internal-reflection",
            Outcome::LeavesThroughEdge => "leaves-through-edge",
            Outcome::Parallel => "parallel",
            Outcome::OnAxis => "on-axis",
            Outcome::Misses => "misses",
            Outcome::Trapped => "trapped",
        }
    }

    /// Crossing position (real or virtual) from the entry vertex, if any.
    pub fn crossing_x(&self) -> Option<f64> {
        match *self {
            Outcome::Crosses { x_mm } | Outcome::Virtual { x_mm } => Some(x_mm),
            _ => None,
        }
    }
}

/// The trace of one ray through a lens shape, read against the optical axis.
#[derive(Clone, Debug, PartialEq)]
pub struct AxialTrace {
    /// The incoming ray.
    pub incoming: Ray,
    /// Start point, then every point where the ray met the outline, in order.
    pub path: Vec<Point>,
    /// The events of the general trace, in order.
    pub events: Vec<Event<Boundary>>,
    /// Direction after the last event (the outgoing direction once it has left).
    pub exit_dir: Vec2,
    /// Where the ray left the piece, if it entered and left.
    pub exit: Option<(Point, Boundary)>,
    /// Number of total internal reflections.
    pub reflections: u32,
    /// Largest angle of incidence met going from glass to air, radians (0 if none).
    pub worst_inside_incidence_rad: f64,
    /// The outcome.
    pub outcome: Outcome,
}

/// Traces `incoming` through `outline` exactly with the general trace
/// ([`trace`]: nearest boundary ahead, vector Snell's law, total internal
/// reflection followed) and reads the result against the optical axis y = 0.
pub fn trace_ray(outline: &Outline, incoming: Ray) -> AxialTrace {
    let tr = trace(outline.shape(), outline.piece.index(), incoming);
    let path: Vec<Point> = tr.points().collect();
    let reflections = tr.reflections() as u32;
    let worst = tr
        .events
        .iter()
        .filter(|e| matches!(e.kind, EventKind::Leave | EventKind::TotalReflection))
        .map(|e| e.incidence_rad())
        .fold(0.0f64, f64::max);
    let exit_dir = tr.final_dir();
    let (exit, outcome) = match tr.end {
        End::Missed => (None, Outcome::Misses),
        End::Trapped => (last_leave(&tr.events), Outcome::Trapped),
        End::Left { face, at, dir } => {
            (Some((at, face)), finish(incoming, Ray { origin: at, dir }, face, reflections))
        }
    };
    AxialTrace {
        incoming,
        path,
        events: tr.events,
        exit_dir,
        exit,
        reflections,
        worst_inside_incidence_rad: worst,
        outcome,
    }
}

fn last_leave(events: &[Event<Boundary>]) -> Option<(Point, Boundary)> {
    events.iter().rev().find(|e| e.kind == EventKind::Leave).map(|e| (e.at, e.face))
}

/// The outcome of a ray that left through `face` along `out`.
fn finish(incoming: Ray, out: Ray, face: Boundary, reflections: u32) -> Outcome {
    if reflections > 0 {
        return Outcome::TotalInternalReflection;
    }
    if matches!(face, Boundary::TopEdge | Boundary::BottomEdge) {
        return Outcome::LeavesThroughEdge;
    }
    if incoming.origin.y == 0.0 && incoming.dir.y == 0.0 {
        return Outcome::OnAxis;
    }
    match axis_crossing(&out) {
        Ok(c) if c.ahead => Outcome::Crosses { x_mm: c.x_mm },
        Ok(c) => Outcome::Virtual { x_mm: c.x_mm },
        Err(_) => Outcome::Parallel,
    }
}

/// Traces a ray parallel to the axis at `height_mm`, starting `lead_mm` before
/// the outline's leftmost point.
pub fn trace_parallel(outline: &Outline, height_mm: f64, lead_mm: f64) -> AxialTrace {
    let (x0, _) = outline.x_range();
    let origin = Point::new(x0 - lead_mm, height_mm);
    trace_ray(outline, Ray { origin, dir: Vec2::new(1.0, 0.0) })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use crate::optics::{Entry, Face, Lens as Piece};
    use proptest::prelude::*;

    fn half_disc(r: f64, n: f64) -> Piece {
        Piece::new(Face::Flat, Face::Convex { radius_mm: r }, r, 2.0 * r, n).unwrap()
    }

    /// DESIGN.md closed form: flat face first, sin θ1 = h/R, sin θ2 = n h / R;
    /// crossing at R n sin θ1 / sin(θ2 − θ1) from the flat face.
    fn half_disc_closed_form(r: f64, n: f64, h: f64) -> f64 {
        let t1 = (h / r).asin();
        let t2 = (n * h / r).asin();
        r * n * t1.sin() / (t2 - t1).sin()
    }

    #[test]
    fn half_disc_matches_closed_form_at_several_heights() {
        let (r, n) = (38.0, 1.49);
        let o = Outline::new(half_disc(r, n), Entry::Front);
        for h in [0.5, 3.0, 7.5, 12.0, 18.0, 22.0, 25.0, -12.0] {
            let tr = trace_parallel(&o, h, 20.0);
            let Outcome::Crosses { x_mm } = tr.outcome else { panic!("h={h}: {:?}", tr.outcome) };
            assert_close(x_mm, half_disc_closed_form(r, n, h.abs()), 1e-9);
            assert_eq!(tr.exit.map(|e| e.1), Some(Boundary::Exit));
        }
    }

    #[test]
    fn half_disc_total_internal_reflection_above_r_over_n() {
        // Common practice, no source: a half-disc read flat face first reflects
        // totally above h = R/n.
        let (r, n) = (38.0, 1.49);
        let o = Outline::new(half_disc(r, n), Entry::Front);
        let hc = r / n;
        assert!(matches!(trace_parallel(&o, hc - 1e-6, 20.0).outcome, Outcome::Crosses { .. }));
        assert_eq!(trace_parallel(&o, hc + 1e-6, 20.0).outcome, Outcome::TotalInternalReflection);
        assert_eq!(trace_parallel(&o, -(hc + 0.5), 20.0).outcome, Outcome::TotalInternalReflection);
    }

    #[test]
    fn symmetric_heights_cross_at_the_same_point_and_move_inward() {
        // Common practice, no source: rays at ±h cross at the same point; the
        // crossing moves toward the piece as the height grows.
        let p =
            Piece::new(Face::Convex { radius_mm: 120.0 }, Face::Convex { radius_mm: 120.0 }, 9.0, 60.0, 1.5)
                .unwrap();
        let o = Outline::new(p, Entry::Front);
        let mut last = f64::INFINITY;
        for h in [2.0, 6.0, 10.0, 14.0, 18.0, 22.0] {
            let up = trace_parallel(&o, h, 10.0).outcome.crossing_x().unwrap();
            let down = trace_parallel(&o, -h, 10.0).outcome.crossing_x().unwrap();
            assert_close(up, down, 1e-9);
            assert!(up < last, "h={h}: {up} not nearer than {last}");
            last = up;
        }
    }

    #[test]
    fn on_axis_ray_and_flat_block() {
        let lens = Outline::new(half_disc(30.0, 1.49), Entry::Front);
        assert_eq!(trace_parallel(&lens, 0.0, 5.0).outcome, Outcome::OnAxis);
        let block = Outline::new(Piece::new(Face::Flat, Face::Flat, 20.0, 40.0, 1.49).unwrap(), Entry::Front);
        assert_eq!(trace_parallel(&block, 7.0, 5.0).outcome, Outcome::Parallel);
        assert_eq!(trace_parallel(&block, 25.0, 5.0).outcome, Outcome::Misses);
    }

    #[test]
    fn diverging_piece_gives_a_virtual_crossing_before_the_exit() {
        let p =
            Piece::new(Face::Concave { radius_mm: 60.0 }, Face::Concave { radius_mm: 60.0 }, 4.0, 40.0, 1.49)
                .unwrap();
        let o = Outline::new(p, Entry::Front);
        let tr = trace_parallel(&o, 5.0, 10.0);
        let Outcome::Virtual { x_mm } = tr.outcome else { panic!("{:?}", tr.outcome) };
        assert!(x_mm < 0.0);
        assert!(tr.exit_dir.y > 0.0);
    }

    #[test]
    fn steep_ray_reflects_off_an_edge() {
        // Inside a block entered through a flat face the ray meets a side edge at
        // more than 90° − 42.2° from its normal, beyond the critical angle: TIR.
        let block = Outline::new(Piece::new(Face::Flat, Face::Flat, 60.0, 20.0, 1.49).unwrap(), Entry::Front);
        let ray = Ray::new(Point::new(-5.0, 5.0), Vec2::new(1.0, 0.6)).unwrap();
        let tr = trace_ray(&block, ray);
        assert!(tr.reflections >= 1, "{tr:?}");
        assert_eq!(tr.outcome, Outcome::TotalInternalReflection);
    }

    #[test]
    fn ray_entering_an_edge_leaves_through_the_other_edge() {
        let block = Outline::new(Piece::new(Face::Flat, Face::Flat, 60.0, 20.0, 1.49).unwrap(), Entry::Front);
        let ray = Ray::new(Point::new(20.0, 30.0), Vec2::new(0.2, -1.0)).unwrap();
        let tr = trace_ray(&block, ray);
        assert_eq!(tr.outcome, Outcome::LeavesThroughEdge);
        assert_eq!(tr.exit.map(|e| e.1), Some(Boundary::BottomEdge));
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(200))]
        #[test]
        fn reversed_ray_retraces_its_path(h in -20.0f64..20.0, r1 in 45.0f64..200.0, r2 in 45.0f64..200.0, flip in proptest::bool::ANY) {
            // Property: optical paths are reversible (Helmholtz reciprocity).
            let p = Piece::new(Face::Convex { radius_mm: r1 }, Face::Concave { radius_mm: r2.max(r1) }, 10.0, 60.0, 1.52).unwrap();
            let o = Outline::new(p, if flip { Entry::Back } else { Entry::Front });
            let tr = trace_parallel(&o, h, 15.0);
            prop_assume!(tr.reflections == 0 && tr.exit.is_some());
            let (exit_p, _) = tr.exit.unwrap();
            // Start beyond the exit point on the outgoing ray and come back.
            let start = exit_p + tr.exit_dir * 30.0;
            let back = trace_ray(&o, Ray { origin: start, dir: -tr.exit_dir });
            prop_assert!((back.exit_dir.x + 1.0).abs() < 1e-9, "{:?}", back.exit_dir);
            prop_assert!(back.exit_dir.y.abs() < 1e-9);
            let (entry_back, _) = back.exit.unwrap();
            prop_assert!((entry_back.y - h).abs() < 1e-9);
            // Every hit point lies on its face.
            for q in &tr.path[1..] {
                let on_entry = (q.x - o.entry_x(q.y)).abs() < 1e-9;
                let on_exit = (q.x - o.exit_x(q.y)).abs() < 1e-9;
                prop_assert!(on_entry || on_exit);
            }
        }
    }
}
