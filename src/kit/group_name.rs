//! Whether a class-set group name can be printed on a sheet: the one check
//! shared by the kit's `[class] names` and a `--roster` file.

use unicode_normalization::UnicodeNormalization;

/// Longest group name printed on a sheet, characters.
pub const MAX_NAME_CHARS: usize = 40;

/// A group name as raysheet keeps it: without surrounding spaces and in
/// Unicode Normalization Form C (UAX #15), so `e` + U+0301 and `é`, which
/// print alike, are one name, printed and compared as `é`.
pub fn normal_group_name(raw: &str) -> String {
    raw.trim().nfc().collect()
}

/// Why a group name cannot be used, or `None` if it can.
pub fn group_name_problem(name: &str) -> Option<String> {
    if name.is_empty() {
        return Some("a group name is empty".into());
    }
    if name.chars().any(char::is_control) {
        return Some(format!("group name {name:?} contains a control character (a newline or tab, say)"));
    }
    if let Some(c) = crate::font::invisible_char(name) {
        return Some(format!(
            "group name {name:?} contains an invisible character (U+{:04X}: a zero-width space or joiner, or a right-to-left or other direction mark) that would make it print like another name; type the name again without it",
            c as u32
        ));
    }
    let n = name.chars().count();
    if n > MAX_NAME_CHARS {
        return Some(format!("group name is {n} characters long; at most {MAX_NAME_CHARS} fit on a sheet"));
    }
    let missing = crate::font::unsupported_chars(name);
    if !missing.is_empty() {
        let list: Vec<String> = missing.iter().map(|c| format!("'{c}' (U+{:04X})", *c as u32)).collect();
        return Some(format!(
            "group name {name:?} has characters the shipped font cannot print: {}",
            list.join(", ")
        ));
    }
    None
}
