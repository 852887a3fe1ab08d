//! What index and critical-angle sheets share: a half-disc with the centre of
//! its flat face on the centre of a printed protractor, single rays aimed
//! along radii at that centre and traced with the general trace, their angles
//! from the normal, the ray reflected at the flat face (partly, or totally
//! past the critical angle), and accept ranges worked out from the geometry.
//!
//! Sheet frame (mm, y up): the flat face lies on x = 0 from y = +R to −R, its
//! centre at the origin; the curved face bulges toward +x; the normal is the
//! x axis. Guide rays come in above the normal: from the upper right through
//! the curved face (`enter = "curved"`), or from the upper left in air onto
//! the flat face (`enter = "flat"`).

use super::angled::AngleRules;
use crate::geom::{Point, Ray, Shape, Vec2};
use crate::optics::measure::NotDefined;
use crate::optics::{Boundary, End, Entry, Event, EventKind, Face, Lens, Outline, Trace, trace};

/// The face the light enters.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Side {
    /// Along a radius through the curved face, unbent; it meets the flat face
    /// from inside the acrylic.
    Curved,
    /// At the flat face's centre from air; it leaves along a radius, unbent.
    Flat,
}

/// Gap between the half-disc's curved face and the protractor's ticks, mm (our choice).
pub const SCALE_GAP_MM: f64 = 5.0;
/// How far beyond the ticks' inner ends the ray-box bars stand, mm (our
/// choice: clear of the scale's numbers, close enough to keep the sheet small).
pub const LEAD_PAST_SCALE_MM: f64 = 16.0;
/// Guides closer than this to the one before them are staggered, degrees.
pub const CROWDED_DEG: f64 = 6.0;
/// How much further out each level of staggered guides starts, mm.
pub const STAGGER_MM: f64 = 10.0;
/// Distances a guide may start at: the lead and this many − 1 steps further.
pub const STAGGER_LEVELS: u8 = 3;
/// Rays whose outcome an aiming error could turn are within this many of the
/// aiming error's degrees of the critical angle, plus this margin, degrees.
pub const OUTCOME_MARGIN_DEG: f64 = 0.5;

/// A half-disc placed on the protractor.
#[derive(Clone, Debug, PartialEq)]
pub struct ProtractorSetup {
    /// The half-disc's outline in the sheet frame (flat face = [`Boundary::Entry`]).
    pub shape: Shape<Boundary>,
    /// Radius of the half-disc, mm.
    pub radius_mm: f64,
    /// Index of refraction.
    pub index: f64,
    /// The face the light enters.
    pub side: Side,
    /// Distance from the centre to the inner end of every protractor tick, mm.
    pub scale_radius_mm: f64,
    /// Distance from the centre to the ray-box bar at a guide line's start, mm
    /// (a guide within [`CROWDED_DEG`] of another starts [`STAGGER_MM`] or
    /// twice that further out, so their bars and letters stay apart).
    pub lead_mm: f64,
}

/// Why a lens shape cannot go on a protractor sheet.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct NotHalfDisc;

impl ProtractorSetup {
    /// Places a half-disc (one flat face, one convex face of radius R,
    /// thickness R, height 2R) with its flat face's centre on the origin.
    pub fn new(lens: &Lens, side: Side) -> Result<ProtractorSetup, NotHalfDisc> {
        if !lens.is_half_disc() {
            return Err(NotHalfDisc);
        }
        let entry = if lens.front() == Face::Flat { Entry::Front } else { Entry::Back };
        let outline = Outline::new(*lens, entry);
        let radius_mm = lens.thickness_mm();
        let scale_radius_mm = radius_mm + SCALE_GAP_MM;
        Ok(ProtractorSetup {
            shape: outline.shape().clone(),
            radius_mm,
            index: lens.index(),
            side,
            scale_radius_mm,
            lead_mm: scale_radius_mm + LEAD_PAST_SCALE_MM,
        })
    }

    /// The critical angle asin(1/n), degrees.
    pub fn critical_deg(&self) -> f64 {
        (1.0 / self.index).asin().to_degrees()
    }

    /// The kit word for the face the light enters.
    pub fn side_word(&self) -> &'static str {
        match self.side {
            Side::Curved => "curved",
            Side::Flat => "flat",
        }
    }

    /// Unit direction of the guide ray at angle of incidence `i_deg` (above the normal).
    pub fn direction(&self, i_deg: f64) -> Vec2 {
        let (s, c) = i_deg.to_radians().sin_cos();
        match self.side {
            Side::Curved => Vec2::new(-c, -s),
            Side::Flat => Vec2::new(c, -s),
        }
    }

    /// The guide ray at `i_deg`, starting at a ray-box bar `lead_mm` from the centre.
    pub fn guide(&self, i_deg: f64, lead_mm: f64) -> Ray {
        let d = self.direction(i_deg);
        Ray { origin: Point::new(0.0, 0.0) - d * lead_mm, dir: d }
    }

    /// Refractive indices on the side the light comes from and the far side
    /// of the flat face.
    fn indices(&self) -> (f64, f64) {
        match self.side {
            Side::Curved => (self.index, 1.0),
            Side::Flat => (1.0, self.index),
        }
    }
}

/// What happens at the flat face.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum RayOutcome {
    /// Through the flat face's centre, refracted.
    Refracts,
    /// Totally reflected at the flat face's centre.
    TotalReflection,
    /// The light did not take the path the sheet measures (never met the
    /// centre, or met another face first).
    OffPath,
}

impl ProtractorRay {
    /// The answer-file outcome (DESIGN.md, answer conventions): `refracts`,
    /// `total-internal-reflection`, or for a ray off the sheet's path how its
    /// trace ended: `misses`, `trapped` or `leaves-through-edge`.
    pub fn outcome_word(&self) -> &'static str {
        match (self.outcome, self.trace.end) {
            (RayOutcome::Refracts, _) => "refracts",
            (RayOutcome::TotalReflection, _) => "total-internal-reflection",
            (RayOutcome::OffPath, End::Missed) => "misses",
            (RayOutcome::OffPath, End::Trapped) => "trapped",
            (RayOutcome::OffPath, End::Left { .. }) => "leaves-through-edge",
        }
    }
}

/// The parts of an accept range, degrees.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Tolerance {
    /// Half the protractor's finest division.
    pub reading_deg: f64,
    /// The drawn line's swing: a slip of e across the ray where it crosses
    /// the scale, its other end pinned at the centre: atan(e/P).
    pub line_deg: f64,
    /// The incoming ray's aiming error: its far end placed to ±e on a guide
    /// `lead` mm long, the near end on the centre: atan(e/lead).
    pub aim_deg: f64,
    /// How much the measured angle turns per degree of aiming error: dr/di =
    /// n₁·cos i / (n₂·cos r) for a refracted ray, 1 for a reflected one.
    pub gain: f64,
    /// The accept range: reading + line + gain × aim.
    pub total_deg: f64,
}

/// One guide ray of a protractor sheet and everything measured on it.
#[derive(Clone, Debug, PartialEq)]
pub struct ProtractorRay {
    /// The letter printed beside it.
    pub letter: String,
    /// The angle of incidence it is printed at, degrees from the normal.
    pub incidence_deg: f64,
    /// The exact trace.
    pub trace: Trace<Boundary>,
    /// What happens at the flat face.
    pub outcome: RayOutcome,
    /// The angle of incidence at the flat face as traced, degrees.
    pub traced_incidence_deg: Result<f64, NotDefined>,
    /// The angle of refraction on the far side of the flat face, degrees.
    pub refraction_deg: Result<f64, NotDefined>,
    /// The angle of the totally reflected ray from the normal, degrees
    /// (`None` unless the ray is totally reflected at the flat face).
    pub reflection_deg: Option<f64>,
    /// The ray reflected at the flat face's centre: its path from the centre
    /// (through the acrylic and out of the curved face, or in air) and its
    /// direction after the last point. For a totally reflected ray it is the
    /// trace's own path.
    pub reflected: (Vec<Point>, Vec2),
    /// The path the light takes after the flat face (refracted, or totally
    /// reflected), from the centre, and its direction after the last point.
    pub onward: Option<(Vec<Point>, Vec2)>,
    /// The accept range of the angle read for this ray (the angle of
    /// refraction, or of the totally reflected ray).
    pub tolerance: Tolerance,
    /// Whether the outcome is beyond doubt: the ray lies further from the
    /// critical angle than its aiming error plus [`OUTCOME_MARGIN_DEG`].
    pub outcome_certain: bool,
}

impl ProtractorRay {
    /// Whether the ray's answers are marked: it takes the sheet's path and
    /// no aiming error could change its outcome.
    pub fn graded(&self) -> bool {
        self.outcome != RayOutcome::OffPath && self.outcome_certain
    }

    /// sin of the angle of incidence.
    pub fn sin_i(&self) -> f64 {
        self.incidence_deg.to_radians().sin()
    }

    /// sin of the angle of refraction, if the ray refracts.
    pub fn sin_r(&self) -> Result<f64, NotDefined> {
        self.refraction_deg.map(|r| r.to_radians().sin())
    }

    /// (sin of the angle in the acrylic, sin of the angle in air), for the
    /// plot, if the ray refracts.
    pub fn sines(&self, side: Side) -> Option<(f64, f64)> {
        let r = self.sin_r().ok()?;
        Some(match side {
            Side::Curved => (self.sin_i(), r),
            Side::Flat => (r, self.sin_i()),
        })
    }
}

/// The event at the flat face, if the ray met it.
pub fn flat_event(tr: &Trace<Boundary>) -> Option<Event<Boundary>> {
    tr.events.iter().find(|e| e.face == Boundary::Entry).copied()
}

/// A direction mirrored in a face of unit normal `n`: d − 2(d·n)n (the law of reflection).
fn mirror(d: Vec2, n: Vec2) -> Vec2 {
    d - n * (2.0 * d.dot(n))
}

/// The path after `at` of a trace that starts there: every event point, and
/// the final direction.
fn path_from(at: Point, tr: &Trace<Boundary>) -> (Vec<Point>, Vec2) {
    let mut pts = vec![at];
    pts.extend(tr.events.iter().map(|e| e.at));
    let dir = match tr.end {
        End::Left { dir, .. } => dir,
        End::Missed | End::Trapped => tr.final_dir(),
    };
    (pts, dir)
}

impl ProtractorSetup {
    /// Traces and measures the guide ray at `i_deg` with the general trace:
    /// the angle at the flat face and what happens there, the reflected ray
    /// (traced on from just inside the acrylic where it stays inside), and the
    /// accept range.
    pub fn answer(&self, rules: &AngleRules, i_deg: f64, letter: String, lead_mm: f64) -> ProtractorRay {
        let tr = trace(&self.shape, self.index, self.guide(i_deg, lead_mm));
        let centre = Point::new(0.0, 0.0);
        let fe = flat_event(&tr);
        let at_centre = fe.is_some_and(|e| e.at.distance(centre) < 1e-6);
        let expected: &[(Boundary, EventKind)] = match (self.side, fe.map(|e| e.kind)) {
            (Side::Curved, Some(EventKind::TotalReflection)) => &[
                (Boundary::Exit, EventKind::Enter),
                (Boundary::Entry, EventKind::TotalReflection),
                (Boundary::Exit, EventKind::Leave),
            ],
            (Side::Curved, _) => &[(Boundary::Exit, EventKind::Enter), (Boundary::Entry, EventKind::Leave)],
            (Side::Flat, _) => &[(Boundary::Entry, EventKind::Enter), (Boundary::Exit, EventKind::Leave)],
        };
        let path_ok = at_centre
            && matches!(tr.end, End::Left { .. })
            && tr.events.iter().map(|e| (e.face, e.kind)).eq(expected.iter().copied());
        let outcome = match fe.map(|e| e.kind) {
            _ if !path_ok => RayOutcome::OffPath,
            Some(EventKind::TotalReflection) => RayOutcome::TotalReflection,
            _ => RayOutcome::Refracts,
        };
        let traced_incidence_deg = fe.map(|e| e.incidence_rad().to_degrees()).ok_or(NotDefined::NotAtFace);
        let refraction_deg = match (outcome, fe) {
            (RayOutcome::Refracts, Some(e)) => {
                e.refraction_rad().map(f64::to_degrees).ok_or(NotDefined::NotAtFace)
            }
            _ => Err(NotDefined::NotAtFace),
        };
        // After the flat face: the trace's own path from the centre on.
        let onward = fe.filter(|_| path_ok).map(|e| {
            let k = tr.events.iter().position(|x| x.face == Boundary::Entry).unwrap_or(0);
            let mut pts = vec![e.at];
            pts.extend(tr.events[k + 1..].iter().map(|x| x.at));
            let dir = match tr.end {
                End::Left { dir, .. } => dir,
                End::Missed | End::Trapped => tr.final_dir(),
            };
            (pts, dir)
        });
        // The reflected ray: the totally reflected path itself, or the part
        // reflected at the face beside the refracted ray.
        let reflected = match (outcome, fe, &onward) {
            (RayOutcome::TotalReflection, _, Some(on)) => on.clone(),
            (_, Some(e), _) => {
                let d = mirror(e.dir_in, e.outward);
                match self.side {
                    // Inside the acrylic: traced on from just inside it.
                    Side::Curved => {
                        let start = e.at + d * 1.0;
                        let t = trace(&self.shape, self.index, Ray { origin: start, dir: d });
                        let (mut pts, dir) = path_from(start, &t);
                        pts[0] = e.at;
                        (pts, dir)
                    }
                    // In air, away from the piece.
                    Side::Flat => (vec![e.at], d),
                }
            }
            _ => (vec![centre], self.direction(i_deg)),
        };
        let reflection_deg = fe
            .filter(|e| outcome == RayOutcome::TotalReflection && e.kind == EventKind::TotalReflection)
            .map(|e| crate::optics::angle_from_normal(e.dir_out, e.outward).to_degrees());
        let tolerance = self.tolerance(rules, outcome, i_deg, refraction_deg.ok(), lead_mm);
        let outcome_certain = (i_deg - self.critical_deg()).abs() > tolerance.aim_deg + OUTCOME_MARGIN_DEG
            || self.side == Side::Flat;
        ProtractorRay {
            letter,
            incidence_deg: i_deg,
            trace: tr,
            outcome,
            traced_incidence_deg,
            refraction_deg,
            reflection_deg,
            reflected,
            onward,
            tolerance,
            outcome_certain,
        }
    }

    /// The accept range of the angle read for a ray (see [`Tolerance`]): the
    /// line is read where it crosses the scale, so its length is the scale's
    /// radius; the guide is `lead_mm` long.
    pub fn tolerance(
        &self,
        rules: &AngleRules,
        outcome: RayOutcome,
        i_deg: f64,
        r_deg: Option<f64>,
        lead_mm: f64,
    ) -> Tolerance {
        let e = rules.across_error_mm();
        let reading_deg = rules.protractor_deg;
        let line_deg = (e / self.scale_radius_mm).atan().to_degrees();
        let aim_deg = (e / lead_mm).atan().to_degrees();
        let (n1, n2) = self.indices();
        let gain = match (outcome, r_deg) {
            (RayOutcome::Refracts, Some(r)) => {
                let cos_r = r.to_radians().cos().max(1e-6);
                n1 * i_deg.to_radians().cos() / (n2 * cos_r)
            }
            _ => 1.0,
        };
        Tolerance { reading_deg, line_deg, aim_deg, gain, total_deg: reading_deg + line_deg + gain * aim_deg }
    }
}

/// Everything a protractor sheet shows: the placed half-disc, the rules and
/// the guide rays in letter order (increasing angle).
#[derive(Clone, Debug, PartialEq)]
pub struct ProtractorPlan {
    /// The placed half-disc.
    pub setup: ProtractorSetup,
    /// The criteria used (ray width, protractor reading).
    pub rules: AngleRules,
    /// The guide rays, lettered A, B, C… in order of increasing angle.
    pub rays: Vec<ProtractorRay>,
}

impl ProtractorPlan {
    /// Traces the guide rays at `angles` (sorted, lettered in order).
    pub fn new(setup: ProtractorSetup, rules: AngleRules, angles: &[f64]) -> ProtractorPlan {
        let mut list = angles.to_vec();
        list.sort_by(f64::total_cmp);
        let mut rays: Vec<ProtractorRay> = Vec::new();
        // Each guide starts at the nearest of STAGGER_LEVELS distances where no
        // guide before it lies within CROWDED_DEG.
        let mut levels: Vec<(f64, u8)> = Vec::new();
        for (k, &i) in list.iter().enumerate() {
            let letter = char::from(crate::plan::RAY_LETTERS[k % crate::plan::RAY_LETTERS.len()]);
            let level = (0..STAGGER_LEVELS)
                .find(|l| levels.iter().all(|(a, m)| m != l || (i - a).abs() >= CROWDED_DEG))
                .unwrap_or(STAGGER_LEVELS - 1);
            levels.push((i, level));
            let lead = setup.lead_mm + STAGGER_MM * f64::from(level);
            rays.push(setup.answer(&rules, i, letter.to_string(), lead));
        }
        ProtractorPlan { setup, rules, rays }
    }

    /// The critical angle asin(1/n), degrees.
    pub fn critical_deg(&self) -> f64 {
        self.setup.critical_deg()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    pub(crate) fn half_disc(r: f64, n: f64) -> Lens {
        Lens::new(Face::Flat, Face::Convex { radius_mm: r }, r, 2.0 * r, n).unwrap()
    }

    #[test]
    fn snell_at_the_flat_face_both_ways_for_n_149_and_150() {
        // Closed form, Snell's law at the flat face: n·sin(angle in acrylic) = sin(angle in air).
        let rules = AngleRules::for_ray_width(2.0);
        for n in [1.49f64, 1.50] {
            let crit = (1.0 / n).asin().to_degrees();
            for k in 1..=8 {
                let i = 10.0 * f64::from(k);
                // Curved face first: i in the acrylic.
                let s = ProtractorSetup::new(&half_disc(38.0, n), Side::Curved).unwrap();
                let ray = s.answer(&rules, i, "A".into(), 59.0);
                assert_close(ray.traced_incidence_deg.unwrap(), i, 1e-9);
                if i < crit {
                    assert_eq!(ray.outcome, RayOutcome::Refracts);
                    let want = (n * i.to_radians().sin()).asin().to_degrees();
                    assert_close(ray.refraction_deg.unwrap(), want, 1e-9);
                } else {
                    assert_eq!(ray.outcome, RayOutcome::TotalReflection);
                    assert!(ray.refraction_deg.is_err());
                }
                // Flat face first: i in air, always refracts.
                let s = ProtractorSetup::new(&half_disc(38.0, n), Side::Flat).unwrap();
                let ray = s.answer(&rules, i, "A".into(), 59.0);
                assert_eq!(ray.outcome, RayOutcome::Refracts);
                let want = (i.to_radians().sin() / n).asin().to_degrees();
                assert_close(ray.refraction_deg.unwrap(), want, 1e-9);
            }
        }
    }

    #[test]
    fn the_reflected_ray_leaves_at_the_angle_of_incidence_on_the_other_side() {
        let rules = AngleRules::for_ray_width(2.0);
        let s = ProtractorSetup::new(&half_disc(38.0, 1.49), Side::Curved).unwrap();
        for i in [20.0f64, 50.0] {
            let ray = s.answer(&rules, i, "A".into(), 59.0);
            let (pts, dir) = &ray.reflected;
            assert_eq!(pts.len(), 2, "centre, then the curved face");
            // Mirror image of the incoming ray: (cos i, −sin i), radial, so unbent at the curved face.
            assert_close(dir.x, i.to_radians().cos(), 1e-9);
            assert_close(dir.y, -i.to_radians().sin(), 1e-9);
            assert_close(pts[1].distance(Point::new(0.0, 0.0)), 38.0, 1e-9);
        }
    }

    #[test]
    fn tolerances_grow_near_the_critical_angle() {
        let rules = AngleRules::for_ray_width(2.0);
        let s = ProtractorSetup::new(&half_disc(38.0, 1.49), Side::Curved).unwrap();
        let a = s.answer(&rules, 20.0, "A".into(), 59.0);
        let b = s.answer(&rules, 40.0, "B".into(), 59.0);
        // dr/di = n cos i / cos r (differentiating sin r = n sin i).
        let r = (1.49 * 40f64.to_radians().sin()).asin();
        assert_close(b.tolerance.gain, 1.49 * 40f64.to_radians().cos() / r.cos(), 1e-9);
        for t in [a.tolerance, b.tolerance] {
            assert_close(t.total_deg, t.reading_deg + t.line_deg + t.gain * t.aim_deg, 1e-12);
        }
        // At 20° the gain is 1.6, at 40° (2° inside the critical margin) 4.0.
        assert!(b.tolerance.gain > 2.0 * a.tolerance.gain, "{a:?} {b:?}");
        // e = 1 mm (a 2 mm ray) at P = 43 mm: atan(1/43) = 1.33°.
        assert_close(a.tolerance.line_deg, (1.0f64 / 43.0).atan().to_degrees(), 1e-12);
        assert!(a.outcome_certain && a.graded());
        // 42.0° is within the aiming error of θc = 42.16°: not graded.
        assert!(!s.answer(&rules, 42.0, "C".into(), 59.0).graded());
    }

    #[test]
    fn a_ray_off_the_sheets_path_says_how_it_ended() {
        let rules = AngleRules::for_ray_width(2.0);
        let mut s = ProtractorSetup::new(&half_disc(38.0, 1.49), Side::Curved).unwrap();
        // The piece moved off the protractor's centre: the guide misses it.
        s.shape = s.shape.placed(&crate::geom::Placement::translation(Vec2::new(0.0, 200.0)));
        let ray = s.answer(&rules, 30.0, "A".into(), 59.0);
        assert_eq!(ray.outcome, RayOutcome::OffPath);
        assert_eq!(ray.outcome_word(), "misses");
        assert!(!ray.graded() && ray.refraction_deg.is_err());
        // Moved a little: the ray meets the flat face, but not at the centre.
        let mut s = ProtractorSetup::new(&half_disc(38.0, 1.49), Side::Curved).unwrap();
        s.shape = s.shape.placed(&crate::geom::Placement::translation(Vec2::new(0.0, 5.0)));
        let ray = s.answer(&rules, 30.0, "A".into(), 59.0);
        assert_eq!(ray.outcome, RayOutcome::OffPath);
        assert_eq!(ray.outcome_word(), "leaves-through-edge");
    }

    #[test]
    fn only_a_half_disc_goes_on_the_protractor() {
        let l = Lens::new(Face::Flat, Face::Convex { radius_mm: 50.0 }, 12.0, 60.0, 1.49).unwrap();
        assert_eq!(ProtractorSetup::new(&l, Side::Curved), Err(NotHalfDisc));
        let back = Lens::new(Face::Convex { radius_mm: 30.0 }, Face::Flat, 30.0, 60.0, 1.49).unwrap();
        let s = ProtractorSetup::new(&back, Side::Flat).unwrap();
        assert_eq!(
            s.answer(&AngleRules::for_ray_width(2.0), 30.0, "A".into(), 59.0).outcome,
            RayOutcome::Refracts
        );
    }
}
