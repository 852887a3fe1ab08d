//! The printed words that are not a sheet's own template text (drawing
//! labels, key lines, answer labels, headers, tile notes, summary pages), by
//! key, from `templates/words.toml`, with `{slot}` placeholders that code
//! fills with values it has formatted.
//!
//! The shipped file is compiled in; `layout` checks an edited copy (unknown
//! keys, placeholders, printable text, with the file's line) and hands the
//! result down to the sheet kinds as a [`Words`] value.

use std::collections::BTreeMap;

/// The shipped `templates/words.toml`.
pub const SHIPPED: &str = include_str!("../../templates/words.toml");

/// Printed words by key.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Words {
    text: BTreeMap<String, String>,
}

impl Words {
    /// The shipped words. The `shipped_words_parse` test keeps the file
    /// valid; were it not, every key would print as itself (never a panic).
    pub fn shipped() -> Words {
        Words { text: toml::from_str(SHIPPED).unwrap_or_default() }
    }

    /// Words from a checked table of key → text.
    pub fn from_map(text: BTreeMap<String, String>) -> Words {
        Words { text }
    }

    /// Every key and its text, in key order.
    pub fn iter(&self) -> impl Iterator<Item = (&str, &str)> {
        self.text.iter().map(|(k, v)| (k.as_str(), v.as_str()))
    }

    /// The text of `key` (a key that does not exist prints as itself; the
    /// `every_key_the_code_uses_is_shipped` test keeps that from happening).
    pub fn say<'a>(&'a self, key: &'a str) -> &'a str {
        self.text.get(key).map_or(key, String::as_str)
    }

    /// The text of `key` with each `{name}` replaced by its value from
    /// `slots`, in one pass (a value holding braces stays as it is).
    pub fn fill(&self, key: &str, slots: &[(&str, &str)]) -> String {
        fill_slots(self.say(key), slots)
    }
}

impl Words {
    /// The key whose text, with its slots filled by anything, reads `printed`
    /// (the one with the most fixed text when several do): for naming the
    /// key of a printed line that does not fit.
    pub fn key_of(&self, printed: &str) -> Option<&str> {
        self.text
            .iter()
            .filter(|(_, t)| fixed_parts(t).iter().map(|p| p.trim().len()).sum::<usize>() >= 2)
            .filter(|(_, t)| matches_pattern(t, printed))
            .max_by_key(|(_, t)| fixed_len(t))
            .map(|(k, _)| k.as_str())
    }
}

/// The pieces of `text` between its `{slots}`.
fn fixed_parts(text: &str) -> Vec<&str> {
    let mut parts = Vec::new();
    let mut rest = text;
    while let Some(open) = rest.find('{') {
        match rest[open..].find('}') {
            Some(close) => {
                parts.push(&rest[..open]);
                rest = &rest[open + close + 1..];
            }
            None => break,
        }
    }
    parts.push(rest);
    parts
}

fn fixed_len(text: &str) -> usize {
    fixed_parts(text).iter().map(|p| p.len()).sum()
}

/// Whether `printed` is `text` with its slots filled by anything.
fn matches_pattern(text: &str, printed: &str) -> bool {
    let parts = fixed_parts(text);
    let (first, last) = (parts[0], parts[parts.len() - 1]);
    if parts.len() == 1 {
        return printed == first;
    }
    if printed.len() < first.len() + last.len()
        || !printed.starts_with(first)
        || !printed[first.len()..].ends_with(last)
    {
        return false;
    }
    let mut rest = &printed[first.len()..printed.len() - last.len()];
    for mid in &parts[1..parts.len() - 1] {
        match rest.find(mid) {
            Some(i) => rest = &rest[i + mid.len()..],
            None => return false,
        }
    }
    true
}

/// `text` with each `{name}` of `slots` replaced by its value; any other
/// braces are kept.
pub fn fill_slots(text: &str, slots: &[(&str, &str)]) -> String {
    let mut out = String::with_capacity(text.len());
    let mut rest = text;
    while let Some(open) = rest.find('{') {
        out.push_str(&rest[..open]);
        let after = &rest[open + 1..];
        match after.find('}').and_then(|close| {
            let name = &after[..close];
            slots.iter().find(|(n, _)| *n == name).map(|(_, v)| (close, *v))
        }) {
            Some((close, value)) => {
                out.push_str(value);
                rest = &after[close + 1..];
            }
            None => {
                out.push('{');
                rest = after;
            }
        }
    }
    out.push_str(rest);
    out
}

/// The `{name}` placeholders in `text`, in order of first appearance (a name
/// is letters, digits and `_`).
pub fn slots_in(text: &str) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    let mut rest = text;
    while let Some(open) = rest.find('{') {
        let after = &rest[open + 1..];
        match after.find('}') {
            Some(close) => {
                let name = &after[..close];
                if !out.iter().any(|n| n == name) {
                    out.push(name.to_string());
                }
                rest = &after[close + 1..];
            }
            None => break,
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fill_replaces_named_slots_once() {
        let s = fill_slots("{a} mm before {b}, {a}; {c}", &[("a", "12.5"), ("b", "{a}")]);
        assert_eq!(s, "12.5 mm before {a}, 12.5; {c}");
        assert_eq!(slots_in("{value} mm {where} {value} {"), ["value", "where"]);
    }

    #[test]
    fn key_of_finds_the_text_a_line_was_filled_from() {
        let w = Words::shipped();
        assert_eq!(w.key_of("A, B: 12.5 mm from the flat face"), Some("crossing_label"));
        assert_eq!(w.key_of("optical axis"), Some("optical_axis"));
        assert_eq!(w.key_of("no text reads like this"), None);
    }

    #[test]
    fn shipped_words_parse() {
        let w: BTreeMap<String, String> =
            toml::from_str(SHIPPED).expect("templates/words.toml is a table of strings");
        assert!(w.len() > 50, "{}", w.len());
        assert_eq!(Words::shipped().say("optical_axis"), "optical axis");
        assert_eq!(Words::shipped().say("no_such_key"), "no_such_key");
    }

    /// Every key the code asks for (`say("…")`, `fill("…"`, and `with("…"`
    /// in the band reasons) is in the shipped file, and every shipped key is used.
    #[test]
    fn every_key_the_code_uses_is_shipped() {
        let shipped = Words::shipped();
        let mut used = std::collections::BTreeSet::new();
        let root = concat!(env!("CARGO_MANIFEST_DIR"), "/src");
        let mut dirs = vec![std::path::PathBuf::from(root)];
        while let Some(d) = dirs.pop() {
            for e in std::fs::read_dir(&d).expect("src is readable").flatten() {
                let p = e.path();
                if p.is_dir() {
                    dirs.push(p);
                } else if p.extension().is_some_and(|x| x == "rs") && !p.ends_with("words.rs") {
                    let text = std::fs::read_to_string(&p).expect("a source file");
                    for pat in ["w.say(", "w.fill(", "words.say(", "words.fill(", " with("] {
                        for (i, _) in text.match_indices(pat) {
                            let rest = text[i + pat.len()..].trim_start();
                            let Some(rest) = rest.strip_prefix('"') else { continue };
                            let key = &rest[..rest.find('"').expect("a closing quote")];
                            used.insert(key.to_string());
                            assert!(
                                shipped.text.contains_key(key),
                                "{}: key `{key}` is not in templates/words.toml",
                                p.display()
                            );
                        }
                    }
                }
            }
        }
        let unused: Vec<&String> = shipped.text.keys().filter(|k| !used.contains(*k)).collect();
        assert!(unused.is_empty(), "keys in templates/words.toml no code prints: {unused:?}");
    }
}
