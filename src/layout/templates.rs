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
    /// Curved-face sheets.
    pub curved_face: SheetText,
    /// Focal sheets, converging piece.
    pub focal: SheetText,
    /// Focal sheets, diverging piece.
    pub focal_diverging: SheetText,
    /// Every sheet.
    pub common: CommonText,
}

const CURVED: &str = include_str!("../../templates/curved-face.toml");
const FOCAL: &str = include_str!("../../templates/focal.toml");
const DIVERGING: &str = include_str!("../../templates/focal-diverging.toml");
const COMMON: &str = include_str!("../../templates/common.toml");

impl Templates {
    /// The templates shipped in `templates/`. An error names the template file;
    /// the `shipped_templates_parse` test keeps them valid.
    pub fn shipped() -> Result<Templates, String> {
        fn parse<T: for<'de> Deserialize<'de>>(text: &str, name: &str) -> Result<T, String> {
            toml::from_str(text).map_err(|e| format!("templates/{name}: {e}"))
        }
        Ok(Templates {
            curved_face: parse(CURVED, "curved-face.toml")?,
            focal: parse(FOCAL, "focal.toml")?,
            focal_diverging: parse(DIVERGING, "focal-diverging.toml")?,
            common: parse(COMMON, "common.toml")?,
        })
    }
}

#[cfg(test)]
mod tests {
    #[test]
    fn shipped_templates_parse() {
        let t = super::Templates::shipped().unwrap();
        assert!(!t.curved_face.instructions.is_empty());
        assert_eq!(t.focal.columns.len(), 4);
    }
}
