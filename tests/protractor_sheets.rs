//! Index and critical-angle sheets (issue 8) end to end: the answer file
//! against Snell's law in closed form, exam mark-scheme values, the printed
//! protractor read back from the PDF at true scale, and class variants.
//!
//! The kit below is this test's own (a "protractor bench" with two half-discs
//! of 35 mm radius, n = 1.49 and n = 1.50); no number comes from the demo kit.

use raysheet::output::Formats;
use raysheet::output::answers::to_json;
use raysheet::paper::Orientation;
use raysheet::plan::Group;
use raysheet::sheets::{Lesson, plan_class, plan_lesson};
use serde_json::Value;

#[expect(dead_code, reason = "the shared test helpers hold more than this file reads")]
mod common {
    pub mod pdfread;
    pub mod sheets;
    pub mod tools;
}
use common::pdfread::{PT_PER_MM, Seg, Visit, load, page_ids, walk};
use common::sheets::{build, file, paper};

const FILE: &str = "protractor.toml";
const R_MM: f64 = 35.0;

fn kit(sheets: &str) -> Lesson {
    let text = format!(
        r#"title = "Protractor bench"
[materials.a149]
index = 1.49
[materials.a150]
index = 1.50
[[pieces]]
id = "hd149"
material = "a149"
front = "flat"
back = {{ curve = "convex", radius_mm = {R_MM} }}
thickness_mm = {R_MM}
height_mm = {h}
[[pieces]]
id = "hd150"
material = "a150"
front = {{ curve = "convex", radius_mm = {R_MM} }}
back = "flat"
thickness_mm = {R_MM}
height_mm = {h}
{sheets}"#,
        h = 2.0 * R_MM
    );
    Lesson::from_toml(&text, FILE).unwrap_or_else(|e| panic!("the kit is valid: {e}"))
}

fn answers(lesson: &Lesson) -> Value {
    let plans = plan_lesson(lesson, &lesson.paper);
    serde_json::from_str(&to_json(&lesson.title, None, &plans)).expect("the answer file is JSON")
}

fn close(a: f64, b: f64, tol: f64, what: &str) {
    assert!((a - b).abs() <= tol, "{what}: expected {b} ± {tol}, got {a}");
}

const TEN_STEPS: &str = "angles_deg = [10, 20, 30, 40, 50, 60, 70, 80]";

#[test]
fn snell_at_the_flat_face_for_n_149_and_150_in_10_degree_steps_both_ways() {
    let sheets = ["hd149", "hd150"]
        .iter()
        .flat_map(|p| {
            ["curved", "flat"].map(|e| {
                format!("[[sheets]]\nkind = \"index\"\npiece = \"{p}\"\nenter = \"{e}\"\n{TEN_STEPS}\n")
            })
        })
        .collect::<String>();
    let a = answers(&kit(&sheets));
    let list = a["sheets"].as_array().expect("sheets");
    assert_eq!(list.len(), 4);
    for (k, (n, enter)) in
        [(1.49f64, "curved"), (1.49, "flat"), (1.50, "curved"), (1.50, "flat")].iter().enumerate()
    {
        let s = &list[k];
        assert_eq!(s["enter"], *enter);
        // θc = asin(1/n) (closed form).
        close(
            s["critical_angle_deg"].as_f64().unwrap(),
            (1.0 / n).asin().to_degrees(),
            1e-9,
            "critical angle",
        );
        let rays = s["rays"].as_array().unwrap();
        assert_eq!(rays.len(), 8);
        for r in rays {
            let i = r["angle_of_incidence_deg"].as_f64().unwrap();
            // Snell's law at the flat face: n·sin(angle in acrylic) = sin(angle in air).
            let sin_out =
                if *enter == "curved" { n * i.to_radians().sin() } else { i.to_radians().sin() / n };
            if sin_out > 1.0 {
                assert_eq!(r["outcome"], "total-internal-reflection", "{enter} n = {n} at {i}°");
                assert!(r["refraction_angle_deg"].is_null());
                // The law of reflection: out at the angle it came in.
                close(r["reflection_angle_deg"].as_f64().unwrap(), i, 1e-9, "reflection");
            } else {
                assert_eq!(r["outcome"], "refracts", "{enter} n = {n} at {i}°");
                let want = sin_out.asin().to_degrees();
                close(r["refraction_angle_deg"].as_f64().unwrap(), want, 1e-9, "refraction");
            }
            assert!(r["tolerance_deg"].as_f64().unwrap() > 0.5, "a tolerance from the geometry");
        }
    }
}

#[test]
fn exam_mark_scheme_values() {
    // From memory, as reproduced by revision sites (CIE IGCSE mark schemes;
    // DESIGN.md): sin r = 1.49·sin 30° gives r = 48.0°–48.2°; n = 1.5 gives a
    // critical angle of 41.8°.
    let a = answers(&kit(
        "[[sheets]]\nkind = \"index\"\npiece = \"hd149\"\nangles_deg = [30]\n[[sheets]]\nkind = \"critical-angle\"\npiece = \"hd150\"\n",
    ));
    let r = a["sheets"][0]["rays"][0]["refraction_angle_deg"].as_f64().unwrap();
    assert!((48.0..=48.2).contains(&r), "r = {r}");
    let c = a["sheets"][1]["critical_angle_deg"].as_f64().unwrap();
    assert_eq!(format!("{c:.1}"), "41.8");
    // n = 1/sin θc gives the index back.
    close(a["sheets"][1]["index_from_critical_angle"].as_f64().unwrap(), 1.5, 1e-12, "n from θc");
}

#[test]
fn a_critical_angle_sheet_has_rays_either_side_and_says_which_leave() {
    let a = answers(&kit("[[sheets]]\nkind = \"critical-angle\"\npiece = \"hd149\"\n"));
    let s = &a["sheets"][0];
    let crit = s["critical_angle_deg"].as_f64().unwrap();
    let rays = s["rays"].as_array().unwrap();
    assert_eq!(rays.len(), 4);
    for r in rays {
        let i = r["angle_of_incidence_deg"].as_f64().unwrap();
        assert_eq!(i, i.round(), "on a 1° grid");
        assert!((i - crit).abs() <= 5.0 && (i - crit).abs() > 0.5, "{i} near θc = {crit}");
        let want = if i < crit { "refracts" } else { "total-internal-reflection" };
        assert_eq!(r["outcome"], want, "{i}");
        assert_eq!(r["graded"], true);
    }
    assert_eq!(rays.iter().filter(|r| r["outcome"] == "refracts").count(), 2);
}

#[test]
fn class_variants_differ_for_every_group() {
    let lesson = kit(
        "[[sheets]]\nkind = \"critical-angle\"\npiece = \"hd149\"\n[[sheets]]\nkind = \"index\"\npiece = \"hd150\"\n[[sheets]]\nkind = \"index\"\npiece = \"hd149\"\nenter = \"flat\"\n",
    );
    let groups: Vec<Group> =
        (1..=8).map(|k| Group { name: format!("Bench {k}"), folder: format!("{k:02}-bench-{k}") }).collect();
    let class = plan_class(&lesson, &lesson.paper, groups, 11);
    for sheet in 0..3 {
        let sets: Vec<String> = class
            .plans
            .iter()
            .map(|g| {
                let a: Value =
                    serde_json::from_str(&to_json(&lesson.title, None, std::slice::from_ref(&g[sheet])))
                        .unwrap();
                a["sheets"][0]["rays"]
                    .as_array()
                    .unwrap()
                    .iter()
                    .map(|r| r["angle_of_incidence_deg"].to_string())
                    .collect::<Vec<_>>()
                    .join(",")
            })
            .collect();
        let distinct: std::collections::BTreeSet<&String> = sets.iter().collect();
        assert_eq!(distinct.len(), sets.len(), "sheet {sheet}: {sets:?}");
    }
    // Curved face first, every group's index sheet shows a totally reflected ray as well.
    for g in &class.plans {
        let a: Value =
            serde_json::from_str(&to_json(&lesson.title, None, std::slice::from_ref(&g[1]))).unwrap();
        let rays = a["sheets"][0]["rays"].as_array().unwrap();
        assert_eq!(rays.iter().filter(|r| r["outcome"] == "total-internal-reflection").count(), 1);
    }
    // Same kit and seed, same plans.
    let again = plan_class(&lesson, &lesson.paper, class.groups.clone(), 11);
    assert_eq!(again.plans, class.plans);
}

/// A point on the page, mm.
type P = (f64, f64);

/// Straight stroked segments of a page, mm, with their line widths, mm.
#[derive(Default)]
struct Lines(Vec<(P, P, f64)>);

impl Visit for Lines {
    fn path(&mut self, segs: Vec<Seg>, width_pt: f64, stroked: bool) {
        if !stroked || segs.len() != 1 {
            return;
        }
        if let Seg::Line(a, b) = segs[0] {
            let mm = |p: (f64, f64)| (p.0 / PT_PER_MM, p.1 / PT_PER_MM);
            self.0.push((mm(a), mm(b), width_pt / PT_PER_MM));
        }
    }
}

fn sub(a: (f64, f64), b: (f64, f64)) -> (f64, f64) {
    (a.0 - b.0, a.1 - b.1)
}
fn len(v: (f64, f64)) -> f64 {
    v.0.hypot(v.1)
}

#[test]
fn the_printed_protractor_is_true_to_scale_in_the_pdf() {
    let lesson = kit("[[sheets]]\nkind = \"index\"\npiece = \"hd149\"\n");
    let out = build(&lesson, &paper("A4", Orientation::Portrait), Formats { pdf: true, svg: false });
    let a: Value = serde_json::from_slice(file(&out, "answers.json")).unwrap();
    let p_mm = a["sheets"][0]["protractor_radius_mm"].as_f64().unwrap();
    assert_eq!(p_mm, R_MM + 5.0, "the scale 5 mm outside the half-disc (SCALE_GAP_MM)");
    let doc = load(file(&out, "sheets.pdf"));
    let mut lines = Lines::default();
    walk(&doc, page_ids(&doc)[0], &mut lines);
    // The centre: where the normal (horizontal) and the flat-face line
    // (vertical), each drawn across the protractor (2P long), cross.
    let across = |horizontal: bool| {
        lines
            .0
            .iter()
            .find(|(a, b, _)| {
                let d = sub(*b, *a);
                (len(d) - 2.0 * p_mm).abs() < 0.01
                    && if horizontal { d.1.abs() < 1e-4 } else { d.0.abs() < 1e-4 }
            })
            .copied()
            .expect("the normal and the flat-face line")
    };
    let (n0, n1, _) = across(true);
    let (f0, _, _) = across(false);
    let centre = (f0.0, n0.1);
    close((n0.0 + n1.0) / 2.0, centre.0, 1e-4, "the normal is centred on the flat-face line");
    // Ticks: 1.3, 2.3 and 3.3 mm long (src/draw/fan.rs), their inner ends on the circle.
    let ticks: Vec<((f64, f64), (f64, f64))> = lines
        .0
        .iter()
        .filter(|(a, b, _)| [1.3, 2.3, 3.3].iter().any(|l| (len(sub(*b, *a)) - l).abs() < 1e-3))
        .map(|&(a, b, _)| if len(sub(a, centre)) < len(sub(b, centre)) { (a, b) } else { (b, a) })
        .filter(|(inner, _)| (len(sub(*inner, centre)) - p_mm).abs() < 0.5)
        .collect();
    assert_eq!(ticks.len(), 360, "a tick every degree round the full circle");
    for (inner, outer) in &ticks {
        // Each tick's distance from the centre is the drawn radius, to 0.01 mm.
        close(len(sub(*inner, centre)), p_mm, 0.01, "tick radius");
        // And it points straight away from the centre.
        let (u, v) = (sub(*inner, centre), sub(*outer, *inner));
        assert!((u.0 * v.1 - u.1 * v.0).abs() / (len(u) * len(v)) < 1e-4, "radial tick");
    }
    let at = |deg: f64| {
        let want = (deg.to_radians().cos(), deg.to_radians().sin());
        ticks
            .iter()
            .find(|(inner, outer)| {
                let u = sub(*inner, centre);
                (len(sub(*outer, *inner)) - 3.3).abs() < 1e-3
                    && (u.0 / len(u) - want.0).abs() < 1e-4
                    && (u.1 / len(u) - want.1).abs() < 1e-4
            })
            .copied()
            .unwrap_or_else(|| panic!("a numbered tick at {deg}°"))
    };
    // 0° (the normal, both sides) and 90° (the flat face, both ends) are perpendicular.
    for (z, q) in [(0.0, 90.0), (180.0, 270.0), (0.0, 270.0)] {
        let (a, b) = (at(z), at(q));
        let (u, v) = (sub(a.1, a.0), sub(b.1, b.0));
        assert!(
            (u.0 * v.0 + u.1 * v.1).abs() / (len(u) * len(v)) < 1e-4,
            "{z}° and {q}° ticks perpendicular"
        );
    }
}

#[test]
fn fixed_angles_that_are_hard_to_set_up_are_warned_about() {
    let l = kit(
        "[[sheets]]\nkind = \"index\"\npiece = \"hd149\"\nenter = \"flat\"\nangles_deg = [30, 75]\n[[sheets]]\nkind = \"index\"\npiece = \"hd149\"\nangles_deg = [20, 88]\n[[sheets]]\nkind = \"critical-angle\"\npiece = \"hd149\"\nangles_deg = [42]\n",
    );
    let plans = plan_lesson(&l, &l.paper);
    let w = |k: usize| plans[k].warnings.join("\n");
    // 1/cos 75° = 3.9 ray widths on the face (block sheets stop at 3).
    assert!(
        w(0).contains(
            "ray B at 75°: it meets the flat face so obliquely that its spot there is 4 ray widths long"
        ),
        "{}",
        w(0)
    );
    assert!(!w(0).contains("ray A"), "{}", w(0));
    // At 88° the ray enters 2·35·sin 1° = 1.2 mm from the corner (ray 2 mm wide).
    assert!(
        w(1).contains("ray B at 88°: it enters the curved face within a ray width and a half of the corner"),
        "{}",
        w(1)
    );
    // 42° is within the aiming error of θc = 42.16° (n = 1.49): not graded, and said so.
    assert!(w(2).contains("ray A at 42°: within the aiming error of the critical angle (42.2°)"), "{}", w(2));
}

#[test]
fn the_keys_accept_ranges_name_the_aiming_error_of_the_staggered_guides_too() {
    // 20°, 23° and 26° are closer than the crowding limit, so the second and
    // third guides start further out: their aiming error is smaller.
    let l = kit("[[sheets]]\nkind = \"index\"\npiece = \"hd149\"\nangles_deg = [20, 23, 26, 50]\n");
    let plans = plan_lesson(&l, &l.paper);
    let a = answers(&l);
    let rays = a["sheets"][0]["rays"].as_array().unwrap();
    let aims: Vec<f64> = rays.iter().map(|r| r["tolerance_parts_deg"]["aiming"].as_f64().unwrap()).collect();
    let (lo, hi) = aims.iter().fold((f64::INFINITY, 0.0f64), |(l, h), a| (l.min(*a), h.max(*a)));
    assert!(hi - lo > 0.05, "the guides are staggered: {aims:?}");
    let w = raysheet::draw::Words::shipped();
    let lines = plans[0].view().key_lines(&w).join("\n");
    // The text gives the range the rays' accept ranges use, not one value.
    let range = format!("{:.1}°–{:.1}°", lo, hi);
    assert!(lines.contains(&range), "{range} in:\n{lines}");
    // The aiming error is atan(slip / guide length) (our tolerance model,
    // issue 8): the longest guide follows from the smallest error.
    let slip = 1.0; // half the default 2 mm ray width
    let long = slip / lo.to_radians().tan();
    assert!(lines.contains("mm on guides ") && lines.contains(&format!("–{:.1} mm long", long)), "{lines}");
}
