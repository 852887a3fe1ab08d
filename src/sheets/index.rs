//! The index and critical-angle kinds: a half-disc at a printed protractor.
//! Which pieces they fit, their fields, class variants (the angles), and the
//! planned sheet as layout and output see it.

use std::fmt::Write;

use serde_json::{Map, Value, json};

use super::angled::AngleRules;
use super::angled_view::{angle, undefined_words};
use super::field::{Bound, FieldValue, SheetField};
use super::protractor::{ProtractorPlan, ProtractorRay, ProtractorSetup, RayOutcome, Side};
use super::{
    Choice, Detail, Enter, Kind, Prepared, Setup, SheetKind, SheetPlan, SheetSpec, SheetView, SummaryRow,
};
use crate::draw::{Drawing, Words};
use crate::kit::{Kit, KitError, SheetEntry};
use crate::optics::{EventKind, Piece};
use crate::paper::PaperSpec;
use crate::plan::scan::grid_values;
use crate::plan::{fmt_index, fmt1};
use crate::scene::{Item, Rect};

/// A sheet kind at a printed protractor: the index and the critical-angle
/// kinds share everything but their word, title, fields and ray choice.
pub struct ProtractorKind {
    kind: SheetKind,
    word: &'static str,
    title: &'static str,
    fields: &'static [SheetField],
}
/// The index kind, for the kind list.
pub static INDEX: ProtractorKind = ProtractorKind {
    kind: SheetKind::Index,
    word: "index",
    title: "Index of refraction at a protractor",
    fields: INDEX_FIELDS,
};
/// The critical-angle kind, for the kind list.
pub static CRITICAL: ProtractorKind = ProtractorKind {
    kind: SheetKind::CriticalAngle,
    word: "critical-angle",
    title: "The critical angle at a protractor",
    fields: CRITICAL_FIELDS,
};

/// Lowest angle an index sheet's variants use, degrees (our choice: below it
/// the refraction is too small to read well).
const LOW_DEG: f64 = 5.0;
/// Highest angle in air on a flat-face-first sheet: the ray's spot on the face
/// stays under three ray widths (1/cos i ≤ 3, as on block sheets).
const FLAT_HIGH_DEG: f64 = 70.0;
/// Least difference between two rays' angles on an index sheet, degrees.
const MIN_APART_DEG: f64 = 6.0;
/// How far a critical-angle sheet's rays may lie from θc, degrees.
const CRITICAL_REACH_DEG: f64 = 5.0;

/// Angles of incidence on a protractor sheet.
const ANGLES: SheetField = SheetField {
    name: "angles_deg",
    about: "Fixed angles of incidence from the normal at the flat face's centre, up to (not including) 90. Default: chosen for the sheet (index: spread from 5° up; critical angle: either side of it) and for each group of a class set.",
    value: FieldValue::Numbers { unit: "deg", min: Bound::Incl(0.0), max: Bound::Excl(90.0), most: 9 },
};

const INDEX_FIELDS: &[SheetField] = &[
    SheetField {
        name: "enter",
        about: "Where the light enters the half-disc: \"curved\" (along a radius, refracted at the flat face from inside) or \"flat\" (at the flat face's centre, from air).",
        value: FieldValue::Word { choices: &["curved", "flat"], default: "curved" },
    },
    ANGLES,
];

const CRITICAL_FIELDS: &[SheetField] = &[
    SheetField {
        name: "enter",
        about: "Where the light enters the half-disc: always \"curved\" (along a radius) on a critical-angle sheet.",
        value: FieldValue::Word { choices: &["curved"], default: "curved" },
    },
    ANGLES,
];

/// What both protractor kinds fit.
const HALF_DISC: &str =
    "a half-disc (one flat face, one convex face of radius R, thickness_mm = R, height_mm = 2R)";

/// Checks an index or critical-angle sheet table: a half-disc, the entry
/// face, angles 0–90°.
fn check(kind: SheetKind, s: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
    let kp = &kit.pieces[s.piece];
    let word = kind.as_str();
    let half_disc = matches!(kp.piece, Piece::Lens(l) if l.is_half_disc());
    if !half_disc {
        let what = match kp.piece {
            Piece::Lens(_) => "a lens shape that is not a half-disc".to_string(),
            other => format!("a {}", other.shape_word()),
        };
        return Err(s.piece_at.error(
            format!("an {word} sheet needs a half-disc; piece `{}` is {what}", kp.id),
            "give a half-disc: one face \"flat\", the other { curve = \"convex\", radius_mm = R }, with thickness_mm = R and height_mm = 2R",
        ));
    }
    let enter = match (kind, s.word("enter")?) {
        (_, None) => Enter::Curved,
        (_, Some(w)) if w.value == "curved" => Enter::Curved,
        (SheetKind::Index, Some(w)) if w.value == "flat" => Enter::Flat,
        (SheetKind::Index, Some(w)) => {
            return Err(w.at.error(
                format!("\"{}\" is not a face an index sheet enters", w.value),
                "give \"curved\" (in along a radius, refracted at the flat face from inside) or \"flat\" (in at the flat face's centre from air)",
            ));
        }
        (_, Some(w)) => {
            return Err(w.at.error(
                format!("a critical-angle sheet always enters the curved face, not \"{}\"", w.value),
                "leave enter out, or give enter = \"curved\"",
            ));
        }
    };
    let angles = check_angles(s)?;
    let mut spec = SheetSpec::angled(s, kind, enter, angles);
    spec.vary_entry = false;
    Ok(spec)
}

/// Reads `angles_deg`: 1 to 9 angles, each from 0 to 90 degrees (90 itself
/// grazes the flat face, so it is refused too).
fn check_angles(s: &SheetEntry) -> Result<Option<Vec<f64>>, KitError> {
    let Some(list) = s.numbers("angles_deg")? else { return Ok(None) };
    if list.value.is_empty() {
        return Err(list.at.error(
            "the list of angles is empty",
            "give at least one angle from the normal, such as [10, 20, 30, 40, 50], or leave angles_deg out to have them chosen",
        ));
    }
    if list.value.len() > 9 {
        return Err(list.at.error(
            format!("{} angles is more than a sheet can show clearly", list.value.len()),
            "give at most 9 angles",
        ));
    }
    let mut out = Vec::new();
    for a in &list.value {
        let v = a.value;
        if !(v.is_finite() && (0.0..90.0).contains(&v)) {
            return Err(a.at.error(
                format!("an angle of incidence of {v}° is outside what a protractor sheet takes"),
                "give angles from 0 up to (not including) 90 degrees, measured from the normal at the flat face's centre",
            ));
        }
        out.push(v);
    }
    Ok(Some(out))
}

fn lens_of(kit: &Kit, spec: &SheetSpec) -> crate::optics::Lens {
    match kit.pieces[spec.piece].piece {
        Piece::Lens(l) => l,
        _ => unreachable!("a checked protractor sheet's piece is a half-disc"),
    }
}

fn side_of(enter: Enter) -> Side {
    if enter == Enter::Flat { Side::Flat } else { Side::Curved }
}

impl Kind for ProtractorKind {
    fn word(&self) -> &'static str {
        self.word
    }
    fn title(&self) -> &'static str {
        self.title
    }
    fn fields(&self) -> &'static [SheetField] {
        self.fields
    }
    fn fits(&self) -> &'static str {
        HALF_DISC
    }
    fn check(&self, s: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
        check(self.kind, s, kit)
    }
    fn takes_colours(&self) -> bool {
        true
    }
    fn prepare<'a>(
        &self,
        kit: &'a Kit,
        spec: &'a SheetSpec,
        _paper: &'a PaperSpec,
    ) -> Box<dyn Prepared + 'a> {
        Box::new(ProtractorPrepared::new(kit, spec))
    }
}

struct ProtractorPrepared<'a> {
    kit: &'a Kit,
    spec: &'a SheetSpec,
    setup: ProtractorSetup,
    rules: AngleRules,
}

impl<'a> ProtractorPrepared<'a> {
    fn new(kit: &'a Kit, spec: &'a SheetSpec) -> ProtractorPrepared<'a> {
        let setup = ProtractorSetup::new(&lens_of(kit, spec), side_of(spec.enter))
            .expect("a checked protractor sheet's piece is a half-disc");
        let rules = AngleRules::for_ray_width(kit.ray_box.ray_width_mm);
        ProtractorPrepared { kit, spec, setup, rules }
    }

    fn critical(&self) -> bool {
        self.spec.kind == SheetKind::CriticalAngle
    }

    /// The aiming error, degrees: how close to θc a ray's outcome stays in doubt.
    fn aim_deg(&self) -> f64 {
        self.setup.tolerance(&self.rules, RayOutcome::TotalReflection, 0.0, None, self.setup.lead_mm).aim_deg
    }

    /// The whole degrees below and above θc that a critical-angle sheet may
    /// use: further than the aiming error (plus a margin) from θc, within
    /// [`CRITICAL_REACH_DEG`] of it.
    fn critical_grid(&self) -> (Vec<f64>, Vec<f64>) {
        let c = self.setup.critical_deg();
        let near = self.aim_deg() + super::protractor::OUTCOME_MARGIN_DEG;
        let below = grid_values(c - CRITICAL_REACH_DEG, c - near, 1.0);
        let above = grid_values(c + near, (c + CRITICAL_REACH_DEG).min(85.0), 1.0);
        (below, above)
    }

    /// The range a refracting ray of an index sheet keeps to: from 5° to
    /// 4° short of θc (curved face first), or to 70° in air (flat face first).
    fn refracting_range(&self) -> (f64, f64) {
        match self.setup.side {
            Side::Curved => (LOW_DEG, self.setup.critical_deg() - self.rules.critical_margin_deg),
            Side::Flat => (LOW_DEG, FLAT_HIGH_DEG),
        }
    }

    /// Totally reflected angles an index sheet may add (curved face first):
    /// whole degrees from 4° past θc, ten of them.
    fn reflecting_grid(&self) -> Vec<f64> {
        let lo = self.setup.critical_deg() + self.rules.critical_margin_deg;
        grid_values(lo, (lo + 10.0).min(80.0), 1.0)
    }

    /// The angles of the ungrouped sheet.
    fn defaults(&self) -> Vec<f64> {
        if self.critical() {
            let (below, above) = self.critical_grid();
            return below.iter().rev().take(2).chain(above.iter().take(2)).copied().collect();
        }
        match self.setup.side {
            Side::Flat => vec![10.0, 20.0, 30.0, 40.0, 50.0, 60.0],
            Side::Curved => {
                let (_, hi) = self.refracting_range();
                let mut v: Vec<f64> = [10.0, 20.0, 30.0].into_iter().filter(|a| *a <= hi).collect();
                if let Some(t) =
                    self.reflecting_grid().iter().map(|a| (a / 10.0).ceil() * 10.0).find(|a| *a < 85.0)
                {
                    v.push(t);
                }
                v
            }
        }
    }
}

impl Prepared for ProtractorPrepared<'_> {
    fn choices(&self) -> Vec<Choice> {
        if self.spec.angles_deg.is_some() {
            return Vec::new();
        }
        let enter = self.spec.enter;
        let mut out = Vec::new();
        if self.critical() {
            // Two rays below θc and two above, every pair of each.
            let (below, above) = self.critical_grid();
            for (a, &b1) in below.iter().enumerate() {
                for &b2 in &below[a + 1..] {
                    for (c, &a1) in above.iter().enumerate() {
                        for &a2 in &above[c + 1..] {
                            out.push(Choice { enter, values: vec![b1, b2, a1, a2] });
                        }
                    }
                }
            }
            return out;
        }
        // Three refracting angles, one in each third of the range, at least
        // 6° apart; curved face first, one totally reflected ray as well.
        let (lo, hi) = self.refracting_range();
        if hi - lo < 2.0 * MIN_APART_DEG {
            return out;
        }
        let grid = grid_values(lo, hi, 1.0);
        let third = (hi - lo) / 3.0;
        let part = |k: f64| {
            grid.iter()
                .copied()
                .filter(move |v| *v >= lo + k * third - 1e-9 && *v <= lo + (k + 1.0) * third + 1e-9)
        };
        let reflect = if self.setup.side == Side::Curved { self.reflecting_grid() } else { Vec::new() };
        for a in part(0.0) {
            for b in part(1.0).filter(|b| b - a >= MIN_APART_DEG) {
                for c in part(2.0).filter(|c| c - b >= MIN_APART_DEG) {
                    if reflect.is_empty() {
                        out.push(Choice { enter, values: vec![a, b, c] });
                    }
                    for &t in &reflect {
                        out.push(Choice { enter, values: vec![a, b, c, t] });
                    }
                }
            }
        }
        out
    }

    fn notes(&self, groups: usize) -> Vec<String> {
        super::angled_view::angle_notes(
            self.spec.number,
            self.spec.angles_deg.is_some(),
            self.choices().len(),
            groups,
        )
    }

    fn plan(&self, choice: Option<&Choice>) -> SheetPlan {
        let angles = choice
            .map(|c| c.values.clone())
            .or_else(|| self.spec.angles_deg.clone())
            .unwrap_or_else(|| self.defaults());
        let plan = ProtractorPlan::new(self.setup.clone(), self.rules, &angles);
        let kp = &self.kit.pieces[self.spec.piece];
        let mut warnings: Vec<String> = plan
            .rays
            .iter()
            .filter(|r| !r.graded())
            .map(|r| {
                format!(
                    "ray {} at {}: within the aiming error of the critical angle ({:.1}°), so whether it leaves is not graded",
                    r.letter,
                    angle(r.incidence_deg),
                    plan.critical_deg()
                )
            })
            .collect();
        // Angles the kit fixed where the ray is hard to set up.
        let w = self.rules.ray_width_mm;
        for r in &plan.rays {
            let i = r.incidence_deg;
            match self.setup.side {
                Side::Flat if i > FLAT_HIGH_DEG => warnings.push(format!(
                    "ray {} at {}: it meets the flat face so obliquely that its spot there is {:.0} ray widths long",
                    r.letter,
                    angle(i),
                    1.0 / i.to_radians().cos().max(1e-9)
                )),
                // Where the ray enters the curved face, against the corner at the flat face's end.
                Side::Curved if 2.0 * self.setup.radius_mm * ((90.0 - i) / 2.0).to_radians().sin() < 1.5 * w => {
                    warnings.push(format!(
                        "ray {} at {}: it enters the curved face within a ray width and a half of the corner, so part of it misses",
                        r.letter,
                        angle(i)
                    ));
                }
                _ => {}
            }
        }
        let (lo, hi) = super::protractor_drawing::extent(&plan);
        let view = ProtractorView {
            kind: self.spec.kind,
            plan,
            setup: Setup { x_min: lo.x, x_max: hi.x, y_min: lo.y, y_max: hi.y },
        };
        SheetPlan {
            number: self.spec.number,
            kind: self.spec.kind,
            piece_id: kp.id.clone(),
            piece_label: kp.label.clone(),
            enter: self.spec.enter,
            index: self.setup.index,
            group: None,
            variant: None,
            warnings,
            wavelength_nm: self.kit.ray_box.wavelength_nm,
            detail: Detail::Protractor(Box::new(view)),
            colours: None,
            source: None,
        }
    }
}

/// A planned index or critical-angle sheet.
#[derive(Clone, Debug, PartialEq)]
pub struct ProtractorView {
    /// Which of the two kinds.
    pub kind: SheetKind,
    /// The rays and the placed half-disc.
    pub plan: ProtractorPlan,
    /// What must be on paper.
    pub setup: Setup,
}

/// "19.6° ± 2.1°", "totally reflected, at 50.0° ± 2.8°" (`short`:
/// "reflected at …") or the words for why there is no value.
fn with_range(r: &ProtractorRay, w: &Words, short: bool) -> String {
    let range = fmt1(r.tolerance.total_deg);
    match (r.refraction_deg, r.reflection_deg) {
        (Ok(v), _) => format!("{}° ± {range}°", fmt1(v)),
        (Err(_), Some(v)) if short => w.fill("table_reflected_at", &[("value", &fmt1(v)), ("range", &range)]),
        (Err(_), Some(v)) => w.fill("table_totally_reflected_at", &[("value", &fmt1(v)), ("range", &range)]),
        (Err(e), None) => undefined_words(e, w).to_string(),
    }
}

impl ProtractorView {
    fn critical(&self) -> bool {
        self.kind == SheetKind::CriticalAngle
    }

    /// The same guide rays traced at another index (a colour's), graded as
    /// the sheet's own: the same accept ranges and the same rays left
    /// ungraded near the critical angle.
    fn at_index(&self, index: f64) -> ProtractorPlan {
        let mut setup = self.plan.setup.clone();
        setup.index = index;
        let angles: Vec<f64> = self.plan.rays.iter().map(|r| r.incidence_deg).collect();
        let mut plan = ProtractorPlan::new(setup, self.plan.rules, &angles);
        for (new, old) in plan.rays.iter_mut().zip(&self.plan.rays) {
            new.tolerance = old.tolerance;
            new.outcome_certain = old.outcome_certain;
        }
        plan
    }

    fn letters(&self, outcome: RayOutcome) -> String {
        let v: Vec<&str> =
            self.plan.rays.iter().filter(|r| r.outcome == outcome).map(|r| r.letter.as_str()).collect();
        v.join(", ")
    }
}

impl SheetView for ProtractorView {
    fn measured(&self) -> Vec<crate::sheets::Measured> {
        self.plan
            .rays
            .iter()
            .filter(|r| r.graded())
            .map(|r| {
                let want = match (r.outcome, r.refraction_deg) {
                    (RayOutcome::Refracts, Ok(v)) => {
                        crate::sheets::Want::Value { value: v.abs() + 0.0, tolerance: r.tolerance.total_deg }
                    }
                    _ => crate::sheets::Want::Observation(r.outcome_word()),
                };
                crate::sheets::Measured {
                    ray: r.letter.clone(),
                    quantity: "refraction_angle_deg",
                    unit: "deg",
                    want,
                }
            })
            .collect()
    }
    fn measured_at_index(&self, index: f64) -> Vec<crate::sheets::Measured> {
        ProtractorView { plan: self.at_index(index), ..self.clone() }.measured()
    }
    fn colour_paths(&self, index: f64) -> Option<Vec<(String, Vec<crate::geom::Point>)>> {
        Some(super::protractor_drawing::ray_paths(&self.at_index(index)))
    }
    fn leaves_at_index(&self, index: f64) -> Vec<(String, bool)> {
        self.at_index(index)
            .rays
            .iter()
            .filter(|r| r.outcome != RayOutcome::OffPath)
            .map(|r| (r.letter.clone(), r.outcome == RayOutcome::Refracts))
            .collect()
    }
    fn class_curve(&self) -> Option<crate::sheets::ClassCurve> {
        // Snell's law at the flat face: from inside (sin r = n sin i, up to the
        // critical angle) or from air (sin r = sin i / n).
        let n = self.plan.setup.index;
        let from_inside = self.plan.setup.side == super::protractor::Side::Curved;
        let points: Vec<(f64, f64)> = (0..=890)
            .map(|k| f64::from(k) / 10.0)
            .filter_map(|i| {
                let s = if from_inside { n * i.to_radians().sin() } else { i.to_radians().sin() / n };
                (s <= 1.0).then(|| (i, s.asin().to_degrees()))
            })
            .collect();
        Some(crate::sheets::ClassCurve {
            x: "angle_of_incidence_deg",
            y: "refraction_angle_deg",
            points,
            paraxial: None,
        })
    }
    fn extent(&self) -> Setup {
        self.setup
    }
    fn student(&self, bounds: Rect, w: &Words) -> Drawing {
        let mut d = Drawing::default();
        d.items = super::protractor_drawing::student(&self.plan, &bounds, &mut d.placer, w);
        d
    }
    fn key(&self, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item> {
        super::protractor_drawing::key(&self.plan, &bounds, &mut base.placer, w)
    }
    fn template(&self) -> &'static str {
        if self.critical() { "critical-angle.toml" } else { "index.toml" }
    }
    fn entry_words(&self, w: &Words) -> String {
        match self.plan.setup.side {
            Side::Curved => w.say("entry_curved"),
            Side::Flat => w.say("entry_flat"),
        }
        .to_string()
    }
    fn table_widths(&self) -> Vec<f64> {
        if self.critical() { vec![0.09, 0.21, 0.35, 0.35] } else { vec![0.08, 0.2, 0.32, 0.2, 0.2] }
    }
    fn table_rows(&self, key: bool, w: &Words) -> Vec<Vec<String>> {
        self.plan
            .rays
            .iter()
            .map(|r| {
                let mut row = vec![r.letter.clone(), angle(r.incidence_deg)];
                if !key {
                    return row;
                }
                let dash = "\u{2013}".to_string();
                if self.critical() {
                    row.push(match r.outcome {
                        RayOutcome::Refracts => w.say("table_leaves").to_string(),
                        RayOutcome::TotalReflection => w.say("table_totally_reflected").to_string(),
                        RayOutcome::OffPath => w.say("happened_off_path").to_string(),
                    });
                    row.push(if r.outcome == RayOutcome::OffPath { dash } else { with_range(r, w, true) });
                } else {
                    // "sin r, or totally reflected": the angle column keeps the
                    // reflected ray's angle and its accept range.
                    row.push(with_range(r, w, true));
                    row.push(format!("{:.3}", r.sin_i()));
                    row.push(match (r.sin_r(), r.outcome) {
                        (Ok(s), _) => format!("{s:.3}"),
                        (Err(_), RayOutcome::TotalReflection) => w.say("table_totally_reflected").to_string(),
                        (Err(_), _) => dash,
                    });
                }
                row
            })
            .collect()
    }
    fn key_lines(&self, w: &Words) -> Vec<String> {
        let p = &self.plan;
        let s = &p.setup;
        let crit = p.critical_deg();
        let mut v = vec![
            match s.side {
                Side::Curved => w.fill("index_snell_curved", &[("index", &fmt_index(s.index))]),
                Side::Flat => w.fill("index_snell_flat", &[("index", &fmt_index(s.index))]),
            },
            w.fill(
                "index_critical",
                &[("critical", &fmt1(crit)), ("index", &format!("{:.3}", 1.0 / crit.to_radians().sin()))],
            ),
        ];
        if self.critical() {
            let none = w.say("none");
            let leave = self.letters(RayOutcome::Refracts);
            let reflect = self.letters(RayOutcome::TotalReflection);
            v.push(w.fill(
                "critical_which",
                &[
                    ("leave", if leave.is_empty() { none } else { &leave }),
                    ("reflected", if reflect.is_empty() { none } else { &reflect }),
                ],
            ));
        }
        let t = s.tolerance(&p.rules, RayOutcome::TotalReflection, 0.0, None, s.lead_mm);
        let e = p.rules.across_error_mm();
        // Staggered guides are longer, so their aiming error is smaller: the
        // line gives the range the rays' own accept ranges use.
        let aims = p.rays.iter().map(|r| r.tolerance.aim_deg);
        let (lo, hi) = aims.fold((t.aim_deg, t.aim_deg), |(lo, hi), a| (lo.min(a), hi.max(a)));
        let long_mm = e / lo.to_radians().tan();
        let aiming = if fmt1(lo) == fmt1(hi) {
            w.fill("index_aim_one", &[("aim", &fmt1(hi)), ("slip", &fmt1(e)), ("lead", &fmt1(s.lead_mm))])
        } else {
            w.fill(
                "index_aim_range",
                &[
                    ("low", &fmt1(lo)),
                    ("high", &fmt1(hi)),
                    ("slip", &fmt1(e)),
                    ("short", &fmt1(s.lead_mm)),
                    ("long", &fmt1(long_mm)),
                ],
            )
        };
        v.push(w.fill(
            "index_accept",
            &[
                ("reading", &fmt1(t.reading_deg)),
                ("line", &fmt1(t.line_deg)),
                ("slip", &fmt1(e)),
                ("radius", &fmt1(s.scale_radius_mm)),
                ("aiming", &aiming),
            ],
        ));
        v.push(w.say("protractor_laser").to_string());
        v
    }
    fn key_plot(&self, rect: Rect, w: &Words) -> Vec<Item> {
        super::protractor_drawing::key_plot(&self.plan, rect, w)
    }
    fn student_note(&self, w: &Words) -> Option<String> {
        let note = if self.critical() { w.say("note_critical") } else { w.say("note_index") };
        Some(note.to_string())
    }
    fn student_plot(&self, rect: Rect, w: &Words) -> Vec<Item> {
        if self.critical() { Vec::new() } else { super::protractor_drawing::student_plot(rect, w) }
    }
    fn answers(&self) -> Value {
        let p = &self.plan;
        let crit = p.critical_deg();
        let rays: Vec<Value> = p
            .rays
            .iter()
            .map(|r| {
                let mut m = Map::new();
                m.insert("ray".into(), json!(r.letter));
                m.insert("angle_of_incidence_deg".into(), json!(r.incidence_deg + 0.0));
                m.insert("outcome".into(), json!(r.outcome_word()));
                m.insert("refraction_angle_deg".into(), r.refraction_deg.map_or(Value::Null, |v| json!(v)));
                if let Some(v) = r.reflection_deg {
                    m.insert("reflection_angle_deg".into(), json!(v));
                }
                m.insert("tolerance_deg".into(), json!(r.tolerance.total_deg));
                m.insert(
                    "tolerance_parts_deg".into(),
                    json!({
                        "protractor_reading": r.tolerance.reading_deg,
                        "line_drawn": r.tolerance.line_deg,
                        "aiming": r.tolerance.aim_deg,
                        "dr_di": r.tolerance.gain,
                    }),
                );
                m.insert("sin_i".into(), json!(r.sin_i()));
                m.insert("sin_r".into(), r.sin_r().map_or(Value::Null, |v| json!(v)));
                m.insert("graded".into(), json!(r.graded()));
                if let Err(e) = r.refraction_deg {
                    let why = if r.outcome == RayOutcome::TotalReflection {
                        "the ray is totally reflected at the flat face"
                    } else {
                        e.words()
                    };
                    m.insert("not_defined".into(), json!({ "refraction_angle_deg": why }));
                }
                let events: Vec<Value> = r
                    .trace
                    .events
                    .iter()
                    .map(|e| {
                        json!({
                            "face": match e.face {
                                crate::optics::Boundary::Entry => "flat",
                                crate::optics::Boundary::Exit => "curved",
                                _ => "edge",
                            },
                            "event": match e.kind {
                                EventKind::Enter => "enters",
                                EventKind::Leave => "leaves",
                                EventKind::TotalReflection => "total-internal-reflection",
                            },
                            "point_mm": [e.at.x + 0.0, e.at.y + 0.0],
                            "incidence_deg": e.incidence_rad().to_degrees(),
                        })
                    })
                    .collect();
                m.insert("events".into(), Value::Array(events));
                Value::Object(m)
            })
            .collect();
        json!({
            "enter": p.setup.side_word(),
            "radius_mm": p.setup.radius_mm,
            "protractor_radius_mm": p.setup.scale_radius_mm,
            "critical_angle_deg": crit,
            "index_from_critical_angle": 1.0 / crit.to_radians().sin(),
            "rays": rays,
        })
    }
    fn summary_rows(&self) -> Vec<SummaryRow> {
        let crit = self.plan.critical_deg();
        self.plan
            .rays
            .iter()
            .map(|r| {
                vec![
                    ("ray", r.letter.clone()),
                    ("angle_of_incidence_deg", format!("{:.3}", r.incidence_deg + 0.0)),
                    ("outcome", r.outcome_word().to_string()),
                    ("refraction_angle_deg", r.refraction_deg.map(|v| format!("{v:.3}")).unwrap_or_default()),
                    ("tolerance_deg", format!("{:.3}", r.tolerance.total_deg)),
                    ("critical_angle_deg", format!("{crit:.3}")),
                    ("graded", r.graded().to_string()),
                ]
            })
            .collect()
    }
    fn summary_cells(&self, w: &Words) -> Vec<[String; 5]> {
        self.plan
            .rays
            .iter()
            .map(|r| {
                [
                    r.letter.clone(),
                    angle(r.incidence_deg),
                    with_range(r, w, false),
                    format!("n {}", fmt_index(self.plan.setup.index)),
                    format!("θc {}°", fmt1(self.plan.critical_deg())),
                ]
            })
            .collect()
    }
    fn report(&self) -> String {
        let p = &self.plan;
        let mut s = String::new();
        let _ = writeln!(
            s,
            "  half-disc of radius {} mm, n = {}, light enters the {} face; critical angle {:.2}°",
            p.setup.radius_mm,
            fmt_index(p.setup.index),
            p.setup.side_word(),
            p.critical_deg()
        );
        let _ =
            writeln!(s, "  {:<3}  {:>7}  {:<26} {:>9} {:>7}  graded", "ray", "i °", "outcome", "r °", "± °");
        for r in &p.rays {
            let _ = writeln!(
                s,
                "  {:<3}  {:>7}  {:<26} {:>9} {:>7}  {}",
                r.letter,
                format!("{:.1}", r.incidence_deg + 0.0),
                r.outcome_word(),
                r.refraction_deg.map_or("-".to_string(), |v| format!("{v:.2}")),
                format!("{:.1}", r.tolerance.total_deg),
                if r.graded() { "yes" } else { "no" }
            );
        }
        s
    }
}
