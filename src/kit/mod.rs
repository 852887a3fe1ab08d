//! The kit file: its TOML mirror and its validation into a normalized [`Kit`]:
//! millimetres, defaults filled, names resolved. Nothing past this module sees
//! TOML or a raw unit.
#![expect(
    clippy::result_large_err,
    reason = "a kit error is made at most once per run and carries its whole location; boxing it buys nothing"
)]

mod error;
mod group_name;
mod raw;

use std::collections::BTreeMap;

pub use error::KitError;
use error::Locator;
pub use group_name::{MAX_NAME_CHARS, group_name_problem};
use raw::{RawKit, RawPiece, RawSheet, TABLE_FIELDS};
use toml::Spanned;

use crate::optics::{Entry, Face, Lens as Piece, Paraxial};
use crate::paper::{Orientation, PaperSize, PaperSpec};

/// The ray box: parallel rays for focal-length sheets.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RayBox {
    /// Number of parallel rays (1–9).
    pub rays: u32,
    /// Centre-to-centre spacing on paper, mm.
    pub spacing_mm: f64,
    /// Width of one ray on paper, mm.
    pub ray_width_mm: f64,
}

impl Default for RayBox {
    /// Five rays 8 mm apart, 2 mm wide: the middle of what classroom ray boxes
    /// give (DESIGN.md: one to five rays, 1–3 mm wide, 5–15 mm apart, *memory*).
    fn default() -> RayBox {
        RayBox { rays: 5, spacing_mm: 8.0, ray_width_mm: 2.0 }
    }
}

/// What a sheet asks students to do.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum SheetKind {
    /// Single guide rays: flat face first, refraction at the curved face.
    CurvedFace,
    /// The ray box's parallel beam through a converging or diverging piece.
    Focal,
}

impl SheetKind {
    /// The kit-file word.
    pub fn as_str(self) -> &'static str {
        match self {
            SheetKind::CurvedFace => "curved-face",
            SheetKind::Focal => "focal",
        }
    }

    /// A title for the sheet.
    pub fn title(self) -> &'static str {
        match self {
            SheetKind::CurvedFace => "Refraction at a curved face",
            SheetKind::Focal => "Focal length of a lens shape",
        }
    }
}

/// A piece of the kit with its name and material resolved.
#[derive(Clone, Debug, PartialEq)]
pub struct KitPiece {
    /// The kit's id for the piece.
    pub id: String,
    /// A longer name, if the kit gives one.
    pub label: Option<String>,
    /// Material name.
    pub material: String,
    /// The checked optical piece (index resolved from the material).
    pub piece: Piece,
    /// Line of the `[[pieces]]` entry, for messages.
    pub line: usize,
}

/// One sheet asked for by the kit.
#[derive(Clone, Debug, PartialEq)]
pub struct SheetSpec {
    /// 1-based position in the kit's `[[sheets]]` list.
    pub number: usize,
    /// What kind of sheet.
    pub kind: SheetKind,
    /// Index into [`Kit::pieces`].
    pub piece: usize,
    /// Which face the light meets first.
    pub entry: Entry,
    /// Whether class variants may turn the piece round (only where the sheet kind allows).
    pub vary_entry: bool,
    /// Fixed guide heights, mm (signed, + above the axis); `None`: chosen in the safe band.
    pub heights_mm: Option<Vec<f64>>,
    /// Line of the `[[sheets]]` entry.
    pub line: usize,
}

/// How the class is split into groups.
#[derive(Clone, Debug, PartialEq, Default)]
pub enum Groups {
    /// One ungrouped set.
    #[default]
    None,
    /// Groups named `Group 1` … `Group n`.
    Count(usize),
    /// Groups with these names, exactly as written.
    Names(Vec<String>),
}

/// The `[class]` table.
#[derive(Clone, Debug, PartialEq)]
pub struct ClassSpec {
    /// The groups.
    pub groups: Groups,
    /// Seed for the variants; `None`: the command line's or 1.
    pub seed: Option<u64>,
    /// Grid the drawn heights lie on, mm.
    pub grid_mm: f64,
}

impl Default for ClassSpec {
    fn default() -> ClassSpec {
        ClassSpec { groups: Groups::None, seed: None, grid_mm: 0.5 }
    }
}

/// Largest number of groups in a class set (a sane bound on output size).
pub const MAX_GROUPS: usize = 60;

/// A validated kit.
#[derive(Clone, Debug, PartialEq)]
pub struct Kit {
    /// Title printed on every sheet.
    pub title: String,
    /// Index of refraction by material name.
    pub materials: BTreeMap<String, f64>,
    /// The ray box.
    pub ray_box: RayBox,
    /// The pieces, in kit order.
    pub pieces: Vec<KitPiece>,
    /// The sheets, in kit order.
    pub sheets: Vec<SheetSpec>,
    /// The paper from the kit (the command line may override it).
    pub paper: PaperSpec,
    /// The class set.
    pub class: ClassSpec,
}

impl Kit {
    /// Parses and validates kit text. `file` is the name used in messages.
    pub fn from_toml(text: &str, file: &str) -> Result<Kit, KitError> {
        let loc = Locator { file, text };
        let raw: RawKit = toml::from_str(text).map_err(|e| de_error(&loc, &e))?;
        Validator { loc: &loc }.kit(raw)
    }
}

fn de_error(loc: &Locator<'_>, e: &toml::de::Error) -> KitError {
    let offset = e.span().map(|s| s.start).unwrap_or(0);
    let msg = e.message().trim().to_string();
    let path = loc.key_path_at(offset);
    if let Some(rest) = msg.strip_prefix("unknown field `") {
        let name = rest.split('`').next().unwrap_or("");
        let table = path.split(['.', '[']).next().unwrap_or("");
        // `[ray_box]` then `key = …` gives `ray_box.key`; an inline table
        // `ray_box = { … }` gives just `ray_box`, itself a table name.
        let inline = !path.is_empty() && TABLE_FIELDS.iter().any(|(t, _)| !t.is_empty() && *t == path);
        let table = if path.contains('.') || path.contains('[') || inline { table } else { "" };
        let known = TABLE_FIELDS.iter().find(|(t, _)| *t == table).map(|(_, f)| *f).unwrap_or(&[]);
        let best = known
            .iter()
            .map(|k| (strsim::damerau_levenshtein(name, k), *k))
            .min()
            .filter(|(d, _)| *d <= 3)
            .map(|(_, k)| format!("did you mean `{k}`? "))
            .unwrap_or_default();
        let field = if inline { format!("{path}.{name}") } else { path };
        return loc.error(
            offset,
            field,
            format!("unknown field `{name}`"),
            format!("{best}accepted here: {}", known.join(", ")),
        );
    }
    if let Some(rest) = msg.strip_prefix("missing field `") {
        let name = rest.split('`').next().unwrap_or("");
        let table = loc.key_path_at(offset);
        let field = if table.is_empty() { name.to_string() } else { format!("{table}.{name}") };
        return loc.error(
            offset,
            field,
            format!("missing field `{name}`"),
            format!("add `{name} = …` to this table"),
        );
    }
    // Choose the hint from what was expected, not from what was found: "invalid
    // type: integer `10`, expected a sequence" wants a list, not a whole number.
    let expected = msg.rsplit_once("expected ").map(|(_, e)| e).unwrap_or("");
    let hint = if expected.starts_with("f64") || expected.starts_with("a number") {
        "give a number, such as 45 or 45.5".to_string()
    } else if expected.starts_with("i64") || expected.starts_with("an integer") {
        "give a whole number, such as 5".to_string()
    } else if expected.starts_with("a string") || expected.starts_with("string") {
        "give text in double quotes".to_string()
    } else if expected.starts_with("a sequence") {
        "give a list in square brackets, such as [8, -8]".to_string()
    } else if expected.starts_with("a boolean") {
        "give true or false".to_string()
    } else if expected.starts_with("struct") || expected.starts_with("a map") {
        "give a table: a [name] header with `key = value` lines below it".to_string()
    } else {
        "see README.md for the kit format".to_string()
    };
    loc.error(offset, path, plain_type_words(&msg).replace('\n', " "), hint)
}

/// serde's type words in teacher's words: `expected f64` → `expected a number`,
/// `expected a sequence` → `expected a list`, `expected struct RawPiece` →
/// `expected a table` (no Rust names in messages).
fn plain_type_words(msg: &str) -> String {
    let msg = msg
        .replace("expected f64", "expected a number")
        .replace("expected i64", "expected a whole number")
        .replace("expected a sequence", "expected a list");
    match msg.find("expected struct ") {
        Some(i) => {
            let rest = &msg[i + "expected struct ".len()..];
            let tail = rest.find(|c: char| !(c.is_alphanumeric() || c == '_')).map_or("", |j| &rest[j..]);
            format!("{}expected a table{tail}", &msg[..i])
        }
        None => msg,
    }
}

struct Validator<'a> {
    loc: &'a Locator<'a>,
}

impl Validator<'_> {
    fn err<T>(
        &self,
        span: std::ops::Range<usize>,
        field: String,
        message: String,
        hint: &str,
    ) -> Result<T, KitError> {
        Err(self.loc.error(span.start, field, message, hint))
    }

    fn line(&self, span: &std::ops::Range<usize>) -> usize {
        self.loc.line_col(span.start).0
    }

    /// Text printed on the sheets must be one line the shipped font can show.
    fn printable(&self, v: &Spanned<String>, field: String) -> Result<(), KitError> {
        let text = v.get_ref();
        if text.chars().any(char::is_control) {
            return self.err(
                v.span(),
                field,
                "the text contains a control character (a newline or tab)".into(),
                "keep it on one line",
            );
        }
        if text.chars().count() > 120 {
            return self.err(
                v.span(),
                field,
                format!("the text is {} characters long", text.chars().count()),
                "keep it under 120 characters so it fits the sheet's header",
            );
        }
        let missing = crate::font::unsupported_chars(text);
        if !missing.is_empty() {
            let list: Vec<String> = missing.iter().map(|c| format!("'{c}' (U+{:04X})", *c as u32)).collect();
            return self.err(
                v.span(),
                field,
                format!("the shipped font (DejaVu Sans) cannot print {}", list.join(", ")),
                "use Latin, Greek or Cyrillic letters, digits and common symbols",
            );
        }
        Ok(())
    }

    fn positive(&self, v: &Spanned<f64>, field: String, what: &str) -> Result<f64, KitError> {
        let x = *v.get_ref();
        if x.is_finite() && x > 0.0 {
            Ok(x)
        } else {
            self.err(
                v.span(),
                field,
                format!("{x} is not a usable {what}"),
                "give a finite number of millimetres above 0",
            )
        }
    }

    fn kit(&self, raw: RawKit) -> Result<Kit, KitError> {
        if let Some(t) = &raw.title {
            self.printable(t, "title".into())?;
        }
        let title = raw.title.map(|t| t.into_inner()).unwrap_or_else(|| "Ray-optics practical".to_string());
        let mut materials = BTreeMap::new();
        for (name, m) in &raw.materials {
            let n = *m.get_ref().index.get_ref();
            if !(n.is_finite() && n > 1.0) {
                return self.err(
                    m.get_ref().index.span(),
                    format!("materials.{name}.index"),
                    format!("index {n} is not a usable index of refraction"),
                    "give a finite number above 1, at the ray box's wavelength (acrylic is about 1.49)",
                );
            }
            materials.insert(name.clone(), n);
        }
        let ray_box = self.ray_box(raw.ray_box)?;
        let mut pieces: Vec<KitPiece> = Vec::new();
        for (i, p) in raw.pieces.iter().enumerate() {
            let kp = self.piece(i, p, &materials)?;
            if let Some(prev) = pieces.iter().find(|q| q.id == kp.id) {
                return self.err(
                    p.get_ref().id.span(),
                    format!("pieces[{}].id", i + 1),
                    format!("piece id `{}` is used twice (first on line {})", kp.id, prev.line),
                    "give every piece its own id",
                );
            }
            pieces.push(kp);
        }
        let mut sheets = Vec::new();
        for (i, s) in raw.sheets.iter().enumerate() {
            sheets.push(self.sheet(i, s, &pieces)?);
        }
        let paper = self.paper(raw.paper)?;
        let class = self.class(raw.class)?;
        Ok(Kit { title, materials, ray_box, pieces, sheets, paper, class })
    }

    fn ray_box(&self, raw: Option<Spanned<raw::RawRayBox>>) -> Result<RayBox, KitError> {
        let mut rb = RayBox::default();
        let Some(raw) = raw else { return Ok(rb) };
        let raw = raw.into_inner();
        if let Some(r) = raw.rays {
            let n = *r.get_ref();
            if !(1..=9).contains(&n) {
                return self.err(
                    r.span(),
                    "ray_box.rays".into(),
                    format!("{n} rays is not a ray box setting"),
                    "give a whole number from 1 to 9",
                );
            }
            rb.rays = n as u32;
        }
        if let Some(s) = &raw.spacing_mm {
            rb.spacing_mm = self.positive(s, "ray_box.spacing_mm".into(), "ray spacing")?;
        }
        if let Some(w) = &raw.ray_width_mm {
            rb.ray_width_mm = self.positive(w, "ray_box.ray_width_mm".into(), "ray width")?;
            if rb.ray_width_mm >= rb.spacing_mm {
                return self.err(
                    w.span(),
                    "ray_box.ray_width_mm".into(),
                    format!("rays {} mm wide would overlap at {} mm spacing", rb.ray_width_mm, rb.spacing_mm),
                    "the ray width must be less than spacing_mm",
                );
            }
        }
        Ok(rb)
    }

    fn face(&self, v: &Spanned<toml::Value>, field: String) -> Result<Face, KitError> {
        const HINT: &str =
            "give \"flat\" or { curve = \"convex\", radius_mm = 45 } (curve is \"convex\" or \"concave\")";
        match v.get_ref() {
            toml::Value::String(s) if s == "flat" => Ok(Face::Flat),
            toml::Value::String(s) => self.err(v.span(), field, format!("\"{s}\" is not a face shape"), HINT),
            toml::Value::Table(t) => {
                for k in t.keys() {
                    if k != "curve" && k != "radius_mm" {
                        let near = if strsim::damerau_levenshtein(k, "radius_mm") <= 3 {
                            "did you mean `radius_mm`? "
                        } else if strsim::damerau_levenshtein(k, "curve") <= 2 {
                            "did you mean `curve`? "
                        } else {
                            ""
                        };
                        return self.err(
                            v.span(),
                            format!("{field}.{k}"),
                            format!("unknown field `{k}` in a face"),
                            &format!("{near}accepted here: curve, radius_mm"),
                        );
                    }
                }
                let curve = match t.get("curve") {
                    Some(toml::Value::String(c)) => c.as_str(),
                    Some(other) => {
                        return self.err(
                            v.span(),
                            format!("{field}.curve"),
                            format!("curve must be text, found {}", other.type_str()),
                            HINT,
                        );
                    }
                    None => {
                        return self.err(
                            v.span(),
                            format!("{field}.curve"),
                            "missing field `curve`".into(),
                            HINT,
                        );
                    }
                };
                let radius = match t.get("radius_mm") {
                    Some(toml::Value::Float(r)) => *r,
                    Some(toml::Value::Integer(r)) => *r as f64,
                    Some(other) => {
                        return self.err(
                            v.span(),
                            format!("{field}.radius_mm"),
                            format!("radius_mm must be a number, found {}", other.type_str()),
                            HINT,
                        );
                    }
                    None => {
                        return self.err(
                            v.span(),
                            format!("{field}.radius_mm"),
                            "missing field `radius_mm`".into(),
                            HINT,
                        );
                    }
                };
                if !(radius.is_finite() && radius > 0.0) {
                    return self.err(
                        v.span(),
                        format!("{field}.radius_mm"),
                        format!("{radius} is not a usable radius"),
                        "give a finite number of millimetres above 0",
                    );
                }
                match curve {
                    "convex" => Ok(Face::Convex { radius_mm: radius }),
                    "concave" => Ok(Face::Concave { radius_mm: radius }),
                    other => self.err(
                        v.span(),
                        format!("{field}.curve"),
                        format!("\"{other}\" is not a curve"),
                        "give \"convex\" or \"concave\"",
                    ),
                }
            }
            other => self.err(
                v.span(),
                field,
                format!("a face must be text or a table, found {}", other.type_str()),
                HINT,
            ),
        }
    }

    fn piece(
        &self,
        i: usize,
        sp: &Spanned<RawPiece>,
        materials: &BTreeMap<String, f64>,
    ) -> Result<KitPiece, KitError> {
        let p = sp.get_ref();
        let f = |name: &str| format!("pieces[{}].{name}", i + 1);
        let id = p.id.get_ref().trim().to_string();
        if id.is_empty() || !id.chars().all(|c| c.is_ascii_alphanumeric() || c == '-' || c == '_') {
            return self.err(
                p.id.span(),
                f("id"),
                format!("`{}` is not a usable piece id", p.id.get_ref()),
                "use letters, digits, - and _ only, such as \"hd40\"",
            );
        }
        let material = p.material.get_ref().clone();
        let Some(&index) = materials.get(&material) else {
            let known: Vec<&str> = materials.keys().map(String::as_str).collect();
            let hint = if known.is_empty() {
                format!("add a [materials.{material}] table with index = 1.49")
            } else {
                format!("known materials: {}; or add a [materials.{material}] table", known.join(", "))
            };
            return self.err(
                p.material.span(),
                f("material"),
                format!("material `{material}` is not defined"),
                &hint,
            );
        };
        let front = self.face(&p.front, f("front"))?;
        let back = self.face(&p.back, f("back"))?;
        let thickness = self.positive(&p.thickness_mm, f("thickness_mm"), "thickness")?;
        let height = self.positive(&p.height_mm, f("height_mm"), "height")?;
        let piece = Piece::new(front, back, thickness, height, index).map_err(|e| {
            use crate::optics::PieceError as E;
            let (span, field) = match &e {
                E::RadiusBelowHalfHeight { face, .. } | E::Radius { face, .. } => (
                    if *face == "front" { p.front.span() } else { p.back.span() },
                    f(&format!("{face}.radius_mm")),
                ),
                E::NegativeEdge { .. } | E::Thickness(_) => (p.thickness_mm.span(), f("thickness_mm")),
                E::Height(_) => (p.height_mm.span(), f("height_mm")),
                E::Size { what: "height", .. } => (p.height_mm.span(), f("height_mm")),
                E::Size { .. } => (p.thickness_mm.span(), f("thickness_mm")),
                E::Index(_) | E::Apex(_) => (p.material.span(), f("material")),
            };
            self.loc.error(span.start, field, e.problem(), e.advice())
        })?;
        Ok(KitPiece {
            id,
            label: match &p.label {
                Some(l) => {
                    self.printable(l, f("label"))?;
                    Some(l.get_ref().clone())
                }
                None => None,
            },
            material,
            piece,
            line: self.line(&sp.span()),
        })
    }

    fn sheet(&self, i: usize, ss: &Spanned<RawSheet>, pieces: &[KitPiece]) -> Result<SheetSpec, KitError> {
        let s = ss.get_ref();
        let f = |name: &str| format!("sheets[{}].{name}", i + 1);
        let kind = match s.kind.get_ref().as_str() {
            "curved-face" => SheetKind::CurvedFace,
            "focal" => SheetKind::Focal,
            other => {
                return self.err(
                    s.kind.span(),
                    f("kind"),
                    format!("\"{other}\" is not a sheet kind"),
                    "give \"curved-face\" or \"focal\"",
                );
            }
        };
        let Some(pi) = pieces.iter().position(|p| &p.id == s.piece.get_ref()) else {
            let ids: Vec<&str> = pieces.iter().map(|p| p.id.as_str()).collect();
            let hint = if ids.is_empty() {
                "the kit has no [[pieces]] yet".to_string()
            } else {
                format!("known pieces: {}", ids.join(", "))
            };
            return self.err(
                s.piece.span(),
                f("piece"),
                format!("no piece has id `{}`", s.piece.get_ref()),
                &hint,
            );
        };
        let kp = &pieces[pi];
        let entry = match s.enter.as_ref().map(|e| e.get_ref().as_str()) {
            None | Some("front") => Entry::Front,
            Some("back") => Entry::Back,
            Some(other) => {
                return self.err(
                    s.enter.as_ref().map(|e| e.span()).unwrap_or(ss.span()),
                    f("enter"),
                    format!("\"{other}\" is not a side"),
                    "give \"front\" or \"back\": the face the light meets first",
                );
            }
        };
        let enter_span = s.enter.as_ref().map(|e| e.span()).unwrap_or(s.kind.span());
        let (first, second) = kp.piece.faces_for(entry);
        match kind {
            SheetKind::CurvedFace => {
                if first.is_curved() || !second.is_curved() {
                    let other = entry.flipped();
                    let (of, os) = kp.piece.faces_for(other);
                    let hint = if !of.is_curved() && os.is_curved() {
                        format!("set enter = \"{}\" so the light meets the flat face first", other.as_str())
                    } else {
                        "a curved-face sheet needs a piece with one flat and one curved face, such as a half-disc or a plano-convex shape".to_string()
                    };
                    return self.err(
                        enter_span,
                        f(if s.enter.is_some() { "enter" } else { "kind" }),
                        format!(
                            "a curved-face sheet needs the light to meet a flat face first and a curved face second; piece `{}` entered from the {} has a {} face first and a {} face second",
                            kp.id,
                            entry.as_str(),
                            first.describe(),
                            second.describe()
                        ),
                        &hint,
                    );
                }
            }
            SheetKind::Focal => {
                if Paraxial::of(&kp.piece, entry).efl_mm().is_none() {
                    return self.err(
                        s.kind.span(),
                        f("kind"),
                        format!(
                            "piece `{}` has no focal length (both faces flat, or powers that cancel)",
                            kp.id
                        ),
                        "use a converging or diverging piece for a focal sheet",
                    );
                }
            }
        }
        let vary_entry = s.vary_entry.as_ref().map(|v| *v.get_ref()).unwrap_or(false);
        if vary_entry && kind == SheetKind::CurvedFace {
            return self.err(
                s.vary_entry.as_ref().map(|v| v.span()).unwrap_or(ss.span()),
                f("vary_entry"),
                "a curved-face sheet must be entered through its flat face, so the entry side cannot vary"
                    .into(),
                "remove vary_entry from this sheet",
            );
        }
        let heights = match &s.heights_mm {
            None => None,
            Some(list) => {
                let a = kp.piece.half_height_mm();
                let mut out = Vec::new();
                if list.get_ref().is_empty() {
                    return self.err(list.span(), f("heights_mm"), "the list of guide heights is empty".into(), "give at least one height, such as [10, -10], or leave heights_mm out to have them chosen");
                }
                if list.get_ref().len() > 9 {
                    return self.err(
                        list.span(),
                        f("heights_mm"),
                        format!(
                            "{} guide heights is more than a sheet can show clearly",
                            list.get_ref().len()
                        ),
                        "give at most 9 heights",
                    );
                }
                for (j, h) in list.get_ref().iter().enumerate() {
                    let v = *h.get_ref();
                    if !v.is_finite() || v.abs() >= a {
                        return self.err(
                            h.span(),
                            format!("{}[{}]", f("heights_mm"), j + 1),
                            format!("guide height {v} mm is outside piece `{}`, which reaches {a} mm either side of the axis", kp.id),
                            &format!("give heights between -{a} and {a} mm (not on the edge)"),
                        );
                    }
                    out.push(v);
                }
                Some(out)
            }
        };
        Ok(SheetSpec {
            number: i + 1,
            kind,
            piece: pi,
            entry,
            vary_entry,
            heights_mm: heights,
            line: self.line(&ss.span()),
        })
    }

    fn paper(&self, raw: Option<Spanned<raw::RawPaper>>) -> Result<PaperSpec, KitError> {
        let mut spec = PaperSpec::default();
        let Some(raw) = raw else { return Ok(spec) };
        let whole = raw.span();
        let raw = raw.into_inner();
        match (&raw.size, &raw.width_mm, &raw.height_mm) {
            (Some(s), None, None) => {
                spec.size = match PaperSize::named(s.get_ref()) {
                    Some(p) => p,
                    None => {
                        return self.err(
                            s.span(),
                            "paper.size".into(),
                            format!("\"{}\" is not a paper size", s.get_ref()),
                            &format!("give one of {}, or width_mm and height_mm", PaperSize::names()),
                        );
                    }
                };
            }
            (None, Some(w), Some(h)) => {
                let w = self.positive(w, "paper.width_mm".into(), "paper width")?;
                let h = self.positive(h, "paper.height_mm".into(), "paper height")?;
                spec.size = PaperSize::custom(w, h);
            }
            (None, None, None) => {}
            (Some(s), _, _) => {
                return self.err(
                    s.span(),
                    "paper.size".into(),
                    "give either size or width_mm and height_mm, not both".into(),
                    "remove one of them",
                );
            }
            (None, w, h) => {
                let span = w.as_ref().map(|w| w.span()).or(h.as_ref().map(|h| h.span())).unwrap_or(whole);
                return self.err(
                    span,
                    "paper".into(),
                    "a custom paper size needs both width_mm and height_mm".into(),
                    "add the missing one",
                );
            }
        }
        if let Some(o) = &raw.orientation {
            spec.orientation = match Orientation::parse(o.get_ref()) {
                Some(o) => o,
                None => {
                    return self.err(
                        o.span(),
                        "paper.orientation".into(),
                        format!("\"{}\" is not an orientation", o.get_ref()),
                        "give \"portrait\", \"landscape\" or \"auto\"",
                    );
                }
            };
        }
        if let Some(m) = &raw.margin_mm {
            spec.margin_mm = *m.get_ref();
            if let Err(msg) = spec.check() {
                let most = ((spec.size.width_mm - crate::paper::MIN_PRINTABLE_MM) / 2.0).max(0.0);
                let hint =
                    format!("give a margin from 0 to {most:.1} mm on this paper (10 mm suits most printers)");
                return self.err(m.span(), "paper.margin_mm".into(), msg, &hint);
            }
        }
        if let Err(msg) = spec.check() {
            let hint = format!(
                "give paper at least {:.1} mm wide on its short side with a {} mm margin",
                crate::paper::MIN_PRINTABLE_MM + 2.0 * spec.margin_mm,
                spec.margin_mm
            );
            return self.err(whole, "paper".into(), msg, &hint);
        }
        Ok(spec)
    }

    fn class(&self, raw: Option<Spanned<raw::RawClass>>) -> Result<ClassSpec, KitError> {
        let mut spec = ClassSpec::default();
        let Some(raw) = raw else { return Ok(spec) };
        let whole = raw.span();
        let raw = raw.into_inner();
        match (&raw.groups, &raw.names) {
            (Some(_), Some(n)) => {
                return self.err(
                    n.span(),
                    "class.names".into(),
                    "give either groups or names, not both".into(),
                    "names already sets the number of groups",
                );
            }
            (Some(g), None) => {
                let n = *g.get_ref();
                if !(1..=MAX_GROUPS as i64).contains(&n) {
                    return self.err(
                        g.span(),
                        "class.groups".into(),
                        format!("{n} groups is outside what raysheet makes"),
                        &format!("give a whole number from 1 to {MAX_GROUPS}"),
                    );
                }
                spec.groups = Groups::Count(n as usize);
            }
            (None, Some(names)) => {
                if names.get_ref().is_empty() || names.get_ref().len() > MAX_GROUPS {
                    return self.err(
                        names.span(),
                        "class.names".into(),
                        format!("{} group names given", names.get_ref().len()),
                        &format!("give from 1 to {MAX_GROUPS} names"),
                    );
                }
                let mut out: Vec<String> = Vec::new();
                for (j, n) in names.get_ref().iter().enumerate() {
                    let name = n.get_ref().trim().to_string();
                    if let Some(msg) = group_name_problem(&name) {
                        return self.err(
                            n.span(),
                            format!("class.names[{}]", j + 1),
                            msg,
                            "give a short printable name, such as \"Bench A\"",
                        );
                    }
                    if out.contains(&name) {
                        return self.err(
                            n.span(),
                            format!("class.names[{}]", j + 1),
                            format!("group name \"{name}\" is given twice"),
                            "give every group its own name",
                        );
                    }
                    out.push(name);
                }
                spec.groups = Groups::Names(out);
            }
            (None, None) => {}
        }
        if let Some(s) = &raw.seed {
            let v = *s.get_ref();
            if v < 0 {
                return self.err(
                    s.span(),
                    "class.seed".into(),
                    format!("seed {v} is negative"),
                    "give a whole number, 0 or more, such as 2031",
                );
            }
            spec.seed = Some(v as u64);
        }
        if let Some(g) = &raw.grid_mm {
            let v = *g.get_ref();
            if !(v.is_finite() && (0.1..=5.0).contains(&v)) {
                return self.err(
                    g.span(),
                    "class.grid_mm".into(),
                    format!("a {v} mm grid cannot be drawn with a ruler"),
                    "give a step from 0.1 to 5 mm (0.5 is the default)",
                );
            }
            spec.grid_mm = v;
        }
        let _ = whole;
        Ok(spec)
    }
}
