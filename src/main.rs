//! The `raysheet` binary: reads arguments and files, writes outputs, maps
//! errors to exit codes (0 success, 2 bad input or usage, 1 anything else).
//! No logic lives here.

use std::path::{Path, PathBuf};
use std::process::ExitCode;

mod write;

use clap::Parser;
use raysheet::cli::{ClassArgs, Cli, Command, OutArgs, PaperArgs, UsageError, parse_formats, resolve_paper};
use raysheet::kit::{Groups, Kit};
use raysheet::layout::{TEMPLATE_FILES, Templates, shipped_template};
use raysheet::output::{answers, report};
use raysheet::{demo, plan};
use std::collections::BTreeMap;

/// What went wrong, and which exit code it earns.
enum Failure {
    /// Bad input or usage: exit 2.
    Input(String),
    /// Anything else (I/O while writing, an internal problem): exit 1.
    Other(String),
}

impl From<UsageError> for Failure {
    fn from(e: UsageError) -> Failure {
        Failure::Input(e.0)
    }
}

fn read_kit(path: &Path) -> Result<Kit, Failure> {
    let name = path.display().to_string();
    let bytes =
        std::fs::read(path).map_err(|e| Failure::Input(format!("{name}: cannot read the kit file: {e}")))?;
    let text = String::from_utf8(bytes).map_err(|e| {
        Failure::Input(format!(
            "{name}: the kit file is not UTF-8 text (bad byte at offset {}); save it as UTF-8",
            e.utf8_error().valid_up_to()
        ))
    })?;
    Kit::from_toml(&text, &name).map_err(|e| Failure::Input(e.to_string()))
}

fn demo_kit() -> Result<Kit, Failure> {
    Kit::from_toml(demo::DEMO_KIT, demo::DEMO_NAME)
        .map_err(|e| Failure::Other(format!("the embedded demo kit is invalid: {e}")))
}

fn solve(kit: &Kit, paper_args: &PaperArgs, class: &ClassArgs, json: bool) -> Result<(), Failure> {
    let paper = resolve_paper(&kit.paper, paper_args)?;
    let (plans, notes, seed) = match class_plan(kit, &paper, class)? {
        None => (plan::plan_kit(kit, &paper), Vec::new(), class.seed),
        Some(cp) => (cp.plans.iter().flatten().cloned().collect(), cp.notes.clone(), Some(cp.seed)),
    };
    if json {
        print!("{}", answers::to_json(&kit.title, seed, &plans));
    } else {
        let mut out = format!("{}\n", kit.title);
        for n in &notes {
            out.push_str(&format!("note: {n}\n"));
        }
        for p in &plans {
            out.push('\n');
            out.push_str(&report::sheet_table(p));
        }
        print!("{out}");
    }
    Ok(())
}

/// The class plan when the kit or the command line asks for groups.
fn class_plan(
    kit: &Kit,
    paper: &raysheet::paper::PaperSpec,
    class: &ClassArgs,
) -> Result<Option<plan::ClassPlan>, Failure> {
    let Some(names) = resolve_groups(kit, class)? else { return Ok(None) };
    let seed = class.seed.or(kit.class.seed).unwrap_or(DEFAULT_SEED);
    let folders = plan::folder_names(&names);
    let groups = names.into_iter().zip(folders).map(|(name, folder)| plan::Group { name, folder }).collect();
    Ok(Some(plan::plan_class(kit, paper, groups, seed)))
}

/// The sheet text: shipped, with any files found in `--templates DIR` instead.
fn templates(out: &OutArgs) -> Result<Templates, Failure> {
    let Some(dir) = &out.templates else {
        return Templates::shipped().map_err(Failure::Other);
    };
    let mut found = BTreeMap::new();
    for name in TEMPLATE_FILES {
        let path = dir.join(name);
        if path.exists() {
            let shown = path.display().to_string();
            let text = std::fs::read_to_string(&path)
                .map_err(|e| Failure::Input(format!("{shown}: cannot read the template: {e}")))?;
            found.insert(name.to_string(), (shown, text));
        }
    }
    if found.is_empty() {
        return Err(Failure::Input(format!(
            "{}: holds none of the template files ({}); `raysheet templates --out {}` writes them for editing",
            dir.display(),
            TEMPLATE_FILES.join(", "),
            dir.display()
        )));
    }
    Templates::with_overrides(&found).map_err(Failure::Input)
}

/// Every plan's warnings, each prefixed with its sheet number.
fn sheet_warnings(plans: &[plan::SheetPlan]) -> Vec<String> {
    plans.iter().flat_map(|p| p.warnings.iter().map(move |w| format!("sheet {}: {w}", p.number))).collect()
}

/// Default seed when neither the kit nor the command line gives one.
const DEFAULT_SEED: u64 = 1;

/// The groups of a class set: `--roster` first, then the kit's [class] table.
fn resolve_groups(kit: &Kit, class: &ClassArgs) -> Result<Option<Vec<String>>, Failure> {
    if let Some(path) = &class.roster {
        let name = path.display().to_string();
        let bytes = std::fs::read(path)
            .map_err(|e| Failure::Input(format!("{name}: cannot read the roster: {e}")))?;
        let text = String::from_utf8(bytes).map_err(|e| {
            Failure::Input(format!(
                "{name}: the roster is not UTF-8 text (bad byte at offset {}); save it as UTF-8 CSV",
                e.utf8_error().valid_up_to()
            ))
        })?;
        return plan::parse_roster(&text, &name).map(Some).map_err(|e| Failure::Input(e.to_string()));
    }
    Ok(match &kit.class.groups {
        Groups::None => None,
        Groups::Count(n) => Some((1..=*n).map(|i| format!("Group {i}")).collect()),
        Groups::Names(names) => Some(names.clone()),
    })
}

fn build(
    kit: &Kit,
    dir: &Path,
    out: &OutArgs,
    paper_args: &PaperArgs,
    class: &ClassArgs,
) -> Result<(), Failure> {
    let formats = parse_formats(&out.format)?;
    let paper = resolve_paper(&kit.paper, paper_args)?;
    let text = templates(out)?;
    let (files, warnings) = match class_plan(kit, &paper, class)? {
        None => {
            if class.seed.is_some() {
                eprintln!(
                    "raysheet: note: --seed only matters for class sets ([class] in the kit, or --roster)"
                );
            }
            let plans = plan::plan_kit(kit, &paper);
            let warnings = sheet_warnings(&plans);
            (raysheet::output::build_plans_with(kit, &plans, &paper, formats, class.seed, &text), warnings)
        }
        Some(cp) => {
            let mut warnings = cp.notes.clone();
            if let Some(first) = cp.plans.first() {
                warnings.extend(sheet_warnings(first));
            }
            (raysheet::output::build_class_with(kit, &cp, &paper, formats, &text), warnings)
        }
    };
    let files = files.map_err(|e| Failure::Input(e.to_string()))?;
    let written = write::write_all(dir, &files, out.force).map_err(|e| match e {
        write::WriteError::Refused(msg) => Failure::Input(msg),
        write::WriteError::Io(msg) => Failure::Other(msg),
    })?;
    for w in &warnings {
        eprintln!("raysheet: warning: {w}");
    }
    println!("Wrote {} files to {}:", written.len(), dir.display());
    for w in written.iter().filter(|p| !p.to_string_lossy().contains("/svg/")) {
        println!("  {}", w.display());
    }
    let svgs = written.iter().filter(|p| p.to_string_lossy().contains("/svg/")).count();
    if svgs > 0 {
        println!("  and {svgs} SVG files in svg/ folders");
    }
    println!("Print at actual size (100 %) and check both scale bars before the lesson.");
    Ok(())
}

fn run(cli: Cli) -> Result<(), Failure> {
    match cli.command {
        Command::Check { kit, paper } => {
            let kit = read_kit(&kit)?;
            let paper = resolve_paper(&kit.paper, &paper)?;
            let plans = plan::plan_kit(&kit, &paper);
            print!("{}", report::check_report(&kit, &plans));
            if let Some(cp) = class_plan(&kit, &paper, &ClassArgs::default())? {
                println!("\nClass set: {} groups, seed {}", cp.groups.len(), cp.seed);
                for n in &cp.notes {
                    println!("  note: {n}");
                }
                if cp.notes.is_empty() {
                    println!("  every sheet has room for a different setting per group");
                }
            }
            Ok(())
        }
        Command::Solve { kit, json, paper, class } => solve(&read_kit(&kit)?, &paper, &class, json),
        Command::Build { kit, out, paper, class } => {
            let kit = read_kit(&kit)?;
            let dir = out.out.clone().ok_or_else(|| {
                Failure::Input("build needs --out DIR: the folder to write the sheets into".into())
            })?;
            build(&kit, &dir, &out, &paper, &class)
        }
        Command::Templates { out, force } => {
            let files: Vec<raysheet::output::Output> = TEMPLATE_FILES
                .iter()
                .map(|n| raysheet::output::Output {
                    path: n.to_string(),
                    bytes: shipped_template(n).unwrap_or_default().as_bytes().to_vec(),
                })
                .collect();
            let written = write::write_all(&out, &files, force).map_err(|e| match e {
                write::WriteError::Refused(msg) => Failure::Input(msg),
                write::WriteError::Io(msg) => Failure::Other(msg),
            })?;
            println!("Wrote {} template files to {}:", written.len(), out.display());
            for w in &written {
                println!("  {}", w.display());
            }
            println!("Edit them, then build with --templates {}", out.display());
            Ok(())
        }
        Command::Demo { out, print_kit, class } => {
            if print_kit {
                print!("{}", demo::DEMO_KIT);
                return Ok(());
            }
            let kit = demo_kit()?;
            let dir = out.out.clone().unwrap_or_else(|| PathBuf::from("raysheet-demo"));
            build(&kit, &dir, &out, &PaperArgs::default(), &class)
        }
    }
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    match run(cli) {
        Ok(()) => ExitCode::SUCCESS,
        Err(Failure::Input(msg)) => {
            eprintln!("raysheet: error: {msg}");
            ExitCode::from(2)
        }
        Err(Failure::Other(msg)) => {
            eprintln!("raysheet: error: {msg}");
            ExitCode::from(1)
        }
    }
}
