//! Round tick steps and tick values for the axes of a small plot.

/// A step for axis ticks: 1, 2 or 5 × 10^k, giving about `n` ticks over
/// `span`. A span that is not finite and positive gives 1.
pub fn nice_step(span: f64, n: f64) -> f64 {
    if !(span.is_finite() && span > 0.0 && n.is_finite() && n > 0.0) {
        return 1.0;
    }
    let raw = span / n;
    let mag = 10f64.powf(raw.log10().floor());
    let f = raw / mag;
    let m = if f <= 1.0 {
        1.0
    } else if f <= 2.0 {
        2.0
    } else if f <= 5.0 {
        5.0
    } else {
        10.0
    };
    m * mag
}

/// The multiples of `step` from `lo` to `hi` (both included, to a millionth of
/// a step), at most 200 of them; empty for a step that is not positive.
pub fn tick_values(lo: f64, hi: f64, step: f64) -> Vec<f64> {
    if !(step.is_finite() && step > 0.0 && lo.is_finite() && hi.is_finite()) {
        return Vec::new();
    }
    let first = (lo / step - 1e-6).ceil();
    (0..200).map(|k| (first + f64::from(k)) * step).take_while(|v| *v <= hi + step * 1e-6).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn steps_are_one_two_or_five_times_a_power_of_ten() {
        assert_eq!(nice_step(37.0, 4.0), 10.0);
        assert_eq!(nice_step(7.0, 4.0), 2.0);
        assert_eq!(nice_step(18.0, 4.0), 5.0);
        assert_eq!(nice_step(0.0, 4.0), 1.0);
        assert_eq!(nice_step(f64::NAN, 4.0), 1.0);
    }

    #[test]
    fn tick_values_cover_the_range_on_the_step() {
        assert_eq!(tick_values(28.0, 61.0, 10.0), [30.0, 40.0, 50.0, 60.0]);
        assert_eq!(tick_values(30.0, 60.0, 10.0), [30.0, 40.0, 50.0, 60.0]);
        assert_eq!(tick_values(-5.0, 5.0, 5.0), [-5.0, 0.0, 5.0]);
        assert!(tick_values(0.0, 1.0, 0.0).is_empty());
        assert_eq!(tick_values(0.0, 1e9, 1.0).len(), 200);
    }
}
