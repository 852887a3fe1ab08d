//! Roster files as spreadsheets save them (issue 9, "Rosters"), through the
//! real binary: comma, semicolon and tab separated; UTF-8 with and without a
//! byte-order mark; UTF-16 LE and BE with one; refusals of other encodings and
//! of rows a separator would cut short; group folders that keep every script's
//! letters in NFC.

use std::collections::BTreeSet;
use std::path::Path;

use unicode_normalization::is_nfc;

mod common {
    pub mod cli;
}
use common::cli::{assert_code, fixture_path, raysheet, text};

/// `text` as UTF-16 with its byte-order mark (FF FE little-endian, FE FF
/// big-endian: The Unicode Standard, §23.8), built with `encode_utf16`.
fn utf16(text: &str, big_endian: bool) -> Vec<u8> {
    let mut out = if big_endian { vec![0xFE, 0xFF] } else { vec![0xFF, 0xFE] };
    for u in text.encode_utf16() {
        out.extend(if big_endian { u.to_be_bytes() } else { u.to_le_bytes() });
    }
    out
}

/// The group names `solve --json` prints for the class-set fixture with the
/// roster `bytes`, in order, one per group (the fixture has one sheet); or
/// the exit code and standard error when it refuses.
fn solve_groups(bytes: &[u8], file: &str) -> Result<Vec<String>, (Option<i32>, String)> {
    let tmp = tempfile::tempdir().unwrap();
    std::fs::write(tmp.path().join(file), bytes).unwrap();
    let kit = fixture_path("class_trio.toml");
    let out = raysheet(&["solve", "--json", &kit, "--roster", file], tmp.path());
    if out.status.code() != Some(0) {
        return Err((out.status.code(), text(&out.stderr)));
    }
    let json: serde_json::Value = serde_json::from_slice(&out.stdout).expect("solve --json prints JSON");
    Ok(json["sheets"].as_array().unwrap().iter().map(|s| s["group"].as_str().unwrap().to_string()).collect())
}

/// The one line of standard error of a refused roster, checked to be exit 2.
fn refusal(bytes: &[u8], file: &str) -> String {
    let (code, stderr) = solve_groups(bytes, file).expect_err("the roster is refused");
    assert_eq!(code, Some(2), "{stderr}");
    assert!(!stderr.contains("panicked"), "{stderr}");
    stderr
}

#[test]
fn semicolon_roster_from_a_decimal_comma_spreadsheet() {
    // Common practice, no source: where the decimal mark is a comma,
    // spreadsheets save "CSV" with semicolons. The third column's `0,75` is data.
    let roster = "bench;name;stool height\n1;Fensterbank;0,75\n2;\"Spüle; links\";0,75\n3;Tafel;0,8\n";
    assert_eq!(
        solve_groups(roster.as_bytes(), "klasse.csv").unwrap(),
        ["Fensterbank", "Spüle; links", "Tafel"]
    );
}

#[test]
fn tab_roster_keeps_commas_in_names() {
    let roster = "name\troom\nSmith, J.\tL5\nOkafor, A.\tL5\n";
    assert_eq!(solve_groups(roster.as_bytes(), "benches.tsv").unwrap(), ["Smith, J.", "Okafor, A."]);
}

#[test]
fn quoted_comma_names_are_kept_whole() {
    // RFC 4180 §2, rule 6: a field holding a comma is enclosed in double quotes.
    let roster = "name,room\n\"Smith, J.\",L5\n\"Hale, R. & Ng, T.\",L5\n";
    assert_eq!(solve_groups(roster.as_bytes(), "r.csv").unwrap(), ["Smith, J.", "Hale, R. & Ng, T."]);
}

#[test]
fn utf8_byte_order_mark_roster() {
    // EF BB BF, U+FEFF in UTF-8 (The Unicode Standard, §23.8): what a
    // spreadsheet's "CSV UTF-8" starts with (common practice, no source).
    let mut bytes = vec![0xEF, 0xBB, 0xBF];
    bytes.extend("name,room\r\nÅsa,L5\r\nBench 2,L5\r\n".as_bytes());
    assert_eq!(solve_groups(&bytes, "r.csv").unwrap(), ["Åsa", "Bench 2"]);
}

#[test]
fn utf16_le_and_be_rosters() {
    // A spreadsheet's "Unicode text": UTF-16 with a byte-order mark, tab
    // separated, CRLF line ends (common practice, no source).
    let roster = "name\troom\r\nΣοφία, Π.\tL5\r\nМаша\tL5\r\nBench 3\tL5\r\n";
    for big_endian in [false, true] {
        let groups = solve_groups(&utf16(roster, big_endian), "r.txt").unwrap();
        assert_eq!(groups, ["Σοφία, Π.", "Маша", "Bench 3"], "big-endian: {big_endian}");
    }
}

#[test]
fn latin1_roster_is_refused_with_the_save_as_hint() {
    // "Zoë" in Latin-1: ë is the single byte 0xEB (ISO/IEC 8859-1); in UTF-8
    // 0xEB starts a three-byte sequence, which `,` cannot continue (RFC 3629).
    let stderr = refusal(b"name,room\nBench 1,L5\nZo\xEB,L5\n", "latin1.csv");
    assert!(
        stderr.contains("latin1.csv:3: field `name`: the file is not UTF-8 text: byte 0xEB at offset 23"),
        "{stderr}"
    );
    assert!(stderr.contains("\"CSV UTF-8\""), "{stderr}");
}

#[test]
fn unquoted_comma_in_a_name_is_refused_at_its_line() {
    // Before issue 9 this row became the group "Smith" without a word.
    let stderr = refusal(b"name\nBench 1\nSmith, J.\n", "r.csv");
    assert!(
        stderr.contains(
            "r.csv:3: field `name`: this row has 2 comma-separated fields but the header has 1 (name)"
        ),
        "{stderr}"
    );
    assert!(stderr.contains("double quotes, such as \"Smith, J.\""), "{stderr}");
}

#[test]
fn names_the_font_cannot_print_are_refused_at_their_row() {
    // DejaVu Sans has no CJK ideographs (U+5317 北), so the sheet could not
    // print the name: refused, as before issue 9.
    let stderr = refusal("name\nBench 1\n北 bench\n".as_bytes(), "r.csv");
    assert!(stderr.contains("r.csv:3: field `name`: ") && stderr.contains("U+5317"), "{stderr}");
}

#[test]
fn a_decomposed_accent_is_the_same_name_as_the_precomposed_one() {
    // UAX #15: NFC of U+0065 U+0301 is U+00E9.
    let stderr = refusal("name\nRen\u{00E9}e\nRene\u{0301}e\n".as_bytes(), "r.csv");
    assert!(
        stderr.contains("r.csv:3: field `name`: the group name \"Renée\" is given twice (first on line 2"),
        "{stderr}"
    );
}

/// The folder names under `dir/groups`.
fn group_folders(dir: &Path) -> BTreeSet<String> {
    std::fs::read_dir(dir.join("groups"))
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().expect("folder names are UTF-8"))
        .collect()
}

#[test]
fn group_folders_keep_greek_cyrillic_and_accents_in_nfc() {
    let tmp = tempfile::tempdir().unwrap();
    // Tab separated UTF-16 LE, one name typed with a combining accent.
    let roster = "name\r\nΣοφία, Π.\r\nМаша\r\nRene\u{0301}e\r\nBench 4\r\n";
    std::fs::write(tmp.path().join("r.txt"), utf16(roster, false)).unwrap();
    let dir = tmp.path().join("class");
    let kit = fixture_path("class_trio.toml");
    let args = ["build", &kit, "--out", dir.to_str().unwrap(), "--roster", "r.txt", "--format", "pdf"];
    assert_code(&raysheet(&args, tmp.path()), 0);
    let folders = group_folders(&dir);
    let want: BTreeSet<String> =
        ["01-σοφία-π", "02-маша", "03-ren\u{00E9}e", "04-bench-4"].iter().map(|s| s.to_string()).collect();
    assert_eq!(folders, want);
    for f in &folders {
        assert!(is_nfc(f), "{f:?} is in NFC (UAX #15)");
        assert!(dir.join("groups").join(f).join("sheets.pdf").is_file(), "{f}");
    }
    // The summary names the group as NFC text too.
    let summary = std::fs::read_to_string(dir.join("summary.csv")).unwrap();
    assert!(summary.contains("Ren\u{00E9}e") && !summary.contains("e\u{0301}"), "{summary}");
}
