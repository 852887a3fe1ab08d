//! The class summary as CSV: one row per guide ray of every group's sheets.

use crate::plan::ClassPlan;

/// Quotes a CSV field when it needs it (RFC 4180).
fn field(s: &str) -> String {
    if s.contains([',', '"', '\n', '\r']) { format!("\"{}\"", s.replace('"', "\"\"")) } else { s.to_string() }
}

fn num(v: Option<f64>) -> String {
    v.map(|x| format!("{:.3}", x + 0.0)).unwrap_or_default()
}

/// Column headings of `summary.csv`.
pub const COLUMNS: &[&str] = &[
    "group",
    "variant",
    "sheet",
    "kind",
    "piece",
    "enter",
    "ray",
    "height_mm",
    "outcome",
    "crossing_from_entry_mm",
    "crossing_from_exit_mm",
    "tolerance_mm",
    "graded",
    "thin_lens_focal_mm",
    "efl_mm",
    "bfl_mm",
];

/// The summary rows as CSV text (UTF-8, comma-separated, values in mm to 0.001).
pub fn summary_csv(class: &ClassPlan) -> String {
    let mut s = COLUMNS.join(",");
    s.push('\n');
    for plans in &class.plans {
        for p in plans {
            for r in p.rays_top_down() {
                let row = [
                    field(p.group.as_deref().unwrap_or("")),
                    field(p.variant.as_deref().unwrap_or("")),
                    p.number.to_string(),
                    p.kind.as_str().to_string(),
                    field(&p.piece_id),
                    p.entry.as_str().to_string(),
                    field(&r.letter),
                    format!("{:.3}", r.height_mm + 0.0),
                    r.trace.outcome.as_str().to_string(),
                    num(r.crossing_from_entry_mm),
                    num(r.crossing_from_exit_mm),
                    num(r.tolerance_mm),
                    r.graded.to_string(),
                    num(p.paraxial.thin_lens_focal_mm()),
                    num(p.paraxial.efl_mm()),
                    num(p.paraxial.bfl_mm()),
                ];
                s.push_str(&row.join(","));
                s.push('\n');
            }
        }
    }
    s
}
