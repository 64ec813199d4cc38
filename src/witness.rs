//! Witnesses of the beam energy: each reading turned into a kinetic energy with its uncertainty,
//! the combined estimate, whether the witnesses agree, and which one does not.
//!
//! A controller usually has several independent witnesses of one beam energy: the accelerator's
//! own readback, a time of flight over a baseline, the field of a dipole that centres the beam, the
//! field of an electrostatic deflector, a speed from a pickup pair. Each [`Reading`] with its
//! standard uncertainty gives, for a [`Species`], an [`Estimate`]: the implied kinetic energy `T`
//! and `σ_T = |dT/dx| σ_x` by first-order propagation. A [`Watch`] holds up to `N` readings and
//! assesses them together ([`Assessment`]): the inverse-variance weighted mean `T̂` and its `σ`,
//! `χ² = Σ (T_i − T̂)²/σ_i²` with `n − 1` degrees of freedom, consistency at a significance
//! level [`Alpha`], and, among three or more witnesses, the outlier.
//!
//! # Units
//! Energies and their uncertainties in eV, times in s, fields in T (dipole) and V/m (deflector),
//! lengths in m, speeds in m/s; the uncertainty of a reading is in the unit of the reading.
//!
//! # The derivatives
//! With `m` the rest energy, `E = T + m`, `pc`, `γ`, `βγ` read from the [`Motion`] each reading
//! builds (textbook relativity; each checked against 50-digit finite differences):
//!
//! | witness | state from | `|dT/dx| σ_x` |
//! | --- | --- | --- |
//! | kinetic readback `T` | `T` | `σ_T` |
//! | flight time `t` over `L` | `β = L/(ct)` | `m γ³ β² σ_t/t = pc · (γ · βγ) · σ_t/t` |
//! | dipole field `B`, radius `r` | `Bρ = B r` | `(pc)²/(E B) · σ_B = β pc · σ_B/B` |
//! | deflector field `E`, radius `r` | `Eρ = E r` | `\|Q\| r E²/(E² + m²) · σ_E = \|Q\| r σ_E/(1 + 1/γ²)` |
//! | speed `v` | `β = v/c` | `m γ³ β/c · σ_v = pc · γ² · σ_v/c` |
//!
//! Every factor is a positive quantity the state holds without cancellation, so `σ_T` carries
//! only the roundings of a few products.
//!
//! # Fusion
//! The sums run relative to the most precise witness (index 0 below): weights
//! `w_i = (σ_0/σ_i)² ≤ 1`, differences `d_i = T_i − T_0` (exact when the witnesses agree within a
//! factor of two), `T̂ = T_0 + Σ w_i d_i / Σ w_i`, `σ_T̂ = σ_0/√(Σ w_i)`,
//! `χ² = Σ ((d_i − (T̂ − T_0))/σ_i)²`. Nothing large is subtracted, no weight can overflow or
//! underflow, and `f32` keeps the fused energy as accurate as the witnesses themselves. Where
//! `Σ w_i d_i` overflows (differences near the largest finite energy) it is summed again on
//! `d_i/16` (exact); a `χ²` beyond the range of the precision is given as its largest finite
//! value.
//!
//! # Consistency
//! The witnesses are inconsistent when the upper-tail probability of `χ²` with `n − 1` degrees of
//! freedom is below `α`, that is when `χ²` exceeds the critical value `χ²_{n−1}(α)`. The
//! critical values are a `const` table for the levels of [`Alpha`] and 1 to 15 degrees of freedom
//! (so at most [`MAX_WITNESSES`] = 16 witnesses), computed with mpmath at 50 digits by inverting
//! the regularized upper incomplete gamma function `Q(k/2, x/2) = α` and rounded once to `f64`;
//! they agree with the NIST/SEMATECH e-Handbook of Statistical Methods table of upper critical
//! values of the chi-square distribution to its three decimals. For any other level pass your own
//! critical values to [`Watch::try_assess_with`].
//!
//! # The outlier
//! With three or more witnesses that do not agree, the outlier is the witness whose removal
//! leaves the smallest `χ²` (the first of equals), named only when the remaining `n − 1` then
//! agree at the same `α`. A consistent set names no outlier.
//!
//! # Precision (promised)
//! Implied and fused energies within 16 eps of the exact values for the readings given, their
//! uncertainties within 64 eps. `χ²` measures the differences of the `T_i` in units of their `σ_i`,
//! so it carries their errors amplified by `T_i/σ_i`: it is within
//! `(1 + χ²) · 16 √n eps · max(T_i/σ_i)` of the exact value (for example `1e-8 · (1 + χ²)` in
//! `f64` for 16 witnesses of `σ_T/T ≥ 1.5e-6`, and `3e-2 · (1 + χ²)` in `f32` for four witnesses
//! of `σ_T/T ≥ 1.3e-4`).
//! A reading's own rounding is amplified as in [`Motion`]'s constructors (a speed near `c` by
//! `β²γ²`). Measured figures: `docs/accuracy.md`.
//!
//! # Examples
//! ```
//! use fourforce::witness::{Alpha, Reading, Watch};
//! use fourforce::Species;
//! // An invented 20 MeV proton line: readback, flight time over 4 m, and a 1.5 m centring dipole.
//! let mut watch = Watch::<f64, 4>::new();
//! watch.try_push(Reading::Kinetic { kinetic_ev: 20.02e6, sigma_ev: 0.05e6 })?;
//! watch.try_push(Reading::FlightTime { time_s: 65.65e-9, sigma_s: 0.05e-9, baseline_m: 4.0 })?;
//! watch.try_push(Reading::Dipole { field_t: 0.433_1, sigma_t: 0.000_2, radius_m: 1.5 })?;
//! let a = watch.try_assess(Species::PROTON, Alpha::default()).map_err(|e| e.error())?;
//! assert!(a.is_consistent());
//! assert!((a.fused().kinetic_energy() / 20.0e6 - 1.0).abs() < 5e-3);
//! assert_eq!(a.degrees_of_freedom(), 2);
//! # Ok::<(), fourforce::Error>(())
//! ```

use core::fmt;

use crate::real::fits;
use crate::{Error, Motion, Real, Species};

/// The most witnesses one assessment takes: the critical-value table covers 1 to 15 degrees of
/// freedom.
///
/// # Examples
/// ```
/// assert_eq!(fourforce::witness::MAX_WITNESSES, 16);
/// ```
pub const MAX_WITNESSES: usize = 16;

/// One reading of an energy witness with its standard uncertainty (same unit as the reading).
///
/// # Examples
/// ```
/// use fourforce::witness::Reading;
/// let tof = Reading::FlightTime { time_s: 66.05e-9_f32, sigma_s: 0.05e-9, baseline_m: 4.0 };
/// assert!(matches!(tof, Reading::FlightTime { .. }));
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Reading<T: Real> {
    /// The kinetic energy the accelerator reports, in eV.
    Kinetic {
        /// Kinetic energy `T` in eV (≥ 0).
        kinetic_ev: T,
        /// Its standard uncertainty in eV (> 0).
        sigma_ev: T,
    },
    /// A time of flight over a known baseline.
    FlightTime {
        /// Time of flight `t` in s (> `L/c`).
        time_s: T,
        /// Its standard uncertainty in s (> 0).
        sigma_s: T,
        /// Baseline `L` in m (> 0), taken as exact.
        baseline_m: T,
    },
    /// The field of a dipole that centres the beam on its radius: `Bρ = B r`.
    Dipole {
        /// Field `B` in T (> 0; the magnitude, whatever the sign of the charge).
        field_t: T,
        /// Its standard uncertainty in T (> 0).
        sigma_t: T,
        /// Bending radius `r` in m (> 0), taken as exact.
        radius_m: T,
    },
    /// The field of an electrostatic deflector that centres the beam: `Eρ = E r`.
    Deflector {
        /// Field `E` in V/m (> 0; the magnitude).
        field_v_per_m: T,
        /// Its standard uncertainty in V/m (> 0).
        sigma_v_per_m: T,
        /// Bending radius `r` in m (> 0), taken as exact.
        radius_m: T,
    },
    /// A speed, for example from the phase of two pickups.
    Speed {
        /// Speed `v` in m/s (0 < v < c).
        speed_m_per_s: T,
        /// Its standard uncertainty in m/s (> 0).
        sigma_m_per_s: T,
    },
}

/// `x`, or [`Error::NonPositiveUncertainty`] unless it is finite and positive.
#[inline]
fn uncertainty<T: Real>(sigma: T) -> Result<T, Error> {
    if crate::try_finite(sigma)? > T::ZERO {
        Ok(sigma)
    } else {
        Err(Error::NonPositiveUncertainty)
    }
}

/// A field magnitude `> 0` or the error naming what is wrong with it.
#[inline]
fn field<T: Real>(x: T) -> Result<T, Error> {
    let x = crate::try_finite(x)?;
    if x > T::ZERO {
        Ok(x)
    } else if x == T::ZERO {
        Err(Error::ZeroField)
    } else {
        Err(Error::NegativeMagnitude)
    }
}

/// A radius `> 0`.
#[inline]
fn radius<T: Real>(x: T) -> Result<T, Error> {
    if crate::try_finite(x)? > T::ZERO {
        Ok(x)
    } else {
        Err(Error::NonPositiveLength)
    }
}

impl<T: Real> Reading<T> {
    /// The kinetic energy this reading implies for `species`, with its first-order standard
    /// uncertainty (see [the derivatives](self#the-derivatives)).
    ///
    /// Promised: `T` within 16 eps and `σ_T` within 64 eps of the exact values for the reading
    /// given (measured worst figures in the module's tests and `docs/accuracy.md`).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a NaN or infinite field of the reading;
    /// [`Error::NonPositiveUncertainty`] for `σ ≤ 0`; [`Error::NegativeEnergy`] for a negative
    /// readback; [`Error::NonPositiveLength`] for a time, baseline or radius `≤ 0`;
    /// [`Error::FasterThanLight`] for `c t ≤ L`; [`Error::ZeroField`] or
    /// [`Error::NegativeMagnitude`] for a field `= 0` or `< 0`; [`Error::ZeroSpeed`] for `v = 0`
    /// (a beam at rest has no first-order uncertainty); [`Error::NegativeMagnitude`] for `v < 0`;
    /// [`Error::SpeedNotBelowLight`] for `v ≥ c`; [`Error::ZeroCharge`] for a field witness of a
    /// neutral species; [`Error::Overflow`] when `T` or `σ_T` does not fit the precision or
    /// `σ_T` rounds to zero.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Reading;
    /// use fourforce::{Error, Species};
    /// // A 250 MeV proton: B rho = 2.4321284387255044 T m (mpmath, CODATA 2018), here B r with
    /// // r = 2 m; sigma_T = beta pc sigma_B / B.
    /// let r = Reading::Dipole { field_t: 1.216_064_219_362_752_2, sigma_t: 1e-4, radius_m: 2.0 };
    /// let w = r.try_estimate(Species::<f64>::PROTON)?;
    /// assert!((w.kinetic_energy() / 250.0e6 - 1.0).abs() < 1e-14);
    /// assert!((w.uncertainty() / 36_791.035_511_781 - 1.0).abs() < 1e-8); // mpmath
    /// let bad = Reading::FlightTime { time_s: -1e-9, sigma_s: 1e-12, baseline_m: 1.0 };
    /// assert_eq!(bad.try_estimate(Species::<f64>::PROTON), Err(Error::NonPositiveLength));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_estimate(&self, species: Species<T>) -> Result<Estimate<T>, Error> {
        let (kinetic, sigma) = match *self {
            Self::Kinetic {
                kinetic_ev,
                sigma_ev,
            } => {
                let t = crate::try_finite(kinetic_ev)?;
                if t < T::ZERO {
                    return Err(Error::NegativeEnergy);
                }
                // `T::ZERO` also turns a `-0.0` into `+0.0`.
                let t = if t == T::ZERO { T::ZERO } else { t };
                (t, uncertainty(sigma_ev)?)
            }
            Self::FlightTime {
                time_s,
                sigma_s,
                baseline_m,
            } => {
                let m = Motion::try_from_flight_time(species, baseline_m, time_s)?;
                let s = uncertainty(sigma_s)?;
                // m γ³ β² σ_t / t = pc · γ · βγ · (σ_t / t)
                let k = m.momentum() * (m.gamma() * m.beta_gamma());
                (m.kinetic_energy(), k * (s / time_s))
            }
            Self::Dipole {
                field_t,
                sigma_t,
                radius_m,
            } => {
                let b = field(field_t)?;
                let r = radius(radius_m)?;
                let s = uncertainty(sigma_t)?;
                let m = Motion::try_from_magnetic_rigidity(species, fits(b * r)?)?;
                // (pc)² / (E B) · σ_B = β pc · (σ_B / B)
                (m.kinetic_energy(), (m.beta() * m.momentum()) * (s / b))
            }
            Self::Deflector {
                field_v_per_m,
                sigma_v_per_m,
                radius_m,
            } => {
                let e = field(field_v_per_m)?;
                let r = radius(radius_m)?;
                let s = uncertainty(sigma_v_per_m)?;
                let m = Motion::try_from_electric_rigidity(species, fits(e * r)?)?;
                // |Q| r E² / (E² + m²) · σ_E = |Q| r σ_E / (1 + 1/γ²)
                let inv_gamma = T::ONE / m.gamma();
                let q = species.charge().abs();
                let k = q * (r * s);
                (m.kinetic_energy(), k / (T::ONE + inv_gamma * inv_gamma))
            }
            Self::Speed {
                speed_m_per_s,
                sigma_m_per_s,
            } => {
                let m = Motion::try_from_speed(species, speed_m_per_s)?;
                if m.beta() == T::ZERO {
                    return Err(Error::ZeroSpeed);
                }
                let s = uncertainty(sigma_m_per_s)?;
                // m γ³ β σ_v / c = pc · γ² · (σ_v / c)
                let g = m.gamma();
                (
                    m.kinetic_energy(),
                    m.momentum() * (g * g) * (s * T::INV_SPEED_OF_LIGHT),
                )
            }
        };
        if !kinetic.is_finite() || !sigma.is_finite() || sigma <= T::ZERO {
            return Err(Error::Overflow);
        }
        Ok(Estimate { kinetic, sigma })
    }
}

/// A kinetic energy with its standard uncertainty, both in eV: one witness's implied value or the
/// fused value of several.
///
/// # Examples
/// ```
/// use fourforce::witness::Estimate;
/// let e = Estimate::try_new(12.0e6_f32, 0.1e6)?;
/// assert_eq!((e.kinetic_energy(), e.uncertainty()), (12.0e6, 0.1e6));
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Estimate<T: Real> {
    kinetic: T,
    sigma: T,
}

impl<T: Real> Estimate<T> {
    /// An estimate from a kinetic energy and its standard uncertainty, both in eV.
    ///
    /// # Errors
    /// As [`Reading::Kinetic`]: [`Error::NonFinite`], [`Error::NegativeEnergy`],
    /// [`Error::NonPositiveUncertainty`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Estimate;
    /// use fourforce::Error;
    /// assert_eq!(Estimate::try_new(1.0e6_f64, 0.0), Err(Error::NonPositiveUncertainty));
    /// ```
    pub fn try_new(kinetic_ev: T, sigma_ev: T) -> Result<Self, Error> {
        Reading::Kinetic {
            kinetic_ev,
            sigma_ev,
        }
        // The species plays no part in a readback.
        .try_estimate(Species::PROTON)
    }

    /// Kinetic energy `T` in eV.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Estimate;
    /// assert_eq!(Estimate::try_new(5.0e6_f64, 1.0e3)?.kinetic_energy(), 5.0e6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn kinetic_energy(&self) -> T {
        self.kinetic
    }

    /// Standard uncertainty `σ_T` in eV (> 0).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Estimate;
    /// assert_eq!(Estimate::try_new(5.0e6_f64, 1.0e3)?.uncertainty(), 1.0e3);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn uncertainty(&self) -> T {
        self.sigma
    }
}

/// A significance level `α` of the consistency test: the witnesses are inconsistent when the
/// upper-tail probability of their `χ²` is below `α`.
///
/// Default: [`Alpha::OnePerMille`] (`α = 10⁻³`).
///
/// # Examples
/// ```
/// use fourforce::witness::Alpha;
/// assert_eq!(Alpha::default().value(), 1e-3);
/// assert_eq!(Alpha::from_value(0.05), Some(Alpha::FivePercent));
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Alpha {
    /// `α = 0.1`.
    TenPercent,
    /// `α = 0.05`.
    FivePercent,
    /// `α = 0.025`.
    TwoAndAHalfPercent,
    /// `α = 0.01`.
    OnePercent,
    /// `α = 10⁻³`.
    #[default]
    OnePerMille,
    /// `α = 10⁻⁴`.
    OnePerTenThousand,
    /// `α = 10⁻⁵`.
    OnePerHundredThousand,
    /// `α = 10⁻⁶`.
    OnePerMillion,
}

/// `χ²_k(α)`, the upper critical value of the chi-square distribution with `k` degrees of freedom
/// (row `k − 1`) at the levels of [`Alpha`] (columns in declaration order): the `x` with
/// `Q(k/2, x/2) = α`, computed with mpmath 1.3.0 at 50 digits and rounded once to `f64`
/// (generator and 20-digit values in the test references).
const CRITICAL: [[f64; 8]; MAX_WITNESSES - 1] = [
    [
        2.7055434540954146,
        3.841458820694126,
        5.023886187314889,
        6.634896601021215,
        10.827566170662733,
        15.136705226623397,
        19.51142096465757,
        23.92812697693483,
    ],
    [
        4.605170185988092,
        5.991464547107982,
        7.3777589082278725,
        9.210340371976184,
        13.815510557964274,
        18.420680743952367,
        23.025850929940457,
        27.631021115928547,
    ],
    [
        6.2513886311703235,
        7.81472790325118,
        9.348403604496148,
        11.344866730144371,
        16.266236196238133,
        21.107513466160214,
        25.901749745662052,
        30.664849706213598,
    ],
    [
        7.779440339734858,
        9.487729036781158,
        11.143286781877798,
        13.276704135987625,
        18.466826952903173,
        23.512742444990838,
        28.473255424006034,
        33.37684158171984,
    ],
    [
        9.236356899781118,
        11.070497693516355,
        12.832501994030029,
        15.086272469388991,
        20.51500565243288,
        25.744831959055876,
        30.856189940435904,
        35.88818687967287,
    ],
    [
        10.64464067566842,
        12.59158724374398,
        14.449375335447922,
        16.81189382977093,
        22.457744484825326,
        27.856341236013918,
        33.107056816829,
        38.25833637720969,
    ],
    [
        12.017036623780529,
        14.067140449340169,
        16.012764274629323,
        18.475306906582365,
        24.321886347856854,
        29.877503909224906,
        35.258536421480876,
        40.521831234179864,
    ],
    [
        13.361566136511728,
        15.507313055865454,
        17.534546139484654,
        20.090235029663233,
        26.124481558376143,
        31.82762800126232,
        37.331593644422206,
        42.700913926544274,
    ],
    [
        14.683656573259837,
        16.91897760462045,
        19.022767798641635,
        21.665994333461924,
        27.877164871256575,
        33.719948438964636,
        39.340653733868486,
        44.81093787068782,
    ],
    [
        15.987179172105261,
        18.307038053275146,
        20.483177350807395,
        23.20925115895436,
        29.588298445074418,
        35.56401394195211,
        41.29615796876022,
        46.863046846784385,
    ],
    [
        17.275008517500073,
        19.675137572682495,
        21.92004926102121,
        24.724970311318284,
        31.264133620239992,
        37.366986437997,
        43.205959720539255,
        48.86564276320364,
    ],
    [
        18.549347786703244,
        21.026069817483066,
        23.336664158645338,
        26.21696730553585,
        32.90949040736022,
        39.13440388194951,
        45.076146524160144,
        50.82525213887445,
    ],
    [
        19.81192930712756,
        22.36203249482694,
        24.73560488493154,
        27.68824961045705,
        34.52817897487089,
        40.870655013836,
        46.91155312895771,
        52.747068114203024,
    ],
    [
        21.064144212997057,
        23.68479130484058,
        26.11894804503737,
        29.141237740672796,
        36.12327368039814,
        42.57928895311299,
        48.7160969026575,
        54.63530553003881,
    ],
    [
        22.30712958157869,
        24.99579013972863,
        27.488392863442982,
        30.577914166892494,
        37.69729821835383,
        44.26322494417498,
        50.49300558106651,
        56.49344249977339,
    ],
];

/// [`CRITICAL`] rounded to `f32` at compile time, so that an `f32` firmware reads `f32` values and
/// links no software double-precision conversion.
#[allow(clippy::indexing_slicing)] // constant evaluation: an index out of range fails the build
const CRITICAL_F32: [[f32; 8]; MAX_WITNESSES - 1] = {
    let mut t = [[0.0_f32; 8]; MAX_WITNESSES - 1];
    let mut k = 0;
    while k < MAX_WITNESSES - 1 {
        let mut a = 0;
        while a < 8 {
            t[k][a] = CRITICAL[k][a] as f32;
            a += 1;
        }
        k += 1;
    }
    t
};

impl Alpha {
    /// Every level the table carries, in declaration order (`0.1` to `10⁻⁶`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Alpha;
    /// assert_eq!(Alpha::ALL.len(), 8);
    /// assert_eq!(Alpha::ALL[4], Alpha::OnePerMille);
    /// ```
    pub const ALL: [Self; 8] = [
        Self::TenPercent,
        Self::FivePercent,
        Self::TwoAndAHalfPercent,
        Self::OnePercent,
        Self::OnePerMille,
        Self::OnePerTenThousand,
        Self::OnePerHundredThousand,
        Self::OnePerMillion,
    ];

    /// The level `α` as a number.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Alpha;
    /// assert_eq!(Alpha::TwoAndAHalfPercent.value(), 0.025);
    /// ```
    #[must_use]
    pub const fn value(self) -> f64 {
        match self {
            Self::TenPercent => 0.1,
            Self::FivePercent => 0.05,
            Self::TwoAndAHalfPercent => 0.025,
            Self::OnePercent => 0.01,
            Self::OnePerMille => 1e-3,
            Self::OnePerTenThousand => 1e-4,
            Self::OnePerHundredThousand => 1e-5,
            Self::OnePerMillion => 1e-6,
        }
    }

    /// The level whose [`value`](Self::value) is exactly `alpha`, if the table carries it.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Alpha;
    /// assert_eq!(Alpha::from_value(1e-3), Some(Alpha::OnePerMille));
    /// assert_eq!(Alpha::from_value(0.002), None);
    /// ```
    #[must_use]
    pub fn from_value(alpha: f64) -> Option<Self> {
        Self::ALL.into_iter().find(|a| a.value() == alpha)
    }

    /// The critical value `χ²_k(α)` for `k = degrees_of_freedom`, 1 to 15 (`None` outside).
    ///
    /// From the `const` table described under [Consistency](self#consistency): mpmath at 50
    /// digits, rounded once to `f64` (and from there once more to `f32`, at compile time).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Alpha;
    /// // NIST/SEMATECH e-Handbook, upper critical values of chi-square: 3.841 at k = 1,
    /// // alpha = 0.05 (from memory).
    /// let x: f32 = Alpha::FivePercent.critical_value(1).unwrap();
    /// assert!((x - 3.841).abs() < 5e-4);
    /// assert_eq!(Alpha::OnePerMille.critical_value::<f64>(0), None);
    /// ```
    #[must_use]
    pub fn critical_value<T: Real>(self, degrees_of_freedom: usize) -> Option<T> {
        let k = degrees_of_freedom.checked_sub(1)?;
        let a = self as usize;
        let x = if T::MANTISSA_DIGITS <= 24 {
            // Widened only to pass through `from_f64`, which narrows it back exactly (the
            // compiler folds the pair away).
            f64::from(*CRITICAL_F32.get(k)?.get(a)?)
        } else {
            *CRITICAL.get(k)?.get(a)?
        };
        Some(T::from_f64(x))
    }
}

/// A reading that could not be used, and which one it was.
///
/// # Examples
/// ```
/// use fourforce::witness::{Alpha, Reading, Watch};
/// use fourforce::{Error, Species};
/// let mut w = Watch::<f32, 2>::new();
/// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 })?;
/// w.try_push(Reading::Speed { speed_m_per_s: 3.1e8, sigma_m_per_s: 1.0e3 })?;
/// let e = w.try_assess(Species::PROTON, Alpha::default()).unwrap_err();
/// assert_eq!((e.index(), e.error()), (1, Error::SpeedNotBelowLight));
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ReadingError {
    index: usize,
    error: Error,
}

impl ReadingError {
    /// Index of the reading in the [`Watch`], from 0 (0 also for an empty watch).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Watch};
    /// use fourforce::{Error, Species};
    /// let e = Watch::<f64, 2>::new().try_assess(Species::PROTON, Alpha::default()).unwrap_err();
    /// assert_eq!((e.index(), e.error()), (0, Error::Empty));
    /// ```
    #[must_use]
    #[inline]
    pub const fn index(&self) -> usize {
        self.index
    }

    /// What is wrong with it ([`Error::Empty`] for an empty watch).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::{Error, Species};
    /// let mut w = Watch::<f64, 1>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: -1.0 })?;
    /// let e = w.try_assess(Species::PROTON, Alpha::default()).unwrap_err();
    /// assert_eq!(e.error(), Error::NonPositiveUncertainty);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn error(&self) -> Error {
        self.error
    }
}

impl fmt::Display for ReadingError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "reading {}: {}", self.index, self.error)
    }
}

impl core::error::Error for ReadingError {}

/// The inverse-variance fusion of `estimates` without the one at `skip` (if any): the fused
/// estimate and `χ²`, or `None` when nothing is left.
fn fuse<T: Real>(estimates: &[Estimate<T>], skip: Option<usize>) -> Option<(Estimate<T>, T)> {
    let kept = || {
        estimates
            .iter()
            .enumerate()
            .filter(move |&(i, _)| Some(i) != skip)
            .map(|(_, e)| e)
    };
    // The most precise witness is the reference: weights ≤ 1, differences small.
    let reference = kept().fold(None, |best: Option<&Estimate<T>>, e| match best {
        Some(b) if b.sigma <= e.sigma => Some(b),
        _ => Some(e),
    })?;
    let (t0, s0) = (reference.kinetic, reference.sigma);
    let mut weights = T::ZERO;
    let mut moment = T::ZERO;
    for e in kept() {
        let r = s0 / e.sigma;
        let w = r * r;
        weights += w;
        moment += w * (e.kinetic - t0);
    }
    let mut shift = moment / weights;
    if !moment.is_finite() {
        // differences near the largest finite energy overflowed the sum: again on d/16 (exact)
        let sixteenth = T::from_f64(0.0625);
        moment = T::ZERO;
        for e in kept() {
            let r = s0 / e.sigma;
            moment += r * r * ((e.kinetic - t0) * sixteenth);
        }
        shift = moment / weights * T::from_f64(16.0);
    }
    let mut chi_squared = T::ZERO;
    for e in kept() {
        let z = ((e.kinetic - t0) - shift) / e.sigma;
        chi_squared += z * z;
    }
    // witnesses so far apart that χ² does not fit: the largest finite value (inconsistent at
    // every level); a comparison, not `min`, which is a call on the chip
    if chi_squared > T::MAX {
        chi_squared = T::MAX;
    }
    // T₀ + shift lies between the smallest and largest T_i: the weight of T₀ is 1 ≥ 1/16 of
    // the total, so the shift stays below the differences by more than its rounding
    let kinetic = t0 + shift;
    Some((
        Estimate {
            kinetic,
            sigma: s0 / weights.sqrt(),
        },
        chi_squared,
    ))
}

/// The result of a [`Watch`]'s assessment: every witness's estimate, the fused one, `χ²`, the
/// verdict and the outlier.
///
/// # Examples
/// ```
/// use fourforce::witness::{Alpha, Reading, Watch};
/// use fourforce::Species;
/// let mut w = Watch::<f64, 3>::new();
/// for t in [10.0e6, 10.1e6, 13.0e6] {
///     w.try_push(Reading::Kinetic { kinetic_ev: t, sigma_ev: 0.1e6 })?;
/// }
/// let a = w.try_assess(Species::PROTON, Alpha::default()).map_err(|e| e.error())?;
/// assert!(!a.is_consistent());
/// assert_eq!(a.outlier(), Some(2));
/// assert_eq!(a.estimates().len(), 3);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Assessment<T: Real, const N: usize> {
    estimates: [Estimate<T>; N],
    len: usize,
    fused: Estimate<T>,
    chi_squared: T,
    consistent: bool,
    outlier: Option<usize>,
}

impl<T: Real, const N: usize> Assessment<T, N> {
    /// Each witness's implied estimate, in the order of the readings.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::Species;
    /// let mut w = Watch::<f32, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 2.0e6, sigma_ev: 1.0e4 })?;
    /// let a = w.try_assess(Species::ELECTRON, Alpha::default()).map_err(|e| e.error())?;
    /// assert_eq!(a.estimates()[0].kinetic_energy(), 2.0e6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn estimates(&self) -> &[Estimate<T>] {
        self.estimates.get(..self.len).unwrap_or(&[])
    }

    /// The inverse-variance weighted mean `T̂` and its uncertainty `1/√(Σ 1/σ_i²)`, in eV.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::Species;
    /// let mut w = Watch::<f64, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 3.0e3 })?;
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.004e6, sigma_ev: 4.0e3 })?;
    /// let f = w.try_assess(Species::PROTON, Alpha::default()).map_err(|e| e.error())?.fused();
    /// // weights 1/9 and 1/16: T = 1.00144e6, sigma = 12/5 keV.
    /// assert!((f.kinetic_energy() - 1.001_44e6).abs() < 1e-9);
    /// assert!((f.uncertainty() - 2.4e3).abs() < 1e-12);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn fused(&self) -> Estimate<T> {
        self.fused
    }

    /// `χ² = Σ (T_i − T̂)²/σ_i²` (0 for one witness; the largest finite value when the
    /// witnesses are so far apart that it does not fit).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::Species;
    /// let mut w = Watch::<f64, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 })?;
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.002e6, sigma_ev: 1.0e3 })?;
    /// let a = w.try_assess(Species::PROTON, Alpha::default()).map_err(|e| e.error())?;
    /// assert!((a.chi_squared() - 2.0).abs() < 1e-9); // two deviations of 1 sigma
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn chi_squared(&self) -> T {
        self.chi_squared
    }

    /// Degrees of freedom `n − 1` of the `χ²`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::Species;
    /// let mut w = Watch::<f64, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 })?;
    /// let a = w.try_assess(Species::PROTON, Alpha::default()).map_err(|e| e.error())?;
    /// assert_eq!(a.degrees_of_freedom(), 0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn degrees_of_freedom(&self) -> usize {
        self.len.saturating_sub(1)
    }

    /// True when the witnesses agree: `χ²` at most the critical value (always for one witness).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::Species;
    /// let mut w = Watch::<f64, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 })?;
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.01e6, sigma_ev: 1.0e3 })?;
    /// let a = w.try_assess(Species::PROTON, Alpha::default()).map_err(|e| e.error())?;
    /// assert!(!a.is_consistent()); // chi^2 = 50 > 10.83
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn is_consistent(&self) -> bool {
        self.consistent
    }

    /// The index of the witness that disagrees, when the set is inconsistent, has three or more
    /// witnesses, and the others agree without it (see [the outlier](self#the-outlier)).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::Species;
    /// let mut w = Watch::<f64, 4>::new();
    /// for t in [5.0e6, 5.001e6, 5.2e6, 4.999e6] {
    ///     w.try_push(Reading::Kinetic { kinetic_ev: t, sigma_ev: 1.0e3 })?;
    /// }
    /// let a = w.try_assess(Species::PROTON, Alpha::default()).map_err(|e| e.error())?;
    /// assert_eq!(a.outlier(), Some(2));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn outlier(&self) -> Option<usize> {
        self.outlier
    }
}

/// Which candidate species the witnesses are consistent with (see [`Watch::try_check_species`]).
///
/// # Examples
/// ```
/// use fourforce::witness::SpeciesVerdict;
/// let v = SpeciesVerdict::One(2);
/// assert_eq!(v.consistent_one(), Some(2));
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum SpeciesVerdict {
    /// Exactly one candidate is consistent: its index in the list.
    One(usize),
    /// Several candidates are consistent: the one with the smallest `χ²`, and how many.
    Several {
        /// Index of the consistent candidate with the smallest `χ²` (the first of equals).
        best: usize,
        /// Number of consistent candidates (≥ 2).
        count: usize,
    },
    /// No candidate is consistent: the one with the smallest `χ²`, if any could be assessed.
    NoneConsistent {
        /// Index of the candidate with the smallest `χ²`; `None` when no candidate can give these
        /// readings at all (a neutral species, an overflow) or the list is empty.
        closest: Option<usize>,
    },
}

impl SpeciesVerdict {
    /// The candidate's index when exactly one is consistent.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::SpeciesVerdict;
    /// assert_eq!(SpeciesVerdict::Several { best: 0, count: 2 }.consistent_one(), None);
    /// ```
    #[must_use]
    pub const fn consistent_one(self) -> Option<usize> {
        match self {
            Self::One(i) => Some(i),
            _ => None,
        }
    }
}

/// Up to `N` readings of one beam energy (at most [`MAX_WITNESSES`] are used), assessed together.
///
/// No heap: the readings live in an array of `N`; an assessment returns another (`N` estimates).
///
/// # Examples
/// ```
/// use fourforce::witness::{Alpha, Reading, Watch};
/// use fourforce::{Error, Species};
/// let mut w = Watch::<f32, 1>::new();
/// w.try_push(Reading::Speed { speed_m_per_s: 1.0e7, sigma_m_per_s: 1.0e4 })?;
/// assert_eq!(
///     w.try_push(Reading::Speed { speed_m_per_s: 1.0e7, sigma_m_per_s: 1.0e4 }),
///     Err(Error::CapacityFull)
/// );
/// assert_eq!(w.len(), 1);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Watch<T: Real, const N: usize> {
    readings: [Reading<T>; N],
    len: usize,
}

impl<T: Real, const N: usize> Default for Watch<T, N> {
    fn default() -> Self {
        Self::new()
    }
}

impl<T: Real, const N: usize> Watch<T, N> {
    /// The capacity actually used: `N`, at most [`MAX_WITNESSES`].
    const CAPACITY: usize = if N < MAX_WITNESSES { N } else { MAX_WITNESSES };

    /// An empty watch, `const` so that a `static` can hold it.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Watch;
    /// static EMPTY: Watch<f32, 4> = Watch::new();
    /// assert!(EMPTY.is_empty());
    /// ```
    #[must_use]
    pub const fn new() -> Self {
        Self {
            readings: [Reading::Kinetic {
                kinetic_ev: T::ZERO,
                sigma_ev: T::ZERO,
            }; N],
            len: 0,
        }
    }

    /// Adds a reading (checked when assessed, where its index is reported).
    ///
    /// # Errors
    /// [`Error::CapacityFull`] when `N` (or [`MAX_WITNESSES`]) readings are held.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Reading, Watch};
    /// let mut w = Watch::<f64, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 })?;
    /// assert_eq!(w.len(), 1);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_push(&mut self, reading: Reading<T>) -> Result<(), Error> {
        if self.len >= Self::CAPACITY {
            return Err(Error::CapacityFull);
        }
        let slot = self.readings.get_mut(self.len).ok_or(Error::CapacityFull)?;
        *slot = reading;
        self.len += 1;
        Ok(())
    }

    /// Removes every reading.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Reading, Watch};
    /// let mut w = Watch::<f64, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 })?;
    /// w.clear();
    /// assert!(w.is_empty());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn clear(&mut self) {
        self.len = 0;
    }

    /// Number of readings held.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Watch;
    /// assert_eq!(Watch::<f64, 3>::new().len(), 0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn len(&self) -> usize {
        self.len
    }

    /// True when no reading is held.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::Watch;
    /// assert!(Watch::<f64, 3>::new().is_empty());
    /// ```
    #[must_use]
    #[inline]
    pub const fn is_empty(&self) -> bool {
        self.len == 0
    }

    /// The readings held, in the order pushed.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Reading, Watch};
    /// let mut w = Watch::<f64, 2>::new();
    /// let r = Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 };
    /// w.try_push(r)?;
    /// assert_eq!(w.readings(), &[r]);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn readings(&self) -> &[Reading<T>] {
        self.readings.get(..self.len).unwrap_or(&[])
    }

    /// Assesses the readings for `species` at the level `alpha`, with the critical values of the
    /// table (see [Consistency](self#consistency)).
    ///
    /// # Errors
    /// The first reading that cannot be turned into an estimate (its index and the error of
    /// [`Reading::try_estimate`]); [`Error::Empty`] (index 0) when no reading is held.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::Species;
    /// let mut w = Watch::<f32, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 })?;
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.003e6, sigma_ev: 1.0e3 })?;
    /// // chi^2 = 4.5: consistent at 1e-3 and 1e-2, not at 5 %.
    /// let at = |a| w.try_assess(Species::PROTON, a).map(|x| x.is_consistent());
    /// assert_eq!(at(Alpha::OnePerMille), Ok(true));
    /// assert_eq!(at(Alpha::FivePercent), Ok(false));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_assess(
        &self,
        species: Species<T>,
        alpha: Alpha,
    ) -> Result<Assessment<T, N>, ReadingError> {
        self.try_assess_with(species, |k| alpha.critical_value(k).unwrap_or(T::INFINITY))
    }

    /// Assesses the readings for `species`, with `critical(k)` the critical `χ²` for `k` degrees
    /// of freedom (1 to 15): for a level the table does not carry.
    ///
    /// # Errors
    /// As [`try_assess`](Self::try_assess).
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, Watch};
    /// use fourforce::Species;
    /// let mut w = Watch::<f64, 2>::new();
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.0e6, sigma_ev: 1.0e3 })?;
    /// w.try_push(Reading::Kinetic { kinetic_ev: 1.003e6, sigma_ev: 1.0e3 })?;
    /// // A strict limit of chi^2 = 4 whatever the degrees of freedom.
    /// let a = w.try_assess_with(Species::PROTON, |_| 4.0).map_err(|e| e.error())?;
    /// assert!(!a.is_consistent());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_assess_with(
        &self,
        species: Species<T>,
        critical: impl Fn(usize) -> T,
    ) -> Result<Assessment<T, N>, ReadingError> {
        let mut estimates = [Estimate {
            kinetic: T::ZERO,
            sigma: T::ONE,
        }; N];
        for (index, (slot, reading)) in estimates.iter_mut().zip(self.readings()).enumerate() {
            *slot = reading
                .try_estimate(species)
                .map_err(|error| ReadingError { index, error })?;
        }
        let n = self.len;
        let used = estimates.get(..n).unwrap_or(&[]);
        let (fused, chi_squared) = fuse(used, None).ok_or(ReadingError {
            index: 0,
            error: Error::Empty,
        })?;
        let consistent = n < 2 || chi_squared <= critical(n - 1);
        let mut outlier = None;
        if !consistent && n >= 3 {
            let mut best: Option<(usize, T)> = None;
            for j in 0..n {
                if let Some((_, rest)) = fuse(used, Some(j)) {
                    if best.is_none_or(|(_, b)| rest < b) {
                        best = Some((j, rest));
                    }
                }
            }
            outlier = best
                .filter(|&(_, rest)| rest <= critical(n - 2))
                .map(|(j, _)| j);
        }
        Ok(Assessment {
            estimates,
            len: n,
            fused,
            chi_squared,
            consistent,
            outlier,
        })
    }

    /// Which of `candidates` (for example the ions and charge states an analysing magnet could
    /// select) the readings are consistent with, at the level `alpha`.
    ///
    /// A candidate that cannot give one of the readings (a neutral species for a field witness,
    /// an overflow) is not consistent. With a single reading every candidate that can give it is
    /// consistent (no degree of freedom); a kinetic readback does not depend on the species.
    ///
    /// # Errors
    /// A reading that no species could give (any error of [`Reading::try_estimate`] other than
    /// [`Error::ZeroCharge`] and [`Error::Overflow`]), with its index; [`Error::Empty`] (index 0)
    /// when no reading is held.
    ///
    /// # Examples
    /// ```
    /// use fourforce::witness::{Alpha, Reading, SpeciesVerdict, Watch};
    /// use fourforce::Species;
    /// // 4He+ or 4He2+ behind a 0.5 m analysing magnet, with a flight time over 2 m: an invented
    /// // implanter, a 1 MeV helium beam (1 MeV He+: B = 0.576083 T, t = 288.080 ns at 2 m, mpmath).
    /// // (He+ taken as an alpha plus an electron; the 54 eV binding energy is neglected.)
    /// let he1 = Species::try_new(3_727.379_406_6e6 + 510_998.95, 1.0)?;
    /// let mut w = Watch::<f64, 2>::new();
    /// w.try_push(Reading::Dipole { field_t: 0.576_08, sigma_t: 0.000_5, radius_m: 0.5 })?;
    /// w.try_push(Reading::FlightTime { time_s: 288.08e-9, sigma_s: 0.5e-9, baseline_m: 2.0 })?;
    /// let v = w.try_check_species(&[Species::ALPHA, he1], Alpha::default()).map_err(|e| e.error())?;
    /// assert_eq!(v, SpeciesVerdict::One(1));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_check_species(
        &self,
        candidates: &[Species<T>],
        alpha: Alpha,
    ) -> Result<SpeciesVerdict, ReadingError> {
        if self.is_empty() {
            return Err(ReadingError {
                index: 0,
                error: Error::Empty,
            });
        }
        let mut closest: Option<(usize, T)> = None;
        let mut best: Option<(usize, T)> = None;
        let mut count = 0;
        for (c, &species) in candidates.iter().enumerate() {
            let a = match self.try_assess(species, alpha) {
                Ok(a) => a,
                Err(e) if matches!(e.error, Error::ZeroCharge | Error::Overflow) => continue,
                Err(e) => return Err(e),
            };
            let x = a.chi_squared;
            if closest.is_none_or(|(_, b)| x < b) {
                closest = Some((c, x));
            }
            if a.consistent {
                count += 1;
                if best.is_none_or(|(_, b)| x < b) {
                    best = Some((c, x));
                }
            }
        }
        Ok(match (best, count) {
            (Some((i, _)), 1) => SpeciesVerdict::One(i),
            (Some((i, _)), _) => SpeciesVerdict::Several { best: i, count },
            (None, _) => SpeciesVerdict::NoneConsistent {
                closest: closest.map(|(i, _)| i),
            },
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_table_rises_with_the_degrees_of_freedom_and_with_stricter_levels() {
        for (k, row) in CRITICAL.iter().enumerate() {
            for pair in row.windows(2) {
                assert!(pair[0] < pair[1], "row {k}");
            }
            if let Some(next) = CRITICAL.get(k + 1) {
                for (a, b) in row.iter().zip(next) {
                    assert!(a < b, "row {k}");
                }
            }
        }
    }

    #[test]
    fn the_capacity_stops_at_the_table() {
        let mut w = Watch::<f32, 20>::new();
        let r = Reading::Kinetic {
            kinetic_ev: 1.0,
            sigma_ev: 1.0,
        };
        for _ in 0..MAX_WITNESSES {
            w.try_push(r).unwrap();
        }
        assert_eq!(w.try_push(r), Err(Error::CapacityFull));
        let a = w.try_assess(Species::PROTON, Alpha::default()).unwrap();
        assert_eq!(a.degrees_of_freedom(), 15);
        assert!(a.is_consistent());
    }
}
