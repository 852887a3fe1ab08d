//! The answer file: every plan's answers written for machines (JSON). The
//! fields every sheet has come first; the kind adds its own (see each kind's
//! `answers`). Every ray then carries the wavelength it is traced at and the
//! index there, right after its letter.

use serde_json::{Map, Value, json};

use crate::sheets::SheetPlan;

/// Version of the answer-file layout.
pub const FORMAT: u32 = 1;

/// The answer file for `plans` as pretty JSON (fields in a fixed order, lengths
/// in mm and angles in degrees, unrounded).
pub fn to_json(kit_title: &str, seed: Option<u64>, plans: &[SheetPlan]) -> String {
    to_json_with(kit_title, None, seed, plans)
}

/// [`to_json`] for a build from `kit`: it also records the SHA-256 of the kit
/// file's text (`kit_sha256`), so marking can tell when the kit was changed since.
pub fn to_json_for(kit: &crate::kit::Kit, seed: Option<u64>, plans: &[SheetPlan]) -> String {
    to_json_with(&kit.title, Some(&kit.source_sha256), seed, plans)
}

fn to_json_with(kit_title: &str, kit_sha256: Option<&str>, seed: Option<u64>, plans: &[SheetPlan]) -> String {
    let sheets: Vec<Value> = plans
        .iter()
        .map(|p| {
            let mut m = Map::new();
            m.insert("sheet".into(), json!(p.number));
            m.insert("kind".into(), json!(p.kind.as_str()));
            m.insert("piece".into(), json!(p.piece_id));
            m.insert("enter".into(), json!(p.enter.as_str()));
            m.insert("group".into(), json!(p.group));
            m.insert("variant".into(), json!(p.variant));
            m.insert("index".into(), json!(p.index));
            m.insert("wavelength_nm".into(), json!(p.wavelength_nm));
            if let Value::Object(kind) = p.view().answers() {
                m.extend(kind);
            }
            if let Some(Value::Array(rays)) = m.get_mut("rays") {
                for ray in rays.iter_mut() {
                    with_light(ray, p.wavelength_nm, p.index);
                }
            }
            m.insert("measured".into(), measured_json(p));
            if let Some(c) = &p.colours {
                let (colours, spread) = c.answers(&p.view().measured());
                m.insert("colours".into(), colours);
                m.insert("colour_spread".into(), spread);
            }

            if let Some(c) = p.view().class_curve() {
                m.insert(
                    "class_curve".into(),
                    json!({ "x": c.x, "y": c.y, "points": c.points, "paraxial": c.paraxial }),
                );
            }
            m.insert("warnings".into(), json!(p.warnings));
            Value::Object(m)
        })
        .collect();
    let mut file = json!({ "format": FORMAT, "kit": kit_title, "seed": seed, "sheets": sheets });
    if let (Some(h), Value::Object(m)) = (kit_sha256, &mut file) {
        // After the title, in the file's fixed order.
        let rest: Vec<(String, Value)> = std::mem::take(m).into_iter().collect();
        for (k, v) in rest {
            let title = k == "kit";
            m.insert(k, v);
            if title {
                m.insert("kit_sha256".into(), json!(h));
            }
        }
    }
    let mut s = serde_json::to_string_pretty(&file).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"));
    s.push('\n');
    s
}

/// What a student measures on the sheet, as `results.csv` and marking use it:
/// `{ray, quantity, unit, value, tolerance}` or `{ray, quantity, observation}`.
fn measured_json(p: &SheetPlan) -> Value {
    p.view()
        .measured()
        .into_iter()
        .map(|m| match m.want {
            crate::sheets::Want::Value { value, tolerance } => json!({
                "ray": m.ray, "quantity": m.quantity, "unit": m.unit, "value": value, "tolerance": tolerance,
            }),
            crate::sheets::Want::Observation(word) => json!({
                "ray": m.ray, "quantity": m.quantity, "observation": word,
            }),
        })
        .collect()
}

/// Puts `wavelength_nm` and `index` right after the ray's letter (`ray`), unless
/// the kind already gave the ray its own (a colour of the ray box).
fn with_light(ray: &mut Value, wavelength_nm: f64, index: f64) {
    let Value::Object(fields) = ray else { return };
    if fields.contains_key("wavelength_nm") {
        return;
    }
    let mut out = Map::new();
    let mut placed = false;
    for (k, v) in std::mem::take(fields) {
        let letter = k == "ray";
        out.insert(k, v);
        if letter {
            out.insert("wavelength_nm".into(), json!(wavelength_nm));
            out.insert("index".into(), json!(index));
            placed = true;
        }
    }
    if !placed {
        out.insert("wavelength_nm".into(), json!(wavelength_nm));
        out.insert("index".into(), json!(index));
    }
    *fields = out;
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn light_goes_right_after_the_letter_and_a_ray_s_own_is_kept() {
        let mut ray = json!({ "ray": "A", "height_mm": 8.0, "outcome": "crosses" });
        with_light(&mut ray, 587.6, 1.49);
        let keys: Vec<&String> = ray.as_object().unwrap().keys().collect();
        assert_eq!(keys, ["ray", "wavelength_nm", "index", "height_mm", "outcome"]);
        assert_eq!(ray["wavelength_nm"], json!(587.6));
        assert_eq!(ray["index"], json!(1.49));
        let mut own = json!({ "ray": "A", "wavelength_nm": 656.3, "index": 1.48 });
        with_light(&mut own, 587.6, 1.49);
        assert_eq!(own["wavelength_nm"], json!(656.3));
        assert_eq!(own["index"], json!(1.48));
    }
}
