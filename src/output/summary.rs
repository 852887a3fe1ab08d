//! The class summary as CSV: one row per guide ray of every group's sheets,
//! with the columns of every kind in the class (blank where a kind has none).

use crate::sheets::ClassPlan;

/// Quotes a CSV field when it needs it (RFC 4180).
fn field(s: &str) -> String {
    if s.contains([',', '"', '\n', '\r']) { format!("\"{}\"", s.replace('"', "\"\"")) } else { s.to_string() }
}

/// Columns every row has.
pub const COMMON_COLUMNS: &[&str] = &["group", "variant", "sheet", "kind", "piece", "enter"];

/// The summary rows as CSV text (UTF-8, comma-separated, lengths in mm and
/// angles in degrees to 0.001). The kinds' own columns follow the common ones,
/// in the order the kinds name them, each once.
pub fn summary_csv(class: &ClassPlan) -> String {
    let mut columns: Vec<&'static str> = COMMON_COLUMNS.to_vec();
    for p in class.plans.iter().flatten() {
        for row in p.view().summary_rows() {
            for (name, _) in row {
                if !columns.contains(&name) {
                    columns.push(name);
                }
            }
        }
    }
    let mut s = columns.join(",");
    s.push('\n');
    for plans in &class.plans {
        for p in plans {
            for row in p.view().summary_rows() {
                let common = [
                    field(p.group.as_deref().unwrap_or("")),
                    field(p.variant.as_deref().unwrap_or("")),
                    p.number.to_string(),
                    p.kind.as_str().to_string(),
                    field(&p.piece_id),
                    p.enter.as_str().to_string(),
                ];
                let mut cells: Vec<String> = common.to_vec();
                for c in &columns[COMMON_COLUMNS.len()..] {
                    cells.push(row.iter().find(|(n, _)| n == c).map(|(_, v)| field(v)).unwrap_or_default());
                }
                s.push_str(&cells.join(","));
                s.push('\n');
            }
        }
    }
    s
}
