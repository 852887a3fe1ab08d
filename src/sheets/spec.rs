//! A checked sheet request, the settings a class variant may change, and the
//! lesson: a kit with all its sheets checked by their kinds.

use super::SheetKind;
use crate::kit::{Kit, KitError};

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
            let spec = kind.def().check(entry, &kit)?;
            entry.reject_unknown(kind.def().fields())?;
            sheets.push(spec);
        }
        Ok(Lesson { kit, sheets })
    }
}

impl std::ops::Deref for Lesson {
    type Target = Kit;
    /// A lesson reads as its kit (title, pieces, paper, class), with its own
    /// checked `sheets` in place of the kit's raw sheet tables.
    fn deref(&self) -> &Kit {
        &self.kit
    }
}
