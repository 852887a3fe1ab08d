//! How a curved-face or focal plan shows itself to layout and output: its
//! drawings, table, key text, plot, answer-file part, summary rows and report.

use std::fmt::Write;

use serde::Serialize;

use super::{LensPlan, RayAnswer, drawing, plot};
use crate::draw::Drawing;
use crate::optics::Outcome;
use crate::plan::{fmt_mm, fmt1, fmt2_or_none};
use crate::scene::{Item, Rect};
use crate::sheets::{Setup, SheetKind, SheetView, SummaryRow};

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
pub const ON_AXIS_CELLS: [&str; 2] = ["on the axis: goes straight through", "nothing to measure"];

impl LensPlan {
    /// Where the table's two measurement columns measure from, as x in the
    /// sheet frame: curved-face sheets from the flat face (the entry vertex)
    /// and the curved face (the exit vertex); focal sheets from the exit
    /// face and the centre line drawn on the sheet ([`drawing::centre_line_x`]).
    pub fn table_references(&self) -> [f64; 2] {
        match self.kind {
            SheetKind::CurvedFace => [self.measure_from().0, self.outline.t()],
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
    fn key_cells(&self, ray: &RayAnswer) -> [String; 2] {
        if matches!(ray.trace.outcome, Outcome::OnAxis) {
            return ON_AXIS_CELLS.map(String::from);
        }
        let cell = |x_ref: f64| match (self.table_distance(ray, x_ref), ray.graded, ray.tolerance_mm) {
            (Some(d), true, Some(t)) => {
                format!("{} ± {} ({}\u{2013}{})", fmt1(d), fmt1(t), fmt1(d - t), fmt1(d + t))
            }
            (Some(d), _, _) => format!("{} (not graded)", fmt1(d)),
            (None, _, _) => String::new(),
        };
        let [a, b] = self.table_references();
        match self.table_distance(ray, a) {
            Some(_) => [cell(a), cell(b)],
            None => ["no crossing".to_string(), ray.trace.outcome.as_str().replace('-', " ")],
        }
    }
}

impl SheetView for LensPlan {
    fn extent(&self) -> Setup {
        self.setup
    }

    fn student(&self, bounds: Rect) -> Drawing {
        drawing::student(self, bounds)
    }

    fn key(&self, base: &mut Drawing, bounds: Rect) -> Vec<Item> {
        drawing::key_extras(self, base, bounds)
    }

    fn template(&self) -> &'static str {
        match self.kind {
            SheetKind::CurvedFace => "curved-face.toml",
            _ if self.is_diverging() => "focal-diverging.toml",
            _ => "focal.toml",
        }
    }

    fn entry_words(&self) -> String {
        self.entry.as_str().to_string()
    }

    fn table_widths(&self) -> [f64; 4] {
        [0.08, 0.14, 0.39, 0.39]
    }

    fn table_rows(&self, key: bool) -> Vec<Vec<String>> {
        self.rays_top_down()
            .into_iter()
            .map(|r| {
                let mut row = vec![r.letter.clone(), drawing::signed(r.height_mm)];
                if key {
                    row.extend(self.key_cells(r));
                } else if matches!(r.trace.outcome, Outcome::OnAxis) {
                    row.extend(ON_AXIS_CELLS.map(String::from));
                }
                row
            })
            .collect()
    }

    fn key_lines(&self) -> Vec<String> {
        let px = &self.paraxial;
        let mut v = Vec::new();
        let mm = |x: Option<f64>| x.map(|x| format!("{} mm", fmt1(x))).unwrap_or_else(|| "none".into());
        let front = match px.front_focal_mm() {
            Some(d) if d < 0.0 => {
                format!("the front focal point lies {} after the entry face (virtual)", mm(Some(-d)))
            }
            d => format!("front focal distance {} before the entry face", mm(d)),
        };
        v.push(format!(
            "Lens maker's formula (thin lens): f = {}. Thick piece: focal length (EFL) {}, back focal length (BFL) {} from the exit face; {front}.",
            mm(px.thin_lens_focal_mm()),
            mm(px.efl_mm()),
            mm(px.bfl_mm()),
        ));
        match px.efl_mm() {
            Some(f) if f < 0.0 => v.push(format!(
                "Diverging: the rays seem to come from a virtual focus {} before the exit face. A ruler from the exit face to where the dashed lines meet measures |BFL|; the focal length {} is counted from the rear principal plane.",
                mm(px.bfl_mm().map(f64::abs)),
                mm(Some(f))
            )),
            Some(f) => v.push(format!(
                "A ruler from the exit face to where near-axis rays cross measures the BFL ({}); the focal length {} is counted from the rear principal plane ({} from the exit face).",
                mm(px.bfl_mm()),
                mm(Some(f)),
                mm(px.rear_principal_mm())
            )),
            None => {}
        }
        if let Some(b) = &self.band {
            v.push(format!(
                "Safe band {}–{} mm from the axis: {}; {}.",
                fmt1(b.min_mm),
                fmt1(b.max_mm),
                b.min_reason,
                b.max_reason
            ));
        }
        v.push(format!(
            "Tolerances: ±{} mm across the ray divided by tan(angle to the axis); crossings are exact Snell's-law traces.",
            fmt_mm(self.rules.across_error_mm())
        ));
        v
    }

    fn key_plot(&self, rect: Rect) -> Vec<Item> {
        plot::aberration_plot(self, rect)
    }

    fn student_note(&self) -> Option<String> {
        match self.kind {
            SheetKind::CurvedFace => None,
            _ if self.is_diverging() => {
                Some("Virtual focus you found: ______ mm before the exit face".to_string())
            }
            _ => Some("Where the rays meet: ______ mm from the exit face".to_string()),
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

    fn summary_cells(&self) -> Vec<[String; 5]> {
        let (ref_x, ref_words) = self.measure_from();
        let opt = |v: Option<f64>| v.map(|v| format!("{:.1}", v + 0.0)).unwrap_or_else(|| "none".into());
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
                        format!("{:.1}{tol} before the exit face", self.outline.t() - x)
                    }
                    Some(x) => format!("{:.1}{tol} {ref_words}", x - ref_x),
                    None => r.trace.outcome.as_str().to_string(),
                };
                let crossing = if r.crossing_from_entry_mm.is_some() && !r.graded {
                    format!("{crossing} (not graded)")
                } else {
                    crossing
                };
                [
                    r.letter.clone(),
                    drawing::signed(r.height_mm),
                    crossing,
                    format!("f {} / EFL {}", opt(px.thin_lens_focal_mm()), opt(px.efl_mm())),
                    format!("BFL {}", opt(px.bfl_mm())),
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
