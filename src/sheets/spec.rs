//! A checked sheet request, the settings a class variant may change, and the
//! lesson: a kit with all its sheets checked by their kinds.

use super::SheetKind;
use super::field::{FieldValue, SheetField};
use crate::kit::{Kit, KitError, SheetEntry};

/// The face the light meets first, as the kit names it.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Enter {
    /// A lens shape's `front` face.
    Front,
    /// A lens shape's `back` face.
    Back,
    /// A prism's equal face (a block's entry face is always this one).
    Side,
    /// A right-angle prism's base (hypotenuse).
    Base,
    /// A half-disc's curved face (index and critical-angle sheets).
    Curved,
    /// A half-disc's flat face, at its centre (index sheets).
    Flat,
}

impl Enter {
    /// The kit word.
    pub fn as_str(self) -> &'static str {
        match self {
            Enter::Front => "front",
            Enter::Back => "back",
            Enter::Side => "side",
            Enter::Base => "base",
            Enter::Curved => "curved",
            Enter::Flat => "flat",
        }
    }
}

/// One sheet asked for by the kit, checked by its kind.
#[derive(Clone, Debug, PartialEq)]
pub struct SheetSpec {
    /// 1-based position in the kit's `[[sheets]]` list.
    pub number: usize,
    /// What kind of sheet.
    pub kind: SheetKind,
    /// Index into [`Kit::pieces`].
    pub piece: usize,
    /// Which face the light meets first.
    pub enter: Enter,
    /// Whether class variants may turn the piece round (lens shapes).
    pub vary_entry: bool,
    /// Fixed guide heights, mm (signed, + above the axis); `None`: chosen.
    pub heights_mm: Option<Vec<f64>>,
    /// Fixed angles of incidence, degrees (signed); `None`: chosen.
    pub angles_deg: Option<Vec<f64>>,
    /// Line of the `[[sheets]]` entry.
    pub line: usize,
    /// With `all_colours = true`: every colour of the ray box with the
    /// piece's index in it (empty otherwise). Set by [`Lesson::check`].
    pub lights: Vec<super::colours::Light>,
    /// The paper the piece's material formula comes from, for a built-in
    /// material. Set by [`Lesson::check`].
    pub source: Option<&'static str>,
}

impl SheetSpec {
    /// A checked angle sheet (block or prism): no heights, no turning round.
    pub fn angled(
        entry: &crate::kit::SheetEntry,
        kind: SheetKind,
        enter: Enter,
        angles_deg: Option<Vec<f64>>,
    ) -> SheetSpec {
        SheetSpec {
            number: entry.number,
            kind,
            piece: entry.piece,
            enter,
            vary_entry: false,
            heights_mm: None,
            angles_deg,
            line: entry.at.line(),
            lights: Vec::new(),
            source: None,
        }
    }
}

/// What a class variant sets on a sheet: the entry side and the guide values
/// (heights in mm or angles in degrees, as the kind reads them).
#[derive(Clone, Debug, PartialEq)]
pub struct Choice {
    /// The face the light meets first.
    pub enter: Enter,
    /// Guide heights or angles.
    pub values: Vec<f64>,
}

/// A kit with every sheet checked by its kind: what a run works from.
#[derive(Clone, Debug, PartialEq)]
pub struct Lesson {
    /// The validated kit.
    pub kit: Kit,
    /// Its sheets, in kit order.
    pub sheets: Vec<SheetSpec>,
}

impl Lesson {
    /// Parses and checks kit text: the kit itself, then every sheet by its
    /// kind. `file` is the name used in messages.
    pub fn from_toml(text: &str, file: &str) -> Result<Lesson, KitError> {
        Lesson::check(Kit::from_toml(text, file)?)
    }

    /// Checks every sheet of a validated kit by its kind.
    pub fn check(kit: Kit) -> Result<Lesson, KitError> {
        let mut sheets = Vec::new();
        for entry in &kit.sheets {
            let Some(kind) = SheetKind::from_word(&entry.kind.value) else {
                let words: Vec<String> =
                    SheetKind::ALL.iter().map(|k| format!("\"{}\"", k.as_str())).collect();
                let (last, rest) = words.split_last().expect("there are sheet kinds");
                return Err(entry.kind.at.error(
                    format!("\"{}\" is not a sheet kind", entry.kind.value),
                    format!("give {} or {last}", rest.join(", ")),
                ));
            };
            // Whether the piece fits comes first: it says more than a field the
            // kind does not take.
            let mut spec = kind.def().check(entry, &kit)?;
            let lights = check_all_colours(entry, &kit, kind)?;
            // A kind may set its colours itself (spectrum sheets always trace them).
            if !lights.is_empty() {
                spec.lights = lights;
            }
            let kp = &kit.pieces[spec.piece];
            spec.source = kit.materials.get(&kp.material).and_then(|m| m.source()).map(|p| p.citation);
            let accepted: Vec<&str> =
                kind.def().fields().iter().chain(SHARED_FIELDS).map(|f| f.name).collect();
            entry.reject_unknown(&accepted)?;
            sheets.push(spec);
        }
        Ok(Lesson { kit, sheets })
    }
}

/// Fields every kind of sheet accepts besides `kind` and `piece`, checked here.
pub const SHARED_FIELDS: &[SheetField] = &[SheetField {
    name: "all_colours",
    about: "Trace every guide ray in every colour of the ray box; the key gives each colour's answer and the spread (needs a material with dispersion and two colours or more). Curved-face, focal, block, prism, index and critical-angle sheets; a spectrum sheet always traces every colour; a radius sheet (no rays) accepts only false.",
    value: FieldValue::Flag { default: false, only: None },
}];

/// [`SHARED_FIELDS`] as `kind` reads them: `all_colours` only false where
/// the kind does not trace colours.
pub fn shared_fields(kind: SheetKind) -> Vec<SheetField> {
    SHARED_FIELDS
        .iter()
        .map(|f| match f.value {
            FieldValue::Flag { default, .. } if f.name == "all_colours" && !kind.def().takes_colours() => {
                SheetField { value: FieldValue::Flag { default, only: Some(false) }, ..*f }
            }
            _ => *f,
        })
        .collect()
}

/// `all_colours = true`: every guide ray traced in every colour of the ray box.
/// Needs a material with dispersion, at least two colours and a kind that
/// traces colours ([`super::Kind::takes_colours`]); gives each colour with the
/// piece's index in it (empty without the flag).
fn check_all_colours(
    entry: &SheetEntry,
    kit: &Kit,
    kind: SheetKind,
) -> Result<Vec<super::colours::Light>, KitError> {
    let Some(flag) = entry.flag("all_colours")? else { return Ok(Vec::new()) };
    if !flag.value {
        return Ok(Vec::new());
    }
    let kp = &kit.pieces[entry.piece];
    let disperses = kit.materials.get(&kp.material).is_some_and(|m| m.dispersion().disperses());
    if !disperses {
        return Err(flag.at.error(
            format!(
                "piece `{}` is made of `{}`, which has no dispersion (only `index`): every colour would take the same path",
                kp.id, kp.material
            ),
            format!(
                "give [materials.{}] a sellmeier formula or a catalog material (`raysheet materials` lists them) instead of index, or remove all_colours",
                kp.material
            ),
        ));
    }
    let colours = kit.ray_box.colours.len();
    if colours < 2 {
        return Err(flag.at.error(
            format!("the ray box lists {colours} colour(s); all_colours compares at least two"),
            "add colours = [ { name = \"red\", wavelength_nm = 656.3 }, { name = \"blue\", wavelength_nm = 486.1 } ] to [ray_box]",
        ));
    }
    if !kind.def().takes_colours() {
        let takes: Vec<String> = SheetKind::ALL
            .iter()
            .filter(|k| k.def().takes_colours())
            .map(|k| format!("\"{}\"", k.as_str()))
            .collect();
        return Err(flag.at.error(
            format!("{} sheets do not trace colours yet", kind.as_str()),
            format!(
                "remove all_colours = true, or set [ray_box] wavelength_nm to one colour's wavelength for a key in that colour; all_colours works on {}",
                takes.join(", ")
            ),
        ));
    }
    let material = kit.materials.get(&kp.material).expect("disperses, so it exists");
    Ok(kit
        .ray_box
        .colours
        .iter()
        .map(|c| super::colours::Light {
            name: c.name.clone(),
            wavelength_nm: c.wavelength_nm,
            index: material.index_at(c.wavelength_nm),
        })
        .collect())
}

impl std::ops::Deref for Lesson {
    type Target = Kit;
    /// A lesson reads as its kit (title, pieces, paper, class), with its own
    /// checked `sheets` in place of the kit's raw sheet tables.
    fn deref(&self) -> &Kit {
        &self.kit
    }
}
