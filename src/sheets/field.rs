//! A field a sheet kind reads from its `[[sheets]]` table, described once:
//! its name, what it means, its type, unit, range and default. The kind checks
//! the table with the names (`SheetEntry::reject_unknown`); the kit file's
//! JSON Schema and `raysheet kinds` are made from the whole description.

use serde_json::{Value, json};

/// One end of a number's range.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Bound {
    /// The value itself is allowed.
    Incl(f64),
    /// Up to the value, not including it.
    Excl(f64),
}

/// What a field holds.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum FieldValue {
    /// `true` or `false`; `only`: the one value this kind accepts.
    Flag {
        /// The value when the field is left out.
        default: bool,
        /// The only value accepted, when the other is refused.
        only: Option<bool>,
    },
    /// One word from a list.
    Word {
        /// The words accepted.
        choices: &'static [&'static str],
        /// The word when the field is left out.
        default: &'static str,
    },
    /// One number.
    Number {
        /// Its unit (`mm`, `deg`).
        unit: &'static str,
        /// Lowest value.
        min: Bound,
        /// Highest value (piece-dependent limits are checked by the kind).
        max: Bound,
    },
    /// A list of 1 to `most` numbers.
    Numbers {
        /// Their unit.
        unit: &'static str,
        /// Lowest value of each.
        min: Bound,
        /// Highest value of each.
        max: Bound,
        /// Most numbers in the list.
        most: usize,
    },
}

/// A field of a sheet table.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SheetField {
    /// The key in the table.
    pub name: &'static str,
    /// What it means; for a default worked out from the kit (chosen in the
    /// safe band), the words say how.
    pub about: &'static str,
    /// Its type, unit and range.
    pub value: FieldValue,
}

impl SheetField {
    /// The field's JSON Schema (draft 7), with `x-unit` for numbers.
    pub fn schema(&self) -> Value {
        let bound = |v: &mut Value, min: Bound, max: Bound| {
            match min {
                Bound::Incl(x) => v["minimum"] = json!(x),
                Bound::Excl(x) => v["exclusiveMinimum"] = json!(x),
            }
            match max {
                Bound::Incl(x) => v["maximum"] = json!(x),
                Bound::Excl(x) => v["exclusiveMaximum"] = json!(x),
            }
        };
        match self.value {
            FieldValue::Flag { default, only } => {
                let mut v = json!({ "description": self.about, "type": "boolean", "default": default });
                if let Some(o) = only {
                    v["const"] = json!(o);
                }
                v
            }
            FieldValue::Word { choices, default } => {
                json!({ "description": self.about, "type": "string", "enum": choices, "default": default })
            }
            FieldValue::Number { unit, min, max } => {
                let mut v = json!({ "description": self.about, "type": "number", "x-unit": unit });
                bound(&mut v, min, max);
                v
            }
            FieldValue::Numbers { unit, min, max, most } => {
                let mut item = json!({ "type": "number" });
                bound(&mut item, min, max);
                json!({
                    "description": self.about,
                    "type": "array",
                    "x-unit": unit,
                    "minItems": 1,
                    "maxItems": most,
                    "items": item,
                })
            }
        }
    }

    /// The field in one line of words: `angles_deg: 1–9 numbers, deg, from 0 to 89.9`.
    pub fn words(&self) -> String {
        let range = |min: Bound, max: Bound| {
            let lo = match min {
                Bound::Incl(x) => format!("from {x}"),
                Bound::Excl(x) => format!("above {x}"),
            };
            let hi = match max {
                Bound::Incl(x) => format!("to {x}"),
                Bound::Excl(x) => format!("below {x}"),
            };
            format!("{lo} {hi}")
        };
        let what = match self.value {
            FieldValue::Flag { default, only: Some(o) } => format!("{o} only (default {default})"),
            FieldValue::Flag { default, only: None } => format!("true or false (default {default})"),
            FieldValue::Word { choices, default } => {
                let list: Vec<String> = choices.iter().map(|c| format!("\"{c}\"")).collect();
                format!("{} (default \"{default}\")", list.join(" or "))
            }
            FieldValue::Number { unit, min, max } => format!("a number, {unit}, {}", range(min, max)),
            FieldValue::Numbers { unit, min, max, most } => {
                format!("a list of 1 to {most} numbers, {unit}, each {}", range(min, max))
            }
        };
        format!("{}: {what}", self.name)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_list_of_angles_has_its_bounds_on_its_items() {
        let f = SheetField {
            name: "angles_deg",
            about: "Angles.",
            value: FieldValue::Numbers {
                unit: "deg",
                min: Bound::Incl(0.0),
                max: Bound::Excl(90.0),
                most: 9,
            },
        };
        let s = f.schema();
        assert_eq!(s["items"]["minimum"], json!(0.0));
        assert_eq!(s["items"]["exclusiveMaximum"], json!(90.0));
        assert_eq!(s["maxItems"], json!(9));
        assert_eq!(f.words(), "angles_deg: a list of 1 to 9 numbers, deg, each from 0 below 90");
    }
}
