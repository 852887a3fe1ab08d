//! The editable sheet text in `templates/`, compiled in.

use serde::Deserialize;

/// Text for one sheet kind.
#[derive(Deserialize, Debug, Clone)]
#[serde(deny_unknown_fields)]
pub struct SheetText {
    /// Heading printed at the top.
    pub heading: String,
    /// Numbered instruction lines.
    pub instructions: Vec<String>,
    /// Column headings of the measurement table.
    pub columns: Vec<String>,
}

/// Text printed on every sheet.
#[derive(Deserialize, Debug, Clone)]
#[serde(deny_unknown_fields)]
pub struct CommonText {
    /// The one-line safety caution.
    pub safety: String,
    /// Label of the 100 mm scale bar.
    pub scale_check: String,
    /// Label of the 50 mm scale bar.
    pub scale_check_vertical: String,
    /// What to do if a bar is wrong.
    pub scale_hint: String,
}

/// All templates, parsed.
#[derive(Debug, Clone)]
pub struct Templates {
    /// Sheet text by template file name (`curved-face.toml`, `block.toml`, …).
    pub sheets: std::collections::BTreeMap<&'static str, SheetText>,
    /// Every sheet.
    pub common: CommonText,
}

/// The template files, as named in `templates/`, with their shipped text.
const SHIPPED: &[(&str, &str)] = &[
    ("curved-face.toml", include_str!("../../templates/curved-face.toml")),
    ("focal.toml", include_str!("../../templates/focal.toml")),
    ("focal-diverging.toml", include_str!("../../templates/focal-diverging.toml")),
    ("block.toml", include_str!("../../templates/block.toml")),
    ("prism.toml", include_str!("../../templates/prism.toml")),
    ("prism-turn.toml", include_str!("../../templates/prism-turn.toml")),
    ("common.toml", include_str!("../../templates/common.toml")),
];

/// The template files, as named in `templates/`.
pub const FILES: &[&str] = &[
    "curved-face.toml",
    "focal.toml",
    "focal-diverging.toml",
    "block.toml",
    "prism.toml",
    "prism-turn.toml",
    "common.toml",
];

/// The shipped text of a template file (`None` for an unknown name).
pub fn shipped_text(name: &str) -> Option<&'static str> {
    SHIPPED.iter().find(|(n, _)| *n == name).map(|(_, t)| *t)
}

/// Most instruction lines a sheet has room for.
pub const MAX_INSTRUCTIONS: usize = 7;

fn parse<T: for<'de> Deserialize<'de>>(text: &str, shown: &str) -> Result<T, String> {
    toml::from_str(text).map_err(|e| format!("{shown}: {}", e.to_string().trim_end()))
}

fn printable(text: &str, shown: &str, field: &str) -> Result<(), String> {
    let missing = crate::font::unsupported_chars(text);
    if let Some(c) = missing.first() {
        return Err(format!(
            "{shown}: field `{field}`: the shipped font (DejaVu Sans) cannot print '{c}' (U+{:04X}); use Latin, Greek or Cyrillic letters, digits and common symbols",
            *c as u32
        ));
    }
    if text.chars().any(char::is_control) {
        return Err(format!(
            "{shown}: field `{field}`: contains a control character; give one line per list entry"
        ));
    }
    Ok(())
}

fn check_sheet(t: &SheetText, shown: &str) -> Result<(), String> {
    printable(&t.heading, shown, "heading")?;
    if t.instructions.len() > MAX_INSTRUCTIONS {
        return Err(format!(
            "{shown}: field `instructions`: {} lines is more than the {MAX_INSTRUCTIONS} a sheet has room for",
            t.instructions.len()
        ));
    }
    for (i, l) in t.instructions.iter().enumerate() {
        printable(l, shown, &format!("instructions[{}]", i + 1))?;
    }
    if t.columns.len() != 4 {
        return Err(format!(
            "{shown}: field `columns`: the measurement table has 4 columns; {} were given",
            t.columns.len()
        ));
    }
    for (i, c) in t.columns.iter().enumerate() {
        printable(c, shown, &format!("columns[{}]", i + 1))?;
    }
    Ok(())
}

impl Templates {
    /// The templates shipped in `templates/`. An error names the template file;
    /// the `shipped_templates_parse` test keeps them valid.
    pub fn shipped() -> Result<Templates, String> {
        Templates::with_overrides(&std::collections::BTreeMap::new())
    }

    /// The shipped templates with some files replaced: `overrides` maps a file
    /// name from [`FILES`] to (the path to show in messages, its text). Each
    /// file is checked: TOML syntax and fields (located), printable text, at
    /// most [`MAX_INSTRUCTIONS`] instruction lines, four table columns.
    pub fn with_overrides(
        overrides: &std::collections::BTreeMap<String, (String, String)>,
    ) -> Result<Templates, String> {
        let get = |name: &str| -> (String, String) {
            match overrides.get(name) {
                Some((shown, text)) => (shown.clone(), text.clone()),
                None => (format!("templates/{name}"), shipped_text(name).unwrap_or_default().to_string()),
            }
        };
        let sheet = |name: &str| -> Result<SheetText, String> {
            let (shown, text) = get(name);
            let t: SheetText = parse(&text, &shown)?;
            check_sheet(&t, &shown)?;
            Ok(t)
        };
        let (shown, text) = get("common.toml");
        let common: CommonText = parse(&text, &shown)?;
        for (field, v) in [
            ("safety", &common.safety),
            ("scale_check", &common.scale_check),
            ("scale_check_vertical", &common.scale_check_vertical),
            ("scale_hint", &common.scale_hint),
        ] {
            printable(v, &shown, field)?;
        }
        let mut sheets = std::collections::BTreeMap::new();
        for name in FILES.iter().filter(|n| **n != "common.toml") {
            sheets.insert(*name, sheet(name)?);
        }
        Ok(Templates { sheets, common })
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
        assert!(bad.unwrap_err().contains("mine/focal.toml: field `columns`"));
        let syntax = super::Templates::with_overrides(&one("common.toml", "safety = \n")).unwrap_err();
        assert!(syntax.starts_with("mine/common.toml:") && syntax.contains("line 1"), "{syntax}");
        let glyph = super::Templates::with_overrides(&one(
            "focal.toml",
            "heading = \"漢\"\ninstructions = []\ncolumns = [\"a\",\"b\",\"c\",\"d\"]\n",
        ));
        assert!(glyph.unwrap_err().contains("U+6F22"));
    }

    #[test]
    fn shipped_templates_parse() {
        let t = super::Templates::shipped().unwrap();
        for name in super::FILES.iter().filter(|n| **n != "common.toml") {
            assert!(!t.sheet(name).instructions.is_empty(), "{name}");
            assert_eq!(t.sheet(name).columns.len(), 4, "{name}");
        }
    }
}
