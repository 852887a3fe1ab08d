//! Benchmark (issue 13): the frozen four-sheet demo kit with `[class] groups = 30`
//! built through the command line, into a new folder each time, as a teacher
//! runs it: wall time by criterion, then CPU time (user + system of the
//! builds, from `/proc/self/stat` on Linux) and the bytes written.
//!
//! Run: `cargo bench --bench class_cli`. With `RAYSHEET_BASELINE=/path/to/an/older/raysheet`
//! the same set is built by that binary too, in the same run, so the two are
//! measured side by side on one machine in one state (figures in README.md).

use std::path::{Path, PathBuf};
use std::process::Command;
use std::time::{Duration, Instant};

use criterion::{Criterion, criterion_group, criterion_main};

/// The demo kit as it stood when the figures were first taken (four lens sheets).
const BENCH_KIT: &str = include_str!("fixtures/lens-demo.toml");

/// Groups in the benchmark's class set (issue 13).
const GROUPS: usize = 30;

/// A scratch folder for this run: the kit, and one output folder per build.
struct Scratch {
    dir: PathBuf,
    kit: PathBuf,
    count: usize,
}

impl Scratch {
    fn new() -> Scratch {
        let dir = std::env::temp_dir().join(format!("raysheet-bench-{}", std::process::id()));
        std::fs::create_dir_all(&dir).expect("scratch folder");
        let kit = dir.join("class.toml");
        std::fs::write(&kit, format!("{BENCH_KIT}\n[class]\ngroups = {GROUPS}\n")).expect("kit written");
        Scratch { dir, kit, count: 0 }
    }

    /// Builds the set with `exe` into a folder no build used before.
    fn build(&mut self, exe: &Path) -> PathBuf {
        self.count += 1;
        let out = self.dir.join(format!("out-{}", self.count));
        let status = Command::new(exe)
            .arg("build")
            .arg(&self.kit)
            .arg("--out")
            .arg(&out)
            .stdout(std::process::Stdio::null())
            .stderr(std::process::Stdio::null())
            .status()
            .expect("raysheet runs");
        assert!(status.success(), "{} build failed", exe.display());
        out
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.dir);
    }
}

/// The binaries to measure: this build, and the baseline if one is named.
fn binaries() -> Vec<(&'static str, PathBuf)> {
    let mut v = vec![("this build", PathBuf::from(env!("CARGO_BIN_EXE_raysheet")))];
    if let Some(base) = std::env::var_os("RAYSHEET_BASELINE") {
        v.push(("baseline", PathBuf::from(base)));
    }
    v
}

/// Total bytes of the files under `dir`.
fn bytes_under(dir: &Path) -> u64 {
    std::fs::read_dir(dir)
        .map(|entries| {
            entries
                .flatten()
                .map(|e| match e.file_type() {
                    Ok(t) if t.is_dir() => bytes_under(&e.path()),
                    Ok(_) => e.metadata().map_or(0, |m| m.len()),
                    Err(_) => 0,
                })
                .sum()
        })
        .unwrap_or(0)
}

/// User + system CPU seconds of this process's waited-for children, from
/// fields 16 and 17 (`cutime`, `cstime`) of `/proc/self/stat`, in clock ticks
/// of 1/100 s (`proc(5)`; the USER_HZ of Linux on x86 and ARM). `None` off Linux.
fn children_cpu_s() -> Option<f64> {
    let stat = std::fs::read_to_string("/proc/self/stat").ok()?;
    // The command name, in parentheses, may hold spaces: count fields after it.
    let rest = &stat[stat.rfind(')')? + 2..];
    let fields: Vec<&str> = rest.split(' ').collect();
    // `rest` starts at field 3 (state), so field n is fields[n - 3].
    let ticks: f64 = fields.get(13)?.parse::<f64>().ok()? + fields.get(14)?.parse::<f64>().ok()?;
    Some(ticks / 100.0)
}

fn class_set(c: &mut Criterion) {
    let mut scratch = Scratch::new();
    let mut g = c.benchmark_group("cli");
    g.sample_size(10).measurement_time(Duration::from_secs(30));
    for (name, exe) in binaries() {
        g.bench_function(
            format!("demo kit, {GROUPS}-group class set, build to a new folder ({name})"),
            |b| {
                // Only the build is timed; removing its folder is not.
                b.iter_custom(|iters| {
                    let mut total = Duration::ZERO;
                    for _ in 0..iters {
                        let start = Instant::now();
                        let out = scratch.build(&exe);
                        total += start.elapsed();
                        let _ = std::fs::remove_dir_all(out);
                    }
                    total
                })
            },
        );
    }
    g.finish();

    // Wall and CPU time per build and the bytes written, outside criterion
    // (which times the wall clock only), the binaries taking turns so that
    // both see the same load; the least of each shows the machine at its
    // quietest, the mean the run as it was.
    const RUNS: usize = 10;
    let bins = binaries();
    let mut seen: Vec<(Vec<f64>, Vec<f64>, u64)> = vec![(Vec::new(), Vec::new(), 0); bins.len()];
    for _ in 0..RUNS {
        for ((_, exe), (walls, cpus, bytes)) in bins.iter().zip(&mut seen) {
            let before = children_cpu_s();
            let start = Instant::now();
            let out = scratch.build(exe);
            walls.push(start.elapsed().as_secs_f64());
            if let (Some(a), Some(b)) = (before, children_cpu_s()) {
                cpus.push(b - a);
            }
            *bytes = bytes_under(&out);
            let _ = std::fs::remove_dir_all(out);
        }
    }
    let least = |v: &[f64]| v.iter().copied().fold(f64::INFINITY, f64::min);
    let mean = |v: &[f64]| v.iter().sum::<f64>() / v.len().max(1) as f64;
    for ((name, _), (walls, cpus, bytes)) in bins.iter().zip(&seen) {
        println!(
            "cli {name}: wall least {:.3} s, mean {:.3} s; CPU (user + system) least {:.2} s, mean {:.3} s ({} runs; CPU in 1/100 s ticks{}); {bytes} bytes written",
            least(walls),
            mean(walls),
            least(cpus),
            mean(cpus),
            walls.len(),
            if cpus.is_empty() { ", not available off Linux" } else { "" },
        );
    }
}

criterion_group!(benches, class_set);
criterion_main!(benches);
