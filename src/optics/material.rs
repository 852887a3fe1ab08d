//! Materials: the index of refraction at any wavelength, from one fixed index,
//! a Sellmeier formula, or a published formula built in (with its citation).
//!
//! Wavelengths are in nanometres at the seams (`wavelength_nm`); the formulas
//! take λ in micrometres, as their papers and the refractiveindex.info
//! database state them.

use std::borrow::Cow;

/// Largest index of refraction a material may have anywhere in the band it is
/// checked over: classroom materials lie between acrylic (1.49) and diamond
/// (2.42); above 4 nothing is transparent to a ray box's light (our bound,
/// common practice, no source).
pub const MAX_INDEX: f64 = 4.0;

/// The band a material is checked over and a kit's wavelengths must lie in,
/// nm: the visible light a ray box's lamp and filters give (380–780 nm, the
/// usual limits of the visible, *memory*). A formula must give a usable index
/// at every wavelength a kit may ask for, so it is checked over all of it.
pub const VISIBLE_NM: (f64, f64) = (380.0, 780.0);

/// The usual reference wavelength, nm: the helium d line (587.6 nm, the line
/// catalogues quote n_d at, *memory*; DESIGN.md).
pub const D_LINE_NM: f64 = 587.6;
/// The hydrogen F line, nm (blue), for the Abbe number (DESIGN.md).
pub const F_LINE_NM: f64 = 486.1;
/// The hydrogen C line, nm (red), for the Abbe number (DESIGN.md).
pub const C_LINE_NM: f64 = 656.3;

/// Step of the scan that checks a formula over [`VISIBLE_NM`], nm.
const SCAN_STEP_NM: f64 = 1.0;

/// How the index depends on the wavelength.
#[derive(Clone, Debug, PartialEq)]
pub enum Dispersion {
    /// One index at every wavelength: no dispersion.
    Constant(f64),
    /// Sellmeier's form, n² − 1 = Σ bᵢλ²/(λ² − cᵢ), λ in µm, cᵢ in µm²
    /// (any number of terms; each cᵢ is the square of a resonance wavelength).
    Sellmeier {
        /// The bᵢ (no unit).
        b: Cow<'static, [f64]>,
        /// The cᵢ, µm².
        c_um2: Cow<'static, [f64]>,
    },
    /// A power series for n²: n² = Σ kⱼ·λ^pⱼ, λ in µm (Beadie et al.'s form,
    /// with p = 0, 2, 4, −2, −4, −6, −8).
    PowerSeries(Cow<'static, [(f64, i32)]>),
}

impl Dispersion {
    /// n² at `wavelength_nm`. Not finite at a Sellmeier pole.
    fn index_squared(&self, wavelength_nm: f64) -> f64 {
        let l = wavelength_nm / 1000.0;
        let l2 = l * l;
        match self {
            Dispersion::Constant(n) => n * n,
            Dispersion::Sellmeier { b, c_um2 } => {
                1.0 + b.iter().zip(c_um2.iter()).map(|(b, c)| b * l2 / (l2 - c)).sum::<f64>()
            }
            Dispersion::PowerSeries(terms) => terms.iter().map(|(k, p)| k * l.powi(*p)).sum(),
        }
    }

    /// Whether the index changes with the wavelength.
    pub fn disperses(&self) -> bool {
        !matches!(self, Dispersion::Constant(_))
    }
}

/// Why a formula cannot be used, with the term it is about (0-based).
#[derive(Clone, Debug, PartialEq)]
pub enum MaterialError {
    /// A constant index that is not finite, or not above 1, or above [`MAX_INDEX`].
    Index(f64),
    /// No terms.
    Empty,
    /// `b` and `c_um2` of different lengths.
    Lengths {
        /// Terms in `b`.
        b: usize,
        /// Terms in `c_um2`.
        c: usize,
    },
    /// A coefficient that is not a finite number.
    NotFinite {
        /// `b` or `c_um2`.
        list: &'static str,
        /// Which term.
        term: usize,
    },
    /// A negative cᵢ: not the square of a wavelength.
    NegativeC {
        /// Which term.
        term: usize,
    },
    /// A pole (λ² = cᵢ) inside the checked band.
    Pole {
        /// Which term.
        term: usize,
        /// Where, nm.
        at_nm: f64,
    },
    /// n ≤ 1 (or n² not even positive) somewhere in the band.
    NotAboveOne {
        /// The first wavelength where it happens, nm.
        at_nm: f64,
        /// n² there.
        index_squared: f64,
    },
    /// n above [`MAX_INDEX`] somewhere in the band.
    TooHigh {
        /// The first wavelength where it happens, nm.
        at_nm: f64,
        /// n there.
        index: f64,
    },
}

impl MaterialError {
    /// What is wrong, in a teacher's words.
    pub fn problem(&self) -> String {
        let (lo, hi) = VISIBLE_NM;
        match self {
            MaterialError::Index(n) => format!("index {n} is not a usable index of refraction"),
            MaterialError::Empty => "the formula has no terms".into(),
            MaterialError::Lengths { b, c } => {
                format!("b has {b} terms but c_um2 has {c}: each term needs one b and one c")
            }
            MaterialError::NotFinite { list, term } => {
                format!("{list} term {} is not a finite number", term + 1)
            }
            MaterialError::NegativeC { term } => {
                format!("c_um2 term {} is negative: it is the square of a wavelength in µm", term + 1)
            }
            MaterialError::Pole { term, at_nm } => format!(
                "c_um2 term {} puts a pole (λ² = c) at {at_nm:.1} nm, inside the visible band {lo:.0}–{hi:.0} nm",
                term + 1
            ),
            MaterialError::NotAboveOne { at_nm, index_squared } => format!(
                "the formula gives n² = {index_squared:.4} at {at_nm:.0} nm: n must be above 1 everywhere in {lo:.0}–{hi:.0} nm"
            ),
            MaterialError::TooHigh { at_nm, index } => format!(
                "the formula gives n = {index:.3} at {at_nm:.0} nm, above {MAX_INDEX} (nothing that clear is in a classroom kit)"
            ),
        }
    }
}

/// A checked material: its index is finite, above 1 and at most
/// [`MAX_INDEX`] at every wavelength of [`VISIBLE_NM`].
#[derive(Clone, Debug, PartialEq)]
pub struct Material {
    dispersion: Dispersion,
    source: Option<&'static Published>,
}

impl Material {
    /// Checks a formula over [`VISIBLE_NM`]: terms present and paired,
    /// coefficients finite, every cᵢ ≥ 0 with no pole in the band, and
    /// 1 < n ≤ [`MAX_INDEX`] at every nanometre of the band.
    pub fn new(dispersion: Dispersion) -> Result<Material, MaterialError> {
        check(&dispersion)?;
        Ok(Material { dispersion, source: None })
    }

    /// One index at every wavelength (a kit's `index = n`).
    pub fn constant(index: f64) -> Result<Material, MaterialError> {
        Material::new(Dispersion::Constant(index))
    }

    /// The published material with this kit word, if there is one.
    pub fn published(word: &str) -> Option<Material> {
        PUBLISHED.iter().find(|p| p.word == word).map(Published::material)
    }

    /// n at `wavelength_nm` (within [`VISIBLE_NM`], where it is checked).
    pub fn index_at(&self, wavelength_nm: f64) -> f64 {
        self.dispersion.index_squared(wavelength_nm).sqrt()
    }

    /// The formula.
    pub fn dispersion(&self) -> &Dispersion {
        &self.dispersion
    }

    /// The published source, for a built-in material.
    pub fn source(&self) -> Option<&'static Published> {
        self.source
    }

    /// The Abbe number V = (n_d − 1)/(n_F − n_C) at the d, F and C lines
    /// (587.6, 486.1, 656.3 nm); `None` for a material without dispersion.
    pub fn abbe_number(&self) -> Option<f64> {
        if !self.dispersion.disperses() {
            return None;
        }
        let spread = self.index_at(F_LINE_NM) - self.index_at(C_LINE_NM);
        (spread != 0.0).then(|| (self.index_at(D_LINE_NM) - 1.0) / spread)
    }
}

fn check(d: &Dispersion) -> Result<(), MaterialError> {
    let (lo, hi) = VISIBLE_NM;
    match d {
        Dispersion::Constant(n) => {
            if !(n.is_finite() && *n > 1.0 && *n <= MAX_INDEX) {
                return Err(MaterialError::Index(*n));
            }
            return Ok(());
        }
        Dispersion::Sellmeier { b, c_um2 } => {
            if b.is_empty() && c_um2.is_empty() {
                return Err(MaterialError::Empty);
            }
            if b.len() != c_um2.len() {
                return Err(MaterialError::Lengths { b: b.len(), c: c_um2.len() });
            }
            for (list, values) in [("b", b), ("c_um2", c_um2)] {
                if let Some(term) = values.iter().position(|v| !v.is_finite()) {
                    return Err(MaterialError::NotFinite { list, term });
                }
            }
            for (term, c) in c_um2.iter().enumerate() {
                if *c < 0.0 {
                    return Err(MaterialError::NegativeC { term });
                }
                let at_nm = c.sqrt() * 1000.0;
                if (lo..=hi).contains(&at_nm) {
                    return Err(MaterialError::Pole { term, at_nm });
                }
            }
        }
        Dispersion::PowerSeries(terms) => {
            if terms.is_empty() {
                return Err(MaterialError::Empty);
            }
            if let Some(term) = terms.iter().position(|(k, _)| !k.is_finite()) {
                return Err(MaterialError::NotFinite { list: "k", term });
            }
        }
    }
    let steps = ((hi - lo) / SCAN_STEP_NM).round() as usize;
    for s in 0..=steps {
        let at_nm = lo + s as f64 * SCAN_STEP_NM;
        let n2 = d.index_squared(at_nm);
        if n2.is_nan() || n2 <= 1.0 {
            return Err(MaterialError::NotAboveOne { at_nm, index_squared: n2 });
        }
        if n2.sqrt() > MAX_INDEX {
            return Err(MaterialError::TooHigh { at_nm, index: n2.sqrt() });
        }
    }
    Ok(())
}

/// A published dispersion formula built into raysheet, with its source.
#[derive(Debug, PartialEq)]
pub struct Published {
    /// The word a kit names it by (`catalog = "…"`).
    pub word: &'static str,
    /// What it is.
    pub substance: &'static str,
    /// The paper, as cited in the README and on the key.
    pub citation: &'static str,
    /// The formula's form and where its coefficients come from.
    pub form: &'static str,
    /// The formula.
    pub dispersion: Dispersion,
}

impl Published {
    /// The material (checked by the crate's tests, so it needs no check here).
    pub fn material(&'static self) -> Material {
        Material { dispersion: self.dispersion.clone(), source: Some(self) }
    }
}

/// The published materials, in the order `raysheet materials` lists them.
/// Coefficients as stored in the public refractiveindex.info database (DESIGN.md,
/// Dispersion). The one-term PMMA fit of Sultanova et al. is left out on
/// purpose: its Abbe number is 53 against the paper's 59 (DESIGN.md).
pub static PUBLISHED: [Published; 3] = [
    Published {
        word: "pmma-beadie-2015",
        substance: "PMMA (acrylic)",
        citation: "Beadie et al., Appl. Opt. 54, F139 (2015)",
        form: "n² = A + k₁λ² + k₂λ⁴ + k₃λ⁻² + k₄λ⁻⁴ + k₅λ⁻⁶ + k₆λ⁻⁸ (λ in µm), stated accuracy 2×10⁻⁴",
        dispersion: Dispersion::PowerSeries(Cow::Borrowed(&[
            (2.1778, 0),
            (6.1209e-3, 2),
            (-1.5004e-3, 4),
            (2.3678e-2, -2),
            (-4.2137e-3, -4),
            (7.3417e-4, -6),
            (-4.5042e-5, -8),
        ])),
    },
    Published {
        word: "pmma-szczurowski-2013",
        substance: "PMMA (acrylic)",
        citation: "Szczurowski (2013)",
        form: "Sellmeier, three terms (λ in µm)",
        dispersion: Dispersion::Sellmeier {
            b: Cow::Borrowed(&[0.99654, 0.18964, 0.00411]),
            c_um2: Cow::Borrowed(&[0.00787, 0.02191, 3.85727]),
        },
    },
    Published {
        word: "pc-sultanova-2009",
        substance: "polycarbonate",
        citation: "Sultanova, Kasarova, Nikolov, Acta Phys. Pol. A 116, 585 (2009)",
        form: "Sellmeier, one term fitted by the refractiveindex.info database (λ in µm)",
        dispersion: Dispersion::Sellmeier { b: Cow::Borrowed(&[1.4182]), c_um2: Cow::Borrowed(&[0.021304]) },
    },
];

/// The kit words of the published materials, for hints.
pub fn published_words() -> Vec<&'static str> {
    PUBLISHED.iter().map(|p| p.word).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    fn sellmeier(b: &[f64], c: &[f64]) -> Dispersion {
        Dispersion::Sellmeier { b: Cow::Owned(b.to_vec()), c_um2: Cow::Owned(c.to_vec()) }
    }

    #[test]
    fn every_published_material_passes_its_own_check() {
        for p in &PUBLISHED {
            assert_eq!(check(&p.dispersion), Ok(()), "{}", p.word);
        }
    }

    #[test]
    fn a_constant_index_is_the_same_everywhere_and_has_no_abbe_number() {
        let m = Material::constant(1.49).unwrap();
        assert_eq!(m.index_at(400.0), 1.49);
        assert_eq!(m.index_at(700.0), 1.49);
        assert_eq!(m.abbe_number(), None);
        assert_eq!(Material::constant(1.0), Err(MaterialError::Index(1.0)));
        assert_eq!(Material::constant(4.5), Err(MaterialError::Index(4.5)));
        assert!(Material::constant(f64::NAN).is_err());
    }

    #[test]
    fn one_term_sellmeier_matches_its_closed_form() {
        // n² = 1 + bλ²/(λ² − c) at 0.5 µm, b = 1, c = 0.01: 1 + 0.25/0.24 (closed form).
        let m = Material::new(sellmeier(&[1.0], &[0.01])).unwrap();
        assert_close(m.index_at(500.0), (1.0 + 0.25 / 0.24_f64).sqrt(), 1e-12);
    }

    #[test]
    fn bad_formulas_are_refused_with_the_term() {
        assert_eq!(Material::new(sellmeier(&[], &[])), Err(MaterialError::Empty));
        assert_eq!(
            Material::new(sellmeier(&[1.0, 0.2], &[0.01])),
            Err(MaterialError::Lengths { b: 2, c: 1 })
        );
        assert_eq!(
            Material::new(sellmeier(&[1.0, f64::INFINITY], &[0.01, 0.02])),
            Err(MaterialError::NotFinite { list: "b", term: 1 })
        );
        assert_eq!(Material::new(sellmeier(&[1.0], &[-0.01])), Err(MaterialError::NegativeC { term: 0 }));
        // c = 0.25 µm² puts the pole at 500 nm.
        assert_eq!(
            Material::new(sellmeier(&[1.0], &[0.25])),
            Err(MaterialError::Pole { term: 0, at_nm: 500.0 })
        );
        // Just outside the band: 0.37² µm² is a pole at 370 nm; fine if n stays usable.
        assert!(Material::new(sellmeier(&[0.1], &[0.37 * 0.37])).is_ok());
        // A negative b gives n² < 1 from the band's start.
        match Material::new(sellmeier(&[-0.5], &[0.01])) {
            Err(MaterialError::NotAboveOne { at_nm, .. }) => assert_eq!(at_nm, 380.0),
            other => panic!("{other:?}"),
        }
        // A huge b gives n above 4.
        assert!(matches!(Material::new(sellmeier(&[40.0], &[0.01])), Err(MaterialError::TooHigh { .. })));
    }
}
