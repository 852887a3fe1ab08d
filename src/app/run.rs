//! Running a resolved [`Job`]: the plans, reports and built files as values.
//! `main.rs` prints the text and writes the files.

use std::path::PathBuf;

use clap::CommandFactory;

use super::Failure;
use super::job::{BuildJob, ClassSetup, Job};
use crate::demo;
use crate::layout::{TEMPLATE_FILES, shipped_template};
use crate::output::{BuildError, Output, answers, build_class_with, build_plans_with, preflight, report};
use crate::paper::PaperSpec;
use crate::render::RenderError;
use crate::sheets::{self, ClassPlan, Lesson, SheetPlan};

/// What a job hands back to `main.rs`.
#[derive(Clone, Debug, PartialEq)]
pub enum Outcome {
    /// Text for standard output.
    Print(String),
    /// Files to write into a folder.
    Write(Writing),
}

/// What was written, for the closing message.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Written {
    /// Sheets, keys and answers.
    Build,
    /// The shipped sheet text.
    Templates,
    /// The marks.
    Grades,
    /// The printer-check page.
    Calibration,
    /// The kit file's JSON Schema.
    Schema,
}

/// The file `raysheet schema --out DIR` writes, and the demo kit's
/// `#:schema` line names beside it.
pub const SCHEMA_FILE: &str = "kit.schema.json";

/// The kit file's JSON Schema as text (pretty, ending in a newline).
pub fn schema_text() -> String {
    let mut s = serde_json::to_string_pretty(&sheets::kit_schema()).expect("a JSON value always serializes");
    s.push('\n');
    s
}

/// Files to write into a folder, and what to say once they are written.
#[derive(Clone, Debug, PartialEq)]
pub struct Writing {
    /// The folder.
    pub dir: PathBuf,
    /// The files, with paths relative to `dir`.
    pub files: Vec<Output>,
    /// Overwrite files there that raysheet did not write.
    pub force: bool,
    /// Warnings for the teacher, shown once the files are written.
    pub warnings: Vec<String>,
    what: Written,
    /// Text printed before the list of files (the marks' overview).
    overview: String,
}

impl Writing {
    /// Which kind of set the files are, for the folder's list of files: a
    /// rebuild replaces the earlier files of its own kind only.
    pub fn set_name(&self) -> &'static str {
        match self.what {
            Written::Build => "build",
            Written::Templates => "templates",
            Written::Grades => "grades",
            Written::Calibration => "calibration",
            Written::Schema => "schema",
        }
    }

    /// The message after writing: the files written (`written`, as the writer
    /// reports them), SVGs counted rather than listed, and the printing advice.
    pub fn report(&self, written: &[PathBuf]) -> String {
        let dir = self.dir.display();
        let mut s = String::new();
        match self.what {
            Written::Build => {
                let is_svg = |p: &&PathBuf| p.to_string_lossy().contains("/svg/");
                s.push_str(&format!("Wrote {} files to {dir}:\n", written.len()));
                for w in written.iter().filter(|p| !is_svg(p)) {
                    s.push_str(&format!("  {}\n", w.display()));
                }
                let svgs = written.iter().filter(is_svg).count();
                if svgs > 0 {
                    s.push_str(&format!("  and {svgs} SVG files in svg/ folders\n"));
                }
                s.push_str("Print at actual size (100 %) and check both scale bars before the lesson.\n");
            }
            Written::Calibration => {
                s.push_str(&format!("Wrote {} file(s) to {dir}:\n", written.len()));
                for w in written {
                    s.push_str(&format!("  {}\n", w.display()));
                }
                s.push_str("Print it at actual size (100 %), measure both rulers, and give them as [printer] in the kit (or --rulers LONG,SHORT).\n");
            }
            Written::Grades => {
                s.push_str(&self.overview);
                s.push_str(&format!("Wrote {} file(s) to {dir}:\n", written.len()));
                for w in written {
                    s.push_str(&format!("  {}\n", w.display()));
                }
            }
            Written::Schema => {
                s.push_str(&format!("Wrote {} file(s) to {dir}:\n", written.len()));
                for w in written {
                    s.push_str(&format!("  {}\n", w.display()));
                }
                s.push_str("Put a kit beside it starting with the line `#:schema ./kit.schema.json` (the demo kit has it).\n");
            }
            Written::Templates => {
                s.push_str(&format!("Wrote {} template files to {dir}:\n", written.len()));
                for w in written {
                    s.push_str(&format!("  {}\n", w.display()));
                }
                s.push_str(&format!("Edit them, then build with --templates {dir}\n"));
            }
        }
        s
    }
}

/// Does the work of `job`.
pub fn run(job: Job) -> Result<Outcome, Failure> {
    match job {
        Job::Check { kit, paper, class } => Ok(Outcome::Print(check(&kit, &paper, class))),
        Job::Solve { kit, paper, class, seed_flag, json } => {
            Ok(Outcome::Print(solve(&kit, &paper, class, seed_flag, json)))
        }
        Job::Build(b) => build(*b).map(Outcome::Write),
        Job::WriteTemplates { dir, force } => Ok(Outcome::Write(Writing {
            dir,
            files: template_files(),
            force,
            warnings: Vec::new(),
            what: Written::Templates,
            overview: String::new(),
        })),
        Job::Calibrate { dir, force, paper } => {
            let words = crate::layout::Templates::shipped().map_err(Failure::Other)?.words;
            let scene = crate::layout::calibration_scene(&paper, &words);
            let pdf = crate::render::render_pdf(&scene).map_err(|e| Failure::Other(e.to_string()))?;
            let svg = crate::render::render_svg_page(&scene.pages[0], &scene.title)
                .map_err(|e| Failure::Other(e.to_string()))?;
            Ok(Outcome::Write(Writing {
                dir,
                files: vec![
                    Output { path: "calibration.pdf".into(), bytes: pdf },
                    Output { path: "calibration.svg".into(), bytes: svg.into_bytes() },
                ],
                force,
                warnings: Vec::new(),
                what: Written::Calibration,
                overview: String::new(),
            }))
        }
        Job::Fit { kit, paper, results, results_file, answers: answers_text, answers_file, json } => {
            let fits =
                crate::output::fit::fit(&kit, &paper, &results, &results_file, &answers_text, &answers_file)
                    .map_err(|e| Failure::Input(e.to_string()))?;
            Ok(Outcome::Print(if json {
                crate::output::fit::fit_json(&fits)
            } else {
                crate::output::fit::fit_text(&fits)
            }))
        }
        Job::Grade { results, results_file, answers: answers_text, answers_file, kit, dir, force } => {
            let mut g = crate::output::grade::grade(&results, &results_file, &answers_text, &answers_file)
                .map_err(|e| Failure::Input(e.to_string()))?;
            let (title, built) = (g.kit_title.clone(), g.kit_sha256.clone());
            if let (Some((name, now)), Some(built)) = (kit, built)
                && now != built
            {
                g.warnings.push(format!(
                    "{name}: the kit has changed since the build that wrote {answers_file}; the marks come from that build's answers, so they do not change (build again for new sheets)"
                ));
            }
            let mut overview =
                String::from("group: answers within tolerance / answers measured (answers asked)\n");
            for (group, within, measured, asked) in &g.groups {
                let name = if group.is_empty() { "(no group)" } else { group };
                overview.push_str(&format!("  {name}: {within} / {measured} ({asked})\n"));
            }
            let words = crate::layout::Templates::shipped().map_err(Failure::Other)?.words;
            let marks: Vec<crate::layout::GroupMarks> = g
                .groups
                .iter()
                .map(|(group, within, measured, asked)| crate::layout::GroupMarks {
                    group: group.clone(),
                    within: *within,
                    measured: *measured,
                    asked: *asked,
                })
                .collect();
            let scene = crate::layout::grades_scene(&title, &marks, &g.plots, &words);
            let pdf = crate::render::render_pdf(&scene).map_err(|e| Failure::Other(e.to_string()))?;
            Ok(Outcome::Write(Writing {
                dir,
                files: vec![
                    Output { path: "grades.csv".into(), bytes: g.csv.into_bytes() },
                    Output { path: "grades.pdf".into(), bytes: pdf },
                ],
                force,
                warnings: g.warnings,
                what: Written::Grades,
                overview,
            }))
        }
        Job::PrintDemoKit => Ok(Outcome::Print(demo::DEMO_KIT.to_string())),
        Job::ListMaterials => Ok(Outcome::Print(report::materials_report())),
        Job::Schema { dir: None, .. } => Ok(Outcome::Print(schema_text())),
        Job::Schema { dir: Some(dir), force } => Ok(Outcome::Write(Writing {
            dir,
            files: vec![Output { path: SCHEMA_FILE.into(), bytes: schema_text().into_bytes() }],
            force,
            warnings: Vec::new(),
            what: Written::Schema,
            overview: String::new(),
        })),
        Job::ListKinds => Ok(Outcome::Print(report::kinds_report())),
        Job::Completions(shell) => {
            let mut bytes = Vec::new();
            clap_complete::generate(shell, &mut super::cli::Cli::command(), "raysheet", &mut bytes);
            String::from_utf8(bytes)
                .map(Outcome::Print)
                .map_err(|e| Failure::Other(format!("the {shell} completions are not UTF-8: {e}")))
        }
        Job::Manual => {
            let mut bytes = Vec::new();
            clap_mangen::Man::new(super::cli::Cli::command())
                .render(&mut bytes)
                .map_err(|e| Failure::Other(format!("cannot make the manual page: {e}")))?;
            String::from_utf8(bytes)
                .map(Outcome::Print)
                .map_err(|e| Failure::Other(format!("the manual page is not UTF-8: {e}")))
        }
    }
}

fn class_plan(kit: &Lesson, paper: &PaperSpec, class: ClassSetup) -> ClassPlan {
    sheets::plan_class(kit, paper, class.groups, class.seed)
}

/// The `check` report, and the class set's notes when the kit has one.
/// Ends with a warning for whatever `build` would refuse on the same kit and paper.
fn check(kit: &Lesson, paper: &PaperSpec, class: Option<ClassSetup>) -> String {
    let plans = sheets::plan_lesson(kit, paper);
    let mut s = report::check_report(kit, &plans);
    let class = class.map(|c| class_plan(kit, paper, c));
    let refused = match &class {
        None => preflight(kit, plans.iter(), paper),
        Some(cp) => preflight(kit, cp.plans.iter().flatten(), paper),
    };
    if !plans.is_empty() && paper.check().is_ok() {
        s.push('\n');
        match &class {
            None => s.push_str(&report::paper_report(plans.iter(), paper)),
            Some(cp) => s.push_str(&report::paper_report(cp.plans.iter().flatten(), paper)),
        }
    }
    if let Some(pc) = kit.printer {
        let (long, short) = pc.factors();
        s.push_str(&format!(
            "\nPrinter correction: every page stretched ×{long:.4} along the long edge, ×{short:.4} along the short edge\n"
        ));
        if pc.largest() > 0.025 {
            s.push_str(&format!(
                "warning: a correction of {:.1} % is more like a \"fit to page\" print (94–97 %) than a printer's own error; print the calibration page at 100 % and measure again\n",
                100.0 * pc.largest()
            ));
        }
    }
    if let Err(e) = refused {
        s.push_str(&format!("\nwarning: `raysheet build` would refuse this kit: {e}\n"));
    }
    if let Some(cp) = class {
        s.push_str(&format!("\nClass set: {} groups, seed {}\n", cp.groups.len(), cp.seed));
        for n in &cp.notes {
            s.push_str(&format!("  note: {n}\n"));
        }
        if cp.notes.is_empty() {
            s.push_str("  every sheet has room for a different setting per group\n");
        }
    }
    s
}

/// The answers as the answer file (JSON) or as text tables.
fn solve(
    kit: &Lesson,
    paper: &PaperSpec,
    class: Option<ClassSetup>,
    seed_flag: Option<u64>,
    json: bool,
) -> String {
    let (plans, notes, seed) = match class.map(|c| class_plan(kit, paper, c)) {
        None => (sheets::plan_lesson(kit, paper), Vec::new(), seed_flag),
        Some(cp) => (cp.plans.into_iter().flatten().collect(), cp.notes, Some(cp.seed)),
    };
    if json {
        return answers::to_json_for(kit, seed, &plans);
    }
    let mut out = format!("{}\n", kit.title);
    for n in &notes {
        out.push_str(&format!("note: {n}\n"));
    }
    for p in &plans {
        out.push('\n');
        out.push_str(&report::sheet_table(p));
    }
    out
}

/// Every plan's warnings, each prefixed with its sheet number, and a word on
/// every sheet tiled over several pages on `paper`.
/// `all` are every plan of the build (every group's, for a class set).
fn sheet_warnings<'a>(
    plans: &[SheetPlan],
    all: impl Iterator<Item = &'a SheetPlan>,
    paper: &PaperSpec,
) -> Vec<String> {
    let mut w: Vec<String> = plans
        .iter()
        .flat_map(|p| p.warnings.iter().map(move |w| format!("sheet {}: {w}", p.number)))
        .collect();
    for (number, (pages, words)) in report::sheet_pages(all, paper) {
        if pages > 1 && words.starts_with("tiled") {
            w.push(format!("sheet {number}: {words}"));
        }
    }
    w
}

/// Plans and builds every file of a build; warnings once per sheet (a class
/// set's sheets share their warnings, so the first group's stand for all).
fn build(job: BuildJob) -> Result<Writing, Failure> {
    let BuildJob { kit, dir, force, formats, paper, templates, class, seed_flag } = job;
    // One memo of the page layout for the warnings, the checks and the build
    // (see `layout::memo_scope`): the plans live, unchanged, until it closes.
    let (files, warnings) = crate::layout::memo_scope(|| match class.map(|c| class_plan(&kit, &paper, c)) {
        None => {
            let plans = sheets::plan_lesson(&kit, &paper);
            let warnings = sheet_warnings(&plans, plans.iter(), &paper);
            (build_plans_with(&kit, &plans, &paper, formats, seed_flag, &templates), warnings)
        }
        Some(cp) => {
            let mut warnings = cp.notes.clone();
            if let Some(first) = cp.plans.first() {
                warnings.extend(sheet_warnings(first, cp.plans.iter().flatten(), &paper));
            }
            (build_class_with(&kit, &cp, &paper, formats, &templates), warnings)
        }
    });
    let files = files.map_err(|e| match e {
        // A number no check caught is raysheet's fault, not the kit's: exit 1.
        BuildError::Render(RenderError::NotFinite { .. }) => Failure::Other(e.to_string()),
        // `check` prints the same refusal as a warning beside the piece list; here, point to it.
        BuildError::Empty => Failure::Input(format!("{e} (`raysheet check KIT` lists them)")),
        _ => Failure::Input(e.to_string()),
    })?;
    Ok(Writing { dir, files, force, warnings, what: Written::Build, overview: String::new() })
}

/// The shipped sheet text, one file per template.
fn template_files() -> Vec<Output> {
    TEMPLATE_FILES
        .iter()
        .map(|n| Output {
            path: n.to_string(),
            bytes: shipped_template(n).unwrap_or_default().as_bytes().to_vec(),
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::app::cli::{Cli, Command};
    use crate::app::job::{Inputs, Source};
    use clap::Parser;

    fn resolve(args: &[&str], kit: Option<&str>) -> Job {
        let command: Command =
            Cli::try_parse_from(std::iter::once("raysheet").chain(args.iter().copied())).unwrap().command;
        let kit = kit.map(|t| Source { path: "k.toml".into(), content: Ok(t.as_bytes().to_vec()) });
        Job::resolve(command, Inputs { kit, ..Inputs::default() }).unwrap()
    }

    #[test]
    fn build_report_lists_files_and_counts_svgs() {
        let Ok(Outcome::Write(w)) = run(resolve(&["demo", "--out", "d", "--format", "pdf"], None)) else {
            panic!("a demo build writes files")
        };
        let paths: Vec<&str> = w.files.iter().map(|f| f.path.as_str()).collect();
        assert_eq!(paths, ["sheets.pdf", "keys.pdf", "answers.json", "results.csv"]);
        let written: Vec<PathBuf> =
            ["d/sheets.pdf", "d/svg/sheet-01.svg", "d/svg/key-01.svg"].iter().map(PathBuf::from).collect();
        assert_eq!(
            w.report(&written),
            "Wrote 3 files to d:\n  d/sheets.pdf\n  and 2 SVG files in svg/ folders\n\
             Print at actual size (100 %) and check both scale bars before the lesson.\n"
        );
    }

    #[test]
    fn templates_writes_every_shipped_file() {
        let Ok(Outcome::Write(w)) = run(resolve(&["templates", "--out", "t"], None)) else {
            panic!("templates writes files")
        };
        assert_eq!(w.files.len(), TEMPLATE_FILES.len());
        assert!(w.files.iter().all(|f| !f.bytes.is_empty()));
        let report = w.report(&[PathBuf::from("t/common.toml")]);
        assert!(report.ends_with("Edit them, then build with --templates t\n"), "{report}");
    }

    #[test]
    fn solve_prints_the_table_or_the_answer_file() {
        let Ok(Outcome::Print(table)) = run(resolve(&["solve", "k.toml"], Some(demo::DEMO_KIT))) else {
            panic!("solve prints")
        };
        let kit = Lesson::from_toml(demo::DEMO_KIT, "k.toml").unwrap();
        assert!(table.starts_with(&format!("{}\n\nSheet 1: ", kit.title)), "{table}");
        let Ok(Outcome::Print(json)) =
            run(resolve(&["solve", "k.toml", "--json", "--seed", "5"], Some(demo::DEMO_KIT)))
        else {
            panic!("solve prints")
        };
        let v: serde_json::Value = serde_json::from_str(&json).unwrap();
        assert_eq!(v["seed"], 5);
        assert_eq!(v["sheets"].as_array().unwrap().len(), kit.sheets.len());
    }
}
