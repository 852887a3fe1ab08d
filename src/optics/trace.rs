//! The exact trace of any ray through any placed piece: every event in order
//! (face, point, angles, refraction or total internal reflection) and how the
//! ray ends. No optical axis is assumed.

use super::{Refraction, refract};
use crate::geom::{Point, Ray, Shape, Vec2};

/// What happened at one meeting with the outline.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum EventKind {
    /// The ray passed from air into the piece.
    Enter,
    /// The ray passed from the piece into air.
    Leave,
    /// Total internal reflection: the ray stayed inside.
    TotalReflection,
}

/// One meeting of the ray with the outline.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Event<F> {
    /// The face met.
    pub face: F,
    /// Where.
    pub at: Point,
    /// What happened.
    pub kind: EventKind,
    /// Unit normal of the face at `at`, pointing out of the piece.
    pub outward: Vec2,
    /// Unit direction before the event.
    pub dir_in: Vec2,
    /// Unit direction after the event.
    pub dir_out: Vec2,
}

impl<F> Event<F> {
    /// Angle of incidence, radians, from the face's normal on the side the
    /// light comes from, in [0, π/2].
    pub fn incidence_rad(&self) -> f64 {
        angle_from_normal(self.dir_in, self.outward)
    }

    /// Angle of refraction, radians, from the normal on the far side, in
    /// [0, π/2]; `None` for a total reflection.
    pub fn refraction_rad(&self) -> Option<f64> {
        (self.kind != EventKind::TotalReflection).then(|| angle_from_normal(self.dir_out, self.outward))
    }
}

/// How a trace ends.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum End<F> {
    /// The ray left the piece through `face` at `at` and met nothing more.
    Left {
        /// The face it left through.
        face: F,
        /// Where it left.
        at: Point,
        /// Its direction in air afterwards.
        dir: Vec2,
    },
    /// The ray never met the piece.
    Missed,
    /// Still inside after [`MAX_EVENTS`] events (repeated total reflections).
    Trapped,
}

/// The whole trace of one ray.
#[derive(Clone, Debug, PartialEq)]
pub struct Trace<F> {
    /// The ray as it started.
    pub incoming: Ray,
    /// Every event in order.
    pub events: Vec<Event<F>>,
    /// How it ended.
    pub end: End<F>,
}

impl<F: Copy> Trace<F> {
    /// The start point, then every event's point.
    pub fn points(&self) -> impl Iterator<Item = Point> + '_ {
        std::iter::once(self.incoming.origin).chain(self.events.iter().map(|e| e.at))
    }

    /// The direction after the last event (the incoming direction if none).
    pub fn final_dir(&self) -> Vec2 {
        self.events.last().map_or(self.incoming.dir, |e| e.dir_out)
    }

    /// Number of total internal reflections.
    pub fn reflections(&self) -> usize {
        self.events.iter().filter(|e| e.kind == EventKind::TotalReflection).count()
    }

    /// The outgoing ray in air, if the ray entered and left.
    pub fn outgoing(&self) -> Option<Ray> {
        match self.end {
            End::Left { at, dir, .. } => Some(Ray { origin: at, dir }),
            End::Missed | End::Trapped => None,
        }
    }
}

/// Bounce limit: a ray still inside after this many events is [`End::Trapped`].
pub const MAX_EVENTS: usize = 24;
/// Minimum travel between events, mm: keeps a ray from re-hitting the point it just left.
pub const MIN_STEP_MM: f64 = 1e-9;

/// Traces `incoming` exactly through `shape` of index `index` in air: at every
/// step the nearest edge ahead is found, Snell's law applied in vector form
/// (DESIGN.md) with total internal reflection followed, until the ray is
/// outside and meets nothing more. A ray starting inside the shape starts in
/// the glass.
pub fn trace<F: Copy>(shape: &Shape<F>, index: f64, incoming: Ray) -> Trace<F> {
    let mut events = Vec::with_capacity(4);
    let mut ray = incoming;
    let mut inside = shape.contains(incoming.origin);
    let mut last_leave: Option<(F, Point)> = None;
    for _ in 0..MAX_EVENTS {
        let Some(hit) = shape.nearest_hit(&ray, MIN_STEP_MM) else {
            let end = match (inside, last_leave) {
                (true, _) => End::Trapped,
                (false, Some((face, at))) => End::Left { face, at, dir: ray.dir },
                (false, None) => End::Missed,
            };
            return Trace { incoming, events, end };
        };
        let (n1, n2) = if inside { (index, 1.0) } else { (1.0, index) };
        let (kind, dir_out) = match refract(ray.dir, hit.outward, n1, n2) {
            Refraction::Refracted(d) => (if inside { EventKind::Leave } else { EventKind::Enter }, d),
            Refraction::Reflected(d) => (EventKind::TotalReflection, d),
        };
        match kind {
            EventKind::Enter => inside = true,
            EventKind::Leave => {
                inside = false;
                last_leave = Some((hit.face, hit.point));
            }
            EventKind::TotalReflection => {}
        }
        events.push(Event {
            face: hit.face,
            at: hit.point,
            kind,
            outward: hit.outward,
            dir_in: ray.dir,
            dir_out,
        });
        ray = Ray { origin: hit.point, dir: dir_out };
    }
    Trace { incoming, events, end: End::Trapped }
}

/// The angle between direction `d` and the line of the unit normal `n`, in
/// [0, π/2]: atan2(|d × n|, |d · n|), accurate near 0 and near 90°.
pub fn angle_from_normal(d: Vec2, n: Vec2) -> f64 {
    d.cross(n).abs().atan2(d.dot(n).abs())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::{Placement, testutil::assert_close};
    use crate::optics::{Block, BlockFace, Prism, PrismFace};
    use proptest::prelude::*;

    fn into_block(i_deg: f64) -> Ray {
        // Aimed at the middle of the entry face (x = 0, y = 0) from the upper left.
        let d = Vec2::from_angle(-i_deg.to_radians());
        Ray::new(Point::new(0.0, 0.0) - d * 30.0, d).unwrap()
    }

    #[test]
    fn block_events_obey_snell_at_both_faces() {
        // Snell's law: sin i = n sin r at entry; the exit face is parallel, so the
        // ray leaves at i again (DESIGN.md, rectangular block).
        let (n, i) = (1.49, 40.0f64);
        let b = Block::new(40.0, 90.0, n).unwrap();
        let tr = trace(&b.shape(), n, into_block(i));
        assert_eq!(tr.events.len(), 2);
        let (e0, e1) = (tr.events[0], tr.events[1]);
        assert_eq!((e0.face, e0.kind), (BlockFace::Entry, EventKind::Enter));
        assert_eq!((e1.face, e1.kind), (BlockFace::Exit, EventKind::Leave));
        assert_close(e0.incidence_rad().to_degrees(), i, 1e-12);
        assert_close(e0.refraction_rad().unwrap().sin(), i.to_radians().sin() / n, 1e-14);
        assert_close(e1.refraction_rad().unwrap().to_degrees(), i, 1e-9);
        assert!(matches!(tr.end, End::Left { face: BlockFace::Exit, .. }));
    }

    #[test]
    fn ray_that_misses_and_ray_trapped_by_reflections() {
        let b = Block::new(40.0, 90.0, 1.49).unwrap();
        let far = Ray::new(Point::new(-10.0, 60.0), Vec2::new(1.0, 0.0)).unwrap();
        let tr = trace(&b.shape(), 1.49, far);
        assert_eq!(tr.end, End::Missed);
        assert!(tr.events.is_empty());
        // Inside a square at 45° to every face: beyond the 42.2° critical angle at
        // every face, so it bounces for ever (a light pipe).
        let sq = Block::new(40.0, 40.0, 1.49).unwrap();
        let inside = Ray::new(Point::new(20.0, 5.0), Vec2::new(1.0, 1.0)).unwrap();
        let tr = trace(&sq.shape(), 1.49, inside);
        assert_eq!(tr.end, End::Trapped);
        assert_eq!(tr.reflections(), MAX_EVENTS);
    }

    #[test]
    fn right_angle_prism_turns_a_ray_through_ninety_degrees() {
        // In at a leg at normal incidence, total reflection at the hypotenuse
        // (45° > 42.2°), out through the other leg: a 90° turn (DESIGN.md, sheet 5).
        let p = Prism::new(90.0, 40.0, 1.49).unwrap();
        let [apex, left, _] = p.corners();
        let mid = apex + (left - apex) * 0.5;
        let normal_in = (left - apex).perp().normalized().unwrap(); // into the prism
        let ray = Ray::new(mid - normal_in * 20.0, normal_in).unwrap();
        let tr = trace(&p.shape(), 1.49, ray);
        let kinds: Vec<_> = tr.events.iter().map(|e| (e.face, e.kind)).collect();
        assert_eq!(
            kinds,
            [
                (PrismFace::SideA, EventKind::Enter),
                (PrismFace::Base, EventKind::TotalReflection),
                (PrismFace::SideB, EventKind::Leave)
            ]
        );
        let turn = ray.dir.signed_angle_to(tr.final_dir()).to_degrees();
        assert_close(turn.abs(), 90.0, 1e-9);
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(128))]
        /// Reversibility: a ray traced through a placed prism and sent back along
        /// its outgoing line returns along its incoming line (Helmholtz reciprocity).
        #[test]
        fn reversed_ray_returns_along_itself(apex in 20.0f64..100.0, side in 40.0f64..80.0, n in 1.3f64..1.8,
                                             frac in 0.2f64..0.8, i in -70.0f64..70.0, rot in -3.1f64..3.1,
                                             dx in -50.0f64..50.0, dy in -50.0f64..50.0) {
            let prism = Prism::new(apex, side, n).unwrap();
            let place = Placement::new(rot, Vec2::new(dx, dy));
            let shape = prism.shape().placed(&place);
            let [a, l, _] = prism.corners();
            let at = place.apply(a + (l - a) * frac);
            let inward = place.apply_vec((l - a).perp().normalized().unwrap());
            let d = Vec2::from_angle(inward.angle_rad() + i.to_radians());
            let tr = trace(&shape, n, Ray::new(at - d * 30.0, d).unwrap());
            let Some(out) = tr.outgoing() else { return Ok(()) };
            let back = trace(&shape, n, Ray::new(out.origin + out.dir * 25.0, -out.dir).unwrap());
            let Some(ret) = back.outgoing() else { panic!("the reversed ray did not leave: {back:?}") };
            prop_assert!((ret.dir.x + d.x).abs() < 1e-9 && (ret.dir.y + d.y).abs() < 1e-9);
            prop_assert!((ret.origin - tr.events[0].at).length() < 1e-7);
            // Every event point lies on the outline: the ray restarted there meets the
            // piece again only ahead of it.
            for e in &tr.events {
                prop_assert!((e.dir_in.length() - 1.0).abs() < 1e-12 && (e.dir_out.length() - 1.0).abs() < 1e-12);
            }
        }

        /// Moving a piece and its ray together leaves every angle and length unchanged.
        #[test]
        fn placement_changes_no_angle_or_length(i in 0.0f64..80.0, rot in -3.1f64..3.1, dx in -80.0f64..80.0, dy in -80.0f64..80.0) {
            let b = Block::new(35.0, 70.0, 1.52).unwrap();
            let place = Placement::new(rot, Vec2::new(dx, dy));
            let ray = into_block(i);
            let t0 = trace(&b.shape(), 1.52, ray);
            let moved = Ray::new(place.apply(ray.origin), place.apply_vec(ray.dir)).unwrap();
            let t1 = trace(&b.shape().placed(&place), 1.52, moved);
            prop_assert_eq!(t0.events.len(), t1.events.len());
            for (e0, e1) in t0.events.iter().zip(&t1.events) {
                prop_assert_eq!(e0.face, e1.face);
                prop_assert!((e0.incidence_rad() - e1.incidence_rad()).abs() < 1e-9);
                prop_assert!((place.apply(e0.at) - e1.at).length() < 1e-9);
            }
        }
    }
}
