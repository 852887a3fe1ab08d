//! Kit errors that point at the file, line, column and field, with a hint.

use std::fmt;

/// A problem in a kit file, located.
#[derive(Clone, Debug, PartialEq)]
pub struct KitError {
    /// The file name as the user gave it.
    pub file: String,
    /// 1-based line.
    pub line: usize,
    /// 1-based column (characters).
    pub column: usize,
    /// The field, as a path (`pieces[2].thickness_mm`); empty when unknown.
    pub field: String,
    /// What is wrong.
    pub message: String,
    /// What would be accepted.
    pub hint: String,
    /// The offending source line, for the caret display.
    pub source_line: String,
}

impl fmt::Display for KitError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}:{}:{}: ", self.file, self.line, self.column)?;
        if !self.field.is_empty() {
            write!(f, "field `{}`: ", self.field)?;
        }
        write!(f, "{}", self.message)?;
        if !self.source_line.is_empty() {
            let gutter = self.line.to_string().len();
            write!(
                f,
                "\n{:gutter$} |\n{} | {}\n{:gutter$} | {}^",
                "",
                self.line,
                self.source_line,
                "",
                " ".repeat(self.column.saturating_sub(1))
            )?;
        }
        if !self.hint.is_empty() {
            write!(f, "\n  hint: {}", self.hint)?;
        }
        Ok(())
    }
}

impl std::error::Error for KitError {}

/// "did you mean `x`? " for the accepted name nearest to `name` (at most three
/// edits away), else nothing.
pub fn did_you_mean(name: &str, known: &[&str]) -> String {
    known
        .iter()
        .map(|k| (strsim::damerau_levenshtein(name, k), *k))
        .min()
        .filter(|(d, _)| *d <= 3)
        .map(|(_, k)| format!("did you mean `{k}`? "))
        .unwrap_or_default()
}

/// Turns byte offsets into lines and columns and finds the key path at an offset.
pub(super) struct Locator<'a> {
    pub file: &'a str,
    pub text: &'a str,
}

impl Locator<'_> {
    /// 1-based line and column of byte `offset`.
    pub fn line_col(&self, offset: usize) -> (usize, usize) {
        let offset = offset.min(self.text.len());
        let before = &self.text[..floor_char(self.text, offset)];
        let line = before.matches('\n').count() + 1;
        let col = before.rsplit('\n').next().map(|s| s.chars().count()).unwrap_or(0) + 1;
        (line, col)
    }

    fn line_text(&self, line: usize) -> String {
        self.text.lines().nth(line - 1).unwrap_or("").trim_end().chars().take(160).collect()
    }

    /// An error at byte `offset`.
    pub fn error(
        &self,
        offset: usize,
        field: impl Into<String>,
        message: impl Into<String>,
        hint: impl Into<String>,
    ) -> KitError {
        let (line, column) = self.line_col(offset);
        KitError {
            file: self.file.to_string(),
            line,
            column,
            field: field.into(),
            message: message.into(),
            hint: hint.into(),
            source_line: self.line_text(line),
        }
    }

    /// The dotted key path of the value at `offset`, from the nearest table
    /// header above it and the key on its own line: `pieces[3].height_mm`.
    pub fn key_path_at(&self, offset: usize) -> String {
        let (line, _) = self.line_col(offset);
        let lines: Vec<&str> = self.text.lines().collect();
        let here = lines.get(line - 1).copied().unwrap_or("");
        let key = here.split_once('=').map(|(k, _)| k.trim().trim_matches('"').to_string());
        let mut header = String::new();
        let mut counts: std::collections::BTreeMap<String, usize> = Default::default();
        for l in lines.iter().take(line) {
            let t = l.trim();
            if let Some(name) = t.strip_prefix("[[").and_then(|r| r.split("]]").next()) {
                let name = name.trim().to_string();
                let n = counts.entry(name.clone()).or_insert(0);
                *n += 1;
                header = format!("{name}[{}]", *n);
            } else if let Some(name) = t.strip_prefix('[').and_then(|r| r.split(']').next()) {
                header = name.trim().to_string();
            }
        }
        match (header.is_empty(), key) {
            (_, Some(k)) if here.trim_start().starts_with('[') => k,
            (true, Some(k)) => k,
            (false, Some(k)) => format!("{header}.{k}"),
            (_, None) => header,
        }
    }
}

fn floor_char(s: &str, mut i: usize) -> usize {
    while i > 0 && !s.is_char_boundary(i) {
        i -= 1;
    }
    i
}
