//! The answer file: a plan's answers written for machines (JSON).

use serde::Serialize;

use crate::plan::SheetPlan;

/// −0.0 written as 0.0 (adding +0.0 does exactly that in IEEE 754).
fn z(v: Option<f64>) -> Option<f64> {
    v.map(|x| x + 0.0)
}

/// Version of the answer-file layout.
pub const FORMAT: u32 = 1;

#[derive(Serialize)]
struct AnswerFile<'a> {
    format: u32,
    kit: &'a str,
    seed: Option<u64>,
    sheets: Vec<SheetAnswers<'a>>,
}

#[derive(Serialize)]
struct SheetAnswers<'a> {
    sheet: usize,
    kind: &'static str,
    piece: &'a str,
    enter: &'static str,
    group: Option<&'a str>,
    variant: Option<&'a str>,
    index: f64,
    paraxial: ParaxialOut,
    safe_band_mm: Option<BandOut<'a>>,
    rays: Vec<RayOut<'a>>,
    warnings: &'a [String],
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

/// The answer file for `plans` as pretty JSON (fields in a fixed order, values
/// in mm, unrounded).
pub fn to_json(kit_title: &str, seed: Option<u64>, plans: &[SheetPlan]) -> String {
    let sheets = plans
        .iter()
        .map(|p| SheetAnswers {
            sheet: p.number,
            kind: p.kind.as_str(),
            piece: &p.piece_id,
            enter: p.entry.as_str(),
            group: p.group.as_deref(),
            variant: p.variant.as_deref(),
            index: p.outline.piece.index(),
            paraxial: ParaxialOut {
                thin_lens_focal_mm: z(p.paraxial.thin_lens_focal_mm()),
                efl_mm: z(p.paraxial.efl_mm()),
                bfl_mm: z(p.paraxial.bfl_mm()),
                front_focal_mm: z(p.paraxial.front_focal_mm()),
                front_principal_plane_mm: z(p.paraxial.front_principal_mm()),
                rear_principal_plane_mm: z(p.paraxial.rear_principal_mm()),
            },
            safe_band_mm: p.band.as_ref().map(|b| BandOut {
                min: b.min_mm,
                max: b.max_mm,
                min_reason: &b.min_reason,
                max_reason: &b.max_reason,
            }),
            rays: p
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
            warnings: &p.warnings,
        })
        .collect();
    let file = AnswerFile { format: FORMAT, kit: kit_title, seed, sheets };
    let mut s = serde_json::to_string_pretty(&file).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"));
    s.push('\n');
    s
}
