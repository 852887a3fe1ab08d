//! The `raysheet` binary: reads arguments and files, hands them to the library,
//! prints and writes what comes back, and maps errors to exit codes (0 success,
//! 2 bad input or usage, 1 anything else). No logic lives here.

use std::io::Write;
use std::path::Path;
use std::process::ExitCode;

mod write;

use clap::Parser;
use raysheet::app::cli::Cli;
use raysheet::app::job::{self, Inputs, Job, Source, Wanted};
use raysheet::app::{Failure, Outcome};

/// Largest kit or roster file read, bytes: a kit of every piece a school owns
/// is a few kilobytes, so 1 MiB is far beyond any real one.
const MAX_INPUT_BYTES: u64 = 1 << 20;

/// Largest template file read, bytes (a template is a few hundred bytes).
const MAX_TEMPLATE_BYTES: u64 = 64 << 10;

/// Reads at most `limit` bytes; a longer file (or a link to an endless device
/// such as /dev/zero) is an error, never read until memory runs out.
fn read_limited(path: &Path, limit: u64, what: &str) -> Result<Vec<u8>, String> {
    use std::io::Read;
    let mut bytes = Vec::new();
    std::fs::File::open(path)
        .and_then(|f| f.take(limit + 1).read_to_end(&mut bytes))
        .map_err(|e| e.to_string())?;
    if bytes.len() as u64 > limit {
        return Err(format!(
            "the file is larger than {} KiB, far more than any {what}; is this the right file?",
            limit >> 10
        ));
    }
    Ok(bytes)
}

/// A file's bytes, or the words of the error that stopped the reading.
fn read_bytes(path: &Path, what: &str) -> Source<Vec<u8>> {
    Source { path: path.to_path_buf(), content: read_limited(path, MAX_INPUT_BYTES, what) }
}

/// Largest answer file read, bytes: a 60-group class set's is a few MiB.
const MAX_ANSWERS_BYTES: u64 = 64 << 20;

/// The answer file's bytes (a larger limit than a kit's).
fn read_limited_source(path: &Path) -> Source<Vec<u8>> {
    Source { path: path.to_path_buf(), content: read_limited(path, MAX_ANSWERS_BYTES, "answer file") }
}

/// Reads the files the command needs; the job judges what was read.
fn read_inputs(wanted: &Wanted) -> Inputs {
    Inputs {
        kit: wanted.kit.as_deref().map(|p| read_bytes(p, "kit")),
        roster: wanted.roster.as_deref().map(|p| read_bytes(p, "roster")),
        templates: wanted
            .templates
            .iter()
            .filter(|(_, path)| path.exists())
            .map(|(name, path)| {
                let content = read_limited(path, MAX_TEMPLATE_BYTES, "template").and_then(|b| {
                    String::from_utf8(b).map_err(|e| {
                        format!(
                            "the file is not UTF-8 text (bad byte at offset {}); save it as UTF-8",
                            e.utf8_error().valid_up_to()
                        )
                    })
                });
                (name.clone(), Source { path: path.clone(), content })
            })
            .collect(),
        marking: wanted
            .marking
            .as_ref()
            .map(|(results, answers)| (read_bytes(results, "results file"), read_limited_source(answers))),
    }
}

/// Prints to standard output. A reader that went away (`raysheet … | head -1`)
/// is not a failure: the work is done, so the rest of the text is dropped.
fn say(text: &str) -> Result<(), Failure> {
    let mut out = std::io::stdout().lock();
    match out.write_all(text.as_bytes()).and_then(|()| out.flush()) {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => {
            Err(Failure::Other(format!("cannot write to standard output: {e}")))
        }
        _ => Ok(()),
    }
}

/// Prints one line to standard error; a closed standard error is ignored (there
/// is nowhere left to say anything).
fn tell(line: &str) {
    let _ = writeln!(std::io::stderr().lock(), "{line}");
}

fn run(cli: Cli) -> Result<(), Failure> {
    let inputs = read_inputs(&job::wanted(&cli.command));
    let job = Job::resolve(cli.command, inputs)?;
    for note in job.notes() {
        tell(&format!("raysheet: note: {note}"));
    }
    match raysheet::app::run(job)? {
        Outcome::Print(text) => say(&text)?,
        Outcome::Write(w) => {
            let written = write::write_all(&w.dir, w.set_name(), &w.files, w.force).map_err(|e| match e {
                write::WriteError::Refused(msg) => Failure::Input(msg),
                write::WriteError::Io(msg) => Failure::Other(msg),
            })?;
            for note in &written.notes {
                tell(&format!("raysheet: note: {note}"));
            }
            for warning in &w.warnings {
                tell(&format!("raysheet: warning: {warning}"));
            }
            say(&w.report(&written.paths))?;
        }
    }
    Ok(())
}

fn main() -> ExitCode {
    match run(Cli::parse()) {
        Ok(()) => ExitCode::SUCCESS,
        Err(Failure::Input(msg)) => {
            tell(&format!("raysheet: error: {msg}"));
            ExitCode::from(2)
        }
        Err(Failure::Other(msg)) => {
            tell(&format!("raysheet: error: {msg}"));
            ExitCode::from(1)
        }
    }
}
