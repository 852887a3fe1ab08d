//! Coloured rays (issue 10, part 2): `all_colours = true` and spectrum sheets
//! against closed forms worked by hand here (the half-disc crossing, the lens
//! maker's formula, Snell's law at both sides of a prism with δ = i + e − A),
//! and a colour key read back in black and white: distinct dash arrays, the
//! initials as text, and grey levels apart in a greyscale rendering.

use std::collections::{BTreeMap, BTreeSet};
use std::process::Command;

use raysheet::output::{Formats, build_plans};
use raysheet::paper::{Orientation, PaperSize, PaperSpec};
use raysheet::sheets::{Lesson, plan_lesson};
use resvg::tiny_skia::Pixmap;
use serde_json::Value;

mod common {
    pub mod tools;
}
use common::tools::have_tool;

/// Beadie et al. 2015 PMMA (built in), red, green and blue filters.
const HEAD: &str = r#"title = "Elmbrook Secondary, lab B: colours"
[materials.pmma]
catalog = "pmma-beadie-2015"
[ray_box]
ray_width_mm = 2
colours = [ { name = "red", wavelength_nm = 656.3 }, { name = "green", wavelength_nm = 532.0 }, { name = "blue", wavelength_nm = 486.1 } ]
"#;

/// n of Beadie et al.'s PMMA at 656.3 and 486.1 nm (DESIGN.md, Dispersion).
const N_RED: f64 = 1.49007;
const N_BLUE: f64 = 1.49837;

fn a4() -> PaperSpec {
    PaperSpec { size: PaperSize::named("A4").expect("A4"), orientation: Orientation::Auto, margin_mm: 10.0 }
}

fn answers(kit: &str) -> Value {
    let lesson = Lesson::from_toml(kit, "colours.toml").unwrap_or_else(|e| panic!("{e}"));
    let plans = plan_lesson(&lesson, &a4());
    serde_json::from_str(&raysheet::output::answers::to_json("t", None, &plans)).expect("json")
}

/// The kit with a 40 mm PMMA half-disc (`hd-40`) and one sheet of it:
/// `sheet` is the sheet table's lines.
fn half_disc_40(sheet: &str) -> String {
    format!(
        "{HEAD}[[pieces]]\nid = \"hd-40\"\nmaterial = \"pmma\"\nfront = \"flat\"\nback = {{ curve = \"convex\", radius_mm = 40 }}\nthickness_mm = 40\nheight_mm = 80\n[[sheets]]\n{sheet}"
    )
}

fn colour<'a>(sheet: &'a Value, name: &str) -> &'a Value {
    sheet["colours"].as_array().expect("colours").iter().find(|c| c["colour"] == name).expect("the colour")
}

fn value(c: &Value, ray: &str, quantity: &str) -> f64 {
    c["measured"]
        .as_array()
        .expect("measured")
        .iter()
        .find(|m| m["ray"] == ray && m["quantity"] == quantity)
        .and_then(|m| m["value"].as_f64())
        .unwrap_or_else(|| panic!("no {quantity} for {ray} in {c}"))
}

#[test]
fn half_disc_crossing_per_colour_is_the_closed_form() {
    let kit = half_disc_40(
        "kind = \"curved-face\"\npiece = \"hd-40\"\nheights_mm = [10, -10]\nall_colours = true\n",
    );
    let a = answers(&kit);
    let sheet = &a["sheets"][0];
    let (r, h) = (40.0_f64, 10.0_f64);
    let mut crossing = BTreeMap::new();
    for name in ["red", "green", "blue"] {
        let c = colour(sheet, name);
        let n = c["index"].as_f64().expect("index");
        // DESIGN.md, half-disc flat face first: sin θ1 = h/R, sin θ2 = n·h/R,
        // crossing R·n·sin θ1 / sin(θ2 − θ1) from the flat face.
        let (t1, t2) = ((h / r).asin(), (n * h / r).asin());
        let want = r * n * t1.sin() / (t2 - t1).sin();
        let got = value(c, "A", "crossing_from_flat_face_mm");
        assert!((got - want).abs() < 1e-9, "{name}: {got} against {want}");
        crossing.insert(name, got);
    }
    assert!((colour(sheet, "red")["index"].as_f64().unwrap() - N_RED).abs() < 1e-5);
    assert!((colour(sheet, "blue")["index"].as_f64().unwrap() - N_BLUE).abs() < 1e-5);
    // DESIGN.md: a 40 mm half-disc, ray at 10 mm, crosses about 1.3 mm further out in red than in blue.
    let spread = crossing["red"] - crossing["blue"];
    assert!((spread - 1.3).abs() < 0.1, "{spread}");
    let s = sheet["colour_spread"]["rays"][0]["spread"].as_f64().expect("spread");
    assert!((s - spread).abs() < 1e-9, "{s} against {spread}");
    // The spread is compared with the sheet's spherical aberration, and is smaller.
    let ab = sheet["colour_spread"]["spherical_aberration_mm"].as_f64().expect("aberration");
    assert!(ab > spread, "{ab} against {spread}");
}

#[test]
fn thin_lens_focus_per_colour_is_the_lens_makers() {
    // An equiconvex PMMA lens with 120 mm faces, thin (2.5 mm): DESIGN.md says
    // it focuses red about 2 mm beyond blue.
    let kit = format!(
        "{HEAD}[[pieces]]\nid = \"bcx-120\"\nmaterial = \"pmma\"\nfront = {{ curve = \"convex\", radius_mm = 120 }}\nback = {{ curve = \"convex\", radius_mm = 120 }}\nthickness_mm = 2.5\nheight_mm = 30\n[[sheets]]\nkind = \"focal\"\npiece = \"bcx-120\"\nheights_mm = [11, -11]\nall_colours = true\n"
    );
    let a = answers(&kit);
    let sheet = &a["sheets"][0];
    let graded: Vec<String> = sheet["colour_spread"]["rays"]
        .as_array()
        .expect("spreads")
        .iter()
        .map(|s| s["ray"].as_str().expect("letter").to_string())
        .collect();
    assert!(!graded.is_empty(), "{sheet}");
    let mut f = BTreeMap::new();
    for name in ["red", "green", "blue"] {
        let c = colour(sheet, name);
        let n = c["index"].as_f64().expect("index");
        // Lens maker's formula, thin lens in air (DESIGN.md): 1/f = (n − 1)(1/R1 − 1/R2), R1 = +120, R2 = −120.
        let f_thin = 1.0 / ((n - 1.0) * (1.0 / 120.0 + 1.0 / 120.0));
        for ray in &graded {
            // Measured from the centre line; a real ray 11 mm out crosses short
            // of f by its spherical aberration (about 1.7 mm at the d line:
            // the sheet's own class curve), so within 2 mm short of f.
            let got = value(c, ray, "crossing_from_centre_line_mm");
            assert!(got < f_thin && f_thin - got < 2.0, "{name} {ray}: {got} against f = {f_thin}");
        }
        f.insert(name, f_thin);
    }
    // Each ray's spread between red and blue is the lens maker's Δf to 0.05 mm
    // (the spherical aberration hardly changes with n).
    let df = f["red"] - f["blue"];
    assert!((df - 2.0).abs() < 0.1, "Δf = {df}, DESIGN.md: about 2 mm");
    for s in sheet["colour_spread"]["rays"].as_array().expect("spreads") {
        let got = s["spread"].as_f64().expect("spread");
        assert!((got - df).abs() < 0.05, "{s} against Δf = {df}");
    }
}

/// An index sheet in every colour: each colour's angle of refraction at the
/// flat face's centre is Snell's law, sin r = n(λ)·sin i (DESIGN.md, sheet 3:
/// the ray enters along a radius, so only the flat face bends it); a ray past
/// every colour's critical angle is totally reflected in all of them, and
/// reflection does not disperse, so it gets no coloured path.
#[test]
fn index_sheet_per_colour_is_snells_law_at_the_centre() {
    let kit =
        half_disc_40("kind = \"index\"\npiece = \"hd-40\"\nangles_deg = [15, 30, 55]\nall_colours = true\n");
    let a = answers(&kit);
    let sheet = &a["sheets"][0];
    let mut r_of = BTreeMap::new();
    for name in ["red", "green", "blue"] {
        let c = colour(sheet, name);
        let n = c["index"].as_f64().expect("index");
        for (ray, i) in [("A", 15.0_f64), ("B", 30.0)] {
            let want = (n * i.to_radians().sin()).asin().to_degrees();
            let got = value(c, ray, "refraction_angle_deg");
            assert!((got - want).abs() < 1e-9, "{name} {ray}: {got} against {want}");
            r_of.insert((name, ray), got);
        }
        // 55° is past asin(1/n) ≈ 42° in every colour.
        let c_obs = c["measured"].as_array().expect("measured").iter().find(|m| m["ray"] == "C").expect("C");
        assert_eq!(c_obs["observation"], "total-internal-reflection", "{c_obs}");
    }
    // Red bends least (smallest n): at 30° about 0.4° less than blue, from
    // asin(1.49007·0.5) = 48.16° and asin(1.49837·0.5) = 48.51° (N_RED, N_BLUE above).
    let spread = r_of[&("blue", "B")] - r_of[&("red", "B")];
    assert!((spread - 0.35).abs() < 0.02, "{spread}");
    // The key draws coloured paths for A and B only.
    let lesson = Lesson::from_toml(&kit, "colours.toml").expect("valid");
    let plans = plan_lesson(&lesson, &a4());
    let set = plans[0].colours.as_ref().expect("colours traced");
    for run in &set.runs {
        let drawn: Vec<&str> =
            run.paths.iter().filter(|(_, p)| !p.is_empty()).map(|(l, _)| l.as_str()).collect();
        assert_eq!(drawn, ["A", "B"], "{}", run.light.name);
    }
}

/// A ray between the colours' critical angles: at 42° in Beadie's PMMA red
/// leaves (θc = asin(1/1.49007) = 42.16°) and blue is totally reflected
/// (θc = asin(1/1.49837) = 41.87°; N_RED, N_BLUE above), and the key says so.
#[test]
fn a_ray_between_the_colours_critical_angles_is_named_on_the_key() {
    let kit =
        half_disc_40("kind = \"index\"\npiece = \"hd-40\"\nangles_deg = [20, 42]\nall_colours = true\n");
    let (red, blue) = ((1.0 / N_RED).asin().to_degrees(), (1.0 / N_BLUE).asin().to_degrees());
    assert!(blue < 42.0 && 42.0 < red, "{blue} {red}");
    let lesson = Lesson::from_toml(&kit, "colours.toml").expect("valid");
    let plans = plan_lesson(&lesson, &a4());
    let set = plans[0].colours.as_ref().expect("colours traced");
    let leaves = |name: &str| {
        let run = set.runs.iter().find(|r| r.light.name == name).expect("the colour");
        run.leaves.iter().find(|(l, _)| l == "B").map(|(_, x)| *x).expect("ray B")
    };
    assert!(leaves("red") && !leaves("blue"));
    let words = raysheet::layout::Templates::shipped().expect("shipped words").words;
    let lines = plans[0].key_lines(&words).join("\n");
    let line =
        lines.lines().find(|l| l.starts_with("Ray B is not the same")).unwrap_or_else(|| panic!("{lines}"));
    let (out, back) = line.split_once("totally reflected in").expect("both parts");
    assert!(
        out.contains("red") && !out.contains("blue") && back.contains("blue") && !back.contains("red"),
        "{line}"
    );
    // Ray A at 20° leaves in every colour: no such line for it.
    assert!(!lines.contains("Ray A is not the same"), "{lines}");
}

#[test]
fn spectrum_deviation_per_colour_is_snell_at_both_sides() {
    let kit = format!(
        "{HEAD}[[pieces]]\nid = \"tri-50\"\nmaterial = \"pmma\"\nshape = \"prism\"\napex_deg = 60\nside_mm = 50\n[[sheets]]\nkind = \"spectrum\"\npiece = \"tri-50\"\nangles_deg = [50]\n"
    );
    let a = answers(&kit);
    let sheet = &a["sheets"][0];
    assert_eq!(sheet["kind"], "spectrum");
    let (i, apex) = (50.0_f64.to_radians(), 60.0_f64.to_radians());
    let mut dev = BTreeMap::new();
    for c in sheet["rays"].as_array().expect("one ray per colour") {
        let n = c["index"].as_f64().expect("index");
        // Snell at the first side (sin i = n sin r1), r2 = A − r1, Snell at the
        // second (sin e = n sin r2), δ = i + e − A (DESIGN.md, triangular prism).
        let r1 = (i.sin() / n).asin();
        let e = (n * (apex - r1).sin()).asin();
        let d = i + e - apex;
        let (got_e, got_d) =
            (c["emergence_angle_deg"].as_f64().unwrap(), c["deviation_deg"].as_f64().unwrap());
        assert!((got_e - e.to_degrees()).abs() < 1e-9, "{c}");
        assert!((got_d - d.to_degrees()).abs() < 1e-9, "{c}");
        dev.insert(c["colour"].as_str().unwrap().to_string(), d.to_degrees());
    }
    let spread = dev["blue"] - dev["red"];
    assert!((sheet["angular_spread_deg"].as_f64().unwrap() - spread).abs() < 1e-9);
    // DESIGN/issue 10: about 0.7° between red and blue for a 60° acrylic prism at 50°.
    assert!((spread - 0.7).abs() < 0.05, "{spread}");
    // The screen: as far as A4 allows (the colours land under two ray widths
    // apart there), and the separation is the spread's chord at that distance
    // to within the exit points' few tenths of a millimetre.
    let d = sheet["screen_distance_mm"].as_f64().unwrap();
    let sep = sheet["screen_separation_mm"].as_f64().unwrap();
    assert!(d >= 100.0, "{d}");
    let chord = d * spread.to_radians();
    assert!((sep - chord).abs() < 0.3, "{sep} against {chord}");
}

#[test]
fn spectrum_screen_goes_as_far_as_two_ray_widths_need_on_big_paper() {
    // On A3 a 60° polycarbonate prism (more dispersive) reaches two ray widths.
    let kit = format!(
        "{}[[pieces]]\nid = \"tri-50\"\nmaterial = \"pc\"\nshape = \"prism\"\napex_deg = 60\nside_mm = 50\n[[sheets]]\nkind = \"spectrum\"\npiece = \"tri-50\"\nangles_deg = [55]\n",
        HEAD.replace(
            "[materials.pmma]\ncatalog = \"pmma-beadie-2015\"",
            "[materials.pc]\ncatalog = \"pc-sultanova-2009\""
        )
    );
    let lesson = Lesson::from_toml(&kit, "pc.toml").unwrap_or_else(|e| panic!("{e}"));
    let paper = PaperSpec {
        size: PaperSize::named("A3").expect("A3"),
        orientation: Orientation::Auto,
        margin_mm: 10.0,
    };
    let plans = plan_lesson(&lesson, &paper);
    let a: Value = serde_json::from_str(&raysheet::output::answers::to_json("t", None, &plans)).unwrap();
    let sep = a["sheets"][0]["screen_separation_mm"].as_f64().unwrap();
    let d = a["sheets"][0]["screen_distance_mm"].as_f64().unwrap();
    // Two ray widths (4 mm), reached within one 5 mm step of the screen.
    assert!((4.0..4.0 + 5.0 * 0.03).contains(&sep), "{sep} mm at {d} mm");
}

fn key_kit() -> Lesson {
    let kit = half_disc_40(
        "kind = \"curved-face\"\npiece = \"hd-40\"\nheights_mm = [10, -10]\nall_colours = true\n",
    );
    Lesson::from_toml(&kit, "colours.toml").unwrap_or_else(|e| panic!("{e}"))
}

/// `(stroke colour, dash array)` of every stroked element of an SVG.
fn strokes(svg: &str) -> Vec<(String, String)> {
    let attr = |el: &str, name: &str| {
        let key = format!(" {name}=\"");
        el.find(&key).map(|k| {
            let rest = &el[k + key.len()..];
            rest[..rest.find('"').unwrap_or(0)].to_string()
        })
    };
    svg.split('<')
        .filter_map(|el| {
            let stroke = attr(el, "stroke")?;
            (stroke != "none").then(|| (stroke, attr(el, "stroke-dasharray").unwrap_or_default()))
        })
        .collect()
}

fn is_grey(hex: &str) -> bool {
    hex.len() == 7 && hex[1..3] == hex[3..5] && hex[3..5] == hex[5..7]
}

fn rgb(hex: &str) -> [u8; 3] {
    [1, 3, 5].map(|k| u8::from_str_radix(&hex[k..k + 2], 16).expect("hex"))
}

#[test]
fn colour_key_stays_readable_in_black_and_white() {
    let lesson = key_kit();
    let paper = a4();
    let plans = plan_lesson(&lesson, &paper);
    let out = build_plans(&lesson, &plans, &paper, Formats { pdf: true, svg: true }, None).expect("builds");
    let svg = out.iter().find(|o| o.path.ends_with(".svg") && o.path.contains("key")).expect("a key SVG");
    let svg = String::from_utf8(svg.bytes.clone()).expect("utf-8");
    let all = strokes(&svg);
    let mut by_colour: BTreeMap<String, BTreeSet<String>> = BTreeMap::new();
    let mut construction: BTreeSet<String> = BTreeSet::new();
    for (stroke, dash) in &all {
        if is_grey(stroke) {
            construction.insert(dash.clone());
        } else {
            by_colour.entry(stroke.clone()).or_default().insert(dash.clone());
        }
    }
    assert_eq!(by_colour.len(), 3, "{by_colour:?}");
    // Each colour has one dash array of its own, none solid, none a construction line's.
    let mut seen = BTreeSet::new();
    for (c, dashes) in &by_colour {
        assert_eq!(dashes.len(), 1, "{c}: {dashes:?}");
        let d = dashes.iter().next().unwrap();
        assert!(!d.is_empty() && !construction.contains(d), "{c}: {d} (construction: {construction:?})");
        assert!(seen.insert(d.clone()), "{d} used twice");
    }
    // The initials at both ends of both rays (and in the legend's words).
    for initial in ["R", "G", "B"] {
        let n = svg.matches(&format!(">{initial}<")).count();
        assert!(n >= 4, "{initial} printed {n} times");
    }
    // Relative luminance (IEC 61966-2-1) of the three paints, apart by 0.1 or more.
    let lum = |c: [u8; 3]| {
        let lin = c.map(|v| {
            let e = f64::from(v) / 255.0;
            if e <= 0.04045 { e / 12.92 } else { ((e + 0.055) / 1.055).powf(2.4) }
        });
        0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]
    };
    let ys: Vec<f64> = by_colour.keys().map(|c| lum(rgb(c))).collect();
    for a in 0..ys.len() {
        for b in a + 1..ys.len() {
            assert!((ys[a] - ys[b]).abs() >= 0.1, "{ys:?}");
        }
    }

    // The PDF key rendered by poppler, in colour and in greyscale: the pixels
    // painted in each colour turn into grey levels that differ.
    if !have_tool("pdftoppm", "-v", "poppler-utils") {
        return;
    }
    let dir = tempfile::tempdir().expect("temp dir");
    let pdf = dir.path().join("keys.pdf");
    std::fs::write(&pdf, &out.iter().find(|o| o.path == "keys.pdf").expect("keys.pdf").bytes).unwrap();
    let render = |stem: &str, gray: bool| {
        let mut cmd = Command::new("pdftoppm");
        cmd.args(["-r", "300", "-f", "1", "-l", "1", "-png", "-singlefile"]);
        if gray {
            cmd.arg("-gray");
        }
        assert!(cmd.arg(&pdf).arg(dir.path().join(stem)).status().expect("pdftoppm runs").success());
        Pixmap::load_png(dir.path().join(format!("{stem}.png"))).expect("png")
    };
    let (colour_px, grey_px) = (render("colour", false), render("grey", true));
    assert_eq!((colour_px.width(), colour_px.height()), (grey_px.width(), grey_px.height()));
    let mut greys: BTreeMap<String, Vec<u8>> = BTreeMap::new();
    for (k, p) in colour_px.pixels().iter().enumerate() {
        let px = [p.red(), p.green(), p.blue()];
        for c in by_colour.keys() {
            let want = rgb(c);
            if px.iter().zip(want).all(|(a, b)| a.abs_diff(b) <= 3) {
                greys.entry(c.clone()).or_default().push(grey_px.pixels()[k].red());
            }
        }
    }
    let medians: Vec<u8> = by_colour
        .keys()
        .map(|c| {
            let v = greys.get_mut(c).unwrap_or_else(|| panic!("no pixel painted {c}"));
            assert!(v.len() >= 20, "{c}: {} pixels", v.len());
            v.sort_unstable();
            v[v.len() / 2]
        })
        .collect();
    for a in 0..medians.len() {
        for b in a + 1..medians.len() {
            assert!(medians[a].abs_diff(medians[b]) >= 20, "grey levels {medians:?}");
        }
    }
}

#[test]
fn spectrum_sheets_refuse_what_gives_no_spectrum() {
    let prism = |apex: f64, material: &str, extra: &str| {
        format!(
            "{}[[pieces]]\nid = \"tri\"\nmaterial = \"pmma\"\nshape = \"prism\"\napex_deg = {apex}\nside_mm = 50\n[[sheets]]\nkind = \"spectrum\"\npiece = \"tri\"\n{extra}",
            HEAD.replace("catalog = \"pmma-beadie-2015\"", material)
        )
    };
    let beadie = "catalog = \"pmma-beadie-2015\"";
    // A right-angle prism reflects the ray totally; one index has no dispersion; one white ray.
    for (text, field, says) in [
        (prism(90.0, beadie, ""), "sheets[1].kind", "right-angle prism"),
        (prism(60.0, "index = 1.49", ""), "sheets[1].kind", "no dispersion"),
        (prism(60.0, beadie, "angles_deg = [45, 50]\n"), "sheets[1].angles_deg", "one white ray"),
    ] {
        let e = Lesson::from_toml(&text, "spectrum.toml").expect_err("refused");
        let shown = e.to_string();
        assert_eq!(e.field, field, "{shown}");
        assert!(shown.contains(says) && !e.hint.is_empty(), "{shown}");
    }
    assert!(Lesson::from_toml(&prism(60.0, beadie, "angles_deg = [45]\n"), "spectrum.toml").is_ok());
}
