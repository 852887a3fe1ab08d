//! Command-line flags, resolved into a job before any work is done. Never parses the kit.

use std::path::PathBuf;

use clap::{Args, Parser, Subcommand};

use crate::output::Formats;
use crate::paper::{Orientation, PaperSize, PaperSpec};

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
    /// Write the shipped sheet text (instructions, table headings, caution) into a folder to edit.
    Templates {
        /// The folder to write them into.
        #[arg(long)]
        out: PathBuf,
        /// Overwrite files there that raysheet did not write.
        #[arg(long)]
        force: bool,
    },
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
    /// focal-diverging.toml, common.toml; `raysheet templates --out DIR` writes the shipped ones).
    #[arg(long, value_name = "DIR")]
    pub templates: Option<PathBuf>,
}

/// Paper options; each overrides the kit's [paper] table.
#[derive(Args, Debug, Default)]
pub struct PaperArgs {
    /// Paper: A4, A3, Letter, Legal, Tabloid, or WIDTHxHEIGHT in mm (such as 250x350).
    #[arg(long)]
    pub paper: Option<String>,
    /// portrait, landscape or auto.
    #[arg(long)]
    pub orientation: Option<String>,
    /// Margin kept clear on every side, mm.
    #[arg(long)]
    pub margin: Option<f64>,
}

/// Class-set options; each overrides the kit's [class] table.
#[derive(Args, Debug, Default)]
pub struct ClassArgs {
    /// Seed for the per-group variants.
    #[arg(long)]
    pub seed: Option<u64>,
    /// CSV file with a `name` column: one group per row.
    #[arg(long)]
    pub roster: Option<PathBuf>,
}

/// A usage problem with the flags (exit code 2).
#[derive(Debug, Clone, PartialEq)]
pub struct UsageError(pub String);

impl std::fmt::Display for UsageError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

impl std::error::Error for UsageError {}

/// Parses `--format`.
pub fn parse_formats(s: &str) -> Result<Formats, UsageError> {
    let mut f = Formats::default();
    for part in s.split(',').map(str::trim).filter(|p| !p.is_empty()) {
        match part.to_ascii_lowercase().as_str() {
            "pdf" => f.pdf = true,
            "svg" => f.svg = true,
            other => {
                return Err(UsageError(format!(
                    "--format: \"{other}\" is not a format; give pdf, svg or pdf,svg"
                )));
            }
        }
    }
    if !f.pdf && !f.svg {
        return Err(UsageError("--format: give at least one of pdf, svg".into()));
    }
    Ok(f)
}

/// Applies `--paper`, `--orientation` and `--margin` on top of the kit's paper.
pub fn resolve_paper(kit_paper: &PaperSpec, args: &PaperArgs) -> Result<PaperSpec, UsageError> {
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
                        return Err(UsageError(format!(
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
            UsageError(format!(
                "--orientation: \"{o}\" is not an orientation; give portrait, landscape or auto"
            ))
        })?;
    }
    if let Some(m) = args.margin {
        spec.margin_mm = m;
    }
    spec.check().map_err(|e| UsageError(format!("--paper/--margin: {e}")))?;
    Ok(spec)
}

#[cfg(test)]
mod tests {
    use super::*;

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
