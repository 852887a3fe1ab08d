//! Spectrum sheets: one white guide ray into a triangular prism's side, spread
//! into the ray box's colours. The key draws every colour's path, gives each
//! colour's angle of emergence and deviation (δ = i + e − A at that colour's
//! index), the angular spread between the extreme colours and their
//! separation on a screen line drawn beyond the prism, at a distance chosen so
//! the extreme colours land at least two ray widths apart where the paper
//! allows; it says when they cannot be told apart on paper.

use std::fmt::Write;

use serde_json::{Value, json};

use super::angled::{AngleLimit, AngleRules, AngledPlan, AngledRay, AngledSetup};
use super::angled_view::{self as av, angle, with_range};
use super::block::angle_warnings;
use super::colours::Light;
use super::field::{Bound, FieldValue, SheetField};
use super::prism::{PrismEntry, PrismPlan, limiting_incidence_deg, minimum_deviation_deg, setup};
use super::{
    Choice, Detail, Enter, Kind, Measured, Prepared, Setup, SheetKind, SheetPlan, SheetSpec, SheetView,
    SummaryRow, Want,
};
use crate::draw::colour::{ColourStyle, colour_styles};
use crate::draw::style::{LINE_DASH, THIN_W, VALUE_PT};
use crate::draw::{Drawing, Words, place_near};
use crate::geom::{Placement, Point, Vec2};
use crate::kit::{Kit, KitError, SheetEntry};
use crate::optics::{Piece, Prism, PrismFace};
use crate::paper::PaperSpec;
use crate::plan::fmt_index;
use crate::plan::scan::{Band, grid_values};
use crate::scene::{Item, Rect, Stroke};

/// The spectrum kind.
pub struct SpectrumKind;
/// The spectrum kind, for the kind list.
pub static KIND: SpectrumKind = SpectrumKind;

/// Class variants take angles on this grid, degrees, within this far of the
/// minimum-deviation incidence (our choice: the spread hardly changes there).
const STEP_DEG: f64 = 1.0;
const VARIANT_REACH_DEG: f64 = 8.0;
/// The screen never comes nearer the exit point than this, mm: beyond the
/// emergent ray a student draws (45 mm).
const SCREEN_MIN_MM: f64 = 60.0;
/// Steps the screen distance is tried in, mm.
const SCREEN_STEP_MM: f64 = 5.0;
/// Room kept round the setup inside the drawing window, mm.
const ROOM_MM: f64 = 12.0;

impl Kind for SpectrumKind {
    fn word(&self) -> &'static str {
        "spectrum"
    }
    fn title(&self) -> &'static str {
        "A prism's spectrum"
    }
    fn fields(&self) -> &'static [SheetField] {
        &[SheetField {
            name: "angles_deg",
            about: "The white ray's signed angle of incidence from the entry face's normal (positive toward the base): one angle. Default: on a 1° grid within 8° of minimum deviation at the ray box's wavelength, chosen for each group of a class set.",
            value: FieldValue::Numbers {
                unit: "deg",
                min: Bound::Incl(-89.9),
                max: Bound::Incl(89.9),
                most: 1,
            },
        }]
    }
    fn fits(&self) -> &'static str {
        "a prism with an apex below 90°, of a material with dispersion"
    }
    fn check(&self, s: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
        let kp = &kit.pieces[s.piece];
        let Piece::Prism(prism) = kp.piece else {
            return Err(s.kind.at.error(
                format!(
                    "a spectrum sheet needs a triangular prism; piece `{}` is a {}",
                    kp.id,
                    kp.piece.shape_word()
                ),
                "give a piece with shape = \"prism\", or choose another kind of sheet for this piece",
            ));
        };
        if prism.is_right_angle() {
            return Err(s.kind.at.error(
                format!(
                    "piece `{}` is a right-angle prism: its side reflects the ray totally, so no spectrum leaves it",
                    kp.id
                ),
                "use a prism with an apex below 90° (an equilateral prism: apex_deg = 60)",
            ));
        }
        let disperses = kit.materials.get(&kp.material).is_some_and(|m| m.dispersion().disperses());
        if !disperses {
            return Err(s.kind.at.error(
                format!(
                    "piece `{}` is made of `{}`, which has no dispersion (only `index`): a spectrum sheet needs n at every colour",
                    kp.id, kp.material
                ),
                format!(
                    "give [materials.{}] a sellmeier formula or a catalog material (`raysheet materials` lists them) instead of index",
                    kp.material
                ),
            ));
        }
        if kit.ray_box.colours.len() < 2 {
            return Err(s.kind.at.error(
                format!("the ray box lists {} colour(s); a spectrum sheet spreads at least two", kit.ray_box.colours.len()),
                "add colours = [ { name = \"red\", wavelength_nm = 656.3 }, { name = \"blue\", wavelength_nm = 486.1 } ] to [ray_box]",
            ));
        }
        let angles = av::check_angles(s, -89.9, 89.9)?;
        if let (Some(a), Some(list)) = (&angles, s.numbers("angles_deg")?)
            && a.len() > 1
        {
            return Err(list.at.error(
                format!("{} angles given; a spectrum sheet shows one white ray", a.len()),
                "give one angle, such as angles_deg = [50], or leave angles_deg out for the class variants",
            ));
        }
        let material = &kit.materials[&kp.material];
        let mut spec = SheetSpec::angled(s, SheetKind::Spectrum, Enter::Side, angles);
        spec.lights = kit
            .ray_box
            .colours
            .iter()
            .map(|c| Light {
                name: c.name.clone(),
                wavelength_nm: c.wavelength_nm,
                index: material.index_at(c.wavelength_nm),
            })
            .collect();
        Ok(spec)
    }
    fn takes_colours(&self) -> bool {
        true
    }
    fn prepare<'a>(&self, kit: &'a Kit, spec: &'a SheetSpec, paper: &'a PaperSpec) -> Box<dyn Prepared + 'a> {
        let Piece::Prism(prism) = kit.pieces[spec.piece].piece else {
            unreachable!("a checked spectrum sheet's piece is a prism")
        };
        let rules = AngleRules::for_ray_width(kit.ray_box.ray_width_mm);
        let s = setup(&prism, PrismEntry::Side);
        let prefer = minimum_deviation_deg(&prism).map_or(45.0, |(_, i)| i);
        let band = s.band(&rules, -89.0, 89.0, prefer, false);
        Box::new(SpectrumPrepared { kit, spec, paper, prism, rules, band, prefer })
    }
}

struct SpectrumPrepared<'a> {
    kit: &'a Kit,
    spec: &'a SheetSpec,
    paper: &'a PaperSpec,
    prism: Prism,
    rules: AngleRules,
    band: Option<Band<AngleLimit>>,
    prefer: f64,
}

impl SpectrumPrepared<'_> {
    /// The default angle: the whole 5° nearest the minimum-deviation incidence
    /// inside the band (the band's middle when none is).
    fn default_angle(&self, band: Option<&Band<AngleLimit>>) -> Vec<f64> {
        let Some(b) = band else { return vec![(self.prefer / 5.0).round() * 5.0] };
        let grid = grid_values(b.min, b.max, 5.0);
        let best =
            grid.iter().copied().min_by(|x, y| (x - self.prefer).abs().total_cmp(&(y - self.prefer).abs()));
        vec![best.unwrap_or((b.min + b.max) / 2.0)]
    }
}

impl Prepared for SpectrumPrepared<'_> {
    fn choices(&self) -> Vec<Choice> {
        if self.spec.angles_deg.is_some() {
            return Vec::new();
        }
        let Some(b) = &self.band else { return Vec::new() };
        grid_values(b.min, b.max, STEP_DEG)
            .into_iter()
            .filter(|a| (a - self.prefer).abs() <= VARIANT_REACH_DEG)
            .map(|a| Choice { enter: Enter::Side, values: vec![a] })
            .collect()
    }

    fn notes(&self, groups: usize) -> Vec<String> {
        av::angle_notes(self.spec.number, self.spec.angles_deg.is_some(), self.choices().len(), groups)
    }

    fn plan(&self, choice: Option<&Choice>) -> SheetPlan {
        let angles = choice.map(|c| c.values.clone()).or_else(|| self.spec.angles_deg.clone());
        let upright = setup(&self.prism, PrismEntry::Side);
        let plan = AngledPlan::in_band(upright.clone(), self.rules, self.band, angles.as_deref(), |b| {
            self.default_angle(b)
        });
        // Turn the prism about the entry point so the emergent white ray runs
        // along the page's long side: the screen can then stand furthest off.
        let tilt = plan
            .rays
            .first()
            .filter(|r| r.path_ok)
            .and_then(|r| r.trace.outgoing())
            .map(|o| -o.dir.angle_rad());
        let plan = match (tilt, plan.rays.first()) {
            (Some(t), Some(r)) if t.abs() > 1e-9 => {
                let angle = [r.incidence_deg];
                AngledPlan::in_band(turned(upright, t), self.rules, self.band, Some(&angle), |b| {
                    self.default_angle(b)
                })
            }
            _ => plan,
        };
        let kp = &self.kit.pieces[self.spec.piece];
        let warnings = angle_warnings(&plan);
        let (lo, hi) = super::angled_drawing::extent(&plan);
        let prism = PrismPlan {
            prism: self.prism,
            entry: PrismEntry::Side,
            minimum_deviation: minimum_deviation_deg(&self.prism),
            limiting_incidence: limiting_incidence_deg(&self.prism),
            plan,
            setup: Setup { x_min: lo.x, x_max: hi.x, y_min: lo.y, y_max: hi.y },
        };
        let view = SpectrumPlan::new(prism, &self.spec.lights, self.kit.ray_box.ray_width_mm, self.paper);
        SheetPlan {
            number: self.spec.number,
            kind: SheetKind::Spectrum,
            piece_id: kp.id.clone(),
            piece_label: kp.label.clone(),
            enter: Enter::Side,
            index: self.prism.index,
            wavelength_nm: self.kit.ray_box.wavelength_nm,
            group: None,
            variant: None,
            warnings,
            detail: Detail::Spectrum(Box::new(view)),
            colours: None,
            source: None,
        }
    }
}

/// One colour through the prism.
#[derive(Clone, Debug, PartialEq)]
pub struct SpectrumColour {
    /// The colour and the index it is traced at.
    pub light: Light,
    /// How the key draws it.
    pub style: ColourStyle,
    /// The guide ray traced at this colour's index.
    pub ray: AngledRay<PrismFace>,
    /// Where it meets the screen line, if it leaves the prism.
    pub on_screen: Option<Point>,
}

/// The screen line beyond the prism.
#[derive(Clone, Debug, PartialEq)]
pub struct Screen {
    /// Distance from the reference ray's exit point along that ray, mm.
    pub distance_mm: f64,
    /// Its ends.
    pub ends: (Point, Point),
    /// Whether the paper stopped the screen short of two ray widths' separation.
    pub paper_bound: bool,
}

/// A planned spectrum sheet.
#[derive(Clone, Debug, PartialEq)]
pub struct SpectrumPlan {
    /// The prism sheet at the ray box's own wavelength (the outline, the
    /// guide ray, the reference trace).
    pub prism: PrismPlan,
    /// Every colour, in the ray box's order.
    pub colours: Vec<SpectrumColour>,
    /// The screen, when the reference ray leaves the prism.
    pub screen: Option<Screen>,
    /// The ray box's ray width, mm.
    pub ray_width_mm: f64,
    /// What must be on paper.
    pub setup: Setup,
}

/// The setup turned by `rad` (counterclockwise) about the origin, where the
/// guide ray meets the prism: the same optics, drawn at another slant.
fn turned(s: AngledSetup<PrismFace>, rad: f64) -> AngledSetup<PrismFace> {
    let r = Placement::new(rad, Vec2::new(0.0, 0.0));
    AngledSetup {
        shape: s.shape.placed(&r),
        entry_point: r.apply(s.entry_point),
        outward: r.apply_vec(s.outward),
        toward: s.toward.map(|t| r.apply(t)),
        ..s
    }
}

/// Where the line from `p` along `d` meets the line through `q` normal to `n`.
fn meet(p: Point, d: Vec2, q: Point, n: Vec2) -> Option<Point> {
    let den = d.dot(n);
    (den.abs() > 1e-12).then(|| p + d * ((q - p).dot(n) / den))
}

impl SpectrumPlan {
    /// Traces every colour, then places the screen: the nearest distance (from
    /// 60 mm, in 5 mm steps) at which the extreme colours land two ray widths
    /// apart, as long as the setup still fits the paper's drawing window;
    /// else the furthest that fits.
    pub fn new(prism: PrismPlan, lights: &[Light], ray_width_mm: f64, paper: &PaperSpec) -> SpectrumPlan {
        let styles =
            colour_styles(&lights.iter().map(|l| (l.wavelength_nm, l.name.clone())).collect::<Vec<_>>());
        let reference = prism.plan.rays.first().cloned();
        let mut colours: Vec<SpectrumColour> = lights
            .iter()
            .zip(styles)
            .filter_map(|(l, style)| {
                let ray = prism.plan.with_index(l.index).rays.into_iter().next()?;
                Some(SpectrumColour { light: l.clone(), style, ray, on_screen: None })
            })
            .collect();
        let mut plan =
            SpectrumPlan { setup: prism.setup, prism, colours: Vec::new(), screen: None, ray_width_mm };
        let Some(out) = reference.filter(|r| r.path_ok).and_then(|r| r.trace.outgoing()) else {
            plan.colours = colours;
            return plan;
        };
        let page = paper.page_mm();
        let (win_w, win_h) = paper.drawing_window_mm(page);
        let mut chosen: Option<(f64, f64, Setup)> = None;
        let mut d = SCREEN_MIN_MM;
        loop {
            let at = out.origin + out.dir * d;
            let hits: Vec<Option<Point>> = colours
                .iter()
                .map(|c| c.ray.trace.outgoing().and_then(|o| meet(o.origin, o.dir, at, out.dir)))
                .collect();
            let sep = plan.extreme_separation(&colours, &hits);
            let half = (sep / 2.0 + 10.0).max(15.0);
            let across = out.dir.perp() * half;
            let s = plan.prism.setup;
            let pts = [at + across, at - across, at + out.dir * 6.0];
            let setup = Setup {
                x_min: pts.iter().map(|p| p.x).fold(s.x_min, f64::min),
                x_max: pts.iter().map(|p| p.x).fold(s.x_max, f64::max),
                y_min: pts.iter().map(|p| p.y).fold(s.y_min, f64::min),
                y_max: pts.iter().map(|p| p.y).fold(s.y_max, f64::max),
            };
            let fits = setup.length() + 2.0 * ROOM_MM <= win_w && setup.height() + 2.0 * ROOM_MM <= win_h;
            if !fits {
                break;
            }
            chosen = Some((d, sep, setup));
            if sep >= 2.0 * ray_width_mm || d > 2000.0 {
                break;
            }
            d += SCREEN_STEP_MM;
        }
        // A paper too small even for the nearest screen: the nearest, tiled.
        let (d, sep, setup) = chosen.unwrap_or_else(|| {
            let at = out.origin + out.dir * SCREEN_MIN_MM;
            let across = out.dir.perp() * 15.0;
            let s = plan.prism.setup;
            let pts = [at + across, at - across];
            (
                SCREEN_MIN_MM,
                0.0,
                Setup {
                    x_min: pts.iter().map(|p| p.x).fold(s.x_min, f64::min),
                    x_max: pts.iter().map(|p| p.x).fold(s.x_max, f64::max),
                    y_min: pts.iter().map(|p| p.y).fold(s.y_min, f64::min),
                    y_max: pts.iter().map(|p| p.y).fold(s.y_max, f64::max),
                },
            )
        });
        let at = out.origin + out.dir * d;
        for c in &mut colours {
            c.on_screen = c.ray.trace.outgoing().and_then(|o| meet(o.origin, o.dir, at, out.dir));
        }
        let half = (sep / 2.0 + 10.0).max(15.0);
        let across = out.dir.perp() * half;
        plan.screen = Some(Screen {
            distance_mm: d,
            ends: (at + across, at - across),
            paper_bound: sep < 2.0 * ray_width_mm,
        });
        plan.setup = setup;
        plan.colours = colours;
        plan
    }

    /// The extreme colours (shortest, longest wavelength), as indices.
    fn extremes(colours: &[SpectrumColour]) -> (usize, usize) {
        let by = |a: &usize, b: &usize| {
            colours[*a].light.wavelength_nm.total_cmp(&colours[*b].light.wavelength_nm)
        };
        ((0..colours.len()).min_by(by).unwrap_or(0), (0..colours.len()).max_by(by).unwrap_or(0))
    }

    fn extreme_separation(&self, colours: &[SpectrumColour], hits: &[Option<Point>]) -> f64 {
        let (s, l) = SpectrumPlan::extremes(colours);
        match (hits.get(s).copied().flatten(), hits.get(l).copied().flatten()) {
            (Some(a), Some(b)) => a.distance(b),
            _ => 0.0,
        }
    }

    /// Separation of the extreme colours on the screen, mm.
    pub fn separation_mm(&self) -> Option<f64> {
        let (s, l) = SpectrumPlan::extremes(&self.colours);
        Some(self.colours.get(s)?.on_screen?.distance(self.colours.get(l)?.on_screen?))
    }

    /// Angle between the extreme colours' emergent rays, degrees (their
    /// deviations' difference: the incoming ray is the same).
    pub fn angular_spread_deg(&self) -> Option<f64> {
        let (s, l) = SpectrumPlan::extremes(&self.colours);
        let a = self.colours.get(s)?.ray.deviation_deg.ok()?;
        let b = self.colours.get(l)?.ray.deviation_deg.ok()?;
        Some((a - b).abs())
    }

    fn incidence_deg(&self) -> f64 {
        self.prism.plan.rays.first().map_or(0.0, |r| r.incidence_deg)
    }

    fn tolerance_deg(&self) -> f64 {
        self.prism.plan.rays.first().map_or(0.0, |r| r.tolerance_deg)
    }

    fn screen_items(&self, d: &mut Drawing, bounds: &Rect, w: &Words) -> Vec<Item> {
        let Some(s) = &self.screen else { return Vec::new() };
        let mut items = vec![Item::Line {
            from: s.ends.0,
            to: s.ends.1,
            stroke: Stroke::solid(THIN_W).dashed(LINE_DASH),
        }];
        d.placer.block_soft_line(s.ends.0, s.ends.1);
        let label = w.fill("spectrum_screen", &[("distance", &format!("{:.0}", s.distance_mm))]);
        let u = (s.ends.0 - s.ends.1).normalized().unwrap_or(Vec2::new(0.0, 1.0));
        if let Some(l) = place_near(&mut d.placer, bounds, &label, VALUE_PT, s.ends.0, u) {
            items.extend(l);
        }
        items
    }
}

impl SheetView for SpectrumPlan {
    fn extent(&self) -> Setup {
        self.setup
    }
    fn student(&self, bounds: Rect, w: &Words) -> Drawing {
        let mut d = self.prism.student(bounds, w);
        let screen = self.screen_items(&mut d, &bounds, w);
        d.items.extend(screen);
        d
    }
    fn key(&self, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item> {
        // The colours run on to the screen (drawn with the shared colour
        // paths): keep the prism key's labels off them.
        for c in &self.colours {
            let mut pts: Vec<Point> = c.ray.trace.points().collect();
            pts.extend(c.on_screen);
            base.placer.block_path(&pts);
        }
        let mut items = self.prism.key(base, bounds, w);
        for c in &self.colours {
            if let Some(p) = c.on_screen {
                items.push(Item::Marker {
                    at: p,
                    shape: crate::scene::MarkerShape::Dot,
                    size_mm: 1.2,
                    stroke: Stroke::solid(THIN_W).paint(c.style.paint),
                });
            }
        }
        items
    }
    fn template(&self) -> &'static str {
        "spectrum.toml"
    }
    fn entry_words(&self, w: &Words) -> String {
        w.say("entry_side").to_string()
    }
    fn table_widths(&self) -> Vec<f64> {
        vec![0.08, 0.14, 0.3, 0.24, 0.24]
    }
    fn graded_column(&self) -> usize {
        3
    }
    fn table_rows(&self, key: bool, w: &Words) -> Vec<Vec<String>> {
        let tol = self.tolerance_deg();
        self.colours
            .iter()
            .map(|c| {
                let mut row =
                    vec![c.style.initial.clone(), c.light.name.clone(), angle(self.incidence_deg())];
                if key {
                    row.push(with_range(&c.ray.emergence_deg, tol, "°", w));
                    row.push(with_range(&c.ray.deviation_deg, tol, "°", w));
                }
                row
            })
            .collect()
    }
    fn key_lines(&self, w: &Words) -> Vec<String> {
        let p = &self.prism.prism;
        let mut v = vec![w.fill(
            "spectrum_formula",
            &[
                ("apex", &format!("{:.1}", p.apex_rad.to_degrees())),
                ("incidence", &format!("{:.1}", self.incidence_deg())),
            ],
        )];
        let (s, l) = SpectrumPlan::extremes(&self.colours);
        if let (Some(spread), Some(sep), Some(screen), Some(short), Some(long)) = (
            self.angular_spread_deg(),
            self.separation_mm(),
            &self.screen,
            self.colours.get(s),
            self.colours.get(l),
        ) {
            let widths = sep / self.ray_width_mm;
            v.push(w.fill(
                "spectrum_spread",
                &[
                    ("short", &short.light.name),
                    ("long", &long.light.name),
                    ("spread", &format!("{spread:.2}")),
                    ("distance", &format!("{:.0}", screen.distance_mm)),
                    ("separation", &format!("{sep:.1}")),
                    ("widths", &format!("{widths:.1}")),
                    ("width", &format!("{:.1}", self.ray_width_mm)),
                ],
            ));
            v.push(if widths < 1.0 {
                w.say("spectrum_not_apart").to_string()
            } else if widths < 2.0 {
                w.say("spectrum_touching").to_string()
            } else {
                w.say("spectrum_apart").to_string()
            });
            if screen.paper_bound {
                v.push(w.say("spectrum_paper_bound").to_string());
            }
            v.push(w.fill(
                "spectrum_small",
                &[("spread", &format!("{spread:.2}")), ("range", &format!("{:.1}", self.tolerance_deg()))],
            ));
        } else {
            v.push(w.say("spectrum_no_spread").to_string());
        }
        v
    }
    fn key_plot(&self, rect: Rect, w: &Words) -> Vec<Item> {
        self.prism.key_plot(rect, w)
    }
    fn student_note(&self, w: &Words) -> Option<String> {
        Some(w.say("note_spectrum").to_string())
    }
    fn answers(&self) -> Value {
        let mut m = match self.prism.answers() {
            Value::Object(m) => m,
            _ => serde_json::Map::new(),
        };
        // The white ray at the ray box's own wavelength, then one ray per
        // colour, lettered by its initial as the key prints it.
        if let Some(white) = m.remove("rays") {
            m.insert("white_ray".into(), white);
        }
        let tol = self.tolerance_deg();
        let rays: Vec<Value> = self
            .colours
            .iter()
            .map(|c| {
                json!({
                    "ray": c.style.initial,
                    "wavelength_nm": c.light.wavelength_nm,
                    "index": c.light.index,
                    "colour": c.light.name,
                    "angle_of_incidence_deg": c.ray.incidence_deg,
                    "emergence_angle_deg": c.ray.emergence_deg.ok(),
                    "deviation_deg": c.ray.deviation_deg.ok(),
                    "tolerance_deg": tol,
                    "on_screen_mm": c.on_screen.map(|p| [p.x + 0.0, p.y + 0.0]),
                    "graded": av::graded(&c.ray),
                })
            })
            .collect();
        m.insert("rays".into(), Value::Array(rays));
        m.insert("angular_spread_deg".into(), json!(self.angular_spread_deg()));
        m.insert("screen_distance_mm".into(), json!(self.screen.as_ref().map(|s| s.distance_mm)));
        m.insert("screen_separation_mm".into(), json!(self.separation_mm()));
        m.insert("ray_width_mm".into(), json!(self.ray_width_mm));
        Value::Object(m)
    }
    fn summary_rows(&self) -> Vec<SummaryRow> {
        let mut rows = self.prism.summary_rows();
        if let Some(r) = rows.first_mut() {
            r.push((
                "angular_spread_deg",
                self.angular_spread_deg().map_or_else(String::new, |s| format!("{s:.3}")),
            ));
        }
        rows
    }
    fn summary_cells(&self, w: &Words) -> Vec<[String; 5]> {
        let spread = self.angular_spread_deg().map_or_else(String::new, |s| format!("{s:.2}°"));
        let tol = self.tolerance_deg();
        self.colours
            .iter()
            .map(|c| {
                [
                    c.style.initial.clone(),
                    angle(self.incidence_deg()),
                    format!("δ {}", with_range(&c.ray.deviation_deg, tol, "°", w)),
                    spread.clone(),
                    String::new(),
                ]
            })
            .collect()
    }
    fn report(&self) -> String {
        let mut s = self.prism.report();
        for c in &self.colours {
            let _ = writeln!(
                s,
                "  {} ({:.1} nm, n = {}): emergence {}, deviation {}",
                c.light.name,
                c.light.wavelength_nm,
                fmt_index(c.light.index),
                c.ray.emergence_deg.map_or_else(|_| "none".into(), |e| format!("{e:.3}°")),
                c.ray.deviation_deg.map_or_else(|_| "none".into(), |d| format!("{d:.3}°")),
            );
        }
        if let (Some(a), Some(sep), Some(sc)) =
            (self.angular_spread_deg(), self.separation_mm(), &self.screen)
        {
            let _ = writeln!(
                s,
                "  angular spread {a:.3}°; {sep:.2} mm apart on a screen {:.0} mm beyond the prism ({:.1} ray widths)",
                sc.distance_mm,
                sep / self.ray_width_mm
            );
        }
        s
    }
    fn measured(&self) -> Vec<Measured> {
        let tolerance = self.tolerance_deg();
        let mut out = Vec::new();
        for c in &self.colours {
            if !av::graded(&c.ray) {
                continue;
            }
            for (quantity, v) in
                [("emergence_angle_deg", &c.ray.emergence_deg), ("deviation_deg", &c.ray.deviation_deg)]
            {
                if let Ok(value) = v {
                    out.push(Measured {
                        ray: c.style.initial.clone(),
                        quantity,
                        unit: "deg",
                        want: Want::Value { value: *value + 0.0, tolerance },
                    });
                }
            }
        }
        out
    }
    fn measured_at_index(&self, index: f64) -> Vec<Measured> {
        // Every colour's answers with the piece's index replaced by `index`
        // shifted by that colour's own offset from the sheet's index, so a
        // fitted index moves the whole spectrum.
        let shift = index - self.prism.plan.setup.index;
        let tolerance = self.tolerance_deg();
        let mut out = Vec::new();
        for c in &self.colours {
            let Some(r) = self.prism.plan.with_index(c.light.index + shift).rays.into_iter().next() else {
                continue;
            };
            if !av::graded(&r) {
                continue;
            }
            for (quantity, v) in
                [("emergence_angle_deg", r.emergence_deg), ("deviation_deg", r.deviation_deg)]
            {
                if let Ok(value) = v {
                    out.push(Measured {
                        ray: c.style.initial.clone(),
                        quantity,
                        unit: "deg",
                        want: Want::Value { value: value + 0.0, tolerance },
                    });
                }
            }
        }
        out
    }
    fn class_curve(&self) -> Option<super::ClassCurve> {
        None
    }
    fn colour_paths(&self, index: f64) -> Option<Vec<(String, Vec<Point>)>> {
        // The colour's path from the entry point to a little past the screen.
        let mut paths = super::angled_drawing::ray_paths(&self.prism.plan.with_index(index));
        let screen = self.screen.as_ref()?;
        let at = screen.ends.0 + (screen.ends.1 - screen.ends.0) * 0.5;
        let n = (screen.ends.1 - screen.ends.0).perp().normalized()?;
        for (_, pts) in &mut paths {
            let k = pts.len();
            if k < 2 {
                continue;
            }
            let (a, b) = (pts[k - 2], pts[k - 1]);
            if let Some(u) = (b - a).normalized()
                && let Some(hit) = meet(a, u, at, n)
            {
                pts[k - 1] = hit + u * 6.0;
            }
        }
        Some(paths)
    }
    fn owns_colour_text(&self) -> bool {
        true
    }
}
