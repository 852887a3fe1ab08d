//! `all_colours = true`: every guide ray of a sheet traced again in every
//! colour of the ray box, at that colour's index, with what the key prints
//! about it (each colour's value, the spread between the extreme colours and
//! how it compares with the sheet's spherical aberration or accept range) and
//! the answer file's part.
//!
//! A kind takes part by answering [`SheetView::colour_paths`] and
//! [`SheetView::measured_at_index`]; the rest is the same for every kind.

use serde_json::{Value, json};

use super::{Measured, SheetPlan, SheetView, Want};
use crate::draw::colour::{ColourPath, ColourStyle, colour_paths, colour_styles, keep_labels_off, legend};
use crate::draw::{Drawing, Words};
use crate::geom::Point;
use crate::plan::fmt_index;
use crate::scene::{Item, Rect};

/// One colour of the ray box, resolved for a sheet's piece.
#[derive(Clone, Debug, PartialEq)]
pub struct Light {
    /// The colour's name, as the kit writes it.
    pub name: String,
    /// Its wavelength, nm.
    pub wavelength_nm: f64,
    /// The piece's index at that wavelength.
    pub index: f64,
}

/// One colour's traces on a sheet.
#[derive(Clone, Debug, PartialEq)]
pub struct ColourRun {
    /// The colour and the index it was traced at.
    pub light: Light,
    /// How the key draws it.
    pub style: ColourStyle,
    /// Each guide ray's path in this colour (letter, points in the sheet
    /// frame), starting where it parts from the other colours.
    pub paths: Vec<(String, Vec<Point>)>,
    /// Every graded answer in this colour, as [`SheetView::measured`] gives it.
    pub measured: Vec<Measured>,
    /// At a protractor: each ray and whether it leaves in this colour (see
    /// [`SheetView::leaves_at_index`]).
    pub leaves: Vec<(String, bool)>,
}

/// Every colour's traces on a sheet, in the ray box's order.
#[derive(Clone, Debug, PartialEq)]
pub struct ColourSet {
    /// One run per colour.
    pub runs: Vec<ColourRun>,
    /// The sheet's spherical aberration, mm, when it has one (lens shapes).
    pub aberration_mm: Option<f64>,
}

/// One spread: a ray's quantity in the extreme colours (shortest and longest
/// wavelength).
#[derive(Clone, Debug, PartialEq)]
pub struct Spread {
    /// The ray's letter.
    pub ray: String,
    /// The quantity (its `measured` name).
    pub quantity: &'static str,
    /// Its unit.
    pub unit: &'static str,
    /// Value in each colour, in the ray box's order (`None`: no value).
    pub values: Vec<Option<f64>>,
    /// Value at the longest wavelength minus value at the shortest.
    pub spread: f64,
    /// The accept range of the quantity (±), at the sheet's own wavelength.
    pub tolerance: f64,
}

/// Traces every colour of `lights` on a planned sheet; `None` with fewer than
/// two colours or when the kind draws no colour paths.
pub fn colour_set(view: &dyn SheetView, lights: &[Light]) -> Option<ColourSet> {
    if lights.len() < 2 {
        return None;
    }
    let styles = colour_styles(&lights.iter().map(|l| (l.wavelength_nm, l.name.clone())).collect::<Vec<_>>());
    let mut runs = Vec::new();
    for (light, style) in lights.iter().zip(styles) {
        let paths = view.colour_paths(light.index)?;
        runs.push(ColourRun {
            light: light.clone(),
            style,
            paths,
            measured: view.measured_at_index(light.index),
            leaves: view.leaves_at_index(light.index),
        });
    }
    part_paths(&mut runs);
    Some(ColourSet { runs, aberration_mm: view.aberration_mm() })
}

/// Cuts each path to start at the last point all colours of that ray share
/// (white light until then), so the key draws a colour only where it has
/// parted from the others; a ray whose colours never part is left out.
fn part_paths(runs: &mut [ColourRun]) {
    let letters: Vec<String> =
        runs.first().map(|r| r.paths.iter().map(|p| p.0.clone()).collect()).unwrap_or_default();
    for (k, _) in letters.iter().enumerate() {
        let paths: Vec<&Vec<Point>> = runs.iter().filter_map(|r| r.paths.get(k).map(|p| &p.1)).collect();
        let shortest = paths.iter().map(|p| p.len()).min().unwrap_or(0);
        let mut shared = 0;
        while shared < shortest && paths.iter().all(|p| p[shared].distance(paths[0][shared]) < 1e-6) {
            shared += 1;
        }
        // Every colour on one path (a totally reflected ray: reflection does
        // not disperse): the light stays white, drawn once by the kind.
        let never_parts = shared == shortest && paths.iter().all(|p| p.len() == shortest);
        let from = shared.saturating_sub(1);
        for r in runs.iter_mut() {
            if let Some(p) = r.paths.get_mut(k) {
                if never_parts {
                    p.1.clear();
                } else {
                    p.1.drain(..from.min(p.1.len().saturating_sub(2)));
                }
            }
        }
    }
}

impl ColourSet {
    /// The extreme colours: (shortest wavelength, longest wavelength), as
    /// indices into `runs`.
    pub fn extremes(&self) -> (usize, usize) {
        let by = |a: &usize, b: &usize| {
            self.runs[*a].light.wavelength_nm.total_cmp(&self.runs[*b].light.wavelength_nm)
        };
        let idx = 0..self.runs.len();
        (idx.clone().min_by(by).unwrap_or(0), idx.max_by(by).unwrap_or(0))
    }

    /// For each ray, its first graded quantity in every colour and the spread
    /// between the extreme colours (rays without a value in both left out).
    /// `reference` is the sheet's own `measured` (for the accept range).
    pub fn spreads(&self, reference: &[Measured]) -> Vec<Spread> {
        let (short, long) = self.extremes();
        let mut out = Vec::new();
        let value = |m: &[Measured], ray: &str, q: &str| {
            m.iter().find(|x| x.ray == ray && x.quantity == q).and_then(|x| match x.want {
                Want::Value { value, .. } => Some(value),
                Want::Observation(_) => None,
            })
        };
        let mut seen: Vec<&str> = Vec::new();
        for m in reference {
            let Want::Value { tolerance, .. } = m.want else { continue };
            if seen.contains(&m.ray.as_str()) {
                continue;
            }
            seen.push(&m.ray);
            let values: Vec<Option<f64>> =
                self.runs.iter().map(|r| value(&r.measured, &m.ray, m.quantity)).collect();
            if let (Some(a), Some(b)) = (values[short], values[long]) {
                out.push(Spread {
                    ray: m.ray.clone(),
                    quantity: m.quantity,
                    unit: m.unit,
                    values,
                    spread: b - a,
                    tolerance,
                });
            }
        }
        out
    }

    /// Every colour's paths, as the key draws them.
    fn paths(&self) -> Vec<ColourPath<'_>> {
        self.runs
            .iter()
            .flat_map(|r| {
                r.paths.iter().map(move |(_, pts)| ColourPath { style: &r.style, points: pts.clone() })
            })
            .collect()
    }

    /// The coloured paths on the key, with each colour's initial at both ends.
    pub fn key_items(&self, d: &mut Drawing, bounds: &Rect) -> Vec<Item> {
        colour_paths(d, bounds, &self.paths())
    }

    /// Each colour as the legend and the key's text name it.
    fn items(&self, w: &Words) -> Vec<String> {
        self.runs
            .iter()
            .map(|r| {
                w.fill(
                    "colour_item",
                    &[
                        ("name", &r.light.name),
                        ("initial", &r.style.initial),
                        ("wavelength", &format!("{:.1}", r.light.wavelength_nm)),
                        ("index", &fmt_index(r.light.index)),
                    ],
                )
            })
            .collect()
    }

    /// The key's lines about the colours: the list of colours when the
    /// legend found no room, each ray's value in every colour, the spreads
    /// between the extreme colours and how they compare with the sheet's
    /// spherical aberration (or, for flat faces, with the accept range).
    pub fn key_lines(&self, reference: &[Measured], w: &Words) -> Vec<String> {
        let mut lines = Vec::new();
        let spreads = self.spreads(reference);
        let Some(first) = spreads.first() else { return self.split_outcomes(w) };
        let initials: Vec<&str> = self.runs.iter().map(|r| r.style.initial.as_str()).collect();
        // Rays with the same values (a pair either side of the axis) share an entry.
        let mut rays: Vec<(Vec<String>, String)> = Vec::new();
        for s in &spreads {
            let v: Vec<String> = s.values.iter().map(|v| v.map_or_else(|| "–".into(), fmt1)).collect();
            let v = v.join("/");
            match rays.iter_mut().find(|(_, x)| *x == v) {
                Some((letters, _)) => letters.push(s.ray.clone()),
                None => rays.push((vec![s.ray.clone()], v)),
            }
        }
        let rays: Vec<String> = rays.iter().map(|(l, v)| format!("{} {v}", l.join(", "))).collect();
        lines.push(w.fill(
            "colour_values",
            &[
                ("quantity", quantity_words(first.quantity, w)),
                ("initials", &initials.join("/")),
                ("rays", &rays.join("; ")),
                ("unit", unit_words(first.unit, w)),
            ],
        ));
        let mut apart: Vec<(Vec<String>, String)> = Vec::new();
        for s in &spreads {
            let v = format!("{}{}", fmt2(s.spread.abs()), unit_words(s.unit, w));
            match apart.iter_mut().find(|(_, x)| *x == v) {
                Some((letters, _)) => letters.push(s.ray.clone()),
                None => apart.push((vec![s.ray.clone()], v)),
            }
        }
        let apart: Vec<String> = apart.iter().map(|(l, v)| format!("{} {v}", l.join(", "))).collect();
        let apart = apart.join("; ");
        let widest = spreads.iter().max_by(|a, b| a.spread.abs().total_cmp(&b.spread.abs())).unwrap_or(first);
        let spread = widest.spread.abs();
        let line = match (self.aberration_mm, widest.unit) {
            (Some(ab), "mm") if ab > 1e-9 => {
                let fill = [
                    ("spreads", apart),
                    ("percent", format!("{:.0}", 100.0 * spread / ab)),
                    ("aberration", fmt1(ab)),
                ];
                let fill: Vec<(&str, &str)> = fill.iter().map(|(k, v)| (*k, v.as_str())).collect();
                if spread < ab {
                    w.fill("colour_vs_aberration", &fill)
                } else {
                    w.fill("colour_vs_aberration_larger", &fill)
                }
            }
            _ => {
                let fill = [
                    ("spreads", apart),
                    ("unit", unit_words(widest.unit, w).to_string()),
                    ("range", fmt2(widest.tolerance)),
                ];
                let fill: Vec<(&str, &str)> = fill.iter().map(|(k, v)| (*k, v.as_str())).collect();
                if spread < widest.tolerance {
                    w.fill("colour_within_range", &fill)
                } else {
                    w.fill("colour_beyond_range", &fill)
                }
            }
        };
        lines.push(line);
        lines.extend(self.split_outcomes(w));
        lines
    }

    /// A line for each ray that leaves in some colours and is totally
    /// reflected in others (its angle lies between their critical angles).
    fn split_outcomes(&self, w: &Words) -> Vec<String> {
        let Some(first) = self.runs.first() else { return Vec::new() };
        let mut lines = Vec::new();
        for (k, (letter, _)) in first.leaves.iter().enumerate() {
            let of = |leaves: bool| -> Vec<&str> {
                self.runs
                    .iter()
                    .filter(|r| r.leaves.get(k).is_some_and(|(l, x)| l == letter && *x == leaves))
                    .map(|r| r.light.name.as_str())
                    .collect()
            };
            let (out, back) = (of(true), of(false));
            if out.is_empty() || back.is_empty() {
                continue;
            }
            let critical: Vec<String> = self
                .runs
                .iter()
                .map(|r| format!("{} {}°", r.style.initial, fmt1((1.0 / r.light.index).asin().to_degrees())))
                .collect();
            lines.push(w.fill(
                "colour_outcome_split",
                &[
                    ("ray", letter),
                    ("leaving", &out.join(", ")),
                    ("reflected", &back.join(", ")),
                    ("critical", &critical.join(", ")),
                ],
            ));
        }
        lines
    }

    /// The answer file's part: `colours` (per colour: `colour`,
    /// `wavelength_nm`, `index`, its measured answers) and `colour_spread`.
    pub fn answers(&self, reference: &[Measured]) -> (Value, Value) {
        let colours: Vec<Value> = self
            .runs
            .iter()
            .map(|r| {
                let measured: Vec<Value> = r
                    .measured
                    .iter()
                    .map(|m| match m.want {
                        Want::Value { value, tolerance } => json!({
                            "ray": m.ray, "quantity": m.quantity, "unit": m.unit, "value": value, "tolerance": tolerance,
                        }),
                        Want::Observation(word) => {
                            json!({ "ray": m.ray, "quantity": m.quantity, "observation": word })
                        }
                    })
                    .collect();
                json!({
                    "colour": r.light.name,
                    "wavelength_nm": r.light.wavelength_nm,
                    "index": r.light.index,
                    "measured": measured,
                })
            })
            .collect();
        let spreads: Vec<Value> = self
            .spreads(reference)
            .iter()
            .map(|s| json!({ "ray": s.ray, "quantity": s.quantity, "unit": s.unit, "spread": s.spread }))
            .collect();
        let mut spread = json!({ "rays": spreads });
        if let (Some(ab), Value::Object(m)) = (self.aberration_mm, &mut spread) {
            m.insert("spherical_aberration_mm".into(), json!(ab));
        }
        (Value::Array(colours), spread)
    }
}

impl SheetPlan {
    /// What the key adds on top of the student drawing: the kind's own key,
    /// every colour's paths when the sheet traces colours, and a legend in
    /// the first free corner of the drawing: each colour (its stroke, initial,
    /// name, wavelength, index) and the paper a built-in material's index
    /// comes from.
    pub fn key(&self, base: &mut Drawing, bounds: Rect, w: &Words) -> Vec<Item> {
        // The colours' paths are drawn after the kind's key, but its labels
        // must keep off them as well as off the white rays.
        if let Some(c) = &self.colours {
            keep_labels_off(base, &bounds, &c.paths());
        }
        let mut items = self.view().key(base, bounds, w);
        let mut rows: Vec<(Option<&ColourStyle>, String)> = Vec::new();
        if let Some(c) = &self.colours {
            items.extend(c.key_items(base, &bounds));
            rows.extend(c.runs.iter().map(|r| &r.style).zip(c.items(w)).map(|(s, t)| (Some(s), t)));
        }
        if let Some(s) = self.source {
            rows.push((None, w.fill("material_source", &[("citation", s)])));
        }
        if !rows.is_empty() {
            // Where the drawing has no room for it, the legend is left out
            // and `labels_placed` below says so: the layout check catches it.
            items.extend(legend(base, &bounds, &rows).into_iter().flatten());
        }
        items
    }

    /// The key's text: the kind's lines, then the colours' lines.
    pub fn key_lines(&self, w: &Words) -> Vec<String> {
        let mut lines = self.view().key_lines(w);
        if let Some(c) = self.colours.as_ref().filter(|_| !self.view().owns_colour_text()) {
            lines.extend(c.key_lines(&self.view().measured(), w));
        }
        lines
    }
}

fn fmt1(v: f64) -> String {
    format!("{:.1}", v + 0.0)
}

fn fmt2(v: f64) -> String {
    format!("{:.2}", v + 0.0)
}

/// Printed words for a measured quantity.
fn quantity_words<'w>(q: &str, w: &'w Words) -> &'w str {
    if q.ends_with("from_flat_face_mm") {
        w.say("colour_q_flat")
    } else if q.ends_with("from_exit_face_mm") {
        w.say("colour_q_exit")
    } else if q.starts_with("crossing") || q.starts_with("traced_back") {
        w.say("colour_q_crossing")
    } else if q.starts_with("refraction") {
        w.say("colour_q_refraction")
    } else if q.starts_with("emergence") {
        w.say("colour_q_emergence")
    } else if q.starts_with("lateral") {
        w.say("colour_q_shift")
    } else {
        w.say("colour_q_deviation")
    }
}

/// Printed unit.
fn unit_words<'w>(u: &str, w: &'w Words) -> &'w str {
    if u == "mm" { w.say("unit_mm") } else { w.say("unit_deg") }
}
