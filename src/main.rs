//! The `raysheet` binary: reads arguments and files, hands them to the library,
//! prints and writes what comes back, and maps errors to exit codes (0 success,
//! 2 bad input or usage, 1 anything else). No logic lives here.

use std::path::Path;
use std::process::ExitCode;

mod write;

use clap::Parser;
use raysheet::app::cli::Cli;
use raysheet::app::job::{self, Inputs, Job, Source, Wanted};
use raysheet::app::{Failure, Outcome};

/// A file's bytes, or the words of the error that stopped the reading.
fn read_bytes(path: &Path) -> Source<Vec<u8>> {
    Source { path: path.to_path_buf(), content: std::fs::read(path).map_err(|e| e.to_string()) }
}

/// Reads the files the command needs; the job judges what was read.
fn read_inputs(wanted: &Wanted) -> Inputs {
    Inputs {
        kit: wanted.kit.as_deref().map(read_bytes),
        roster: wanted.roster.as_deref().map(read_bytes),
        templates: wanted
            .templates
            .iter()
            .filter(|(_, path)| path.exists())
            .map(|(name, path)| {
                let content = std::fs::read_to_string(path).map_err(|e| e.to_string());
                (name.clone(), Source { path: path.clone(), content })
            })
            .collect(),
    }
}

fn run(cli: Cli) -> Result<(), Failure> {
    let inputs = read_inputs(&job::wanted(&cli.command));
    let job = Job::resolve(cli.command, inputs)?;
    for note in job.notes() {
        eprintln!("raysheet: note: {note}");
    }
    match raysheet::app::run(job)? {
        Outcome::Print(text) => print!("{text}"),
        Outcome::Write(w) => {
            let written = write::write_all(&w.dir, &w.files, w.force).map_err(|e| match e {
                write::WriteError::Refused(msg) => Failure::Input(msg),
                write::WriteError::Io(msg) => Failure::Other(msg),
            })?;
            for warning in &w.warnings {
                eprintln!("raysheet: warning: {warning}");
            }
            print!("{}", w.report(&written));
        }
    }
    Ok(())
}

fn main() -> ExitCode {
    match run(Cli::parse()) {
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
