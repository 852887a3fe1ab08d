//! Safe folder names for groups: no path traversal, no reserved device names,
//! no control characters, and never two groups in one folder.

/// Names Windows reserves for devices, in any case and with any extension.
const RESERVED: &[&str] = &[
    "con", "prn", "aux", "nul", "com1", "com2", "com3", "com4", "com5", "com6", "com7", "com8", "com9",
    "lpt1", "lpt2", "lpt3", "lpt4", "lpt5", "lpt6", "lpt7", "lpt8", "lpt9",
];

/// Longest cleaned part of a folder name, characters.
const MAX_SLUG: usize = 32;

/// Cleans one name into ASCII letters, digits and single hyphens, lower case.
pub fn slug(name: &str) -> String {
    let mut out = String::new();
    for ch in name.chars() {
        let c = ch.to_ascii_lowercase();
        if c.is_ascii_alphanumeric() {
            out.push(c);
        } else if !out.ends_with('-') && !out.is_empty() {
            out.push('-');
        }
        if out.len() >= MAX_SLUG {
            break;
        }
    }
    let out = out.trim_matches('-').to_string();
    let stem = out.split('.').next().unwrap_or("");
    if out.is_empty() {
        "group".into()
    } else if RESERVED.contains(&stem) {
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

    #[test]
    fn hostile_names_become_safe_folders() {
        let names: Vec<String> =
            ["../x", "CON", "", "Bench A", "bench  a", "a\nb", &"z".repeat(300), "Élodie & Ünal"]
                .iter()
                .map(|s| s.to_string())
                .collect();
        let f = folder_names(&names);
        assert_eq!(f[0], "01-x");
        assert_eq!(f[1], "02-con-group");
        assert_eq!(f[2], "03-group");
        assert_eq!(f[3], "04-bench-a");
        assert_eq!(f[4], "05-bench-a");
        assert_eq!(f[5], "06-a-b");
        assert!(f[6].len() <= 3 + MAX_SLUG);
        assert_eq!(f[7], "08-lodie-nal");
        for name in &f {
            assert!(!name.contains('/') && !name.contains('\\') && !name.contains(".."));
            assert!(name.chars().all(|c| c.is_ascii_alphanumeric() || c == '-'));
        }
        let unique: std::collections::BTreeSet<&String> = f.iter().collect();
        assert_eq!(unique.len(), f.len());
    }
}
