//! The prism sheets' optics: a guide ray into a prism's side (deviation,
//! minimum deviation, limiting incidence) or into a right-angle prism's side or
//! base (turned through 90° or 180° by total internal reflection).

use std::fmt::Write;

use serde_json::{Value, json};

use super::angled::{AngleLimit, AngleRules, AngledPlan, AngledSetup, Expected, spread_in_band};
use super::angled_view::{self as av, angle, with_range};
use super::block::angle_warnings;
use super::field::{Bound, FieldValue, SheetField};
use super::{
    Choice, Detail, Enter, Kind, Prepared, Setup, SheetKind, SheetPlan, SheetSpec, SheetView, SummaryRow,
};
use crate::draw::{Drawing, Words};
use crate::geom::{Placement, Point, Vec2};
use crate::kit::{Kit, KitError, SheetEntry};
use crate::optics::{Piece, Prism, PrismFace};
use crate::paper::PaperSpec;
use crate::plan::fmt_index;
use crate::plan::scan::{Band, grid_values};
use crate::scene::{Item, Rect};

/// Length of the printed guide line before the entry point, mm.
pub const LEAD_MM: f64 = 50.0;
/// Length of the emergent ray a student draws, mm (common practice, no source).
pub const OUT_MM: f64 = 45.0;

/// Which face the light enters.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PrismEntry {
    /// In at one equal face (side A), out at the other.
    Side,
    /// In at the base of a right-angle prism, a quarter of the base from one end.
    Base,
}

impl PrismEntry {
    /// The kit word.
    pub fn as_str(self) -> &'static str {
        match self {
            PrismEntry::Side => "side",
            PrismEntry::Base => "base",
        }
    }
}

/// Outward unit normal of the edge from `a` to `b` of a counterclockwise outline.
fn outward(a: Point, b: Point) -> Vec2 {
    let v = b - a;
    Vec2::new(v.y, -v.x).normalized().unwrap_or(Vec2::new(-1.0, 0.0))
}

/// A prism on the sheet. Side entry: the guide ray meets the middle of side A;
/// a positive angle of incidence puts the incoming ray on the base side of the
/// normal (the textbook drawing, where the light bends toward the base), and
/// the emergence angle and deviation are positive toward the base too. A prism
/// other than a right-angle one stands on its base (apex up); a right-angle
/// prism is turned so that the face the light enters is upright with the light
/// coming from the left. Base entry (right-angle prisms): the ray meets the
/// base a quarter of its length from the end nearer side A; positive angles
/// lean toward that end.
pub fn setup(prism: &Prism, entry: PrismEntry) -> AngledSetup<PrismFace> {
    let [apex, left, right] = prism.corners();
    let base_mid = Point::new(0.0, 0.0);
    let (face, point, normal, toward, expected) = match entry {
        PrismEntry::Side => {
            let expected = if prism.is_right_angle() {
                Expected::Turn { reflect_at: vec![PrismFace::Base], exit: PrismFace::SideB }
            } else {
                Expected::Refract { exit: PrismFace::SideB }
            };
            (PrismFace::SideA, apex + (left - apex) * 0.5, outward(apex, left), base_mid, expected)
        }
        PrismEntry::Base => (
            PrismFace::Base,
            left + (right - left) * 0.25,
            outward(left, right),
            left,
            Expected::Turn { reflect_at: vec![PrismFace::SideA, PrismFace::SideB], exit: PrismFace::Base },
        ),
    };
    // Right-angle prisms: turn the entry face upright, the light arriving from the left.
    let place = if prism.is_right_angle() {
        let turn = Vec2::new(-1.0, 0.0).angle_rad() - normal.angle_rad();
        let r = Placement::new(turn, Vec2::new(0.0, 0.0));
        let p = r.apply(point);
        Placement::new(turn, Vec2::new(-p.x, -p.y))
    } else {
        Placement::translation(Vec2::new(-point.x, -point.y))
    };
    let (point, normal, toward) = (place.apply(point), place.apply_vec(normal), place.apply(toward));
    // The sense that turns the outward normal toward `toward` makes the incoming
    // ray's side positive.
    let sense = if normal.cross(toward - point) >= 0.0 { 1.0 } else { -1.0 };
    AngledSetup {
        shape: prism.shape().placed(&place),
        index: prism.index,
        entry_face: face,
        entry_point: point,
        outward: normal,
        sense,
        toward: Some(toward),
        expected,
        lead_mm: LEAD_MM,
        out_mm: OUT_MM,
        plots_deviation: true,
    }
}

/// Why a prism formula has no value.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum NoValue {
    /// n·sin(A/2) > 1: no ray passes symmetrically.
    NoSymmetricPassage,
    /// A > 2θc: every ray that enters one side is totally reflected at the other.
    ApexBeyondTwiceCritical,
}

impl NoValue {
    /// Printed words, in `w`.
    pub fn printed(self, w: &Words) -> &str {
        match self {
            NoValue::NoSymmetricPassage => w.say("prism_no_symmetric"),
            NoValue::ApexBeyondTwiceCritical => w.say("prism_apex_too_wide"),
        }
    }

    /// Plain words.
    pub fn words(self) -> &'static str {
        match self {
            NoValue::NoSymmetricPassage => "n·sin(A/2) exceeds 1, so no ray crosses the prism symmetrically",
            NoValue::ApexBeyondTwiceCritical => {
                "the apex angle exceeds twice the critical angle, so no ray passes from one side to the other"
            }
        }
    }
}

/// Minimum deviation and the incidence that gives it, degrees:
/// i = asin(n·sin(A/2)), δmin = 2i − A (DESIGN.md: n = sin((A + δmin)/2)/sin(A/2)).
pub fn minimum_deviation_deg(prism: &Prism) -> Result<(f64, f64), NoValue> {
    if prism.apex_rad > 2.0 * (1.0 / prism.index).asin() {
        return Err(NoValue::ApexBeyondTwiceCritical);
    }
    let s = prism.index * (prism.apex_rad / 2.0).sin();
    if s > 1.0 {
        return Err(NoValue::NoSymmetricPassage);
    }
    let i = s.asin();
    Ok(((2.0 * i - prism.apex_rad).to_degrees(), i.to_degrees()))
}

/// Limiting incidence, degrees: below asin(n·sin(A − θc)) the ray is totally
/// reflected at the second side (DESIGN.md). Negative when rays from the apex
/// side of the normal still pass.
pub fn limiting_incidence_deg(prism: &Prism) -> Result<f64, NoValue> {
    let crit = (1.0 / prism.index).asin();
    if prism.apex_rad > 2.0 * crit {
        return Err(NoValue::ApexBeyondTwiceCritical);
    }
    Ok((prism.index * (prism.apex_rad - crit).sin()).clamp(-1.0, 1.0).asin().to_degrees())
}

/// The prism kind.
pub struct PrismKind;
/// The prism kind, for the kind list.
pub static KIND: PrismKind = PrismKind;

/// Step of the angles class variants are drawn from, degrees.
const STEP_DEG: f64 = 1.0;

impl Kind for PrismKind {
    fn word(&self) -> &'static str {
        "prism"
    }
    fn title(&self) -> &'static str {
        "Deviation by a prism"
    }
    fn fields(&self) -> &'static [SheetField] {
        &[
            SheetField {
                name: "enter",
                about: "Where the light enters: \"side\" (one of the equal faces) or \"base\" (the hypotenuse of a right-angle prism, which turns the light by total internal reflection).",
                value: FieldValue::Word { choices: &["side", "base"], default: "side" },
            },
            SheetField {
                name: "angles_deg",
                about: "Fixed signed angles of incidence from the entry face's normal (positive toward the base). Default: up to four on a 5° grid either side of minimum deviation, or normal incidence for a turn; chosen for each group of a class set.",
                value: FieldValue::Numbers {
                    unit: "deg",
                    min: Bound::Incl(-89.9),
                    max: Bound::Incl(89.9),
                    most: 9,
                },
            },
        ]
    }
    fn fits(&self) -> &'static str {
        "a prism (enter = \"base\": a right-angle prism)"
    }
    fn check(&self, s: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
        let kp = &kit.pieces[s.piece];
        let Piece::Prism(prism) = kp.piece else {
            return Err(s.kind.at.error(
                format!("a prism sheet needs a prism; piece `{}` is a {}", kp.id, kp.piece.shape_word()),
                "give a piece with shape = \"prism\", or choose another kind of sheet for this piece",
            ));
        };
        let enter = match s.word("enter")? {
            None => Enter::Side,
            Some(w) => match w.value.as_str() {
                "side" => Enter::Side,
                "base" if prism.is_right_angle() => Enter::Base,
                "base" => {
                    return Err(w.at.error(
                        format!(
                            "light enters the base only on a right-angle prism; piece `{}` has a {}° apex",
                            kp.id,
                            prism.apex_rad.to_degrees()
                        ),
                        "use enter = \"side\", or a prism with apex_deg = 90",
                    ));
                }
                other => {
                    return Err(w.at.error(
                        format!("\"{other}\" is not a face a prism sheet enters"),
                        "give \"side\" (in at one equal face) or \"base\" (right-angle prisms)",
                    ));
                }
            },
        };
        let angles = av::check_angles(s, -89.9, 89.9)?;
        Ok(SheetSpec::angled(s, SheetKind::Prism, enter, angles))
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
        let Piece::Prism(prism) = kit.pieces[spec.piece].piece else {
            unreachable!("a checked prism sheet's piece is a prism")
        };
        let entry = if spec.enter == Enter::Base { PrismEntry::Base } else { PrismEntry::Side };
        let rules = AngleRules::for_ray_width(kit.ray_box.ray_width_mm);
        let s = setup(&prism, entry);
        let prefer = match (&s.expected, minimum_deviation_deg(&prism)) {
            (Expected::Refract { .. }, Ok((_, i))) => i,
            _ => 0.0,
        };
        // A turning sheet is about the turn at near-normal incidence (a single
        // reflection's turn changes by twice any tilt), so its variants stay
        // within 8° of the normal; a deviation sheet takes any angle.
        let (from, to) =
            if matches!(s.expected, Expected::Turn { .. }) { (-8.0, 8.0) } else { (-89.0, 89.0) };
        let band = s.band(&rules, from, to, prefer, false);
        Box::new(PrismPrepared { kit, spec, prism, entry, rules, band })
    }
}

struct PrismPrepared<'a> {
    kit: &'a Kit,
    spec: &'a SheetSpec,
    prism: Prism,
    entry: PrismEntry,
    rules: AngleRules,
    band: Option<Band<AngleLimit>>,
}

impl PrismPrepared<'_> {
    fn turns(&self) -> bool {
        self.prism.is_right_angle()
    }

    /// Default angles: for a turn, normal incidence (or the band's middle); for
    /// deviation, up to four on a 5° grid, two each side of the minimum-deviation incidence.
    fn defaults(&self, band: Option<&Band<AngleLimit>>) -> Vec<f64> {
        if self.turns() {
            return match band {
                Some(b) if !b.contains(0.0) => vec![(b.min + b.max) / 2.0],
                _ => vec![0.0],
            };
        }
        let Some(b) = band else { return vec![30.0, 40.0, 50.0, 60.0] };
        let grid = grid_values(b.min, b.max, 5.0);
        let imin = minimum_deviation_deg(&self.prism).map(|(_, i)| i).unwrap_or((b.min + b.max) / 2.0);
        let below: Vec<f64> = grid.iter().copied().filter(|v| *v < imin).collect();
        let above: Vec<f64> = grid.iter().copied().filter(|v| *v > imin).collect();
        let mut out: Vec<f64> = below.iter().rev().take(2).chain(above.iter().take(2)).copied().collect();
        if out.len() < 3 {
            out = spread_in_band(band, &[0.1, 0.4, 0.7, 0.95], STEP_DEG);
        }
        out.sort_by(f64::total_cmp);
        out
    }
}

impl Prepared for PrismPrepared<'_> {
    fn choices(&self) -> Vec<Choice> {
        if self.spec.angles_deg.is_some() {
            return Vec::new();
        }
        let Some(b) = &self.band else { return Vec::new() };
        let grid = grid_values(b.min, b.max, STEP_DEG);
        let enter = self.spec.enter;
        if self.turns() {
            return grid.into_iter().map(|a| Choice { enter, values: vec![a] }).collect();
        }
        // Three angles: one at least 4° below the minimum-deviation incidence,
        // one within 3° of it, one at least 4° above, so every group can find
        // the minimum between its rays.
        let imin = minimum_deviation_deg(&self.prism).map(|(_, i)| i).unwrap_or((b.min + b.max) / 2.0);
        let mut out = Vec::new();
        for lo in grid.iter().filter(|v| **v <= imin - 4.0) {
            for mid in grid.iter().filter(|v| (**v - imin).abs() <= 3.0) {
                for hi in grid.iter().filter(|v| **v >= imin + 4.0) {
                    out.push(Choice { enter, values: vec![*lo, *mid, *hi] });
                }
            }
        }
        out
    }

    fn notes(&self, groups: usize) -> Vec<String> {
        av::angle_notes(self.spec.number, self.spec.angles_deg.is_some(), self.choices().len(), groups)
    }

    fn plan(&self, choice: Option<&Choice>) -> SheetPlan {
        let angles = choice.map(|c| c.values.clone()).or_else(|| self.spec.angles_deg.clone());
        let plan = AngledPlan::in_band(
            setup(&self.prism, self.entry),
            self.rules,
            self.band,
            angles.as_deref(),
            |b| self.defaults(b),
        );
        let kp = &self.kit.pieces[self.spec.piece];
        let mut warnings = angle_warnings(&plan);
        if self.turns() && self.prism.index <= 2f64.sqrt() {
            warnings.push(format!(
                "n = {} is not above √2: the long face cannot reflect the ray totally at 45°",
                fmt_index(self.prism.index)
            ));
        }
        let (lo, hi) = super::angled_drawing::extent(&plan);
        let view = PrismPlan {
            prism: self.prism,
            entry: self.entry,
            minimum_deviation: minimum_deviation_deg(&self.prism),
            limiting_incidence: limiting_incidence_deg(&self.prism),
            plan,
            setup: Setup { x_min: lo.x, x_max: hi.x, y_min: lo.y, y_max: hi.y },
        };
        SheetPlan {
            number: self.spec.number,
            kind: SheetKind::Prism,
            piece_id: kp.id.clone(),
            piece_label: kp.label.clone(),
            enter: self.spec.enter,
            index: self.prism.index,
            wavelength_nm: self.kit.ray_box.wavelength_nm,
            group: None,
            variant: None,
            warnings,
            detail: Detail::Prism(Box::new(view)),
            colours: None,
            source: None,
        }
    }
}

/// A planned prism sheet.
#[derive(Clone, Debug, PartialEq)]
pub struct PrismPlan {
    /// The prism.
    pub prism: Prism,
    /// Where the light enters.
    pub entry: PrismEntry,
    /// (δmin, incidence giving it), degrees, or why there is none.
    pub minimum_deviation: Result<(f64, f64), NoValue>,
    /// The limiting incidence, degrees, or why there is none.
    pub limiting_incidence: Result<f64, NoValue>,
    /// Its rays and band.
    pub plan: AngledPlan<PrismFace>,
    /// What must be on paper.
    pub setup: Setup,
}

impl PrismPlan {
    fn turns(&self) -> bool {
        matches!(self.plan.setup.expected, Expected::Turn { .. })
    }
}

impl SheetView for PrismPlan {
    fn class_curve(&self) -> Option<crate::sheets::ClassCurve> {
        // The deviation the key plots against the angle of incidence (turning
        // prisms turn by a fixed angle: nothing to plot).
        let points: Vec<(f64, f64)> =
            self.plan.deviation_curve.iter().map(|&(i, d)| (i.abs(), d.abs())).collect();
        (!self.turns() && points.len() > 1).then_some(crate::sheets::ClassCurve {
            x: "angle_of_incidence_deg",
            y: "deviation_deg",
            points,
            paraxial: None,
        })
    }
    fn measured_at_index(&self, index: f64) -> Vec<crate::sheets::Measured> {
        PrismPlan { plan: self.plan.with_index(index), ..self.clone() }.measured()
    }

    fn colour_paths(&self, index: f64) -> Option<Vec<(String, Vec<crate::geom::Point>)>> {
        Some(crate::sheets::angled_drawing::ray_paths(&self.plan.with_index(index)))
    }
    fn measured(&self) -> Vec<crate::sheets::Measured> {
        let p = &self.plan;
        let mut out = Vec::new();
        for r in p.rays.iter().filter(|r| av::graded(r)) {
            if self.turns() {
                let want = match &r.exit {
                    Ok((f, _)) => crate::sheets::Want::Observation(av::FaceName::name(*f)),
                    Err(_) => crate::sheets::Want::Observation(av::outcome(p, r)),
                };
                out.push(crate::sheets::Measured {
                    ray: r.letter.clone(),
                    quantity: "exit_face",
                    unit: "",
                    want,
                });
            } else {
                out.push(av::measured_one(
                    p,
                    r,
                    "emergence_angle_deg",
                    "deg",
                    &r.emergence_deg,
                    r.tolerance_deg,
                ));
            }
            out.push(av::measured_one(p, r, "deviation_deg", "deg", &r.deviation_deg, r.tolerance_deg));
        }
        out
    }
    fn extent(&self) -> Setup {
        self.setup
    }
    fn student(&self, bounds: Rect, w: &Words) -> Drawing {
        av::student_drawing(&self.plan, bounds, w)
    }
    fn key(&self, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item> {
        super::angled_drawing::key(&self.plan, &bounds, &mut base.placer, w)
    }
    fn template(&self) -> &'static str {
        if self.turns() { "prism-turn.toml" } else { "prism.toml" }
    }
    fn entry_words(&self, w: &Words) -> String {
        match self.entry {
            PrismEntry::Side => w.say("entry_side"),
            PrismEntry::Base => w.say("entry_base"),
        }
        .to_string()
    }
    fn table_widths(&self) -> Vec<f64> {
        vec![0.09, 0.21, 0.35, 0.35]
    }
    fn table_rows(&self, key: bool, w: &Words) -> Vec<Vec<String>> {
        self.plan
            .rays
            .iter()
            .map(|r| {
                let mut row = vec![r.letter.clone(), angle(r.incidence_deg)];
                if key {
                    if self.turns() {
                        let face = match &r.exit {
                            Ok((f, _)) => av::FaceName::words(*f, w).to_string(),
                            Err(e) => av::undefined_words(*e, w).to_string(),
                        };
                        row.push(face);
                    } else {
                        row.push(with_range(&r.emergence_deg, r.tolerance_deg, "°", w));
                    }
                    row.push(with_range(&r.deviation_deg, r.tolerance_deg, "°", w));
                }
                row
            })
            .collect()
    }
    fn key_lines(&self, w: &Words) -> Vec<String> {
        let p = &self.prism;
        let a = p.apex_rad.to_degrees();
        let crit = (1.0 / p.index).asin().to_degrees();
        let mut v = Vec::new();
        if self.turns() {
            v.push(
                w.fill("prism_turn", &[("index", &fmt_index(p.index)), ("critical", &format!("{crit:.1}"))]),
            );
            if self.entry == PrismEntry::Base {
                v.push(w.say("prism_comes_back").to_string());
            }
        } else {
            v.push(w.fill(
                "prism_deviation",
                &[
                    ("apex", &format!("{a:.1}")),
                    ("index", &fmt_index(p.index)),
                    ("critical", &format!("{crit:.1}")),
                ],
            ));
            match self.minimum_deviation {
                Ok((d, i)) => v.push(w.fill(
                    "prism_minimum",
                    &[
                        ("deviation", &format!("{d:.1}")),
                        ("incidence", &format!("{i:.1}")),
                        (
                            "index",
                            &format!(
                                "{:.3}",
                                ((p.apex_rad + d.to_radians()) / 2.0).sin() / (p.apex_rad / 2.0).sin()
                            ),
                        ),
                    ],
                )),
                Err(e) => v.push(w.fill("prism_no_minimum", &[("why", e.printed(w))])),
            }
            match self.limiting_incidence {
                Ok(l) => v.push(w.fill("prism_limiting", &[("incidence", &format!("{l:.1}"))])),
                Err(e) => v.push(w.fill("prism_no_limiting", &[("why", e.printed(w))])),
            }
        }
        if let (Some(band), Some((lo, hi))) = (&self.plan.band, self.plan.band_words_in(w)) {
            v.push(av::band_line(band, &lo, &hi, w));
        }
        let sign = match self.entry {
            PrismEntry::Side => w.say("prism_sign_side"),
            PrismEntry::Base => w.say("prism_sign_base"),
        };
        v.push(w.fill(
            "prism_accept",
            &[("slip", &format!("{:.1}", self.plan.rules.across_error_mm())), ("sign", sign)],
        ));
        v
    }
    fn key_plot(&self, rect: Rect, w: &Words) -> Vec<Item> {
        super::angled_drawing::deviation_plot(&self.plan, rect, w)
    }
    fn student_note(&self, w: &Words) -> Option<String> {
        if self.turns() {
            Some(w.say("note_turned").to_string())
        } else {
            Some(w.say("note_smallest_deviation").to_string())
        }
    }
    fn answers(&self) -> Value {
        let mut m = serde_json::Map::new();
        m.insert("apex_deg".into(), json!(self.prism.apex_rad.to_degrees()));
        let mut reasons = serde_json::Map::new();
        match self.minimum_deviation {
            Ok((d, i)) => {
                m.insert("minimum_deviation_deg".into(), json!(d));
                m.insert("minimum_deviation_incidence_deg".into(), json!(i));
            }
            Err(e) => {
                m.insert("minimum_deviation_deg".into(), Value::Null);
                m.insert("minimum_deviation_incidence_deg".into(), Value::Null);
                reasons.insert("minimum_deviation_deg".into(), json!(e.words()));
                reasons.insert("minimum_deviation_incidence_deg".into(), json!(e.words()));
            }
        }
        match self.limiting_incidence {
            Ok(l) => {
                m.insert("limiting_incidence_deg".into(), json!(l));
            }
            Err(e) => {
                m.insert("limiting_incidence_deg".into(), Value::Null);
                reasons.insert("limiting_incidence_deg".into(), json!(e.words()));
            }
        }
        if !reasons.is_empty() {
            m.insert("not_defined".into(), Value::Object(reasons));
        }
        m.insert("safe_band_deg".into(), av::band_json(&self.plan));
        m.insert("rays".into(), Value::Array(av::rays_json(&self.plan, false)));
        Value::Object(m)
    }
    fn summary_rows(&self) -> Vec<SummaryRow> {
        av::summary_rows(&self.plan, false)
    }
    fn summary_cells(&self, w: &Words) -> Vec<[String; 5]> {
        let facts = match (self.turns(), self.minimum_deviation) {
            (true, _) => (
                w.fill("summary_apex", &[("apex", &format!("{:.0}", self.prism.apex_rad.to_degrees()))]),
                format!("n {}", fmt_index(self.prism.index)),
            ),
            (false, Ok((d, i))) => {
                (format!("δmin {d:.1}°"), w.fill("summary_at", &[("incidence", &format!("{i:.1}"))]))
            }
            (false, Err(_)) => (w.say("summary_no_minimum").to_string(), String::new()),
        };
        self.plan
            .rays
            .iter()
            .map(|r| {
                [
                    r.letter.clone(),
                    angle(r.incidence_deg),
                    format!("δ {}", with_range(&r.deviation_deg, r.tolerance_deg, "°", w)),
                    facts.0.clone(),
                    facts.1.clone(),
                ]
            })
            .collect()
    }
    fn report(&self) -> String {
        let mut s = String::new();
        let p = &self.prism;
        let _ = writeln!(
            s,
            "  prism: apex {:.1}°, sides {} mm, base {:.1} mm, n = {}, light enters the {}",
            p.apex_rad.to_degrees(),
            p.side_mm,
            p.base_mm(),
            fmt_index(p.index),
            self.entry.as_str()
        );
        let _ = match self.minimum_deviation {
            Ok((d, i)) => writeln!(s, "  minimum deviation {d:.2}° at incidence {i:.2}°"),
            Err(e) => writeln!(s, "  minimum deviation: none ({})", e.words()),
        };
        let _ = match self.limiting_incidence {
            Ok(l) => writeln!(s, "  limiting incidence {l:.2}°"),
            Err(e) => writeln!(s, "  limiting incidence: none ({})", e.words()),
        };
        s.push_str(&av::report(&self.plan, false));
        s
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use crate::optics::EventKind;
    use crate::sheets::angled::AngleRules;

    fn rules() -> AngleRules {
        AngleRules::for_ray_width(2.0)
    }

    #[test]
    fn deviation_is_i_plus_e_minus_a_with_signed_angles() {
        // δ = i + e − A (DESIGN.md, triangular prism).
        let p = Prism::new(60.0, 50.0, 1.49).unwrap();
        let s = setup(&p, PrismEntry::Side);
        for i in [30.0, 40.0, 48.0, 55.0, 65.0] {
            let r = s.answer(&rules(), i, "A".into(), true);
            assert!(r.path_ok, "i = {i}: {:?}", r.trace.events);
            let (e, d) = (r.emergence_deg.unwrap(), r.deviation_deg.unwrap());
            assert_close(d, i + e - 60.0, 1e-9);
            assert!(d > 0.0, "the light bends toward the base");
            // Snell's law at the entry side with the angle of refraction signed alike.
            assert_close(r.refraction_deg.unwrap().to_radians().sin() * 1.49, i.to_radians().sin(), 1e-12);
        }
    }

    #[test]
    fn a_positive_angle_puts_the_incoming_ray_on_the_base_side_of_the_normal() {
        // The textbook sign (issue 7): positive when the incoming ray lies on the base side.
        let p = Prism::new(60.0, 50.0, 1.49).unwrap();
        let s = setup(&p, PrismEntry::Side);
        let base_mid = s.toward.unwrap();
        let side = |q: Point| s.outward.cross(q - s.entry_point).signum();
        assert_eq!(side(s.guide(30.0).origin), side(base_mid));
        assert_eq!(side(s.guide(-30.0).origin), -side(base_mid));
    }

    #[test]
    fn traced_minimum_deviation_matches_the_formula() {
        // Minimum deviation at symmetric passage: n = sin((A + δmin)/2)/sin(A/2) (DESIGN.md).
        for (apex, n) in [(60.0, 1.49), (45.0, 1.586), (30.0, 1.52)] {
            let p = Prism::new(apex, 50.0, n).unwrap();
            let s = setup(&p, PrismEntry::Side);
            let (dmin, imin) = minimum_deviation_deg(&p).unwrap();
            assert_close(
                ((apex + dmin) / 2.0f64).to_radians().sin() / (apex / 2.0f64).to_radians().sin(),
                n,
                1e-12,
            );
            // Golden-section search on the traced deviation.
            let dev = |i: f64| s.answer(&rules(), i, "A".into(), true).deviation_deg.unwrap();
            let (mut a, mut b) = (imin - 15.0, imin + 15.0);
            let g = (5f64.sqrt() - 1.0) / 2.0;
            for _ in 0..80 {
                let (c, d) = (b - g * (b - a), a + g * (b - a));
                if dev(c) < dev(d) { b = d } else { a = c }
            }
            let i_found = (a + b) / 2.0;
            assert_close(dev(i_found), dmin, 1e-9);
            assert_close(i_found, imin, 1e-4);
            // At minimum deviation the passage is symmetric: e = i.
            let r = s.answer(&rules(), imin, "A".into(), true);
            assert_close(r.emergence_deg.unwrap(), imin, 1e-9);
        }
    }

    #[test]
    fn limiting_incidence_separates_refraction_from_total_reflection() {
        // asin(n·sin(A − θc)) (DESIGN.md): 60° acrylic prism, n = 1.49.
        let p = Prism::new(60.0, 50.0, 1.49).unwrap();
        let s = setup(&p, PrismEntry::Side);
        let lim = limiting_incidence_deg(&p).unwrap();
        assert_close(
            lim,
            (1.49 * (60f64.to_radians() - (1.0f64 / 1.49).asin()).sin()).asin().to_degrees(),
            1e-12,
        );
        let above = s.answer(&rules(), lim + 0.01, "A".into(), true);
        let below = s.answer(&rules(), lim - 0.01, "A".into(), true);
        assert!(above.path_ok);
        assert!(!below.path_ok);
        assert_eq!(below.trace.events[1].kind, EventKind::TotalReflection);
        assert_eq!(below.trace.events[1].face, PrismFace::SideB);
    }

    #[test]
    fn right_angle_prism_turns_through_90_and_180_degrees() {
        // DESIGN.md, sheet 5: in at a leg → 90°; in at the hypotenuse → 180°, for n > √2.
        let p = Prism::new(90.0, 40.0, 1.49).unwrap();
        let side = setup(&p, PrismEntry::Side);
        let r = side.answer(&rules(), 0.0, "A".into(), true);
        assert!(r.path_ok);
        assert_close(r.deviation_deg.unwrap(), 90.0, 1e-9);
        // The face the light enters is upright and the ray runs left to right.
        assert_close(side.guide(0.0).dir.x, 1.0, 1e-12);
        let base = setup(&p, PrismEntry::Base);
        let r = base.answer(&rules(), 0.0, "A".into(), true);
        assert!(r.path_ok, "{:?}", r.trace.events);
        assert_close(r.deviation_deg.unwrap(), 180.0, 1e-9);
        assert_eq!(r.trace.reflections(), 2);
        // Below n = √2 the hypotenuse no longer reflects totally at 45°.
        let weak = Prism::new(90.0, 40.0, 1.40).unwrap();
        let r = setup(&weak, PrismEntry::Side).answer(&rules(), 0.0, "A".into(), true);
        assert!(!r.path_ok);
        assert_eq!(r.trace.reflections(), 0);
        // A right-angle prism's apex exceeds twice the critical angle (2 × 42.2°).
        assert_eq!(limiting_incidence_deg(&p), Err(NoValue::ApexBeyondTwiceCritical));
        assert_eq!(minimum_deviation_deg(&p), Err(NoValue::ApexBeyondTwiceCritical));
    }

    #[test]
    fn the_180_degree_turn_holds_within_about_four_degrees_for_acrylic() {
        // DESIGN.md: "the 180° turn holds only within about ±4° of normal incidence for n = 1.49".
        let p = Prism::new(90.0, 40.0, 1.49).unwrap();
        let base = setup(&p, PrismEntry::Base);
        let band = base.band(&rules(), -30.0, 30.0, 0.0, false).unwrap();
        // The turn itself holds to asin(n·sin(45° − θc)) = 4.24°; the band keeps 0.5° inside that.
        let edge = (1.49 * (45f64.to_radians() - (1.0f64 / 1.49).asin()).sin()).asin().to_degrees();
        assert_close(edge, 4.24, 0.01);
        assert!(band.max < edge && band.max > edge - 1.0, "{band:?}");
        assert!(band.min > -edge && band.min < -edge + 1.0, "{band:?}");
    }
}
