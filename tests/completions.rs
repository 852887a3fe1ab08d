//! `raysheet completions SHELL` and `raysheet manual`, made by clap_complete
//! and clap_mangen from the parser's own definitions: the bash completions
//! load in a real bash (`complete -p raysheet` names their function) and
//! complete a subcommand and a flag; every subcommand is in each shell's
//! script and in the manual page.

mod common {
    #[expect(dead_code, reason = "this test runs no fixture kit")]
    pub mod cli;
    pub mod tools;
}

use std::process::Command;

use clap::CommandFactory;
use common::cli::{assert_code, raysheet, text};
use raysheet::app::cli::Cli;

/// Every subcommand's name, from the parser itself.
fn subcommands() -> Vec<String> {
    Cli::command().get_subcommands().map(|c| c.get_name().to_string()).collect()
}

fn completions(shell: &str) -> String {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = raysheet(&["completions", shell], dir.path());
    assert_code(&out, 0);
    text(&out.stdout)
}

/// Runs `script` in a bash without start-up files, after loading the bash
/// completions from a file; its standard output.
fn in_bash(script: &str) -> String {
    let dir = tempfile::tempdir().expect("temp dir");
    let file = dir.path().join("raysheet.bash");
    std::fs::write(&file, completions("bash")).expect("write the completions");
    let out = Command::new("bash")
        .args(["--norc", "--noprofile", "-c"])
        .arg(format!("source '{}' && {script}", file.display()))
        .output()
        .expect("bash runs");
    assert!(out.status.success(), "bash failed:\n{}\n{}", text(&out.stdout), text(&out.stderr));
    text(&out.stdout)
}

#[test]
fn the_bash_completions_load_and_complete_subcommands_and_flags() {
    if !common::tools::have_tool("bash", "--version", "bash") {
        return;
    }
    let registered = in_bash("complete -p raysheet");
    assert!(
        registered.contains("-F _raysheet") && registered.trim_end().ends_with("raysheet"),
        "complete -p raysheet says: {registered}"
    );
    // Ask the loaded function as bash would on <TAB>: `raysheet sch` → schema.
    let words = in_bash(
        "COMP_WORDS=(raysheet sch); COMP_CWORD=1; COMP_LINE='raysheet sch'; COMP_POINT=12; \
         _raysheet raysheet sch raysheet; printf '%s\\n' \"${COMPREPLY[@]}\"",
    );
    assert_eq!(words.lines().collect::<Vec<_>>(), ["schema"], "completions of `raysheet sch`");
    // `raysheet build --for` → --force and --format.
    let words = in_bash(
        "COMP_WORDS=(raysheet build --f); COMP_CWORD=2; COMP_LINE='raysheet build --f'; COMP_POINT=18; \
         _raysheet raysheet --f build; printf '%s\\n' \"${COMPREPLY[@]}\"",
    );
    let mut got: Vec<&str> = words.lines().collect();
    got.sort();
    assert_eq!(got, ["--force", "--format"], "completions of `raysheet build --f`");
}

#[test]
fn every_shell_gets_every_subcommand() {
    let names = subcommands();
    assert!(names.len() >= 12, "subcommands: {names:?}");
    for shell in ["bash", "zsh", "fish", "powershell"] {
        let script = completions(shell);
        for name in &names {
            assert!(script.contains(name.as_str()), "{shell} completions lack `{name}`");
        }
    }
}

#[test]
fn an_unknown_shell_is_refused_with_the_ones_there_are() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = raysheet(&["completions", "tcsh"], dir.path());
    assert_code(&out, 2);
    let err = text(&out.stderr);
    for shell in ["bash", "zsh", "fish", "powershell"] {
        assert!(err.contains(shell), "the error names {shell}: {err}");
    }
}

#[test]
fn the_manual_page_is_roff_with_every_subcommand() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = raysheet(&["manual"], dir.path());
    assert_code(&out, 0);
    let page = text(&out.stdout);
    assert!(
        page.starts_with(".ie \\n(.g .ds Aq") || page.contains(".TH raysheet"),
        "roff header: {page:.200}"
    );
    assert!(page.contains(".TH raysheet 1"), "a section-1 page");
    for name in subcommands() {
        assert!(page.contains(&name), "the manual page lacks `{name}`");
    }
}
