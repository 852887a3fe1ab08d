//! Snell's law in vector form, with total internal reflection as a value.

use crate::geom::Vec2;

/// What happens to a ray at an interface.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Refraction {
    /// The ray passes into the second medium with this unit direction.
    Refracted(Vec2),
    /// Total internal reflection: the ray stays in the first medium with this
    /// unit direction.
    Reflected(Vec2),
}

/// Vector Snell's law (DESIGN.md). `d`: unit direction of the incoming ray;
/// `normal`: unit normal at the hit point (either side; it is turned to face the
/// incoming ray here); `n1`, `n2`: indices before and after the interface.
///
/// With μ = n1/n2, c = −n·d, k = 1 − μ²(1 − c²): k < 0 is total internal
/// reflection, d' = d − 2(d·n)n; otherwise d' = μd + (μc − √k)n.
pub fn refract(d: Vec2, normal: Vec2, n1: f64, n2: f64) -> Refraction {
    let n = if normal.dot(d) > 0.0 { -normal } else { normal };
    let mu = n1 / n2;
    let c = -n.dot(d);
    let k = 1.0 - mu * mu * (1.0 - c * c);
    if k < 0.0 {
        return Refraction::Reflected(d - n * (2.0 * d.dot(n)));
    }
    Refraction::Refracted(d * mu + n * (mu * c - k.sqrt()))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;
    use proptest::prelude::*;

    fn sin_from_normal(d: Vec2, n: Vec2) -> f64 {
        d.cross(n).abs()
    }

    #[test]
    fn normal_incidence_passes_straight() {
        let Refraction::Refracted(out) = refract(Vec2::new(1.0, 0.0), Vec2::new(-1.0, 0.0), 1.0, 1.49) else {
            panic!("expected refraction")
        };
        assert_close(out.x, 1.0, 1e-15);
        assert_close(out.y, 0.0, 1e-15);
    }

    #[test]
    fn thirty_degrees_into_acrylic() {
        // sin θ2 = sin 30° / 1.49 = 0.33557 (Snell's law, closed form).
        let d = Vec2::from_angle(30f64.to_radians());
        let Refraction::Refracted(out) = refract(d, Vec2::new(-1.0, 0.0), 1.0, 1.49) else { panic!() };
        assert_close(out.y, 0.5 / 1.49, 1e-14);
    }

    #[test]
    fn critical_angle_boundary() {
        // Critical angle asin(1/1.49) = 42.155° (acrylic, DESIGN.md "about 42.2°").
        let crit = (1.0f64 / 1.49).asin();
        let n = Vec2::new(1.0, 0.0);
        let below = Vec2::from_angle(crit - 1e-6);
        let above = Vec2::from_angle(crit + 1e-6);
        assert!(matches!(refract(below, n, 1.49, 1.0), Refraction::Refracted(_)));
        let Refraction::Reflected(r) = refract(above, n, 1.49, 1.0) else { panic!("expected TIR") };
        assert_close(r.x, -above.x, 1e-15);
        assert_close(r.y, above.y, 1e-15);
        assert_close(crit.to_degrees(), 42.155, 1e-3);
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(256))]
        #[test]
        fn snell_holds_and_directions_stay_unit(angle in -1.5f64..1.5, tilt in -3.1f64..3.1, n1 in 1.0f64..2.0, n2 in 1.0f64..2.0) {
            let normal = Vec2::from_angle(tilt);
            let d = Vec2::from_angle(tilt + std::f64::consts::PI + angle); // heading into the normal
            match refract(d, normal, n1, n2) {
                Refraction::Refracted(out) => {
                    prop_assert!((out.length() - 1.0).abs() < 1e-12);
                    let lhs = n1 * sin_from_normal(d, normal);
                    let rhs = n2 * sin_from_normal(out, normal);
                    prop_assert!((lhs - rhs).abs() < 1e-12, "{lhs} vs {rhs}");
                }
                Refraction::Reflected(out) => {
                    prop_assert!(n1 * angle.sin().abs() > n2 - 1e-12);
                    prop_assert!((out.length() - 1.0).abs() < 1e-12);
                }
            }
        }
    }
}
