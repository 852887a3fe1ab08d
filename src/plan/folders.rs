//! Safe folder names for groups: the name's letters and digits in any script,
//! in Unicode NFC, lower case, with no path separator, control or invisible
//! formatting character, no leading or trailing dot or space, no reserved
//! device name, and never two groups in one folder.

use unicode_normalization::UnicodeNormalization;
use unicode_normalization::char::is_combining_mark;

/// Names Windows reserves for devices, in any case and with any extension,
/// superscript digits included (Microsoft, "Naming Files, Paths, and
/// Namespaces").
const RESERVED: &[&str] = &[
    "con",
    "prn",
    "aux",
    "nul",
    "com1",
    "com2",
    "com3",
    "com4",
    "com5",
    "com6",
    "com7",
    "com8",
    "com9",
    "com\u{b9}",
    "com\u{b2}",
    "com\u{b3}",
    "lpt1",
    "lpt2",
    "lpt3",
    "lpt4",
    "lpt5",
    "lpt6",
    "lpt7",
    "lpt8",
    "lpt9",
    "lpt\u{b9}",
    "lpt\u{b2}",
    "lpt\u{b3}",
];

/// Longest cleaned part of a folder name, characters (at most 4 bytes each in
/// UTF-8, so far below the 255-byte file-name limit of common file systems).
const MAX_SLUG: usize = 32;

/// Characters left out of a folder name without a trace: control characters
/// other than white space (a tab or line break parts words, as a space does)
/// and the Default_Ignorable_Code_Point set of the Unicode Character Database
/// (DerivedCoreProperties.txt): the soft hyphen, zero-width spaces and
/// joiners, bidirectional marks, embeddings, overrides and isolates, the byte
/// order mark, variation selectors, Hangul fillers and tags, which print as
/// nothing and would make two folder names look alike; and the interlinear
/// annotation marks U+FFF9..U+FFFB (format characters, general category Cf).
fn is_dropped(c: char) -> bool {
    (c.is_control() && !c.is_whitespace())
        || matches!(c,
            '\u{00AD}' | '\u{034F}' | '\u{061C}' | '\u{115F}'..='\u{1160}' | '\u{17B4}'..='\u{17B5}'
            | '\u{180B}'..='\u{180F}' | '\u{200B}'..='\u{200F}' | '\u{202A}'..='\u{202E}'
            | '\u{2060}'..='\u{206F}' | '\u{3164}' | '\u{FE00}'..='\u{FE0F}' | '\u{FEFF}' | '\u{FFA0}'
            | '\u{FFF0}'..='\u{FFFB}' | '\u{1BCA0}'..='\u{1BCA3}' | '\u{1D173}'..='\u{1D17A}'
            | '\u{E0000}'..='\u{E0FFF}')
}

/// Cleans one name into a folder name part: letters and digits of any script
/// (with the combining marks that follow them) in lower case and Unicode NFC
/// (UAX #15), single hyphens for anything else (spaces, punctuation, path
/// separators, dots), and nothing for the characters [`is_dropped`] names.
/// An empty result is `group`; a Windows device name gets `-group` after it.
pub fn slug(name: &str) -> String {
    let mut out = String::new();
    let mut count = 0;
    for ch in name.nfc().filter(|&c| !is_dropped(c)) {
        if count >= MAX_SLUG {
            break;
        }
        if ch.is_alphanumeric() || (is_combining_mark(ch) && !out.is_empty() && !out.ends_with('-')) {
            for c in ch.to_lowercase() {
                out.push(c);
                count += 1;
            }
        } else if !out.ends_with('-') && !out.is_empty() {
            out.push('-');
            count += 1;
        }
    }
    let out: String = out.trim_matches('-').nfc().collect();
    if out.is_empty() {
        "group".into()
    } else if RESERVED.contains(&out.as_str()) {
        format!("{out}-group")
    } else {
        out
    }
}

/// Folder names for the groups, in order: a two-digit position, then the
/// cleaned name (`01-bench-a`). The position keeps folders distinct even when
/// two names clean alike, and keeps them in class order.
pub fn folder_names(names: &[String]) -> Vec<String> {
    names.iter().enumerate().map(|(i, n)| format!("{:02}-{}", i + 1, slug(n))).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn strings(names: &[&str]) -> Vec<String> {
        names.iter().map(|s| s.to_string()).collect()
    }

    #[test]
    fn hostile_names_become_safe_folders() {
        let names =
            strings(&["../x", "CON", "", "Bench A", "bench  a", "a\nb", &"z".repeat(300), "Élodie & Ünal"]);
        let f = folder_names(&names);
        assert_eq!(f[0], "01-x");
        assert_eq!(f[1], "02-con-group");
        assert_eq!(f[2], "03-group");
        assert_eq!(f[3], "04-bench-a");
        assert_eq!(f[4], "05-bench-a");
        assert_eq!(f[5], "06-a-b");
        assert_eq!(f[6], format!("07-{}", "z".repeat(MAX_SLUG)));
        assert_eq!(f[7], "08-élodie-ünal");
        for name in &f {
            assert!(!name.contains('/') && !name.contains('\\') && !name.contains(".."));
            assert!(name.chars().all(|c| c.is_alphanumeric() || c == '-'));
        }
        let unique: std::collections::BTreeSet<&String> = f.iter().collect();
        assert_eq!(unique.len(), f.len());
    }

    #[test]
    fn decomposed_and_precomposed_accents_give_one_folder() {
        // UAX #15: NFC of U+0065 U+0301 is U+00E9; of U+0041 U+030A is U+00C5
        // (lower-cased here to U+00E5).
        assert_eq!(slug("Ren\u{0065}\u{0301}e"), "ren\u{00E9}e");
        assert_eq!(slug("Ren\u{00E9}e"), "ren\u{00E9}e");
        assert_eq!(slug("\u{0041}\u{030A}sa"), "\u{00E5}sa");
        // A letter with no precomposed form keeps its combining mark
        // (U+0071 U+0307: q with dot above stays two code points in NFC).
        assert_eq!(slug("Q\u{0307}i"), "q\u{0307}i");
        // A mark with no letter before it is not a name part.
        assert_eq!(slug("\u{0301}Bench"), "bench");
    }

    #[test]
    fn letters_of_every_script_stay_in_folder_names() {
        assert_eq!(slug("Αθηνά 3"), "αθηνά-3");
        assert_eq!(slug("Москва-Б"), "москва-б");
        assert_eq!(slug("東京 ベンチ"), "東京-ベンチ");
        assert_eq!(slug("नमस्ते"), "नमस्ते", "Devanagari vowel signs are combining marks and stay");
        assert_eq!(slug("Ødegård & Søn"), "ødegård-søn");
    }

    #[test]
    fn invisible_and_direction_characters_are_dropped_from_folders() {
        // Zero-width space, joiner, word joiner, BOM, soft hyphen, bidi
        // override and isolate, variation selector, tag: Default_Ignorable_Code_Point.
        for hidden in [
            '\u{200B}',
            '\u{200D}',
            '\u{2060}',
            '\u{FEFF}',
            '\u{00AD}',
            '\u{202E}',
            '\u{2067}',
            '\u{FE0F}',
            '\u{E0041}',
        ] {
            assert_eq!(slug(&format!("{hidden}Ben{hidden}ch{hidden}")), "bench", "U+{:04X}", hidden as u32);
        }
        assert_eq!(slug("\u{3164}"), "group", "a Hangul filler is a letter that prints as nothing");
        assert_eq!(slug("a\u{0007}b\u{001B}c"), "abc");
    }

    #[test]
    fn path_parts_dots_and_device_names_never_survive() {
        assert_eq!(slug("..\\..\\Windows"), "windows");
        assert_eq!(slug(" .hidden. "), "hidden");
        assert_eq!(slug("C:/x|y*z?"), "c-x-y-z");
        assert_eq!(slug("nul"), "nul-group");
        assert_eq!(
            slug("COM\u{00B9}"),
            "com\u{00B9}-group",
            "Windows reserves COM with a superscript digit too"
        );
        assert_eq!(slug("LPT9.txt"), "lpt9-txt");
        assert_eq!(slug("Console"), "console");
    }

    #[test]
    fn folders_stay_distinct_ignoring_case_whatever_the_names() {
        let names = strings(&[
            "Bench A",
            "BENCH A",
            "bench-a",
            "Σ",
            "σ",
            "ς",
            "Ren\u{00E9}e",
            "Ren\u{0065}\u{0301}e",
            "\u{200B}",
        ]);
        let f = folder_names(&names);
        let lower: std::collections::BTreeSet<String> = f.iter().map(|n| n.to_lowercase()).collect();
        assert_eq!(lower.len(), f.len(), "{f:?}");
        assert_eq!(f[6][3..], f[7][3..], "the two spellings of Renée clean alike");
    }
}
