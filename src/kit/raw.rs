//! The TOML mirror of a kit file: serde structs that keep every field's span.

use std::collections::BTreeMap;

use serde::Deserialize;
use toml::Spanned;

#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawKit {
    pub title: Option<Spanned<String>>,
    #[serde(default)]
    pub materials: BTreeMap<String, Spanned<RawMaterial>>,
    pub ray_box: Option<Spanned<RawRayBox>>,
    #[serde(default)]
    pub pieces: Vec<Spanned<RawPiece>>,
    #[serde(default)]
    pub sheets: Vec<Spanned<super::fields::RawSheetTable>>,
    pub paper: Option<Spanned<RawPaper>>,
    pub class: Option<Spanned<RawClass>>,
    pub printer: Option<Spanned<RawPrinter>>,
}

#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawPrinter {
    pub long_ruler_mm: Spanned<f64>,
    pub short_ruler_mm: Spanned<f64>,
}

#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawMaterial {
    pub index: Option<Spanned<f64>>,
    pub sellmeier: Option<Spanned<RawSellmeier>>,
    pub catalog: Option<Spanned<String>>,
    #[expect(dead_code, reason = "accepted for the teacher's own notes; not printed")]
    pub label: Option<Spanned<String>>,
}

/// `sellmeier = { b = [...], c_um2 = [...] }`.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawSellmeier {
    pub b: Spanned<Vec<Spanned<f64>>>,
    pub c_um2: Spanned<Vec<Spanned<f64>>>,
}

#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawRayBox {
    pub rays: Option<Spanned<i64>>,
    pub spacing_mm: Option<Spanned<f64>>,
    pub ray_width_mm: Option<Spanned<f64>>,
    pub wavelength_nm: Option<Spanned<f64>>,
    pub colours: Option<Spanned<Vec<Spanned<RawColour>>>>,
}

/// One of the ray box's colours: `{ name = "red", wavelength_nm = 656.3 }`.
#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawColour {
    pub name: Spanned<String>,
    pub wavelength_nm: Spanned<f64>,
}

#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawPiece {
    pub id: Spanned<String>,
    pub label: Option<Spanned<String>>,
    pub material: Spanned<String>,
    pub shape: Option<Spanned<String>>,
    pub front: Option<Spanned<toml::Value>>,
    pub back: Option<Spanned<toml::Value>>,
    pub thickness_mm: Option<Spanned<f64>>,
    pub height_mm: Option<Spanned<f64>>,
    pub apex_deg: Option<Spanned<f64>>,
    pub side_mm: Option<Spanned<f64>>,
}

#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawPaper {
    pub size: Option<Spanned<String>>,
    pub width_mm: Option<Spanned<f64>>,
    pub height_mm: Option<Spanned<f64>>,
    pub orientation: Option<Spanned<String>>,
    pub margin_mm: Option<Spanned<f64>>,
}

#[derive(Deserialize, Debug)]
#[serde(deny_unknown_fields)]
pub(super) struct RawClass {
    pub groups: Option<Spanned<i64>>,
    pub names: Option<Spanned<Vec<Spanned<String>>>>,
    pub seed: Option<Spanned<i64>>,
    pub grid_mm: Option<Spanned<f64>>,
}

/// Inline tables inside other tables, named by their key in [`TABLE_FIELDS`].
pub(super) const NESTED_TABLES: &[&str] = &["sellmeier", "colours"];

/// Field names each table accepts, for "did you mean" hints.
pub(super) const TABLE_FIELDS: &[(&str, &[&str])] = &[
    ("", &["title", "materials", "ray_box", "pieces", "sheets", "paper", "class"]),
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
];
