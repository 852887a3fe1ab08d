//! The class summary as CSV: one row per guide ray of every group's sheets,
//! with the columns of every kind in the class (blank where a kind has none).

use crate::sheets::ClassPlan;

/// Quotes a CSV field when it needs it (RFC 4180), and neutralises a field a
/// spreadsheet would run as a formula, as OWASP's "CSV Injection" page
/// advises: a field that starts with `=`, `+`, `-`, `@`, a tab or a carriage
/// return gets a leading `'` and is quoted. Numbers (a height of `-12.500`)
/// are left as numbers.
pub(crate) fn field(s: &str) -> String {
    let formula =
        s.starts_with(['=', '+', '-', '@', '\t', '\r']) && !s.parse::<f64>().is_ok_and(f64::is_finite);
    if formula {
        format!("\"'{}\"", s.replace('"', "\"\""))
    } else if s.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
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

#[cfg(test)]
mod tests {
    use super::field;

    /// Issue 12, finding 9: a roster name such as `=cmd|' /C calc'!A0` was
    /// written to summary.csv as-is, and a spreadsheet runs it as a formula.
    #[test]
    fn csv_injection_in_summary_csv() {
        assert_eq!(field("=cmd|' /C calc'!A0"), "\"'=cmd|' /C calc'!A0\"");
        assert_eq!(field("@SUM(A1:A9)"), "\"'@SUM(A1:A9)\"");
        assert_eq!(field("+1\"x"), "\"'+1\"\"x\"");
        assert_eq!(field("-foo"), "\"'-foo\"");
        assert_eq!(field("\tbench"), "\"'\tbench\"");
        // Numbers stay numbers; ordinary text stays as it was; RFC 4180 quoting still applies.
        assert_eq!(field("-12.500"), "-12.500");
        assert_eq!(field("+3"), "+3");
        assert_eq!(field("Bench A"), "Bench A");
        assert_eq!(field("a, b"), "\"a, b\"");
        // A formula that parses as a non-finite number is still neutralised.
        assert_eq!(field("-inf"), "\"'-inf\"");
    }
}
