//! Marking a class's `results.csv` against the answer file the build wrote:
//! the build's answers are the truth, so a later change to the kit or to
//! raysheet cannot change a mark. Rows are matched by group, sheet, ray and
//! quantity, never by position; the variant code is only a check (a
//! spreadsheet may turn `2E45` into a number).

use std::collections::BTreeMap;

use serde_json::Value;

use super::answer_file::AnswerFile;
use super::results::COLUMNS;
use super::summary::field;

/// A results file or answer file that cannot be marked, located.
#[derive(Clone, Debug, PartialEq)]
pub struct GradeError {
    /// The file as given.
    pub file: String,
    /// 1-based line (0: the whole file).
    pub line: u64,
    /// 1-based column (0: the whole line).
    pub column: usize,
    /// What is wrong and what would be accepted.
    pub message: String,
}

impl std::fmt::Display for GradeError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match (self.line, self.column) {
            (0, _) => write!(f, "{}: {}", self.file, self.message),
            (l, 0) => write!(f, "{}:{l}: {}", self.file, self.message),
            (l, c) => write!(f, "{}:{l}:{c}: {}", self.file, self.message),
        }
    }
}

impl std::error::Error for GradeError {}

/// The marks: `grades.csv`, one line per group for the overview, and warnings.
#[derive(Clone, Debug, PartialEq)]
pub struct Grades {
    /// Every results row with `predicted`, `tolerance`, `difference`, `verdict`.
    pub csv: String,
    /// Per group in the answer file's order: (group, answers within tolerance, answers measured, answers asked).
    pub groups: Vec<(String, usize, usize, usize)>,
    /// Variant codes that differ from the build's, and the like.
    pub warnings: Vec<String>,
    /// For each sheet (and entry side) with a curve: the class's measurements against it.
    pub plots: Vec<crate::layout::ClassPlotData>,
    /// The kit's title, from the answer file.
    pub kit_title: String,
    /// SHA-256 of the kit file the build was made from, when the answer file records it.
    pub kit_sha256: Option<String>,
}

/// One expected answer from the answer file.
#[derive(Clone, Debug)]
struct Expected {
    variant: String,
    unit: String,
    want: Want,
}

#[derive(Clone, Debug)]
enum Want {
    Value { value: f64, tolerance: f64 },
    Observation(String),
}

/// (group, sheet, ray, quantity).
pub(crate) type Key = (String, u64, String, String);

/// The expected answers in an answer file, and its groups in order.
fn expected(a: &AnswerFile, file: &str) -> Result<(BTreeMap<Key, Expected>, Vec<String>), GradeError> {
    let whole = |message: String| GradeError { file: file.to_string(), line: 0, column: 0, message };
    let mut out = BTreeMap::new();
    let mut groups: Vec<String> = Vec::new();
    for s in &a.sheets {
        if !groups.contains(&s.group) {
            groups.push(s.group.clone());
        }
        let Some(measured) = &s.measured else {
            return Err(whole(format!(
                "sheet {} has no `measured` list: the answer file was written by an older raysheet; build again to mark",
                s.sheet
            )));
        };
        for m in measured {
            let want = match (m.value, m.tolerance) {
                (Some(value), Some(tolerance)) => Want::Value { value, tolerance },
                _ => Want::Observation(m.observation.clone().unwrap_or_default()),
            };
            out.insert(
                (s.group.clone(), s.sheet, m.ray.clone(), m.quantity.clone()),
                Expected { variant: s.variant.clone(), unit: m.unit.clone(), want },
            );
        }
    }
    Ok((out, groups))
}

/// The separator of a results file: the one of comma, semicolon and tab that
/// splits its header line into the most fields.
fn separator(text: &str) -> u8 {
    let header = text.lines().next().unwrap_or("");
    [b',', b';', b'\t']
        .into_iter()
        .max_by_key(|&c| header.bytes().filter(|&b| b == c).count())
        .unwrap_or(b',')
}

/// A measured cell as a number: `12.5`, or `12,5` in a semicolon-separated
/// file (a decimal comma). `Err` says why it is not one.
fn number(cell: &str, decimal_comma: bool) -> Result<f64, String> {
    let t = cell.trim().replace('\u{2212}', "-");
    let t = if decimal_comma { t.replace(',', ".") } else { t };
    if let Ok(v) = t.parse::<f64>()
        && v.is_finite()
    {
        return Ok(v);
    }
    let stripped = t.trim_end_matches(|c: char| c.is_alphabetic() || c == '°' || c == ' ');
    if stripped != t && stripped.parse::<f64>().is_ok() {
        return Err(format!(
            "{cell:?} has its unit in the cell; write the number only (the unit is in the `unit` column)"
        ));
    }
    if !decimal_comma && t.contains(',') && t.replace(',', ".").parse::<f64>().is_ok() {
        return Err(format!(
            "{cell:?} has a decimal comma in a comma-separated file; write {:?}, or save the file separated by semicolons",
            t.replace(',', ".")
        ));
    }
    Err(format!(
        "{cell:?} is not a number; write a number such as 81.5, or leave the cell empty if it was not measured"
    ))
}

/// A results file read against its answer file: every row's key, measured
/// cell and verdict (`None`: not measured), in file order.
pub(crate) struct Parsed {
    want: BTreeMap<Key, Expected>,
    groups: Vec<String>,
    pub(crate) rows: Vec<(Key, String, Option<Verdict>)>,
    warnings: Vec<String>,
}

/// Marks `results` (the text of `results_file`) against the answer file.
pub fn grade(
    results: &str,
    results_file: &str,
    answers: &str,
    answers_file: &str,
) -> Result<Grades, GradeError> {
    let a = AnswerFile::read(answers, answers_file)?;
    let Parsed { want, groups, rows, warnings } = parse(results, results_file, &a, answers_file)?;
    let plots = class_plots(&a, &rows);
    let mut g = grades_of(want, groups, rows, warnings)?;
    g.plots = plots;
    g.kit_title = a.kit;
    g.kit_sha256 = a.kit_sha256;
    Ok(g)
}

/// Every sheet's curve from the answer file (one plot per sheet number and
/// entry side, the first group's curve standing for the groups that share
/// it), with each measured number of its quantity at its ray's setting.
fn class_plots(a: &AnswerFile, rows: &[(Key, String, Option<Verdict>)]) -> Vec<crate::layout::ClassPlotData> {
    let mut plots: Vec<(u64, String, crate::layout::ClassPlotData)> = Vec::new();
    let mut settings: BTreeMap<(String, u64, String), f64> = BTreeMap::new();
    let mut side: BTreeMap<(String, u64), String> = BTreeMap::new();
    for s in &a.sheets {
        side.insert((s.group.clone(), s.sheet), s.enter.clone());
        let Some(c) = &s.class_curve else { continue };
        for r in s.rays.iter().flatten() {
            if let (Some(letter), Some(x)) =
                (r.get("ray").and_then(Value::as_str), r.get(&c.x).and_then(Value::as_f64))
            {
                settings.insert((s.group.clone(), s.sheet, letter.to_string()), x.abs());
            }
        }
        if plots.iter().any(|(n, e, _)| *n == s.sheet && *e == s.enter) {
            continue;
        }
        plots.push((
            s.sheet,
            s.enter.clone(),
            crate::layout::ClassPlotData {
                sheet: s.sheet,
                x: c.x.clone(),
                y: c.y.clone(),
                curve: c.points.clone(),
                paraxial: c.paraxial,
                points: Vec::new(),
            },
        ));
    }
    for (key, _, verdict) in rows {
        let Some(Verdict::Number { measured, within, .. }) = verdict else { continue };
        let Some(x) = settings.get(&(key.0.clone(), key.1, key.2.clone())) else { continue };
        let enter = side.get(&(key.0.clone(), key.1)).cloned().unwrap_or_default();
        if let Some((_, _, p)) = plots.iter_mut().find(|(n, e, p)| *n == key.1 && *e == enter && p.y == key.3)
        {
            p.points.push((*x, measured.abs(), *within));
        }
    }
    plots.into_iter().map(|(_, _, p)| p).collect()
}

/// Reads and checks a results file against its answer file (every row's
/// place in both), without marking.
pub(crate) fn parse(
    results: &str,
    results_file: &str,
    answers: &AnswerFile,
    answers_file: &str,
) -> Result<Parsed, GradeError> {
    let (want, groups) = expected(answers, answers_file)?;
    let results = results.strip_prefix('\u{feff}').unwrap_or(results);
    let sep = separator(results);
    let at = |line: u64, column: usize, message: String| GradeError {
        file: results_file.to_string(),
        line,
        column,
        message,
    };
    let mut reader = csv::ReaderBuilder::new()
        .delimiter(sep)
        .has_headers(true)
        .flexible(true)
        .from_reader(results.as_bytes());
    let headers = reader.headers().map_err(|e| at(1, 0, format!("cannot read the header row: {e}")))?.clone();
    let col = |name: &str| headers.iter().position(|h| h.trim().eq_ignore_ascii_case(name));
    let mut cols = BTreeMap::new();
    for name in ["group", "variant", "sheet", "ray", "quantity", "measured"] {
        match col(name) {
            Some(i) => {
                cols.insert(name, i);
            }
            None if name == "variant" => {}
            None => {
                return Err(at(
                    1,
                    0,
                    format!(
                        "the header row has no `{name}` column (found: {}); keep the header of the results.csv the build wrote: {}",
                        headers.iter().collect::<Vec<_>>().join(", "),
                        COLUMNS.join(", ")
                    ),
                ));
            }
        }
    }
    let groups_list = groups.iter().map(|g| format!("{g:?}")).collect::<Vec<_>>().join(", ");
    let mut seen: BTreeMap<Key, u64> = BTreeMap::new();
    let mut rows: Vec<(Key, String, Option<Verdict>)> = Vec::new();
    let mut warnings = Vec::new();
    for rec in reader.records() {
        let rec =
            rec.map_err(|e| at(e.position().map_or(0, |p| p.line()), 0, format!("not valid CSV: {e}")))?;
        let line = rec.position().map_or(0, |p| p.line());
        if rec.iter().all(|c| c.trim().is_empty()) {
            continue;
        }
        let cell = |name: &str| cols.get(name).and_then(|&i| rec.get(i)).unwrap_or("").trim().to_string();
        let column = |name: &str| cols.get(name).map_or(0, |i| i + 1);
        // A group name written with a leading ' (the CSV-injection guard) matches the name.
        let mut group = cell("group");
        if !groups.contains(&group)
            && let Some(g) = group.strip_prefix('\'')
            && groups.iter().any(|x| x == g)
        {
            group = g.to_string();
        }
        if !groups.contains(&group) {
            return Err(at(
                line,
                column("group"),
                format!(
                    "group {group:?} is not in the build's answer file; the groups there are {groups_list}"
                ),
            ));
        }
        let sheet: u64 = cell("sheet").parse().map_err(|_| {
            at(
                line,
                column("sheet"),
                format!(
                    "sheet {:?} is not a sheet number; write the number printed on the sheet, such as 3",
                    cell("sheet")
                ),
            )
        })?;
        let key: Key = (group.clone(), sheet, cell("ray"), cell("quantity"));
        let Some(exp) = want.get(&key) else {
            let asked: Vec<String> = want
                .keys()
                .filter(|(g, s, _, _)| *g == group && *s == sheet)
                .map(|(_, _, r, q)| format!("{r} {q}"))
                .collect();
            let why = if asked.is_empty() {
                format!("group {group:?} has no sheet {sheet} with answers to mark")
            } else {
                format!(
                    "ray {:?} with quantity {:?} is not an answer on this group's sheet {sheet}; it asks for: {}",
                    key.2,
                    key.3,
                    asked.join("; ")
                )
            };
            return Err(at(line, column("ray"), why));
        };
        if let Some(first) = seen.insert(key.clone(), line) {
            return Err(at(
                line,
                0,
                format!("this answer was given already on line {first}; give each answer once"),
            ));
        }
        let variant = cell("variant");
        if cols.contains_key("variant") && !variant.is_empty() && variant != exp.variant {
            warnings.push(format!(
                "{results_file}:{line}: variant {variant:?} differs from the build's {:?} for group {group:?}, sheet {sheet} (marked against the build's; a spreadsheet may have turned the code into a number)",
                exp.variant
            ));
        }
        let measured = cell("measured");
        let verdict = if measured.is_empty() {
            None
        } else {
            Some(match &exp.want {
                Want::Value { value, tolerance } => {
                    let m = match number(&measured, sep == b';') {
                        Ok(m) => m,
                        Err(_) if is_observation_word(&measured) => {
                            rows.push((key, measured.clone(), Some(Verdict::Word(false))));
                            continue;
                        }
                        Err(why) => return Err(at(line, column("measured"), why)),
                    };
                    // Angles from the normal are read as sizes on a protractor.
                    let (m, v) = if exp.unit == "deg" { (m.abs(), value.abs()) } else { (m, *value) };
                    Verdict::Number {
                        measured: m,
                        difference: m - v,
                        within: (m - v).abs() <= tolerance + 1e-9,
                    }
                }
                Want::Observation(word) => {
                    let same = measured.trim().eq_ignore_ascii_case(word)
                        || measured.trim().replace(' ', "-").eq_ignore_ascii_case(word);
                    if !same && !is_observation_word(&measured) && number(&measured, sep == b';').is_err() {
                        return Err(at(
                            line,
                            column("measured"),
                            format!(
                                "{measured:?} is not a word marking knows; write {word:?} or what the ray did instead ({})",
                                OBSERVATIONS.join(", ")
                            ),
                        ));
                    }
                    Verdict::Word(same)
                }
            })
        };
        rows.push((key, measured, verdict));
    }
    Ok(Parsed { want, groups, rows, warnings })
}

/// grades.csv and the overview from checked rows.
fn grades_of(
    want: BTreeMap<Key, Expected>,
    groups: Vec<String>,
    rows: Vec<(Key, String, Option<Verdict>)>,
    warnings: Vec<String>,
) -> Result<Grades, GradeError> {
    // grades.csv: the results columns as the build wrote them, then the marks.
    let mut csv = COLUMNS
        .iter()
        .chain(&["predicted", "tolerance", "difference", "verdict"])
        .copied()
        .collect::<Vec<_>>()
        .join(",");
    csv.push('\n');
    let mut tally: BTreeMap<String, (usize, usize)> = BTreeMap::new();
    for (key, measured, verdict) in &rows {
        let exp = &want[key];
        let (predicted, tolerance) = match &exp.want {
            Want::Value { value, tolerance } => (format!("{value:.3}"), format!("{tolerance:.3}")),
            Want::Observation(w) => (w.clone(), String::new()),
        };
        let (difference, word) = match verdict {
            None => (String::new(), "missing"),
            Some(Verdict::Number { difference, within, .. }) => {
                (format!("{difference:.3}"), if *within { "within" } else { "outside" })
            }
            Some(Verdict::Word(ok)) => (String::new(), if *ok { "within" } else { "outside" }),
        };
        let t = tally.entry(key.0.clone()).or_default();
        if verdict.is_some() {
            t.1 += 1;
        }
        if word == "within" {
            t.0 += 1;
        }
        let cells = [
            field(&key.0),
            field(&exp.variant),
            key.1.to_string(),
            field(&key.2),
            key.3.clone(),
            exp.unit.clone(),
            field(measured),
            predicted,
            tolerance,
            difference,
            word.to_string(),
        ];
        csv.push_str(&cells.join(","));
        csv.push('\n');
    }
    let groups = groups
        .into_iter()
        .map(|g| {
            let asked = want.keys().filter(|k| k.0 == g).count();
            let (within, measured) = tally.get(&g).copied().unwrap_or_default();
            (g, within, measured, asked)
        })
        .collect();
    Ok(Grades { csv, groups, warnings, plots: Vec::new(), kit_title: String::new(), kit_sha256: None })
}

/// How one measured answer compares.
#[derive(Clone, Copy, Debug)]
pub(crate) enum Verdict {
    /// A number: as compared (a size for angles), its difference from the
    /// prediction, and whether that is within the tolerance.
    Number { measured: f64, difference: f64, within: bool },
    /// A word: whether it is the expected one.
    Word(bool),
}

/// The words a student may write instead of a number (the answer file's
/// outcome and face words).
const OBSERVATIONS: &[&str] = &[
    "total-internal-reflection",
    "misses",
    "trapped",
    "leaves-through-edge",
    "refracts",
    "turns",
    "base",
    "first-side",
    "second-side",
    "entry",
    "exit",
];

fn is_observation_word(s: &str) -> bool {
    let s = s.trim().replace(' ', "-");
    OBSERVATIONS.iter().any(|w| w.eq_ignore_ascii_case(&s))
}
