//! A whole build as values: every output file's relative path and bytes.
//! Writing them to disk (atomically, without clobbering) is `main.rs`'s job.

use super::{answers, results, summary};
use crate::draw::Words;
use crate::kit::Kit;
use crate::layout::{self, Templates};
use crate::paper::{PaperSpec, PrinterCorrection};
use crate::render::{Deflater, PdfFonts, PdfPage, RenderError, pdf_document, render_pdf, render_svg_page};
use crate::scene::{Item, Scene};
use crate::sheets::{ClassPlan, SheetPlan};

/// Which kinds of file a build writes besides the answer file (and, for a
/// class set, the summary CSV).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub struct Formats {
    /// Write PDFs.
    pub pdf: bool,
    /// Write SVGs.
    pub svg: bool,
}

/// One file of a build.
#[derive(Clone, Debug, PartialEq)]
pub struct Output {
    /// Path relative to the output folder, `/`-separated.
    pub path: String,
    /// The file's bytes.
    pub bytes: Vec<u8>,
}

/// Why a build could not be made.
#[derive(Debug)]
pub enum BuildError {
    /// A renderer refused a drawing (a character the font lacks, say).
    Render(RenderError),
    /// The shipped templates are broken (a build defect).
    Templates(String),
    /// The output would be unreasonably large.
    TooLarge(String),
    /// The kit asks for no sheets.
    Empty,
    /// Edited template text that cannot fit its place on the page.
    TextFit(layout::TextFitError),
}

impl std::fmt::Display for BuildError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            BuildError::Render(e) => write!(f, "{e}"),
            BuildError::Templates(e) | BuildError::TooLarge(e) => write!(f, "{e}"),
            BuildError::TextFit(e) => write!(f, "{e}"),
            BuildError::Empty => {
                let kinds: Vec<String> =
                    crate::sheets::SheetKind::ALL.iter().map(|k| format!("\"{}\"", k.as_str())).collect();
                write!(
                    f,
                    "the kit has no [[sheets]], so there is nothing to print; add a [[sheets]] entry with kind = one of {} and piece = the id of one of the kit's [[pieces]]",
                    kinds.join(", ")
                )
            }
        }
    }
}

impl std::error::Error for BuildError {}

impl From<layout::TextFitError> for BuildError {
    fn from(e: layout::TextFitError) -> BuildError {
        BuildError::TextFit(e)
    }
}

impl From<RenderError> for BuildError {
    fn from(e: RenderError) -> BuildError {
        BuildError::Render(e)
    }
}

fn scene_files(
    scene: &Scene,
    prefix: &str,
    pdf_name: &str,
    formats: Formats,
    out: &mut Vec<Output>,
) -> Result<(), BuildError> {
    if formats.pdf {
        out.push(Output { path: format!("{prefix}{pdf_name}"), bytes: render_pdf(scene)? });
    }
    if formats.svg {
        for page in &scene.pages {
            let svg = render_svg_page(page, &scene.title)?;
            out.push(Output { path: format!("{prefix}svg/{}.svg", page.name), bytes: svg.into_bytes() });
        }
    }
    Ok(())
}

/// Every page of `scene` stretched about its centre by the printer's
/// correction, with a line over the identity box saying so (in `w`). The
/// layout is untouched: the stretch is one transform round the finished page.
pub fn corrected(scene: Scene, printer: Option<PrinterCorrection>, margin_mm: f64, w: &Words) -> Scene {
    let Some(pc) = printer else { return scene };
    let (long, short) = pc.factors();
    let note = w.fill("printer_note", &[("long", &format!("{long:.4}")), ("short", &format!("{short:.4}"))]);
    let pages = scene
        .pages
        .into_iter()
        .map(|mut page| {
            let (sx, sy) = pc.page_factors(page.width_mm, page.height_mm);
            // In the top margin, right-aligned over the identity box: some
            // 7 mm from the paper's edge with the usual 10 mm margin, where
            // printers print; the layout's own places are all taken.
            page.items.push(crate::draw::text(
                crate::geom::Point::new(page.width_mm - margin_mm, page.height_mm - margin_mm + 1.2),
                &note,
                5.0,
                crate::scene::Weight::Regular,
                crate::scene::Anchor::End,
            ));
            let about = crate::geom::Point::new(page.width_mm / 2.0, page.height_mm / 2.0);
            page.items = vec![Item::Scale { sx, sy, about, items: std::mem::take(&mut page.items) }];
            page
        })
        .collect();
    Scene { pages, ..scene }
}

/// Refuses, before any layout, a set where one sheet would be tiled over more
/// than [`MAX_SHEET_PAGES`] pages, or whose sheets and keys would need more
/// than [`MAX_PAGES`] pages (a setup tiled over thousands of pages, say).
fn check_pages<'a>(plans: impl Iterator<Item = &'a SheetPlan>, paper: &PaperSpec) -> Result<(), BuildError> {
    layout::memo_scope(|| check_pages_now(plans, paper))
}

fn check_pages_now<'a>(
    plans: impl Iterator<Item = &'a SheetPlan>,
    paper: &PaperSpec,
) -> Result<(), BuildError> {
    let mut total: usize = 0;
    for p in plans {
        let n = layout::pages_needed(p, paper).saturating_add(usize::from(p.view().has_gauge()));
        if n > MAX_SHEET_PAGES {
            return Err(BuildError::TooLarge(format!(
                "sheet {} would be tiled over {n} pages, more than the {MAX_SHEET_PAGES} pages raysheet prints for one sheet; check the piece's sizes, its curves and the ray box, or use larger paper",
                p.number
            )));
        }
        total = total.saturating_add(n.saturating_mul(2));
        if total > MAX_PAGES {
            return Err(BuildError::TooLarge(format!(
                "the sheets and keys would need more than {MAX_PAGES} pages (sheet {} alone is tiled over {n} pages); raysheet refuses so large a build: check the piece sizes, or use larger paper",
                p.number
            )));
        }
    }
    Ok(())
}

/// What `build` checks before any layout, for `check` to warn about too: the
/// kit has sheets, the paper holds a drawing, and no sheet or set needs too
/// many pages. `plans` are every plan the build would lay out (every group's,
/// for a class set).
pub fn preflight<'a>(
    kit: &Kit,
    plans: impl Iterator<Item = &'a SheetPlan>,
    paper: &PaperSpec,
) -> Result<(), BuildError> {
    if kit.sheets.is_empty() {
        return Err(BuildError::Empty);
    }
    paper.check().map_err(BuildError::TooLarge)?;
    check_pages(plans, paper)
}

/// Builds the student sheets, keys and answer file for already-made plans,
/// with the shipped templates.
pub fn build_plans(
    kit: &Kit,
    plans: &[SheetPlan],
    paper: &PaperSpec,
    formats: Formats,
    seed: Option<u64>,
) -> Result<Vec<Output>, BuildError> {
    let templates = Templates::shipped().map_err(BuildError::Templates)?;
    build_plans_with(kit, plans, paper, formats, seed, &templates)
}

/// [`build_plans`] with the given sheet text.
pub fn build_plans_with(
    kit: &Kit,
    plans: &[SheetPlan],
    paper: &PaperSpec,
    formats: Formats,
    seed: Option<u64>,
    templates: &Templates,
) -> Result<Vec<Output>, BuildError> {
    if plans.is_empty() {
        return Err(BuildError::Empty);
    }
    preflight(kit, plans.iter(), paper)?;
    let mut set = layout::layout(&kit.title, plans, paper, templates)?;
    set.sheets = corrected(set.sheets, kit.printer, paper.margin_mm, &templates.words);
    set.keys = corrected(set.keys, kit.printer, paper.margin_mm, &templates.words);
    if set.sheets.pages.len() + set.keys.pages.len() > MAX_PAGES {
        return Err(BuildError::TooLarge(format!(
            "these sheets would need {} pages, more than the {MAX_PAGES} raysheet makes in one build; split the kit",
            set.sheets.pages.len() + set.keys.pages.len()
        )));
    }
    let mut out = Vec::new();
    scene_files(&set.sheets, "", "sheets.pdf", formats, &mut out)?;
    scene_files(&set.keys, "", "keys.pdf", formats, &mut out)?;
    out.push(Output {
        path: "answers.json".into(),
        bytes: answers::to_json_for(kit, seed, plans).into_bytes(),
    });
    out.push(Output { path: "results.csv".into(), bytes: results::results_csv(plans).into_bytes() });
    Ok(out)
}

/// Largest number of pages a class set may have (a runaway guard).
pub const MAX_PAGES: usize = 2000;

/// Largest number of pages one sheet may be tiled over: beyond this nobody
/// tapes a sheet together (our bound, common practice, no source). In 20
/// landscape A4 pages (5 × 4 tiles) a setup may be about 1.3 m by 0.4 m.
pub const MAX_SHEET_PAGES: usize = 20;

/// Builds a class set: per-group folders with sheets, keys and SVGs; every
/// group's sheets and keys in one PDF each; the summary; the answer file.
pub fn build_class(
    kit: &Kit,
    class: &ClassPlan,
    paper: &PaperSpec,
    formats: Formats,
) -> Result<Vec<Output>, BuildError> {
    let templates = Templates::shipped().map_err(BuildError::Templates)?;
    build_class_with(kit, class, paper, formats, &templates)
}

/// [`build_class`] with the given sheet text, on as many threads as the
/// machine offers ([`default_threads`]).
pub fn build_class_with(
    kit: &Kit,
    class: &ClassPlan,
    paper: &PaperSpec,
    formats: Formats,
    templates: &Templates,
) -> Result<Vec<Output>, BuildError> {
    build_class_on(kit, class, paper, formats, templates, default_threads())
}

/// How many threads a class set is built on by default: the processors the
/// operating system gives this process (1 when it cannot say).
pub fn default_threads() -> usize {
    std::thread::available_parallelism().map_or(1, std::num::NonZeroUsize::get)
}

/// One group's scenes, laid out and corrected for the printer.
struct GroupScenes {
    sheets: Scene,
    keys: Scene,
}

/// One group's files, and its pages ready for the combined PDFs.
struct GroupFiles {
    files: Vec<Output>,
    sheet_pages: Vec<PdfPage>,
    key_pages: Vec<PdfPage>,
}

/// [`build_class_with`] on `threads` threads (at least one). Groups are laid
/// out and rendered in parallel; the files, their order and their bytes are
/// the same for any number of threads.
///
/// Every PDF of the set embeds the same font subsets (every glyph the set
/// shows, subset and compressed once), so each page's content stream is built
/// and compressed once, for its group's PDF, and reused in the combined PDFs.
pub fn build_class_on(
    kit: &Kit,
    class: &ClassPlan,
    paper: &PaperSpec,
    formats: Formats,
    templates: &Templates,
    threads: usize,
) -> Result<Vec<Output>, BuildError> {
    preflight(kit, class.plans.iter().flatten(), paper)?;
    let jobs: Vec<_> = class.groups.iter().zip(&class.plans).collect();
    let laid = in_parallel(threads, jobs, |(group, plans)| {
        let set = layout::layout(&kit.title, plans, paper, templates)?;
        let sheets = corrected(set.sheets, kit.printer, paper.margin_mm, &templates.words);
        let keys = corrected(set.keys, kit.printer, paper.margin_mm, &templates.words);
        Ok::<_, BuildError>(GroupScenes {
            sheets: Scene {
                title: format!("{}: {}: student sheets", kit.title, group.name),
                pages: sheets.pages,
            },
            keys: Scene { title: format!("{}: {}: answer keys", kit.title, group.name), pages: keys.pages },
        })
    })
    .into_iter()
    .collect::<Result<Vec<_>, _>>()?;
    let mut pages = 0_usize;
    for g in &laid {
        pages += g.sheets.pages.len() + g.keys.pages.len();
        if pages > MAX_PAGES {
            return Err(BuildError::TooLarge(format!(
                "this class set would need more than {MAX_PAGES} pages; make fewer groups or fewer sheets"
            )));
        }
    }
    let summary = formats.pdf.then(|| {
        corrected(
            layout::summary_scene(&kit.title, class, paper, templates),
            kit.printer,
            paper.margin_mm,
            &templates.words,
        )
    });
    let fonts = if formats.pdf {
        let scenes = laid.iter().flat_map(|g| [&g.sheets, &g.keys]).chain(summary.as_ref());
        Some(PdfFonts::new(scenes, &mut Deflater::new())?)
    } else {
        None
    };

    let jobs: Vec<_> = class.groups.iter().zip(laid).collect();
    let rendered = in_parallel_with(threads, jobs, Deflater::new, |z, (group, scenes)| {
        group_files(&group.folder, &scenes, fonts.as_ref(), formats, z)
    })
    .into_iter()
    .collect::<Result<Vec<_>, _>>()?;

    let mut out = Vec::new();
    let mut all_sheets = Vec::new();
    let mut all_keys = Vec::new();
    for g in rendered {
        out.extend(g.files);
        all_sheets.extend(g.sheet_pages);
        all_keys.extend(g.key_pages);
    }
    if let (Some(fonts), Some(summary)) = (&fonts, &summary) {
        let title = format!("{}: student sheets, all groups", kit.title);
        out.push(Output { path: "sheets.pdf".into(), bytes: pdf_document(&title, &all_sheets, fonts) });
        drop(all_sheets);
        let title = format!("{}: answer keys, all groups", kit.title);
        out.push(Output { path: "keys.pdf".into(), bytes: pdf_document(&title, &all_keys, fonts) });
        drop(all_keys);
        let mut z = Deflater::new();
        let pages =
            summary.pages.iter().map(|p| PdfPage::new(p, fonts, &mut z)).collect::<Result<Vec<_>, _>>()?;
        out.push(Output { path: "summary.pdf".into(), bytes: pdf_document(&summary.title, &pages, fonts) });
    }
    out.push(Output { path: "summary.csv".into(), bytes: summary::summary_csv(class).into_bytes() });
    let flat: Vec<SheetPlan> = class.plans.iter().flatten().cloned().collect();
    out.push(Output { path: "results.csv".into(), bytes: results::results_csv(&flat).into_bytes() });
    out.push(Output {
        path: "answers.json".into(),
        bytes: answers::to_json_for(kit, Some(class.seed), &flat).into_bytes(),
    });
    Ok(out)
}

/// One group's PDFs (against the set's `fonts`) and SVGs, in the order
/// `scene_files` gives them, and its pages kept for the combined PDFs.
fn group_files(
    folder: &str,
    scenes: &GroupScenes,
    fonts: Option<&PdfFonts>,
    formats: Formats,
    z: &mut Deflater,
) -> Result<GroupFiles, BuildError> {
    let prefix = format!("groups/{folder}/");
    let mut files = Vec::new();
    let mut kept = Vec::new();
    for (scene, name) in [(&scenes.sheets, "sheets.pdf"), (&scenes.keys, "keys.pdf")] {
        let mut pages = Vec::new();
        if let Some(fonts) = fonts {
            pages = scene.pages.iter().map(|p| PdfPage::new(p, fonts, z)).collect::<Result<Vec<_>, _>>()?;
            files.push(Output {
                path: format!("{prefix}{name}"),
                bytes: pdf_document(&scene.title, &pages, fonts),
            });
        }
        if formats.svg {
            for page in &scene.pages {
                let svg = render_svg_page(page, &scene.title)?;
                files
                    .push(Output { path: format!("{prefix}svg/{}.svg", page.name), bytes: svg.into_bytes() });
            }
        }
        kept.push(pages);
    }
    let key_pages = kept.pop().unwrap_or_default();
    let sheet_pages = kept.pop().unwrap_or_default();
    Ok(GroupFiles { files, sheet_pages, key_pages })
}

/// `work` applied to every job on up to `threads` threads; the results in the
/// jobs' order, whichever thread did which job.
fn in_parallel<J: Send, R: Send>(threads: usize, jobs: Vec<J>, work: impl Fn(J) -> R + Sync) -> Vec<R> {
    in_parallel_with(threads, jobs, || (), |(), job| work(job))
}

/// [`in_parallel`] with a value each thread makes once (`init`) and hands to
/// every job it does (a compressor, say).
fn in_parallel_with<J: Send, R: Send, S>(
    threads: usize,
    jobs: Vec<J>,
    init: impl Fn() -> S + Sync,
    work: impl Fn(&mut S, J) -> R + Sync,
) -> Vec<R> {
    let n = jobs.len();
    let threads = threads.clamp(1, n.max(1));
    if threads == 1 {
        let mut state = init();
        return jobs.into_iter().map(|j| work(&mut state, j)).collect();
    }
    // Each thread takes the next job off the shared queue, so a slow group
    // does not hold up the others; the index puts the results back in order.
    let queue = std::sync::Mutex::new(jobs.into_iter().enumerate());
    let next = || queue.lock().unwrap_or_else(std::sync::PoisonError::into_inner).next();
    let mut done: Vec<(usize, R)> = std::thread::scope(|scope| {
        let workers: Vec<_> = (0..threads)
            .map(|_| {
                scope.spawn(|| {
                    let mut state = init();
                    let mut mine = Vec::new();
                    while let Some((i, job)) = next() {
                        mine.push((i, work(&mut state, job)));
                    }
                    mine
                })
            })
            .collect();
        workers
            .into_iter()
            .flat_map(|w| match w.join() {
                Ok(mine) => mine,
                // A panic in a job is a defect: carry it on to the caller.
                Err(panic) => std::panic::resume_unwind(panic),
            })
            .collect()
    });
    done.sort_by_key(|(i, _)| *i);
    done.into_iter().map(|(_, r)| r).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parallel_results_keep_the_jobs_order() {
        for threads in [1, 2, 3, 8] {
            let jobs: Vec<u64> = (0..50).collect();
            // Uneven work, so threads finish out of order.
            let got =
                in_parallel(threads, jobs, |j| (0..(j % 7) * 10_000).fold(j, |a, b| a ^ b.rotate_left(3)));
            let want: Vec<u64> =
                (0..50).map(|j: u64| (0..(j % 7) * 10_000).fold(j, |a, b| a ^ b.rotate_left(3))).collect();
            assert_eq!(got, want, "{threads} threads");
        }
        assert!(in_parallel(2, Vec::<u8>::new(), |j| j).is_empty());
    }
}
