//! Benchmarks: whole-piece traces per second on the (frozen) demo pieces, the
//! demo build (all sheets and keys, PDF and SVG) and a 30-group class set.
//!
//! Run: `cargo bench` (figures go in README.md).

use std::hint::black_box;

use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use raysheet::optics::{Entry, Outline, trace_parallel};
use raysheet::output::{Formats, build_class, build_plans};
use raysheet::plan::{Group, folder_names};
use raysheet::sheets::{Enter, Lesson, plan_class, plan_lesson};

/// The demo kit as it stood when the benchmark figures were first taken
/// (four lens sheets), frozen so figures stay comparable as the demo grows.
const BENCH_KIT: &str = include_str!("fixtures/lens-demo.toml");

fn demo() -> Lesson {
    Lesson::from_toml(BENCH_KIT, "lens-demo.toml").expect("the bench kit is valid")
}

fn traces(c: &mut Criterion) {
    let kit = demo();
    let outlines: Vec<Outline> = kit
        .sheets
        .iter()
        .filter_map(|s| {
            let entry = if s.enter == Enter::Back { Entry::Back } else { Entry::Front };
            kit.pieces[s.piece].piece.lens().map(|l| Outline::new(*l, entry))
        })
        .collect();
    // 100 heights across each piece's middle 80 %.
    let heights: Vec<f64> = (0..100).map(|i| -0.4 + 0.8 * f64::from(i) / 99.0).collect();
    let per_iter = (outlines.len() * heights.len()) as u64;
    let mut g = c.benchmark_group("trace");
    g.throughput(Throughput::Elements(per_iter));
    g.bench_function("demo pieces, whole-piece traces", |b| {
        b.iter(|| {
            let mut sum = 0.0;
            for o in &outlines {
                let a = o.a();
                for &f in &heights {
                    let tr = trace_parallel(o, black_box(f * a), 10.0);
                    sum += tr.exit_dir.y;
                }
            }
            black_box(sum)
        })
    });
    g.finish();
}

fn builds(c: &mut Criterion) {
    let kit = demo();
    let both = Formats { pdf: true, svg: true };
    let mut g = c.benchmark_group("build");
    g.sample_size(10);
    g.bench_function("demo kit, sheets and keys, pdf+svg", |b| {
        b.iter(|| {
            let plans = plan_lesson(&kit, &kit.paper);
            black_box(build_plans(&kit, &plans, &kit.paper, both, None).expect("build"))
        })
    });
    // A 30-sheet set: the demo's four sheets repeated.
    let mut kit30 = kit.clone();
    kit30.sheets = (0..30)
        .map(|i| {
            let mut s = kit.sheets[i % kit.sheets.len()].clone();
            s.number = i + 1;
            s
        })
        .collect();
    g.bench_function("30-sheet set, sheets and keys, pdf+svg", |b| {
        b.iter(|| {
            let plans = plan_lesson(&kit30, &kit30.paper);
            black_box(build_plans(&kit30, &plans, &kit30.paper, both, None).expect("build"))
        })
    });
    let names: Vec<String> = (1..=30).map(|i| format!("Bench {i}")).collect();
    let folders = folder_names(&names);
    g.bench_function("demo kit, 30-group class set, pdf+svg", |b| {
        b.iter(|| {
            let groups = names
                .iter()
                .zip(&folders)
                .map(|(n, f)| Group { name: n.clone(), folder: f.clone() })
                .collect();
            let cp = plan_class(&kit, &kit.paper, groups, 2031);
            black_box(build_class(&kit, &cp, &kit.paper, both).expect("build"))
        })
    });
    g.finish();
}

criterion_group!(benches, traces, builds);
criterion_main!(benches);
