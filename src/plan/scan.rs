//! The generic 1-D safe band: the run of one sheet parameter (a guide height
//! or an angle of incidence) where every criterion passes, found by scanning
//! and refined by bisection, with what stops it at each end.

/// A band `[min, max]` of one parameter and the limit met just beyond each end.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Band<L> {
    /// Lower end.
    pub min: f64,
    /// Upper end.
    pub max: f64,
    /// What stops the band going lower.
    pub min_limit: L,
    /// What stops it going higher.
    pub max_limit: L,
}

impl<L> Band<L> {
    /// Whether `v` lies in the band (to 1e-9).
    pub fn contains(&self, v: f64) -> bool {
        (self.min - 1e-9..=self.max + 1e-9).contains(&v)
    }

    /// Width of the band.
    pub fn width(&self) -> f64 {
        self.max - self.min
    }
}

/// How to scan one parameter.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Scan<L> {
    /// Lowest value scanned.
    pub from: f64,
    /// Highest value scanned.
    pub to: f64,
    /// Scan step (the band's ends are then refined by bisection).
    pub step: f64,
    /// Among passing runs, prefer the one containing this value, then the widest.
    pub prefer: f64,
    /// Refine the ends until they are known to within this.
    pub resolution: f64,
    /// The limit reported at `from` when the band reaches it.
    pub at_from: L,
    /// The limit reported at `to` when the band reaches it.
    pub at_to: L,
}

/// Scans `check` (`None`: the value passes; `Some(limit)`: the first criterion
/// it fails) from `from` to `to` in steps of `step` (at most 20 000 steps;
/// wider ranges scan coarser), takes the preferred run of passing values and
/// refines both ends by bisection (at most 40 halvings). `None` when no value passes.
pub fn find_band<L: Copy>(scan: &Scan<L>, check: impl Fn(f64) -> Option<L>) -> Option<Band<L>> {
    const MAX_STEPS: usize = 20_000;
    let span = scan.to - scan.from;
    if !(span.is_finite() && span >= 0.0 && scan.step > 0.0) {
        return None;
    }
    let step = (span / MAX_STEPS as f64).max(scan.step);
    let n = ((span / step).floor() as usize).min(MAX_STEPS);
    let at = |i: usize| scan.from + i as f64 * step;
    let ok: Vec<bool> = (0..=n).map(|i| check(at(i)).is_none()).collect();
    let mut runs: Vec<(usize, usize)> = Vec::new();
    let mut i = 0;
    while i <= n {
        if ok[i] {
            let start = i;
            while i < n && ok[i + 1] {
                i += 1;
            }
            runs.push((start, i));
        }
        i += 1;
    }
    let (lo, hi) = runs.iter().copied().max_by(|&(s1, e1), &(s2, e2)| {
        let c1 = (at(s1)..=at(e1)).contains(&scan.prefer);
        let c2 = (at(s2)..=at(e2)).contains(&scan.prefer);
        (c1, e1 - s1).cmp(&(c2, e2 - s2))
    })?;
    let refine = |mut good: f64, mut bad: f64| {
        for _ in 0..40 {
            let mid = 0.5 * (good + bad);
            if check(mid).is_none() {
                good = mid;
            } else {
                bad = mid;
            }
            if (good - bad).abs() < scan.resolution {
                break;
            }
        }
        (good, bad)
    };
    let (min, min_limit) = if lo == 0 {
        (scan.from, check(scan.from).unwrap_or(scan.at_from))
    } else {
        let (good, bad) = refine(at(lo), at(lo - 1));
        (good, check(bad).unwrap_or(scan.at_from))
    };
    let (max, max_limit) = if hi == n {
        (at(hi), check(scan.to).unwrap_or(scan.at_to))
    } else {
        let (good, bad) = refine(at(hi), at(hi + 1));
        (good, check(bad.min(scan.to)).unwrap_or(scan.at_to))
    };
    Some(Band { min, max, min_limit, max_limit })
}

/// Values on a grid of `step` from `lo` to `hi`, both ends included when on the grid.
pub fn grid_values(lo: f64, hi: f64, step: f64) -> Vec<f64> {
    let a = (lo / step - 1e-9).ceil() as i64;
    let b = (hi / step + 1e-9).floor() as i64;
    (a..=b).map(|k| k as f64 * step).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[derive(Clone, Copy, Debug, PartialEq)]
    enum Why {
        Low,
        High,
        End,
    }

    fn scan() -> Scan<Why> {
        Scan {
            from: 0.0,
            to: 50.0,
            step: 0.05,
            prefer: 12.0,
            resolution: 1e-3,
            at_from: Why::End,
            at_to: Why::End,
        }
    }

    #[test]
    fn band_ends_are_refined_to_the_resolution() {
        let check = |v: f64| {
            if v < 7.3 {
                Some(Why::Low)
            } else if v > 31.4159 {
                Some(Why::High)
            } else {
                None
            }
        };
        let b = find_band(&scan(), check).unwrap();
        assert!((b.min - 7.3).abs() < 1e-3 && b.min >= 7.3, "{b:?}");
        assert!((b.max - 31.4159).abs() < 1e-3 && b.max <= 31.4159, "{b:?}");
        assert_eq!((b.min_limit, b.max_limit), (Why::Low, Why::High));
        assert!(b.contains(20.0) && !b.contains(35.0));
    }

    #[test]
    fn preferred_run_wins_over_a_wider_one_and_empty_is_none() {
        // Two runs: 2–10 (contains the preferred 5) and 20–45 (wider).
        let check = |v: f64| ((2.0..=10.0).contains(&v) || (20.0..=45.0).contains(&v)).not_then(Why::Low);
        let mut s = scan();
        s.prefer = 5.0;
        let b = find_band(&s, check).unwrap();
        assert!(b.max < 10.01, "{b:?}");
        s.prefer = 100.0;
        let b = find_band(&s, check).unwrap();
        assert!(b.min > 19.99, "{b:?}");
        assert_eq!(find_band(&s, |_| Some(Why::High)), None);
        // A band reaching both ends of the scan reports the end limits.
        let all = find_band(&s, |_| None::<Why>).unwrap();
        assert_eq!((all.min, all.max, all.min_limit, all.max_limit), (0.0, 50.0, Why::End, Why::End));
    }

    trait NotThen {
        fn not_then<T>(self, t: T) -> Option<T>;
    }
    impl NotThen for bool {
        fn not_then<T>(self, t: T) -> Option<T> {
            (!self).then_some(t)
        }
    }

    #[test]
    fn grid_values_are_inclusive_and_on_the_grid() {
        assert_eq!(grid_values(2.2, 4.0, 0.5), vec![2.5, 3.0, 3.5, 4.0]);
        assert!(grid_values(3.1, 3.4, 0.5).is_empty());
        assert_eq!(grid_values(-3.5, 3.5, 1.0), vec![-3.0, -2.0, -1.0, 0.0, 1.0, 2.0, 3.0]);
    }
}
