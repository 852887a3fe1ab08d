//! External programs some tests check against (poppler's `pdftoppm`,
//! librsvg's `rsvg-convert`). Outside CI a test may skip when its tool is
//! missing; under CI (`CI` set, as CI services do) a missing tool fails the
//! test, so a check is never skipped silently where it is supposed to run.

use std::process::Command;

/// Whether a value of the `CI` variable means "this is a CI run": set to
/// anything but empty, `0` or `false`.
pub fn means_ci(value: Option<&str>) -> bool {
    value.is_some_and(|v| !matches!(v.trim().to_ascii_lowercase().as_str(), "" | "0" | "false"))
}

/// What a test does about its tool: `Ok(None)` run the check, `Ok(Some(note))`
/// skip it and print the note, `Err(message)` fail.
pub fn decide(tool: &str, package: &str, found: bool, ci: bool) -> Result<Option<String>, String> {
    match (found, ci) {
        (true, _) => Ok(None),
        (false, false) => Ok(Some(format!("note: {tool} is not installed ({package}); skipping this check"))),
        (false, true) => Err(format!(
            "{tool} is not installed ({package}), and CI is set: under CI the checks that need it must run. \
             Install {package} (.ci/run does so with apt-get), or unset CI to skip them locally."
        )),
    }
}

/// Whether `tool` runs (probed with `probe_arg`). When it does not: under CI
/// the calling test panics naming the package; elsewhere a note is printed and
/// the caller skips its check.
pub fn have_tool(tool: &str, probe_arg: &str, package: &str) -> bool {
    let found = Command::new(tool).arg(probe_arg).output().is_ok();
    match decide(tool, package, found, means_ci(std::env::var("CI").ok().as_deref())) {
        Ok(None) => true,
        Ok(Some(note)) => {
            println!("{note}");
            false
        }
        Err(msg) => panic!("{msg}"),
    }
}
