//! Imports point one way: each top-level module of `src/` may use only the
//! modules below it in [`LAYERS`]; one that uses a module above it, or a module
//! missing from the list, fails this test with the file and line.
//!
//! The test reads every `src/**/*.rs` as text. It blanks comments, strings and
//! character literals, then collects every `crate::X` path (in `use` lines and
//! anywhere in code, `crate::{X, Y::…}` groups included) and every `super::`
//! chain that climbs out of the top-level module, with inline `mod … { }`
//! blocks counted. The binary's files (`main.rs` and the modules it declares)
//! sit on top and may use anything; the crate root (`lib.rs`) only declares
//! the modules.

use std::collections::BTreeMap;
use std::fmt::Write as _;
use std::path::{Path, PathBuf};

/// The layer order, bottom first. A module may use the modules before it in
/// this list, never one after it. Mirrored in DEVELOPERS.md ("Layer order").
const LAYERS: &[&str] = &[
    "geom",   // points, vectors, rays, segments, circles
    "font",   // the text layer: shipped faces, widths, the "can this be printed?" check
    "paper",  // paper sizes, orientation, margins
    "optics", // pieces, Snell's law, the exact trace, paraxial values
    "demo",   // the embedded demo kit's text
    "kit",    // the kit file validated into a normalized Kit
    "plan",   // heights, safe bands, answers, ray letters, class sets
    "scene",  // the device-independent drawing
    "draw",   // drawing helpers any sheet kind uses: text, labels, outlines, angle scales
    "sheets", // one folder per sheet kind: what it measures, its answers and drawings
    "layout", // plans placed on paper as scenes
    "render", // scenes to SVG and PDF bytes
    "output", // answer file, summary CSV, text reports, a build's file list
    "app",    // command-line flags, the resolved job, its run
];

/// Slots in [`LAYERS`] kept for modules still to come.
const RESERVED: &[&str] = &[];

/// One reference from a file to a top-level module of the crate.
#[derive(Debug, Clone, PartialEq)]
struct Use {
    /// 1-based line in the file.
    line: usize,
    /// The top-level module referred to (`None`: the crate root itself,
    /// as in `crate::{self}` or a glob).
    target: Option<String>,
}

fn is_ident(c: char) -> bool {
    c.is_alphanumeric() || c == '_'
}

/// `text` with comments, string literals and character literals replaced by
/// spaces (newlines kept, so line numbers stay right).
fn code_only(text: &str) -> String {
    let c: Vec<char> = text.chars().collect();
    let mut out: Vec<char> = Vec::with_capacity(c.len());
    let blank = |ch: char| if ch == '\n' { '\n' } else { ' ' };
    let mut i = 0;
    while i < c.len() {
        let prev_ident = i > 0 && is_ident(c[i - 1]);
        // Line comment (doc comments too).
        if c[i] == '/' && c.get(i + 1) == Some(&'/') {
            while i < c.len() && c[i] != '\n' {
                out.push(' ');
                i += 1;
            }
            continue;
        }
        // Block comment, nested.
        if c[i] == '/' && c.get(i + 1) == Some(&'*') {
            let mut depth = 0;
            while i < c.len() {
                if c[i] == '/' && c.get(i + 1) == Some(&'*') {
                    depth += 1;
                    out.extend([' ', ' ']);
                    i += 2;
                } else if c[i] == '*' && c.get(i + 1) == Some(&'/') {
                    depth -= 1;
                    out.extend([' ', ' ']);
                    i += 2;
                    if depth == 0 {
                        break;
                    }
                } else {
                    out.push(blank(c[i]));
                    i += 1;
                }
            }
            continue;
        }
        // Raw string: r"…", r#"…"#, br#"…"#, cr"…".
        let raw_start = c[i] == 'r'
            && (!prev_ident || (i >= 1 && matches!(c[i - 1], 'b' | 'c') && (i < 2 || !is_ident(c[i - 2]))));
        if raw_start {
            let mut j = i + 1;
            while c.get(j) == Some(&'#') {
                j += 1;
            }
            if c.get(j) == Some(&'"') {
                let hashes = j - i - 1;
                out.push('r');
                out.extend(std::iter::repeat_n(' ', j - i));
                i = j + 1;
                while i < c.len() {
                    if c[i] == '"' && (1..=hashes).all(|k| c.get(i + k) == Some(&'#')) {
                        out.extend(std::iter::repeat_n(' ', hashes + 1));
                        i += hashes + 1;
                        break;
                    }
                    out.push(blank(c[i]));
                    i += 1;
                }
                continue;
            }
        }
        // String literal (b"…" and c"…" too: the prefix stays as code).
        if c[i] == '"' {
            out.push(' ');
            i += 1;
            while i < c.len() && c[i] != '"' {
                if c[i] == '\\' && i + 1 < c.len() {
                    out.push(' ');
                    out.push(blank(c[i + 1]));
                    i += 2;
                } else {
                    out.push(blank(c[i]));
                    i += 1;
                }
            }
            out.push(' ');
            i += 1;
            continue;
        }
        // Character literal ('x', '\n', '\u{2212}', '"'); a lifetime ('a) stays.
        if c[i] == '\'' {
            if c.get(i + 1) == Some(&'\\') {
                // Skip the escaped character itself ('\'' is a quote), then find the close.
                let mut j = i + 3;
                while j < c.len() && c[j] != '\'' {
                    j += 1;
                }
                out.extend(std::iter::repeat_n(' ', j + 1 - i));
                i = j + 1;
                continue;
            }
            if c.get(i + 2) == Some(&'\'') {
                out.extend([' ', ' ', ' ']);
                i += 3;
                continue;
            }
        }
        out.push(c[i]);
        i += 1;
    }
    out.into_iter().collect()
}

/// A tiny cursor over code-only text.
struct Cursor<'a> {
    c: &'a [char],
    i: usize,
}

impl Cursor<'_> {
    fn skip_ws(&mut self) {
        while self.i < self.c.len() && self.c[self.i].is_whitespace() {
            self.i += 1;
        }
    }

    /// Eats `s` after any whitespace; leaves the cursor where it was if absent.
    fn eat(&mut self, s: &str) -> bool {
        let at = self.i;
        self.skip_ws();
        let want: Vec<char> = s.chars().collect();
        if self.c[self.i..].starts_with(&want) {
            self.i += want.len();
            true
        } else {
            self.i = at;
            false
        }
    }

    fn ident(&mut self) -> Option<String> {
        let at = self.i;
        self.skip_ws();
        let start = self.i;
        while self.i < self.c.len() && is_ident(self.c[self.i]) {
            self.i += 1;
        }
        if self.i == start {
            self.i = at;
            None
        } else {
            Some(self.c[start..self.i].iter().collect())
        }
    }

    /// After `crate::` (or a `super::` chain that reached the crate root):
    /// the top-level names this path or `{…}` group starts with, each with
    /// where it stands (a char index).
    fn root_targets(&mut self) -> Vec<(usize, Option<String>)> {
        if self.eat("{") {
            let mut out = Vec::new();
            let mut depth = 1;
            let mut item_start = true;
            while self.i < self.c.len() && depth > 0 {
                if item_start {
                    self.skip_ws();
                    let at = self.i;
                    match self.ident() {
                        Some(name) if name == "self" => out.push((at, None)),
                        Some(name) => out.push((at, Some(name))),
                        None => {
                            if self.eat("*") {
                                out.push((at, None));
                            }
                        }
                    }
                    item_start = false;
                    continue;
                }
                match self.c[self.i] {
                    '{' => depth += 1,
                    '}' => depth -= 1,
                    ',' if depth == 1 => item_start = true,
                    _ => {}
                }
                self.i += 1;
            }
            out
        } else {
            self.skip_ws();
            vec![(self.i, self.ident())]
        }
    }
}

/// Every reference in `text` to a top-level crate module outside
/// `module_path` (the file's module path: `["plan", "class"]` for
/// `src/plan/class.rs`). References inside the file's own top-level module
/// are left out.
fn crate_uses(text: &str, module_path: &[String]) -> Vec<Use> {
    let code: Vec<char> = code_only(text).chars().collect();
    let line_of = |i: usize| code[..i].iter().filter(|&&ch| ch == '\n').count() + 1;
    let mut uses = Vec::new();
    // Inline modules: (brace depth inside the block, module name).
    let mut inline: Vec<(usize, String)> = Vec::new();
    let mut depth = 0usize;
    let mut i = 0;
    while i < code.len() {
        let ch = code[i];
        if ch == '{' {
            depth += 1;
            i += 1;
            continue;
        }
        if ch == '}' {
            if inline.last().is_some_and(|(d, _)| *d == depth) {
                inline.pop();
            }
            depth = depth.saturating_sub(1);
            i += 1;
            continue;
        }
        let starts_word = is_ident(ch) && (i == 0 || !(is_ident(code[i - 1]) || code[i - 1] == '$'));
        if !starts_word {
            i += 1;
            continue;
        }
        let mut cur = Cursor { c: &code, i };
        let word = cur.ident().unwrap_or_default();
        match word.as_str() {
            "mod" => {
                if let Some(name) = cur.ident() {
                    if cur.eat("{") {
                        depth += 1;
                        inline.push((depth, name));
                    }
                }
            }
            "crate" if cur.eat("::") => {
                uses.extend(
                    cur.root_targets().into_iter().map(|(at, target)| Use { line: line_of(at), target }),
                );
            }
            "super" if !(i >= 2 && code[i - 2..i] == [':', ':']) => {
                let mut climbs = 0;
                let mut probe = Cursor { c: &code, i };
                while probe.ident().as_deref() == Some("super") && probe.eat("::") {
                    climbs += 1;
                    cur.i = probe.i;
                }
                let here = module_path.len() + inline.len();
                if climbs > 0 && climbs >= here {
                    uses.extend(
                        cur.root_targets().into_iter().map(|(at, target)| Use { line: line_of(at), target }),
                    );
                }
            }
            _ => {}
        }
        i = cur.i.max(i + word.chars().count().max(1));
    }
    let own = module_path.first();
    uses.retain(|u| u.target.as_ref() != own);
    uses
}

/// `mod` declarations at the top of a crate root (`lib.rs`, `main.rs`).
fn declared_modules(root_text: &str) -> Vec<String> {
    let code = code_only(root_text);
    code.lines()
        .filter_map(|l| {
            let l = l.trim();
            let rest = ["pub mod ", "pub(crate) mod ", "mod "].iter().find_map(|p| l.strip_prefix(p))?;
            Some(rest.strip_suffix(';')?.trim().to_string())
        })
        .collect()
}

/// The module path of a file under `src/`: `plan/class.rs` → `["plan", "class"]`,
/// `kit/mod.rs` → `["kit"]`.
fn module_path(rel: &Path) -> Vec<String> {
    let mut parts: Vec<String> = rel.iter().map(|p| p.to_string_lossy().into_owned()).collect();
    if let Some(last) = parts.pop() {
        let stem = last.trim_end_matches(".rs").to_string();
        if stem != "mod" {
            parts.push(stem);
        }
    }
    parts
}

/// What is wrong with the crate's layering, one readable line per problem.
/// `files` maps paths relative to `src/` (with `/`) to their text.
fn problems(files: &BTreeMap<String, String>, layers: &[&str]) -> Vec<String> {
    let rank = |m: &str| layers.iter().position(|l| *l == m);
    let order = layers.join(" < ");
    let mut out = Vec::new();
    let lib_modules = files.get("lib.rs").map(|t| declared_modules(t)).unwrap_or_default();
    let bin_modules = files.get("main.rs").map(|t| declared_modules(t)).unwrap_or_default();
    for m in &lib_modules {
        if rank(m).is_none() {
            out.push(format!(
                "src/lib.rs: module `{m}` is not in the layer order; place it in LAYERS in tests/layering.rs (and in DEVELOPERS.md)"
            ));
        }
    }
    for (rel, text) in files {
        if rel == "lib.rs" || rel == "main.rs" {
            continue;
        }
        let path = module_path(Path::new(rel));
        let top = &path[0];
        if bin_modules.contains(top) {
            continue; // The binary sits on top of everything.
        }
        if !lib_modules.contains(top) {
            out.push(format!("src/{rel}: belongs to no module declared in src/lib.rs or src/main.rs"));
            continue;
        }
        let Some(own) = rank(top) else { continue };
        for u in crate_uses(text, &path) {
            match u.target.as_deref().map(|t| (t, rank(t))) {
                None => out.push(format!(
                    "src/{rel}:{}: {top} refers to the crate root as a whole (a glob or `self`), which hides the modules it uses; name them",
                    u.line
                )),
                Some((t, None)) => out.push(format!(
                    "src/{rel}:{}: {top} uses `crate::{t}`, which is not a module in the layer order ({order})",
                    u.line
                )),
                Some((t, Some(r))) if r > own => out.push(format!(
                    "src/{rel}:{}: {top} may not use {t}: {t} sits above {top} in the layer order ({order}); move what {top} needs down, or hand it over as a value",
                    u.line
                )),
                Some(_) => {}
            }
        }
    }
    out
}

fn rust_files(dir: &Path, root: &Path, out: &mut BTreeMap<String, String>) {
    let mut entries: Vec<PathBuf> = std::fs::read_dir(dir)
        .expect("src/ is readable")
        .map(|e| e.expect("a directory entry").path())
        .collect();
    entries.sort();
    for p in entries {
        if p.is_dir() {
            rust_files(&p, root, out);
        } else if p.extension().is_some_and(|e| e == "rs") {
            let rel = p.strip_prefix(root).expect("under src/").to_string_lossy().replace('\\', "/");
            out.insert(rel, std::fs::read_to_string(&p).expect("a source file is UTF-8 text"));
        }
    }
}

fn src_files() -> BTreeMap<String, String> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let mut files = BTreeMap::new();
    rust_files(&root, &root, &mut files);
    files
}

#[test]
fn imports_point_down_the_layer_order() {
    let files = src_files();
    assert!(files.len() > 20 && files.contains_key("lib.rs"), "src/ read: {:?}", files.keys());
    let found = problems(&files, LAYERS);
    let mut msg = String::new();
    for p in &found {
        let _ = writeln!(msg, "  {p}");
    }
    assert!(found.is_empty(), "imports that point up the layer order:\n{msg}");
}

#[test]
fn every_layer_is_a_module_or_reserved() {
    // A name in LAYERS that is neither declared in lib.rs nor reserved is a typo.
    let files = src_files();
    let declared = declared_modules(&files["lib.rs"]);
    for l in LAYERS {
        assert!(
            declared.iter().any(|d| d == l) != RESERVED.contains(l),
            "LAYERS names `{l}`: declared in src/lib.rs and reserved, or neither"
        );
    }
}

#[test]
fn developers_md_mirrors_the_layer_order() {
    let text = std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("DEVELOPERS.md")).unwrap();
    let line = text
        .lines()
        .find(|l| l.starts_with("Layer order (bottom first):"))
        .expect("DEVELOPERS.md has a line starting \"Layer order (bottom first):\"");
    let names: Vec<&str> = line.split('`').skip(1).step_by(2).collect();
    let expected: Vec<&str> = LAYERS.iter().copied().chain(["main"]).collect();
    assert_eq!(names, expected, "DEVELOPERS.md's layer order differs from tests/layering.rs");
}

// ------------------------------------------------------------ the parser itself

fn path(p: &[&str]) -> Vec<String> {
    p.iter().map(|s| s.to_string()).collect()
}

fn targets(text: &str, module: &[&str]) -> Vec<(usize, String)> {
    crate_uses(text, &path(module))
        .into_iter()
        .map(|u| (u.line, u.target.unwrap_or_else(|| "<root>".into())))
        .collect()
}

#[test]
fn group_items_carry_their_own_lines() {
    let text = "use crate::{\n    geom::Point,\n    layout::x,\n};\n";
    assert_eq!(targets(text, &["plan"]), [(2, "geom"), (3, "layout")].map(|(l, t)| (l, t.to_string())));
}

#[test]
fn finds_use_lines_groups_and_paths_in_code() {
    let text = "use crate::geom::Point;\n\
                use crate::{kit::Kit, plan::{a, b}, scene};\n\
                fn f() -> usize { crate::layout::pages(1) + crate :: render::x() }\n";
    assert_eq!(
        targets(text, &["output", "build"]),
        [(1, "geom"), (2, "kit"), (2, "plan"), (2, "scene"), (3, "layout"), (3, "render")]
            .map(|(l, t)| (l, t.to_string()))
    );
}

#[test]
fn skips_comments_strings_chars_and_macro_crate() {
    let text = r####"
        // use crate::layout;
        /// See [`crate::layout::layout`].
        /* crate::render /* nested crate::app */ still crate::app */
        let s = "crate::layout::x and \" crate::app";
        let r = r#"crate::output "quoted" crate::app"#;
        let q = '"'; let e = '\''; let lt: &'static str = "";
        macro_rules! m { () => { $crate::app::x() } }
        use crate::plan::SheetPlan;
    "####;
    assert_eq!(targets(text, &["layout"]), [(9, "plan".to_string())]);
}

#[test]
fn super_chains_count_only_when_they_leave_the_module() {
    // src/plan/class.rs: `super::` is plan itself; `super::super::` is the crate root.
    let text = "use super::band::x;\nuse super::super::layout::y;\nuse super::super::{geom::P, app};\n";
    assert_eq!(
        targets(text, &["plan", "class"]),
        [(2, "layout"), (3, "geom"), (3, "app")].map(|(l, t)| (l, t.to_string()))
    );
    // src/kit/mod.rs: one `super::` already leaves kit, except inside an inline module.
    let text = "use super::plan::x;\n#[cfg(test)]\nmod tests {\n    use super::*;\n    use super::super::app::y;\n}\nuse super::render::z;\n";
    assert_eq!(
        targets(text, &["kit"]),
        [(1, "plan"), (5, "app"), (7, "render")].map(|(l, t)| (l, t.to_string()))
    );
}

#[test]
fn a_use_of_a_higher_module_is_reported_with_file_and_line() {
    let mut files = BTreeMap::new();
    files.insert("lib.rs".to_string(), "pub mod kit;\npub mod plan;\n".to_string());
    files.insert("kit/mod.rs".to_string(), "//! Kit.\nuse crate::plan::group_name;\n".to_string());
    files.insert("plan/mod.rs".to_string(), "//! Plan.\nuse crate::kit::Kit;\n".to_string());
    let found = problems(&files, &["kit", "plan"]);
    assert_eq!(
        found,
        [
            "src/kit/mod.rs:2: kit may not use plan: plan sits above kit in the layer order (kit < plan); move what kit needs down, or hand it over as a value"
        ]
    );
    // The same files with the order turned round: now plan's use is the wrong one.
    let found = problems(&files, &["plan", "kit"]);
    assert_eq!(found.len(), 1);
    assert!(found[0].starts_with("src/plan/mod.rs:2: plan may not use kit"), "{found:?}");
}

#[test]
fn modules_missing_from_the_order_fail() {
    let mut files = BTreeMap::new();
    files.insert("lib.rs".to_string(), "pub mod kit;\npub mod grade;\n".to_string());
    files.insert("kit/mod.rs".to_string(), "use crate::extra::x;\n".to_string());
    files.insert("stray.rs".to_string(), "//! Not compiled.\n".to_string());
    files.insert("main.rs".to_string(), "mod write;\nuse raysheet::kit;\n".to_string());
    files.insert("write.rs".to_string(), "use crate::anything;\n".to_string());
    let found = problems(&files, &["kit"]);
    assert_eq!(found.len(), 3, "{found:#?}");
    assert!(found[0].contains("module `grade` is not in the layer order"), "{found:?}");
    assert!(found.iter().any(|p| p.starts_with("src/kit/mod.rs:1: kit uses `crate::extra`")), "{found:?}");
    assert!(found.iter().any(|p| p.starts_with("src/stray.rs: belongs to no module")), "{found:?}");
}

#[test]
fn module_paths_follow_the_file_layout() {
    assert_eq!(module_path(Path::new("kit/mod.rs")), path(&["kit"]));
    assert_eq!(module_path(Path::new("render/pdf.rs")), path(&["render", "pdf"]));
    assert_eq!(module_path(Path::new("render/pdf/bezier.rs")), path(&["render", "pdf", "bezier"]));
    assert_eq!(module_path(Path::new("font.rs")), path(&["font"]));
}
