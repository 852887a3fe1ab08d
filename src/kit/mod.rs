//! The kit file: its TOML mirror and its validation into a normalized [`Kit`]:
//! millimetres, defaults filled, names resolved. Nothing past this module sees
//! TOML or a raw unit.
#![expect(
    clippy::result_large_err,
    reason = "a kit error is made at most once per run and carries its whole location; boxing it buys nothing"
)]

mod error;
mod fields;
mod group_name;
mod raw;
mod schema;

use std::collections::BTreeMap;

pub use error::KitError;
use error::Locator;
pub use fields::{COMMON_SHEET_FIELDS, Located, Place, SheetEntry};
pub use group_name::{MAX_NAME_CHARS, group_name_problem, normal_group_name};
use raw::{NESTED_TABLES, RawKit, RawPiece, TABLE_FIELDS};
pub use schema::kit_schema;
use toml::Spanned;

use crate::optics::material::{Dispersion, Material, MaterialError, VISIBLE_NM, published_words};
use crate::optics::{Block, Face, Lens, Piece, Prism};
use crate::paper::{Orientation, PaperSize, PaperSpec};

/// The ray box: parallel rays for focal-length sheets, the wavelength that
/// fixes every piece's index, and the colours its filters give.
#[derive(Clone, Debug, PartialEq)]
pub struct RayBox {
    /// Number of parallel rays (1–9).
    pub rays: u32,
    /// Centre-to-centre spacing on paper, mm.
    pub spacing_mm: f64,
    /// Width of one ray on paper, mm.
    pub ray_width_mm: f64,
    /// The wavelength of the ray box's white or single-colour ray, nm: every
    /// piece's index is its material's index here.
    pub wavelength_nm: f64,
    /// The colours the ray box's filters give, in kit order (names unique,
    /// printable; wavelengths in [`VISIBLE_NM`]).
    pub colours: Vec<Colour>,
}

impl Default for RayBox {
    /// Five rays 8 mm apart, 2 mm wide: the middle of what classroom ray boxes
    /// give (DESIGN.md: one to five rays, 1–3 mm wide, 5–15 mm apart, *memory*);
    /// at the d line, 587.6 nm, the usual reference wavelength (DESIGN.md); no colours.
    fn default() -> RayBox {
        RayBox {
            rays: 5,
            spacing_mm: 8.0,
            ray_width_mm: 2.0,
            wavelength_nm: crate::optics::material::D_LINE_NM,
            colours: Vec::new(),
        }
    }
}

/// One colour of the ray box: a filter's name (printed) and its wavelength.
#[derive(Clone, Debug, PartialEq)]
pub struct Colour {
    /// The name, as written in the kit (printed on keys).
    pub name: String,
    /// Its wavelength, nm.
    pub wavelength_nm: f64,
}

impl Colour {
    /// The letter printed at both ends of this colour's rays on a key, so a
    /// black-and-white copy still tells the colours apart: the name's first
    /// character in capitals. Two colours of a ray box never share it (the
    /// kit refuses that).
    pub fn initial(&self) -> String {
        initial_of(&self.name)
    }
}

fn initial_of(name: &str) -> String {
    name.chars().next().map(|c| c.to_uppercase().collect()).unwrap_or_default()
}

/// Most colours a ray box may list: the seven of a rainbow (our bound).
pub const MAX_COLOURS: usize = 7;

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

/// Largest index of refraction a kit may give (the optics' own bound).
pub use crate::optics::MAX_INDEX;

/// Largest ray spacing, mm: ray boxes space their slits some 5–15 mm apart
/// (DESIGN.md, *memory*); 40 mm leaves room for a comb with slits blocked.
pub const MAX_RAY_SPACING_MM: f64 = 40.0;

/// Largest ray width on paper, mm: rays are some 1–3 mm wide (DESIGN.md,
/// *memory*); 10 mm allows a broad, badly focused lamp.
pub const MAX_RAY_WIDTH_MM: f64 = 10.0;

/// Largest thickness, height or side of a piece, mm (the optics' own bound,
/// checked here first so the error points at the field).
pub use crate::optics::MAX_PIECE_MM;

const SELLMEIER_EXAMPLE: &str =
    "sellmeier = { b = [0.99654, 0.18964, 0.00411], c_um2 = [0.00787, 0.02191, 3.85727] }";

fn catalog_example() -> String {
    format!("catalog = \"{}\" (`raysheet materials` lists the built-in ones)", published_words()[0])
}

const PIECE_WHY: &str = "classroom pieces fit on a sheet of paper";

/// A validated kit.
#[derive(Clone, Debug, PartialEq)]
pub struct Kit {
    /// Title printed on every sheet.
    pub title: String,
    /// Materials by name: each gives an index at any wavelength of [`VISIBLE_NM`].
    pub materials: BTreeMap<String, Material>,
    /// The ray box.
    pub ray_box: RayBox,
    /// The pieces, in kit order.
    pub pieces: Vec<KitPiece>,
    /// The sheets, in kit order, as located tables: each sheet kind reads and
    /// checks its own fields (see `sheets`).
    pub sheets: Vec<SheetEntry>,
    /// The paper from the kit (the command line may override it).
    pub paper: PaperSpec,
    /// The class set.
    pub class: ClassSpec,
    /// The printer's measured stretch (`[printer]`), if the teacher gave it.
    pub printer: Option<crate::paper::PrinterCorrection>,
    /// SHA-256 of the kit file's text, hex: the answer file records it, so
    /// marking can tell a kit changed after the build.
    pub source_sha256: String,
}

/// The SHA-256 of `bytes` as 64 lower-case hex digits (the kit's record in
/// the answer file, and the output folder's list of files).
pub fn sha256_hex(bytes: &[u8]) -> String {
    use sha2::Digest;
    sha2::Sha256::digest(bytes).iter().map(|b| format!("{b:02x}")).collect()
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
        // A known inline table inside a table (`sellmeier = { … }` under a
        // material, `colours = [{ … }]` under the ray box) is named by its own
        // key, unless that key is itself the unknown field.
        let last = path.rsplit('.').next().unwrap_or("");
        let nested = path.contains('.') && last != name && NESTED_TABLES.contains(&last) && !inline;
        let (table, inline) = if nested { (last, true) } else { (table, inline) };
        let known = TABLE_FIELDS.iter().find(|(t, _)| *t == table).map(|(_, f)| *f).unwrap_or(&[]);
        let best = error::did_you_mean(name, known);
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

    fn piece_field_span(&self, p: &RawPiece, name: &str) -> Option<std::ops::Range<usize>> {
        match name {
            "front" => p.front.as_ref().map(|v| v.span()),
            "back" => p.back.as_ref().map(|v| v.span()),
            "thickness_mm" => p.thickness_mm.as_ref().map(|v| v.span()),
            "height_mm" => p.height_mm.as_ref().map(|v| v.span()),
            "apex_deg" => p.apex_deg.as_ref().map(|v| v.span()),
            "side_mm" => p.side_mm.as_ref().map(|v| v.span()),
            _ => None,
        }
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

    /// A length above 0 and at most `max_mm`, the largest a classroom kit has
    /// (`why` says so in the hint).
    fn length(
        &self,
        v: &Spanned<f64>,
        field: String,
        what: &str,
        max_mm: f64,
        why: &str,
    ) -> Result<f64, KitError> {
        let x = *v.get_ref();
        if x.is_finite() && x > 0.0 && x <= max_mm {
            Ok(x)
        } else {
            self.err(
                v.span(),
                field,
                format!("{x} is not a usable {what}"),
                &format!("give a finite number of millimetres above 0 and at most {max_mm} ({why})"),
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
            materials.insert(name.clone(), self.material(name, m)?);
        }
        let ray_box = self.ray_box(raw.ray_box)?;
        let mut pieces: Vec<KitPiece> = Vec::new();
        for (i, p) in raw.pieces.iter().enumerate() {
            let kp = self.piece(i, p, &materials, ray_box.wavelength_nm)?;
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
            sheets.push(SheetEntry::new(self.loc, i + 1, s, &pieces)?);
        }
        let paper = self.paper(raw.paper)?;
        let class = self.class(raw.class)?;
        let printer = match raw.printer {
            None => None,
            Some(p) => {
                let p = p.into_inner();
                let ruler = |v: &Spanned<f64>, field: &str, nominal: f64| {
                    let x = *v.get_ref();
                    if x.is_finite() && (0.9 * nominal..=1.1 * nominal).contains(&x) {
                        Ok(x)
                    } else {
                        self.err(
                            v.span(),
                            format!("printer.{field}"),
                            format!("{x} mm is not what a printer makes of the {nominal} mm ruler on the calibration page"),
                            &format!(
                                "give the ruler's length as you measured it, {:.0} to {:.0} mm (a printer is off by a few per cent at most; more is a \"fit to page\" setting: print at 100 %)",
                                0.9 * nominal,
                                1.1 * nominal
                            ),
                        )
                    }
                };
                Some(crate::paper::PrinterCorrection {
                    long_ruler_mm: ruler(&p.long_ruler_mm, "long_ruler_mm", crate::paper::LONG_RULER_MM)?,
                    short_ruler_mm: ruler(&p.short_ruler_mm, "short_ruler_mm", crate::paper::SHORT_RULER_MM)?,
                })
            }
        };
        let source_sha256 = sha256_hex(self.loc.text.as_bytes());
        Ok(Kit { title, materials, ray_box, pieces, sheets, paper, class, printer, source_sha256 })
    }

    /// One `[materials.NAME]` table: exactly one of `index`, `sellmeier` and
    /// `catalog`, checked over the visible band.
    fn material(&self, name: &str, m: &Spanned<raw::RawMaterial>) -> Result<Material, KitError> {
        let raw = m.get_ref();
        let f = |field: &str| format!("materials.{name}.{field}");
        let given: Vec<(&str, std::ops::Range<usize>)> = [
            ("index", raw.index.as_ref().map(|v| v.span())),
            ("sellmeier", raw.sellmeier.as_ref().map(|v| v.span())),
            ("catalog", raw.catalog.as_ref().map(|v| v.span())),
        ]
        .into_iter()
        .filter_map(|(k, span)| span.map(|s| (k, s)))
        .collect();
        match given.as_slice() {
            [] => {
                return self.err(
                    m.span(),
                    f("index"),
                    format!("material `{name}` has no index of refraction"),
                    &format!("add `index = 1.49` (at the ray box's wavelength), or a dispersion formula: {SELLMEIER_EXAMPLE} or {}", catalog_example()),
                );
            }
            [_] => {}
            [(first, _), (second, span), ..] => {
                return self.err(
                    span.clone(),
                    f(second),
                    format!("material `{name}` gives both `{first}` and `{second}`"),
                    "give exactly one of index (no dispersion), sellmeier or catalog",
                );
            }
        }
        if let Some(v) = &raw.index {
            return Material::constant(*v.get_ref()).or_else(|_| {
                let n = *v.get_ref();
                self.err(
                    v.span(),
                    f("index"),
                    format!("index {n} is not a usable index of refraction"),
                    &format!(
                        "give a finite number above 1 and at most {MAX_INDEX}, at the ray box's wavelength (acrylic is about 1.49, glass 1.5 to 1.9, diamond 2.42)"
                    ),
                )
            });
        }
        if let Some(c) = &raw.catalog {
            let word = c.get_ref();
            return Material::published(word).ok_or_else(|| {
                let words = published_words();
                let best = error::did_you_mean(word, &words);
                self.loc.error(
                    c.span().start,
                    f("catalog"),
                    format!("\"{word}\" is not a built-in material"),
                    format!(
                        "{best}give one of {} (`raysheet materials` lists them with their sources)",
                        words.iter().map(|w| format!("\"{w}\"")).collect::<Vec<_>>().join(", ")
                    ),
                )
            });
        }
        let s = raw.sellmeier.as_ref().expect("one of the three is given");
        let table = s.get_ref();
        let values =
            |v: &Spanned<Vec<Spanned<f64>>>| v.get_ref().iter().map(|x| *x.get_ref()).collect::<Vec<f64>>();
        let dispersion =
            Dispersion::Sellmeier { b: values(&table.b).into(), c_um2: values(&table.c_um2).into() };
        Material::new(dispersion).or_else(|e| {
            let element = |list: &Spanned<Vec<Spanned<f64>>>, name: &str, term: usize| {
                let span = list.get_ref().get(term).map(|x| x.span()).unwrap_or(list.span());
                (span, f(&format!("sellmeier.{name}[{}]", term + 1)))
            };
            let (span, field) = match &e {
                MaterialError::Empty => (table.b.span(), f("sellmeier.b")),
                MaterialError::Lengths { .. } => (table.c_um2.span(), f("sellmeier.c_um2")),
                MaterialError::NotFinite { list: "b", term } => element(&table.b, "b", *term),
                MaterialError::NotFinite { term, .. }
                | MaterialError::NegativeC { term }
                | MaterialError::Pole { term, .. } => element(&table.c_um2, "c_um2", *term),
                MaterialError::Index(_) | MaterialError::NotAboveOne { .. } | MaterialError::TooHigh { .. } => {
                    (s.span(), f("sellmeier"))
                }
            };
            let (lo, hi) = VISIBLE_NM;
            self.err(
                span,
                field,
                e.problem(),
                &format!(
                    "give lists b and c_um2 of the same length (one term each, at least one), finite numbers, every c_um2 0 or more with no pole (λ = √c) in {lo:.0}–{hi:.0} nm, so that n is above 1 and at most {MAX_INDEX} there; such as {SELLMEIER_EXAMPLE} (PMMA, Szczurowski 2013)"
                ),
            )
        })
    }

    fn wavelength(&self, v: &Spanned<f64>, field: String) -> Result<f64, KitError> {
        let x = *v.get_ref();
        let (lo, hi) = VISIBLE_NM;
        if x.is_finite() && (lo..=hi).contains(&x) {
            Ok(x)
        } else {
            self.err(
                v.span(),
                field,
                format!("{x} nm is not a wavelength of visible light"),
                &format!(
                    "give a wavelength in nm from {lo:.0} to {hi:.0}, such as 587.6 (the d line, the default), 656.3 (red) or 486.1 (blue)"
                ),
            )
        }
    }

    fn colours(&self, list: &Spanned<Vec<Spanned<raw::RawColour>>>) -> Result<Vec<Colour>, KitError> {
        if list.get_ref().len() > MAX_COLOURS {
            return self.err(
                list.span(),
                "ray_box.colours".into(),
                format!("{} colours given", list.get_ref().len()),
                &format!("give at most {MAX_COLOURS} colours, one per filter"),
            );
        }
        let mut out: Vec<Colour> = Vec::new();
        for (j, c) in list.get_ref().iter().enumerate() {
            let f = |name: &str| format!("ray_box.colours[{}].{name}", j + 1);
            let c = c.get_ref();
            self.printable(&c.name, f("name"))?;
            let name = c.name.get_ref().trim().to_string();
            if name.is_empty() {
                return self.err(
                    c.name.span(),
                    f("name"),
                    "the colour has no name".into(),
                    "give the name printed beside its rays, such as \"red\"",
                );
            }
            if let Some(prev) = out.iter().find(|o| o.name.to_lowercase() == name.to_lowercase()) {
                return self.err(
                    c.name.span(),
                    f("name"),
                    format!("colour \"{name}\" is given twice (as \"{}\")", prev.name),
                    "give every colour its own name",
                );
            }
            if let Some(prev) = out.iter().find(|o| o.initial() == initial_of(&name)) {
                return self.err(
                    c.name.span(),
                    f("name"),
                    format!(
                        "colour \"{name}\" starts with the same letter as \"{}\": keys print each colour's initial ({}) at its rays' ends, so a black-and-white copy could not tell them apart",
                        prev.name,
                        prev.initial()
                    ),
                    "rename one so that every colour starts with its own letter, such as \"violet\" for \"purple\" beside \"pink\"",
                );
            }
            let wavelength_nm = self.wavelength(&c.wavelength_nm, f("wavelength_nm"))?;
            out.push(Colour { name, wavelength_nm });
        }
        Ok(out)
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
            rb.spacing_mm = self.length(
                s,
                "ray_box.spacing_mm".into(),
                "ray spacing",
                MAX_RAY_SPACING_MM,
                "a ray box's slits are some 5 to 15 mm apart",
            )?;
        }
        if let Some(w) = &raw.ray_width_mm {
            rb.ray_width_mm = self.length(
                w,
                "ray_box.ray_width_mm".into(),
                "ray width",
                MAX_RAY_WIDTH_MM,
                "a ray box's rays are some 1 to 3 mm wide on paper",
            )?;
            if rb.ray_width_mm >= rb.spacing_mm {
                return self.err(
                    w.span(),
                    "ray_box.ray_width_mm".into(),
                    format!("rays {} mm wide would overlap at {} mm spacing", rb.ray_width_mm, rb.spacing_mm),
                    "the ray width must be less than spacing_mm",
                );
            }
        }
        if let Some(w) = &raw.wavelength_nm {
            rb.wavelength_nm = self.wavelength(w, "ray_box.wavelength_nm".into())?;
        }
        if let Some(c) = &raw.colours {
            rb.colours = self.colours(c)?;
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
        materials: &BTreeMap<String, Material>,
        wavelength_nm: f64,
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
        let Some(index) = materials.get(&material).map(|m| m.index_at(wavelength_nm)) else {
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
        let shape = p.shape.as_ref().map(|s| s.get_ref().as_str()).unwrap_or("lens");
        // Fields that belong to other shapes are refused by name.
        let belongs: &[(&str, bool)] = &[
            ("front", p.front.is_some()),
            ("back", p.back.is_some()),
            ("thickness_mm", p.thickness_mm.is_some()),
            ("height_mm", p.height_mm.is_some()),
            ("apex_deg", p.apex_deg.is_some()),
            ("side_mm", p.side_mm.is_some()),
        ];
        let wanted: &[&str] = match shape {
            "lens" => &["front", "back", "thickness_mm", "height_mm"],
            "block" => &["thickness_mm", "height_mm"],
            "prism" => &["apex_deg", "side_mm"],
            other => {
                let span = p.shape.as_ref().map(|s| s.span()).unwrap_or(sp.span());
                return self.err(
                    span,
                    f("shape"),
                    format!("\"{other}\" is not a piece shape"),
                    "give \"lens\" (two faces, the default), \"block\" or \"prism\"",
                );
            }
        };
        for (name, present) in belongs {
            if *present && !wanted.contains(name) {
                let span = self.piece_field_span(p, name).unwrap_or(sp.span());
                return self.err(
                    span,
                    f(name),
                    format!("a {shape} has no `{name}`"),
                    &format!(
                        "a {shape} takes {}; set shape = \"…\" if this piece is another shape",
                        wanted.join(", ")
                    ),
                );
            }
        }
        for name in wanted {
            if !belongs.iter().any(|(n, present)| n == name && *present) {
                return self.err(
                    sp.span(),
                    f(name),
                    format!("missing field `{name}`"),
                    &format!("add `{name} = …` to this table"),
                );
            }
        }
        let req = |v: &Option<Spanned<f64>>| v.clone().expect("checked present above");
        let map_err = |e: crate::optics::PieceError| {
            use crate::optics::PieceError as E;
            let (span, field) = match &e {
                E::RadiusBelowHalfHeight { face, .. } | E::Radius { face, .. } => {
                    let v = if *face == "front" { &p.front } else { &p.back };
                    (v.as_ref().map(|v| v.span()).unwrap_or(sp.span()), f(&format!("{face}.radius_mm")))
                }
                E::NegativeEdge { .. } | E::Thickness(_) | E::Size { what: "thickness", .. } => {
                    (self.piece_field_span(p, "thickness_mm").unwrap_or(sp.span()), f("thickness_mm"))
                }
                E::Height(_) | E::Size { what: "height", .. } => {
                    (self.piece_field_span(p, "height_mm").unwrap_or(sp.span()), f("height_mm"))
                }
                E::Size { .. } => (self.piece_field_span(p, "side_mm").unwrap_or(sp.span()), f("side_mm")),
                E::Apex(_) => (self.piece_field_span(p, "apex_deg").unwrap_or(sp.span()), f("apex_deg")),
                E::Index(_) => (p.material.span(), f("material")),
            };
            self.loc.error(span.start, field, e.problem(), e.advice())
        };
        let piece = match shape {
            "lens" | "block" => {
                // Lens shapes and blocks both have a thickness and a height; the
                // faces (lens shapes only) are read first, as written in the table.
                let faces = if shape == "lens" {
                    Some((
                        self.face(p.front.as_ref().expect("checked"), f("front"))?,
                        self.face(p.back.as_ref().expect("checked"), f("back"))?,
                    ))
                } else {
                    None
                };
                let thickness = self.length(
                    &req(&p.thickness_mm),
                    f("thickness_mm"),
                    "thickness",
                    MAX_PIECE_MM,
                    PIECE_WHY,
                )?;
                let height =
                    self.length(&req(&p.height_mm), f("height_mm"), "height", MAX_PIECE_MM, PIECE_WHY)?;
                match faces {
                    Some((front, back)) => {
                        Piece::Lens(Lens::new(front, back, thickness, height, index).map_err(map_err)?)
                    }
                    None => Piece::Block(Block::new(thickness, height, index).map_err(map_err)?),
                }
            }
            _ => {
                let apex = *req(&p.apex_deg).get_ref();
                let side =
                    self.length(&req(&p.side_mm), f("side_mm"), "side length", MAX_PIECE_MM, PIECE_WHY)?;
                Piece::Prism(Prism::new(apex, side, index).map_err(map_err)?)
            }
        };
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
                let hint = match spec.largest_margin_mm() {
                    Some(most) => format!(
                        "give a margin from 0 to {most:.1} mm on this paper and orientation (10 mm suits most printers)"
                    ),
                    None => "this paper is too small for a sheet even with no margin; give larger paper"
                        .to_string(),
                };
                return self.err(m.span(), "paper.margin_mm".into(), msg, &hint);
            }
        }
        if let Err(msg) = spec.check() {
            let narrow = spec.size.width_mm - 2.0 * spec.margin_mm < crate::paper::MIN_PRINTABLE_MM;
            let hint = if narrow {
                format!(
                    "give paper at least {:.1} mm wide on its short side with a {} mm margin",
                    crate::paper::MIN_PRINTABLE_MM + 2.0 * spec.margin_mm,
                    spec.margin_mm
                )
            } else {
                let (w, h) = spec.smallest_paper_mm();
                format!(
                    "give paper at least {w:.0} × {h:.0} mm with a {} mm margin, such as A5",
                    spec.margin_mm
                )
            };
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
                    let name = normal_group_name(n.get_ref());
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
