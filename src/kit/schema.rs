//! The kit file as a JSON Schema (draft 7, what TOML-aware editors read),
//! generated from the serde structs in `raw.rs` that read it: their doc
//! comments are the descriptions, their `schemars` attributes the units,
//! ranges and defaults the validator applies. Whatever the validator checks
//! within one field (its type, range, a word from a list, a name's length) the
//! schema checks too; what needs two fields or the physics (a radius below half
//! the height, a material that is not defined) only the program can check.

use schemars::generate::SchemaSettings;
use schemars::{Schema, SchemaGenerator, json_schema};
use serde_json::{Map, Value, json};

use super::raw::RawKit;
use crate::optics::MIN_PIECE_MM;
use crate::paper::NAMED_SIZES;

/// Text without control characters (`char::is_control`: U+0000–U+001F and
/// U+007F–U+009F), as `Validator::printable` asks.
pub(super) const PRINTABLE: &str = "^[^\\u0000-\\u001F\\u007F-\\u009F]*$";

/// A piece id: letters, digits, - and _ (spaces around it are trimmed).
pub(super) const PIECE_ID: &str = "^\\s*[A-Za-z0-9_-]+\\s*$";

/// Control characters, and the invisible format characters
/// `font::invisible_char` refuses in a group name, as a regex class body.
const CONTROL: &str = "\\u0000-\\u001F\\u007F-\\u009F";
const INVISIBLE: &str =
    "\\u00AD\\u061C\\u180E\\u200B-\\u200F\\u202A-\\u202E\\u2060-\\u2064\\u2066-\\u206F\\uFEFF\\uFFF9-\\uFFFB";

/// Printable text with at least one character that is not a space (a colour's name).
pub(super) fn printable_word() -> String {
    format!("^[^{CONTROL}]*[^\\s{CONTROL}][^{CONTROL}]*$")
}

/// A group name: after trimming, 1 to [`super::MAX_NAME_CHARS`] characters,
/// none a control or invisible character (`group_name_problem`).
pub(super) fn group_name_pattern() -> String {
    let bad = format!("{CONTROL}{INVISIBLE}");
    let inner = super::MAX_NAME_CHARS - 2;
    format!("^\\s*(?:[^\\s{bad}]|[^\\s{bad}][^{bad}]{{0,{inner}}}[^\\s{bad}])\\s*$")
}

/// One of `words` in any letter case, with spaces around it allowed (as the
/// validator trims and compares without case).
fn any_case(words: &[&str]) -> String {
    let alternatives: Vec<String> = words
        .iter()
        .map(|w| {
            w.chars()
                .map(|c| {
                    if c.is_ascii_alphabetic() {
                        format!("[{}{}]", c.to_ascii_lowercase(), c.to_ascii_uppercase())
                    } else {
                        regex_escape(c)
                    }
                })
                .collect()
        })
        .collect();
    format!("^\\s*(?:{})\\s*$", alternatives.join("|"))
}

fn regex_escape(c: char) -> String {
    if "\\^$.|?*+()[]{}-".contains(c) { format!("\\{c}") } else { c.to_string() }
}

/// A named paper size, any case.
pub(super) fn paper_size_pattern() -> String {
    let names: Vec<&str> = NAMED_SIZES.iter().map(|(n, ..)| *n).collect();
    any_case(&names)
}

/// An orientation word, any case.
pub(super) fn orientation_pattern() -> String {
    any_case(&["portrait", "landscape", "auto"])
}

/// A lens shape's face: `"flat"` or `{ curve = "convex" | "concave", radius_mm = R }`.
pub(super) fn face_schema(_: &mut SchemaGenerator) -> Schema {
    json_schema!({
        "oneOf": [
            { "const": "flat", "description": "A flat face." },
            {
                "type": "object",
                "description": "A curved face: a circular arc.",
                "additionalProperties": false,
                "required": ["curve", "radius_mm"],
                "properties": {
                    "curve": {
                        "description": "\"convex\" bulges out of the piece, \"concave\" is hollowed into it. Required: no default.",
                        "enum": ["convex", "concave"]
                    },
                    "radius_mm": {
                        "description": "The face's radius of curvature, at least half the piece's height; no upper limit here. Required: no default.",
                        "type": "number",
                        "x-unit": "mm",
                        "exclusiveMinimum": 0.0
                    }
                }
            }
        ]
    })
}

/// Which fields each piece shape takes: the others are refused.
pub(super) fn piece_shapes() -> Value {
    let all = ["front", "back", "thickness_mm", "height_mm", "apex_deg", "side_mm"];
    let rule = |shape: &str, wanted: &[&str]| {
        let mut refused: Map<String, Value> =
            all.iter().filter(|f| !wanted.contains(f)).map(|f| (f.to_string(), Value::Bool(false))).collect();
        // A block's sides and a prism's are at least MIN_PIECE_MM (a lens
        // shape's thickness and height only above 0).
        if shape != "lens" {
            for f in wanted.iter().filter(|f| **f != "apex_deg") {
                refused.insert(f.to_string(), json!({ "minimum": MIN_PIECE_MM }));
            }
        }
        let mut test = json!({ "properties": { "shape": { "const": shape } } });
        if shape != "lens" {
            // A piece without `shape` is a lens shape.
            test["required"] = json!(["shape"]);
        }
        json!({ "if": test, "then": { "required": wanted, "properties": refused } })
    };
    json!([
        rule("lens", &["front", "back", "thickness_mm", "height_mm"]),
        rule("block", &["thickness_mm", "height_mm"]),
        rule("prism", &["apex_deg", "side_mm"]),
    ])
}

/// The kit file's schema, with `sheet_table` as the schema of one
/// `[[sheets]]` table (the sheet kinds make it; see `sheets::kit_schema`).
pub fn kit_schema(sheet_table: Value) -> Value {
    let mut settings = SchemaSettings::draft07();
    settings.inline_subschemas = true;
    let root = settings.into_generator().into_root_schema_for::<RawKit>();
    let mut v = root.to_value();
    drop_null(&mut v);
    v["properties"]["sheets"]["items"] = sheet_table;
    describe(&mut v);
    v
}

/// TOML has no null: `Option` fields are simply left out, so the `null` that
/// schemars allows for them is taken out again.
fn drop_null(v: &mut Value) {
    match v {
        Value::Object(m) => {
            if let Some(Value::Array(types)) = m.get_mut("type") {
                types.retain(|t| t != "null");
                if types.len() == 1 {
                    let only = types[0].clone();
                    m.insert("type".into(), only);
                }
            }
            for key in ["anyOf", "oneOf"] {
                if let Some(Value::Array(list)) = m.get_mut(key) {
                    list.retain(|s| s != &json!({ "type": "null" }));
                    if list.len() == 1 {
                        let only = list.remove(0);
                        m.remove(key);
                        if let Value::Object(inner) = only {
                            for (k, x) in inner {
                                m.entry(k).or_insert(x);
                            }
                        }
                    }
                }
            }
            for x in m.values_mut() {
                drop_null(x);
            }
        }
        Value::Array(list) => list.iter_mut().for_each(drop_null),
        _ => {}
    }
}

/// Adds the unit, range and default to every property's description, so an
/// editor's hover text says them in words.
pub fn describe(v: &mut Value) {
    let Value::Object(m) = v else {
        if let Value::Array(list) = v {
            list.iter_mut().for_each(describe);
        }
        return;
    };
    // Doc comments come with their line breaks; an editor wraps by itself.
    if let Some(Value::String(d)) = m.get_mut("description") {
        *d = d.split_whitespace().collect::<Vec<_>>().join(" ");
    }
    // serde's number formats (`double`, `int64`) say nothing a kit's writer needs.
    m.remove("format");
    if let Some(Value::Object(props)) = m.get_mut("properties") {
        for p in props.values_mut() {
            if let Value::Object(field) = p {
                if let Some(Value::String(d)) = field.get_mut("description") {
                    *d = d.split_whitespace().collect::<Vec<_>>().join(" ");
                }
                let words = field_words(field);
                if !words.is_empty() {
                    let about = field.get("description").and_then(Value::as_str).unwrap_or("").trim();
                    let joined = if about.is_empty() { words } else { format!("{about} ({words})") };
                    field.insert("description".into(), Value::String(joined));
                }
            }
        }
    }
    for x in m.values_mut() {
        describe(x);
    }
}

/// "unit mm; from 0 (not included) to 40; default 8" for a field's schema.
fn field_words(field: &Map<String, Value>) -> String {
    // A list of numbers carries its bounds on its items.
    let numbers = field.get("items").and_then(Value::as_object).filter(|_| field.contains_key("x-unit"));
    let bounds = numbers.unwrap_or(field);
    let num = |k: &str| bounds.get(k).and_then(Value::as_f64).map(fmt_number);
    let mut parts = Vec::new();
    if let Some(u) = field.get("x-unit").and_then(Value::as_str) {
        parts.push(if u == "1" { "no unit".to_string() } else { format!("unit {u}") });
    }
    let low = match (num("minimum"), num("exclusiveMinimum")) {
        (Some(x), _) => Some(format!("from {x}")),
        (None, Some(x)) => Some(format!("above {x}")),
        _ => None,
    };
    let high = match (num("maximum"), num("exclusiveMaximum")) {
        (Some(x), _) => Some(format!("at most {x}")),
        (None, Some(x)) => Some(format!("below {x}")),
        _ => None,
    };
    match (low, high) {
        (Some(l), Some(h)) => parts.push(format!("{l}, {h}")),
        (Some(l), None) => parts.push(l),
        (None, Some(h)) => parts.push(h),
        (None, None) => {}
    }
    if let Some(d) = field.get("default") {
        let d = match d {
            Value::Number(n) => n.as_f64().map(fmt_number).unwrap_or_else(|| n.to_string()),
            other => other.to_string(),
        };
        parts.push(format!("default {d}"));
    }
    parts.join("; ")
}

fn fmt_number(x: f64) -> String {
    format!("{x}")
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The "did you mean" lists of the kit's tables name exactly the fields
    /// the schema (made from the same structs) has.
    #[test]
    fn the_hint_lists_name_the_fields_of_the_schema() {
        let s = kit_schema(json!({}));
        let keys = |v: &Value| -> Vec<String> {
            let mut k: Vec<String> =
                v["properties"].as_object().expect("properties").keys().cloned().collect();
            k.sort();
            k
        };
        let table = |name: &str| -> Value {
            let p = &s["properties"];
            match name {
                "" => s.clone(),
                "materials" => p["materials"]["additionalProperties"].clone(),
                "sellmeier" => p["materials"]["additionalProperties"]["properties"]["sellmeier"].clone(),
                "colours" => p["ray_box"]["properties"]["colours"]["items"].clone(),
                "pieces" => p["pieces"]["items"].clone(),
                other => p[other].clone(),
            }
        };
        for (name, fields) in super::super::raw::TABLE_FIELDS {
            let mut want: Vec<String> = fields.iter().map(|f| f.to_string()).collect();
            want.sort();
            assert_eq!(keys(&table(name)), want, "table `{name}`");
        }
    }

    #[test]
    fn any_case_matches_the_words_only() {
        assert_eq!(any_case(&["A4", "auto"]), "^\\s*(?:[aA]4|[aA][uU][tT][oO])\\s*$");
    }
}
