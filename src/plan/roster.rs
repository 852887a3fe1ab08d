//! Reading a roster: a UTF-8 CSV with a `name` column, one group per row.

use crate::kit::{MAX_GROUPS, group_name_problem, normal_group_name};

/// A problem in a roster file, located.
#[derive(Clone, Debug, PartialEq)]
pub struct RosterError {
    /// File name as given.
    pub file: String,
    /// 1-based line (0 when the whole file is at fault).
    pub line: u64,
    /// What is wrong and what would be accepted.
    pub message: String,
}

impl std::fmt::Display for RosterError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        if self.line > 0 {
            write!(f, "{}:{}: field `name`: {}", self.file, self.line, self.message)
        } else {
            write!(f, "{}: {}", self.file, self.message)
        }
    }
}

impl std::error::Error for RosterError {}

/// The group names in a roster, exactly as written (a byte-order mark is
/// dropped; surrounding spaces are kept out of the name).
pub fn parse_roster(text: &str, file: &str) -> Result<Vec<String>, RosterError> {
    let err = |line: u64, message: String| RosterError { file: file.to_string(), line, message };
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let mut reader = csv::ReaderBuilder::new().has_headers(true).flexible(true).from_reader(text.as_bytes());
    let headers = reader.headers().map_err(|e| err(1, format!("cannot read the header row: {e}")))?.clone();
    let Some(col) = headers.iter().position(|h| h.trim().eq_ignore_ascii_case("name")) else {
        return Err(err(
            1,
            format!(
                "the header row has no `name` column (found: {}); the first line must name the columns, such as `name`",
                headers.iter().collect::<Vec<_>>().join(", ")
            ),
        ));
    };
    let mut names: Vec<String> = Vec::new();
    for rec in reader.records() {
        let rec =
            rec.map_err(|e| err(e.position().map(|p| p.line()).unwrap_or(0), format!("not valid CSV: {e}")))?;
        let line = rec.position().map(|p| p.line()).unwrap_or(0);
        if rec.iter().all(|f| f.trim().is_empty()) {
            continue;
        }
        let name = normal_group_name(rec.get(col).unwrap_or(""));
        if let Some(problem) = group_name_problem(&name) {
            return Err(err(line, format!("{problem}; give a short printable name, such as Bench A")));
        }
        if names.contains(&name) {
            return Err(err(
                line,
                format!("the group name {name:?} appears twice; give every group its own name"),
            ));
        }
        names.push(name);
        if names.len() > MAX_GROUPS {
            return Err(err(
                line,
                format!("more than {MAX_GROUPS} groups; raysheet makes at most {MAX_GROUPS} per class set"),
            ));
        }
    }
    if names.is_empty() {
        return Err(err(
            0,
            "the roster has no names; add one group name per line under the `name` header".into(),
        ));
    }
    Ok(names)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_names_exactly_and_rejects_hostile_ones() {
        let ok = parse_roster("name,room\nBench A,4\n\"Ødegård, K.\",4\n", "r.csv").unwrap();
        assert_eq!(ok, vec!["Bench A".to_string(), "Ødegård, K.".to_string()]);
        let e = parse_roster("name\nA\n\"two\nlines\"\n", "r.csv").unwrap_err();
        assert!(e.to_string().contains("r.csv:3"), "{e}");
        assert!(e.to_string().contains("control character"));
        let e = parse_roster("name\nA\n,\n\"\"\n", "r.csv");
        assert!(e.is_ok(), "blank rows are skipped: {e:?}");
        let e = parse_roster(&format!("name\n{}\n", "x".repeat(300)), "r.csv").unwrap_err();
        assert!(e.to_string().contains("300 characters"), "{e}");
        assert!(parse_roster("group\nA\n", "r.csv").unwrap_err().to_string().contains("no `name` column"));
        assert!(parse_roster("name\nA\nA\n", "r.csv").unwrap_err().to_string().contains("twice"));
    }
}
