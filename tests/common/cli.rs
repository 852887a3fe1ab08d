//! The built `raysheet` binary run as a user would, on the kits in `tests/fixtures/`.

use std::path::Path;
use std::process::{Command, Output};

/// Runs the binary with `args` in the folder `cwd`.
pub fn raysheet(args: &[&str], cwd: &Path) -> Output {
    Command::new(env!("CARGO_BIN_EXE_raysheet"))
        .args(args)
        .current_dir(cwd)
        .output()
        .expect("the binary runs")
}

/// The path of a fixture kit or roster.
pub fn fixture_path(name: &str) -> String {
    format!("{}/tests/fixtures/{name}", env!("CARGO_MANIFEST_DIR"))
}

pub fn text(b: &[u8]) -> String {
    String::from_utf8_lossy(b).into_owned()
}

/// Exit code, with both streams in the message when it is not `want`.
pub fn assert_code(out: &Output, want: i32) {
    assert_eq!(
        out.status.code(),
        Some(want),
        "exit code\n--- stdout\n{}\n--- stderr\n{}",
        text(&out.stdout),
        text(&out.stderr)
    );
}
