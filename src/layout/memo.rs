//! A memo of [`super::one_page_regions`] for the length of one layout call:
//! whether a plan's text fits beside its drawing is asked for both
//! orientations, for the sheet and its key and for the page count, and each
//! answer lays out the whole text block (a third of a class set's CPU time
//! before this memo).
//!
//! Entries are keyed by the plan's and the templates' addresses. That is
//! sound only while neither can move, change or be dropped, and no other plan
//! can take a dropped one's place: inside [`scope`], whose callers hold the
//! plans and templates, unchanged, for the whole call (`layout`, the page
//! checks and reports, and the CLI's build, where every plan is made before
//! the scope's work and dropped at its end). Outside a scope nothing is
//! remembered.

use std::cell::RefCell;

use super::Regions;
use crate::paper::PaperSpec;
use crate::sheets::SheetPlan;

/// (plan address, templates address, page width and height bits, margin
/// bits): the regions depend on the paper only through its turned size and
/// margin, so `auto` and the orientation it resolves to share an entry.
type Key = (usize, usize, u64, u64, u64);

/// The answers remembered in the open scope (`None`: no scope is open).
type Entries = Option<Vec<(Key, Option<Regions>)>>;

thread_local! {
    static MEMO: RefCell<Entries> = const { RefCell::new(None) };
}

/// Runs `f` with a fresh memo on this thread (nested scopes share the outer one).
/// The memo is dropped when the outermost scope ends, also by a panic that a
/// caller catches (a property test's case), so no address outlives its plan.
pub fn scope<R>(f: impl FnOnce() -> R) -> R {
    /// Closes the memo when dropped, if this scope opened it.
    struct Close(bool);
    impl Drop for Close {
        fn drop(&mut self) {
            if self.0 {
                MEMO.with(|m| *m.borrow_mut() = None);
            }
        }
    }
    let _close = Close(MEMO.with(|m| {
        let mut m = m.borrow_mut();
        let opens = m.is_none();
        if opens {
            *m = Some(Vec::new());
        }
        opens
    }));
    f()
}

/// The remembered answer for `(p, paper, t)` inside a scope, else `compute()`.
pub fn one_page(
    p: &SheetPlan,
    paper: &PaperSpec,
    t: &super::Templates,
    compute: impl FnOnce() -> Option<Regions>,
) -> Option<Regions> {
    let (w, h) = paper.page_mm();
    let key: Key = (
        std::ptr::from_ref(p) as usize,
        std::ptr::from_ref(t) as usize,
        w.to_bits(),
        h.to_bits(),
        paper.margin_mm.to_bits(),
    );
    let hit = MEMO.with(|m| m.borrow().as_ref().map(|v| v.iter().find(|e| e.0 == key).map(|e| e.1)));
    match hit {
        Some(Some(found)) => found,
        Some(None) => {
            let r = compute();
            MEMO.with(|m| {
                if let Some(v) = m.borrow_mut().as_mut() {
                    v.push((key, r));
                }
            });
            r
        }
        None => compute(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn open() -> bool {
        MEMO.with(|m| m.borrow().is_some())
    }

    #[test]
    fn a_scope_closes_its_memo_even_when_its_work_panics() {
        assert!(!open());
        scope(|| {
            assert!(open());
            scope(|| assert!(open()));
            // The inner scope did not close the outer one's memo.
            assert!(open());
        });
        assert!(!open());
        let caught = std::panic::catch_unwind(|| scope(|| panic!("a failing case")));
        assert!(caught.is_err());
        assert!(!open(), "a panic left the memo open");
    }
}
