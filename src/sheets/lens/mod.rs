//! Curved-face and focal sheets: a lens shape (half-discs included) on its
//! optical axis, lit by rays parallel to it. Which rays each sheet shows, its
//! safe band of guide heights, its answers, drawings and text.

mod band;
mod curve;
mod drawing;
mod kind;
mod plot;
mod view;

pub use band::{BandRules, Limit, SafeBand, check_height, safe_band};
pub use curve::{CURVE_SAMPLES, CrossingCurve, CurvePoint, crossing_curve};
pub use drawing::{GUIDE_W, LABEL_PT, OUTLINE_W, RAY_W, THIN_W, signed};
pub use kind::{CURVED_FACE, FOCAL};

use super::{Detail, SheetKind, SheetPlan, SheetSpec};
use crate::draw::Words;
use crate::geom::Point;
use crate::kit::Kit;
use crate::optics::{AxialTrace as Trace, Entry, Lens, Outcome, Outline, Paraxial, trace_parallel};
use crate::paper::PaperSpec;
use crate::plan::{fmt_mm, ray_letters, to_grid, top_down};

/// Distances past the exit vertex at which students mark two points on each
/// outgoing ray of a diverging piece, mm.
pub const TRACE_BACK_MM: [f64; 2] = [25.0, 75.0];

/// Room across the axis beyond a trace-back point for its label ("E2") on
/// whichever side of the point the label goes, mm.
pub const TRACE_BACK_LABEL_ROOM_MM: f64 = 8.0;

/// Space from the printable area's left edge to the piece for converging
/// pieces: room for the ray-box mark and the start of the guide lines, mm.
pub const LEAD_IN_MM: f64 = 45.0;

/// Space left after the furthest crossing for its label, mm.
pub const TAIL_MM: f64 = 12.0;

/// Space kept before a virtual focus (or crossing) for the ray box and the
/// guide lines' labels beside it, which would otherwise sit on the focus's
/// marks where the lead-in is capped by the paper, mm. The same as the
/// uncapped lead-in's 25 mm.
pub const VIRTUAL_ROOM_MM: f64 = 25.0;

/// One traced guide ray with its answers.
#[derive(Clone, Debug, PartialEq)]
pub struct RayAnswer {
    /// The ray's letter, printed beside it on the sheet and the key: A for the
    /// highest ray, then down (see [`ray_letters`]).
    pub letter: String,
    /// Guide height, mm (+ above the axis).
    pub height_mm: f64,
    /// The exact trace.
    pub trace: Trace,
    /// Crossing (real or virtual) from the entry vertex, mm.
    pub crossing_from_entry_mm: Option<f64>,
    /// Crossing from the exit vertex, mm.
    pub crossing_from_exit_mm: Option<f64>,
    /// The face it left through: `front`, `back` or `edge`.
    pub exit_face: Option<&'static str>,
    /// Angle of the outgoing ray to the axis, degrees.
    pub exit_angle_deg: Option<f64>,
    /// Grading tolerance along the axis, ± mm: the across-ray error divided by
    /// the tangent of the ray's angle to the axis.
    pub tolerance_mm: Option<f64>,
    /// For virtual crossings: the two trace-back points on the outgoing ray.
    pub trace_back: Option<[Point; 2]>,
    /// Whether the height lies in the safe band.
    pub in_band: bool,
    /// Whether the key grades this ray's crossing: it crosses (really or
    /// virtually) and lies in the safe band. Near-axis rays of a focal sheet's
    /// beam are drawn and traced but not graded: their crossing is too shallow to locate.
    pub graded: bool,
}

/// Everything a curved-face or focal sheet (and its key) shows.
#[derive(Clone, Debug, PartialEq)]
pub struct LensPlan {
    /// Curved-face or focal.
    pub kind: SheetKind,
    /// Which face the light meets first.
    pub entry: Entry,
    /// The piece placed for that side.
    pub outline: Outline,
    /// Paraxial values for that side.
    pub paraxial: Paraxial,
    /// The safe band (None: no height qualifies).
    pub band: Option<SafeBand>,
    /// The guide rays and their answers.
    pub rays: Vec<RayAnswer>,
    /// Crossing against guide height, sampled for the key's plot.
    pub crossing_curve: CrossingCurve,
    /// The rules used.
    pub rules: BandRules,
    /// Where things sit in the sheet frame: y from −y_half to +y_half.
    pub setup: super::Setup,
}

impl LensPlan {
    /// The rays from the top down: the order their letters run in, and the
    /// order of every table that lists them.
    pub fn rays_top_down(&self) -> Vec<&RayAnswer> {
        let heights: Vec<f64> = self.rays.iter().map(|r| r.height_mm).collect();
        top_down(&heights).into_iter().map(|i| &self.rays[i]).collect()
    }

    /// Where students measure crossings from, as (x in the sheet frame, words in `w`):
    /// the flat face on curved-face sheets, the exit face on focal sheets.
    pub fn measure_from<'w>(&self, w: &'w Words) -> (f64, &'w str) {
        match (self.kind, self.outline.entry_face) {
            (SheetKind::CurvedFace, crate::optics::Face::Flat) => (0.0, w.say("from_flat_face")),
            _ => (self.outline.t(), w.say("from_exit_face")),
        }
    }

    /// Whether the piece diverges light entering from this side.
    pub fn is_diverging(&self) -> bool {
        self.paraxial.efl_mm().is_some_and(|f| f < 0.0)
    }
}

/// Band rules for a sheet on this paper: the page's printable length along the
/// axis (the long side in landscape) bounds where crossings may fall. When
/// even the paraxial focus falls beyond one page the setup is tiled anyway,
/// so the page bound is dropped. A curved-face sheet grades crossings from
/// its flat face (the entry vertex), a focal sheet from the exit face.
pub fn rules_for(
    kind: SheetKind,
    kit: &Kit,
    paper: &PaperSpec,
    outline: &Outline,
    lead_in_mm: f64,
) -> BandRules {
    let mut rules = BandRules::for_ray_width(kit.ray_box.ray_width_mm);
    rules.measure_from_entry = kind == SheetKind::CurvedFace;
    let (page_w, _) = paper.page_mm();
    let printable = page_w - 2.0 * paper.margin_mm;
    let (x0, _) = outline.x_range();
    let left = x0 - lead_in_mm;
    rules.room_after_exit_mm = left + printable - outline.t() - TAIL_MM;
    rules.room_before_entry_mm = -left - 5.0;
    if let Some(f) = Paraxial::of(&outline.piece, outline.entry).rear_focus_x() {
        if f > outline.t() + rules.room_after_exit_mm || f < -rules.room_before_entry_mm {
            rules.room_after_exit_mm = f64::INFINITY;
            rules.room_before_entry_mm = f64::INFINITY;
        }
    }
    rules
}

pub(crate) fn lead_in_for(paraxial: &Paraxial, paper: &PaperSpec) -> f64 {
    let (page_w, _) = paper.page_mm();
    let printable = page_w - 2.0 * paper.margin_mm;
    match paraxial.rear_focus_x() {
        // max then min, not clamp: tiny paper must not panic.
        Some(x) if x < 0.0 => (-x + VIRTUAL_ROOM_MM).min(printable * 0.6).max(LEAD_IN_MM),
        _ => LEAD_IN_MM,
    }
}

/// Default guide heights for a sheet with none given.
/// Curved-face: ±h at a third of the half-height (kept inside the band, on a
/// 0.5 mm grid), plus one ray high in the band to show spherical aberration.
/// Focal: the ray box's rays, centred on the axis.
pub fn default_heights(kind: SheetKind, band: Option<&SafeBand>, kit: &Kit, a: f64) -> Vec<f64> {
    match kind {
        SheetKind::Focal => {
            let n = kit.ray_box.rays;
            (0..n).map(|i| (f64::from(i) - f64::from(n - 1) / 2.0) * kit.ray_box.spacing_mm).rev().collect()
        }
        _ => {
            let Some(b) = band else { return vec![to_grid(a / 3.0, 0.5), -to_grid(a / 3.0, 0.5)] };
            let inside = |h: f64| band_height(b, h);
            let low = inside(to_grid(a / 3.0, 0.5));
            let high = inside(((b.min_mm + 0.9 * b.width()) / 0.5).floor() * 0.5);
            let mut out = vec![low, -low];
            if high - low >= 2.0 * kit.ray_box.ray_width_mm {
                out.insert(0, high);
            }
            out
        }
    }
}

/// `h` moved into the band `b`, on the 0.5 mm grid. A band narrower than the
/// grid may hold no grid height (6.05–6.45 mm, say): then its middle, on a
/// 0.1 mm grid when that stays inside, else exactly. Never panics, even on a
/// band whose ends are reversed or not finite (it then gives a finite height
/// or the band's own values).
pub fn band_height(b: &SafeBand, h: f64) -> f64 {
    let lo = (b.min_mm / 0.5).ceil() * 0.5;
    let hi = (b.max_mm / 0.5).floor() * 0.5;
    if lo <= hi {
        return h.max(lo).min(hi);
    }
    let mid = (b.min_mm + b.max_mm) / 2.0;
    let tenth = to_grid(mid, 0.1);
    if b.contains(tenth) { tenth } else { mid }
}

/// Traces one guide height and works out its answers; `letter` is its name on
/// the sheet (from [`ray_letters`] over all of the sheet's heights).
pub fn answer_ray(
    outline: &Outline,
    rules: &BandRules,
    band: Option<&SafeBand>,
    h: f64,
    letter: String,
) -> RayAnswer {
    let trace = trace_parallel(outline, h, 10.0);
    let t = outline.t();
    let x = trace.outcome.crossing_x();
    let angle = (trace.exit.is_some() && trace.exit_dir.x != 0.0)
        .then(|| (trace.exit_dir.y / trace.exit_dir.x).abs().atan().to_degrees());
    let tolerance = match (x, angle) {
        (Some(_), Some(a)) if a > 1e-6 => Some(rules.across_error_mm() / a.to_radians().tan()),
        _ => None,
    };
    let trace_back = match (trace.outcome, trace.exit) {
        (Outcome::Virtual { .. }, Some((p, _))) => {
            let d = trace.exit_dir;
            let at = |dx: f64| {
                let s = (t + dx - p.x) / d.x;
                p + d * s
            };
            Some([at(TRACE_BACK_MM[0]), at(TRACE_BACK_MM[1])])
        }
        _ => None,
    };
    RayAnswer {
        letter,
        height_mm: h,
        crossing_from_entry_mm: x,
        crossing_from_exit_mm: x.map(|x| x - t),
        exit_face: trace.exit.map(|(_, b)| outline.boundary_name(b)),
        exit_angle_deg: angle,
        tolerance_mm: tolerance,
        trace_back,
        in_band: band.is_some_and(|b| b.contains(h)),
        graded: band.is_some_and(|b| b.contains(h)) && x.is_some(),
        trace,
    }
}

/// The lens shape of a lens sheet's piece (the kind's check makes sure it is one).
pub fn lens_of(kit: &Kit, spec: &SheetSpec) -> Lens {
    *kit.pieces[spec.piece].piece.lens().expect("a checked lens sheet's piece is a lens shape")
}

/// Plans one sheet with the given guide heights (or the defaults) and entry side.
pub fn plan_sheet(
    kit: &Kit,
    spec: &SheetSpec,
    paper: &PaperSpec,
    entry: Entry,
    heights: Option<&[f64]>,
) -> SheetPlan {
    let outline = Outline::new(lens_of(kit, spec), entry);
    let paraxial = Paraxial::of(&outline.piece, entry);
    let rules = rules_for(spec.kind, kit, paper, &outline, lead_in_for(&paraxial, paper));
    let band = safe_band(&outline, &rules);
    plan_sheet_in_band(kit, spec, paper, entry, heights, band)
}

/// [`plan_sheet`] with the safe band already worked out (class sets reuse it
/// for every group).
pub fn plan_sheet_in_band(
    kit: &Kit,
    spec: &SheetSpec,
    paper: &PaperSpec,
    entry: Entry,
    heights: Option<&[f64]>,
    band: Option<SafeBand>,
) -> SheetPlan {
    let kp = &kit.pieces[spec.piece];
    let outline = Outline::new(lens_of(kit, spec), entry);
    let paraxial = Paraxial::of(&outline.piece, entry);
    let lead_in = lead_in_for(&paraxial, paper);
    let rules = rules_for(spec.kind, kit, paper, &outline, lead_in);
    let a = outline.a();
    let heights: Vec<f64> = match heights {
        Some(h) => h.to_vec(),
        None => default_heights(spec.kind, band.as_ref(), kit, a),
    };
    let rays: Vec<RayAnswer> = heights
        .iter()
        .zip(ray_letters(&heights))
        .map(|(&h, letter)| answer_ray(&outline, &rules, band.as_ref(), h, letter))
        .collect();
    let mut warnings = Vec::new();
    match &band {
        None => warnings.push(
            "no guide height qualifies on this piece and paper; check the piece's size and the ray width"
                .into(),
        ),
        Some(b) => {
            for r in &rays {
                // A focal sheet's beam is the ray box's: its inner rays are meant to be near
                // the axis, so only rays above the band are worth a warning there.
                let matters = match spec.kind {
                    SheetKind::Focal => r.height_mm.abs() > b.max_mm,
                    _ => r.height_mm != 0.0,
                };
                let misses = matches!(r.trace.outcome, Outcome::Misses);
                if matters && !r.in_band && !misses {
                    let why = if r.height_mm.abs() < b.min_mm { &b.min_reason } else { &b.max_reason };
                    warnings.push(format!(
                        "guide height {} mm lies outside the safe band {:.1}–{:.1} mm: {why}",
                        fmt_mm(r.height_mm),
                        b.min_mm,
                        b.max_mm
                    ));
                }
            }
            if !rays.is_empty() && !rays.iter().any(|r| r.in_band) {
                warnings.push(format!(
                    "no guide ray lies in the safe band {:.1}–{:.1} mm, so nothing on this sheet is graded: set heights_mm to put at least one ray there (move the ray box, or change its spacing_mm)",
                    b.min_mm, b.max_mm
                ));
            }
        }
    }
    for r in &rays {
        match r.trace.outcome {
            Outcome::TotalInternalReflection => warnings.push(format!("the ray at {} mm is totally internally reflected", fmt_mm(r.height_mm))),
            Outcome::LeavesThroughEdge => warnings.push(format!("the ray at {} mm leaves through an edge", fmt_mm(r.height_mm))),
            Outcome::Misses => warnings.push(format!(
                "the ray at {} mm passes beside the piece (the beam is wider than the piece): cover that slit or use fewer rays",
                fmt_mm(r.height_mm)
            )),
            _ => {}
        }
    }
    let (x0, x1) = outline.x_range();
    let mut x_max = x1 + 40.0;
    let mut x_min = x0 - lead_in;
    for r in &rays {
        if let Some(x) = r.crossing_from_entry_mm {
            if x > 0.0 {
                x_max = x_max.max(x + TAIL_MM);
            } else {
                x_min = x_min.min(x - VIRTUAL_ROOM_MM);
            }
        }
        if let Some(tb) = r.trace_back {
            x_max = x_max.max(tb[1].x + TAIL_MM);
        }
    }
    if let Some(f) = paraxial.rear_focus_x() {
        if f > 0.0 {
            x_max = x_max.max(f + TAIL_MM);
        } else {
            x_min = x_min.min(f - VIRTUAL_ROOM_MM);
        }
    }
    // Room across the axis for the traced rays inside the drawing (they may leave steeply).
    let mut y_half = a + 8.0;
    for r in &rays {
        for p in &r.trace.path {
            if p.x >= x_min && p.x <= x_max {
                y_half = y_half.max(p.y.abs() + 4.0);
            }
        }
        if let Some(tb) = r.trace_back {
            y_half = y_half.max(tb[1].y.abs() + TRACE_BACK_LABEL_ROOM_MM);
        }
    }
    let crossing_curve = crossing_curve(&outline, band.as_ref());
    SheetPlan {
        number: spec.number,
        kind: spec.kind,
        piece_id: kp.id.clone(),
        piece_label: kp.label.clone(),
        enter: kind::enter_of(entry),
        index: kp.piece.index(),
        wavelength_nm: kit.ray_box.wavelength_nm,
        group: None,
        variant: None,
        warnings,
        detail: Detail::Lens(Box::new(LensPlan {
            kind: spec.kind,
            entry,
            outline,
            paraxial,
            band,
            rays,
            crossing_curve,
            rules,
            setup: super::Setup { x_min, x_max, y_min: -y_half, y_max: y_half },
        })),
        colours: None,
        source: None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::sheets::lens::band::Limit;

    fn band(min_mm: f64, max_mm: f64) -> SafeBand {
        SafeBand {
            min_mm,
            max_mm,
            min_limit: Limit::NearAxis,
            max_limit: Limit::CriticalMargin,
            min_reason: String::new(),
            max_reason: String::new(),
        }
    }

    /// Issue 12, finding 2: a band narrower than the 0.5 mm grid made
    /// `f64::clamp` panic with min 6.5 > max 6.0.
    #[test]
    fn default_heights_clamp_panics_when_band_narrower_than_grid() {
        let b = band(6.05, 6.45);
        for h in [0.0, 3.0, 6.2, 20.0] {
            let got = band_height(&b, h);
            // The band's middle is 6.25; on the 0.1 mm grid 6.3 (round half away from zero).
            assert!((got - 6.3).abs() < 1e-12, "{h} → {got}");
            assert!(b.contains(got));
        }
        // Narrower than 0.1 mm with no tenth inside: the exact middle.
        let b = band(6.01, 6.04);
        assert!((band_height(&b, 1.0) - 6.025).abs() < 1e-12);
        // A band with grid heights still keeps h on the grid, inside.
        let b = band(2.2, 9.9);
        assert_eq!([band_height(&b, 0.0), band_height(&b, 5.0), band_height(&b, 30.0)], [2.5, 5.0, 9.5]);
    }
}
