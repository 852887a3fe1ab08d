//! The radius kind: students trace round a lens shape and find each curved
//! face's radius of curvature from a chord and its sagitta,
//! R = c²/(8s) + s/2 (DESIGN.md, sheet 6), then the lens maker's focal length
//! from their radii. With the sheet, a gauge page of true-scale arcs.
//!
//! Sheet frame (mm, y up): the optical axis is the x axis, the front face's
//! vertex at x = 0 and the back face's at x = t; the centre line is x = t/2.
//! The chord of a face joins the outline's points at y = ±h; the sagitta is
//! measured along the axis from the chord to the face's vertex.

use std::fmt::Write;

use serde_json::{Value, json};

use super::field::{Bound, FieldValue, SheetField};
use super::{
    Choice, Detail, Enter, Kind, Prepared, Setup, SheetKind, SheetPlan, SheetSpec, SheetView, SummaryRow,
};
use crate::draw::{Drawing, Words};
use crate::geom::{Point, Ray, Shape, Vec2};
use crate::kit::{Kit, KitError, SheetEntry};
use crate::optics::{Boundary, Entry, Face, Lens, MAX_PIECE_MM, Outline, Paraxial, Piece};
use crate::paper::PaperSpec;
use crate::plan::fmt1;
use crate::plan::scan::grid_values;
use crate::scene::{Item, Rect};

/// The radius kind.
pub struct RadiusKind;
/// The radius kind, for the kind list.
pub static KIND: RadiusKind = RadiusKind;

/// Share of the half-height the default chord's half-length takes (our
/// choice: clear of the corners, long enough for a deep sagitta).
const H_SHARE: f64 = 0.8;
/// Range of that share the class variants use.
const H_VARIANTS: (f64, f64) = (0.6, 0.88);
/// Reading error of the sagitta, mm: a ruler read to ±0.5 mm (common practice, no source).
pub const SAGITTA_READING_MM: f64 = 0.5;
/// How far the sagittas of neighbouring gauge arcs differ at the piece's
/// half-height, mm (our choice: visibly apart, room for their numbers).
pub const GAUGE_STEP_MM: f64 = 2.5;
/// Most arcs on a gauge page.
pub const GAUGE_MAX_ARCS: usize = 14;

/// One curved face measured by its chord.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FaceChord {
    /// The kit word for the face: `front` or `back`.
    pub face: &'static str,
    /// The face's own radius, mm.
    pub radius_mm: f64,
    /// Whether it bulges out.
    pub convex: bool,
    /// The vertex, on the axis.
    pub vertex: Point,
    /// x of the chord (where the outline's points at ±h lie).
    pub chord_x: f64,
    /// Chord length c = 2h, mm.
    pub chord_mm: f64,
    /// Sagitta s, mm: from the chord to the vertex along the axis.
    pub sagitta_mm: f64,
    /// R = c²/(8s) + s/2 from the chord and sagitta, mm.
    pub radius_from_chord_mm: f64,
    /// Accept range of R, ± mm: |dR/ds| × the sagitta's reading error.
    pub tolerance_mm: f64,
}

/// R = c²/(8s) + s/2: the radius of the circle through a chord of length c
/// whose arc stands s above it (DESIGN.md, sheet 6).
pub fn radius_from_chord(c: f64, s: f64) -> f64 {
    c * c / (8.0 * s) + s / 2.0
}

/// Where the horizontal line y = `h` first meets the outline coming from the
/// far left (`from_left`) or the far right: the traced outline's point on
/// the front or the back face, found by intersecting the outline itself.
fn outline_point(shape: &Shape<Boundary>, h: f64, from_left: bool, reach: f64) -> Option<Point> {
    let (x, d) = if from_left { (-reach, Vec2::new(1.0, 0.0)) } else { (reach, Vec2::new(-1.0, 0.0)) };
    shape.nearest_hit(&Ray { origin: Point::new(x, h), dir: d }, 0.0).map(|hit| hit.point)
}

/// The chord and sagitta of each curved face at half-chord `h`, from the
/// outline's own geometry (the points where y = ±h meets it).
pub fn chords(lens: &Lens, h: f64) -> Vec<FaceChord> {
    let outline = Outline::new(*lens, Entry::Front);
    let shape = outline.shape();
    let reach = 10.0 * (lens.thickness_mm() + lens.height_mm());
    let mut out = Vec::new();
    for (face, f, vertex_x, from_left) in
        [("front", lens.front(), 0.0, true), ("back", lens.back(), lens.thickness_mm(), false)]
    {
        let Some(r) = f.radius_mm() else { continue };
        let (Some(p), Some(q)) =
            (outline_point(shape, h, from_left, reach), outline_point(shape, -h, from_left, reach))
        else {
            continue;
        };
        let chord_x = (p.x + q.x) / 2.0;
        let chord_mm = p.distance(q);
        let sagitta_mm = (chord_x - vertex_x).abs();
        let dr_ds = (-chord_mm * chord_mm / (8.0 * sagitta_mm * sagitta_mm) + 0.5).abs();
        out.push(FaceChord {
            face,
            radius_mm: r,
            convex: matches!(f, Face::Convex { .. }),
            vertex: Point::new(vertex_x, 0.0),
            chord_x,
            chord_mm,
            sagitta_mm,
            radius_from_chord_mm: radius_from_chord(chord_mm, sagitta_mm),
            tolerance_mm: dr_ds * SAGITTA_READING_MM,
        });
    }
    out
}

fn lens_of(kit: &Kit, spec: &SheetSpec) -> Lens {
    *kit.pieces[spec.piece].piece.lens().expect("a checked radius sheet's piece is a lens shape")
}

/// The half-chords the sheet may use: whole millimetres from 60 % to 88 % of
/// the half-height (at least 3 mm).
fn h_grid(lens: &Lens) -> Vec<f64> {
    let a = lens.half_height_mm();
    grid_values((H_VARIANTS.0 * a).max(3.0), H_VARIANTS.1 * a, 1.0)
}

/// The default half-chord: 80 % of the half-height, to the whole millimetre below.
fn default_h(lens: &Lens) -> f64 {
    (H_SHARE * lens.half_height_mm()).floor().max(3.0)
}

impl Kind for RadiusKind {
    fn word(&self) -> &'static str {
        "radius"
    }
    fn title(&self) -> &'static str {
        "Radius of curvature by tracing"
    }
    fn fields(&self) -> &'static [SheetField] {
        &[SheetField {
            name: "half_chord_mm",
            about: "Half the chord's length: the chord joins the traced outline's points this far above and below the axis; from 3 up to (not including) the piece's half height. Default: 80 % of the half height, to the whole millimetre below; varied for each group of a class set.",
            value: FieldValue::Number {
                unit: "mm",
                min: Bound::Incl(3.0),
                max: Bound::Excl(MAX_PIECE_MM / 2.0),
            },
        }]
    }
    fn fits(&self) -> &'static str {
        "a lens shape with at least one curved face"
    }
    fn check(&self, s: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError> {
        let kp = &kit.pieces[s.piece];
        let curved = match kp.piece {
            Piece::Lens(l) => l.front().is_curved() || l.back().is_curved(),
            _ => false,
        };
        if !curved {
            let what = match kp.piece {
                Piece::Lens(_) => "a lens shape with two flat faces".to_string(),
                other => format!("a {}", other.shape_word()),
            };
            return Err(s.piece_at.error(
                format!("a radius sheet needs a piece with a curved face; piece `{}` is {what}", kp.id),
                "give a lens shape with at least one face { curve = \"convex\" or \"concave\", radius_mm = R }",
            ));
        }
        let lens = *kp.piece.lens().expect("checked above");
        let mut heights = None;
        if let Some(v) = s.number("half_chord_mm")? {
            let a = lens.half_height_mm();
            if !(v.value.is_finite() && v.value >= 3.0 && v.value < a) {
                return Err(v.at.error(
                    format!(
                        "a half-chord of {} mm does not fit piece `{}` ({a} mm from the axis to its edge)",
                        v.value, kp.id
                    ),
                    format!(
                        "give a number of millimetres from 3 up to (not including) {a}, such as {}",
                        default_h(&lens)
                    ),
                ));
            }
            heights = Some(vec![v.value]);
        }
        Ok(SheetSpec {
            number: s.number,
            kind: SheetKind::Radius,
            piece: s.piece,
            enter: Enter::Front,
            vary_entry: false,
            heights_mm: heights,
            angles_deg: None,
            line: s.at.line(),
            lights: Vec::new(),
            source: None,
        })
    }
    fn prepare<'a>(
        &self,
        kit: &'a Kit,
        spec: &'a SheetSpec,
        _paper: &'a PaperSpec,
    ) -> Box<dyn Prepared + 'a> {
        Box::new(RadiusPrepared {
            kit,
            spec,
            lens: lens_of(kit, spec),
            gauge: gauge_radii(kit, &lens_of(kit, spec)),
        })
    }
}

/// The gauge's radii: equal steps of curvature 1/R over the radii of every
/// curved face of the kit's lens shapes (one step beyond each end), the step
/// making neighbouring arcs' sagittas at this piece's half-height differ by
/// [`GAUGE_STEP_MM`] (s ≈ a²/(2R), so Δ(1/R) = 2·step/a²), at most
/// [`GAUGE_MAX_ARCS`] arcs; each radius to the whole millimetre, none below
/// the half-height.
pub fn gauge_radii(kit: &Kit, lens: &Lens) -> Vec<f64> {
    let a = lens.half_height_mm();
    let radii: Vec<f64> = kit
        .pieces
        .iter()
        .filter_map(|p| p.piece.lens())
        .flat_map(|l| [l.front(), l.back()])
        .chain([lens.front(), lens.back()])
        .filter_map(Face::radius_mm)
        .collect();
    let k_lo = radii.iter().map(|r| 1.0 / r).fold(f64::INFINITY, f64::min);
    let k_hi = radii.iter().map(|r| 1.0 / r).fold(0.0, f64::max).min(1.0 / a);
    if !(k_lo.is_finite() && k_hi >= k_lo) {
        return Vec::new();
    }
    let mut step = 2.0 * GAUGE_STEP_MM / (a * a);
    while (k_hi - k_lo) / step + 3.0 > GAUGE_MAX_ARCS as f64 {
        step *= 1.25;
    }
    let first = ((k_lo / step).floor() - 1.0).max(1.0) * step;
    let mut out: Vec<f64> = Vec::new();
    let mut k = first;
    while k <= (k_hi + step).min(1.0 / a) + 1e-12 {
        let r = (1.0 / k).round();
        if r >= a && !out.contains(&r) {
            out.push(r);
        }
        k += step;
    }
    out
}

struct RadiusPrepared<'a> {
    kit: &'a Kit,
    spec: &'a SheetSpec,
    lens: Lens,
    gauge: Vec<f64>,
}

impl Prepared for RadiusPrepared<'_> {
    fn choices(&self) -> Vec<Choice> {
        if self.spec.heights_mm.is_some() {
            return Vec::new();
        }
        h_grid(&self.lens).into_iter().map(|h| Choice { enter: Enter::Front, values: vec![h] }).collect()
    }

    fn notes(&self, groups: usize) -> Vec<String> {
        let n = self.choices().len();
        if self.spec.heights_mm.is_some() {
            vec![format!(
                "sheet {} has a fixed half_chord_mm, so every group gets the same chord",
                self.spec.number
            )]
        } else if n < groups {
            vec![format!(
                "sheet {}: the piece has room for only {n} different chord(s) for {groups} groups",
                self.spec.number
            )]
        } else {
            Vec::new()
        }
    }

    fn plan(&self, choice: Option<&Choice>) -> SheetPlan {
        let h = choice
            .and_then(|c| c.values.first().copied())
            .or_else(|| self.spec.heights_mm.as_ref().and_then(|v| v.first().copied()))
            .unwrap_or_else(|| default_h(&self.lens));
        let kp = &self.kit.pieces[self.spec.piece];
        let view = RadiusView::new(self.lens, h, self.gauge.clone());
        SheetPlan {
            number: self.spec.number,
            kind: SheetKind::Radius,
            piece_id: kp.id.clone(),
            piece_label: kp.label.clone(),
            enter: Enter::Front,
            index: self.lens.index(),
            group: None,
            variant: None,
            warnings: Vec::new(),
            wavelength_nm: self.kit.ray_box.wavelength_nm,
            detail: Detail::Radius(Box::new(view)),
            colours: None,
            source: None,
        }
    }
}

/// A planned radius sheet.
#[derive(Clone, Debug, PartialEq)]
pub struct RadiusView {
    /// The piece.
    pub lens: Lens,
    /// Half the chord: the outline's points at ±h, mm.
    pub half_chord_mm: f64,
    /// Each curved face's chord and sagitta.
    pub faces: Vec<FaceChord>,
    /// The gauge page's radii, mm.
    pub gauge_radii: Vec<f64>,
    /// What must be on paper.
    pub setup: Setup,
}

impl RadiusView {
    /// Plans the sheet for half-chord `h`.
    pub fn new(lens: Lens, h: f64, gauge_radii: Vec<f64>) -> RadiusView {
        let faces = chords(&lens, h);
        let (lo, hi) = super::radius_drawing::extent(&lens);
        RadiusView {
            lens,
            half_chord_mm: h,
            faces,
            gauge_radii,
            setup: Setup { x_min: lo.x, x_max: hi.x, y_min: lo.y, y_max: hi.y },
        }
    }

    /// The lens maker's thin-lens focal length, mm (`None`: afocal).
    pub fn thin_lens_focal_mm(&self) -> Option<f64> {
        Paraxial::of(&self.lens, Entry::Front).thin_lens_focal_mm()
    }

    /// The printed name of a face.
    fn face_words<'w>(face: &str, w: &'w Words) -> &'w str {
        if face == "front" { w.say("entry_front") } else { w.say("entry_back") }
    }
}

impl SheetView for RadiusView {
    fn measured(&self) -> Vec<crate::sheets::Measured> {
        // Per curved face (its name in the `ray` column): the sagitta read on
        // the traced outline, and the radius worked out from it.
        self.faces
            .iter()
            .flat_map(|f| {
                [
                    crate::sheets::Measured {
                        ray: f.face.to_string(),
                        quantity: "sagitta_mm",
                        unit: "mm",
                        want: crate::sheets::Want::Value {
                            value: f.sagitta_mm,
                            tolerance: SAGITTA_READING_MM,
                        },
                    },
                    crate::sheets::Measured {
                        ray: f.face.to_string(),
                        quantity: "radius_mm",
                        unit: "mm",
                        want: crate::sheets::Want::Value {
                            value: f.radius_from_chord_mm,
                            tolerance: f.tolerance_mm,
                        },
                    },
                ]
            })
            .collect()
    }
    fn measured_at_index(&self, _index: f64) -> Vec<crate::sheets::Measured> {
        // A face's shape does not depend on the index.
        self.measured()
    }
    fn class_curve(&self) -> Option<crate::sheets::ClassCurve> {
        None
    }
    fn extent(&self) -> Setup {
        self.setup
    }
    fn student(&self, bounds: Rect, w: &Words) -> Drawing {
        let mut d = Drawing::default();
        d.items = super::radius_drawing::student(self, &bounds, &mut d.placer, w);
        d
    }
    fn key(&self, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item> {
        super::radius_drawing::key(self, &bounds, &mut base.placer, w)
    }
    fn template(&self) -> &'static str {
        "radius.toml"
    }
    fn entry_words(&self, w: &Words) -> String {
        w.say("entry_front").to_string()
    }
    fn table_widths(&self) -> Vec<f64> {
        vec![0.14, 0.2, 0.26, 0.4]
    }
    fn table_rows(&self, key: bool, w: &Words) -> Vec<Vec<String>> {
        self.faces
            .iter()
            .map(|f| {
                let mut row =
                    vec![Self::face_words(f.face, w).to_string(), format!("{} mm", fmt1(f.chord_mm))];
                if key {
                    row.push(format!("{} mm", fmt1(f.sagitta_mm)));
                    row.push(format!("{} ± {} mm", fmt1(f.radius_from_chord_mm), fmt1(f.tolerance_mm)));
                }
                row
            })
            .collect()
    }
    fn key_lines(&self, w: &Words) -> Vec<String> {
        let mut v = vec![w.fill(
            "radius_formula",
            &[("h", &fmt1(self.half_chord_mm)), ("chord", &fmt1(2.0 * self.half_chord_mm))],
        )];
        let n = self.lens.index();
        match self.thin_lens_focal_mm() {
            Some(f) => v.push(
                w.fill("radius_lens_maker", &[("index", &crate::plan::fmt_index(n)), ("focal", &fmt1(f))]),
            ),
            None => v.push(w.say("radius_afocal").to_string()),
        }
        v.push(w.fill("radius_accept", &[("reading", &fmt1(SAGITTA_READING_MM))]));
        v
    }
    fn key_plot(&self, _rect: Rect, _w: &Words) -> Vec<Item> {
        Vec::new()
    }
    fn student_note(&self, w: &Words) -> Option<String> {
        Some(w.fill("radius_note", &[("index", &crate::plan::fmt_index(self.lens.index()))]))
    }
    fn has_gauge(&self) -> bool {
        !self.gauge_radii.is_empty()
    }
    fn gauge(&self, rect: Rect, key: bool, w: &Words) -> Vec<Item> {
        let faces: Vec<(&str, f64)> = self
            .faces
            .iter()
            .map(|f| {
                (if f.face == "front" { w.say("entry_front") } else { w.say("entry_back") }, f.radius_mm)
            })
            .collect();
        super::radius_drawing::gauge(&self.gauge_radii, self.lens.half_height_mm(), &faces, key, rect, w)
    }
    fn answers(&self) -> Value {
        let faces: Vec<Value> = self
            .faces
            .iter()
            .map(|f| {
                json!({
                    "face": f.face,
                    "radius_mm": f.radius_mm,
                    "chord_mm": f.chord_mm,
                    "sagitta_mm": f.sagitta_mm,
                    "radius_from_chord_mm": f.radius_from_chord_mm,
                    "tolerance_mm": f.tolerance_mm,
                })
            })
            .collect();
        json!({
            "half_chord_mm": self.half_chord_mm,
            "faces": faces,
            "thin_lens_focal_mm": self.thin_lens_focal_mm(),
            "gauge_radii_mm": self.gauge_radii,
        })
    }
    fn summary_rows(&self) -> Vec<SummaryRow> {
        self.faces
            .iter()
            .map(|f| {
                vec![
                    ("ray", f.face.to_string()),
                    ("chord_mm", format!("{:.3}", f.chord_mm)),
                    ("sagitta_mm", format!("{:.3}", f.sagitta_mm)),
                    ("radius_mm", format!("{:.3}", f.radius_mm)),
                    ("tolerance_mm", format!("{:.3}", f.tolerance_mm)),
                    (
                        "thin_lens_focal_mm",
                        self.thin_lens_focal_mm().map(|v| format!("{v:.3}")).unwrap_or_default(),
                    ),
                ]
            })
            .collect()
    }
    fn summary_cells(&self, w: &Words) -> Vec<[String; 5]> {
        self.faces
            .iter()
            .map(|f| {
                [
                    Self::face_words(f.face, w).to_string(),
                    format!("c {} mm", fmt1(f.chord_mm)),
                    format!("R {} ± {} mm", fmt1(f.radius_from_chord_mm), fmt1(f.tolerance_mm)),
                    self.thin_lens_focal_mm().map(|v| format!("f {} mm", fmt1(v))).unwrap_or_default(),
                    format!("n {}", crate::plan::fmt_index(self.lens.index())),
                ]
            })
            .collect()
    }
    fn report(&self) -> String {
        let mut s = String::new();
        let _ = writeln!(
            s,
            "  chord between the outline's points at ±{} mm: R = c²/(8s) + s/2",
            fmt1(self.half_chord_mm)
        );
        let _ = writeln!(s, "  {:<6} {:>9} {:>9} {:>9} {:>7}", "face", "c mm", "s mm", "R mm", "± mm");
        for f in &self.faces {
            let _ = writeln!(
                s,
                "  {:<6} {:>9.2} {:>9.2} {:>9.2} {:>7.1}",
                f.face, f.chord_mm, f.sagitta_mm, f.radius_from_chord_mm, f.tolerance_mm
            );
        }
        match self.thin_lens_focal_mm() {
            Some(f) => {
                let _ = writeln!(s, "  lens maker's formula (thin lens): f = {f:.2} mm");
            }
            None => {
                let _ = writeln!(s, "  lens maker's formula: afocal");
            }
        }
        let _ = writeln!(s, "  gauge radii: {:?} mm", self.gauge_radii);
        s
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    #[test]
    fn the_chord_formula_recovers_each_faces_radius_at_several_heights() {
        // R = c²/(8s) + s/2 (DESIGN.md, sheet 6) against the piece's own radii,
        // with c and s read off the outline itself.
        let lens =
            Lens::new(Face::Convex { radius_mm: 72.0 }, Face::Concave { radius_mm: 96.0 }, 16.0, 64.0, 1.49)
                .unwrap();
        for h in [8.0, 16.0, 24.0, 30.0] {
            let c = chords(&lens, h);
            assert_eq!(c.len(), 2);
            assert_close(c[0].chord_mm, 2.0 * h, 1e-9);
            assert_close(c[0].radius_from_chord_mm, 72.0, 1e-9);
            assert_close(c[1].radius_from_chord_mm, 96.0, 1e-9);
            // s = R − √(R² − h²) (DESIGN.md).
            assert_close(c[0].sagitta_mm, 72.0 - (72.0f64 * 72.0 - h * h).sqrt(), 1e-9);
        }
        // A flat face has no chord.
        let pcx = Lens::new(Face::Flat, Face::Convex { radius_mm: 52.0 }, 14.0, 60.0, 1.49).unwrap();
        let c = chords(&pcx, 20.0);
        assert_eq!(c.len(), 1);
        assert_eq!(c[0].face, "back");
        assert_close(c[0].radius_from_chord_mm, 52.0, 1e-9);
    }

    #[test]
    fn the_lens_makers_formula_from_the_recovered_radii() {
        // 1/f = (n − 1)(1/R1 − 1/R2), signed radii (DESIGN.md): front convex +R, back convex −R.
        let lens =
            Lens::new(Face::Convex { radius_mm: 72.0 }, Face::Convex { radius_mm: 96.0 }, 16.0, 64.0, 1.491)
                .unwrap();
        let c = chords(&lens, 25.0);
        let (r1, r2) = (c[0].radius_from_chord_mm, -c[1].radius_from_chord_mm);
        let f = 1.0 / (0.491 * (1.0 / r1 - 1.0 / r2));
        let view = RadiusView::new(lens, 25.0, Vec::new());
        assert_close(view.thin_lens_focal_mm().unwrap(), f, 1e-9);
        // Closed form: 1/(0.491·(1/72 + 1/96)) = 83.80 mm.
        assert_close(f, 1.0 / (0.491 * (1.0 / 72.0 + 1.0 / 96.0)), 1e-9);
    }

    #[test]
    fn the_accept_range_follows_dr_ds() {
        // dR/ds = −c²/(8s²) + 1/2; ±0.5 mm on s.
        let lens = Lens::new(Face::Convex { radius_mm: 50.0 }, Face::Flat, 12.0, 60.0, 1.49).unwrap();
        let c = chords(&lens, 24.0)[0];
        let s = 50.0 - (2500.0f64 - 576.0).sqrt();
        assert_close(c.tolerance_mm, (48.0 * 48.0 / (8.0 * s * s) - 0.5) * 0.5, 1e-9);
    }
}
