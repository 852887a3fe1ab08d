//! The command-line flags as clap reads them; `job.rs` resolves them before any
//! work is done. Never parses the kit.

use std::path::PathBuf;

use clap::{Args, Parser, Subcommand};

/// raysheet: true-scale ray-optics tracing sheets and answer keys from a kit file.
#[derive(Parser, Debug)]
#[command(name = "raysheet", version, about, long_about = None)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Check a kit file and print each piece's and sheet's optics, safe bands and warnings.
    Check {
        /// The kit file (TOML).
        kit: PathBuf,
        #[command(flatten)]
        paper: PaperArgs,
    },
    /// Print the answers for a kit: a table, or the answer file with --json.
    Solve {
        /// The kit file (TOML).
        kit: PathBuf,
        /// Print the answer file (JSON) instead of a table.
        #[arg(long)]
        json: bool,
        #[command(flatten)]
        paper: PaperArgs,
        #[command(flatten)]
        class: ClassArgs,
    },
    /// Write student sheets, answer keys and the answer file for a kit.
    Build {
        /// The kit file (TOML).
        kit: PathBuf,
        #[command(flatten)]
        out: OutArgs,
        #[command(flatten)]
        paper: PaperArgs,
        #[command(flatten)]
        class: ClassArgs,
    },
    /// Write the printer-check page: two rulers to measure, for [printer] in the kit.
    Calibrate {
        /// Folder to write calibration.pdf and calibration.svg into.
        #[arg(long)]
        out: PathBuf,
        /// Overwrite files in the output folder that raysheet did not write.
        #[arg(long)]
        force: bool,
        #[command(flatten)]
        paper: PaperArgs,
    },
    /// Fit each material's index to what the class measured (a filled-in results.csv).
    Fit {
        /// The kit the build was made from.
        kit: PathBuf,
        /// The results file with the `measured` column filled in.
        results: PathBuf,
        /// The build's answer file (default: answers.json beside the results file).
        #[arg(long, value_name = "FILE")]
        answers: Option<PathBuf>,
        /// Print the fit as JSON.
        #[arg(long)]
        json: bool,
        #[command(flatten)]
        paper: PaperArgs,
    },
    /// Mark a class's filled-in results.csv against the answers the build wrote.
    Grade {
        /// The results file (the build's results.csv, with the `measured` column filled in).
        results: PathBuf,
        /// Folder to write grades.csv into.
        #[arg(long)]
        out: PathBuf,
        /// The build's answer file (default: answers.json beside the results file).
        #[arg(long, value_name = "FILE")]
        answers: Option<PathBuf>,
        /// The kit file: a warning if it changed since the build (the marks never change).
        #[arg(long, value_name = "FILE")]
        kit: Option<PathBuf>,
        /// Overwrite files in the output folder that raysheet did not write.
        #[arg(long)]
        force: bool,
    },
    /// Write the shipped sheet text (instructions, table headings, caution) into a folder to edit.
    Templates {
        /// The folder to write them into.
        #[arg(long)]
        out: PathBuf,
        /// Overwrite files there that raysheet did not write.
        #[arg(long)]
        force: bool,
    },
    /// List the built-in materials (`catalog = "…"` in a kit) with their sources and n at 486.1, 587.6 and 656.3 nm.
    Materials,
    /// Print the kit file's JSON Schema, which TOML-aware editors use to complete and check a kit as it is typed.
    Schema {
        /// Write it as kit.schema.json into this folder instead of printing it.
        #[arg(long, value_name = "DIR")]
        out: Option<PathBuf>,
        /// Overwrite a kit.schema.json there that raysheet did not write.
        #[arg(long, requires = "out")]
        force: bool,
    },
    /// List every sheet kind: the pieces it fits and the fields it reads.
    Kinds,
    /// Print shell completions for raysheet (load them in your shell's start-up file).
    Completions {
        /// The shell: bash, zsh, fish or powershell.
        shell: clap_complete::Shell,
    },
    /// Print raysheet's manual page (roff; read it with `man -l FILE`).
    Manual,
    /// Build the embedded demo kit (no kit file needed).
    Demo {
        #[command(flatten)]
        out: OutArgs,
        /// Print the demo kit's TOML (a starting point for your own) and stop.
        #[arg(long)]
        print_kit: bool,
        #[command(flatten)]
        class: ClassArgs,
    },
}

/// Where and what to write.
#[derive(Args, Debug)]
pub struct OutArgs {
    /// Output folder (for `demo` the default is raysheet-demo).
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Formats to write, comma-separated: pdf, svg.
    #[arg(long, default_value = "pdf,svg")]
    pub format: String,
    /// Overwrite files in the output folder that raysheet did not write.
    #[arg(long)]
    pub force: bool,
    /// Folder with your own sheet text (any of curved-face.toml, focal.toml,
    /// focal-diverging.toml, block.toml, prism.toml, prism-turn.toml, common.toml,
    /// words.toml; `raysheet templates --out DIR` writes the shipped ones).
    #[arg(long, value_name = "DIR")]
    pub templates: Option<PathBuf>,
}

/// Paper options; each overrides the kit's `[paper]` table.
#[derive(Args, Debug, Default)]
pub struct PaperArgs {
    /// Paper: A4, A5, A3, Letter, Legal, Tabloid, or WIDTHxHEIGHT in mm (such as 250x350).
    #[arg(long)]
    pub paper: Option<String>,
    /// portrait, landscape or auto.
    #[arg(long)]
    pub orientation: Option<String>,
    /// Margin kept clear on every side, mm.
    #[arg(long)]
    pub margin: Option<f64>,
    /// What the calibration page's rulers measured on this printer, LONG,SHORT in mm
    /// (such as 178.6,119.3): every page is stretched to print true. Overrides [printer].
    #[arg(long, value_name = "LONG,SHORT")]
    pub rulers: Option<String>,
}

/// Class-set options; each overrides the kit's `[class]` table.
#[derive(Args, Debug, Default)]
pub struct ClassArgs {
    /// Seed for the per-group variants.
    #[arg(long)]
    pub seed: Option<u64>,
    /// CSV file with a `name` column: one group per row.
    #[arg(long)]
    pub roster: Option<PathBuf>,
}
