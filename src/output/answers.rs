//! The answer file: every plan's answers written for machines (JSON). The
//! fields every sheet has come first; the kind adds its own (see each kind's
//! `answers`).

use serde_json::{Map, Value, json};

use crate::sheets::SheetPlan;

/// Version of the answer-file layout.
pub const FORMAT: u32 = 1;

/// The answer file for `plans` as pretty JSON (fields in a fixed order, lengths
/// in mm and angles in degrees, unrounded).
pub fn to_json(kit_title: &str, seed: Option<u64>, plans: &[SheetPlan]) -> String {
    let sheets: Vec<Value> = plans
        .iter()
        .map(|p| {
            let mut m = Map::new();
            m.insert("sheet".into(), json!(p.number));
            m.insert("kind".into(), json!(p.kind.as_str()));
            m.insert("piece".into(), json!(p.piece_id));
            m.insert("enter".into(), json!(p.enter.as_str()));
            m.insert("group".into(), json!(p.group));
            m.insert("variant".into(), json!(p.variant));
            m.insert("index".into(), json!(p.index));
            if let Value::Object(kind) = p.view().answers() {
                m.extend(kind);
            }
            m.insert("measured".into(), measured_json(p));
            m.insert("warnings".into(), json!(p.warnings));
            Value::Object(m)
        })
        .collect();
    let file = json!({ "format": FORMAT, "kit": kit_title, "seed": seed, "sheets": sheets });
    let mut s = serde_json::to_string_pretty(&file).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"));
    s.push('\n');
    s
}

/// What a student measures on the sheet, as `results.csv` and marking use it:
/// `{ray, quantity, unit, value, tolerance}` or `{ray, quantity, observation}`.
fn measured_json(p: &SheetPlan) -> Value {
    p.view()
        .measured()
        .into_iter()
        .map(|m| match m.want {
            crate::sheets::Want::Value { value, tolerance } => json!({
                "ray": m.ray, "quantity": m.quantity, "unit": m.unit, "value": value, "tolerance": tolerance,
            }),
            crate::sheets::Want::Observation(word) => json!({
                "ray": m.ray, "quantity": m.quantity, "observation": word,
            }),
        })
        .collect()
}
