//! `results.csv`: one row per answer a student measures, for the teacher to
//! fill in while walking round the room, and what `raysheet grade` reads back.

use super::summary::field;
use crate::sheets::{SheetPlan, Want};

/// The columns, in order (issue 11: the names are fixed, tools read them).
pub const COLUMNS: [&str; 7] = ["group", "variant", "sheet", "ray", "quantity", "unit", "measured"];

/// The results file for these plans, in their order (a class set's plans group
/// by group, as the summary), with `measured` empty. An observation (a word
/// rather than a number) has the unit column empty.
pub fn results_csv(plans: &[SheetPlan]) -> String {
    let mut s = COLUMNS.join(",");
    s.push('\n');
    for p in plans {
        for m in p.view().measured() {
            let unit = match m.want {
                Want::Value { .. } => m.unit,
                Want::Observation(_) => "",
            };
            let cells = [
                field(p.group.as_deref().unwrap_or("")),
                field(p.variant.as_deref().unwrap_or("")),
                p.number.to_string(),
                field(&m.ray),
                m.quantity.to_string(),
                unit.to_string(),
                String::new(),
            ];
            s.push_str(&cells.join(","));
            s.push('\n');
        }
    }
    s
}
