//! An answer file read back (for marking and for fitting the kit's index):
//! the fields those read, typed, from one parse of the JSON that
//! [`super::answers`] writes. Fields a kind adds to its rays stay as JSON
//! maps, since they differ by kind.

use serde::Deserialize;
use serde_json::{Map, Value};

use super::grade::GradeError;

/// The answer file of one build.
#[derive(Clone, Debug, Deserialize)]
pub struct AnswerFile {
    /// The kit's title.
    #[serde(default)]
    pub kit: String,
    /// SHA-256 of the kit file's text the build was made from, when recorded.
    #[serde(default)]
    pub kit_sha256: Option<String>,
    /// Every sheet of the build, group by group.
    pub sheets: Vec<AnsweredSheet>,
}

/// One sheet of the build.
#[derive(Clone, Debug, Deserialize)]
pub struct AnsweredSheet {
    /// The sheet's number in the kit (1-based).
    pub sheet: u64,
    /// The kind's kit word.
    #[serde(default)]
    pub kind: String,
    /// The piece's id.
    #[serde(default)]
    pub piece: String,
    /// The entry side's kit word.
    #[serde(default)]
    pub enter: String,
    /// The group's name; empty for a build without groups.
    #[serde(default, deserialize_with = "null_as_empty")]
    pub group: String,
    /// The variant code.
    #[serde(default, deserialize_with = "null_as_empty")]
    pub variant: String,
    /// The guide rays, with each kind's own fields; `None` for a sheet
    /// without rays (a radius sheet).
    #[serde(default)]
    pub rays: Option<Vec<Map<String, Value>>>,
    /// What the students measure; `None` in files of older raysheets.
    #[serde(default)]
    pub measured: Option<Vec<MeasuredAnswer>>,
    /// The sheet's exact curve for the class plot, if it has one.
    #[serde(default)]
    pub class_curve: Option<ClassCurve>,
}

/// One measured answer: a number with its tolerance, or an observation word.
#[derive(Clone, Debug, Deserialize)]
pub struct MeasuredAnswer {
    /// The ray's letter.
    #[serde(default)]
    pub ray: String,
    /// The quantity's answer-file name.
    #[serde(default)]
    pub quantity: String,
    /// Its unit.
    #[serde(default)]
    pub unit: String,
    /// The exact value, for a number.
    #[serde(default)]
    pub value: Option<f64>,
    /// Its accept range (±), for a number.
    #[serde(default)]
    pub tolerance: Option<f64>,
    /// The expected word, for an observation.
    #[serde(default)]
    pub observation: Option<String>,
}

/// A sheet's exact curve: a ray field against a measured quantity.
#[derive(Clone, Debug, Deserialize)]
pub struct ClassCurve {
    /// The ray field along x (a height or an angle).
    pub x: String,
    /// The measured quantity along y.
    pub y: String,
    /// Points of the exact curve.
    #[serde(default)]
    pub points: Vec<(f64, f64)>,
    /// The paraxial limit, if the kind has one.
    #[serde(default)]
    pub paraxial: Option<f64>,
}

fn null_as_empty<'de, D: serde::Deserializer<'de>>(d: D) -> Result<String, D::Error> {
    Ok(Option::<String>::deserialize(d)?.unwrap_or_default())
}

impl AnswerFile {
    /// Reads `text` (the contents of `file`): refused, located, when it is
    /// not JSON, was written in another layout ([`super::answers::FORMAT`]),
    /// or lacks what marking reads.
    pub fn read(text: &str, file: &str) -> Result<AnswerFile, GradeError> {
        let whole = |message: String| GradeError { file: file.to_string(), line: 0, column: 0, message };
        let v: Value = serde_json::from_str(text).map_err(|e| GradeError {
            file: file.to_string(),
            line: e.line() as u64,
            column: e.column(),
            message: format!(
                "not the answer file raysheet writes (not JSON: {e}); give the answers.json of the build the results belong to"
            ),
        })?;
        if v.get("format").and_then(Value::as_u64) != Some(u64::from(super::answers::FORMAT)) {
            return Err(whole(format!(
                "not an answer file of this raysheet (its `format` is {}, this raysheet reads {}); give the answers.json the same build wrote",
                v.get("format").map(|f| f.to_string()).unwrap_or_else(|| "missing".into()),
                super::answers::FORMAT
            )));
        }
        if v.get("sheets").and_then(Value::as_array).is_none() {
            return Err(whole("has no `sheets`".into()));
        }
        serde_json::from_value(v).map_err(|e| {
            whole(format!(
                "not the answer file raysheet writes ({e}); give the answers.json of the build the results belong to"
            ))
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_written_answer_file_reads_back_with_its_measured_answers_and_curve() {
        let lesson = crate::sheets::Lesson::from_toml(crate::demo::DEMO_KIT, "demo.toml").unwrap();
        let plans = crate::sheets::plan_lesson(&lesson, &lesson.paper);
        let text = super::super::answers::to_json_for(&lesson.kit, None, &plans);
        let a = AnswerFile::read(&text, "answers.json").unwrap();
        assert_eq!(a.kit, lesson.title);
        assert_eq!(a.kit_sha256.as_deref(), Some(lesson.kit.source_sha256.as_str()));
        assert_eq!(a.sheets.len(), plans.len());
        for (s, p) in a.sheets.iter().zip(&plans) {
            assert_eq!((s.sheet, s.kind.as_str(), s.group.as_str()), (p.number as u64, p.kind.as_str(), ""));
            assert_eq!(s.measured.as_ref().map(Vec::len), Some(p.view().measured().len()));
            assert_eq!(s.class_curve.is_some(), p.view().class_curve().is_some());
        }
    }

    #[test]
    fn files_of_another_layout_or_not_json_are_refused_with_the_reason() {
        let e = AnswerFile::read("{\"format\": 99, \"sheets\": []}", "a.json").unwrap_err();
        assert!(e.message.contains("its `format` is 99"), "{e}");
        let e = AnswerFile::read("{\n  \"format\": 1,\n  oops", "a.json").unwrap_err();
        assert_eq!((e.line, e.file.as_str()), (3, "a.json"));
        let e =
            AnswerFile::read("{\"format\": 1, \"sheets\": [{\"sheet\": \"one\"}]}", "a.json").unwrap_err();
        assert!(e.message.contains("not the answer file"), "{e}");
    }
}
