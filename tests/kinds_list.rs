//! `raysheet kinds` lists every sheet kind from the kind modules themselves,
//! and README.md's table of kinds and its pictures are checked against it: a
//! kind added to the code and not to the README (or the other way round)
//! fails here.

mod common {
    #[expect(dead_code, reason = "this test runs no fixture kit")]
    pub mod cli;
}

use std::collections::BTreeSet;
use std::path::Path;

use common::cli::{assert_code, raysheet, text};
use raysheet::sheets::{SHARED_FIELDS, SheetKind};

fn kinds_output() -> String {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = raysheet(&["kinds"], dir.path());
    assert_code(&out, 0);
    text(&out.stdout)
}

/// The kind words `raysheet kinds` prints: the lines `word: title` at the
/// start of a line.
fn listed_kinds(out: &str) -> BTreeSet<String> {
    out.lines()
        .filter(|l| !l.starts_with(' ') && !l.starts_with("Sheet kinds") && !l.starts_with("Every kind"))
        .filter_map(|l| l.split_once(": ").map(|(w, _)| w.to_string()))
        .filter(|w| !w.contains(' ') && !w.starts_with('`'))
        .collect()
}

fn readme() -> String {
    std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("README.md")).expect("README.md")
}

/// The first column's kind words in README's "The sheet kinds" table.
fn readme_kinds(readme: &str) -> BTreeSet<String> {
    let start = readme.find("### The sheet kinds").expect("README has a section \"The sheet kinds\"");
    readme[start..]
        .lines()
        .skip_while(|l| !l.starts_with("| kind"))
        .skip(2)
        .take_while(|l| l.starts_with('|'))
        .filter_map(|l| l.split('|').nth(1))
        .filter_map(|cell| cell.split('`').nth(1).map(str::to_string))
        .collect()
}

#[test]
fn kinds_lists_every_kind_with_what_it_fits_and_every_field_it_reads() {
    let out = kinds_output();
    for kind in SheetKind::ALL {
        let def = kind.def();
        let head = format!("{}: {}\n  fits: {}\n", def.word(), def.title(), def.fits());
        assert!(out.contains(&head), "`raysheet kinds` lacks\n{head}in\n{out}");
        let block = out.split(&head).nth(1).expect("after the head");
        let block = block.split("\n\n").next().expect("the kind's block");
        for f in def.fields() {
            assert!(
                block.contains(&format!("  {}: ", f.name)),
                "{}: field {} not listed",
                def.word(),
                f.name
            );
        }
    }
    for f in SHARED_FIELDS {
        assert!(out.contains(&f.words()), "the shared field {} is not listed", f.name);
    }
    let want: BTreeSet<String> = SheetKind::ALL.iter().map(|k| k.as_str().to_string()).collect();
    assert_eq!(listed_kinds(&out), want);
}

#[test]
fn the_readme_lists_the_kinds_raysheet_kinds_lists() {
    let listed = listed_kinds(&kinds_output());
    let in_readme = readme_kinds(&readme());
    assert!(listed.len() >= 7, "kinds listed: {listed:?}");
    assert_eq!(
        in_readme, listed,
        "README.md's table of sheet kinds (left) differs from `raysheet kinds` (right)"
    );
}

/// Every kind has a picture in the README: an image whose alt text starts
/// with the kind's word, a PNG in docs/ that exists and is kept small.
#[test]
fn the_readme_shows_a_small_picture_of_every_kind() {
    let readme = readme();
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    for word in listed_kinds(&kinds_output()) {
        let marker = format!("![{word} ");
        let at = readme.find(&marker).unwrap_or_else(|| panic!("README has no picture `{marker}…`"));
        let rest = &readme[at..];
        let path = rest.split("](").nth(1).and_then(|r| r.split(')').next()).expect("an image path");
        assert!(path.starts_with("docs/") && path.ends_with(".png"), "{word}: {path}");
        let bytes = std::fs::metadata(root.join(path)).unwrap_or_else(|e| panic!("{path}: {e}")).len();
        assert!(bytes < 160_000, "{path} is {bytes} bytes; regenerate it at 80 dpi (DEVELOPERS.md)");
    }
}
