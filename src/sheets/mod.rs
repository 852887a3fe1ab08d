//! Sheet kinds. This file is the kind list: the one place that names every
//! kind of sheet. Each kind lives in its own module and owns everything
//! particular to it: which pieces it fits, the kit fields it reads, its rays,
//! safe band, class variants, answers, drawings and text template. The rest of
//! the crate asks a kind through [`Kind`] (while checking and planning) and a
//! plan through [`SheetView`] (while laying out and writing).
#![expect(
    clippy::result_large_err,
    reason = "a kit error is made at most once per run and carries its whole location; boxing it buys nothing"
)]

pub mod angled;
pub mod angled_drawing;
pub mod angled_view;
pub mod block;
mod class;
pub mod colours;
pub mod deviation_plot;
pub mod field;
pub mod index;
pub mod lens;
pub mod prism;
pub mod protractor;
pub mod protractor_drawing;
pub mod radius;
pub mod radius_drawing;
mod spec;
pub mod spectrum;

pub use class::{ClassPlan, plan_class};
pub use field::SheetField;
pub use spec::{Choice, Enter, Lesson, SHARED_FIELDS, SheetSpec};

use crate::draw::{Drawing, Words};
use crate::kit::{Kit, KitError, SheetEntry};
use crate::paper::PaperSpec;
use crate::scene::{Item, Rect};

/// The kinds of sheet raysheet makes.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum SheetKind {
    /// Single guide rays: flat face first, refraction at the curved face.
    CurvedFace,
    /// The ray box's parallel beam through a converging or diverging lens shape.
    Focal,
    /// Lateral shift through a rectangular block.
    Block,
    /// Deviation through a prism; turning by total reflection in a right-angle prism.
    Prism,
    /// Index of refraction: a half-disc at a printed protractor.
    Index,
    /// Rays either side of the critical angle at a half-disc's flat face.
    CriticalAngle,
    /// A lens shape's radii of curvature from a traced chord and sagitta.
    Radius,
    /// A white ray through a prism, spread into the ray box's colours.
    Spectrum,
}

impl SheetKind {
    /// Every kind, in the order the README lists them.
    pub const ALL: [SheetKind; 8] = [
        SheetKind::CurvedFace,
        SheetKind::Focal,
        SheetKind::Block,
        SheetKind::Prism,
        SheetKind::Index,
        SheetKind::CriticalAngle,
        SheetKind::Radius,
        SheetKind::Spectrum,
    ];

    /// The module that implements the kind.
    pub fn def(self) -> &'static dyn Kind {
        match self {
            SheetKind::CurvedFace => &lens::CURVED_FACE,
            SheetKind::Focal => &lens::FOCAL,
            SheetKind::Block => &block::KIND,
            SheetKind::Prism => &prism::KIND,
            SheetKind::Index => &index::INDEX,
            SheetKind::CriticalAngle => &index::CRITICAL,
            SheetKind::Radius => &radius::KIND,
            SheetKind::Spectrum => &spectrum::KIND,
        }
    }

    /// The kit-file word.
    pub fn as_str(self) -> &'static str {
        self.def().word()
    }

    /// A title for the sheet.
    pub fn title(self) -> &'static str {
        self.def().title()
    }

    /// The kind with this kit word.
    pub fn from_word(word: &str) -> Option<SheetKind> {
        SheetKind::ALL.into_iter().find(|k| k.as_str() == word)
    }
}

/// The kit file's JSON Schema: the kit's own tables from `kit`, and a
/// `[[sheets]]` table as one of the kinds' tables, each made from its kind's
/// own field list (with `kind`, `piece` and [`SHARED_FIELDS`]).
pub fn kit_schema() -> serde_json::Value {
    use serde_json::{Map, Value, json};
    let words: Vec<&str> = SheetKind::ALL.iter().map(|k| k.as_str()).collect();
    let branches: Vec<Value> = SheetKind::ALL
        .iter()
        .map(|k| {
            let def = k.def();
            let mut props = Map::new();
            props.insert(
                "kind".into(),
                json!({ "description": format!("{}: {}.", def.title(), def.fits()), "const": def.word() }),
            );
            props.insert(
                "piece".into(),
                json!({ "description": "The id of the piece this sheet uses (a [[pieces]] table of this kit).", "type": "string" }),
            );
            for f in def.fields().iter().chain(&spec::shared_fields(*k)) {
                props.insert(f.name.into(), f.schema());
            }
            json!({
                "title": def.word(),
                "type": "object",
                "additionalProperties": false,
                "required": ["kind", "piece"],
                "properties": props,
            })
        })
        .collect();
    crate::kit::kit_schema(json!({
        "description": format!("One sheet to print: kind is one of {}.", words.join(", ")),
        "type": "object",
        "required": ["kind", "piece"],
        "properties": { "kind": { "enum": words } },
        "oneOf": branches,
    }))
}

/// What a sheet kind does before layout: check a kit's sheet table, and
/// prepare plans (one, or one per group of a class).
pub trait Kind: Sync {
    /// The kit word (`kind = "…"`).
    fn word(&self) -> &'static str;
    /// A title for the sheet.
    fn title(&self) -> &'static str;
    /// The fields a sheet table of this kind accepts besides `kind`, `piece`
    /// and [`SHARED_FIELDS`], each with its meaning, unit, range and default
    /// (the kit file's schema and `raysheet kinds` are made from them).
    fn fields(&self) -> &'static [SheetField];
    /// The pieces the kind fits, in words (`raysheet kinds`).
    fn fits(&self) -> &'static str;
    /// Checks a sheet table against the kit: the piece fits, every field is
    /// accepted and usable. Errors point at the file, line and field.
    fn check(&self, entry: &SheetEntry, kit: &Kit) -> Result<SheetSpec, KitError>;
    /// Whether `all_colours = true` is taken: the plans answer
    /// [`SheetView::colour_paths`].
    fn takes_colours(&self) -> bool {
        false
    }
    /// Works out what every plan of this sheet shares (safe bands, once).
    fn prepare<'a>(&self, kit: &'a Kit, spec: &'a SheetSpec, paper: &'a PaperSpec) -> Box<dyn Prepared + 'a>;
}

/// A sheet ready to plan: the ungrouped plan, or a class variant's.
pub trait Prepared {
    /// Every setting a group may get, in a fixed order (empty when the sheet
    /// has fixed values or no band).
    fn choices(&self) -> Vec<Choice>;
    /// Notes for the teacher about the class variants of this sheet.
    fn notes(&self, groups: usize) -> Vec<String>;
    /// The plan with `choice`, or the sheet's own settings with `None`.
    fn plan(&self, choice: Option<&Choice>) -> SheetPlan;
}

/// The extent of a setup in the sheet frame: what must be on paper, mm.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Setup {
    /// Leftmost x.
    pub x_min: f64,
    /// Rightmost x.
    pub x_max: f64,
    /// Lowest y.
    pub y_min: f64,
    /// Highest y.
    pub y_max: f64,
}

impl Setup {
    /// Length along x.
    pub fn length(&self) -> f64 {
        self.x_max - self.x_min
    }

    /// Height along y.
    pub fn height(&self) -> f64 {
        self.y_max - self.y_min
    }
}

/// Everything one sheet (and its key) shows.
#[derive(Clone, Debug, PartialEq)]
pub struct SheetPlan {
    /// Position in the kit's sheet list, 1-based.
    pub number: usize,
    /// Sheet kind.
    pub kind: SheetKind,
    /// The piece's id.
    pub piece_id: String,
    /// The piece's longer name, if any.
    pub piece_label: Option<String>,
    /// Which face the light meets first.
    pub enter: Enter,
    /// The piece's index of refraction at [`SheetPlan::wavelength_nm`].
    pub index: f64,
    /// The wavelength the sheet's rays are traced at, nm (the ray box's).
    pub wavelength_nm: f64,
    /// The group, for class sets.
    pub group: Option<String>,
    /// The variant code.
    pub variant: Option<String>,
    /// Things the teacher should know.
    pub warnings: Vec<String>,
    /// What is particular to the kind.
    pub detail: Detail,
    /// With `all_colours = true`: every colour's traces (see [`colours`]).
    pub colours: Option<colours::ColourSet>,
    /// The paper the material's formula comes from, for a built-in material.
    pub source: Option<&'static str>,
}

/// The kind-particular part of a plan.
#[derive(Clone, Debug, PartialEq)]
pub enum Detail {
    /// Curved-face and focal sheets.
    Lens(Box<lens::LensPlan>),
    /// Block sheets.
    Block(Box<block::BlockPlan>),
    /// Prism sheets.
    Prism(Box<prism::PrismPlan>),
    /// Index and critical-angle sheets.
    Protractor(Box<index::ProtractorView>),
    /// Radius sheets.
    Radius(Box<radius::RadiusView>),
    /// Spectrum sheets.
    Spectrum(Box<spectrum::SpectrumPlan>),
}

impl Detail {
    /// The plan as layout and output see it.
    pub fn view(&self) -> &dyn SheetView {
        match self {
            Detail::Lens(p) => p.as_ref(),
            Detail::Block(p) => p.as_ref(),
            Detail::Prism(p) => p.as_ref(),
            Detail::Protractor(p) => p.as_ref(),
            Detail::Radius(p) => p.as_ref(),
            Detail::Spectrum(p) => p.as_ref(),
        }
    }
}

/// One row of the class summary: column name and cell, the columns named as
/// in the answer file.
pub type SummaryRow = Vec<(&'static str, String)>;

/// One answer a student measures on a sheet: what `results.csv` asks for and
/// what marking compares against (issue 11).
#[derive(Clone, Debug, PartialEq)]
pub struct Measured {
    /// The ray's letter as printed.
    pub ray: String,
    /// The quantity's name (also its name in the answer file's `measured`).
    pub quantity: &'static str,
    /// Its unit: `mm`, `deg`, or empty for an observation.
    pub unit: &'static str,
    /// The exact answer.
    pub want: Want,
}

/// The exact answer to one measurement.
#[derive(Clone, Debug, PartialEq)]
pub enum Want {
    /// A number, accepted within ± `tolerance`.
    Value {
        /// The exact value, as the key's table gives it.
        value: f64,
        /// Half the accept range.
        tolerance: f64,
    },
    /// A word the student writes instead of a number (a ray totally
    /// reflected, the face a ray leaves by).
    Observation(&'static str),
}

/// The curve a class's measurements are plotted against when marking: one
/// measured quantity against the ray's setting, exact, sampled.
#[derive(Clone, Debug, PartialEq)]
pub struct ClassCurve {
    /// The setting along x: `height_mm` or `angle_of_incidence_deg` (the
    /// answer file's ray field).
    pub x: &'static str,
    /// The measured quantity along y (its `measured` name).
    pub y: &'static str,
    /// Samples (setting, exact value), settings rising; sizes for angles and
    /// heights (the curve is symmetric in the sign).
    pub points: Vec<(f64, f64)>,
    /// The paraxial value (lens sheets), drawn as a line.
    pub paraxial: Option<f64>,
}

/// What layout and output ask of a planned sheet. Everything printed takes
/// the words to print with ([`Words`], from `templates/words.toml`).
pub trait SheetView {
    /// What must be on paper, in the sheet frame.
    fn extent(&self) -> Setup;
    /// The student drawing in the sheet frame; `bounds` is where labels may go.
    fn student(&self, bounds: Rect, w: &Words) -> Drawing;
    /// What the key adds on top of the student drawing.
    fn key(&self, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item>;
    /// The template file with the sheet's heading, instructions and table columns.
    fn template(&self) -> &'static str;
    /// Words filling `{entry}` in the template and the subtitle: "the front face".
    fn entry_words(&self, w: &Words) -> String;
    /// The measurement table's rows, in letter order: every column filled on
    /// the key, only the given values (letter, setting) on the student sheet.
    fn table_rows(&self, key: bool, w: &Words) -> Vec<Vec<String>>;
    /// The columns' shares of the table's width, one per column of its template.
    fn table_widths(&self) -> Vec<f64> {
        vec![0.09, 0.17, 0.47, 0.27]
    }
    /// The table column the key prints in bold: the graded answer.
    fn graded_column(&self) -> usize {
        2
    }
    /// The key's text: exact values, accept ranges and the safe band's reasons.
    fn key_lines(&self, w: &Words) -> Vec<String>;
    /// The key's plot in `rect` (page mm); empty when the kind has none.
    fn key_plot(&self, rect: Rect, w: &Words) -> Vec<Item>;
    /// A line for the student to fill in under the table, if any.
    fn student_note(&self, w: &Words) -> Option<String>;
    /// A blank plot for the student to fill in, in `rect` (page mm), where
    /// the key has its plot; empty when the kind has none (the student note
    /// goes there then).
    fn student_plot(&self, _rect: Rect, _w: &Words) -> Vec<Item> {
        Vec::new()
    }
    /// Whether the sheet (and its key) has a gauge page after its drawing.
    fn has_gauge(&self) -> bool {
        false
    }
    /// The gauge page's drawing in `rect` (page mm), when the sheet has one;
    /// `key` adds the answers (the key's gauge page).
    fn gauge(&self, _rect: Rect, _key: bool, _w: &Words) -> Vec<Item> {
        Vec::new()
    }
    /// The kind's part of the answer file, as a JSON object.
    fn answers(&self) -> serde_json::Value;
    /// The class summary's rows, one per guide ray in letter order.
    fn summary_rows(&self) -> Vec<SummaryRow>;
    /// The class summary page's cells for each ray in letter order: letter,
    /// guide value, predicted answer with its accept range, and two cells of
    /// sheet-wide values (printed on the first row only).
    fn summary_cells(&self, w: &Words) -> Vec<[String; 5]>;
    /// The `check`/`solve` text for the sheet (after its heading line).
    fn report(&self) -> String;
    /// Every graded answer a student measures, ray by ray in letter order,
    /// as the table's columns ask for them.
    fn measured(&self) -> Vec<Measured>;
    /// [`SheetView::measured`] with the piece's index replaced by `index`:
    /// the same guide settings traced again (the accept ranges and which
    /// answers are graded stay), for fitting a kit's real index to what a
    /// class measured. An answer that no longer exists at `index` is left out.
    fn measured_at_index(&self, index: f64) -> Vec<Measured>;
    /// The exact curve the class's measurements of this sheet are plotted
    /// against when marking, if the sheet has one.
    fn class_curve(&self) -> Option<ClassCurve>;
    /// At a flat face read at a protractor: each guide ray traced at `index`
    /// (a colour's) as (letter, whether it leaves rather than being totally
    /// reflected), for the rays that do one or the other; empty for other
    /// kinds. Near the critical angle one colour may leave while another is
    /// totally reflected, and the key says so.
    fn leaves_at_index(&self, _index: f64) -> Vec<(String, bool)> {
        Vec::new()
    }
    /// Every guide ray traced again with the piece's index replaced by
    /// `index` (a colour's), as (letter, path in the sheet frame as the key
    /// draws it: from the ray box to its drawn end); `None` when the kind
    /// does not trace colours.
    fn colour_paths(&self, _index: f64) -> Option<Vec<(String, Vec<crate::geom::Point>)>> {
        None
    }
    /// The sheet's longitudinal spherical aberration, mm: the largest distance
    /// between the paraxial focus and a graded ray's crossing (lens shapes);
    /// `None` for flat faces.
    fn aberration_mm(&self) -> Option<f64> {
        None
    }
    /// Whether the kind's own key text already tells the colours (spectrum
    /// sheets), so the shared colour lines are left out.
    fn owns_colour_text(&self) -> bool {
        false
    }
}

impl SheetPlan {
    /// The kind-particular part, as layout and output see it.
    pub fn view(&self) -> &dyn SheetView {
        self.detail.view()
    }

    /// The lens part, for curved-face and focal sheets.
    pub fn lens(&self) -> Option<&lens::LensPlan> {
        match &self.detail {
            Detail::Lens(p) => Some(p),
            _ => None,
        }
    }

    /// What must be on paper, in the sheet frame.
    pub fn setup(&self) -> Setup {
        self.view().extent()
    }
}

/// Plans every sheet of the lesson, ungrouped: fixed values where given,
/// defaults elsewhere.
pub fn plan_lesson(lesson: &Lesson, paper: &PaperSpec) -> Vec<SheetPlan> {
    lesson
        .sheets
        .iter()
        .map(|s| {
            let mut plan = s.kind.def().prepare(&lesson.kit, s, paper).plan(None);
            attach(&mut plan, s);
            plan
        })
        .collect()
}

/// Adds what the kit's sheet table asks beyond the kind's plan: the colours'
/// traces (`all_colours`) and the material's source.
pub fn attach(plan: &mut SheetPlan, spec: &SheetSpec) {
    plan.source = spec.source;
    plan.colours = colours::colour_set(plan.view(), &spec.lights);
}
