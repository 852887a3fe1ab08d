//! Every class of bad kit gets a located error: the message names the file,
//! the line (and column where one value is to blame), the field path, and a
//! hint saying what would be accepted (issue 2, section 2). Then a property
//! test: no input, however malformed, makes parsing, planning or the answer
//! file panic.
//!
//! The kit below is this test's own invention (a bench at "Hollins Road
//! annexe"); no number comes from the issue text or the demo kit. Expected
//! lines and columns are found by searching the kit text itself, so the tests
//! say *which* text the error must point at.

use proptest::prelude::*;
use raysheet::demo;
use raysheet::kit::KitError;
use raysheet::output::answers;
use raysheet::sheets::Lesson;

const FILE: &str = "bench.toml";

const BASE: &str = r#"title = "Bench kit, Hollins Road annexe"

[materials.pmma]
index = 1.50

[[pieces]]
id = "hd33"
material = "pmma"
front = "flat"
back = { curve = "convex", radius_mm = 33 }
thickness_mm = 33
height_mm = 66

[[pieces]]
id = "cx90"
material = "pmma"
front = { curve = "convex", radius_mm = 90 }
back = { curve = "convex", radius_mm = 90 }
thickness_mm = 12
height_mm = 50

[[pieces]]
id = "pcx70"
material = "pmma"
front = { curve = "convex", radius_mm = 70 }
back = "flat"
thickness_mm = 9
height_mm = 44

[[pieces]]
id = "slab"
material = "pmma"
front = "flat"
back = "flat"
thickness_mm = 25
height_mm = 40

[[sheets]]
kind = "curved-face"
piece = "hd33"
heights_mm = [9, -9]

[[sheets]]
kind = "focal"
piece = "cx90"
"#;

/// The base kit is valid: every error below comes from the one change made.
#[test]
fn base_kit_is_valid() {
    let kit = Lesson::from_toml(BASE, FILE).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(kit.pieces.len(), 4);
    assert_eq!(kit.sheets.len(), 2);
}

/// `base` with the first occurrence of `from` replaced by `to` (which must exist).
fn edit(base: &str, from: &str, to: &str) -> String {
    assert!(base.contains(from), "the test kit has no {from:?}");
    base.replacen(from, to, 1)
}

/// 1-based line and column (characters) of the first occurrence of `needle`.
fn at(text: &str, needle: &str) -> (usize, usize) {
    let i = text.find(needle).unwrap_or_else(|| panic!("{needle:?} not in the kit"));
    let before = &text[..i];
    let line = before.matches('\n').count() + 1;
    let col = before.rsplit('\n').next().unwrap_or("").chars().count() + 1;
    (line, col)
}

/// 1-based line of the `n`th (1-based) occurrence of `needle`.
fn nth_line(text: &str, needle: &str, n: usize) -> usize {
    let (i, _) = text.match_indices(needle).nth(n - 1).unwrap_or_else(|| panic!("no {n}th {needle:?}"));
    text[..i].matches('\n').count() + 1
}

fn error(text: &str) -> KitError {
    match Lesson::from_toml(text, FILE) {
        Ok(_) => panic!("the kit was accepted:\n{text}"),
        Err(e) => e,
    }
}

/// Where an error must point and what its hint must say.
struct Expect<'a> {
    line: usize,
    /// `None` when the error is about a whole table (no one value to point at).
    col: Option<usize>,
    field: &'a str,
    /// Words the hint must contain (what would be accepted).
    hint: &'a [&'a str],
}

fn check(e: &KitError, x: Expect<'_>) -> String {
    let shown = e.to_string();
    let place = match x.col {
        Some(c) => format!("{FILE}:{}:{c}: ", x.line),
        None => format!("{FILE}:{}:", x.line),
    };
    assert!(shown.starts_with(&place), "expected the message to start with {place:?}:\n{shown}");
    assert_eq!(e.file, FILE);
    assert_eq!(e.line, x.line, "{shown}");
    if let Some(c) = x.col {
        assert_eq!(e.column, c, "{shown}");
    }
    assert_eq!(e.field, x.field, "{shown}");
    assert!(shown.contains(&format!("field `{}`", x.field)), "field path missing:\n{shown}");
    assert!(!e.hint.is_empty(), "no hint:\n{shown}");
    assert!(shown.contains("\n  hint: "), "hint not shown:\n{shown}");
    for w in x.hint {
        assert!(e.hint.contains(w), "hint lacks {w:?}:\n{shown}");
    }
    // The offending line is quoted under the message, with a caret.
    assert!(shown.contains(&format!("{} | {}", x.line, e.source_line)), "{shown}");
    assert!(shown.contains('^'), "{shown}");
    // No Rust type names leak into what a teacher reads.
    for leak in ["Raw", "struct ", "f64", "i64", "Spanned"] {
        assert!(!shown.contains(leak), "message shows {leak:?}:\n{shown}");
    }
    shown
}

// ---------------------------------------------------------------- unknown field

#[test]
fn unknown_field_suggests_the_nearest_known_name() {
    let text = edit(BASE, "thickness_mm = 33", "thicknes_mm = 33");
    let (line, col) = at(&text, "thicknes_mm");
    let shown = check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "pieces[1].thicknes_mm",
            hint: &["did you mean `thickness_mm`?", "accepted here:", "height_mm"],
        },
    );
    assert!(shown.contains("unknown field `thicknes_mm`"), "{shown}");
}

#[test]
fn unknown_field_far_from_any_name_lists_the_accepted_ones() {
    let text = edit(BASE, "height_mm = 50", "height_mm = 50\ncolour = \"blue\"");
    let (line, col) = at(&text, "colour");
    let e = error(&text);
    check(
        &e,
        Expect {
            line,
            col: Some(col),
            field: "pieces[2].colour",
            hint: &[
                "accepted here: id, label, material, shape, front, back, thickness_mm, height_mm, apex_deg, side_mm",
            ],
        },
    );
    assert!(!e.hint.contains("did you mean"), "{e}");
}

#[test]
fn unknown_top_level_table_suggests_ray_box() {
    let text = format!("{BASE}\n[raybox]\nrays = 3\n");
    let (line, col) = at(&text, "raybox");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "raybox",
            hint: &["did you mean `ray_box`?", "accepted here: title"],
        },
    );
}

#[test]
fn unknown_top_level_key_suggests_title() {
    let text = edit(BASE, "title =", "titel =");
    check(&error(&text), Expect { line: 1, col: Some(1), field: "titel", hint: &["did you mean `title`?"] });
}

#[test]
fn unknown_field_in_a_sheet_suggests_heights_mm() {
    let text = edit(BASE, "heights_mm = [9, -9]", "hieghts_mm = [9, -9]");
    let (line, col) = at(&text, "hieghts_mm");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].hieghts_mm", hint: &["did you mean `heights_mm`?"] },
    );
}

#[test]
fn unknown_field_in_a_material_suggests_index() {
    let text = edit(BASE, "index = 1.50", "indx = 1.50");
    let (line, col) = at(&text, "indx");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "materials.pmma.indx", hint: &["did you mean `index`?"] },
    );
}

#[test]
fn unknown_field_in_a_face_suggests_radius_mm() {
    let text = edit(BASE, "radius_mm = 33", "raduis_mm = 33");
    let (line, col) = at(&text, "{ curve = \"convex\", raduis_mm");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "pieces[1].back.raduis_mm",
            hint: &["did you mean `radius_mm`?", "curve, radius_mm"],
        },
    );
}

#[test]
fn unknown_field_in_an_inline_table_names_that_table() {
    // Regression: `ray_box = { … }` on one line used to be matched against the
    // top-level names (title, materials, …) and the field shown as `ray_box`.
    let text = format!("ray_box = {{ rays = 3, spacng_mm = 7 }}\n{BASE}");
    let (line, col) = at(&text, "spacng_mm");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "ray_box.spacng_mm",
            hint: &["did you mean `spacing_mm`?", "accepted here: rays, spacing_mm, ray_width_mm"],
        },
    );
}

// ------------------------------------------------------------------ wrong type

#[test]
fn wrong_type_string_for_a_number() {
    let text = edit(BASE, "thickness_mm = 33", "thickness_mm = \"33\"");
    let (line, col) = at(&text, "\"33\"");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "pieces[1].thickness_mm", hint: &["give a number"] },
    );
    assert!(shown.contains("expected a number"), "{shown}");
}

#[test]
fn wrong_type_number_for_a_face() {
    let text = edit(BASE, "front = \"flat\"", "front = 3");
    let (line, col) = at(&text, "= 3");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col + 2),
            field: "pieces[1].front",
            hint: &["\"flat\"", "curve = \"convex\"", "radius_mm"],
        },
    );
}

#[test]
fn wrong_type_word_for_a_face() {
    let text = edit(BASE, "front = \"flat\"", "front = \"plane\"");
    let (line, col) = at(&text, "\"plane\"");
    check(&error(&text), Expect { line, col: Some(col), field: "pieces[1].front", hint: &["give \"flat\""] });
}

#[test]
fn wrong_type_word_for_a_curve() {
    let text = edit(BASE, "curve = \"convex\", radius_mm = 33", "curve = \"bulging\", radius_mm = 33");
    let (line, col) = at(&text, "{ curve = \"bulging\"");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "pieces[1].back.curve", hint: &["\"convex\" or \"concave\""] },
    );
}

#[test]
fn wrong_type_hint_follows_the_expected_type_not_the_found_one() {
    // Regression: "invalid type: integer `9`, expected a sequence" was answered
    // with "give a whole number", and a number for the title likewise.
    let text = edit(BASE, "heights_mm = [9, -9]", "heights_mm = 9");
    let (line, col) = at(&text, "heights_mm = 9\n");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col + 13),
            field: "sheets[1].heights_mm",
            hint: &["a list in square brackets"],
        },
    );
    let text = edit(BASE, "title = \"Bench kit, Hollins Road annexe\"", "title = 4");
    check(&error(&text), Expect { line: 1, col: Some(9), field: "title", hint: &["text in double quotes"] });
}

#[test]
fn wrong_type_fraction_for_a_whole_number() {
    let text = format!("{BASE}\n[ray_box]\nrays = 2.5\n");
    let (line, col) = at(&text, "2.5");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "ray_box.rays", hint: &["a whole number"] },
    );
    assert!(shown.contains("expected a whole number"), "{shown}");
}

#[test]
fn wrong_type_text_for_true_or_false() {
    let text = edit(BASE, "piece = \"cx90\"", "piece = \"cx90\"\nvary_entry = \"yes\"");
    let (line, col) = at(&text, "\"yes\"");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[2].vary_entry", hint: &["true or false"] },
    );
}

#[test]
fn wrong_type_number_for_a_table_shows_no_rust_names() {
    // Regression: the message said "expected struct RawRayBox".
    let text = format!("ray_box = 5\n{BASE}");
    let shown = check(&error(&text), Expect { line: 1, col: Some(11), field: "ray_box", hint: &["a table"] });
    assert!(shown.contains("expected a table"), "{shown}");
}

// --------------------------------------------------------------- missing field

#[test]
fn missing_field_points_at_its_table() {
    let text = edit(BASE, "thickness_mm = 12\n", "");
    let line = nth_line(&text, "[[pieces]]", 2);
    let shown = check(
        &error(&text),
        Expect { line, col: Some(1), field: "pieces[2].thickness_mm", hint: &["add `thickness_mm = "] },
    );
    assert!(shown.contains("missing field `thickness_mm`"), "{shown}");
}

#[test]
fn missing_material_index() {
    let text = edit(BASE, "index = 1.50\n", "");
    let (line, _) = at(&text, "[materials.pmma]");
    check(
        &error(&text),
        Expect { line, col: Some(1), field: "materials.pmma.index", hint: &["add `index = "] },
    );
}

#[test]
fn missing_sheet_piece() {
    let text = edit(BASE, "piece = \"cx90\"\n", "");
    let line = nth_line(&text, "[[sheets]]", 2);
    check(&error(&text), Expect { line, col: Some(1), field: "sheets[2].piece", hint: &["add `piece = "] });
}

#[test]
fn missing_radius_in_a_face() {
    let text = edit(BASE, "{ curve = \"convex\", radius_mm = 33 }", "{ curve = \"convex\" }");
    let (line, col) = at(&text, "{ curve = \"convex\" }");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "pieces[1].back.radius_mm", hint: &["radius_mm = 45"] },
    );
}

// ---------------------------------------------------------- names and references

#[test]
fn duplicate_piece_id_names_both_places() {
    let text = edit(BASE, "id = \"cx90\"", "id = \"hd33\"");
    let line = nth_line(&text, "id = \"hd33\"", 2);
    let first = nth_line(&text, "[[pieces]]", 1);
    let shown =
        check(&error(&text), Expect { line, col: Some(6), field: "pieces[2].id", hint: &["its own id"] });
    assert!(shown.contains(&format!("first on line {first}")), "{shown}");
}

#[test]
fn sheet_naming_a_missing_piece_lists_the_known_ones() {
    let text = edit(BASE, "piece = \"cx90\"", "piece = \"cx95\"");
    let (line, col) = at(&text, "\"cx95\"");
    let shown = check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "sheets[2].piece",
            hint: &["known pieces: hd33, cx90, pcx70, slab"],
        },
    );
    assert!(shown.contains("`cx95`"), "{shown}");
}

#[test]
fn piece_naming_a_missing_material_lists_the_known_ones() {
    let text = edit(BASE, "material = \"pmma\"", "material = \"perspex\"");
    let (line, col) = at(&text, "\"perspex\"");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "pieces[1].material",
            hint: &["known materials: pmma", "[materials.perspex]"],
        },
    );
}

// ------------------------------------------------------------------ the numbers

#[test]
fn index_not_finite_or_not_above_one() {
    for bad in ["nan", "inf", "-inf", "1", "1.0", "0.98", "-1.5"] {
        let text = edit(BASE, "index = 1.50", &format!("index = {bad}"));
        let (line, col) = at(&text, &format!("= {bad}"));
        let shown = check(
            &error(&text),
            Expect {
                line,
                col: Some(col + 2),
                field: "materials.pmma.index",
                hint: &["finite number above 1"],
            },
        );
        assert!(shown.contains("not a usable index"), "{bad}: {shown}");
    }
}

#[test]
fn sizes_not_finite_or_not_above_zero() {
    let cases = [
        ("thickness_mm = 33", "thickness_mm", "pieces[1].thickness_mm"),
        ("height_mm = 66", "height_mm", "pieces[1].height_mm"),
        ("thickness_mm = 12", "thickness_mm", "pieces[2].thickness_mm"),
    ];
    for (from, key, field) in cases {
        for bad in ["0", "-0.0", "-4", "nan", "inf", "-inf"] {
            let text = edit(BASE, from, &format!("{key} = {bad}"));
            let (line, col) = at(&text, &format!("{key} = {bad}"));
            check(
                &error(&text),
                Expect {
                    line,
                    col: Some(col + key.len() + 3),
                    field,
                    hint: &["finite number of millimetres above 0"],
                },
            );
        }
    }
}

#[test]
fn radius_not_finite_or_not_above_zero() {
    for bad in ["0", "-33", "nan", "inf"] {
        let text = edit(BASE, "radius_mm = 33", &format!("radius_mm = {bad}"));
        let (line, col) = at(&text, "{ curve = \"convex\", radius_mm");
        let shown = check(
            &error(&text),
            Expect {
                line,
                col: Some(col),
                field: "pieces[1].back.radius_mm",
                hint: &["finite number of millimetres above 0"],
            },
        );
        assert!(shown.contains("not a usable radius"), "{bad}: {shown}");
    }
}

#[test]
fn ray_box_values_out_of_range() {
    for (table, field, hint) in [
        ("rays = 0", "ray_box.rays", "from 1 to 9"),
        ("rays = 12", "ray_box.rays", "from 1 to 9"),
        ("spacing_mm = -3", "ray_box.spacing_mm", "above 0"),
        ("spacing_mm = 6\nray_width_mm = 6", "ray_box.ray_width_mm", "less than spacing_mm"),
    ] {
        let text = format!("{BASE}\n[ray_box]\n{table}\n");
        let key = table.rsplit('\n').next().unwrap();
        let (line, col) = at(&text, key);
        let eq = key.find('=').unwrap() + 2;
        check(&error(&text), Expect { line, col: Some(col + eq), field, hint: &[hint] });
    }
}

/// Issue 12, finding 4: `index = 1e155` went through to `NaN` in the PDF with
/// exit 0. An index above 4 is not a classroom material (diamond is 2.42):
/// refused where it stands.
#[test]
fn index_1e155_nan_in_output() {
    for bad in ["1e155", "4.01", "inf"] {
        let text = edit(BASE, "index = 1.50", &format!("index = {bad}"));
        let (line, col) = at(&text, bad);
        let shown = check(
            &error(&text),
            Expect {
                line,
                col: Some(col),
                field: "materials.pmma.index",
                hint: &["at most 4", "diamond 2.42"],
            },
        );
        assert!(shown.contains("not a usable index of refraction"), "{bad}: {shown}");
    }
    // 4 itself and diamond pass.
    for ok in ["4", "2.42"] {
        assert!(
            Lesson::from_toml(&edit(BASE, "index = 1.50", &format!("index = {ok}")), "k.toml").is_ok(),
            "{ok}"
        );
    }
}

/// Issue 12, finding 5: `[ray_box] rays = 1, spacing_mm = 1e6, ray_width_mm =
/// 5e5` and a piece 400 mm tall made one sheet of 1,850 pages (53 s, 1.5 GB).
/// A ray box's numbers and a piece's size are bounded, each where it stands.
#[test]
fn one_sheet_1850_pages_absurd_ray_box() {
    for (table, field, hint) in [
        ("rays = 1\nspacing_mm = 1e6", "ray_box.spacing_mm", "at most 40"),
        ("spacing_mm = 40\nray_width_mm = 5e5", "ray_box.ray_width_mm", "at most 10"),
    ] {
        let text = format!("{BASE}\n[ray_box]\n{table}\n");
        let key = table.rsplit('\n').next().unwrap();
        let (line, col) = at(&text, key);
        let eq = key.find('=').unwrap() + 2;
        check(&error(&text), Expect { line, col: Some(col + eq), field, hint: &[hint, "above 0"] });
    }
    let text = edit(BASE, "thickness_mm = 12\nheight_mm = 50", "thickness_mm = 12\nheight_mm = 400");
    let (line, col) = at(&text, "400");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "pieces[2].height_mm", hint: &["at most 300", "above 0"] },
    );
}

// ------------------------------------------------------------ the piece's shape

#[test]
fn curved_face_radius_below_half_the_height() {
    // hd33 is 66 mm tall: a 30 mm radius cannot reach its edges (DESIGN.md: R ≥ H/2).
    let text = edit(BASE, "radius_mm = 33", "radius_mm = 30");
    let (line, col) = at(&text, "{ curve = \"convex\", radius_mm = 30");
    let shown = check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "pieces[1].back.radius_mm",
            hint: &["at least 33 mm", "height of at most 60 mm"],
        },
    );
    assert!(shown.contains("smaller than half the height (33 mm)"), "{shown}");
}

#[test]
fn negative_edge_thickness() {
    // cx90 made 5 mm thick: each face's sagitta over a = 25 mm is
    // s = 90 − √(90² − 25²) = 3.5419 mm (DESIGN.md), so the edge would be
    // 5 − 2·3.5419 = −2.084 mm.
    let text = edit(BASE, "thickness_mm = 12", "thickness_mm = 5");
    let (line, col) = at(&text, "thickness_mm = 5");
    let shown = check(
        &error(&text),
        Expect {
            line,
            col: Some(col + 15),
            field: "pieces[2].thickness_mm",
            hint: &["2.084 mm thicker", "flatter"],
        },
    );
    assert!(shown.contains("-2.084 mm"), "{shown}");
}

#[test]
fn zero_edge_thickness_is_accepted() {
    // A half-disc has edge thickness exactly 0 (DESIGN.md): the boundary case passes.
    let kit = Lesson::from_toml(BASE, FILE).unwrap();
    assert!(kit.pieces[0].piece.lens().unwrap().edge_thickness_mm().abs() < 1e-12);
}

// -------------------------------------------------- sheets that don't fit pieces

#[test]
fn curved_face_sheet_on_a_piece_without_a_flat_face() {
    let text = edit(BASE, "piece = \"hd33\"", "piece = \"cx90\"");
    let (line, col) = at(&text, "\"curved-face\"");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].kind", hint: &["one flat and one curved face"] },
    );
    assert!(shown.contains("piece `cx90`"), "{shown}");
}

#[test]
fn curved_face_sheet_entered_from_the_curved_side_says_which_enter() {
    let text = edit(BASE, "piece = \"hd33\"", "piece = \"hd33\"\nenter = \"back\"");
    let (line, col) = at(&text, "\"back\"");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].enter", hint: &["set enter = \"front\""] },
    );
    // pcx70's flat face is its back: with no `enter` the light meets the curved face first.
    let text = edit(BASE, "piece = \"hd33\"\nheights_mm = [9, -9]", "piece = \"pcx70\"");
    let (line, col) = at(&text, "\"curved-face\"");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].kind", hint: &["set enter = \"back\""] },
    );
}

#[test]
fn index_sheet_on_a_piece_that_is_not_a_half_disc() {
    // Issue 8: an index or critical-angle sheet needs a half-disc; the error
    // points at the sheet's `piece` and says what a half-disc is.
    for kind in ["index", "critical-angle"] {
        let text = edit(
            BASE,
            "kind = \"focal\"\npiece = \"cx90\"",
            &format!("kind = \"{kind}\"\npiece = \"pcx70\""),
        );
        // The value of `piece = "pcx70"` (the id itself first appears in the piece's own table).
        let (line, col) = at(&text, "piece = \"pcx70\"");
        let col = col + "piece = ".len();
        let shown = check(
            &error(&text),
            Expect {
                line,
                col: Some(col),
                field: "sheets[2].piece",
                hint: &["thickness_mm = R and height_mm = 2R"],
            },
        );
        assert!(
            shown.contains("needs a half-disc; piece `pcx70` is a lens shape that is not a half-disc"),
            "{shown}"
        );
    }
}

#[test]
fn index_sheet_angle_outside_0_to_90() {
    for bad in ["90", "-5", "120.5"] {
        let text = edit(
            BASE,
            "kind = \"focal\"\npiece = \"cx90\"",
            &format!("kind = \"index\"\npiece = \"hd33\"\nangles_deg = [10, {bad}]"),
        );
        let (line, col) = at(&text, &format!("{bad}]"));
        let shown = check(
            &error(&text),
            Expect {
                line,
                col: Some(col),
                field: "sheets[2].angles_deg[2]",
                hint: &["from 0 up to (not including) 90 degrees"],
            },
        );
        assert!(shown.contains("outside what a protractor sheet takes"), "{shown}");
    }
}

#[test]
fn critical_angle_sheet_enters_only_the_curved_face() {
    let text = edit(
        BASE,
        "kind = \"focal\"\npiece = \"cx90\"",
        "kind = \"critical-angle\"\npiece = \"hd33\"\nenter = \"flat\"",
    );
    let (line, col) = at(&text, "enter = \"flat\"");
    let col = col + "enter = ".len();
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[2].enter", hint: &["enter = \"curved\""] },
    );
    let text = edit(
        BASE,
        "kind = \"focal\"\npiece = \"cx90\"",
        "kind = \"index\"\npiece = \"hd33\"\nenter = \"front\"",
    );
    let (line, col) = at(&text, "enter = \"front\"");
    let col = col + "enter = ".len();
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[2].enter", hint: &["\"curved\"", "\"flat\""] },
    );
}

#[test]
fn radius_sheet_on_a_piece_with_no_curved_face() {
    // Issue 8: a radius sheet needs a curved face; `slab` is flat on both sides.
    let text = edit(BASE, "kind = \"focal\"\npiece = \"cx90\"", "kind = \"radius\"\npiece = \"slab\"");
    let (line, col) = at(&text, "piece = \"slab\"");
    let col = col + "piece = ".len();
    let shown = check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "sheets[2].piece",
            hint: &["curve = \"convex\" or \"concave\""],
        },
    );
    assert!(shown.contains("piece `slab` is a lens shape with two flat faces"), "{shown}");
}

#[test]
fn radius_sheet_half_chord_beyond_the_piece() {
    // cx90 is 50 mm high: a half-chord must stay under 25 mm.
    for bad in ["25", "2", "\"wide\""] {
        let text = edit(
            BASE,
            "kind = \"focal\"\npiece = \"cx90\"",
            &format!("kind = \"radius\"\npiece = \"cx90\"\nhalf_chord_mm = {bad}"),
        );
        let (line, col) = at(&text, &format!("half_chord_mm = {bad}"));
        let hint: &[&str] =
            if bad.starts_with('"') { &["give a number"] } else { &["from 3 up to (not including) 25"] };
        check(
            &error(&text),
            Expect {
                line,
                col: Some(col + "half_chord_mm = ".len()),
                field: "sheets[2].half_chord_mm",
                hint,
            },
        );
    }
}

#[test]
fn curved_face_sheet_cannot_vary_its_entry() {
    let text = edit(BASE, "heights_mm = [9, -9]", "heights_mm = [9, -9]\nvary_entry = true");
    let (line, col) = at(&text, "true");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].vary_entry", hint: &["remove vary_entry"] },
    );
}

#[test]
fn focal_sheet_on_a_flat_block() {
    let text = edit(BASE, "piece = \"cx90\"", "piece = \"slab\"");
    let (line, col) = at(&text, "\"focal\"");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[2].kind", hint: &["converging or diverging piece"] },
    );
    assert!(shown.contains("no focal length"), "{shown}");
}

#[test]
fn fixed_height_outside_the_piece() {
    // hd33 reaches 33 mm either side of the axis; a height on the edge is refused too.
    for (list, bad) in [("[9, 40]", "40"), ("[-34, 9]", "-34"), ("[9, 33]", "33"), ("[nan]", "nan")] {
        let text = edit(BASE, "heights_mm = [9, -9]", &format!("heights_mm = {list}"));
        let (line, lcol) = at(&text, list);
        let col = lcol + list.find(bad).unwrap();
        let n = list.trim_matches(['[', ']']).split(", ").position(|h| h == bad).unwrap() + 1;
        let field = format!("sheets[1].heights_mm[{n}]");
        let shown = check(
            &error(&text),
            Expect { line, col: Some(col), field: &field, hint: &["between -33 and 33 mm"] },
        );
        assert!(shown.contains("outside piece `hd33`"), "{list}: {shown}");
    }
}

#[test]
fn empty_or_overlong_height_list() {
    let text = edit(BASE, "heights_mm = [9, -9]", "heights_mm = []");
    let (line, col) = at(&text, "[]");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].heights_mm", hint: &["at least one height"] },
    );
    let list = "[1, 2, 3, 4, 5, 6, 7, 8, 9, 10]";
    let text = edit(BASE, "heights_mm = [9, -9]", &format!("heights_mm = {list}"));
    let (line, col) = at(&text, list);
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].heights_mm", hint: &["at most 9"] },
    );
}

// ------------------------------------------------------------------------ paper

#[test]
fn unknown_paper_size() {
    // B5 is an ISO 216 size raysheet does not name (A5 is named since issue 9).
    let text = format!("{BASE}\n[paper]\nsize = \"B5\"\n");
    let (line, col) = at(&text, "\"B5\"");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "paper.size",
            hint: &["A4, A5, A3, Letter", "width_mm and height_mm"],
        },
    );
}

#[test]
fn margin_too_large_or_negative() {
    // A4 is 210 mm across (ISO 216); 100 mm must stay printable, so at most 55 mm.
    for bad in ["80", "-1", "nan"] {
        let text = format!("{BASE}\n[paper]\nsize = \"A4\"\nmargin_mm = {bad}\n");
        let (line, col) = at(&text, &format!("= {bad}\n"));
        check(
            &error(&text),
            Expect { line, col: Some(col + 2), field: "paper.margin_mm", hint: &["from 0 to 55.0 mm"] },
        );
    }
}

/// The hint worked the largest margin out from the paper's width alone: on A5
/// (148 × 210 mm) it said "up to 24 mm", (148 − 100) / 2, and 20 mm was still
/// refused. Under the 15 mm header, 8 mm caution, 58 mm text and 56 mm scale
/// bands, the 3 mm gap and a 40 mm drawing, 210 − 2m ≥ 180 gives 15 mm.
#[test]
fn margin_hint_on_a5_says_the_real_limit() {
    for bad in ["16", "24"] {
        let text = format!("{BASE}\n[paper]\nwidth_mm = 148\nheight_mm = 210\nmargin_mm = {bad}\n");
        let (line, col) = at(&text, &format!("= {bad}\n"));
        let e = error(&text);
        check(
            &e,
            Expect { line, col: Some(col + 2), field: "paper.margin_mm", hint: &["from 0 to 15.0 mm"] },
        );
        assert!(!e.to_string().contains("24.0 mm"), "{e}");
    }
    // 15 mm itself is accepted.
    let ok = format!("{BASE}\n[paper]\nwidth_mm = 148\nheight_mm = 210\nmargin_mm = 15\n");
    assert!(Lesson::from_toml(&ok, FILE).is_ok());
}

#[test]
fn custom_paper_too_small_or_half_given() {
    let text = format!("{BASE}\n[paper]\nwidth_mm = 90\nheight_mm = 300\n");
    let (line, _) = at(&text, "[paper]");
    // The error is about the whole table: its line, no particular column.
    check(&error(&text), Expect { line, col: None, field: "paper", hint: &["at least 120.0 mm wide"] });
    let text = format!("{BASE}\n[paper]\nwidth_mm = 250\n");
    let (line, col) = at(&text, "250");
    check(&error(&text), Expect { line, col: Some(col), field: "paper", hint: &["add the missing one"] });
    let text = format!("{BASE}\n[paper]\nsize = \"A3\"\nwidth_mm = 250\nheight_mm = 300\n");
    let (line, col) = at(&text, "\"A3\"");
    check(&error(&text), Expect { line, col: Some(col), field: "paper.size", hint: &["remove one"] });
    let text = format!("{BASE}\n[paper]\norientation = \"sideways\"\n");
    let (line, col) = at(&text, "\"sideways\"");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "paper.orientation",
            hint: &["\"portrait\", \"landscape\" or \"auto\""],
        },
    );
}

/// Issue 12, finding 1: paper too short for the sheet's bands and a drawing
/// (150 × 190 mm leaves 30 mm for the drawing in portrait) is refused at the
/// `[paper]` table, with the smallest paper that works.
#[test]
fn small_paper_exit_0_with_empty_pdfs_refused_in_the_kit() {
    let text = format!("{BASE}\n[paper]\nwidth_mm = 150\nheight_mm = 190\n");
    let (line, _) = at(&text, "[paper]");
    check(&error(&text), Expect { line, col: None, field: "paper", hint: &["at least 120 × 200 mm", "A5"] });
    // A5 itself is accepted.
    let text = format!("{BASE}\n[paper]\nwidth_mm = 148\nheight_mm = 210\n");
    assert!(Lesson::from_toml(&text, "kit.toml").is_ok());
}

// ---------------------------------------------------------------- sheet words

#[test]
fn bad_enter_value() {
    let text = edit(BASE, "piece = \"cx90\"", "piece = \"cx90\"\nenter = \"left\"");
    let (line, col) = at(&text, "\"left\"");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[2].enter", hint: &["\"front\" or \"back\""] },
    );
    assert!(shown.contains("\"left\" is not a side"), "{shown}");
}

#[test]
fn bad_sheet_kind() {
    let text = edit(BASE, "kind = \"focal\"", "kind = \"focus\"");
    let (line, col) = at(&text, "\"focus\"");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "sheets[2].kind",
            hint: &[
                "\"curved-face\", \"focal\", \"block\", \"prism\", \"index\", \"critical-angle\", \"radius\" or \"spectrum\"",
            ],
        },
    );
}

// --------------------------------------------------------------------- syntax

#[test]
fn toml_syntax_errors_are_located_too() {
    let text = edit(BASE, "height_mm = 66", "height_mm = ");
    let (line, _) = at(&text, "height_mm = \n");
    let e = error(&text);
    assert_eq!((e.file.as_str(), e.line), (FILE, line), "{e}");
    assert!(e.to_string().starts_with(&format!("{FILE}:{line}:")), "{e}");
    let text = edit(BASE, "height_mm = 66", "height_mm = 66\nheight_mm = 67");
    let (line, col) = at(&text, "height_mm = 67");
    let e = error(&text);
    assert_eq!((e.line, e.column), (line, col), "{e}");
    assert_eq!(e.field, "pieces[1].height_mm", "{e}");
}

// ------------------------------------------------------------- never panics

/// Parses; when the kit is valid, plans it and writes the answer file, which
/// must be JSON. Any panic fails the property.
fn run_all(text: &str) {
    if let Ok(kit) = Lesson::from_toml(text, FILE) {
        let plans = raysheet::sheets::plan_lesson(&kit, &kit.paper);
        let json = answers::to_json(&kit.title, kit.class.seed, &plans);
        assert!(serde_json::from_str::<serde_json::Value>(&json).is_ok(), "answer file is not JSON:\n{json}");
    }
}

/// One random change to a text, on characters (so UTF-8 stays valid).
#[derive(Clone, Debug)]
enum Mutation {
    /// Delete `len` characters at a position (given as a fraction of the length).
    Delete(f64, usize),
    /// Duplicate the line at a position.
    DuplicateLine(f64),
    /// Replace the character at a position.
    Replace(f64, char),
}

fn mutation() -> impl Strategy<Value = Mutation> {
    // Characters that matter to TOML and to the numbers, plus some that don't fit.
    let chars = prop::sample::select(vec![
        '0', '1', '5', '9', '-', '.', 'e', 'n', 'i', '"', '\'', '=', '[', ']', '{', '}', ',', '#', ' ', '\n',
        '\t', '\\', 'x', 'é', '°', '\u{0}', '\u{202e}',
    ]);
    prop_oneof![
        (0.0..1.0f64, 1usize..40).prop_map(|(p, n)| Mutation::Delete(p, n)),
        (0.0..1.0f64).prop_map(Mutation::DuplicateLine),
        (0.0..1.0f64, chars).prop_map(|(p, c)| Mutation::Replace(p, c)),
    ]
}

fn apply(text: &str, m: &Mutation) -> String {
    let mut chars: Vec<char> = text.chars().collect();
    let pos = |p: f64, len: usize| ((p * len as f64) as usize).min(len.saturating_sub(1));
    match *m {
        Mutation::Delete(p, n) => {
            let i = pos(p, chars.len());
            let j = (i + n).min(chars.len());
            chars.drain(i..j);
            chars.into_iter().collect()
        }
        Mutation::DuplicateLine(p) => {
            let lines: Vec<&str> = text.split_inclusive('\n').collect();
            let i = pos(p, lines.len());
            let mut out = String::new();
            for (k, l) in lines.iter().enumerate() {
                out.push_str(l);
                if k == i {
                    out.push_str(l);
                }
            }
            out
        }
        Mutation::Replace(p, c) => {
            let i = pos(p, chars.len());
            chars[i] = c;
            chars.into_iter().collect()
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    #[test]
    fn random_bytes_never_panic(bytes in prop::collection::vec(any::<u8>(), 0..400)) {
        run_all(&String::from_utf8_lossy(&bytes));
    }

    #[test]
    fn mutated_demo_kits_never_panic(ms in prop::collection::vec(mutation(), 1..4)) {
        let mut text = demo::DEMO_KIT.to_string();
        for m in &ms {
            text = apply(&text, m);
        }
        run_all(&text);
    }

    #[test]
    fn demo_kit_with_random_numbers_never_panics(
        which in 0usize..64,
        value in prop_oneof![
            Just("0".to_string()), Just("-0.0".to_string()), Just("nan".to_string()), Just("inf".to_string()),
            Just("1e308".to_string()), Just("1e-300".to_string()), Just("9223372036854775807".to_string()),
            (-1.0e4..1.0e4f64).prop_map(|v| v.to_string()),
        ],
    ) {
        // Every `= number` in the demo kit is a candidate; replace one of them.
        let text = demo::DEMO_KIT;
        let spots: Vec<(usize, usize)> = text
            .match_indices("= ")
            .filter_map(|(i, _)| {
                let rest = &text[i + 2..];
                let len = rest.find(|c: char| !(c.is_ascii_digit() || c == '.' || c == '-')).unwrap_or(rest.len());
                (len > 0).then_some((i + 2, i + 2 + len))
            })
            .collect();
        prop_assume!(!spots.is_empty());
        let (a, b) = spots[which % spots.len()];
        run_all(&format!("{}{}{}", &text[..a], value, &text[b..]));
    }
}

// ------------------------------------------------------------ printable text

#[test]
fn title_or_label_the_font_cannot_print_is_located() {
    // U+6F22 is a CJK ideograph: DejaVu Sans has no glyph for it (its cmap,
    // read with ttf-parser in src/font.rs tests).
    let text = edit(BASE, "title = \"Bench kit, Hollins Road annexe\"", "title = \"Bench kit 漢\"");
    let (line, col) = at(&text, "\"Bench kit 漢\"");
    let shown = check(&error(&text), Expect { line, col: Some(col), field: "title", hint: &["Latin"] });
    assert!(shown.contains("U+6F22"), "{shown}");
    let text = edit(BASE, "id = \"hd33\"", "id = \"hd33\"\nlabel = \"half-disc\\nsecond line\"");
    let e = error(&text);
    assert_eq!(e.field, "pieces[1].label", "{e}");
    assert!(e.message.contains("control character"), "{e}");
}

#[test]
fn accented_and_greek_labels_are_accepted() {
    let text =
        edit(BASE, "id = \"hd33\"", "id = \"hd33\"\nlabel = \"Halbscheibe, Ø 66 mm, n≈1.50 (θ < 42°)\"");
    assert!(Lesson::from_toml(&text, FILE).is_ok());
}

// ------------------------------------------- materials with dispersion (issue 10)

/// BASE with its material written as `material` (the `index = 1.50` line replaced).
fn with_material(material: &str) -> String {
    edit(BASE, "index = 1.50\n", &format!("{material}\n"))
}

/// BASE with a `[ray_box]` table holding `lines`.
fn with_ray_box(base: &str, lines: &str) -> String {
    format!("{base}\n[ray_box]\n{lines}\n")
}

const SELLMEIER_HINT: &[&str] = &["same length", "no pole", "above 1", "c_um2 = ["];

#[test]
fn sellmeier_pole_in_the_visible_points_at_its_c() {
    // c = 0.25 µm² is a pole at λ = 0.5 µm (λ² = c), inside 380–780 nm.
    let text = with_material("sellmeier = { b = [1.0, 0.3], c_um2 = [0.01, 0.25] }");
    let (line, col) = at(&text, "0.25");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "materials.pmma.sellmeier.c_um2[2]", hint: SELLMEIER_HINT },
    );
    assert!(shown.contains("pole") && shown.contains("500.0 nm"), "{shown}");
}

#[test]
fn sellmeier_lists_of_different_lengths_point_at_c() {
    let text = with_material("sellmeier = { b = [1.0, 0.3], c_um2 = [0.01] }");
    let (line, col) = at(&text, "[0.01]");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "materials.pmma.sellmeier.c_um2", hint: SELLMEIER_HINT },
    );
    assert!(shown.contains("b has 2 terms but c_um2 has 1"), "{shown}");
}

#[test]
fn sellmeier_without_terms_is_refused() {
    let text = with_material("sellmeier = { b = [], c_um2 = [] }");
    let (line, col) = at(&text, "[]");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "materials.pmma.sellmeier.b", hint: SELLMEIER_HINT },
    );
    assert!(shown.contains("no terms"), "{shown}");
}

#[test]
fn sellmeier_non_finite_coefficient_points_at_it() {
    let text = with_material("sellmeier = { b = [1.0, nan], c_um2 = [0.01, 0.02] }");
    let (line, col) = at(&text, "nan");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "materials.pmma.sellmeier.b[2]", hint: SELLMEIER_HINT },
    );
    let text = with_material("sellmeier = { b = [1.0], c_um2 = [inf] }");
    let (line, col) = at(&text, "inf");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "materials.pmma.sellmeier.c_um2[1]", hint: SELLMEIER_HINT },
    );
}

#[test]
fn sellmeier_giving_n_not_above_one_is_refused() {
    // b = −0.5, c = 0.01: n² = 1 − 0.5λ²/(λ² − 0.01) < 1 everywhere (closed form).
    let text = with_material("sellmeier = { b = [-0.5], c_um2 = [0.01] }");
    let (line, col) = at(&text, "{ b =");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "materials.pmma.sellmeier", hint: SELLMEIER_HINT },
    );
    assert!(shown.contains("n must be above 1"), "{shown}");
}

#[test]
fn sellmeier_unknown_field_names_the_formula_table() {
    let text = with_material("sellmeier = { b = [1.0], c = [0.01] }");
    let (line, col) = at(&text, "c = [");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "materials.pmma.sellmeier.c",
            hint: &["did you mean `b`?", "accepted here: b, c_um2"],
        },
    );
}

#[test]
fn material_with_two_of_index_sellmeier_and_catalog_is_refused() {
    let text = with_material("index = 1.50\ncatalog = \"pmma-beadie-2015\"");
    let (line, col) = at(&text, "\"pmma-beadie-2015\"");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "materials.pmma.catalog", hint: &["exactly one of index"] },
    );
    assert!(shown.contains("both `index` and `catalog`"), "{shown}");
}

#[test]
fn unknown_catalog_material_suggests_the_nearest() {
    let text = with_material("catalog = \"pmma-beadie-2014\"");
    let (line, col) = at(&text, "\"pmma-beadie-2014\"");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "materials.pmma.catalog",
            hint: &["did you mean `pmma-beadie-2015`?", "pc-sultanova-2009", "raysheet materials"],
        },
    );
}

#[test]
fn material_with_no_index_names_the_three_ways() {
    let text = with_material("label = \"cast acrylic\"");
    let (line, _) = at(&text, "[materials.pmma]");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(1),
            field: "materials.pmma.index",
            hint: &["add `index = ", "sellmeier = {", "catalog = "],
        },
    );
}

#[test]
fn ray_box_wavelength_outside_the_visible_is_refused() {
    for bad in ["900", "379.9", "nan", "-587.6"] {
        let text = with_ray_box(BASE, &format!("wavelength_nm = {bad}"));
        let (line, col) = at(&text, &format!("= {bad}"));
        check(
            &error(&text),
            Expect { line, col: Some(col + 2), field: "ray_box.wavelength_nm", hint: &["from 380 to 780"] },
        );
    }
    assert!(Lesson::from_toml(&with_ray_box(BASE, "wavelength_nm = 780"), FILE).is_ok());
}

#[test]
fn ray_box_colours_are_checked_one_by_one() {
    let colours = |list: &str| with_ray_box(BASE, &format!("colours = [{list}]"));
    // A name twice (whatever its capitals).
    let text = colours("{ name = \"red\", wavelength_nm = 656.3 }, { name = \"Red\", wavelength_nm = 640 }");
    let (line, col) = at(&text, "\"Red\"");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "ray_box.colours[2].name", hint: &["its own name"] },
    );
    assert!(shown.contains("given twice"), "{shown}");
    // A wavelength outside the visible.
    let text = colours("{ name = \"red\", wavelength_nm = 656.3 }, { name = \"uv\", wavelength_nm = 350 }");
    let (line, col) = at(&text, "350");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "ray_box.colours[2].wavelength_nm",
            hint: &["from 380 to 780"],
        },
    );
    // A name the font cannot print (U+6F22, see below).
    let text = colours("{ name = \"漢\", wavelength_nm = 500 }");
    let (line, col) = at(&text, "\"漢\"");
    check(&error(&text), Expect { line, col: Some(col), field: "ray_box.colours[1].name", hint: &["Latin"] });
    // An unknown field in a colour.
    let text = colours("{ name = \"red\", wavelength = 656.3 }");
    let (line, col) = at(&text, "wavelength =");
    check(
        &error(&text),
        Expect {
            line,
            col: Some(col),
            field: "ray_box.colours.wavelength",
            hint: &["did you mean `wavelength_nm`?", "accepted here: name, wavelength_nm"],
        },
    );
    let ok = colours("{ name = \"red\", wavelength_nm = 656.3 }, { name = \"blue\", wavelength_nm = 486.1 }");
    let lesson = Lesson::from_toml(&ok, FILE).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(lesson.ray_box.colours.len(), 2);
    assert_eq!(lesson.ray_box.colours[1].name, "blue");
}

/// BASE's curved-face sheet with `all_colours = true`, on `material`, with `ray_box` lines.
fn all_colours_kit(material: &str, ray_box: &str) -> String {
    let text = with_material(material);
    let text = edit(&text, "heights_mm = [9, -9]\n", "heights_mm = [9, -9]\nall_colours = true\n");
    with_ray_box(&text, ray_box)
}

const RGB: &str =
    "colours = [ { name = \"red\", wavelength_nm = 656.3 }, { name = \"blue\", wavelength_nm = 486.1 } ]";

#[test]
fn two_colours_with_one_initial_are_refused() {
    // Keys print each colour's initial at its rays' ends: red and rose would both be R.
    let text = with_ray_box(
        BASE,
        "colours = [ { name = \"red\", wavelength_nm = 656.3 }, { name = \"rose\", wavelength_nm = 620.0 } ]",
    );
    let (line, col) = at(&text, "\"rose\"");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "ray_box.colours[2].name", hint: &["rename one"] },
    );
    assert!(shown.contains("same letter"), "{shown}");
}

#[test]
fn all_colours_on_a_material_without_dispersion_is_refused() {
    let text = all_colours_kit("index = 1.50", RGB);
    let (line, col) = at(&text, "true");
    let shown = check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].all_colours", hint: &["sellmeier", "catalog"] },
    );
    assert!(shown.contains("no dispersion"), "{shown}");
}

#[test]
fn all_colours_needs_two_colours_and_a_kind_that_traces_them() {
    let text = all_colours_kit("catalog = \"pmma-beadie-2015\"", "rays = 3");
    let (line, col) = at(&text, "true");
    check(
        &error(&text),
        Expect { line, col: Some(col), field: "sheets[1].all_colours", hint: &["colours = ["] },
    );
    // With a dispersing material and colours a curved-face sheet takes it:
    // each colour with the piece's index at its wavelength.
    let text = all_colours_kit("catalog = \"pmma-beadie-2015\"", RGB);
    let lesson = Lesson::from_toml(&text, FILE).unwrap_or_else(|e| panic!("{e}"));
    let lights = &lesson.sheets[0].lights;
    assert_eq!(lights.len(), 2);
    // DESIGN.md (Dispersion): Beadie et al. 2015, n = 1.49007 at 656.3 nm, 1.49837 at 486.1 nm.
    assert!(
        (lights[0].index - 1.49007).abs() < 1e-5 && (lights[1].index - 1.49837).abs() < 1e-5,
        "{lights:?}"
    );
    // A kind that does not trace colours (a radius sheet) refuses it, located.
    let radius = edit(&text, "heights_mm = [9, -9]\nall_colours = true\n", "heights_mm = [9, -9]\n");
    let radius = format!("{radius}\n[[sheets]]\nkind = \"radius\"\npiece = \"hd33\"\nall_colours = true\n");
    if let Err(e) = Lesson::from_toml(&radius, FILE) {
        let shown = e.to_string();
        assert!(shown.contains("do not trace colours") && e.field.ends_with("all_colours"), "{shown}");
    } else {
        panic!("a radius sheet with all_colours was accepted");
    }
    // false is accepted on any kind, and a wrong type is located.
    let off = edit(&text, "all_colours = true", "all_colours = false");
    assert!(Lesson::from_toml(&off, FILE).is_ok());
    let bad = edit(&text, "all_colours = true", "all_colours = \"yes\"");
    let (line, col) = at(&bad, "\"yes\"");
    check(
        &error(&bad),
        Expect { line, col: Some(col), field: "sheets[1].all_colours", hint: &["true or false"] },
    );
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    /// Any Sellmeier coefficients: a located error, or a material whose index
    /// is above 1 and at most 4 everywhere in 380–780 nm (checked here at every
    /// half nanometre, finer than the 1 nm scan of the check itself).
    #[test]
    fn random_sellmeier_coefficients_are_refused_or_usable(
        terms in prop::collection::vec((-2.0..4.0f64, 0.0..1.0f64), 1..4),
    ) {
        let b: Vec<String> = terms.iter().map(|(b, _)| format!("{b:?}")).collect();
        let c: Vec<String> = terms.iter().map(|(_, c)| format!("{c:?}")).collect();
        let text = with_material(&format!("sellmeier = {{ b = [{}], c_um2 = [{}] }}", b.join(", "), c.join(", ")));
        match Lesson::from_toml(&text, FILE) {
            Err(e) => {
                prop_assert!(e.field.starts_with("materials.pmma.sellmeier"), "{e}");
                prop_assert!(e.line == 4, "{e}");
            }
            Ok(kit) => {
                let m = &kit.materials["pmma"];
                for k in 0..=800 {
                    let n = m.index_at(380.0 + k as f64 * 0.5);
                    prop_assert!(n > 1.0 && n <= 4.0, "n = {n} at {} nm", 380.0 + k as f64 * 0.5);
                }
                run_all(&text);
            }
        }
    }
}
