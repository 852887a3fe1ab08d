//! A roster file's bytes as text: UTF-8 with or without a byte-order mark, or
//! UTF-16 (little- or big-endian) with one; anything else is refused at the
//! first byte that does not fit, by offset and line.
//!
//! Spreadsheets save a roster in one of these (common practice, no source):
//! "CSV UTF-8" is UTF-8 with a byte-order mark, "Unicode text" is UTF-16
//! little-endian with a byte-order mark and tab separated, a plain "CSV" is in
//! the machine's old code page (Latin-1 or Windows-1252 in much of Europe),
//! which cannot be told apart from other 8-bit code pages and so is refused.

use super::roster::RosterError;

/// U+FEFF as UTF-8: EF BB BF. The byte-order marks here are those listed in
/// The Unicode Standard, §23.8 "Specials", under "Byte Order Mark (BOM)".
const UTF8_BOM: &[u8] = &[0xEF, 0xBB, 0xBF];
/// U+FEFF as UTF-16 little-endian: FF FE.
const UTF16LE_BOM: &[u8] = &[0xFF, 0xFE];
/// U+FEFF as UTF-16 big-endian: FE FF.
const UTF16BE_BOM: &[u8] = &[0xFE, 0xFF];
/// U+FEFF as UTF-32 little-endian: FF FE 00 00 (so checked before UTF-16 LE).
const UTF32LE_BOM: &[u8] = &[0xFF, 0xFE, 0x00, 0x00];
/// U+FEFF as UTF-32 big-endian: 00 00 FE FF.
const UTF32BE_BOM: &[u8] = &[0x00, 0x00, 0xFE, 0xFF];

/// What to say about how to save the file again.
const SAVE_AS: &str =
    "save the roster from the spreadsheet as \"CSV UTF-8\" (or as \"Unicode text\"), then try again";

/// How the roster's bytes were written.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum RosterEncoding {
    /// UTF-8, with or without a byte-order mark.
    Utf8,
    /// UTF-16 little-endian, with a byte-order mark.
    Utf16Le,
    /// UTF-16 big-endian, with a byte-order mark.
    Utf16Be,
}

/// The roster's text without its byte-order mark, and how it was written;
/// line breaks are left as they are.
///
/// Refused, each with the file, the line and the byte offset: bytes that are
/// not UTF-8 when there is no UTF-16 byte-order mark (a Latin-1 file, say); a
/// NUL byte in UTF-8 text (UTF-16 without its mark, or not a text file); a
/// UTF-32 byte-order mark; an odd number of bytes or an unpaired surrogate in
/// UTF-16.
pub fn decode_roster(bytes: &[u8], file: &str) -> Result<(String, RosterEncoding), RosterError> {
    let err = |line: u64, message: String| RosterError { file: file.to_string(), line, message };
    if bytes.starts_with(UTF32LE_BOM) || bytes.starts_with(UTF32BE_BOM) {
        return Err(err(
            1,
            format!(
                "the file is UTF-32 text (byte-order mark at offset 0), which raysheet does not read; {SAVE_AS}"
            ),
        ));
    }
    if let Some(rest) = bytes.strip_prefix(UTF16LE_BOM) {
        return utf16(rest, u16::from_le_bytes, file).map(|t| (t, RosterEncoding::Utf16Le));
    }
    if let Some(rest) = bytes.strip_prefix(UTF16BE_BOM) {
        return utf16(rest, u16::from_be_bytes, file).map(|t| (t, RosterEncoding::Utf16Be));
    }
    let (rest, start) = match bytes.strip_prefix(UTF8_BOM) {
        Some(rest) => (rest, UTF8_BOM.len()),
        None => (bytes, 0),
    };
    let text = std::str::from_utf8(rest).map_err(|e| {
        let at = e.valid_up_to();
        let line = line_at(&rest[..at]);
        let bad = rest[at..].iter().take(e.error_len().unwrap_or(rest.len() - at)).map(|b| format!("0x{b:02X}"));
        let bad: Vec<String> = bad.collect();
        err(
            line,
            format!(
                "the file is not UTF-8 text: byte {} at offset {} cannot be read (a Latin-1 or Windows-1252 file, perhaps); {SAVE_AS}",
                bad.join(" "),
                start + at
            ),
        )
    })?;
    if let Some(at) = text.find('\0') {
        return Err(err(
            line_at(&rest[..at]),
            format!(
                "a NUL byte at offset {} (UTF-16 text without its byte-order mark, or not a text file); {SAVE_AS}",
                start + at
            ),
        ));
    }
    Ok((text.to_string(), RosterEncoding::Utf8))
}

/// The 1-based line of the byte just after `before`.
fn line_at(before: &[u8]) -> u64 {
    1 + before.iter().filter(|&&b| b == b'\n').count() as u64
}

/// UTF-16 code units (after a 2-byte mark) into text, or the offset and line
/// of the first that cannot be read.
fn utf16(bytes: &[u8], unit: fn([u8; 2]) -> u16, file: &str) -> Result<String, RosterError> {
    let err = |line: u64, message: String| RosterError { file: file.to_string(), line, message };
    let units = bytes.chunks_exact(2).map(|p| unit([p[0], p[1]]));
    let mut text = String::with_capacity(bytes.len() / 2);
    let mut line = 1;
    let mut at = UTF16LE_BOM.len();
    for c in char::decode_utf16(units) {
        match c {
            Ok('\0') => {
                return Err(err(
                    line,
                    format!("a NUL character at offset {at}, so this is not a text file; {SAVE_AS}"),
                ));
            }
            Ok(c) => {
                line += u64::from(c == '\n');
                at += 2 * c.len_utf16();
                text.push(c);
            }
            Err(e) => {
                return Err(err(
                    line,
                    format!(
                        "the UTF-16 text has a lone surrogate 0x{:04X} at offset {at}, so it cannot be read; {SAVE_AS}",
                        e.unpaired_surrogate()
                    ),
                ));
            }
        }
    }
    if bytes.len() % 2 == 1 {
        return Err(err(
            line,
            format!(
                "the UTF-16 text ends in half a character (an odd byte at offset {}); the file was cut short; {SAVE_AS}",
                at
            ),
        ));
    }
    Ok(text)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// `text` as UTF-16 with its byte-order mark, built with `encode_utf16`.
    fn utf16_bytes(text: &str, big_endian: bool) -> Vec<u8> {
        let mark: &[u8] = if big_endian { UTF16BE_BOM } else { UTF16LE_BOM };
        let mut out = mark.to_vec();
        for u in text.encode_utf16() {
            out.extend(if big_endian { u.to_be_bytes() } else { u.to_le_bytes() });
        }
        out
    }

    #[test]
    fn byte_order_marks_are_the_unicode_standards() {
        // The Unicode Standard, §23.8 (U+FEFF ZERO WIDTH NO-BREAK SPACE as a
        // byte order mark) and the UTF-8/16/32 encoding forms of §3.9: the
        // constants are U+FEFF encoded, checked here against Rust's encoders.
        let mut utf8 = [0u8; 3];
        assert_eq!('\u{FEFF}'.encode_utf8(&mut utf8).as_bytes(), UTF8_BOM);
        assert_eq!(utf16_bytes("", false), UTF16LE_BOM);
        assert_eq!(utf16_bytes("", true), UTF16BE_BOM);
        assert_eq!(0xFEFFu32.to_le_bytes(), UTF32LE_BOM);
        assert_eq!(0xFEFFu32.to_be_bytes(), UTF32BE_BOM);
    }

    #[test]
    fn utf8_with_and_without_its_mark() {
        let (t, e) = decode_roster("name\nÅsa\n".as_bytes(), "r.csv").unwrap();
        assert_eq!((t.as_str(), e), ("name\nÅsa\n", RosterEncoding::Utf8));
        let (t, e) = decode_roster(b"\xEF\xBB\xBFname\nBench A\n", "r.csv").unwrap();
        assert_eq!((t.as_str(), e), ("name\nBench A\n", RosterEncoding::Utf8));
    }

    #[test]
    fn utf16_both_byte_orders_with_a_surrogate_pair() {
        // U+1D11E (musical G clef) takes a surrogate pair in UTF-16.
        let text = "name\tbench\r\nΣοφία\t2\r\n\u{1D11E}\t3\r\n";
        for (big, enc) in [(false, RosterEncoding::Utf16Le), (true, RosterEncoding::Utf16Be)] {
            let (t, e) = decode_roster(&utf16_bytes(text, big), "r.txt").unwrap();
            assert_eq!((t.as_str(), e), (text, enc));
        }
    }

    #[test]
    fn latin1_is_refused_at_its_byte_and_line_with_the_way_out() {
        // "Bänk" in Latin-1: ä is 0xE4 (ISO/IEC 8859-1), not UTF-8 on its own.
        let e = decode_roster(b"name\nBench A\nB\xe4nk\n", "old.csv").unwrap_err();
        assert_eq!(e.line, 3);
        let s = e.to_string();
        assert!(s.starts_with("old.csv:3: field `name`: "), "{s}");
        assert!(s.contains("0xE4") && s.contains("offset 14") && s.contains("CSV UTF-8"), "{s}");
        // Behind a UTF-8 mark the offset still counts from the file's first byte.
        let e = decode_roster(b"\xEF\xBB\xBFname\n\xe9\n", "old.csv").unwrap_err();
        assert!(e.to_string().contains("offset 8") && e.line == 2, "{e}");
    }

    #[test]
    fn utf16_without_its_mark_and_utf32_are_refused() {
        let no_mark: Vec<u8> = "name\nA\n".encode_utf16().flat_map(u16::to_le_bytes).collect();
        let e = decode_roster(&no_mark, "r.txt").unwrap_err().to_string();
        assert!(e.contains("NUL byte at offset 1") && e.contains("byte-order mark"), "{e}");
        let utf32: Vec<u8> = "\u{FEFF}name\n".chars().flat_map(|c| (c as u32).to_le_bytes()).collect();
        let e = decode_roster(&utf32, "r.txt").unwrap_err().to_string();
        assert!(e.contains("UTF-32") && e.contains("CSV UTF-8"), "{e}");
    }

    #[test]
    fn broken_utf16_is_refused_at_its_offset() {
        let mut cut = utf16_bytes("name\nA\n", false);
        cut.push(b'B');
        let e = decode_roster(&cut, "r.txt").unwrap_err();
        assert!(e.line == 3 && e.to_string().contains("odd byte at offset 16"), "{e}");
        // A high surrogate followed by a letter: unpaired.
        let mut lone = utf16_bytes("name\n", true);
        lone.extend([0xD8, 0x34, 0x00, 0x41]);
        let e = decode_roster(&lone, "r.txt").unwrap_err();
        assert!(e.line == 2 && e.to_string().contains("0xD834 at offset 12"), "{e}");
    }
}
