//! The TOML mirror of a kit file: serde structs that keep every field's span.
//! The same structs describe the kit file as a JSON Schema (`schema.rs`): each
//! field's doc comment is its description there, and its `schemars` attributes
//! state the unit, range and default the validator in `mod.rs` applies.

use std::collections::BTreeMap;

use schemars::JsonSchema;
use serde::Deserialize;
use toml::Spanned;

use super::schema::{
    PIECE_ID, PRINTABLE, face_schema, group_name_pattern, orientation_pattern, paper_size_pattern,
    piece_shapes, printable_word,
};
use super::{MAX_COLOURS, MAX_GROUPS, MAX_RAY_SPACING_MM, MAX_RAY_WIDTH_MM};
use crate::optics::MAX_INDEX;
use crate::optics::material::{D_LINE_NM, VISIBLE_NM};
use crate::optics::{MAX_PIECE_MM, MIN_PIECE_MM};
use crate::paper::{LONG_RULER_MM, SHORT_RULER_MM};

/// A raysheet kit file: the optics pieces of a class set, the ray box, the
/// sheets to print and the paper to print them on.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(title = "raysheet kit file")]
pub(super) struct RawKit {
    /// Title printed at the head of every sheet and key (one line, at most 120
    /// characters the shipped font can print).
    #[schemars(with = "Option<String>", extend("default" = "Ray-optics practical", "maxLength" = 120, "pattern" = PRINTABLE))]
    pub title: Option<Spanned<String>>,
    /// The materials the pieces are made of, by name: `[materials.NAME]`, each
    /// with exactly one of `index`, `sellmeier` or `catalog`. Default: none.
    #[serde(default)]
    #[schemars(with = "BTreeMap<String, RawMaterial>")]
    pub materials: BTreeMap<String, Spanned<RawMaterial>>,
    /// The ray box: how many parallel rays, how far apart and how wide on the
    /// paper, and its wavelength. Default: five rays 8 mm apart, 2 mm wide, at 587.6 nm.
    #[schemars(with = "Option<RawRayBox>")]
    pub ray_box: Option<Spanned<RawRayBox>>,
    /// The pieces of the kit, one `[[pieces]]` table each: a lens shape (the
    /// default), a rectangular block or a prism. Default: none.
    #[serde(default)]
    #[schemars(with = "Vec<RawPiece>")]
    pub pieces: Vec<Spanned<RawPiece>>,
    /// The sheets to print, one `[[sheets]]` table each, in order: a `kind`,
    /// the `piece` it uses, and the fields that kind reads (`raysheet kinds`
    /// lists them). Default: none.
    #[serde(default)]
    #[schemars(with = "Vec<BTreeMap<String, String>>")]
    pub sheets: Vec<Spanned<super::fields::RawSheetTable>>,
    /// The paper: a named size or width and height, orientation and margin.
    /// The command line's --paper, --orientation and --margin override it.
    /// Default: A4, auto orientation, 10 mm margin.
    #[schemars(with = "Option<RawPaper>")]
    pub paper: Option<Spanned<RawPaper>>,
    /// A class set: groups that each get their own variant of every sheet.
    /// Default: one set, no groups.
    #[schemars(with = "Option<RawClass>")]
    pub class: Option<Spanned<RawClass>>,
    /// What the two rulers of `raysheet calibrate`'s page measured on this
    /// printer: every page is then stretched to print true. Default: no correction.
    #[schemars(with = "Option<RawPrinter>")]
    pub printer: Option<Spanned<RawPrinter>>,
}

/// The calibration page's rulers as printed and measured.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
pub(super) struct RawPrinter {
    /// The long ruler (180 mm as drawn) as measured on the printed page,
    /// within 10 % of 180 mm. Required: no default.
    #[schemars(with = "f64", extend("x-unit" = "mm", "minimum" = 0.9 * LONG_RULER_MM, "maximum" = 1.1 * LONG_RULER_MM))]
    pub long_ruler_mm: Spanned<f64>,
    /// The short ruler (120 mm as drawn) as measured on the printed page,
    /// within 10 % of 120 mm. Required: no default.
    #[schemars(with = "f64", extend("x-unit" = "mm", "minimum" = 0.9 * SHORT_RULER_MM, "maximum" = 1.1 * SHORT_RULER_MM))]
    pub short_ruler_mm: Spanned<f64>,
}

/// A material: exactly one of `index` (no dispersion), `sellmeier` or `catalog`.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(extend("oneOf" = [{"required": ["index"]}, {"required": ["sellmeier"]}, {"required": ["catalog"]}]))]
pub(super) struct RawMaterial {
    /// Index of refraction at the ray box's wavelength, the same at every
    /// wavelength (acrylic is about 1.49). No default: give this, `sellmeier` or `catalog`.
    #[schemars(with = "Option<f64>", extend("x-unit" = "1", "exclusiveMinimum" = 1.0, "maximum" = MAX_INDEX))]
    pub index: Option<Spanned<f64>>,
    /// A Sellmeier formula, n² = 1 + Σ bᵢλ²/(λ² − cᵢ) with λ in µm, valid over
    /// 380–780 nm with n above 1. No default: give this, `index` or `catalog`.
    #[schemars(with = "Option<RawSellmeier>")]
    pub sellmeier: Option<Spanned<RawSellmeier>>,
    /// A built-in published formula by name (`raysheet materials` lists them
    /// with their sources). No default: give this, `index` or `sellmeier`.
    #[schemars(with = "Option<String>", extend("enum" = crate::optics::material::published_words()))]
    pub catalog: Option<Spanned<String>>,
    /// A longer name for the teacher's own notes; not printed. Default: none.
    #[expect(dead_code, reason = "accepted for the teacher's own notes; not printed")]
    #[schemars(with = "Option<String>")]
    pub label: Option<Spanned<String>>,
}

/// `sellmeier = { b = [...], c_um2 = [...] }`.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
pub(super) struct RawSellmeier {
    /// The terms' strengths bᵢ, one per term (as many as `c_um2`); no lower
    /// limit and no upper limit here, but n must stay above 1 over 380–780 nm.
    /// Required: no default.
    #[schemars(with = "Vec<f64>", extend("minItems" = 1, "x-unit" = "1"))]
    pub b: Spanned<Vec<Spanned<f64>>>,
    /// The terms' resonances cᵢ, µm², one per term (as many as `b`), each 0 or
    /// more (no upper limit), with no pole λ = √cᵢ in 380–780 nm. Required:
    /// no default.
    #[schemars(with = "Vec<f64>", extend("minItems" = 1, "items" = {"type": "number", "minimum": 0}, "x-unit" = "µm²"))]
    pub c_um2: Spanned<Vec<Spanned<f64>>>,
}

/// The ray box.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
pub(super) struct RawRayBox {
    /// Number of parallel rays the comb gives, for focal sheets.
    #[schemars(with = "Option<i64>", extend("x-unit" = "rays", "minimum" = 1, "maximum" = 9, "default" = 5))]
    pub rays: Option<Spanned<i64>>,
    /// Centre-to-centre spacing of the rays on the paper (classroom ray boxes:
    /// some 5 to 15 mm).
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "exclusiveMinimum" = 0.0, "maximum" = MAX_RAY_SPACING_MM, "default" = 8.0))]
    pub spacing_mm: Option<Spanned<f64>>,
    /// Width of one ray on the paper (some 1 to 3 mm); less than `spacing_mm`.
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "exclusiveMinimum" = 0.0, "maximum" = MAX_RAY_WIDTH_MM, "default" = 2.0))]
    pub ray_width_mm: Option<Spanned<f64>>,
    /// The wavelength every piece's index is taken at (587.6 nm is the d line;
    /// 656.3 with a red filter in).
    #[schemars(with = "Option<f64>", extend("x-unit" = "nm", "minimum" = VISIBLE_NM.0, "maximum" = VISIBLE_NM.1, "default" = D_LINE_NM))]
    pub wavelength_nm: Option<Spanned<f64>>,
    /// The colours the ray box's filters give, each a name and a wavelength
    /// (names unique). Default: none.
    #[schemars(with = "Option<Vec<RawColour>>", extend("maxItems" = MAX_COLOURS))]
    pub colours: Option<Spanned<Vec<Spanned<RawColour>>>>,
}

/// One of the ray box's colours: `{ name = "red", wavelength_nm = 656.3 }`.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
pub(super) struct RawColour {
    /// The colour's name, printed beside its rays (not empty, one line).
    /// Required: no default.
    #[schemars(with = "String", extend("maxLength" = 120, "pattern" = printable_word()))]
    pub name: Spanned<String>,
    /// The filter's wavelength. Required: no default.
    #[schemars(with = "f64", extend("x-unit" = "nm", "minimum" = VISIBLE_NM.0, "maximum" = VISIBLE_NM.1))]
    pub wavelength_nm: Spanned<f64>,
}

/// One piece of the kit. A lens shape takes `front`, `back`, `thickness_mm`
/// and `height_mm`; a block `thickness_mm` and `height_mm`; a prism
/// `apex_deg` and `side_mm`.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(extend("allOf" = piece_shapes()))]
pub(super) struct RawPiece {
    /// The piece's id, which sheets name in `piece` (letters, digits, - and _;
    /// unique in the kit). Required: no default.
    #[schemars(with = "String", extend("pattern" = PIECE_ID))]
    pub id: Spanned<String>,
    /// A longer name printed on the sheets (one line, at most 120 characters).
    /// Default: none.
    #[schemars(with = "Option<String>", extend("maxLength" = 120, "pattern" = PRINTABLE))]
    pub label: Option<Spanned<String>>,
    /// The name of a `[materials.NAME]` table of this kit. Required: no default.
    #[schemars(with = "String")]
    pub material: Spanned<String>,
    /// What the piece is: "lens" (a lens shape with two faces, half-discs
    /// included), "block" (rectangular) or "prism" (isosceles).
    #[schemars(with = "Option<String>", extend("enum" = ["lens", "block", "prism"], "default" = "lens"))]
    pub shape: Option<Spanned<String>>,
    /// A lens shape's front face: "flat", or { curve = "convex" or "concave",
    /// radius_mm = R }. Lens shapes only; required there, no default.
    #[serde(default)]
    #[schemars(schema_with = "face_schema")]
    pub front: Option<Spanned<toml::Value>>,
    /// A lens shape's back face: "flat", or { curve = "convex" or "concave",
    /// radius_mm = R }. Lens shapes only; required there, no default.
    #[serde(default)]
    #[schemars(schema_with = "face_schema")]
    pub back: Option<Spanned<toml::Value>>,
    /// Thickness along the optical axis (a lens shape's or block's; a
    /// half-disc's is its radius; a block's at least 10 mm). Required for
    /// lens shapes and blocks: no default.
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "exclusiveMinimum" = 0.0, "maximum" = MAX_PIECE_MM))]
    pub thickness_mm: Option<Spanned<f64>>,
    /// Height across the optical axis (a lens shape's or block's; a
    /// half-disc's is its diameter; a block's at least 10 mm). Required for
    /// lens shapes and blocks: no default.
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "exclusiveMinimum" = 0.0, "maximum" = MAX_PIECE_MM))]
    pub height_mm: Option<Spanned<f64>>,
    /// A prism's apex angle, between its two equal faces (90 for a
    /// right-angle prism). Prisms only; required there, no default.
    #[schemars(with = "Option<f64>", extend("x-unit" = "deg", "exclusiveMinimum" = 0.0, "exclusiveMaximum" = 180.0))]
    pub apex_deg: Option<Spanned<f64>>,
    /// Length of a prism's two equal faces; its base (2·side·sin(apex/2))
    /// must also be 10 to 300 mm. Prisms only; required there, no default.
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "minimum" = MIN_PIECE_MM, "maximum" = MAX_PIECE_MM))]
    pub side_mm: Option<Spanned<f64>>,
}

/// The paper: `size`, or `width_mm` and `height_mm`; orientation; margin.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(extend(
    "dependencies" = {"width_mm": ["height_mm"], "height_mm": ["width_mm"]},
    "not" = {"anyOf": [{"required": ["size", "width_mm"]}, {"required": ["size", "height_mm"]}]}
))]
pub(super) struct RawPaper {
    /// A named paper size, in any case (or give width_mm and height_mm).
    #[schemars(with = "Option<String>", extend("pattern" = paper_size_pattern(), "default" = "A4"))]
    pub size: Option<Spanned<String>>,
    /// A custom paper's width, with `height_mm` (instead of `size`); no upper
    /// limit here, but a sheet's drawing must fit. Default: A4's 210 mm.
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "exclusiveMinimum" = 0.0))]
    pub width_mm: Option<Spanned<f64>>,
    /// A custom paper's height, with `width_mm` (instead of `size`); no upper
    /// limit here, but a sheet's drawing must fit. Default: A4's 297 mm.
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "exclusiveMinimum" = 0.0))]
    pub height_mm: Option<Spanned<f64>>,
    /// "portrait", "landscape", or "auto" (each sheet the way its drawing fits), in any case.
    #[schemars(with = "Option<String>", extend("pattern" = orientation_pattern(), "default" = "auto"))]
    pub orientation: Option<Spanned<String>>,
    /// Margin kept clear on every side for the printer; no upper limit here,
    /// but it must leave 100 mm of printable width on the paper.
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "minimum" = 0.0, "default" = 10.0))]
    pub margin_mm: Option<Spanned<f64>>,
}

/// The class set.
#[derive(Deserialize, Debug, JsonSchema)]
#[serde(deny_unknown_fields)]
#[schemars(extend("not" = {"required": ["groups", "names"]}))]
pub(super) struct RawClass {
    /// Number of groups, named "Group 1" … (or give `names`). Default: no groups.
    #[schemars(with = "Option<i64>", extend("x-unit" = "groups", "minimum" = 1, "maximum" = MAX_GROUPS))]
    pub groups: Option<Spanned<i64>>,
    /// The groups' names, printed on their sheets (unique, at most 40
    /// characters each; or give `groups`). Default: no groups.
    #[schemars(with = "Option<Vec<String>>", extend("minItems" = 1, "maxItems" = MAX_GROUPS, "items" = {"type": "string", "pattern": group_name_pattern()}))]
    pub names: Option<Spanned<Vec<Spanned<String>>>>,
    /// Seed for the groups' variants: the same kit and seed give the same
    /// sheets; no upper limit but TOML's own. Default: the command line's
    /// --seed, else 1.
    #[schemars(with = "Option<i64>", extend("x-unit" = "1", "minimum" = 0))]
    pub seed: Option<Spanned<i64>>,
    /// Grid the groups' guide heights lie on.
    #[schemars(with = "Option<f64>", extend("x-unit" = "mm", "minimum" = 0.1, "maximum" = 5.0, "default" = 0.5))]
    pub grid_mm: Option<Spanned<f64>>,
}

/// Inline tables inside other tables, named by their key in [`TABLE_FIELDS`].
pub(super) const NESTED_TABLES: &[&str] = &["sellmeier", "colours"];

/// Field names each table accepts, for "did you mean" hints.
pub(super) const TABLE_FIELDS: &[(&str, &[&str])] = &[
    ("", &["title", "materials", "ray_box", "pieces", "sheets", "paper", "class", "printer"]),
    ("materials", &["index", "sellmeier", "catalog", "label"]),
    ("sellmeier", &["b", "c_um2"]),
    ("ray_box", &["rays", "spacing_mm", "ray_width_mm", "wavelength_nm", "colours"]),
    ("colours", &["name", "wavelength_nm"]),
    (
        "pieces",
        &[
            "id",
            "label",
            "material",
            "shape",
            "front",
            "back",
            "thickness_mm",
            "height_mm",
            "apex_deg",
            "side_mm",
        ],
    ),
    ("paper", &["size", "width_mm", "height_mm", "orientation", "margin_mm"]),
    ("class", &["groups", "names", "seed", "grid_mm"]),
    ("printer", &["long_ruler_mm", "short_ruler_mm"]),
];
