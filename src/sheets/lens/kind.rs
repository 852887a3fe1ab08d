//! The curved-face and focal kinds: which pieces they fit, the kit fields
//! they read, and their class variants (guide heights and entry side).

use super::{SafeBand, lead_in_for, lens_of, plan_sheet_in_band, rules_for, safe_band};
use crate::kit::{Kit, KitError, SheetEntry};
use crate::optics::MAX_PIECE_MM;
use crate::optics::{Entry, Outline, Paraxial};
use crate::paper::PaperSpec;
use crate::plan::scan::grid_values;
use crate::plan::to_grid;
use crate::sheets::field::{Bound, FieldValue, SheetField};
use crate::sheets::{Choice, Enter, Kind, Prepared, SheetKind, SheetPlan, SheetSpec};

/// Single guide rays: flat face first, refraction at the curved face.
pub struct CurvedFaceKind;
/// The ray box's beam through a converging or diverging lens shape.
pub struct FocalKind;

/// The curved-face kind.
pub static CURVED_FACE: CurvedFaceKind = CurvedFaceKind;
/// The focal kind.
pub static FOCAL: FocalKind = FocalKind;

/// The face the light meets first.
const ENTER: SheetField = SheetField {
    name: "enter",
    about: "The face of the lens shape the light meets first: its \"front\" or its \"back\" face.",
    value: FieldValue::Word { choices: &["front", "back"], default: "front" },
};

/// Fixed guide heights (else chosen in the safe band).
const HEIGHTS: SheetField = SheetField {
    name: "heights_mm",
    about: "Fixed guide-ray heights above (+) or below (-) the optical axis, each inside the piece's half height. Default: chosen in the safe band, and for each group of a class set.",
    value: FieldValue::Numbers {
        unit: "mm",
        min: Bound::Excl(-MAX_PIECE_MM / 2.0),
        max: Bound::Excl(MAX_PIECE_MM / 2.0),
        most: 9,
    },
};

const CURVED_FACE_FIELDS: &[SheetField] = &[
    ENTER,
    HEIGHTS,
    SheetField {
        name: "vary_entry",
        about: "Whether a class set's groups may get the piece turned round; a curved-face sheet is always entered through its flat face, so only false is accepted.",
        value: FieldValue::Flag { default: false, only: Some(false) },
    },
];

const FOCAL_FIELDS: &[SheetField] = &[
    ENTER,
    HEIGHTS,
    SheetField {
        name: "vary_entry",
        about: "Whether a class set's groups may get the piece turned round (entered from the other face).",
        value: FieldValue::Flag { default: false, only: None },
    },
];

/// The kit's word for a lens entry side.
pub fn enter_of(entry: Entry) -> Enter {
    match entry {
        Entry::Front => Enter::Front,
        Entry::Back => Enter::Back,
    }
}

fn entry_of(enter: Enter) -> Entry {
    if enter == Enter::Back { Entry::Back } else { Entry::Front }
}

impl Kind for CurvedFaceKind {
    fn word(&self) -> &'static str {
        "curved-face"
    }
    fn title(&self) -> &'static str {
        "Refraction at a curved face"
    }
    fn fields(&self) -> &'static [SheetField] {
        CURVED_FACE_FIELDS
    }
    fn fits(&self) -> &'static str {
        "a lens shape with one flat and one curved face, entered through the flat face (a half-disc, a plano-convex or plano-concave shape)"
    }
    fn check(&self, entry: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
        check(SheetKind::CurvedFace, entry, kit)
    }
    fn takes_colours(&self) -> bool {
        true
    }

    fn prepare<'a>(&self, kit: &'a Kit, spec: &'a SheetSpec, paper: &'a PaperSpec) -> Box<dyn Prepared + 'a> {
        Box::new(LensPrepared::new(kit, spec, paper))
    }
}

impl Kind for FocalKind {
    fn word(&self) -> &'static str {
        "focal"
    }
    fn title(&self) -> &'static str {
        "Focal length of a lens shape"
    }
    fn fields(&self) -> &'static [SheetField] {
        FOCAL_FIELDS
    }
    fn fits(&self) -> &'static str {
        "a lens shape with a focal length (converging or diverging)"
    }
    fn check(&self, entry: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
        check(SheetKind::Focal, entry, kit)
    }
    fn takes_colours(&self) -> bool {
        true
    }

    fn prepare<'a>(&self, kit: &'a Kit, spec: &'a SheetSpec, paper: &'a PaperSpec) -> Box<dyn Prepared + 'a> {
        Box::new(LensPrepared::new(kit, spec, paper))
    }
}

fn check(kind: SheetKind, s: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
    let kp = &kit.pieces[s.piece];
    let Some(lens) = kp.piece.lens() else {
        return Err(s.kind.at.error(
            format!(
                "a {} sheet needs a lens shape; piece `{}` is a {}",
                kind.as_str(),
                kp.id,
                kp.piece.shape_word()
            ),
            format!(
                "use a lens shape or half-disc here, or a \"{}\" sheet for this piece",
                if kp.piece.shape_word() == "block" { "block" } else { "prism" }
            ),
        ));
    };
    let enter = s.word("enter")?;
    let entry = match enter.as_ref().map(|e| e.value.as_str()) {
        None | Some("front") => Entry::Front,
        Some("back") => Entry::Back,
        Some(other) => {
            let at = &enter.as_ref().expect("matched Some").at;
            return Err(at.error(
                format!("\"{other}\" is not a side"),
                "give \"front\" or \"back\": the face the light meets first",
            ));
        }
    };
    let (first, second) = lens.faces_for(entry);
    match kind {
        SheetKind::CurvedFace => {
            if first.is_curved() || !second.is_curved() {
                let other = entry.flipped();
                let (of, os) = lens.faces_for(other);
                let hint = if !of.is_curved() && os.is_curved() {
                    format!("set enter = \"{}\" so the light meets the flat face first", other.as_str())
                } else {
                    "a curved-face sheet needs a piece with one flat and one curved face, such as a half-disc or a plano-convex shape".to_string()
                };
                let at = enter.as_ref().map(|e| &e.at).unwrap_or(&s.kind.at);
                return Err(at.error(
                    format!(
                        "a curved-face sheet needs the light to meet a flat face first and a curved face second; piece `{}` entered from the {} has a {} face first and a {} face second",
                        kp.id,
                        entry.as_str(),
                        first.describe(),
                        second.describe()
                    ),
                    hint,
                ));
            }
        }
        _ => {
            if Paraxial::of(lens, entry).efl_mm().is_none() {
                return Err(s.kind.at.error(
                    format!("piece `{}` has no focal length (both faces flat, or powers that cancel)", kp.id),
                    "use a converging or diverging piece for a focal sheet",
                ));
            }
        }
    }
    let vary = s.flag("vary_entry")?;
    let vary_entry = vary.as_ref().is_some_and(|v| v.value);
    if vary_entry && kind == SheetKind::CurvedFace {
        return Err(vary.expect("vary_entry is set").at.error(
            "a curved-face sheet must be entered through its flat face, so the entry side cannot vary",
            "remove vary_entry from this sheet",
        ));
    }
    let heights = match s.numbers("heights_mm")? {
        None => None,
        Some(list) => {
            let a = lens.half_height_mm();
            if list.value.is_empty() {
                return Err(list.at.error(
                    "the list of guide heights is empty",
                    "give at least one height, such as [10, -10], or leave heights_mm out to have them chosen",
                ));
            }
            if list.value.len() > 9 {
                return Err(list.at.error(
                    format!("{} guide heights is more than a sheet can show clearly", list.value.len()),
                    "give at most 9 heights",
                ));
            }
            let mut out = Vec::new();
            for h in &list.value {
                let v = h.value;
                if !v.is_finite() || v.abs() >= a {
                    return Err(h.at.error(
                        format!(
                            "guide height {v} mm is outside piece `{}`, which reaches {a} mm either side of the axis",
                            kp.id
                        ),
                        format!("give heights between -{a} and {a} mm (not on the edge)"),
                    ));
                }
                out.push(v);
            }
            Some(out)
        }
    };
    Ok(SheetSpec {
        number: s.number,
        kind,
        piece: s.piece,
        enter: enter_of(entry),
        vary_entry,
        heights_mm: heights,
        angles_deg: None,
        line: s.at.line(),
        lights: Vec::new(),
        source: None,
    })
}

/// A lens sheet with its safe band worked out once for each entry side.
struct LensPrepared<'a> {
    kit: &'a Kit,
    spec: &'a SheetSpec,
    paper: &'a PaperSpec,
    bands: [Option<SafeBand>; 2],
}

impl<'a> LensPrepared<'a> {
    fn new(kit: &'a Kit, spec: &'a SheetSpec, paper: &'a PaperSpec) -> LensPrepared<'a> {
        let lens = lens_of(kit, spec);
        let band_for = |entry: Entry| {
            let outline = Outline::new(lens, entry);
            let lead = lead_in_for(&Paraxial::of(&lens, entry), paper);
            safe_band(&outline, &rules_for(spec.kind, kit, paper, &outline, lead))
        };
        // The other side's band is worked out only when class variants may use it.
        let own = entry_of(spec.enter);
        let other =
            (spec.vary_entry && lens.front() != lens.back()).then(|| band_for(own.flipped())).flatten();
        let bands = if own == Entry::Front { [band_for(own), other] } else { [other, band_for(own)] };
        LensPrepared { kit, spec, paper, bands }
    }

    fn band(&self, entry: Entry) -> Option<SafeBand> {
        self.bands[usize::from(entry == Entry::Back)].clone()
    }
}

impl Prepared for LensPrepared<'_> {
    fn choices(&self) -> Vec<Choice> {
        let (kit, spec) = (self.kit, self.spec);
        let lens = lens_of(kit, spec);
        let grid = kit.class.grid_mm;
        let w = kit.ray_box.ray_width_mm;
        if spec.heights_mm.is_some() {
            return Vec::new();
        }
        // Turning round a piece whose two faces are alike gives the same setup, so
        // it adds no variety.
        let own = entry_of(spec.enter);
        let symmetric = lens.front() == lens.back();
        let entries = if spec.vary_entry && !symmetric { vec![own, own.flipped()] } else { vec![own] };
        let mut out = Vec::new();
        for entry in entries {
            let Some(band) = self.band(entry) else { continue };
            let enter = enter_of(entry);
            match spec.kind {
                SheetKind::CurvedFace => {
                    // A symmetric pair ±low (rays at the same height on both sides
                    // cross at the same point) and one high ray on either side
                    // (spherical aberration), at least two ray widths apart.
                    let values = grid_values(band.min_mm, band.max_mm, grid);
                    let before = out.len();
                    for low in preferred_lows(&values, lens.half_height_mm()) {
                        for &high in values.iter().filter(|&&v| v - low >= 2.0 * w) {
                            for side in [1.0, -1.0] {
                                let mut hs = vec![low, -low, side * high];
                                hs.sort_by(|a, b| b.total_cmp(a));
                                out.push(Choice { enter, values: hs });
                            }
                        }
                    }
                    if out.len() == before {
                        for &low in &values {
                            out.push(Choice { enter, values: vec![low, -low] });
                        }
                    }
                }
                _ => {
                    // The ray box's comb, moved up or down by a grid step: every ray
                    // must stay below the band's upper end.
                    let n = kit.ray_box.rays;
                    let s = kit.ray_box.spacing_mm;
                    for off in grid_values(-s / 2.0 + grid, s / 2.0, grid) {
                        let hs: Vec<f64> = (0..n)
                            .rev()
                            .map(|i| to_grid(off + (f64::from(i) - f64::from(n - 1) / 2.0) * s, grid / 4.0))
                            .collect();
                        if hs.iter().all(|h| h.abs() <= band.max_mm) {
                            out.push(Choice { enter, values: hs });
                        }
                    }
                }
            }
        }
        out
    }

    fn notes(&self, groups: usize) -> Vec<String> {
        let (kit, spec) = (self.kit, self.spec);
        let lens = lens_of(kit, spec);
        let mut notes = Vec::new();
        if spec.vary_entry && lens.front() == lens.back() {
            notes.push(format!(
                "sheet {}: piece {} has two alike faces, so turning it round (vary_entry) gives no new settings",
                spec.number, kit.pieces[spec.piece].id
            ));
        }
        let options = self.choices().len();
        if spec.heights_mm.is_some() {
            notes.push(format!(
                "sheet {} has fixed heights_mm, so every group gets the same guide heights",
                spec.number
            ));
        } else if options == 0 {
            notes.push(format!(
                "sheet {}: no guide heights qualify, so every group gets the default heights",
                spec.number
            ));
        } else if options < groups {
            notes.push(format!(
                "sheet {}: the safe band has room for only {options} different setting(s) for {groups} groups, so some groups share guide heights",
                spec.number
            ));
        }
        notes
    }

    fn plan(&self, choice: Option<&Choice>) -> SheetPlan {
        match choice {
            Some(c) => {
                let entry = entry_of(c.enter);
                plan_sheet_in_band(self.kit, self.spec, self.paper, entry, Some(&c.values), self.band(entry))
            }
            None => {
                let entry = entry_of(self.spec.enter);
                plan_sheet_in_band(
                    self.kit,
                    self.spec,
                    self.paper,
                    entry,
                    self.spec.heights_mm.as_deref(),
                    self.band(entry),
                )
            }
        }
    }
}

/// The symmetric pair's heights a class set deals out: the band's grid values
/// (`values`, all markable) from a quarter to a third of the half-height `a`,
/// where teachers place single rays (DESIGN.md, "Where the rays should go";
/// common practice, no source). When the band holds none there, the values
/// nearest that range (within 1 mm of the nearest), so the pair stays as
/// close to it as the band allows.
pub(crate) fn preferred_lows(values: &[f64], a: f64) -> Vec<f64> {
    let (lo, hi) = (a / 4.0, a / 3.0);
    let gap = |v: f64| (lo - v).max(v - hi).max(0.0);
    let nearest = values.iter().map(|&v| gap(v)).fold(f64::INFINITY, f64::min);
    values
        .iter()
        .copied()
        .filter(|&v| gap(v) <= nearest.max(0.0) + if nearest > 0.0 { 1.0 } else { 1e-9 })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::preferred_lows;

    #[test]
    fn class_pairs_sit_a_quarter_to_a_third_of_the_half_height_out() {
        // a = 50: 12.5–16.7 mm (DESIGN.md's band for single rays).
        let values: Vec<f64> = (20..=62).map(|i| f64::from(i) * 0.5).collect();
        let got = preferred_lows(&values, 50.0);
        assert_eq!(got.first().copied(), Some(12.5));
        assert_eq!(got.last().copied(), Some(16.5));
        // a = 31 with the band starting at 10.5 (above a third, 10.33): the
        // lowest values, within 1 mm of the nearest.
        let values: Vec<f64> = (21..=38).map(|i| f64::from(i) * 0.5).collect();
        assert_eq!(preferred_lows(&values, 31.0), vec![10.5, 11.0, 11.5]);
        assert!(preferred_lows(&[], 31.0).is_empty());
    }
}
