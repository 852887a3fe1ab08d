//! Reading a roster as spreadsheets save one: a header row with a `name`
//! column, then one group per row, separated by commas, semicolons or tabs.

use super::roster_text::{RosterEncoding, decode_roster};
use crate::kit::{MAX_GROUPS, group_name_problem, normal_group_name};

/// A problem in a roster file, located.
#[derive(Clone, Debug, PartialEq)]
pub struct RosterError {
    /// File name as given.
    pub file: String,
    /// 1-based line (0 when the whole file is at fault).
    pub line: u64,
    /// What is wrong and what would be accepted.
    pub message: String,
}

impl std::fmt::Display for RosterError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        if self.line > 0 {
            write!(f, "{}:{}: field `name`: {}", self.file, self.line, self.message)
        } else {
            write!(f, "{}: {}", self.file, self.message)
        }
    }
}

impl std::error::Error for RosterError {}

/// The field separators a roster may use, in the order a tie is settled: a
/// tab first (spreadsheets' "Unicode text"), then a semicolon (their CSV where
/// the decimal mark is a comma), then a comma (common practice, no source).
const SEPARATORS: [u8; 3] = [b'\t', b';', b','];

/// A separator's name in messages.
fn separator_word(sep: u8) -> &'static str {
    match sep {
        b'\t' => "tab",
        b';' => "semicolon",
        _ => "comma",
    }
}

/// The group names in a roster file's bytes: UTF-8 (a byte-order mark
/// allowed) or UTF-16 with a byte-order mark, as [`decode_roster`] reads them,
/// then [`parse_roster`]'s rules. A one-column UTF-16 file is taken as tab
/// separated (a spreadsheet's "Unicode text"), a one-column UTF-8 file as
/// comma separated.
pub fn read_roster(bytes: &[u8], file: &str) -> Result<Vec<String>, RosterError> {
    let (text, encoding) = decode_roster(bytes, file)?;
    let fallback = if encoding == RosterEncoding::Utf8 { b',' } else { b'\t' };
    parse_with(&text, file, fallback)
}

/// The group names in a roster's text, in Unicode NFC without surrounding
/// spaces (a leading byte-order mark is dropped).
///
/// The header row names the columns; the separator is the one of tab,
/// semicolon and comma that splits it into the most columns with one of them
/// `name` (any case), a comma when the header is one column. Fields may be
/// quoted as RFC 4180 §2 says (`"Smith, J."` stays whole). Rows with nothing in
/// them are skipped. Refused, at the row's line: a row with more fields than
/// the header (an unquoted separator inside a name would cut it short), a row
/// without its `name` field, a name [`group_name_problem`] refuses, a name given
/// twice (after NFC), more than [`MAX_GROUPS`] names.
pub fn parse_roster(text: &str, file: &str) -> Result<Vec<String>, RosterError> {
    parse_with(text, file, b',')
}

/// [`parse_roster`] with the separator for a one-column header.
fn parse_with(text: &str, file: &str, fallback: u8) -> Result<Vec<String>, RosterError> {
    let err = |line: u64, message: String| RosterError { file: file.to_string(), line, message };
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    // Old Mac line ends (a lone CR) count as line breaks, so lines are counted
    // as an editor shows them (common practice, no source).
    let text = text.replace("\r\n", "\n").replace('\r', "\n");
    let header = Header::find(&text, fallback).map_err(|(line, message)| err(line, message))?;
    let columns = header.fields.len();
    let sep = separator_word(header.sep);
    let mut reader = reader(&text, header.sep);
    let mut names: Vec<(String, u64)> = Vec::new();
    for rec in reader.records() {
        let rec =
            rec.map_err(|e| err(e.position().map(|p| p.line()).unwrap_or(0), format!("not valid CSV: {e}")))?;
        let line = rec.position().map(|p| p.line()).unwrap_or(0);
        if line <= header.line || rec.iter().all(|f| f.trim().is_empty()) {
            continue;
        }
        if rec.len() > columns {
            let example = if header.sep == b'\t' {
                "type the name without tabs".to_string()
            } else {
                let s = char::from(header.sep);
                format!("a name with a {sep} in it goes in double quotes, such as \"Smith{s} J.\" (RFC 4180)")
            };
            return Err(err(
                line,
                format!(
                    "this row has {} {sep}-separated fields but the header has {columns} ({}); {example}, or add the extra column to the header",
                    rec.len(),
                    header.fields.join(", ")
                ),
            ));
        }
        let Some(raw) = rec.get(header.name) else {
            return Err(err(
                line,
                format!(
                    "this row has {} {sep}-separated fields, so no `name` (column {} of {columns}: {}); give every row its name in that column",
                    rec.len(),
                    header.name + 1,
                    header.fields.join(", ")
                ),
            ));
        };
        let name = normal_group_name(raw);
        if let Some(problem) = group_name_problem(&name) {
            return Err(err(line, format!("{problem}; give a short printable name, such as Bench A")));
        }
        if let Some((_, first)) = names.iter().find(|(n, _)| *n == name) {
            return Err(err(
                line,
                format!(
                    "the group name {name:?} is given twice (first on line {first}; names are compared in Unicode NFC, so an accent typed two ways is one name); give every group its own name"
                ),
            ));
        }
        names.push((name, line));
        if names.len() > MAX_GROUPS {
            return Err(err(
                line,
                format!("more than {MAX_GROUPS} groups; raysheet makes at most {MAX_GROUPS} per class set"),
            ));
        }
    }
    if names.is_empty() {
        return Err(err(
            0,
            "the roster has no names; add one group name per line under the `name` header".into(),
        ));
    }
    Ok(names.into_iter().map(|(n, _)| n).collect())
}

/// A CSV reader over `text` with `sep` between fields, every row as a record
/// (the header too) and rows of any length.
fn reader(text: &str, sep: u8) -> csv::Reader<&[u8]> {
    csv::ReaderBuilder::new().has_headers(false).flexible(true).delimiter(sep).from_reader(text.as_bytes())
}

/// The header row as read with the separator chosen for it.
struct Header {
    /// The separator.
    sep: u8,
    /// Its line, 1-based.
    line: u64,
    /// Its fields, trimmed.
    fields: Vec<String>,
    /// Which field is `name`, from 0.
    name: usize,
}

impl Header {
    /// The header read with each separator; the one that finds a single `name`
    /// column among the most columns wins, `fallback` when all find one.
    fn find(text: &str, fallback: u8) -> Result<Header, (u64, String)> {
        let mut best: Option<Header> = None;
        let mut widest: (u64, Vec<String>) = (1, Vec::new());
        for sep in std::iter::once(fallback).chain(SEPARATORS) {
            let Some(rec) = reader(text, sep).records().next() else {
                return Err((
                    0,
                    "the roster is empty; the first line must name the columns, such as `name`".into(),
                ));
            };
            let rec = rec.map_err(|e| (1, format!("cannot read the header row: {e}")))?;
            let line = rec.position().map(|p| p.line()).unwrap_or(1);
            let fields: Vec<String> = rec.iter().map(|f| f.trim().to_string()).collect();
            let named: Vec<usize> =
                (0..fields.len()).filter(|&i| fields[i].eq_ignore_ascii_case("name")).collect();
            if named.len() > 1 {
                return Err((
                    line,
                    format!(
                        "the header row has {} `name` columns ({}); keep one, and rename the others",
                        named.len(),
                        fields.join(", ")
                    ),
                ));
            }
            if fields.len() > widest.1.len() {
                widest = (line, fields.clone());
            }
            let wider = best.as_ref().is_none_or(|b| fields.len() > b.fields.len());
            if let (Some(&name), true) = (named.first(), wider) {
                best = Some(Header { sep, line, fields, name });
            }
        }
        best.ok_or_else(|| {
            (
                widest.0,
                format!(
                    "the header row has no `name` column (found: {}); the first line must name the columns, such as `name` or `name,room`, separated by commas, semicolons or tabs",
                    widest.1.join(", ")
                ),
            )
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn names(text: &str) -> Vec<String> {
        parse_roster(text, "r.csv").unwrap_or_else(|e| panic!("{e}"))
    }

    fn error(text: &str) -> String {
        parse_roster(text, "r.csv").expect_err(text).to_string()
    }

    /// `text` as UTF-16 with its byte-order mark (FF FE or FE FF, The Unicode
    /// Standard §23.8), built with `encode_utf16`.
    fn utf16(text: &str, big_endian: bool) -> Vec<u8> {
        let mut out = if big_endian { vec![0xFE, 0xFF] } else { vec![0xFF, 0xFE] };
        for u in text.encode_utf16() {
            out.extend(if big_endian { u.to_be_bytes() } else { u.to_le_bytes() });
        }
        out
    }

    #[test]
    fn reads_names_exactly_and_rejects_hostile_ones() {
        let ok = parse_roster("name,room\nBench A,4\n\"Ødegård, K.\",4\n", "r.csv").unwrap();
        assert_eq!(ok, vec!["Bench A".to_string(), "Ødegård, K.".to_string()]);
        let e = parse_roster("name\nA\n\"two\nlines\"\n", "r.csv").unwrap_err();
        assert!(e.to_string().contains("r.csv:3"), "{e}");
        assert!(e.to_string().contains("control character"));
        // Blank rows are skipped, even one of bare separators (a spreadsheet
        // writes `,,` for an empty row of a three-column sheet).
        let e = parse_roster("name\nA\n,\n\"\"\n  \n\n", "r.csv");
        assert_eq!(e, Ok(vec!["A".to_string()]), "blank rows are skipped");
        let e = parse_roster(&format!("name\n{}\n", "x".repeat(300)), "r.csv").unwrap_err();
        assert!(e.to_string().contains("300 characters"), "{e}");
        assert!(parse_roster("group\nA\n", "r.csv").unwrap_err().to_string().contains("no `name` column"));
        assert!(
            parse_roster("name\nA\nA\n", "r.csv")
                .unwrap_err()
                .to_string()
                .contains("given twice (first on line 2")
        );
    }

    #[test]
    fn semicolon_roster_with_comma_in_its_other_columns() {
        // A spreadsheet where the decimal mark is a comma saves CSV with
        // semicolons (common practice, no source); the comma in `2,5` is data.
        let text = "room;name;bench width\nL4;Bench Nord;2,5\nL4;Παγκάκι Δ;2,5\n";
        assert_eq!(names(text), ["Bench Nord", "Παγκάκι Δ"]);
        // A quoted name keeps its semicolon (RFC 4180 §2, with `;` as separator).
        assert_eq!(names("name;room\n\"Ash; Birch\";L4\n"), ["Ash; Birch"]);
    }

    #[test]
    fn tab_roster_keeps_commas_and_semicolons_in_names() {
        let text = "name\troom\nSmith, J.\tL2\nBench; east\tL2\n";
        assert_eq!(names(text), ["Smith, J.", "Bench; east"]);
    }

    #[test]
    fn quoted_comma_names_are_kept_whole() {
        // RFC 4180 §2, rules 5 and 6: a field in double quotes may hold the
        // separator, and "" inside quotes is one quote mark.
        let text = "name,room\n\"Smith, J.\",L1\n\"The \"\"Owls\"\", Y9\",L1\n";
        assert_eq!(names(text), ["Smith, J.", "The \"Owls\", Y9"]);
    }

    #[test]
    fn unquoted_comma_in_a_name_is_refused_not_cut_short() {
        // Before issue 9, `Smith, J.` under a one-column header became "Smith".
        let e = error("name\nBench A\nSmith, J.\n");
        assert!(
            e.starts_with(
                "r.csv:3: field `name`: this row has 2 comma-separated fields but the header has 1 (name)"
            ),
            "{e}"
        );
        assert!(e.contains("\"Smith, J.\""), "the hint shows the quoting: {e}");
        let e = error("name;room\nA;L1\nB;L1;extra\n");
        assert!(e.starts_with("r.csv:3: field `name`: this row has 3 semicolon-separated fields"), "{e}");
    }

    #[test]
    fn a_short_row_needs_its_name_field() {
        // A row may end before its trailing columns, but not before `name`.
        assert_eq!(names("name,room\nBench A\nBench B,L2\n"), ["Bench A", "Bench B"]);
        let e = error("room,name\nL1,Bench A\nL2\n");
        assert!(
            e.starts_with(
                "r.csv:3: field `name`: this row has 1 comma-separated fields, so no `name` (column 2 of 2"
            ),
            "{e}"
        );
    }

    #[test]
    fn header_chooses_the_separator_that_finds_name() {
        // `name;room` split at commas is one column called "name;room".
        assert_eq!(names("name;room\nA;1\n"), ["A"]);
        assert_eq!(names("\"Name\",Room\nA,1\n"), ["A"]);
        let e = error("group;room\nA;1\n");
        assert!(
            e.starts_with("r.csv:1: field `name`: the header row has no `name` column (found: group, room)"),
            "{e}"
        );
        let e = error("name,room,Name\nA,1,B\n");
        assert!(e.contains("2 `name` columns"), "{e}");
        assert!(parse_roster("", "r.csv").unwrap_err().to_string().contains("empty"));
    }

    #[test]
    fn crlf_and_lone_cr_line_ends_count_lines_as_an_editor_does() {
        assert_eq!(names("name\r\nA\r\nB\r\n"), ["A", "B"]);
        let e = error("name\rA\rA\r");
        assert!(e.starts_with("r.csv:3:"), "{e}");
    }

    #[test]
    fn utf8_byte_order_mark_is_not_part_of_the_header() {
        // EF BB BF is U+FEFF in UTF-8 (The Unicode Standard §23.8); a
        // spreadsheet's "CSV UTF-8" starts with it (common practice, no source).
        assert_eq!(read_roster(b"\xEF\xBB\xBFname\nBench A\n", "r.csv").unwrap(), ["Bench A"]);
        assert_eq!(names("\u{FEFF}name\nBench A\n"), ["Bench A"]);
    }

    #[test]
    fn utf16_unicode_text_both_byte_orders() {
        // A spreadsheet's "Unicode text": UTF-16 LE with a byte-order mark,
        // tab separated, CRLF line ends (common practice, no source).
        let text = "name\troom\r\nSmith, J.\tL1\r\nΣοφία\tL2\r\nМаша\tL2\r\n";
        for big in [false, true] {
            assert_eq!(read_roster(&utf16(text, big), "r.txt").unwrap(), ["Smith, J.", "Σοφία", "Маша"]);
        }
        // One column: tab separated, so the comma stays in the name.
        assert_eq!(read_roster(&utf16("name\r\nSmith, J.\r\n", false), "r.txt").unwrap(), ["Smith, J."]);
        // The same one-column file in UTF-8 is comma separated: refused, not cut.
        assert!(read_roster(b"name\nSmith, J.\n", "r.csv").is_err());
    }

    #[test]
    fn latin1_roster_is_refused_with_the_way_to_save_it() {
        // "Ödegård" in Latin-1 (ISO/IEC 8859-1: Ö = 0xD6, å = 0xE5).
        let e = read_roster(b"name\nBench A\n\xD6deg\xE5rd\n", "klasse.csv").unwrap_err().to_string();
        assert!(
            e.starts_with("klasse.csv:3: field `name`: the file is not UTF-8 text: byte 0xD6 at offset 13"),
            "{e}"
        );
        assert!(e.contains("save the roster") && e.contains("CSV UTF-8"), "{e}");
    }

    #[test]
    fn nfc_makes_a_decomposed_accent_the_same_name() {
        // UAX #15: U+0065 U+0301 (e, combining acute) has the NFC form U+00E9.
        let decomposed = "Ren\u{0065}\u{0301}e";
        assert_eq!(names(&format!("name\n{decomposed}\n")), ["Ren\u{00E9}e"]);
        let e = error(&format!("name\nRen\u{00E9}e\n{decomposed}\n"));
        assert!(
            e.starts_with("r.csv:3: field `name`: the group name \"Renée\" is given twice (first on line 2"),
            "{e}"
        );
        // Hangul: U+1100 U+1161 (conjoining jamo) compose to U+AC00 (UAX #15, Hangul
        // composition); the font lacks both forms, so the name is refused as
        // unprintable, naming the composed syllable.
        let e = error("name\n\u{1100}\u{1161}\n");
        assert!(e.contains("U+AC00") && e.contains("cannot print"), "{e}");
    }

    #[test]
    fn names_the_font_cannot_print_are_refused_at_their_row() {
        // DejaVu Sans has Greek and Cyrillic but no CJK ideographs.
        assert_eq!(names("name\nΑθηνά\nМосква\n"), ["Αθηνά", "Москва"]);
        let e = error("name\nΑθηνά\n東京\n");
        assert!(e.starts_with("r.csv:3: field `name`: ") && e.contains("U+6771"), "{e}");
    }

    #[test]
    fn any_bytes_give_names_or_a_located_error() {
        // A small deterministic sweep beside the fuzz target: truncations and
        // one-byte changes of a roster in each encoding never panic, and an
        // error names the file.
        let base = "name;room\n\"Smith; J.\";L1\nÅsa;L2\r\nΣοφία;L3\n";
        let mut inputs: Vec<Vec<u8>> = vec![base.as_bytes().to_vec(), utf16(base, false), utf16(base, true)];
        let mut more = Vec::new();
        for b in &inputs {
            for i in 0..b.len() {
                more.push(b[..i].to_vec());
                for v in [0x00, 0x0A, 0x22, 0x3B, 0x80, 0xFF] {
                    let mut c = b.clone();
                    c[i] = v;
                    more.push(c);
                }
            }
        }
        inputs.extend(more);
        for b in &inputs {
            match read_roster(b, "r.csv") {
                Ok(n) => assert!(!n.is_empty() && n.iter().all(|n| group_name_problem(n).is_none())),
                Err(e) => assert!(e.to_string().starts_with("r.csv"), "{e}"),
            }
        }
    }
}
