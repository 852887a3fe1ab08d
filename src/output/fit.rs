//! The kit's real index: each material's index fitted to what the class
//! measured, by least squares on the exact trace (not a paraxial formula).
//!
//! Every measured number on a sheet whose piece is made of the material is
//! predicted again at a trial index with the build's own guide settings (the
//! heights and angles in its answer file), and the index minimising
//! S(n) = Σ ((measured − predicted(n)) / tolerance)² is found by a scan and a
//! golden-section search. Its uncertainty comes from the spread of the
//! residuals: s² = S/(N − 1), standard error se = √(s² / Σ Jᵢ²) with
//! Jᵢ = ∂rᵢ/∂n (the usual linearised error of a one-parameter least-squares
//! fit), and the stated uncertainty is the 95 % half-width t₀.₉₇₅(N − 1)·se.

use std::collections::BTreeMap;

use serde_json::Value;

use super::answer_file::AnswerFile;
use super::grade::{GradeError, Key, Verdict, parse};
use crate::paper::PaperSpec;
use crate::sheets::{Choice, Enter, Lesson, SheetPlan, Want};

/// One material's fitted index.
#[derive(Clone, Debug, PartialEq)]
pub struct MaterialFit {
    /// The material's id in the kit.
    pub material: String,
    /// The index the kit gives it.
    pub kit_index: f64,
    /// The fitted index, if the measurements fix it.
    pub index: Option<f64>,
    /// Half-width of its 95 % interval.
    pub uncertainty: Option<f64>,
    /// Numbers measured on sheets made of it.
    pub measurements: usize,
    /// Why there is no index, when there is none.
    pub why_not: Option<String>,
}

/// Two-sided 95 % Student t quantiles for 1–30 degrees of freedom (standard
/// tables, e.g. NIST/SEMATECH e-Handbook, table 1.3.6.7.2); 1.96 beyond.
fn t95(df: usize) -> f64 {
    const T: [f64; 30] = [
        12.706, 4.303, 3.182, 2.776, 2.571, 2.447, 2.365, 2.306, 2.262, 2.228, 2.201, 2.179, 2.160, 2.145,
        2.131, 2.120, 2.110, 2.101, 2.093, 2.086, 2.080, 2.074, 2.069, 2.064, 2.060, 2.056, 2.052, 2.048,
        2.045, 2.042,
    ];
    if df == 0 { f64::INFINITY } else { T.get(df - 1).copied().unwrap_or(1.96) }
}

/// Fits every material of `lesson` that the results measured.
pub fn fit(
    lesson: &Lesson,
    paper: &PaperSpec,
    results: &str,
    results_file: &str,
    answers: &str,
    answers_file: &str,
) -> Result<Vec<MaterialFit>, GradeError> {
    let a = AnswerFile::read(answers, answers_file)?;
    let parsed = parse(results, results_file, &a, answers_file)?;
    let whole = |message: String| GradeError { file: answers_file.to_string(), line: 0, column: 0, message };
    // The build's sheets: (group, number) → the plan with its own settings.
    let mut plans: BTreeMap<(String, u64), SheetPlan> = BTreeMap::new();
    for s in &a.sheets {
        let number = s.sheet;
        let Some(spec) = lesson.sheets.get((number as usize).wrapping_sub(1)) else {
            return Err(whole(format!(
                "sheet {number} of the build is not in this kit (it has {} sheets); give the kit the build was made from",
                lesson.sheets.len()
            )));
        };
        let piece = &lesson.kit.pieces[spec.piece];
        if s.piece != piece.id || s.kind != spec.kind.as_str() {
            return Err(whole(format!(
                "sheet {number} was a {} sheet with piece {} in the build, a {} sheet with piece {} in this kit; give the kit the build was made from",
                s.kind,
                s.piece,
                spec.kind.as_str(),
                piece.id
            )));
        }
        // A sheet without guide rays (a radius sheet) measures shapes, not the index.
        let Some(rays) = &s.rays else { continue };
        let enter = match s.enter.as_str() {
            "front" => Enter::Front,
            "back" => Enter::Back,
            "base" => Enter::Base,
            _ => Enter::Side,
        };
        let values: Vec<f64> = rays
            .iter()
            .filter_map(|r| {
                r.get("height_mm").or_else(|| r.get("angle_of_incidence_deg")).and_then(Value::as_f64)
            })
            .collect();
        let prepared = spec.kind.def().prepare(&lesson.kit, spec, paper);
        plans.insert((s.group.clone(), number), prepared.plan(Some(&Choice { enter, values })));
    }
    // The measured numbers, by material.
    let mut by_material: BTreeMap<String, Vec<(Key, f64, f64)>> = BTreeMap::new();
    for (key, _, verdict) in &parsed.rows {
        let Some(Verdict::Number { measured, .. }) = verdict else { continue };
        let Some(plan) = plans.get(&(key.0.clone(), key.1)) else { continue };
        let Some(m) = plan.view().measured().into_iter().find(|m| m.ray == key.2 && m.quantity == key.3)
        else {
            continue;
        };
        let Want::Value { tolerance, .. } = m.want else { continue };
        let material = lesson.kit.pieces[lesson.sheets[key.1 as usize - 1].piece].material.clone();
        by_material.entry(material).or_default().push((key.clone(), *measured, tolerance));
    }
    let mut out = Vec::new();
    for (material, rows) in by_material {
        let kit_index = lesson
            .kit
            .pieces
            .iter()
            .find(|p| p.material == material)
            .map(|p| p.piece.index())
            .unwrap_or(f64::NAN);
        out.push(fit_one(material, kit_index, &rows, &plans));
    }
    Ok(out)
}

/// Residuals (measured − predicted)/tolerance at index `n`; a prediction
/// that no longer exists counts as 10 tolerances off.
fn residuals(n: f64, rows: &[(Key, f64, f64)], plans: &BTreeMap<(String, u64), SheetPlan>) -> Vec<f64> {
    let mut predicted: BTreeMap<(String, u64), Vec<crate::sheets::Measured>> = BTreeMap::new();
    rows.iter()
        .map(|(key, measured, tol)| {
            let at = predicted
                .entry((key.0.clone(), key.1))
                .or_insert_with(|| plans[&(key.0.clone(), key.1)].view().measured_at_index(n));
            let p = at.iter().find(|m| m.ray == key.2 && m.quantity == key.3).and_then(|m| match m.want {
                Want::Value { value, .. } => Some(if key.3.ends_with("_deg") { value.abs() } else { value }),
                Want::Observation(_) => None,
            });
            match p {
                Some(p) => (measured - p) / tol,
                None => 10.0,
            }
        })
        .collect()
}

fn fit_one(
    material: String,
    kit_index: f64,
    rows: &[(Key, f64, f64)],
    plans: &BTreeMap<(String, u64), SheetPlan>,
) -> MaterialFit {
    let n_rows = rows.len();
    let none = |why: String| MaterialFit {
        material: material.clone(),
        kit_index,
        index: None,
        uncertainty: None,
        measurements: n_rows,
        why_not: Some(why),
    };
    if n_rows < 2 {
        return none(format!(
            "{n_rows} number measured on its sheets; at least 2 are needed to fit an index and say how sure it is"
        ));
    }
    let s = |n: f64| residuals(n, rows, plans).iter().map(|r| r * r).sum::<f64>();
    // Scan classroom materials' range, then refine the best bracket.
    let (lo, hi, step): (f64, f64, f64) = (1.30, 1.90, 0.005);
    let steps = ((hi - lo) / step).round() as usize;
    let (mut best, mut best_s) = (lo, f64::INFINITY);
    for k in 0..=steps {
        let n = lo + step * k as f64;
        let v = s(n);
        if v < best_s {
            (best, best_s) = (n, v);
        }
    }
    let (mut a, mut b) = ((best - step).max(1.0 + 1e-6), best + step);
    let g = (5f64.sqrt() - 1.0) / 2.0;
    let (mut c, mut d) = (b - g * (b - a), a + g * (b - a));
    let (mut fc, mut fd) = (s(c), s(d));
    while b - a > 1e-10 {
        if fc < fd {
            (b, d, fd) = (d, c, fc);
            c = b - g * (b - a);
            fc = s(c);
        } else {
            (a, c, fc) = (c, d, fd);
            d = a + g * (b - a);
            fd = s(d);
        }
    }
    let n = (a + b) / 2.0;
    // Sensitivity of each residual to n, by central differences.
    let h = 1e-6;
    let (up, down) = (residuals(n + h, rows, plans), residuals(n - h, rows, plans));
    let jj: f64 = up.iter().zip(&down).map(|(u, d)| ((u - d) / (2.0 * h)).powi(2)).sum();
    if jj < 1e-12 {
        return none(
            "none of the numbers measured depends on the index (a right-angle prism's turn, say); measure refraction on a half-disc, block or prism".into(),
        );
    }
    let s2 = s(n) / (n_rows - 1) as f64;
    let se = (s2 / jj).sqrt();
    MaterialFit {
        material,
        kit_index,
        index: Some(n),
        uncertainty: Some(t95(n_rows - 1) * se),
        measurements: n_rows,
        why_not: None,
    }
}

/// The fits as text: one paragraph per material with the kit line to change.
pub fn fit_text(fits: &[MaterialFit]) -> String {
    let mut s = String::new();
    if fits.is_empty() {
        s.push_str("No measured numbers to fit: fill in the `measured` column of results.csv first.\n");
    }
    for f in fits {
        match (f.index, f.uncertainty) {
            (Some(n), Some(u)) => s.push_str(&format!(
                "{}: n = {n:.4} ± {u:.4} (95 %, from {} measured numbers; the kit says {}).\n  In the kit: [materials.{}] index = {n:.3}\n",
                f.material, f.measurements, f.kit_index, f.material
            )),
            _ => s.push_str(&format!(
                "{}: no index: {} (the kit says {}).\n",
                f.material,
                f.why_not.as_deref().unwrap_or("the measurements cannot fix it"),
                f.kit_index
            )),
        }
    }
    s
}

/// The fits as JSON: `{"materials": [{"material", "index", "uncertainty", "measurements"}]}`.
pub fn fit_json(fits: &[MaterialFit]) -> String {
    let materials: Vec<Value> = fits
        .iter()
        .map(|f| {
            serde_json::json!({
                "material": f.material,
                "index": f.index,
                "uncertainty": f.uncertainty,
                "measurements": f.measurements,
                "kit_index": f.kit_index,
                "why_not": f.why_not,
            })
        })
        .collect();
    let mut s =
        serde_json::to_string_pretty(&serde_json::json!({ "materials": materials })).unwrap_or_default();
    s.push('\n');
    s
}
