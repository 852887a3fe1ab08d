//! The one tolerance check of the integration tests.

/// Asserts `|actual − expected| <= tol`, naming `what` and printing both values on failure.
#[track_caller]
pub fn assert_close(actual: f64, expected: f64, tol: f64, what: &str) {
    assert!(
        (actual - expected).abs() <= tol,
        "{what}: got {actual}, expected {expected} (difference {:e}, tolerance {tol:e})",
        actual - expected
    );
}
