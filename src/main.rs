//! The `raysheet` binary: reads arguments and files, writes outputs, maps
//! errors to exit codes (0 success, 2 bad input or usage, 1 anything else).
//! No logic lives here.

use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::Parser;
use raysheet::cli::{Cli, ClassArgs, Command, PaperArgs, UsageError, resolve_paper};
use raysheet::kit::Kit;
use raysheet::{answers, demo, plan, report};

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
    let bytes = std::fs::read(path).map_err(|e| Failure::Input(format!("{name}: cannot read the kit file: {e}")))?;
    let text = String::from_utf8(bytes).map_err(|e| {
        Failure::Input(format!("{name}: the kit file is not UTF-8 text (bad byte at offset {}); save it as UTF-8", e.utf8_error().valid_up_to()))
    })?;
    Kit::from_toml(&text, &name).map_err(|e| Failure::Input(e.to_string()))
}

fn demo_kit() -> Result<Kit, Failure> {
    Kit::from_toml(demo::DEMO_KIT, demo::DEMO_NAME).map_err(|e| Failure::Other(format!("the embedded demo kit is invalid: {e}")))
}

fn solve(kit: &Kit, paper_args: &PaperArgs, class: &ClassArgs, json: bool) -> Result<(), Failure> {
    let paper = resolve_paper(&kit.paper, paper_args)?;
    let plans = plan::plan_kit(kit, &paper);
    if json {
        print!("{}", answers::to_json(&kit.title, class.seed, &plans));
    } else {
        let mut out = format!("{}\n", kit.title);
        for p in &plans {
            out.push('\n');
            out.push_str(&report::sheet_table(p));
        }
        print!("{out}");
    }
    Ok(())
}

fn run(cli: Cli) -> Result<(), Failure> {
    match cli.command {
        Command::Check { kit, paper } => {
            let kit = read_kit(&kit)?;
            let paper = resolve_paper(&kit.paper, &paper)?;
            let plans = plan::plan_kit(&kit, &paper);
            print!("{}", report::check_report(&kit, &plans));
            Ok(())
        }
        Command::Solve { kit, json, paper, class } => solve(&read_kit(&kit)?, &paper, &class, json),
        Command::Build { .. } => Err(Failure::Other("build is not available yet".into())),
        Command::Demo { print_kit, .. } => {
            if print_kit {
                print!("{}", demo::DEMO_KIT);
                return Ok(());
            }
            let kit = demo_kit()?;
            let paper = resolve_paper(&kit.paper, &PaperArgs::default())?;
            let plans = plan::plan_kit(&kit, &paper);
            print!("{}", report::check_report(&kit, &plans));
            let _ = PathBuf::new();
            Ok(())
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
