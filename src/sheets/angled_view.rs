//! What block and prism sheets share when they show themselves: field checks,
//! outcome words, table cells, answer-file rays, summary rows and report lines.

use std::fmt::Write;

use serde_json::{Map, Value, json};

use super::SummaryRow;
use super::angled::{AngledPlan, AngledRay, Expected};
use crate::draw::Words;
use crate::kit::{KitError, SheetEntry};
use crate::optics::{BlockFace, End, EventKind, PrismFace};
use crate::plan::fmt1;

/// Faces with answer-file names.
pub trait FaceName: Copy + PartialEq {
    /// The answer-file word for the face.
    fn name(self) -> &'static str;
    /// Words for a sentence, in `w`: "the second side".
    fn words(self, w: &Words) -> &str;
}

impl FaceName for BlockFace {
    fn name(self) -> &'static str {
        self.as_str()
    }
    fn words(self, w: &Words) -> &str {
        match self {
            BlockFace::Entry => w.say("face_block_entry"),
            BlockFace::Exit => w.say("face_block_far"),
            BlockFace::End => w.say("face_block_end"),
        }
    }
}

impl FaceName for PrismFace {
    fn name(self) -> &'static str {
        self.as_str()
    }
    fn words(self, w: &Words) -> &str {
        match self {
            PrismFace::SideA => w.say("face_prism_first"),
            PrismFace::SideB => w.say("face_prism_second"),
            PrismFace::Base => w.say("face_prism_base"),
        }
    }
}

/// An angle for sheets: whole degrees without decimals, else one decimal,
/// with a true minus sign.
pub fn angle(v: f64) -> String {
    let s = if (v - v.round()).abs() < 1e-9 {
        format!("{}°", v.round().abs())
    } else {
        format!("{:.1}°", v.abs())
    };
    if v < -1e-9 { format!("\u{2212}{s}") } else { s }
}

/// The answer-file outcome of an angle-sheet ray.
pub fn outcome<F: FaceName>(plan: &AngledPlan<F>, r: &AngledRay<F>) -> &'static str {
    let turn = matches!(plan.setup.expected, Expected::Turn { .. });
    if r.path_ok {
        return if turn { "turns" } else { "refracts" };
    }
    match r.trace.end {
        End::Missed => "misses",
        End::Trapped => "trapped",
        End::Left { .. } => {
            let reflected = r.trace.events.iter().any(|e| e.kind == EventKind::TotalReflection);
            if reflected && !turn {
                "total-internal-reflection"
            } else if turn {
                // A right-angle prism whose ray escapes instead of turning.
                "refracts"
            } else {
                "leaves-through-edge"
            }
        }
    }
}

/// Whether a ray's answers are marked: it takes the expected path inside the safe band.
pub fn graded<F: FaceName>(r: &AngledRay<F>) -> bool {
    r.path_ok && r.in_band
}

/// "value ± tol unit" or the reason there is no value, in `w`.
pub fn with_range(
    v: &Result<f64, crate::optics::measure::NotDefined>,
    tol: f64,
    unit: &str,
    w: &Words,
) -> String {
    match v {
        Ok(x) => format!("{} ± {} {unit}", fmt1(*x), fmt1(tol)).replace(" °", "°"),
        Err(e) => undefined_words(*e, w).to_string(),
    }
}

/// The key's line on the safe band of angles: its ends and why, in `w`.
pub fn band_line(
    band: &crate::plan::scan::Band<super::angled::AngleLimit>,
    lo: &str,
    hi: &str,
    w: &Words,
) -> String {
    w.fill(
        "angle_band",
        &[
            ("min", &format!("{:.1}", band.min)),
            ("max", &format!("{:.1}", band.max)),
            ("lower", lo),
            ("upper", hi),
        ],
    )
}

/// Printed words, in `w`, for why a measurement has no value.
pub fn undefined_words(e: crate::optics::measure::NotDefined, w: &Words) -> &str {
    use crate::optics::measure::NotDefined;
    match e {
        NotDefined::Missed => w.say("undefined_missed"),
        NotDefined::Trapped => w.say("undefined_trapped"),
        NotDefined::Parallel => w.say("undefined_parallel"),
        NotDefined::NotParallel => w.say("undefined_not_parallel"),
        NotDefined::NotAtFace => w.say("undefined_not_at_face"),
    }
}

/// The answer file's rays of an angle sheet.
pub fn rays_json<F: FaceName>(plan: &AngledPlan<F>, shift: bool) -> Vec<Value> {
    plan.rays
        .iter()
        .map(|r| {
            let mut m = Map::new();
            let mut reasons = Map::new();
            let mut put = |name: &str, v: &Result<f64, crate::optics::measure::NotDefined>| match v {
                Ok(x) => {
                    m.insert(name.into(), json!(x + 0.0));
                }
                Err(e) => {
                    m.insert(name.into(), Value::Null);
                    reasons.insert(name.into(), json!(e.words()));
                }
            };
            put("refraction_angle_deg", &r.refraction_deg);
            put("emergence_angle_deg", &r.emergence_deg);
            put("deviation_deg", &r.deviation_deg);
            if shift {
                put("lateral_shift_mm", &r.lateral_shift_mm);
            }
            let mut out = Map::new();
            out.insert("ray".into(), json!(r.letter));
            out.insert("angle_of_incidence_deg".into(), json!(r.incidence_deg + 0.0));
            out.insert("outcome".into(), json!(outcome(plan, r)));
            out.extend(m);
            out.insert("exit_face".into(), json!(r.exit.as_ref().ok().map(|(f, _)| f.name())));
            out.insert("tolerance_deg".into(), json!(r.tolerance_deg));
            out.insert("refraction_tolerance_deg".into(), json!(r.refraction_tolerance_deg));
            if shift {
                out.insert("tolerance_mm".into(), json!(r.tolerance_mm));
            }
            out.insert("in_safe_band".into(), json!(r.in_band));
            out.insert("graded".into(), json!(graded(r)));
            if !reasons.is_empty() {
                out.insert("not_defined".into(), Value::Object(reasons));
            }
            let events: Vec<Value> = r
                .trace
                .events
                .iter()
                .map(|e| {
                    json!({
                        "face": e.face.name(),
                        "event": match e.kind {
                            EventKind::Enter => "enters",
                            EventKind::Leave => "leaves",
                            EventKind::TotalReflection => "total-internal-reflection",
                        },
                        "point_mm": [e.at.x + 0.0, e.at.y + 0.0],
                        "incidence_deg": e.incidence_rad().to_degrees(),
                        "refraction_deg": e.refraction_rad().map(f64::to_degrees),
                    })
                })
                .collect();
            out.insert("events".into(), Value::Array(events));
            Value::Object(out)
        })
        .collect()
}

/// The safe band of angles for the answer file.
pub fn band_json<F: FaceName>(plan: &AngledPlan<F>) -> Value {
    match (&plan.band, &plan.band_words) {
        (Some(b), Some((lo, hi))) => {
            json!({ "min": b.min, "max": b.max, "min_reason": lo, "max_reason": hi })
        }
        _ => Value::Null,
    }
}

/// The class summary's rows of an angle sheet.
pub fn summary_rows<F: FaceName>(plan: &AngledPlan<F>, shift: bool) -> Vec<SummaryRow> {
    let n = |v: &Result<f64, _>| v.as_ref().map(|x: &f64| format!("{:.3}", x + 0.0)).unwrap_or_default();
    plan.rays
        .iter()
        .map(|r| {
            let mut row = vec![
                ("ray", r.letter.clone()),
                ("angle_of_incidence_deg", format!("{:.3}", r.incidence_deg + 0.0)),
                ("outcome", outcome(plan, r).to_string()),
                ("refraction_angle_deg", n(&r.refraction_deg)),
                ("emergence_angle_deg", n(&r.emergence_deg)),
                ("deviation_deg", n(&r.deviation_deg)),
                ("tolerance_deg", format!("{:.3}", r.tolerance_deg)),
                ("refraction_tolerance_deg", format!("{:.3}", r.refraction_tolerance_deg)),
            ];
            if shift {
                row.push(("lateral_shift_mm", n(&r.lateral_shift_mm)));
                row.push(("tolerance_mm", format!("{:.3}", r.tolerance_mm)));
            }
            row.push(("graded", graded(r).to_string()));
            row
        })
        .collect()
}

/// The `check`/`solve` lines of an angle sheet: band, then one line per ray.
pub fn report<F: FaceName>(plan: &AngledPlan<F>, shift: bool) -> String {
    let mut s = String::new();
    match (&plan.band, &plan.band_words) {
        (Some(b), Some((lo, hi))) => {
            let _ = writeln!(s, "  safe band: angles of incidence {:.1}° to {:.1}°", b.min, b.max);
            let _ = writeln!(s, "    lower end: {lo}");
            let _ = writeln!(s, "    upper end: {hi}");
        }
        _ => {
            let _ = writeln!(s, "  safe band: none");
        }
    }
    let _ = writeln!(
        s,
        "  {:<3}  {:>7}  {:<26} {:>9} {:>9} {:>9} {:>8} {:>7} {:>6}  exit face",
        "ray", "i °", "outcome", "r °", "e °", "δ °", "d mm", "± °", "± mm"
    );
    let o = |v: &Result<f64, _>| {
        v.as_ref().map(|x: &f64| format!("{:.2}", x + 0.0)).unwrap_or_else(|_| "-".into())
    };
    for r in &plan.rays {
        let _ = writeln!(
            s,
            "  {:<3}  {:>7}  {:<26} {:>9} {:>9} {:>9} {:>8} {:>7} {:>6}  {}",
            r.letter,
            format!("{:.1}", r.incidence_deg + 0.0),
            outcome(plan, r),
            o(&r.refraction_deg),
            o(&r.emergence_deg),
            o(&r.deviation_deg),
            if shift { o(&r.lateral_shift_mm) } else { "-".into() },
            format!("{:.1}", r.tolerance_deg),
            if shift { format!("{:.1}", r.tolerance_mm) } else { "-".into() },
            r.exit.as_ref().map(|(f, _)| f.name()).unwrap_or("-")
        );
    }
    s
}

/// Reads `angles_deg` from a sheet table: 1 to 9 finite angles, each within
/// `lo`–`hi` degrees (exclusive of ±90).
pub fn check_angles(s: &SheetEntry, lo: f64, hi: f64) -> Result<Option<Vec<f64>>, KitError> {
    let Some(list) = s.numbers("angles_deg")? else { return Ok(None) };
    if list.value.is_empty() {
        return Err(list.at.error(
            "the list of angles is empty",
            "give at least one angle of incidence, such as [30, 45, 60], or leave angles_deg out to have them chosen",
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
        let inside = v.is_finite() && v >= lo && v <= hi && v.abs() < 90.0;
        if !inside {
            return Err(a.at.error(
                format!("an angle of incidence of {v}° is outside what this sheet takes"),
                format!("give angles from {lo} to {hi} degrees, measured from the normal of the face the light enters"),
            ));
        }
        out.push(v);
    }
    Ok(Some(out))
}

/// The class-variant notes of an angle sheet: fixed angles, no band, or fewer
/// settings than groups.
pub fn angle_notes(number: usize, fixed: bool, options: usize, groups: usize) -> Vec<String> {
    if fixed {
        vec![format!("sheet {number} has fixed angles_deg, so every group gets the same angles")]
    } else if options == 0 {
        vec![format!(
            "sheet {number}: no angle of incidence qualifies, so every group gets the default angles"
        )]
    } else if options < groups {
        vec![format!(
            "sheet {number}: the safe band has room for only {options} different setting(s) for {groups} groups"
        )]
    } else {
        Vec::new()
    }
}

/// An angle sheet's student drawing.
pub fn student_drawing<F: FaceName>(
    plan: &AngledPlan<F>,
    bounds: crate::scene::Rect,
    w: &Words,
) -> crate::draw::Drawing {
    let mut d = crate::draw::Drawing::default();
    d.items = super::angled_drawing::student(plan, &bounds, &mut d.placer, w);
    d
}

/// One graded angle-sheet answer: the value with its accept range, or, when
/// the value is not defined for this ray, the ray's outcome word.
pub fn measured_one<F: FaceName>(
    plan: &AngledPlan<F>,
    r: &AngledRay<F>,
    quantity: &'static str,
    unit: &'static str,
    value: &Result<f64, crate::optics::measure::NotDefined>,
    tolerance: f64,
) -> crate::sheets::Measured {
    let want = match value {
        Ok(v) => crate::sheets::Want::Value { value: *v + 0.0, tolerance },
        Err(_) => crate::sheets::Want::Observation(outcome(plan, r)),
    };
    crate::sheets::Measured { ray: r.letter.clone(), quantity, unit, want }
}
