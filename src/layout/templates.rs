//! The editable sheet text in `templates/`, compiled in.

use serde::Deserialize;
use toml::Spanned;

use crate::draw::Words;
use crate::draw::words::slots_in;

/// The file holding every printed word that is not a sheet's own text.
pub const WORDS_FILE: &str = "words.toml";

/// Text for one sheet kind.
#[derive(Debug, Clone)]
pub struct SheetText {
    /// Heading printed at the top.
    pub heading: String,
    /// Numbered instruction lines.
    pub instructions: Vec<String>,
    /// Column headings of the measurement table.
    pub columns: Vec<String>,
    /// Where each field was written, for errors: see [`Places`].
    pub places: Places,
}

/// Where a template's fields were written: `FILE:LINE:COLUMN: field `F``,
/// by field name (`heading`, `instructions[2]`, `columns[4]`, `safety`, …).
#[derive(Debug, Clone, Default)]
pub struct Places(std::collections::BTreeMap<String, String>);

impl Places {
    /// Where `field` was written, if the file gave it.
    pub fn get(&self, field: &str) -> Option<&String> {
        self.0.get(field)
    }

    /// The start of an error about `field`: file, line, column and field name.
    pub fn of(&self, field: &str) -> String {
        self.0.get(field).cloned().unwrap_or_else(|| format!("field `{field}`"))
    }
}

/// Text printed on every sheet.
#[derive(Debug, Clone)]
pub struct CommonText {
    /// The one-line safety caution.
    pub safety: String,
    /// Label of the 100 mm scale bar.
    pub scale_check: String,
    /// Label of the 50 mm scale bar.
    pub scale_check_vertical: String,
    /// What to do if a bar is wrong.
    pub scale_hint: String,
    /// Where each field was written, for errors.
    pub places: Places,
}

/// All templates, parsed.
#[derive(Debug, Clone)]
pub struct Templates {
    /// Sheet text by template file name (`curved-face.toml`, `block.toml`, …).
    pub sheets: std::collections::BTreeMap<&'static str, SheetText>,
    /// Every sheet.
    pub common: CommonText,
    /// Every other printed word (labels, key lines, headers, summary pages):
    /// `words.toml`, the shipped text under any key an edited file leaves out.
    pub words: Words,
    /// Where each key of `words.toml` was written, for errors.
    pub word_places: Places,
}

/// The template files, as named in `templates/`, with their shipped text.
const SHIPPED: &[(&str, &str)] = &[
    ("curved-face.toml", include_str!("../../templates/curved-face.toml")),
    ("focal.toml", include_str!("../../templates/focal.toml")),
    ("focal-diverging.toml", include_str!("../../templates/focal-diverging.toml")),
    ("block.toml", include_str!("../../templates/block.toml")),
    ("prism.toml", include_str!("../../templates/prism.toml")),
    ("prism-turn.toml", include_str!("../../templates/prism-turn.toml")),
    ("spectrum.toml", include_str!("../../templates/spectrum.toml")),
    ("index.toml", include_str!("../../templates/index.toml")),
    ("critical-angle.toml", include_str!("../../templates/critical-angle.toml")),
    ("radius.toml", include_str!("../../templates/radius.toml")),
    ("common.toml", include_str!("../../templates/common.toml")),
    ("words.toml", crate::draw::words::SHIPPED),
];

/// The template files, as named in `templates/`.
pub const FILES: &[&str] = &[
    "curved-face.toml",
    "focal.toml",
    "focal-diverging.toml",
    "block.toml",
    "prism.toml",
    "prism-turn.toml",
    "spectrum.toml",
    "index.toml",
    "critical-angle.toml",
    "radius.toml",
    "common.toml",
    "words.toml",
];

/// The shipped text of a template file (`None` for an unknown name).
pub fn shipped_text(name: &str) -> Option<&'static str> {
    SHIPPED.iter().find(|(n, _)| *n == name).map(|(_, t)| *t)
}

/// Most instruction lines a sheet has room for.
pub const MAX_INSTRUCTIONS: usize = 7;

/// A template file's text with the name to show: errors read
/// `NAME:LINE:COLUMN: field `F`: …`, on one line.
struct Source<'a> {
    shown: &'a str,
    text: &'a str,
}

impl Source<'_> {
    /// 1-based line and column (in characters) of byte `offset`.
    fn line_col(&self, offset: usize) -> (usize, usize) {
        let mut i = offset.min(self.text.len());
        while !self.text.is_char_boundary(i) {
            i -= 1;
        }
        let before = &self.text[..i];
        let line = before.matches('\n').count() + 1;
        (line, before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1)
    }

    fn error(&self, span: &std::ops::Range<usize>, field: &str, msg: &str) -> String {
        format!("{}: {msg}", self.place(span, field))
    }

    /// `NAME:LINE:COLUMN: field `F``.
    fn place(&self, span: &std::ops::Range<usize>, field: &str) -> String {
        let (line, col) = self.line_col(span.start);
        format!("{}:{line}:{col}: field `{field}`", self.shown)
    }

    fn parse<T: for<'de> Deserialize<'de>>(&self) -> Result<T, String> {
        toml::from_str(self.text).map_err(|e| {
            // toml's own message, without its multi-line source snippet: one line.
            let (line, col) = self.line_col(e.span().map_or(0, |s| s.start));
            let msg = e.message().split_whitespace().collect::<Vec<_>>().join(" ");
            format!("{}:{line}:{col}: {msg}", self.shown)
        })
    }

    /// Checks one text field: no control characters (a newline, a tab), and
    /// every character in the shipped font. Characters are shown escaped, so
    /// the message stays on one line.
    fn printable(&self, v: &Spanned<String>, field: &str) -> Result<(), String> {
        let text = v.get_ref();
        if let Some(c) = text.chars().find(|c| c.is_control()) {
            return Err(self.error(
                &v.span(),
                field,
                &format!(
                    "contains a control character ('{}', U+{:04X}); keep each entry on one line and give one line per list entry",
                    c.escape_debug(),
                    c as u32
                ),
            ));
        }
        if let Some(c) = crate::font::unsupported_chars(text).first() {
            return Err(self.error(
                &v.span(),
                field,
                &format!(
                    "the shipped font (DejaVu Sans) cannot print '{}' (U+{:04X}); use Latin, Greek or Cyrillic letters, digits and common symbols",
                    c.escape_debug(),
                    *c as u32
                ),
            ));
        }
        Ok(())
    }
}

/// [`SheetText`] as written, with the place of every value.
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSheet {
    heading: Spanned<String>,
    instructions: Spanned<Vec<Spanned<String>>>,
    columns: Spanned<Vec<Spanned<String>>>,
}

/// [`CommonText`] as written, with the place of every value.
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCommon {
    safety: Spanned<String>,
    scale_check: Spanned<String>,
    scale_check_vertical: Spanned<String>,
    scale_hint: Spanned<String>,
}

/// Columns of a sheet template's measurement table: as many as its shipped
/// file has (four for most kinds), since the kind fills that many cells a row.
fn shipped_columns(name: &str) -> usize {
    shipped_text(name)
        .and_then(|t| toml::from_str::<RawSheet>(t).ok())
        .map_or(4, |r| r.columns.get_ref().len())
}

fn check_sheet(src: &Source<'_>, want_columns: usize) -> Result<SheetText, String> {
    let t: RawSheet = src.parse()?;
    src.printable(&t.heading, "heading")?;
    let lines = t.instructions.get_ref();
    if lines.len() > MAX_INSTRUCTIONS {
        return Err(src.error(
            &t.instructions.span(),
            "instructions",
            &format!("{} lines is more than the {MAX_INSTRUCTIONS} a sheet has room for", lines.len()),
        ));
    }
    for (i, l) in lines.iter().enumerate() {
        src.printable(l, &format!("instructions[{}]", i + 1))?;
    }
    let columns = t.columns.get_ref();
    if columns.len() != want_columns {
        return Err(src.error(
            &t.columns.span(),
            "columns",
            &format!("the measurement table has {want_columns} columns; {} were given", columns.len()),
        ));
    }
    for (i, c) in columns.iter().enumerate() {
        src.printable(c, &format!("columns[{}]", i + 1))?;
    }
    let mut places = std::collections::BTreeMap::new();
    places.insert("heading".to_string(), src.place(&t.heading.span(), "heading"));
    for (list, v) in [("instructions", lines), ("columns", columns)] {
        for (i, l) in v.iter().enumerate() {
            let field = format!("{list}[{}]", i + 1);
            places.insert(field.clone(), src.place(&l.span(), &field));
        }
    }
    let text = |v: &[Spanned<String>]| v.iter().map(|s| s.get_ref().clone()).collect();
    Ok(SheetText {
        heading: t.heading.get_ref().clone(),
        instructions: text(lines),
        columns: text(columns),
        places: Places(places),
    })
}

fn check_common(src: &Source<'_>) -> Result<CommonText, String> {
    let c: RawCommon = src.parse()?;
    for (field, v) in [
        ("safety", &c.safety),
        ("scale_check", &c.scale_check),
        ("scale_check_vertical", &c.scale_check_vertical),
        ("scale_hint", &c.scale_hint),
    ] {
        src.printable(v, field)?;
    }
    let places = [
        ("safety", &c.safety),
        ("scale_check", &c.scale_check),
        ("scale_check_vertical", &c.scale_check_vertical),
        ("scale_hint", &c.scale_hint),
    ]
    .into_iter()
    .map(|(f, v)| (f.to_string(), src.place(&v.span(), f)))
    .collect();
    Ok(CommonText {
        places: Places(places),
        safety: c.safety.into_inner(),
        scale_check: c.scale_check.into_inner(),
        scale_check_vertical: c.scale_check_vertical.into_inner(),
        scale_hint: c.scale_hint.into_inner(),
    })
}

/// `words.toml` checked against the shipped one: every key known, the same
/// `{slots}` as the shipped text (a slot left out would drop a number; an
/// unknown one would print as written), printable text. Keys left out keep
/// the shipped text.
fn check_words(src: &Source<'_>) -> Result<(Words, Places), String> {
    let shipped: std::collections::BTreeMap<String, String> = toml::from_str(crate::draw::words::SHIPPED)
        .map_err(|e| format!("templates/{WORDS_FILE}: the shipped file does not parse: {}", e.message()))?;
    let given: std::collections::BTreeMap<Spanned<String>, Spanned<String>> = src.parse()?;
    let mut text = shipped.clone();
    let mut places = std::collections::BTreeMap::new();
    for (key, value) in &given {
        let k = key.get_ref();
        let Some(theirs) = shipped.get(k) else {
            let near = nearest_key(k, shipped.keys());
            return Err(src.error(
                &key.span(),
                k,
                &format!(
                    "no such key in {WORDS_FILE}{}; `raysheet templates --out DIR` writes the file with every key",
                    near.map(|n| format!(" (did you mean `{n}`?)")).unwrap_or_default()
                ),
            ));
        };
        src.printable(value, k)?;
        let want = slots_in(theirs);
        let have = slots_in(value.get_ref());
        let list = |v: &[String]| {
            if v.is_empty() {
                "none".to_string()
            } else {
                v.iter().map(|s| format!("{{{s}}}")).collect::<Vec<_>>().join(", ")
            }
        };
        if let Some(extra) = have.iter().find(|s| !want.contains(s)) {
            return Err(src.error(
                &value.span(),
                k,
                &format!("unknown placeholder {{{extra}}}; this text takes {}", list(&want)),
            ));
        }
        if let Some(missing) = want.iter().find(|s| !have.contains(s)) {
            return Err(src.error(
                &value.span(),
                k,
                &format!(
                    "placeholder {{{missing}}} is missing, so its value would not be printed; this text takes {}",
                    list(&want)
                ),
            ));
        }
        places.insert(k.clone(), src.place(&value.span(), k));
        text.insert(k.clone(), value.get_ref().clone());
    }
    Ok((Words::from_map(text), Places(places)))
}

/// The shipped key closest to a mistyped one (by edit distance, at most a third of its length).
fn nearest_key<'a>(key: &str, keys: impl Iterator<Item = &'a String>) -> Option<&'a String> {
    let distance = |a: &str, b: &str| {
        let b: Vec<char> = b.chars().collect();
        let mut row: Vec<usize> = (0..=b.len()).collect();
        for (i, ca) in a.chars().enumerate() {
            let mut prev = row[0];
            row[0] = i + 1;
            for (j, cb) in b.iter().enumerate() {
                let cur = row[j + 1];
                row[j + 1] = (prev + usize::from(ca != *cb)).min(row[j] + 1).min(row[j + 1] + 1);
                prev = cur;
            }
        }
        row[b.len()]
    };
    keys.map(|k| (distance(key, k), k)).filter(|(d, _)| *d * 3 <= key.chars().count()).min().map(|(_, k)| k)
}

impl Templates {
    /// The templates shipped in `templates/`. An error names the template file;
    /// the `shipped_templates_parse` test keeps them valid.
    pub fn shipped() -> Result<Templates, String> {
        Templates::with_overrides(&std::collections::BTreeMap::new())
    }

    /// The shipped templates with some files replaced: `overrides` maps a file
    /// name from [`FILES`] to (the path to show in messages, its text). Each
    /// file is checked: TOML syntax and fields, printable text, at most
    /// [`MAX_INSTRUCTIONS`] instruction lines, as many table columns as the shipped file. Every error
    /// names the file, line, column and field, on one line.
    pub fn with_overrides(
        overrides: &std::collections::BTreeMap<String, (String, String)>,
    ) -> Result<Templates, String> {
        let get = |name: &str| -> (String, String) {
            match overrides.get(name) {
                Some((shown, text)) => (shown.clone(), text.clone()),
                None => (format!("templates/{name}"), shipped_text(name).unwrap_or_default().to_string()),
            }
        };
        let (shown, text) = get("common.toml");
        let common = check_common(&Source { shown: &shown, text: &text })?;
        let mut sheets = std::collections::BTreeMap::new();
        for name in FILES.iter().filter(|n| !["common.toml", WORDS_FILE].contains(*n)) {
            let (shown, text) = get(name);
            sheets.insert(*name, check_sheet(&Source { shown: &shown, text: &text }, shipped_columns(name))?);
        }
        let (shown, text) = get(WORDS_FILE);
        let (words, word_places) = check_words(&Source { shown: &shown, text: &text })?;
        Ok(Templates { sheets, common, words, word_places })
    }

    /// The text of one sheet template. A name not in [`FILES`] is a bug in a
    /// sheet kind; the shipped curved-face text stands in for it.
    pub fn sheet(&self, name: &str) -> &SheetText {
        self.sheets
            .get(name)
            .or_else(|| self.sheets.values().next())
            .expect("the shipped templates are parsed")
    }
}

#[cfg(test)]
mod tests {
    use std::collections::BTreeMap;

    fn one(name: &str, text: &str) -> BTreeMap<String, (String, String)> {
        BTreeMap::from([(name.to_string(), (format!("mine/{name}"), text.to_string()))])
    }

    #[test]
    fn overrides_replace_one_file_and_are_checked() {
        let mine = "heading = \"Brechung\"\ninstructions = [\"1. Prüfen\"]\ncolumns = [\"a\", \"b\", \"c\", \"d\"]\n";
        let t = super::Templates::with_overrides(&one("curved-face.toml", mine)).unwrap();
        assert_eq!(t.sheet("curved-face.toml").heading, "Brechung");
        assert_eq!(t.sheet("focal.toml").columns.len(), 4);
        let bad = super::Templates::with_overrides(&one(
            "focal.toml",
            "heading = \"x\"\ninstructions = []\ncolumns = [\"a\"]\n",
        ));
        // Line 3, column 11: where the list opens.
        assert!(bad.unwrap_err().starts_with("mine/focal.toml:3:11: field `columns`"));
        let syntax = super::Templates::with_overrides(&one("common.toml", "safety = \n")).unwrap_err();
        assert!(syntax.starts_with("mine/common.toml:1:") && !syntax.contains('\n'), "{syntax}");
        let glyph = super::Templates::with_overrides(&one(
            "focal.toml",
            "heading = \"漢\"\ninstructions = []\ncolumns = [\"a\",\"b\",\"c\",\"d\"]\n",
        ));
        assert!(glyph.unwrap_err().contains("U+6F22"));
    }

    /// Issue 12, finding 7: template errors named the file and field but not
    /// the line, and a template with a newline in a heading printed the raw
    /// newline inside the message.
    #[test]
    fn template_errors_without_a_line_number() {
        let cols = "columns = [\"a\", \"b\", \"c\", \"d\"]";
        let cases = [
            // (file text, line:column, field, words)
            (
                format!("heading = \"\"\"two\nlines\"\"\"\ninstructions = []\n{cols}\n"),
                "1:11",
                "heading",
                "U+000A",
            ),
            (
                format!(
                    "heading = \"x\"\ninstructions = [\"1\", \"2\", \"3\", \"4\", \"5\", \"6\", \"7\", \"8\"]\n{cols}\n"
                ),
                "2:16",
                "instructions",
                "8 lines",
            ),
            (
                format!("heading = \"x\"\ninstructions = [\"ok\",\n  \"tab\\there\"]\n{cols}\n"),
                "3:3",
                "instructions[2]",
                "U+0009",
            ),
            (
                "heading = \"x\"\ninstructions = []\ncolumns = [\"a\", \"b\", \"c\", \"漢\"]\n".to_string(),
                "3:27",
                "columns[4]",
                "U+6F22",
            ),
            (
                "heading = \"x\"\ninstructions = []\n\ncolumns = [\"a\"]\n".to_string(),
                "4:11",
                "columns",
                "4 columns",
            ),
        ];
        for (text, at, field, words) in cases {
            let err = super::Templates::with_overrides(&one("focal.toml", &text)).unwrap_err();
            assert!(err.starts_with(&format!("mine/focal.toml:{at}: field `{field}`: ")), "{err}");
            assert!(err.contains(words) && !err.contains('\n') && !err.contains('\t'), "{err:?}");
        }
    }

    /// Issue 9: words.toml errors name the file, line, column and key, and
    /// say what is accepted.
    #[test]
    fn words_errors_name_the_key_and_what_is_accepted() {
        let cases = [
            ("optical_axes = \"x\"\n", "1:1: field `optical_axes`", "did you mean `optical_axis`?"),
            ("\n  normal = \"x\"\nray_box = 3\n", "3:11", "string"),
            (
                "not_graded = \"{valeur} (non noté)\"\n",
                "1:14: field `not_graded`",
                "unknown placeholder {valeur}; this text takes {value}",
            ),
            (
                "identity_variant = \"variante\"\n",
                "1:20: field `identity_variant`",
                "placeholder {code} is missing",
            ),
            ("optical_axis = \"漢\"\n", "1:16: field `optical_axis`", "U+6F22"),
        ];
        for (text, at, words) in cases {
            let err = super::Templates::with_overrides(&one("words.toml", text)).unwrap_err();
            assert!(err.starts_with(&format!("mine/words.toml:{at}")), "{err}");
            assert!(err.contains(words) && !err.contains('\n'), "{err}");
        }
        let t = super::Templates::with_overrides(&one(
            "words.toml",
            "# nur eins\noptical_axis = \"optische Achse\"\nnot_graded = \"{value} (ohne Wertung)\"\n",
        ))
        .unwrap();
        assert_eq!(t.words.say("optical_axis"), "optische Achse");
        assert_eq!(t.words.fill("not_graded", &[("value", "12.5")]), "12.5 (ohne Wertung)");
        assert_eq!(t.words.say("normal"), "normal", "a key left out keeps the shipped text");
        assert_eq!(
            t.word_places.get("optical_axis").map(String::as_str),
            Some("mine/words.toml:2:16: field `optical_axis`")
        );
    }

    #[test]
    fn shipped_templates_parse() {
        let t = super::Templates::shipped().unwrap();
        for name in super::FILES.iter().filter(|n| !["common.toml", "words.toml"].contains(*n)) {
            assert!(!t.sheet(name).instructions.is_empty(), "{name}");
            // Four columns, five on the index sheet (ray, i, r, sin i, sin r)
            // and the spectrum sheet (ray, colour, i, e, δ).
            let want = if ["index.toml", "spectrum.toml"].contains(name) { 5 } else { 4 };
            assert_eq!(t.sheet(name).columns.len(), want, "{name}");
        }
    }
}
