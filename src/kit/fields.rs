//! A `[[sheets]]` table kept as located values, so that each sheet kind can
//! read the fields it accepts and point at the file, line and column of any
//! it refuses, without seeing TOML.

use std::collections::BTreeMap;
use std::fmt;

use serde::Deserialize;
use serde::de::{self, MapAccess, SeqAccess, Visitor};
use toml::Spanned;

use super::KitError;
use super::error::Locator;

/// A value of the kit file with every nested value's span kept.
#[derive(Clone, Debug, PartialEq)]
pub(super) enum Raw {
    Bool(bool),
    Int(i64),
    Float(f64),
    Text(String),
    List(Vec<Spanned<Raw>>),
    Table(Vec<(Spanned<String>, Spanned<Raw>)>),
}

impl Raw {
    fn type_words(&self) -> String {
        match self {
            Raw::Bool(b) => format!("boolean `{b}`"),
            Raw::Int(i) => format!("integer `{i}`"),
            Raw::Float(f) => format!("floating point `{f}`"),
            Raw::Text(s) => format!("string \"{s}\""),
            Raw::List(_) => "a list".into(),
            Raw::Table(_) => "a table".into(),
        }
    }
}

struct RawVisitor;

impl<'de> Visitor<'de> for RawVisitor {
    type Value = Raw;
    fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("a TOML value")
    }
    fn visit_bool<E: de::Error>(self, v: bool) -> Result<Raw, E> {
        Ok(Raw::Bool(v))
    }
    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Raw, E> {
        Ok(Raw::Int(v))
    }
    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Raw, E> {
        Ok(i64::try_from(v).map(Raw::Int).unwrap_or(Raw::Float(v as f64)))
    }
    fn visit_f64<E: de::Error>(self, v: f64) -> Result<Raw, E> {
        Ok(Raw::Float(v))
    }
    fn visit_str<E: de::Error>(self, v: &str) -> Result<Raw, E> {
        Ok(Raw::Text(v.to_string()))
    }
    fn visit_string<E: de::Error>(self, v: String) -> Result<Raw, E> {
        Ok(Raw::Text(v))
    }
    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Raw, A::Error> {
        let mut out = Vec::new();
        while let Some(v) = seq.next_element::<Spanned<Raw>>()? {
            out.push(v);
        }
        Ok(Raw::List(out))
    }
    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Raw, A::Error> {
        let mut out = Vec::new();
        while let Some(k) = map.next_key::<Spanned<String>>()? {
            out.push((k, map.next_value::<Spanned<Raw>>()?));
        }
        Ok(Raw::Table(out))
    }
}

impl<'de> Deserialize<'de> for Raw {
    fn deserialize<D: de::Deserializer<'de>>(d: D) -> Result<Raw, D::Error> {
        d.deserialize_any(RawVisitor)
    }
}

/// The raw `[[sheets]]` table: every key with its span.
pub(super) type RawSheetTable = BTreeMap<Spanned<String>, Spanned<Raw>>;

/// Where something is in the kit file, ready to make an error.
#[derive(Clone, Debug, PartialEq)]
pub struct Place {
    file: String,
    line: usize,
    column: usize,
    source_line: String,
    /// The field's path (`sheets[2].angles_deg[3]`).
    pub field: String,
}

impl Place {
    pub(super) fn at(loc: &Locator<'_>, offset: usize, field: String) -> Place {
        let e = loc.error(offset, field.clone(), "", "");
        Place { file: e.file, line: e.line, column: e.column, source_line: e.source_line, field }
    }

    /// 1-based line.
    pub fn line(&self) -> usize {
        self.line
    }

    /// An error here: what is wrong and what would be accepted.
    pub fn error(&self, message: impl Into<String>, hint: impl Into<String>) -> KitError {
        KitError {
            file: self.file.clone(),
            line: self.line,
            column: self.column,
            field: self.field.clone(),
            message: message.into(),
            hint: hint.into(),
            source_line: self.source_line.clone(),
        }
    }

    fn child(&self, loc: &Locator<'_>, offset: usize, suffix: &str) -> Place {
        Place::at(loc, offset, format!("{}{suffix}", self.field))
    }
}

/// A value and where it is.
#[derive(Clone, Debug, PartialEq)]
pub struct Located<T> {
    /// The value.
    pub value: T,
    /// Where it is in the kit file.
    pub at: Place,
}

#[derive(Clone, Debug, PartialEq)]
enum Value {
    Bool(bool),
    Number(f64),
    Text(String),
    Numbers(Vec<Located<Option<f64>>>),
    Other(String),
}

#[derive(Clone, Debug, PartialEq)]
struct Field {
    key_at: Place,
    value_at: Place,
    value: Value,
}

/// One `[[sheets]]` table: its kind, its piece (resolved) and every other field
/// kept with its place, for the sheet kind to read and check.
#[derive(Clone, Debug, PartialEq)]
pub struct SheetEntry {
    /// 1-based position in the kit's `[[sheets]]` list.
    pub number: usize,
    /// The table's header line.
    pub at: Place,
    /// The `kind` word.
    pub kind: Located<String>,
    /// Index into [`super::Kit::pieces`].
    pub piece: usize,
    /// Where the `piece` field is.
    pub piece_at: Place,
    fields: BTreeMap<String, Field>,
}

/// The fields every sheet table has.
pub const COMMON_SHEET_FIELDS: &[&str] = &["kind", "piece"];

impl SheetEntry {
    pub(super) fn new(
        loc: &Locator<'_>,
        number: usize,
        table: &Spanned<RawSheetTable>,
        pieces: &[super::KitPiece],
    ) -> Result<SheetEntry, KitError> {
        let f = |name: &str| format!("sheets[{number}].{name}");
        let at = Place::at(loc, table.span().start, format!("sheets[{number}]"));
        let get = |name: &str| table.get_ref().iter().find(|(k, _)| k.get_ref() == name).map(|(_, v)| v);
        let text = |name: &str| -> Result<Located<String>, KitError> {
            match get(name) {
                None => Err(Place::at(loc, table.span().start, f(name))
                    .error(format!("missing field `{name}`"), format!("add `{name} = …` to this table"))),
                Some(v) => match v.get_ref() {
                    Raw::Text(s) => {
                        Ok(Located { value: s.clone(), at: Place::at(loc, v.span().start, f(name)) })
                    }
                    other => Err(Place::at(loc, v.span().start, f(name)).error(
                        format!("invalid type: {}, expected a string", other.type_words()),
                        "give text in double quotes",
                    )),
                },
            }
        };
        let kind = text("kind")?;
        let piece = text("piece")?;
        let Some(pi) = pieces.iter().position(|p| p.id == piece.value) else {
            let ids: Vec<&str> = pieces.iter().map(|p| p.id.as_str()).collect();
            let hint = if ids.is_empty() {
                "the kit has no [[pieces]] yet".to_string()
            } else {
                format!("known pieces: {}", ids.join(", "))
            };
            return Err(piece.at.error(format!("no piece has id `{}`", piece.value), hint));
        };
        let mut fields = BTreeMap::new();
        for (k, v) in table.get_ref() {
            let name = k.get_ref().as_str();
            if COMMON_SHEET_FIELDS.contains(&name) {
                continue;
            }
            let key_at = Place::at(loc, k.span().start, f(name));
            let value_at = Place::at(loc, v.span().start, f(name));
            let value = match v.get_ref() {
                Raw::Bool(b) => Value::Bool(*b),
                Raw::Int(i) => Value::Number(*i as f64),
                Raw::Float(x) => Value::Number(*x),
                Raw::Text(s) => Value::Text(s.clone()),
                Raw::List(items) => Value::Numbers(
                    items
                        .iter()
                        .enumerate()
                        .map(|(j, e)| Located {
                            value: match e.get_ref() {
                                Raw::Int(i) => Some(*i as f64),
                                Raw::Float(x) => Some(*x),
                                _ => None,
                            },
                            at: value_at.child(loc, e.span().start, &format!("[{}]", j + 1)),
                        })
                        .collect(),
                ),
                other => Value::Other(other.type_words()),
            };
            fields.insert(name.to_string(), Field { key_at, value_at, value });
        }
        Ok(SheetEntry { number, at, kind, piece: pi, piece_at: piece.at, fields })
    }

    /// Refuses any field not in `accepted` (besides `kind` and `piece`), saying
    /// which are accepted on this kind of sheet and suggesting the nearest name.
    pub fn reject_unknown(&self, accepted: &[&str]) -> Result<(), KitError> {
        let all: Vec<&str> = COMMON_SHEET_FIELDS.iter().chain(accepted).copied().collect();
        for (name, field) in &self.fields {
            if accepted.contains(&name.as_str()) {
                continue;
            }
            let best = super::error::did_you_mean(name, &all);
            return Err(field.key_at.error(
                format!("unknown field `{name}` on a {} sheet", self.kind.value),
                format!("{best}accepted here: {}", all.join(", ")),
            ));
        }
        Ok(())
    }

    /// Whether the table has the field.
    pub fn has(&self, name: &str) -> bool {
        self.fields.contains_key(name)
    }

    /// Where a field's value is, if given.
    pub fn place(&self, name: &str) -> Option<&Place> {
        self.fields.get(name).map(|f| &f.value_at)
    }

    fn wrong_type(f: &Field, expected: &str, hint: &str) -> KitError {
        let found = match &f.value {
            Value::Bool(b) => format!("boolean `{b}`"),
            Value::Number(x) => format!("number `{x}`"),
            Value::Text(s) => format!("string \"{s}\""),
            Value::Numbers(_) => "a list".into(),
            Value::Other(w) => w.clone(),
        };
        f.value_at.error(format!("invalid type: {found}, expected {expected}"), hint)
    }

    /// A text field.
    pub fn word(&self, name: &str) -> Result<Option<Located<String>>, KitError> {
        match self.fields.get(name) {
            None => Ok(None),
            Some(f) => match &f.value {
                Value::Text(s) => Ok(Some(Located { value: s.clone(), at: f.value_at.clone() })),
                _ => Err(Self::wrong_type(f, "a string", "give text in double quotes")),
            },
        }
    }

    /// A true/false field.
    pub fn flag(&self, name: &str) -> Result<Option<Located<bool>>, KitError> {
        match self.fields.get(name) {
            None => Ok(None),
            Some(f) => match &f.value {
                Value::Bool(b) => Ok(Some(Located { value: *b, at: f.value_at.clone() })),
                _ => Err(Self::wrong_type(f, "a boolean", "give true or false")),
            },
        }
    }

    /// A number field.
    pub fn number(&self, name: &str) -> Result<Option<Located<f64>>, KitError> {
        match self.fields.get(name) {
            None => Ok(None),
            Some(f) => match &f.value {
                Value::Number(x) => Ok(Some(Located { value: *x, at: f.value_at.clone() })),
                _ => Err(Self::wrong_type(f, "a number", "give a number, such as 24 or 24.5")),
            },
        }
    }

    /// A list of numbers, each with its own place.
    pub fn numbers(&self, name: &str) -> Result<Option<Located<Vec<Located<f64>>>>, KitError> {
        match self.fields.get(name) {
            None => Ok(None),
            Some(f) => match &f.value {
                Value::Numbers(items) => {
                    let mut out = Vec::new();
                    for it in items {
                        match it.value {
                            Some(v) => out.push(Located { value: v, at: it.at.clone() }),
                            None => {
                                return Err(it.at.error(
                                    "invalid type in the list, expected a number",
                                    "give a number, such as 45 or 45.5",
                                ));
                            }
                        }
                    }
                    Ok(Some(Located { value: out, at: f.value_at.clone() }))
                }
                _ => Err(Self::wrong_type(f, "a list", "give a list in square brackets, such as [8, -8]")),
            },
        }
    }
}
