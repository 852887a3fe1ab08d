//! The rectangular-block sheet's optics: a guide ray into the middle of the
//! entry face, its angle of refraction and its lateral shift.

use std::fmt::Write;

use serde_json::json;

use super::angled::{AngleRange, AngleRules, AngledPlan, AngledSetup, Expected, spread_in_band};
use super::angled_view::{self as av, angle, with_range};
use super::field::{Bound, FieldValue, SheetField};
use super::{
    Choice, Detail, Enter, Kind, Prepared, Setup, SheetKind, SheetPlan, SheetSpec, SheetView, SummaryRow,
};
use crate::draw::{Drawing, Words};
use crate::geom::{Point, Vec2};
use crate::kit::{Kit, KitError, SheetEntry};
use crate::optics::{Block, BlockFace, Piece};
use crate::paper::PaperSpec;
use crate::plan::fmt_index;
use crate::plan::scan::{Band, grid_values};
use crate::scene::{Item, Rect};

/// Length of the printed guide line before the entry point, mm.
pub const LEAD_MM: f64 = 50.0;
/// Length of the emergent ray a student draws, mm (common practice, no source).
pub const OUT_MM: f64 = 45.0;

/// A block on the sheet: its entry face on x = 0 from y = +h/2 down to −h/2,
/// the light coming from the left and meeting the face's middle (the origin).
/// A positive angle of incidence has the incoming ray above the normal, going
/// down to the right.
pub fn setup(block: &Block) -> AngledSetup<BlockFace> {
    AngledSetup {
        shape: block.shape(),
        index: block.index,
        entry_face: BlockFace::Entry,
        entry_point: Point::new(0.0, 0.0),
        outward: Vec2::new(-1.0, 0.0),
        sense: -1.0,
        toward: None,
        expected: Expected::Refract { exit: BlockFace::Exit },
        lead_mm: LEAD_MM,
        out_mm: OUT_MM,
        plots_deviation: false,
    }
}

/// The block kind.
pub struct BlockKind;
/// The block kind, for the kind list.
pub static KIND: BlockKind = BlockKind;

/// Angles of incidence a block sheet scans for its band, degrees.
const RANGE: AngleRange = AngleRange { from: 0.0, to: 89.0, prefer: 45.0, need_shift: true };
/// Step of the angles class variants are drawn from, degrees.
const STEP_DEG: f64 = 1.0;
/// Least difference between two rays' angles on one sheet, degrees.
const MIN_APART_DEG: f64 = 8.0;

impl Kind for BlockKind {
    fn word(&self) -> &'static str {
        "block"
    }
    fn title(&self) -> &'static str {
        "Sideways shift through a rectangular block"
    }
    fn fields(&self) -> &'static [SheetField] {
        &[SheetField {
            name: "angles_deg",
            about: "Fixed angles of incidence at the middle of the entry face, from its normal. Default: 30, 45 and 60 where the safe band has them, else three spread across it; chosen for each group of a class set.",
            value: FieldValue::Numbers {
                unit: "deg",
                min: Bound::Incl(0.0),
                max: Bound::Incl(89.9),
                most: 9,
            },
        }]
    }
    fn fits(&self) -> &'static str {
        "a rectangular block"
    }
    fn check(&self, s: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
        let kp = &kit.pieces[s.piece];
        if !matches!(kp.piece, Piece::Block(_)) {
            return Err(s.kind.at.error(
                format!(
                    "a block sheet needs a rectangular block; piece `{}` is a {}",
                    kp.id,
                    kp.piece.shape_word()
                ),
                "give a piece with shape = \"block\", or choose another kind of sheet for this piece",
            ));
        }
        let angles = av::check_angles(s, 0.0, 89.9)?;
        Ok(SheetSpec::angled(s, SheetKind::Block, Enter::Side, angles))
    }
    fn takes_colours(&self) -> bool {
        true
    }

    fn prepare<'a>(
        &self,
        kit: &'a Kit,
        spec: &'a SheetSpec,
        _paper: &'a PaperSpec,
    ) -> Box<dyn Prepared + 'a> {
        let Piece::Block(block) = kit.pieces[spec.piece].piece else {
            unreachable!("a checked block sheet's piece is a block")
        };
        let rules = AngleRules::for_ray_width(kit.ray_box.ray_width_mm);
        let s = setup(&block);
        let band = s.band(&rules, RANGE.from, RANGE.to, RANGE.prefer, RANGE.need_shift);
        Box::new(BlockPrepared { kit, spec, block, rules, band })
    }
}

/// The default angles: the textbook 30°, 45° and 60° where the band has them,
/// else three spread across the band.
fn default_angles(band: Option<&Band<super::angled::AngleLimit>>) -> Vec<f64> {
    let textbook: Vec<f64> =
        [30.0, 45.0, 60.0].into_iter().filter(|a| band.is_some_and(|b| b.contains(*a))).collect();
    if textbook.len() >= 2 {
        return textbook;
    }
    let spread = spread_in_band(band, &[0.15, 0.5, 0.85], STEP_DEG);
    if spread.is_empty() { vec![30.0, 45.0, 60.0] } else { spread }
}

struct BlockPrepared<'a> {
    kit: &'a Kit,
    spec: &'a SheetSpec,
    block: Block,
    rules: AngleRules,
    band: Option<Band<super::angled::AngleLimit>>,
}

impl Prepared for BlockPrepared<'_> {
    fn choices(&self) -> Vec<Choice> {
        if self.spec.angles_deg.is_some() {
            return Vec::new();
        }
        let Some(b) = &self.band else { return Vec::new() };
        // Three angles a whole number of degrees, at least 8° apart, one in each
        // third of the band so every group sees small, middle and large angles.
        let grid = grid_values(b.min, b.max, STEP_DEG);
        let third = b.width() / 3.0;
        let part = |k: f64| {
            grid.iter()
                .copied()
                .filter(move |v| *v >= b.min + k * third - 1e-9 && *v <= b.min + (k + 1.0) * third + 1e-9)
        };
        let mut out = Vec::new();
        for lo in part(0.0) {
            for mid in part(1.0).filter(|m| m - lo >= MIN_APART_DEG) {
                for hi in part(2.0).filter(|h| h - mid >= MIN_APART_DEG) {
                    out.push(Choice { enter: Enter::Side, values: vec![lo, mid, hi] });
                }
            }
        }
        out
    }

    fn notes(&self, groups: usize) -> Vec<String> {
        av::angle_notes(self.spec.number, self.spec.angles_deg.is_some(), self.choices().len(), groups)
    }

    fn plan(&self, choice: Option<&Choice>) -> SheetPlan {
        let angles = choice.map(|c| c.values.clone()).or_else(|| self.spec.angles_deg.clone());
        let plan =
            AngledPlan::in_band(setup(&self.block), self.rules, self.band, angles.as_deref(), default_angles);
        let kp = &self.kit.pieces[self.spec.piece];
        let warnings = angle_warnings(&plan);
        let (lo, hi) = super::angled_drawing::extent(&plan);
        let view = BlockPlan {
            block: self.block,
            plan,
            setup: Setup { x_min: lo.x, x_max: hi.x, y_min: lo.y, y_max: hi.y },
        };
        SheetPlan {
            number: self.spec.number,
            kind: SheetKind::Block,
            piece_id: kp.id.clone(),
            piece_label: kp.label.clone(),
            enter: Enter::Side,
            index: self.block.index,
            wavelength_nm: self.kit.ray_box.wavelength_nm,
            group: None,
            variant: None,
            warnings,
            detail: Detail::Block(Box::new(view)),
            colours: None,
            source: None,
        }
    }
}

/// Warnings for rays outside the band or off the expected path.
pub fn angle_warnings<F: av::FaceName>(plan: &AngledPlan<F>) -> Vec<String> {
    let mut w = Vec::new();
    if plan.band.is_none() {
        w.push("no angle of incidence qualifies on this piece; check its size and the ray width".to_string());
    }
    for r in &plan.rays {
        if !r.path_ok {
            w.push(format!(
                "ray {} at {}: {} (not the path the sheet measures)",
                r.letter,
                angle(r.incidence_deg),
                av::outcome(plan, r).replace('-', " ")
            ));
        } else if let (false, Some((b, (lo, hi)))) =
            (r.in_band, plan.band.as_ref().zip(plan.band_words.as_ref()))
        {
            let why = if r.incidence_deg < b.min { lo } else { hi };
            w.push(format!(
                "ray {} at {} lies outside the safe band {:.1}°–{:.1}°: {why}",
                r.letter,
                angle(r.incidence_deg),
                b.min,
                b.max
            ));
        }
    }
    w
}

/// A planned block sheet.
#[derive(Clone, Debug, PartialEq)]
pub struct BlockPlan {
    /// The block.
    pub block: Block,
    /// Its rays and band.
    pub plan: AngledPlan<BlockFace>,
    /// What must be on paper.
    pub setup: Setup,
}

impl SheetView for BlockPlan {
    fn class_curve(&self) -> Option<crate::sheets::ClassCurve> {
        // Snell's law at the entry face (sin i = n sin r), every degree to 89°.
        let n = self.plan.setup.index;
        let points = (0..=89)
            .map(|i| (f64::from(i), (f64::from(i).to_radians().sin() / n).asin().to_degrees()))
            .collect();
        Some(crate::sheets::ClassCurve {
            x: "angle_of_incidence_deg",
            y: "refraction_angle_deg",
            points,
            paraxial: None,
        })
    }
    fn measured_at_index(&self, index: f64) -> Vec<crate::sheets::Measured> {
        BlockPlan { plan: self.plan.with_index(index), ..self.clone() }.measured()
    }

    fn colour_paths(&self, index: f64) -> Option<Vec<(String, Vec<crate::geom::Point>)>> {
        Some(crate::sheets::angled_drawing::ray_paths(&self.plan.with_index(index)))
    }
    fn measured(&self) -> Vec<crate::sheets::Measured> {
        let p = &self.plan;
        p.rays
            .iter()
            .filter(|r| av::graded(r))
            .flat_map(|r| {
                [
                    av::measured_one(
                        p,
                        r,
                        "refraction_angle_deg",
                        "deg",
                        &r.refraction_deg,
                        r.refraction_tolerance_deg,
                    ),
                    av::measured_one(p, r, "lateral_shift_mm", "mm", &r.lateral_shift_mm, r.tolerance_mm),
                ]
            })
            .collect()
    }
    fn extent(&self) -> Setup {
        self.setup
    }
    fn student(&self, bounds: Rect, w: &Words) -> Drawing {
        av::student_drawing(&self.plan, bounds, w)
    }
    fn key(&self, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item> {
        super::angled_drawing::key(&self.plan, &bounds, &mut base.placer, w)
    }
    fn template(&self) -> &'static str {
        "block.toml"
    }
    fn entry_words(&self, w: &Words) -> String {
        w.fill("entry_block", &[("length", &crate::plan::fmt_mm(self.block.height_mm))])
    }
    fn table_widths(&self) -> Vec<f64> {
        vec![0.09, 0.21, 0.35, 0.35]
    }
    fn table_rows(&self, key: bool, w: &Words) -> Vec<Vec<String>> {
        self.plan
            .rays
            .iter()
            .map(|r| {
                let mut row = vec![r.letter.clone(), angle(r.incidence_deg)];
                if key {
                    row.push(with_range(&r.refraction_deg, r.refraction_tolerance_deg, "°", w));
                    row.push(with_range(&r.lateral_shift_mm, r.tolerance_mm, "mm", w));
                }
                row
            })
            .collect()
    }
    fn key_lines(&self, w: &Words) -> Vec<String> {
        let b = &self.block;
        let mut v = vec![w.fill(
            "block_snell",
            &[("index", &fmt_index(b.index)), ("thickness", &b.thickness_mm.to_string())],
        )];
        if let (Some(band), Some((lo, hi))) = (&self.plan.band, self.plan.band_words_in(w)) {
            v.push(av::band_line(band, &lo, &hi, w));
        }
        let slip = format!("{:.1}", self.plan.rules.across_error_mm());
        v.push(w.fill(
            "block_accept",
            &[
                (
                    "angle",
                    &format!(
                        "{:.1}",
                        self.plan
                            .rays
                            .iter()
                            .map(|r| r.refraction_tolerance_deg)
                            .fold(f64::INFINITY, f64::min)
                            .min(99.0)
                    ),
                ),
                ("slip", &slip),
                ("shift", &format!("{:.1}", self.plan.rules.across_error_mm() + self.plan.rules.ruler_mm)),
                ("placed", &slip),
            ],
        ));
        v
    }
    fn key_plot(&self, _rect: Rect, _w: &Words) -> Vec<Item> {
        Vec::new()
    }
    fn student_note(&self, w: &Words) -> Option<String> {
        Some(w.fill("block_note", &[("thickness", &self.block.thickness_mm.to_string())]))
    }
    fn answers(&self) -> serde_json::Value {
        json!({
            "thickness_mm": self.block.thickness_mm,
            "safe_band_deg": av::band_json(&self.plan),
            "rays": av::rays_json(&self.plan, true),
        })
    }
    fn summary_rows(&self) -> Vec<SummaryRow> {
        av::summary_rows(&self.plan, true)
    }
    fn summary_cells(&self, w: &Words) -> Vec<[String; 5]> {
        self.plan
            .rays
            .iter()
            .map(|r| {
                [
                    r.letter.clone(),
                    angle(r.incidence_deg),
                    format!(
                        "r {}, d {}",
                        with_range(&r.refraction_deg, r.refraction_tolerance_deg, "°", w),
                        with_range(&r.lateral_shift_mm, r.tolerance_mm, "mm", w)
                    ),
                    format!("t {} mm", self.block.thickness_mm),
                    format!("n {}", fmt_index(self.block.index)),
                ]
            })
            .collect()
    }
    fn report(&self) -> String {
        let mut s = String::new();
        let _ = writeln!(
            s,
            "  block {} mm thick, faces {} mm long, n = {}: d = t·sin(i − r)/cos r",
            self.block.thickness_mm,
            self.block.height_mm,
            fmt_index(self.block.index)
        );
        s.push_str(&av::report(&self.plan, true));
        s
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use crate::sheets::angled::{AngleLimit, AngleRules};

    #[test]
    fn shift_and_angles_follow_the_textbook_formulas() {
        // Snell's law sin i = n sin r; d = t·sin(i − r)/cos r; the emergent ray
        // is parallel to the incoming one, so e = i and the deviation is 0
        // (DESIGN.md, rectangular block).
        let (t, n) = (40.0, 1.49);
        let s = setup(&Block::new(t, 90.0, n).unwrap());
        let rules = AngleRules::for_ray_width(2.0);
        for i in [20.0f64, 30.0, 45.0, 60.0] {
            let ray = s.answer(&rules, i, "A".into(), true);
            assert!(ray.path_ok);
            let r = (i.to_radians().sin() / n).asin();
            assert_close(ray.refraction_deg.unwrap(), r.to_degrees(), 1e-9);
            assert_close(ray.emergence_deg.unwrap(), i, 1e-9);
            assert_close(ray.deviation_deg.unwrap(), 0.0, 1e-9);
            assert_close(ray.lateral_shift_mm.unwrap(), t * (i.to_radians() - r).sin() / r.cos(), 1e-9);
            assert_eq!(ray.exit.unwrap().0, BlockFace::Exit);
        }
    }

    #[test]
    fn band_ends_at_a_measurable_shift_and_at_grazing_incidence() {
        let s = setup(&Block::new(40.0, 90.0, 1.49).unwrap());
        let rules = AngleRules::for_ray_width(2.0);
        let band = s.band(&rules, 0.0, 89.0, 45.0, true).unwrap();
        // The textbook angles 30°, 45° and 60° are all worth printing.
        assert!(band.contains(30.0) && band.contains(45.0) && band.contains(60.0), "{band:?}");
        assert_eq!(band.min_limit, AngleLimit::SmallShift);
        // w / cos i = 3 w at i = acos(1/3) = 70.53°.
        assert_eq!(band.max_limit, AngleLimit::Grazing);
        assert_close(band.max, (1.0f64 / 3.0).acos().to_degrees(), 0.01);
        // Below the band the shift is under three accept ranges (3 × 1.5 mm).
        let low = s.answer(&rules, band.min - 0.1, "A".into(), false);
        assert!(low.lateral_shift_mm.unwrap() < 4.5);
    }
}
