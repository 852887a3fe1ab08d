//! Issue 9: every printed word comes from the templates. A full translation
//! (every template string replaced by made-up words of the same lengths in
//! letters no English word uses) leaves no English on any sheet, key or
//! class summary page of the demo kit.

use std::collections::{BTreeMap, BTreeSet};

use raysheet::demo::DEMO_KIT;
use raysheet::layout::{self, TEMPLATE_FILES, Templates, shipped_template, summary_scene};
use raysheet::paper::{Orientation, PaperSize, PaperSpec};
use raysheet::plan::{Group, folder_names};
use raysheet::render::render_svg_page;
use raysheet::scene::Scene;
use raysheet::sheets::{Lesson, plan_class, plan_lesson};

const LOWER: [char; 7] = ['ž', 'ø', 'ł', 'đ', 'ŧ', 'ŋ', 'ħ'];
const UPPER: [char; 7] = ['Ž', 'Ø', 'Ł', 'Đ', 'Ŧ', 'Ŋ', 'Ħ'];

/// `s` with every ASCII letter outside `{placeholders}` replaced by a
/// non-English letter (the same case), so each word keeps its length.
fn pseudo(s: &str) -> String {
    let mut out = String::new();
    let mut in_slot = false;
    for (i, c) in s.chars().enumerate() {
        match c {
            '{' => in_slot = true,
            '}' => in_slot = false,
            _ => {}
        }
        out.push(match c {
            'a'..='z' if !in_slot => LOWER[(c as usize + i) % LOWER.len()],
            'A'..='Z' if !in_slot => UPPER[(c as usize + i) % UPPER.len()],
            _ => c,
        });
    }
    out
}

/// A template file with every string value translated: TOML basic strings
/// ("…") after `=` or in a list, with comments left alone (they are not printed).
fn translate_file(text: &str) -> String {
    let value: toml::Table = toml::from_str(text).expect("shipped templates are TOML");
    let mut out = toml::Table::new();
    for (k, v) in value {
        let v = match v {
            toml::Value::String(s) => toml::Value::String(pseudo(&s)),
            toml::Value::Array(a) => toml::Value::Array(
                a.into_iter()
                    .map(|x| match x {
                        toml::Value::String(s) => toml::Value::String(pseudo(&s)),
                        other => other,
                    })
                    .collect(),
            ),
            other => other,
        };
        out.insert(k, v);
    }
    toml::to_string(&out).expect("a table writes")
}

/// The words (runs of 4 or more ASCII letters, lower-cased) of the shipped
/// templates' strings, placeholder names left out.
fn shipped_words() -> BTreeSet<String> {
    let mut words = BTreeSet::new();
    for name in TEMPLATE_FILES {
        let table: toml::Table = toml::from_str(shipped_template(name).unwrap()).unwrap();
        let mut strings = Vec::new();
        for v in table.values() {
            match v {
                toml::Value::String(s) => strings.push(s.clone()),
                toml::Value::Array(a) => {
                    strings.extend(a.iter().filter_map(|x| x.as_str().map(String::from)))
                }
                _ => {}
            }
        }
        for s in strings {
            let mut no_slots = String::new();
            let mut in_slot = false;
            for c in s.chars() {
                match c {
                    '{' => in_slot = true,
                    '}' => {
                        in_slot = false;
                        no_slots.push(' ');
                    }
                    _ if !in_slot => no_slots.push(c),
                    _ => {}
                }
            }
            words.extend(ascii_words(&no_slots));
        }
    }
    words
}

/// Runs of 4 or more ASCII letters in `s`, lower-cased.
fn ascii_words(s: &str) -> Vec<String> {
    s.split(|c: char| !c.is_ascii_alphabetic())
        .filter(|w| w.len() >= 4)
        .map(|w| w.to_ascii_lowercase())
        .collect()
}

/// The text of every `<text>` element of an SVG page, unescaped.
fn svg_texts(svg: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut rest = svg;
    while let Some(open) = rest.find("<text") {
        let after = &rest[open..];
        let start = after.find('>').expect("a text element closes its tag") + 1;
        let end = after.find("</text>").expect("a text element ends");
        out.push(
            after[start..end]
                .replace("&lt;", "<")
                .replace("&gt;", ">")
                .replace("&quot;", "\"")
                .replace("&apos;", "'")
                .replace("&amp;", "&"),
        );
        rest = &after[end..];
    }
    out
}

/// A4, or A5 (148 × 210 mm, not among the named sizes).
fn paper(size: &str) -> PaperSpec {
    let size = PaperSize::named(size).unwrap_or_else(|| PaperSize::custom(148.0, 210.0));
    PaperSpec { size, orientation: Orientation::Auto, margin_mm: 10.0 }
}

/// Every page's text: (page name, text).
fn page_texts(scene: &Scene) -> Vec<(String, String)> {
    scene
        .pages
        .iter()
        .flat_map(|p| {
            let svg = render_svg_page(p, &scene.title).expect("the page renders");
            svg_texts(&svg).into_iter().map(|t| (p.name.clone(), t)).collect::<Vec<_>>()
        })
        .collect()
}

/// Every translated page of the demo kit: sheets and keys on A4 and on A5
/// (where the larger setups are tiled, so the tile notes print), and the
/// class summary of three groups.
fn translated_pages(t: &Templates, codes: &mut BTreeSet<String>) -> Vec<(String, String)> {
    let lesson = Lesson::from_toml(DEMO_KIT, "demo").expect("the demo kit is valid");
    let mut texts = Vec::new();
    for size in ["A4", "A5"] {
        let paper = paper(size);
        let plans = plan_lesson(&lesson, &paper);
        codes.extend(plans.iter().filter_map(|p| p.variant.as_ref().map(|v| v.to_ascii_lowercase())));
        let set = layout::layout(&lesson.kit.title, &plans, &paper, t).expect("the translated text fits");
        texts.extend(page_texts(&set.sheets));
        texts.extend(page_texts(&set.keys));
        if size == "A5" {
            assert!(
                set.keys.pages.len() > plans.len(),
                "some sheet is tiled on A5, so the tile words are checked"
            );
        }
    }
    let paper = paper("A4");
    let names: Vec<String> = ["Žø 1", "Žø 2", "Žø 3"].map(String::from).to_vec();
    let groups = names
        .iter()
        .cloned()
        .zip(folder_names(&names))
        .map(|(name, folder)| Group { name, folder })
        .collect();
    let class = plan_class(&lesson, &paper, groups, 4242);
    for plans in &class.plans {
        codes.extend(plans.iter().filter_map(|p| p.variant.as_ref().map(|v| v.to_ascii_lowercase())));
        let set = layout::layout(&lesson.kit.title, plans, &paper, t).expect("the translated text fits");
        texts.extend(page_texts(&set.sheets));
        texts.extend(page_texts(&set.keys));
    }
    texts.extend(page_texts(&summary_scene(&lesson.kit.title, &class, &paper, t)));
    texts
}

/// Words that may stay: the kit's own names and titles (the teacher wrote
/// them). Units ("mm"), symbols and ray letters are under four letters;
/// variant codes are added from the plans.
fn allowed() -> BTreeSet<String> {
    let lesson = Lesson::from_toml(DEMO_KIT, "demo").unwrap();
    let kit = &lesson.kit;
    let mut own = vec![kit.title.clone()];
    for p in &kit.pieces {
        own.push(p.id.clone());
        own.extend(p.label.clone());
    }
    // The ray box's colours as the kit names them, and the published sources
    // of its materials (an author's name and a journal stay as written).
    own.extend(kit.ray_box.colours.iter().map(|c| c.name.clone()));
    own.extend(kit.materials.values().filter_map(|m| m.source()).map(|p| p.citation.to_string()));
    own.iter().flat_map(|s| ascii_words(s)).collect()
}

fn translated() -> Templates {
    let overrides: BTreeMap<String, (String, String)> = TEMPLATE_FILES
        .iter()
        .map(|name| {
            let text = translate_file(shipped_template(name).unwrap());
            (name.to_string(), (format!("translated/{name}"), text))
        })
        .collect();
    Templates::with_overrides(&overrides).unwrap_or_else(|e| panic!("the translation is accepted: {e}"))
}

#[test]
fn a_full_translation_leaves_no_english_on_any_page() {
    let english = shipped_words();
    assert!(english.len() > 100, "the templates hold the printed words: {}", english.len());
    let mut allowed = allowed();
    // The variant codes printed in the identity box are codes, not words.
    let mut codes = BTreeSet::new();
    let pages = translated_pages(&translated(), &mut codes);
    assert!(codes.len() >= 8, "{codes:?}");
    allowed.extend(codes);
    assert!(pages.len() > 500, "text was found on the pages: {}", pages.len());
    let mut left: BTreeMap<String, BTreeSet<String>> = BTreeMap::new();
    for (page, text) in &pages {
        for w in ascii_words(text) {
            // A shipped English word, or any other run of ASCII letters: the
            // translation uses none, so it came from the code.
            if !allowed.contains(&w) {
                let tag = if english.contains(&w) { "" } else { " (not in templates)" };
                left.entry(format!("{w}{tag}")).or_default().insert(format!("{page}: {text:?}"));
            }
        }
    }
    let report: Vec<String> = left
        .iter()
        .map(|(w, at)| format!("{w}: {} (e.g. {})", at.len(), at.iter().next().unwrap()))
        .collect();
    assert!(left.is_empty(), "English left on the pages:\n{}", report.join("\n"));
}

#[test]
fn pseudo_words_keep_lengths_and_placeholders() {
    let s = "Lay {piece} on it: 12 mm (A).";
    let p = pseudo(s);
    assert!(p.contains("{piece}") && p.contains(" 12 ") && p.ends_with(")."), "{p}");
    assert_eq!(p.chars().count(), s.chars().count());
    assert!(ascii_words(&p.replace("{piece}", "")).is_empty(), "{p}");
    assert_eq!(ascii_words("Lens maker's, 10 mm ABCD"), ["lens", "maker", "abcd"]);
}

/// Edited key text that cannot fit above the table, even on a cover page of
/// its own (where a key too long for the page beside its drawing goes), is
/// refused, naming the words.toml line and key, never drawn over the table.
#[test]
fn key_text_too_long_is_refused_with_its_key() {
    let long = vec!["Ołžø øžł ħŧŋđ ž {value} ŋŧ."; 300].join(" ");
    let text = format!("lens_tolerances = \"{long}\"\n");
    let overrides = BTreeMap::from([("words.toml".to_string(), ("mine/words.toml".to_string(), text))]);
    let t = Templates::with_overrides(&overrides).expect("the file is valid");
    let lesson = Lesson::from_toml(DEMO_KIT, "demo").unwrap();
    let paper = paper("A4");
    let plans = plan_lesson(&lesson, &paper);
    let err = match layout::layout(&lesson.kit.title, &plans, &paper, &t) {
        Ok(_) => panic!("a key text of 300 sentences cannot fit"),
        Err(e) => e.to_string(),
    };
    assert!(err.starts_with("mine/words.toml:1:19: field `lens_tolerances`"), "{err}");
    assert!(err.contains("shorten it"), "{err}");
}

/// An edited drawing label too long for any place in its drawing is refused
/// with its key, not cut off by the drawing window.
#[test]
fn a_drawing_label_too_long_is_refused_with_its_key() {
    let long = vec!["łžø ħŧŋđ"; 40].join(" ");
    let text = format!("# mine\nflat_face = \"{long}\"\n");
    let overrides = BTreeMap::from([("words.toml".to_string(), ("mine/words.toml".to_string(), text))]);
    let t = Templates::with_overrides(&overrides).expect("the file is valid");
    let lesson = Lesson::from_toml(DEMO_KIT, "demo").unwrap();
    let paper = paper("A4");
    let plans = plan_lesson(&lesson, &paper);
    let err = match layout::layout(&lesson.kit.title, &plans, &paper, &t) {
        Ok(_) => panic!("a 359-character label cannot fit beside the flat face"),
        Err(e) => e.to_string(),
    };
    assert!(err.starts_with("mine/words.toml:2:13: field `flat_face`: the drawing label"), "{err}");
}
