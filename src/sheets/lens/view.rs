//! How a curved-face or focal plan shows itself to layout and output: its
//! drawings, table, key text, plot, answer-file part, summary rows and report.

use std::fmt::Write;

use serde::Serialize;

use super::{LensPlan, RayAnswer, drawing, plot};
use crate::draw::{Drawing, Words};
use crate::optics::Outcome;
use crate::plan::{fmt_mm, fmt1, fmt2_or_none};
use crate::scene::{Item, Rect};
use crate::sheets::{Measured, Setup, SheetKind, SheetView, SummaryRow, Want};

/// −0.0 written as 0.0 (adding +0.0 does exactly that in IEEE 754).
fn z(v: Option<f64>) -> Option<f64> {
    v.map(|x| x + 0.0)
}

fn num(v: Option<f64>) -> String {
    v.map(|x| format!("{:.3}", x + 0.0)).unwrap_or_default()
}

#[derive(Serialize)]
struct Answers<'a> {
    paraxial: ParaxialOut,
    safe_band_mm: Option<BandOut<'a>>,
    rays: Vec<RayOut<'a>>,
}

#[derive(Serialize)]
struct ParaxialOut {
    thin_lens_focal_mm: Option<f64>,
    efl_mm: Option<f64>,
    bfl_mm: Option<f64>,
    front_focal_mm: Option<f64>,
    front_principal_plane_mm: Option<f64>,
    rear_principal_plane_mm: Option<f64>,
}

#[derive(Serialize)]
struct BandOut<'a> {
    min: f64,
    max: f64,
    min_reason: &'a str,
    max_reason: &'a str,
}

#[derive(Serialize)]
struct RayOut<'a> {
    ray: &'a str,
    height_mm: f64,
    outcome: &'static str,
    #[serde(skip_serializing_if = "Option::is_none")]
    crossing_from_entry_mm: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    crossing_from_exit_mm: Option<f64>,
    exit_face: Option<&'static str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    exit_angle_deg: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    tolerance_mm: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    trace_back_points_mm: Option<[[f64; 2]; 2]>,
    in_safe_band: bool,
    graded: bool,
}

/// The student sheet's words for an on-axis ray, in the two measurement columns.
pub fn on_axis_cells(w: &Words) -> [String; 2] {
    [w.say("on_axis_goes_straight").to_string(), w.say("on_axis_nothing").to_string()]
}

/// Printed words for a lens ray's outcome.
pub fn outcome_words(o: &Outcome, w: &Words) -> String {
    match o {
        Outcome::Crosses { .. } => w.say("outcome_crosses"),
        Outcome::Virtual { .. } => w.say("outcome_virtual"),
        Outcome::TotalInternalReflection => w.say("outcome_total_internal_reflection"),
        Outcome::LeavesThroughEdge => w.say("outcome_leaves_through_edge"),
        Outcome::Parallel => w.say("outcome_parallel"),
        Outcome::OnAxis => w.say("outcome_on_axis"),
        Outcome::Misses => w.say("outcome_misses"),
        Outcome::Trapped => w.say("outcome_trapped"),
    }
    .to_string()
}

impl LensPlan {
    /// The same guide heights traced again with the piece's index replaced by
    /// `index`; each ray keeps its letter, grading and accept range. `None`
    /// when the lens shape is not valid at that index.
    pub fn at_index(&self, index: f64) -> Option<LensPlan> {
        let p = &self.outline.piece;
        let lens =
            crate::optics::Lens::new(p.front(), p.back(), p.thickness_mm(), p.height_mm(), index).ok()?;
        let outline = crate::optics::Outline::new(lens, self.entry);
        let mut copy = self.clone();
        copy.rays = self
            .rays
            .iter()
            .map(|r| {
                let mut a = super::answer_ray(
                    &outline,
                    &self.rules,
                    self.band.as_ref(),
                    r.height_mm,
                    r.letter.clone(),
                );
                a.graded = r.graded;
                a.tolerance_mm = r.tolerance_mm;
                a
            })
            .collect();
        copy.paraxial = crate::optics::Paraxial::of(&outline.piece, self.entry);
        copy.outline = outline;
        Some(copy)
    }

    /// Where the table's two measurement columns measure from, as x in the
    /// sheet frame: curved-face sheets from the flat face (the entry vertex)
    /// and the curved face (the exit vertex); focal sheets from the exit
    /// face and the centre line drawn on the sheet ([`drawing::centre_line_x`]).
    pub fn table_references(&self) -> [f64; 2] {
        match self.kind {
            SheetKind::CurvedFace => [self.measure_from(&Words::default()).0, self.outline.t()],
            _ => [self.outline.t(), drawing::centre_line_x(&self.outline)],
        }
    }

    /// A crossing's distance from the reference at `x_ref`, as the table asks
    /// for it: after the reference for a real crossing, before it for a
    /// virtual one (traced back). None when the ray has no crossing.
    pub fn table_distance(&self, ray: &RayAnswer, x_ref: f64) -> Option<f64> {
        match (ray.trace.outcome, ray.crossing_from_entry_mm) {
            (Outcome::Crosses { .. }, Some(x)) => Some(x - x_ref),
            (Outcome::Virtual { .. }, Some(x)) => Some(x_ref - x),
            _ => None,
        }
    }

    /// The key's two measurement cells for one ray: each distance with its
    /// accept range (`90.5 ± 3.4 (87.1–93.9)`) when graded, the distance
    /// marked "not graded" otherwise, or what happened instead.
    fn key_cells(&self, ray: &RayAnswer, w: &Words) -> [String; 2] {
        if matches!(ray.trace.outcome, Outcome::OnAxis) {
            return on_axis_cells(w);
        }
        let cell = |x_ref: f64| match (self.table_distance(ray, x_ref), ray.graded, ray.tolerance_mm) {
            (Some(d), true, Some(t)) => {
                format!("{} ± {} ({}\u{2013}{})", fmt1(d), fmt1(t), fmt1(d - t), fmt1(d + t))
            }
            (Some(d), _, _) => w.fill("not_graded", &[("value", &fmt1(d))]),
            (None, _, _) => String::new(),
        };
        let [a, b] = self.table_references();
        match self.table_distance(ray, a) {
            Some(_) => [cell(a), cell(b)],
            None => [w.say("no_crossing").to_string(), outcome_words(&ray.trace.outcome, w)],
        }
    }
}

impl SheetView for LensPlan {
    fn extent(&self) -> Setup {
        self.setup
    }

    fn class_curve(&self) -> Option<crate::sheets::ClassCurve> {
        // The table's first column: the flat face or the exit face, as `measured` names it.
        let t = self.outline.t();
        let flat_first = matches!(self.outline.entry_face, crate::optics::Face::Flat);
        let diverging = self.is_diverging();
        let (y, x_ref) = match self.kind {
            SheetKind::CurvedFace => ("crossing_from_flat_face_mm", if flat_first { 0.0 } else { t }),
            _ if diverging => ("traced_back_from_exit_face_mm", t),
            _ => ("crossing_from_exit_face_mm", t),
        };
        let dist = |x: f64| if diverging { x_ref - x } else { x - x_ref };
        let points: Vec<(f64, f64)> = self
            .crossing_curve
            .points
            .iter()
            .map(|p| (p.height_mm, dist(p.crossing_from_entry_mm)))
            .collect();
        (!points.is_empty()).then(|| crate::sheets::ClassCurve {
            x: "height_mm",
            y,
            points,
            paraxial: self.paraxial.rear_focus_x().map(dist),
        })
    }

    fn measured_at_index(&self, index: f64) -> Vec<Measured> {
        self.at_index(index).map(|c| c.measured()).unwrap_or_default()
    }

    fn colour_paths(&self, index: f64) -> Option<Vec<(String, Vec<crate::geom::Point>)>> {
        let copy = self.at_index(index)?;
        Some(
            copy.rays_top_down()
                .into_iter()
                .map(|r| (r.letter.clone(), drawing::key_path(&copy.setup, r)))
                .collect(),
        )
    }

    fn aberration_mm(&self) -> Option<f64> {
        // Longitudinal spherical aberration: paraxial focus to each graded
        // ray's crossing along the axis, the largest.
        let f = self.paraxial.rear_focus_x()?;
        self.rays
            .iter()
            .filter(|r| r.graded)
            .filter_map(|r| r.crossing_from_entry_mm.map(|x| (f - x).abs()))
            .max_by(f64::total_cmp)
    }

    fn measured(&self) -> Vec<Measured> {
        // Where the table's columns measure from, by the columns' own words:
        // the flat and the curved face on curved-face sheets, the exit face and
        // the centre line on focal sheets (traced back for a virtual crossing).
        let t = self.outline.t();
        let flat_first = matches!(self.outline.entry_face, crate::optics::Face::Flat);
        let refs: [(&'static str, &'static str, f64); 2] = match self.kind {
            SheetKind::CurvedFace => {
                let (flat, curved) = if flat_first { (0.0, t) } else { (t, 0.0) };
                [
                    ("crossing_from_flat_face_mm", "crossing_from_flat_face_mm", flat),
                    ("crossing_from_curved_face_mm", "crossing_from_curved_face_mm", curved),
                ]
            }
            _ => [
                ("crossing_from_exit_face_mm", "traced_back_from_exit_face_mm", t),
                (
                    "crossing_from_centre_line_mm",
                    "traced_back_from_centre_line_mm",
                    drawing::centre_line_x(&self.outline),
                ),
            ],
        };
        let mut out = Vec::new();
        for r in self.rays_top_down() {
            let (true, Some(tolerance)) = (r.graded, r.tolerance_mm) else { continue };
            let virtual_ = matches!(r.trace.outcome, Outcome::Virtual { .. });
            for (real, traced_back, x_ref) in refs {
                if let Some(value) = self.table_distance(r, x_ref) {
                    out.push(Measured {
                        ray: r.letter.clone(),
                        quantity: if virtual_ { traced_back } else { real },
                        unit: "mm",
                        want: Want::Value { value: value + 0.0, tolerance },
                    });
                }
            }
        }
        out
    }

    fn student(&self, bounds: Rect, w: &Words) -> Drawing {
        drawing::student(self, bounds, w)
    }

    fn key(&self, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item> {
        drawing::key_extras(self, base, bounds, w)
    }

    fn template(&self) -> &'static str {
        match self.kind {
            SheetKind::CurvedFace => "curved-face.toml",
            _ if self.is_diverging() => "focal-diverging.toml",
            _ => "focal.toml",
        }
    }

    fn entry_words(&self, w: &Words) -> String {
        match self.entry {
            crate::optics::Entry::Front => w.say("entry_front"),
            crate::optics::Entry::Back => w.say("entry_back"),
        }
        .to_string()
    }

    fn table_widths(&self) -> Vec<f64> {
        vec![0.08, 0.14, 0.39, 0.39]
    }

    fn table_rows(&self, key: bool, w: &Words) -> Vec<Vec<String>> {
        self.rays_top_down()
            .into_iter()
            .map(|r| {
                let mut row = vec![r.letter.clone(), drawing::signed(r.height_mm)];
                if key {
                    row.extend(self.key_cells(r, w));
                } else if matches!(r.trace.outcome, Outcome::OnAxis) {
                    row.extend(on_axis_cells(w));
                }
                row
            })
            .collect()
    }

    fn key_lines(&self, w: &Words) -> Vec<String> {
        let px = &self.paraxial;
        let mut v = Vec::new();
        let mm =
            |x: Option<f64>| x.map(|x| format!("{} mm", fmt1(x))).unwrap_or_else(|| w.say("none").into());
        let front = match px.front_focal_mm() {
            Some(d) if d < 0.0 => w.fill("lens_front_virtual", &[("value", &mm(Some(-d)))]),
            d => w.fill("lens_front", &[("value", &mm(d))]),
        };
        v.push(w.fill(
            "lens_formulas",
            &[
                ("thin", &mm(px.thin_lens_focal_mm())),
                ("efl", &mm(px.efl_mm())),
                ("bfl", &mm(px.bfl_mm())),
                ("front", &front),
            ],
        ));
        match px.efl_mm() {
            Some(f) if f < 0.0 => v.push(
                w.fill("lens_diverging", &[("bfl", &mm(px.bfl_mm().map(f64::abs))), ("efl", &mm(Some(f)))]),
            ),
            Some(f) => v.push(w.fill(
                "lens_converging",
                &[("bfl", &mm(px.bfl_mm())), ("efl", &mm(Some(f))), ("plane", &mm(px.rear_principal_mm()))],
            )),
            None => {}
        }
        if let Some(b) = &self.band {
            let (lower, upper) = super::band::reasons(b, &self.outline, &self.rules, w);
            v.push(w.fill(
                "lens_band",
                &[("min", &fmt1(b.min_mm)), ("max", &fmt1(b.max_mm)), ("lower", &lower), ("upper", &upper)],
            ));
        }
        v.push(w.fill("lens_tolerances", &[("value", &fmt_mm(self.rules.across_error_mm()))]));
        v
    }

    fn key_plot(&self, rect: Rect, w: &Words) -> Vec<Item> {
        plot::aberration_plot(self, rect, w)
    }

    fn student_note(&self, w: &Words) -> Option<String> {
        match self.kind {
            SheetKind::CurvedFace => None,
            _ if self.is_diverging() => Some(w.say("note_virtual_focus").to_string()),
            _ => Some(w.say("note_rays_meet").to_string()),
        }
    }

    fn answers(&self) -> serde_json::Value {
        let px = &self.paraxial;
        let a = Answers {
            paraxial: ParaxialOut {
                thin_lens_focal_mm: z(px.thin_lens_focal_mm()),
                efl_mm: z(px.efl_mm()),
                bfl_mm: z(px.bfl_mm()),
                front_focal_mm: z(px.front_focal_mm()),
                front_principal_plane_mm: z(px.front_principal_mm()),
                rear_principal_plane_mm: z(px.rear_principal_mm()),
            },
            safe_band_mm: self.band.as_ref().map(|b| BandOut {
                min: b.min_mm,
                max: b.max_mm,
                min_reason: &b.min_reason,
                max_reason: &b.max_reason,
            }),
            rays: self
                .rays
                .iter()
                .map(|r| RayOut {
                    ray: &r.letter,
                    height_mm: r.height_mm + 0.0,
                    outcome: r.trace.outcome.as_str(),
                    crossing_from_entry_mm: z(r.crossing_from_entry_mm),
                    crossing_from_exit_mm: z(r.crossing_from_exit_mm),
                    exit_face: r.exit_face,
                    exit_angle_deg: r.exit_angle_deg,
                    tolerance_mm: r.tolerance_mm,
                    trace_back_points_mm: r.trace_back.map(|[a, b]| [[a.x, a.y], [b.x, b.y]]),
                    in_safe_band: r.in_band,
                    graded: r.graded,
                })
                .collect(),
        };
        serde_json::to_value(a).unwrap_or(serde_json::Value::Null)
    }

    fn summary_rows(&self) -> Vec<SummaryRow> {
        let px = &self.paraxial;
        self.rays_top_down()
            .into_iter()
            .map(|r| {
                vec![
                    ("ray", r.letter.clone()),
                    ("height_mm", format!("{:.3}", r.height_mm + 0.0)),
                    ("outcome", r.trace.outcome.as_str().to_string()),
                    ("crossing_from_entry_mm", num(r.crossing_from_entry_mm)),
                    ("crossing_from_exit_mm", num(r.crossing_from_exit_mm)),
                    ("tolerance_mm", num(r.tolerance_mm)),
                    ("graded", r.graded.to_string()),
                    ("thin_lens_focal_mm", num(px.thin_lens_focal_mm())),
                    ("efl_mm", num(px.efl_mm())),
                    ("bfl_mm", num(px.bfl_mm())),
                ]
            })
            .collect()
    }

    fn summary_cells(&self, w: &Words) -> Vec<[String; 5]> {
        let (ref_x, ref_words) = self.measure_from(w);
        let opt =
            |v: Option<f64>| v.map(|v| format!("{:.1}", v + 0.0)).unwrap_or_else(|| w.say("none").into());
        let px = &self.paraxial;
        self.rays_top_down()
            .into_iter()
            .map(|r| {
                let tol = match (r.graded, r.tolerance_mm) {
                    (true, Some(t)) => format!(" ± {t:.1}"),
                    _ => String::new(),
                };
                let crossing = match r.crossing_from_entry_mm {
                    Some(x) if x < self.outline.t() && ref_x > 0.0 => {
                        let value = format!("{:.1}{tol}", self.outline.t() - x);
                        w.fill("summary_crossing", &[("value", &value), ("where", w.say("before_exit_face"))])
                    }
                    Some(x) => w.fill(
                        "summary_crossing",
                        &[("value", &format!("{:.1}{tol}", x - ref_x)), ("where", ref_words)],
                    ),
                    None => outcome_words(&r.trace.outcome, w),
                };
                let crossing = if r.crossing_from_entry_mm.is_some() && !r.graded {
                    w.fill("not_graded", &[("value", &crossing)])
                } else {
                    crossing
                };
                [
                    r.letter.clone(),
                    drawing::signed(r.height_mm),
                    crossing,
                    w.fill(
                        "summary_focal",
                        &[("thin", &opt(px.thin_lens_focal_mm())), ("efl", &opt(px.efl_mm()))],
                    ),
                    w.fill("summary_bfl", &[("bfl", &opt(px.bfl_mm()))]),
                ]
            })
            .collect()
    }

    fn report(&self) -> String {
        let mut s = String::new();
        let px = &self.paraxial;
        let _ = writeln!(
            s,
            "  thin-lens focal length (lens maker's formula): {} mm",
            fmt2_or_none(px.thin_lens_focal_mm())
        );
        let front = match px.front_focal_mm() {
            Some(d) if d < 0.0 => format!("{} mm after the entry vertex (virtual)", fmt2_or_none(Some(-d))),
            d => format!("{} mm before the entry vertex", fmt2_or_none(d)),
        };
        let back = match px.bfl_mm() {
            Some(b) if b < 0.0 => format!("{} mm before the exit vertex (virtual)", fmt2_or_none(Some(-b))),
            b => format!("{} mm after the exit vertex", fmt2_or_none(b)),
        };
        let _ = writeln!(
            s,
            "  thick piece: EFL {} mm; rear focus {back}; front focus {front}",
            fmt2_or_none(px.efl_mm())
        );
        let _ = writeln!(
            s,
            "  principal planes: front {} mm from the entry vertex, rear {} mm from the exit vertex",
            fmt2_or_none(px.front_principal_mm()),
            fmt2_or_none(px.rear_principal_mm())
        );
        match &self.band {
            Some(b) => {
                let _ =
                    writeln!(s, "  safe band: {:.1} to {:.1} mm either side of the axis", b.min_mm, b.max_mm);
                let _ = writeln!(s, "    lower end: {}", b.min_reason);
                let _ = writeln!(s, "    upper end: {}", b.max_reason);
            }
            None => {
                let _ = writeln!(s, "  safe band: none");
            }
        }
        let _ = writeln!(
            s,
            "  {:<3}  {:>9}  {:<26} {:>12} {:>11} {:>9} {:>8}  exit face",
            "ray", "height mm", "outcome", "from entry", "from exit", "angle °", "± mm"
        );
        for r in &self.rays {
            let _ = writeln!(
                s,
                "  {:<3}  {:>9}  {:<26} {:>12} {:>11} {:>9} {:>8}  {}",
                r.letter,
                fmt_mm(r.height_mm),
                r.trace.outcome.as_str(),
                fmt2_or_none(r.crossing_from_entry_mm),
                fmt2_or_none(r.crossing_from_exit_mm),
                r.exit_angle_deg.map(|a| format!("{a:.1}")).unwrap_or_else(|| "-".into()),
                r.tolerance_mm.map(|a| format!("{a:.1}")).unwrap_or_else(|| "-".into()),
                r.exit_face.unwrap_or("-")
            );
            if let Some([a, b]) = r.trace_back {
                let _ = writeln!(
                    s,
                    "  {:<3}  {:>9}  trace-back points ({:.1}, {:.1}) and ({:.1}, {:.1}) mm from the entry vertex",
                    "", "", a.x, a.y, b.x, b.y
                );
            }
        }
        s
    }
}
