//! Everything a run needs, resolved before any work: the command, the kit, the
//! paper, the formats, the seed, the groups and the sheet text. Value in, value
//! out: `main.rs` reads the files [`wanted`] names and passes their contents in.

use std::collections::BTreeMap;
use std::path::PathBuf;

use super::Failure;
use super::cli::{ClassArgs, Command, OutArgs, PaperArgs};
use crate::demo;
use crate::kit::{Groups, Kit};
use crate::layout::{TEMPLATE_FILES, Templates};
use crate::output::Formats;
use crate::paper::{Orientation, PaperSize, PaperSpec};
use crate::plan::{self, Group};
use crate::sheets::Lesson;

/// Seed of a class set when neither the kit nor the command line gives one.
pub const DEFAULT_SEED: u64 = 1;

/// Where `demo` writes when no `--out` is given.
pub const DEMO_DIR: &str = "raysheet-demo";

/// A file as `main.rs` read it: its contents, or the words of the error that
/// stopped the reading.
#[derive(Clone, Debug, PartialEq)]
pub struct Source<T> {
    /// The path as given on the command line (shown in messages).
    pub path: PathBuf,
    /// The contents, or why they could not be read.
    pub content: Result<T, String>,
}

/// The files a command needs read, worked out from the flags alone.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Wanted {
    /// The kit file.
    pub kit: Option<PathBuf>,
    /// The `--roster` CSV.
    pub roster: Option<PathBuf>,
    /// Template files that may sit in `--templates DIR`, by file name: read
    /// those that exist.
    pub templates: Vec<(String, PathBuf)>,
    /// `grade`: the results file and the answer file.
    pub marking: Option<(PathBuf, PathBuf)>,
}

/// A file's bytes as read.
pub type Bytes = Source<Vec<u8>>;

/// What `main.rs` read for the command, as [`Wanted`] asked.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Inputs {
    /// The kit file's bytes.
    pub kit: Option<Source<Vec<u8>>>,
    /// The roster's bytes.
    pub roster: Option<Source<Vec<u8>>>,
    /// The template files that exist, by file name, as text.
    pub templates: Vec<(String, Source<String>)>,
    /// `grade`: the results file's and the answer file's bytes.
    pub marking: Option<(Bytes, Bytes)>,
}

/// The files `command` needs read.
pub fn wanted(command: &Command) -> Wanted {
    let templates = |out: &OutArgs| -> Vec<(String, PathBuf)> {
        let Some(dir) = &out.templates else { return Vec::new() };
        TEMPLATE_FILES.iter().map(|name| (name.to_string(), dir.join(name))).collect()
    };
    match command {
        Command::Check { kit, .. } => Wanted { kit: Some(kit.clone()), ..Wanted::default() },
        Command::Solve { kit, class, .. } => {
            Wanted { kit: Some(kit.clone()), roster: class.roster.clone(), ..Wanted::default() }
        }
        Command::Build { kit, out, class, .. } => Wanted {
            kit: Some(kit.clone()),
            roster: class.roster.clone(),
            templates: templates(out),
            marking: None,
        },
        Command::Demo { print_kit: true, .. }
        | Command::Templates { .. }
        | Command::Calibrate { .. }
        | Command::Materials
        | Command::Schema { .. }
        | Command::Kinds
        | Command::Completions { .. }
        | Command::Manual => Wanted::default(),
        Command::Fit { kit, results, answers, .. } => {
            let answers = answers
                .clone()
                .unwrap_or_else(|| results.parent().unwrap_or(std::path::Path::new("")).join("answers.json"));
            Wanted { kit: Some(kit.clone()), marking: Some((results.clone(), answers)), ..Wanted::default() }
        }
        Command::Grade { results, answers, kit, .. } => {
            let answers = answers
                .clone()
                .unwrap_or_else(|| results.parent().unwrap_or(std::path::Path::new("")).join("answers.json"));
            Wanted { kit: kit.clone(), marking: Some((results.clone(), answers)), ..Wanted::default() }
        }
        Command::Demo { out, class, .. } => {
            Wanted { kit: None, roster: class.roster.clone(), templates: templates(out), marking: None }
        }
    }
}

/// A results or answer file's text: UTF-8 or UTF-16 with a byte-order mark,
/// decoded as rosters are (spreadsheets save both).
fn marking_text(s: Bytes) -> Result<(String, String), Failure> {
    let name = s.path.display().to_string();
    let bytes = s.content.map_err(|e| Failure::Input(format!("{name}: cannot read: {e}")))?;
    let (text, _) = crate::plan::decode_roster(&bytes, &name)
        .map_err(|e| Failure::Input(e.to_string().replace("field `name`: ", "")))?;
    Ok((name, text))
}

/// A class set's groups and seed.
#[derive(Clone, Debug, PartialEq)]
pub struct ClassSetup {
    /// The groups in order, with their folder names.
    pub groups: Vec<Group>,
    /// The seed of the per-group variants.
    pub seed: u64,
}

/// A `build` (or `demo`) resolved.
#[derive(Clone, Debug)]
pub struct BuildJob {
    /// The kit.
    pub kit: Lesson,
    /// The folder to write into.
    pub dir: PathBuf,
    /// Overwrite files there that raysheet did not write.
    pub force: bool,
    /// PDF, SVG or both.
    pub formats: Formats,
    /// The kit's paper with the flags applied.
    pub paper: PaperSpec,
    /// The sheet text.
    pub templates: Templates,
    /// The class set, when the kit or `--roster` asks for one.
    pub class: Option<ClassSetup>,
    /// The seed given with `--seed`.
    pub seed_flag: Option<u64>,
}

/// A command with everything it needs resolved.
#[derive(Clone, Debug)]
pub enum Job {
    /// Print the check report.
    Check {
        /// The kit.
        kit: Lesson,
        /// The paper.
        paper: PaperSpec,
        /// The kit's own class set, if it has one.
        class: Option<ClassSetup>,
    },
    /// Print the answers, as a table or as the answer file.
    Solve {
        /// The kit.
        kit: Lesson,
        /// The paper.
        paper: PaperSpec,
        /// The class set, if any.
        class: Option<ClassSetup>,
        /// The seed given with `--seed`.
        seed_flag: Option<u64>,
        /// The answer file (JSON) instead of the table.
        json: bool,
    },
    /// Build sheets, keys and answers into a folder.
    Build(Box<BuildJob>),
    /// Write the printer-check page.
    Calibrate {
        /// The folder.
        dir: PathBuf,
        /// Overwrite files there that raysheet did not write.
        force: bool,
        /// The paper.
        paper: PaperSpec,
    },
    /// Fit each material's index to a results file.
    Fit {
        /// The kit the build was made from.
        kit: Lesson,
        /// The paper (the build's, for its safe bands).
        paper: PaperSpec,
        /// The results file's text.
        results: String,
        /// Its name, for messages.
        results_file: String,
        /// The answer file's text.
        answers: String,
        /// Its name, for messages.
        answers_file: String,
        /// JSON instead of text.
        json: bool,
    },
    /// Mark a results file against an answer file.
    Grade {
        /// The results file's text.
        results: String,
        /// Its name, for messages.
        results_file: String,
        /// The answer file's text.
        answers: String,
        /// Its name, for messages.
        answers_file: String,
        /// `--kit`: its name and the SHA-256 of its bytes.
        kit: Option<(String, String)>,
        /// The folder to write grades.csv into.
        dir: PathBuf,
        /// Overwrite files there that raysheet did not write.
        force: bool,
    },
    /// Write the shipped sheet text into a folder.
    WriteTemplates {
        /// The folder.
        dir: PathBuf,
        /// Overwrite files there that raysheet did not write.
        force: bool,
    },
    /// Print the demo kit's TOML.
    PrintDemoKit,
    /// Print the built-in materials.
    ListMaterials,
    /// Print the kit file's JSON Schema, or write it into `dir`.
    Schema {
        /// The folder to write kit.schema.json into; `None`: print it.
        dir: Option<PathBuf>,
        /// Overwrite a kit.schema.json there that raysheet did not write.
        force: bool,
    },
    /// Print the sheet kinds.
    ListKinds,
    /// Print shell completions.
    Completions(clap_complete::Shell),
    /// Print the manual page.
    Manual,
}

impl Job {
    /// Resolves `command` with the files `main.rs` read for it. Problems are
    /// reported in the order a user meets them: the kit, `--out`, `--format`,
    /// the paper flags, the templates, the roster.
    pub fn resolve(command: Command, inputs: Inputs) -> Result<Job, Failure> {
        match command {
            Command::Calibrate { out, force, paper } => {
                let paper = resolve_paper(&crate::paper::PaperSpec::default(), &paper)?;
                Ok(Job::Calibrate { dir: out, force, paper })
            }
            Command::Check { paper, .. } => {
                let mut kit = kit_from(inputs.kit.as_ref())?;
                apply_rulers(&mut kit, &paper)?;
                let paper = resolve_paper(&kit.paper, &paper)?;
                let class = class_setup(&kit, None, None)?;
                Ok(Job::Check { kit, paper, class })
            }
            Command::Solve { json, paper, class, .. } => {
                let kit = kit_from(inputs.kit.as_ref())?;
                let paper = resolve_paper(&kit.paper, &paper)?;
                let setup = class_setup(&kit, roster_for(&class, &inputs)?, class.seed)?;
                Ok(Job::Solve { kit, paper, class: setup, seed_flag: class.seed, json })
            }
            Command::Build { out, paper, class, .. } => {
                let mut kit = kit_from(inputs.kit.as_ref())?;
                apply_rulers(&mut kit, &paper)?;
                let dir = out.out.clone().ok_or_else(|| {
                    Failure::Input("build needs --out DIR: the folder to write the sheets into".into())
                })?;
                build_job(kit, dir, &out, &paper, &class, &inputs)
            }
            Command::Templates { out, force } => Ok(Job::WriteTemplates { dir: out, force }),
            Command::Fit { json, paper, .. } => {
                let kit = kit_from(inputs.kit.as_ref())?;
                let paper = resolve_paper(&kit.paper, &paper)?;
                let Some((results, answers)) = inputs.marking else {
                    return Err(Failure::Other("fit: the results and answer files were not read".into()));
                };
                let (results_file, results) = marking_text(results)?;
                let (answers_file, answers) = marking_text(answers)?;
                Ok(Job::Fit { kit, paper, results, results_file, answers, answers_file, json })
            }
            Command::Grade { out, force, .. } => {
                let Some((results, answers)) = inputs.marking else {
                    return Err(Failure::Other("grade: the results and answer files were not read".into()));
                };
                let (results_file, results) = marking_text(results)?;
                let (answers_file, answers) = marking_text(answers)?;
                // The kit given with --kit, as its file name and the SHA-256 of its bytes.
                let kit = match inputs.kit {
                    None => None,
                    Some(k) => {
                        let name = k.path.display().to_string();
                        let bytes =
                            k.content.map_err(|e| Failure::Input(format!("{name}: cannot read: {e}")))?;
                        Some((name, crate::kit::sha256_hex(&bytes)))
                    }
                };
                Ok(Job::Grade { results, results_file, answers, answers_file, kit, dir: out, force })
            }
            Command::Demo { print_kit: true, .. } => Ok(Job::PrintDemoKit),
            Command::Materials => Ok(Job::ListMaterials),
            Command::Schema { out, force } => Ok(Job::Schema { dir: out, force }),
            Command::Kinds => Ok(Job::ListKinds),
            Command::Completions { shell } => Ok(Job::Completions(shell)),
            Command::Manual => Ok(Job::Manual),
            Command::Demo { out, class, .. } => {
                let kit = Lesson::from_toml(demo::DEMO_KIT, demo::DEMO_NAME)
                    .map_err(|e| Failure::Other(format!("the embedded demo kit is invalid: {e}")))?;
                let dir = out.out.clone().unwrap_or_else(|| PathBuf::from(DEMO_DIR));
                build_job(kit, dir, &out, &PaperArgs::default(), &class, &inputs)
            }
        }
    }

    /// Notes for the user before the work starts (such as a flag that has no effect).
    pub fn notes(&self) -> Vec<String> {
        match self {
            Job::Build(b) if b.class.is_none() && b.seed_flag.is_some() => {
                vec!["--seed only matters for class sets ([class] in the kit, or --roster)".into()]
            }
            _ => Vec::new(),
        }
    }
}

fn build_job(
    kit: Lesson,
    dir: PathBuf,
    out: &OutArgs,
    paper: &PaperArgs,
    class: &ClassArgs,
    inputs: &Inputs,
) -> Result<Job, Failure> {
    let formats = parse_formats(&out.format)?;
    let paper = resolve_paper(&kit.paper, paper)?;
    let templates = templates(out, &inputs.templates)?;
    let setup = class_setup(&kit, roster_for(class, inputs)?, class.seed)?;
    Ok(Job::Build(Box::new(BuildJob {
        kit,
        dir,
        force: out.force,
        formats,
        paper,
        templates,
        class: setup,
        seed_flag: class.seed,
    })))
}

/// A source `main.rs` was asked for but did not pass: a defect, not a user error.
fn not_read(what: &str) -> Failure {
    Failure::Other(format!("internal: the {what} was not read before the job was resolved"))
}

/// The kit from its file's bytes: readable, UTF-8, valid.
pub fn kit_from(source: Option<&Source<Vec<u8>>>) -> Result<Lesson, Failure> {
    let source = source.ok_or_else(|| not_read("kit file"))?;
    let name = source.path.display().to_string();
    let bytes = source
        .content
        .as_ref()
        .map_err(|e| Failure::Input(format!("{name}: cannot read the kit file: {e}")))?;
    let text = std::str::from_utf8(bytes).map_err(|e| {
        Failure::Input(format!(
            "{name}: the kit file is not UTF-8 text (bad byte at offset {}); save it as UTF-8",
            e.valid_up_to()
        ))
    })?;
    Lesson::from_toml(text, &name).map_err(|e| Failure::Input(e.to_string()))
}

/// The roster's source when `--roster` was given.
fn roster_for<'a>(class: &ClassArgs, inputs: &'a Inputs) -> Result<Option<&'a Source<Vec<u8>>>, Failure> {
    match (&class.roster, &inputs.roster) {
        (None, _) => Ok(None),
        (Some(_), Some(source)) => Ok(Some(source)),
        (Some(_), None) => Err(not_read("roster")),
    }
}

/// The group names of a class set: the roster first, then the kit's `[class]`
/// table; `None` when neither asks for groups.
pub fn resolve_groups(kit: &Kit, roster: Option<&Source<Vec<u8>>>) -> Result<Option<Vec<String>>, Failure> {
    if let Some(source) = roster {
        let name = source.path.display().to_string();
        let bytes = source
            .content
            .as_ref()
            .map_err(|e| Failure::Input(format!("{name}: cannot read the roster: {e}")))?;
        return plan::read_roster(bytes, &name).map(Some).map_err(|e| Failure::Input(e.to_string()));
    }
    Ok(match &kit.class.groups {
        Groups::None => None,
        Groups::Count(n) => Some((1..=*n).map(|i| format!("Group {i}")).collect()),
        Groups::Names(names) => Some(names.clone()),
    })
}

/// The class set's groups (with folder names) and seed: `--seed`, else the
/// kit's, else [`DEFAULT_SEED`].
pub fn class_setup(
    kit: &Kit,
    roster: Option<&Source<Vec<u8>>>,
    seed_flag: Option<u64>,
) -> Result<Option<ClassSetup>, Failure> {
    let Some(names) = resolve_groups(kit, roster)? else { return Ok(None) };
    let seed = seed_flag.or(kit.class.seed).unwrap_or(DEFAULT_SEED);
    let folders = plan::folder_names(&names);
    let groups = names.into_iter().zip(folders).map(|(name, folder)| Group { name, folder }).collect();
    Ok(Some(ClassSetup { groups, seed }))
}

/// The sheet text: shipped, with any files found in `--templates DIR` instead.
/// `found` holds the template files that exist there, by file name.
pub fn templates(out: &OutArgs, found: &[(String, Source<String>)]) -> Result<Templates, Failure> {
    let Some(dir) = &out.templates else {
        return Templates::shipped().map_err(Failure::Other);
    };
    let mut overrides = BTreeMap::new();
    for name in TEMPLATE_FILES {
        let Some((_, source)) = found.iter().find(|(n, _)| n == name) else { continue };
        let shown = source.path.display().to_string();
        let text = source
            .content
            .clone()
            .map_err(|e| Failure::Input(format!("{shown}: cannot read the template: {e}")))?;
        overrides.insert(name.to_string(), (shown, text));
    }
    if overrides.is_empty() {
        return Err(Failure::Input(format!(
            "{}: holds none of the template files ({}); `raysheet templates --out {}` writes them for editing",
            dir.display(),
            TEMPLATE_FILES.join(", "),
            dir.display()
        )));
    }
    Templates::with_overrides(&overrides).map_err(Failure::Input)
}

/// Parses `--format`.
pub fn parse_formats(s: &str) -> Result<Formats, Failure> {
    let mut f = Formats::default();
    for part in s.split(',').map(str::trim).filter(|p| !p.is_empty()) {
        match part.to_ascii_lowercase().as_str() {
            "pdf" => f.pdf = true,
            "svg" => f.svg = true,
            other => {
                return Err(Failure::Input(format!(
                    "--format: \"{other}\" is not a format; give pdf, svg or pdf,svg"
                )));
            }
        }
    }
    if !f.pdf && !f.svg {
        return Err(Failure::Input("--format: give at least one of pdf, svg".into()));
    }
    Ok(f)
}

/// Applies `--paper`, `--orientation` and `--margin` on top of the kit's paper.
/// `--rulers LONG,SHORT` in place of the kit's `[printer]`, checked as the kit's is.
fn apply_rulers(lesson: &mut Lesson, args: &PaperArgs) -> Result<(), Failure> {
    let Some(r) = &args.rulers else { return Ok(()) };
    let parsed: Option<(f64, f64)> =
        r.split_once(',').and_then(|(a, b)| Some((a.trim().parse().ok()?, b.trim().parse().ok()?)));
    let (long, short) = parsed.ok_or_else(|| {
        Failure::Input(format!(
            "--rulers: \"{r}\" is not two lengths; give the long and the short ruler as measured, in mm, such as 178.6,119.3"
        ))
    })?;
    for (v, nominal, which) in
        [(long, crate::paper::LONG_RULER_MM, "long"), (short, crate::paper::SHORT_RULER_MM, "short")]
    {
        if !(v.is_finite() && (0.9 * nominal..=1.1 * nominal).contains(&v)) {
            return Err(Failure::Input(format!(
                "--rulers: the {which} ruler ({nominal} mm) cannot have printed {v} mm; give {:.0} to {:.0} mm (more than a few per cent is a \"fit to page\" setting: print at 100 %)",
                0.9 * nominal,
                1.1 * nominal
            )));
        }
    }
    lesson.kit.printer = Some(crate::paper::PrinterCorrection { long_ruler_mm: long, short_ruler_mm: short });
    Ok(())
}

pub fn resolve_paper(kit_paper: &PaperSpec, args: &PaperArgs) -> Result<PaperSpec, Failure> {
    let mut spec = kit_paper.clone();
    if let Some(p) = &args.paper {
        spec.size = match PaperSize::named(p) {
            Some(s) => s,
            None => {
                let dims: Option<(f64, f64)> = p
                    .to_ascii_lowercase()
                    .split_once('x')
                    .and_then(|(w, h)| Some((w.trim().parse().ok()?, h.trim().parse().ok()?)));
                match dims {
                    Some((w, h))
                        if w.is_finite() && h.is_finite() && w > 0.0 && h > 0.0 && w.max(h) <= 2000.0 =>
                    {
                        PaperSize::custom(w, h)
                    }
                    _ => {
                        return Err(Failure::Input(format!(
                            "--paper: \"{p}\" is not a paper size; give one of {} or WIDTHxHEIGHT in mm, such as 250x350",
                            PaperSize::names()
                        )));
                    }
                }
            }
        };
    }
    if let Some(o) = &args.orientation {
        spec.orientation = Orientation::parse(o).ok_or_else(|| {
            Failure::Input(format!(
                "--orientation: \"{o}\" is not an orientation; give portrait, landscape or auto"
            ))
        })?;
    }
    if let Some(m) = args.margin {
        spec.margin_mm = m;
    }
    spec.check().map_err(|e| Failure::Input(format!("--paper/--margin: {e}")))?;
    Ok(spec)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::app::cli::Cli;
    use clap::Parser;

    fn command(args: &[&str]) -> Command {
        Cli::try_parse_from(std::iter::once("raysheet").chain(args.iter().copied())).unwrap().command
    }

    fn source<T>(path: &str, content: Result<T, String>) -> Option<Source<T>> {
        Some(Source { path: PathBuf::from(path), content })
    }

    const CLASS_KIT: &str = r#"
        title = "Lab C"
        [materials.acrylic]
        index = 1.49
        [[pieces]]
        id = "hd30"
        material = "acrylic"
        front = "flat"
        back = { curve = "convex", radius_mm = 30 }
        thickness_mm = 30
        height_mm = 60
        [[sheets]]
        kind = "curved-face"
        piece = "hd30"
        [class]
        groups = 3
        seed = 44
    "#;

    fn kit_input(text: &str) -> Inputs {
        Inputs { kit: source("lab.toml", Ok(text.as_bytes().to_vec())), ..Inputs::default() }
    }

    fn input_error(r: Result<Job, Failure>) -> String {
        match r {
            Err(Failure::Input(msg)) => msg,
            Err(Failure::Other(msg)) => panic!("expected a usage error, got another failure: {msg}"),
            Ok(job) => panic!("expected a usage error, got {job:?}"),
        }
    }

    #[test]
    fn wanted_names_the_kit_roster_and_template_files() {
        let w = wanted(&command(&["build", "k.toml", "--out", "o", "--roster", "r.csv", "--templates", "t"]));
        assert_eq!(w.kit, Some(PathBuf::from("k.toml")));
        assert_eq!(w.roster, Some(PathBuf::from("r.csv")));
        let names: Vec<&str> = w.templates.iter().map(|(n, _)| n.as_str()).collect();
        assert_eq!(names, TEMPLATE_FILES);
        assert!(w.templates.iter().all(|(n, p)| *p == PathBuf::from("t").join(n)));
        assert_eq!(wanted(&command(&["demo", "--print-kit"])), Wanted::default());
        assert_eq!(wanted(&command(&["templates", "--out", "t"])), Wanted::default());
        assert_eq!(wanted(&command(&["check", "k.toml"])).roster, None);
    }

    #[test]
    fn groups_come_from_the_roster_first_then_the_kit() {
        let kit = Lesson::from_toml(CLASS_KIT, "lab.toml").unwrap();
        let roster = source("r.csv", Ok(b"name\nBench A\nBench B\n".to_vec()));
        assert_eq!(resolve_groups(&kit, roster.as_ref()).unwrap().unwrap(), ["Bench A", "Bench B"]);
        assert_eq!(resolve_groups(&kit, None).unwrap().unwrap(), ["Group 1", "Group 2", "Group 3"]);
        let plain = Lesson::from_toml(demo::DEMO_KIT, demo::DEMO_NAME).unwrap();
        assert_eq!(resolve_groups(&plain, None).unwrap(), None);
        let unreadable = source("r.csv", Err("permission denied".into()));
        let e = resolve_groups(&kit, unreadable.as_ref()).unwrap_err();
        assert_eq!(e, Failure::Input("r.csv: cannot read the roster: permission denied".into()));
        let latin1 = source("r.csv", Ok(b"name\nB\xe4nk\n".to_vec()));
        let e = resolve_groups(&kit, latin1.as_ref()).unwrap_err().to_string();
        assert!(
            e.starts_with("r.csv:2: field `name`: ") && e.contains("not UTF-8") && e.contains("offset 6"),
            "{e}"
        );
        let utf16: Vec<u8> =
            [0xFEFF].into_iter().chain("name\nBench Ä\n".encode_utf16()).flat_map(u16::to_le_bytes).collect();
        let utf16 = source("r.txt", Ok(utf16));
        assert_eq!(resolve_groups(&kit, utf16.as_ref()).unwrap().unwrap(), ["Bench Ä"]);
    }

    #[test]
    fn the_seed_is_the_flag_else_the_kits_else_one() {
        let kit = Lesson::from_toml(CLASS_KIT, "lab.toml").unwrap();
        let setup = class_setup(&kit, None, Some(9)).unwrap().unwrap();
        assert_eq!(setup.seed, 9);
        assert_eq!(setup.groups[2], Group { name: "Group 3".into(), folder: "03-group-3".into() });
        assert_eq!(class_setup(&kit, None, None).unwrap().unwrap().seed, 44);
        let unseeded = Lesson::from_toml(&CLASS_KIT.replace("seed = 44", ""), "lab.toml").unwrap();
        assert_eq!(class_setup(&unseeded, None, None).unwrap().unwrap().seed, DEFAULT_SEED);
    }

    #[test]
    fn a_seed_without_a_class_set_earns_a_note() {
        let demo_kit = demo::DEMO_KIT.as_bytes().to_vec();
        let inputs = Inputs { kit: source("d.toml", Ok(demo_kit)), ..Inputs::default() };
        let job = Job::resolve(command(&["build", "d.toml", "--out", "o", "--seed", "3"]), inputs).unwrap();
        assert_eq!(job.notes(), ["--seed only matters for class sets ([class] in the kit, or --roster)"]);
        let job =
            Job::resolve(command(&["build", "lab.toml", "--out", "o", "--seed", "3"]), kit_input(CLASS_KIT))
                .unwrap();
        assert!(job.notes().is_empty());
        let Job::Build(b) = job else { panic!("a build") };
        assert_eq!(b.class.map(|c| c.seed), Some(3));
    }

    #[test]
    fn build_resolves_formats_paper_and_folder() {
        let cmd = command(&["build", "lab.toml", "--out", "o", "--format", "svg", "--paper", "letter"]);
        let Job::Build(b) = Job::resolve(cmd, kit_input(CLASS_KIT)).unwrap() else { panic!("a build") };
        assert_eq!(b.formats, Formats { pdf: false, svg: true });
        assert_eq!(b.paper.size.name, "Letter");
        assert_eq!(b.dir, PathBuf::from("o"));
        let Job::Build(d) = Job::resolve(command(&["demo"]), Inputs::default()).unwrap() else {
            panic!("a build")
        };
        assert_eq!(d.dir, PathBuf::from(DEMO_DIR));
        assert!(matches!(
            Job::resolve(command(&["demo", "--print-kit"]), Inputs::default()),
            Ok(Job::PrintDemoKit)
        ));
    }

    #[test]
    fn problems_come_in_the_order_a_user_meets_them() {
        // No --out is reported before a bad --format; a bad --format before a
        // roster that cannot be read.
        let e = input_error(Job::resolve(
            command(&["build", "lab.toml", "--format", "png"]),
            kit_input(CLASS_KIT),
        ));
        assert_eq!(e, "build needs --out DIR: the folder to write the sheets into");
        let mut inputs = kit_input(CLASS_KIT);
        inputs.roster = source("r.csv", Err("not found".into()));
        let cmd = command(&["build", "lab.toml", "--out", "o", "--format", "png", "--roster", "r.csv"]);
        let e = input_error(Job::resolve(cmd, inputs.clone()));
        assert!(e.starts_with("--format: \"png\""), "{e}");
        let cmd = command(&["build", "lab.toml", "--out", "o", "--roster", "r.csv"]);
        assert_eq!(input_error(Job::resolve(cmd, inputs)), "r.csv: cannot read the roster: not found");
        // The kit comes first of all.
        let bad = Inputs { kit: source("k.toml", Ok(vec![b'a', 0xff])), ..Inputs::default() };
        let e = input_error(Job::resolve(command(&["build", "k.toml"]), bad));
        assert_eq!(e, "k.toml: the kit file is not UTF-8 text (bad byte at offset 1); save it as UTF-8");
    }

    #[test]
    fn template_overrides_are_read_or_refused() {
        let out = |dir: Option<&str>| OutArgs {
            out: None,
            format: "pdf".into(),
            force: false,
            templates: dir.map(PathBuf::from),
        };
        assert!(templates(&out(None), &[]).is_ok());
        let e = templates(&out(Some("mine")), &[]).unwrap_err().to_string();
        assert!(e.starts_with("mine: holds none of the template files (curved-face.toml"), "{e}");
        let unreadable = [(
            "common.toml".to_string(),
            Source { path: "mine/common.toml".into(), content: Err("denied".into()) },
        )];
        let e = templates(&out(Some("mine")), &unreadable).unwrap_err();
        assert_eq!(e, Failure::Input("mine/common.toml: cannot read the template: denied".into()));
        let broken = [(
            "common.toml".to_string(),
            Source { path: "mine/common.toml".into(), content: Ok("safety = \n".into()) },
        )];
        let e = templates(&out(Some("mine")), &broken).unwrap_err().to_string();
        assert!(e.contains("mine/common.toml"), "{e}");
    }

    #[test]
    fn formats_parse() {
        assert_eq!(parse_formats("pdf").unwrap(), Formats { pdf: true, svg: false });
        assert_eq!(parse_formats("svg, pdf").unwrap(), Formats { pdf: true, svg: true });
        assert!(parse_formats("png").is_err());
        assert!(parse_formats("").is_err());
    }

    #[test]
    fn paper_flags_override_the_kit() {
        let base = PaperSpec::default();
        let args = PaperArgs {
            paper: Some("letter".into()),
            orientation: Some("portrait".into()),
            margin: Some(12.0),
            rulers: None,
        };
        let p = resolve_paper(&base, &args).unwrap();
        assert_eq!(p.size.name, "Letter");
        assert_eq!(p.orientation, Orientation::Portrait);
        let custom =
            resolve_paper(&base, &PaperArgs { paper: Some("350x250".into()), ..Default::default() }).unwrap();
        assert_eq!((custom.size.width_mm, custom.size.height_mm), (250.0, 350.0));
        assert!(resolve_paper(&base, &PaperArgs { paper: Some("B5".into()), ..Default::default() }).is_err());
        assert!(resolve_paper(&base, &PaperArgs { margin: Some(60.0), ..Default::default() }).is_err());
    }
}
