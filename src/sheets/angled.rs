//! What block and prism sheets share: a single guide ray aimed at one point of
//! the entry face at a signed angle of incidence, traced through the placed
//! piece, with its angles, deviation, lateral shift and tolerances, and the
//! safe band of angles.

use crate::draw::Words;
use crate::geom::{Point, Ray, Shape, Vec2};
use crate::optics::measure::{self, NotDefined};
use crate::optics::{End, EventKind, Trace, trace};
use crate::plan::scan::{Band, Scan, find_band};

/// The path a sheet expects the light to take.
#[derive(Clone, Debug, PartialEq)]
pub enum Expected<F> {
    /// In at the entry face, out by refraction at `exit`, no total reflection.
    Refract {
        /// The face the light should leave through.
        exit: F,
    },
    /// In at the entry face, totally reflected at each face of `reflect_at` in
    /// order, out through `exit` (a right-angle prism turning the light).
    Turn {
        /// The faces where the light must be totally reflected, in order.
        reflect_at: Vec<F>,
        /// The face it leaves through.
        exit: F,
    },
}

/// A placed piece with the point its guide rays are aimed at.
#[derive(Clone, Debug, PartialEq)]
pub struct AngledSetup<F> {
    /// The piece's outline in the sheet frame.
    pub shape: Shape<F>,
    /// Index of refraction.
    pub index: f64,
    /// The face the light enters.
    pub entry_face: F,
    /// Where the guide rays meet the entry face.
    pub entry_point: Point,
    /// Unit normal of the entry face there, pointing out of the piece.
    pub outward: Vec2,
    /// +1 or −1: the sense of rotation (counterclockwise positive) that turns
    /// the inward normal onto the direction of a ray with a positive angle of
    /// incidence. Angles of refraction share it.
    pub sense: f64,
    /// Where on the piece "positive" sides point (the base of a prism); the
    /// emergence angle and the deviation are positive toward it. `None`: they
    /// take the sense of the angle of incidence (blocks).
    pub toward: Option<Point>,
    /// The path the sheet expects.
    pub expected: Expected<F>,
    /// Length of the printed guide line before the entry point, mm.
    pub lead_mm: f64,
    /// Length of the outgoing ray a student draws, mm (common practice, no source).
    pub out_mm: f64,
    /// Whether the key plots deviation against the angle of incidence (prisms;
    /// a block's deviation is always zero).
    pub plots_deviation: bool,
}

/// Criteria for an angle worth printing (our choices, common practice, no source).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct AngleRules {
    /// Width of one ray on paper, mm.
    pub ray_width_mm: f64,
    /// How far inside the critical angle a refracting ray must stay, degrees.
    pub critical_margin_deg: f64,
    /// How far past the critical angle a total reflection the sheet relies on must be, degrees.
    pub reflection_margin_deg: f64,
    /// Widest footprint of the ray on the entry face, in ray widths (w / cos i).
    pub max_footprint_widths: f64,
    /// Smallest ratio of a lateral shift to its tolerance.
    pub min_shift_ratio: f64,
    /// Half the finest division of a school protractor, degrees.
    pub protractor_deg: f64,
    /// Half the finest division of a ruler, mm.
    pub ruler_mm: f64,
}

impl AngleRules {
    /// Defaults for rays `ray_width_mm` wide: 4° from the critical angle for
    /// refraction, 0.5° past it for a total reflection the sheet relies on (the
    /// 180° turn of an acrylic right-angle prism holds only within about ±4° of
    /// normal incidence, DESIGN.md), a footprint of at most three ray widths
    /// (i ≤ 70.5°), a shift at least three times its tolerance, ±0.5° protractor
    /// and ±0.5 mm ruler readings.
    pub fn for_ray_width(ray_width_mm: f64) -> AngleRules {
        AngleRules {
            ray_width_mm,
            critical_margin_deg: 4.0,
            reflection_margin_deg: 0.5,
            max_footprint_widths: 3.0,
            min_shift_ratio: 3.0,
            protractor_deg: 0.5,
            ruler_mm: 0.5,
        }
    }

    /// How far across the ray a student locates its centre, mm: half the ray
    /// width, at least 1 mm (DESIGN.md, about ±1–2 mm, *memory*).
    pub fn across_error_mm(&self) -> f64 {
        (self.ray_width_mm / 2.0).max(1.0)
    }

    /// Accept range for an angle read from a drawn line `length_mm` long: the
    /// protractor's half division plus the angle the line can swing when each
    /// end is off by the across-ray error, atan(2e/L).
    pub fn angle_tolerance_deg(&self, length_mm: f64) -> f64 {
        self.protractor_deg + (2.0 * self.across_error_mm() / length_mm.max(1.0)).atan().to_degrees()
    }
}

/// Why an angle of incidence is not in the safe band.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum AngleLimit {
    /// The light does not take the path the sheet expects.
    WrongPath,
    /// Refraction within the critical-angle margin at the exit face.
    CriticalMargin,
    /// A total reflection the sheet relies on is too close to the critical angle.
    ReflectionMargin,
    /// Near-grazing incidence: the ray's footprint on the entry face is too long.
    Grazing,
    /// The ray leaves within a ray width of a corner of the piece.
    NearCorner,
    /// The lateral shift is too small against its tolerance.
    SmallShift,
    /// The end of the range of angles scanned.
    RangeEnd,
}

/// One guide ray of an angle sheet and everything measured on it.
#[derive(Clone, Debug, PartialEq)]
pub struct AngledRay<F> {
    /// The letter printed beside it.
    pub letter: String,
    /// Signed angle of incidence, degrees.
    pub incidence_deg: f64,
    /// The exact trace.
    pub trace: Trace<F>,
    /// Whether the light took the expected path (`None`), or how it went wrong.
    pub path_ok: bool,
    /// Signed angle of refraction inside, at the entry face, degrees.
    pub refraction_deg: Result<f64, NotDefined>,
    /// Signed angle of emergence at the face it leaves through, degrees.
    pub emergence_deg: Result<f64, NotDefined>,
    /// Deviation, degrees (signed as [`AngledSetup::toward`] says).
    pub deviation_deg: Result<f64, NotDefined>,
    /// Distance between the incoming and outgoing lines, mm (parallel only).
    pub lateral_shift_mm: Result<f64, NotDefined>,
    /// The face it leaves through and where.
    pub exit: Result<(F, Point), NotDefined>,
    /// Accept range for the angle of emergence and the deviation, ± degrees:
    /// read on the outgoing ray a student draws ([`AngledSetup::out_mm`] long).
    pub tolerance_deg: f64,
    /// Accept range for the angle of refraction, ± degrees: read on the ray
    /// inside the piece, as long as its path from the entry point.
    pub refraction_tolerance_deg: f64,
    /// Accept range for the lateral shift, ± mm.
    pub tolerance_mm: f64,
    /// Whether the angle lies in the safe band.
    pub in_band: bool,
}

impl<F: Copy + PartialEq> AngledSetup<F> {
    /// Unit direction of a ray at signed incidence `i_deg`: the inward normal
    /// turned by `sense · i`.
    pub fn direction(&self, i_deg: f64) -> Vec2 {
        Vec2::from_angle((-self.outward).angle_rad() + self.sense * i_deg.to_radians())
    }

    /// The guide ray at `i_deg`, starting `lead_mm` before the entry point.
    pub fn guide(&self, i_deg: f64) -> Ray {
        let d = self.direction(i_deg);
        Ray { origin: self.entry_point - d * self.lead_mm, dir: d }
    }

    /// Sign that makes a rotation from `from` positive when it turns toward
    /// [`AngledSetup::toward`] (or takes the incidence's sense).
    fn toward_sense(&self, from_point: Point, from_dir: Vec2) -> f64 {
        match self.toward {
            Some(t) => {
                let c = from_dir.cross(t - from_point);
                if c >= 0.0 { 1.0 } else { -1.0 }
            }
            None => self.sense,
        }
    }

    /// Whether a trace took the expected path.
    pub fn took_expected_path(&self, tr: &Trace<F>) -> bool {
        let ev = &tr.events;
        let Some(first) = ev.first() else { return false };
        if first.face != self.entry_face || first.kind != EventKind::Enter {
            return false;
        }
        let (reflect_at, exit): (&[F], F) = match &self.expected {
            Expected::Refract { exit } => (&[], *exit),
            Expected::Turn { reflect_at, exit } => (reflect_at.as_slice(), *exit),
        };
        if ev.len() != reflect_at.len() + 2 {
            return false;
        }
        let middle_ok = ev[1..ev.len() - 1]
            .iter()
            .zip(reflect_at)
            .all(|(e, f)| e.face == *f && e.kind == EventKind::TotalReflection);
        let last = ev[ev.len() - 1];
        middle_ok && last.face == exit && last.kind == EventKind::Leave && matches!(tr.end, End::Left { .. })
    }

    /// Traces and measures the guide ray at `i_deg`.
    pub fn answer(&self, rules: &AngleRules, i_deg: f64, letter: String, in_band: bool) -> AngledRay<F> {
        let tr = trace(&self.shape, self.index, self.guide(i_deg));
        let path_ok = self.took_expected_path(&tr);
        let first = tr.events.first().copied();
        let refraction_deg = match first {
            Some(e) if e.face == self.entry_face && e.kind == EventKind::Enter => {
                Ok(self.sense * (-self.outward).signed_angle_to(e.dir_out).to_degrees())
            }
            _ => Err(NotDefined::NotAtFace),
        };
        let last_leave = tr.events.iter().rev().find(|e| e.kind == EventKind::Leave).copied();
        let emergence_deg = match (measure::exit_point(&tr), last_leave) {
            (Ok(_), Some(e)) => {
                let s = self.toward_sense(e.at, e.outward);
                Ok(s * e.outward.signed_angle_to(e.dir_out).to_degrees())
            }
            (Err(w), _) => Err(w),
            (Ok(_), None) => Err(NotDefined::Trapped),
        };
        let deviation_deg = measure::deviation_rad(&tr).map(|d| {
            let s = self.toward_sense(self.entry_point, tr.incoming.dir);
            match self.expected {
                Expected::Turn { .. } => d.abs().to_degrees(),
                Expected::Refract { .. } => s * d.to_degrees(),
            }
        });
        let lateral_shift_mm = measure::lateral_shift_mm(&tr);
        let exit = measure::exit_point(&tr);
        // Each angle is read on the line a student draws for it: the angle of
        // refraction on the ray inside the piece (entry point to the next
        // event), the emergence and deviation on the outgoing ray.
        let inside_len = match (tr.events.first(), tr.events.get(1)) {
            (Some(a), Some(b)) => a.at.distance(b.at),
            _ => self.out_mm,
        };
        let tolerance_deg = rules.angle_tolerance_deg(self.out_mm);
        let refraction_tolerance_deg = rules.angle_tolerance_deg(inside_len);
        let tolerance_mm = rules.across_error_mm() + rules.ruler_mm;
        AngledRay {
            letter,
            incidence_deg: i_deg,
            trace: tr,
            path_ok,
            refraction_deg,
            emergence_deg,
            deviation_deg,
            lateral_shift_mm,
            exit,
            tolerance_deg,
            refraction_tolerance_deg,
            tolerance_mm,
            in_band,
        }
    }

    /// The first criterion the angle `i_deg` fails, or `None` if it passes.
    pub fn check(&self, rules: &AngleRules, i_deg: f64, need_shift: bool) -> Option<AngleLimit> {
        let footprint = 1.0 / i_deg.to_radians().cos().max(1e-9);
        if footprint > rules.max_footprint_widths {
            return Some(AngleLimit::Grazing);
        }
        let tr = trace(&self.shape, self.index, self.guide(i_deg));
        if !self.took_expected_path(&tr) {
            return Some(AngleLimit::WrongPath);
        }
        let crit = (1.0 / self.index).asin().to_degrees();
        for e in &tr.events[1..] {
            let inc = e.incidence_rad().to_degrees();
            // A face parallel to the entry face always lets the ray out (it meets it at
            // the angle of refraction, below θc), so no margin is needed there.
            let parallel_exit = e.outward.dot(self.outward) < -1.0 + 1e-12;
            match e.kind {
                EventKind::Leave if !parallel_exit && inc > crit - rules.critical_margin_deg => {
                    return Some(AngleLimit::CriticalMargin);
                }
                EventKind::TotalReflection if inc < crit + rules.reflection_margin_deg => {
                    return Some(AngleLimit::ReflectionMargin);
                }
                _ => {}
            }
        }
        // Every event point keeps a ray width and a half from the piece's corners.
        let clear = 1.5 * rules.ray_width_mm;
        let corners: Vec<Point> = self.shape.edges().iter().map(|e| e.path.start()).collect();
        if tr.events[1..].iter().any(|e| corners.iter().any(|c| c.distance(e.at) < clear)) {
            return Some(AngleLimit::NearCorner);
        }
        if need_shift {
            let shift = measure::lateral_shift_mm(&tr).unwrap_or(0.0);
            let tol = rules.across_error_mm() + rules.ruler_mm;
            if shift < rules.min_shift_ratio * tol {
                return Some(AngleLimit::SmallShift);
            }
        }
        None
    }

    /// The safe band of angles of incidence between `from` and `to` degrees,
    /// scanned in 0.1° steps and refined to 0.01°, preferring the run that
    /// contains `prefer`.
    pub fn band(
        &self,
        rules: &AngleRules,
        from: f64,
        to: f64,
        prefer: f64,
        need_shift: bool,
    ) -> Option<Band<AngleLimit>> {
        let scan = Scan {
            from,
            to,
            step: 0.1,
            prefer,
            resolution: 0.01,
            at_from: AngleLimit::RangeEnd,
            at_to: AngleLimit::RangeEnd,
        };
        find_band(&scan, |i| self.check(rules, i, need_shift))
    }
}

/// Plain words, in `w`, for what ends a band at angle `at_deg`: `lower` for the low end.
pub fn limit_words(
    limit: AngleLimit,
    at_deg: f64,
    lower: bool,
    rules: &AngleRules,
    crit_deg: f64,
    w: &Words,
) -> String {
    let side = if lower { w.say("band_below") } else { w.say("band_above") };
    let a = format!("{at_deg:.1}°");
    let s = [("side", side), ("at", a.as_str())];
    let with = |key: &str, more: &[(&str, &str)]| w.fill(key, &[&s[..], more].concat());
    let crit = format!("{crit_deg:.1}");
    match limit {
        AngleLimit::WrongPath => with("angle_wrong_path", &[]),
        AngleLimit::CriticalMargin => {
            with("angle_critical", &[("margin", &rules.critical_margin_deg.to_string()), ("critical", &crit)])
        }
        AngleLimit::ReflectionMargin => with(
            "angle_reflection",
            &[("margin", &rules.reflection_margin_deg.to_string()), ("critical", &crit)],
        ),
        AngleLimit::Grazing => with("angle_grazing", &[("widths", &rules.max_footprint_widths.to_string())]),
        AngleLimit::NearCorner => with("angle_corner", &[]),
        AngleLimit::SmallShift => with(
            "angle_small_shift",
            &[
                ("ratio", &rules.min_shift_ratio.to_string()),
                ("range", &format!("{:.1}", rules.across_error_mm() + rules.ruler_mm)),
            ],
        ),
        AngleLimit::RangeEnd => with("angle_range_end", &[]),
    }
}

/// Everything an angle sheet (block or prism) shows: the placed piece, the
/// rules, the safe band with its reasons, the guide rays and, for prisms, the
/// traced deviation against the angle of incidence.
#[derive(Clone, Debug, PartialEq)]
pub struct AngledPlan<F> {
    /// The placed piece and where its rays go in.
    pub setup: AngledSetup<F>,
    /// The criteria used.
    pub rules: AngleRules,
    /// The safe band of angles of incidence, degrees (`None`: no angle qualifies).
    pub band: Option<Band<AngleLimit>>,
    /// Plain words for why the band ends where it ends (low end, high end).
    pub band_words: Option<(String, String)>,
    /// The guide rays, lettered A, B, C… in order of increasing angle.
    pub rays: Vec<AngledRay<F>>,
    /// (angle of incidence, deviation) in degrees, traced every 0.5° where the
    /// light takes the expected path: the curve the key plots.
    pub deviation_curve: Vec<(f64, f64)>,
}

/// The range of angles a sheet scans for its band, degrees.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct AngleRange {
    /// Lowest angle.
    pub from: f64,
    /// Highest angle.
    pub to: f64,
    /// Angle the band should preferably contain.
    pub prefer: f64,
    /// Whether the lateral shift must be measurable (blocks).
    pub need_shift: bool,
}

impl<F: Copy + PartialEq> AngledPlan<F> {
    /// Works out the band in `range`, then traces the guide rays at `angles`
    /// (or, with `None`, at the angles `choose` picks from the band).
    pub fn new(
        setup: AngledSetup<F>,
        rules: AngleRules,
        range: AngleRange,
        angles: Option<&[f64]>,
        choose: impl Fn(Option<&Band<AngleLimit>>) -> Vec<f64>,
    ) -> AngledPlan<F> {
        let band = setup.band(&rules, range.from, range.to, range.prefer, range.need_shift);
        AngledPlan::in_band(setup, rules, band, angles, choose)
    }

    /// The same guide angles traced again with the piece's index replaced by
    /// `index`; each ray keeps its letter, band flag and accept ranges.
    pub fn with_index(&self, index: f64) -> AngledPlan<F>
    where
        F: Copy,
    {
        let mut copy = self.clone();
        copy.setup.index = index;
        copy.rays = self
            .rays
            .iter()
            .map(|r| {
                let mut a = copy.setup.answer(&self.rules, r.incidence_deg, r.letter.clone(), r.in_band);
                a.tolerance_deg = r.tolerance_deg;
                a.refraction_tolerance_deg = r.refraction_tolerance_deg;
                a.tolerance_mm = r.tolerance_mm;
                a
            })
            .collect();
        copy
    }

    /// Why the band ends where it ends (low end, high end), in `w`.
    pub fn band_words_in(&self, w: &Words) -> Option<(String, String)> {
        let crit = (1.0 / self.setup.index).asin().to_degrees();
        self.band.as_ref().map(|b| {
            (
                limit_words(b.min_limit, b.min, true, &self.rules, crit, w),
                limit_words(b.max_limit, b.max, false, &self.rules, crit, w),
            )
        })
    }

    /// [`AngledPlan::new`] with the band already worked out (class sets reuse it).
    pub fn in_band(
        setup: AngledSetup<F>,
        rules: AngleRules,
        band: Option<Band<AngleLimit>>,
        angles: Option<&[f64]>,
        choose: impl Fn(Option<&Band<AngleLimit>>) -> Vec<f64>,
    ) -> AngledPlan<F> {
        let crit = (1.0 / setup.index).asin().to_degrees();
        // The shipped words, for the answer file and reports (which stay English).
        let shipped = Words::shipped();
        let band_words = band.as_ref().map(|b| {
            (
                limit_words(b.min_limit, b.min, true, &rules, crit, &shipped),
                limit_words(b.max_limit, b.max, false, &rules, crit, &shipped),
            )
        });
        let mut list: Vec<f64> = match angles {
            Some(a) => a.to_vec(),
            None => choose(band.as_ref()),
        };
        list.sort_by(f64::total_cmp);
        let rays = list
            .iter()
            .enumerate()
            .map(|(k, &i)| {
                let letter = char::from(crate::plan::RAY_LETTERS[k % crate::plan::RAY_LETTERS.len()]);
                let in_band = band.as_ref().is_some_and(|b| b.contains(i));
                setup.answer(&rules, i, letter.to_string(), in_band)
            })
            .collect();
        let deviation_curve = match setup.expected {
            Expected::Refract { .. } if setup.plots_deviation => (0..=356)
                .map(|k| -89.0 + 0.5 * f64::from(k))
                .filter_map(|i| {
                    let r = setup.answer(&rules, i, String::new(), false);
                    if !r.path_ok {
                        return None;
                    }
                    r.deviation_deg.ok().map(|d| (i, d))
                })
                .collect(),
            _ => Vec::new(),
        };
        AngledPlan { setup, rules, band, band_words, rays, deviation_curve }
    }
}

/// Angles on a `step`-degree grid inside `band`, picked to spread across it:
/// the grid values nearest to the given fractions of the band's width,
/// without repeats. Empty without a band.
pub fn spread_in_band(band: Option<&Band<AngleLimit>>, fractions: &[f64], step: f64) -> Vec<f64> {
    let Some(b) = band else { return Vec::new() };
    let grid = crate::plan::scan::grid_values(b.min, b.max, step);
    let mut out: Vec<f64> = Vec::new();
    for f in fractions {
        let target = b.min + f * b.width();
        if let Some(v) = grid.iter().copied().min_by(|x, y| (x - target).abs().total_cmp(&(y - target).abs()))
            && !out.iter().any(|o| (o - v).abs() < 1e-9)
        {
            out.push(v);
        }
    }
    out
}
