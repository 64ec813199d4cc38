//! On-device plausibility checks: is a measured energy, flight time or centring field possible,
//! and is it inside the window the machine expects? And is a reading drifting?
//!
//! An [`EnergyWindow`] holds the species and the expected kinetic energy with its lower and
//! upper bounds. Each check infers the kinetic energy from a measurement (a flight time over a
//! baseline, the dipole field that centres the beam on a known radius, or an energy read
//! directly) with the stable formulas of [`Motion`], and returns a [`Verdict`]:
//! [`Inside`](Verdict::Inside), [`Low`](Verdict::Low), [`High`](Verdict::High) with the
//! inferred energy and its deviation from the nominal, or [`Impossible`](Verdict::Impossible)
//! with the reason (a flight time shorter than light needs, a zero field, a non-finite reading).
//!
//! A [`MovingWindow`] keeps the last `N` readings (no heap) and gives their mean, spread and
//! drift, and flags a [`Trend`] when the drift across the window exceeds a threshold.
//!
//! # For firmware authors
//! A check is one [`Motion`] construction (a square root, a few divisions) and two comparisons.
//! A window push is O(1); [`MovingWindow::try_slope`] is O(N).
//!
//! # Examples
//! ```
//! use fourforce::Species;
//! use fourforce::check::{EnergyWindow, Verdict};
//! // An invented 5 MeV alpha line, 1.5 m time-of-flight cell, window ±2 %.
//! let window = EnergyWindow::try_around(Species::<f32>::ALPHA, 5.0e6, 0.02)?;
//! // 96.696 ns over 1.5 m is 5 MeV (mpmath, CODATA 2018: beta = 0.051744192122256112).
//! assert!(window.check_flight_time(1.5, 96.696e-9).is_inside());
//! assert!(matches!(window.check_flight_time(1.5, 90.0e-9), Verdict::High { .. }));
//! assert!(matches!(window.check_flight_time(1.5, 4.0e-9), Verdict::Impossible(_)));
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::real::fits;
use crate::{Error, Motion, Real, Species, try_finite};

/// The outcome of a plausibility check.
///
/// # Examples
/// ```
/// use fourforce::Species;
/// use fourforce::check::{EnergyWindow, Verdict};
/// let w = EnergyWindow::try_new(Species::<f64>::PROTON, 9.0e6, 10.0e6, 11.0e6)?;
/// match w.check_kinetic_energy(8.0e6) {
///     Verdict::Low { kinetic_energy_ev, deviation } => {
///         assert_eq!(kinetic_energy_ev, 8.0e6);
///         assert_eq!(deviation, -0.2);
///     }
///     other => panic!("{other:?}"),
/// }
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Verdict<T: Real> {
    /// Within the window (bounds included).
    Inside {
        /// Inferred kinetic energy in eV.
        kinetic_energy_ev: T,
        /// Relative deviation from the nominal energy, `(T - T_nom) / T_nom`, at most `MAX`.
        deviation: T,
    },
    /// Below the lower bound.
    Low {
        /// Inferred kinetic energy in eV.
        kinetic_energy_ev: T,
        /// Relative deviation from the nominal energy, `(T - T_nom) / T_nom`, at most `MAX`.
        deviation: T,
    },
    /// Above the upper bound.
    High {
        /// Inferred kinetic energy in eV.
        kinetic_energy_ev: T,
        /// Relative deviation from the nominal energy, `(T - T_nom) / T_nom`, at most `MAX`.
        deviation: T,
    },
    /// No particle of the species could give this reading; the error says why.
    Impossible(Error),
}

impl<T: Real> Verdict<T> {
    /// True for [`Verdict::Inside`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, check::Verdict};
    /// assert!(!Verdict::<f32>::Impossible(Error::FasterThanLight).is_inside());
    /// ```
    #[must_use]
    #[inline]
    pub const fn is_inside(&self) -> bool {
        matches!(self, Self::Inside { .. })
    }

    /// The inferred kinetic energy (eV), if the reading was possible.
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::Verdict;
    /// let v = Verdict::High { kinetic_energy_ev: 2.0e6_f32, deviation: 1.0 };
    /// assert_eq!(v.kinetic_energy(), Some(2.0e6));
    /// ```
    #[must_use]
    #[inline]
    pub const fn kinetic_energy(&self) -> Option<T> {
        match *self {
            Self::Inside {
                kinetic_energy_ev, ..
            }
            | Self::Low {
                kinetic_energy_ev, ..
            }
            | Self::High {
                kinetic_energy_ev, ..
            } => Some(kinetic_energy_ev),
            Self::Impossible(_) => None,
        }
    }

    /// The relative deviation from the nominal energy, if the reading was possible.
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::Verdict;
    /// let v = Verdict::Inside { kinetic_energy_ev: 1.01e6_f64, deviation: 0.01 };
    /// assert_eq!(v.deviation(), Some(0.01));
    /// ```
    #[must_use]
    #[inline]
    pub const fn deviation(&self) -> Option<T> {
        match *self {
            Self::Inside { deviation, .. }
            | Self::Low { deviation, .. }
            | Self::High { deviation, .. } => Some(deviation),
            Self::Impossible(_) => None,
        }
    }
}

/// The expected kinetic energy of a species with its acceptable window.
///
/// # Examples
/// ```
/// use fourforce::Species;
/// use fourforce::check::EnergyWindow;
/// let w = EnergyWindow::try_new(Species::<f32>::ELECTRON, 95.0e3, 100.0e3, 105.0e3)?;
/// assert_eq!(w.nominal(), 100.0e3);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct EnergyWindow<T: Real> {
    species: Species<T>,
    low: T,
    nominal: T,
    high: T,
}

impl<T: Real> EnergyWindow<T> {
    /// A window `low ≤ T ≤ high` (eV) around the nominal kinetic energy `nominal` (eV).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NegativeEnergy`] if `low < 0`; [`Error::InvalidRange`]
    /// unless `low ≤ nominal ≤ high` and `nominal > 0`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Species, check::EnergyWindow};
    /// let bad = EnergyWindow::try_new(Species::<f64>::PROTON, 2.0e6, 1.0e6, 3.0e6);
    /// assert_eq!(bad, Err(Error::InvalidRange));
    /// ```
    pub fn try_new(
        species: Species<T>,
        low_ev: T,
        nominal_ev: T,
        high_ev: T,
    ) -> Result<Self, Error> {
        let (low, nominal, high) = (
            try_finite(low_ev)?,
            try_finite(nominal_ev)?,
            try_finite(high_ev)?,
        );
        if low < T::ZERO {
            return Err(Error::NegativeEnergy);
        }
        if !(low <= nominal && nominal <= high) || nominal <= T::ZERO {
            return Err(Error::InvalidRange);
        }
        Ok(Self {
            species,
            low,
            nominal,
            high,
        })
    }

    /// A window `nominal (1 ± relative_tolerance)`.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::InvalidRange`] for a tolerance outside `[0, 1]` or a
    /// nominal energy that is not positive; [`Error::Overflow`] if `nominal (1 + tol)` does not
    /// fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Species, check::EnergyWindow};
    /// let w = EnergyWindow::try_around(Species::<f64>::PROTON, 10.0e6, 0.05)?;
    /// assert_eq!((w.low(), w.high()), (9.5e6, 10.5e6));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_around(
        species: Species<T>,
        nominal_ev: T,
        relative_tolerance: T,
    ) -> Result<Self, Error> {
        let tol = try_finite(relative_tolerance)?;
        if !(T::ZERO..=T::ONE).contains(&tol) {
            return Err(Error::InvalidRange);
        }
        let nominal = try_finite(nominal_ev)?;
        let high = nominal * (T::ONE + tol);
        if !high.is_finite() {
            return Err(Error::Overflow);
        }
        Self::try_new(species, nominal * (T::ONE - tol), nominal, high)
    }

    /// The species the window is for.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Species, check::EnergyWindow};
    /// let w = EnergyWindow::try_around(Species::<f32>::DEUTERON, 2.0e6, 0.1)?;
    /// assert_eq!(w.species(), Species::DEUTERON);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn species(&self) -> Species<T> {
        self.species
    }

    /// Lower bound of the kinetic energy in eV.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Species, check::EnergyWindow};
    /// let w = EnergyWindow::try_new(Species::<f32>::PROTON, 1.0, 2.0, 3.0)?;
    /// assert_eq!(w.low(), 1.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn low(&self) -> T {
        self.low
    }

    /// Nominal kinetic energy in eV.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Species, check::EnergyWindow};
    /// let w = EnergyWindow::try_new(Species::<f32>::PROTON, 1.0, 2.0, 3.0)?;
    /// assert_eq!(w.nominal(), 2.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn nominal(&self) -> T {
        self.nominal
    }

    /// Upper bound of the kinetic energy in eV.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Species, check::EnergyWindow};
    /// let w = EnergyWindow::try_new(Species::<f32>::PROTON, 1.0, 2.0, 3.0)?;
    /// assert_eq!(w.high(), 3.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn high(&self) -> T {
        self.high
    }

    /// The verdict on a kinetic energy `t_ev` (eV) read directly.
    ///
    /// [`Verdict::Impossible`] with [`Error::NonFinite`] or [`Error::NegativeEnergy`] for a
    /// reading that no particle can have.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Species, check::{EnergyWindow, Verdict}};
    /// let w = EnergyWindow::try_around(Species::<f32>::PROTON, 10.0e6, 0.01)?;
    /// assert!(w.check_kinetic_energy(10.05e6).is_inside());
    /// assert_eq!(w.check_kinetic_energy(-1.0), Verdict::Impossible(Error::NegativeEnergy));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn check_kinetic_energy(&self, t_ev: T) -> Verdict<T> {
        match try_finite(t_ev) {
            Ok(t) if t < T::ZERO => Verdict::Impossible(Error::NegativeEnergy),
            Ok(t) => self.classify(t),
            Err(e) => Verdict::Impossible(e),
        }
    }

    /// The verdict on a state of motion built elsewhere.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, check::EnergyWindow};
    /// let w = EnergyWindow::try_around(Species::<f64>::PROTON, 250.0e6, 0.01)?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 251.0e6)?;
    /// assert!(w.check_motion(&p).is_inside());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn check_motion(&self, motion: &Motion<T>) -> Verdict<T> {
        self.classify(motion.kinetic_energy())
    }

    /// The verdict on a flight time `time_s` (s) over a baseline `baseline_m` (m).
    ///
    /// The energy comes from [`Motion::try_from_flight_time`] (`c t - L` formed exactly, so
    /// a relativistic flight time keeps its information). [`Verdict::Impossible`] with
    /// [`Error::FasterThanLight`] when `c t ≤ L`, [`Error::NonPositiveLength`] for a baseline or
    /// time that is not positive, [`Error::NonFinite`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Species, check::{EnergyWindow, Verdict}};
    /// // 1 GeV proton: 3.8120493548822230 ns/m (mpmath, CODATA 2018); a 10 m baseline.
    /// let w = EnergyWindow::try_around(Species::<f64>::PROTON, 1.0e9, 0.001)?;
    /// let v = w.check_flight_time(10.0, 38.120_493_548_822_23e-9);
    /// assert!(v.is_inside() && v.deviation().unwrap().abs() < 1e-12);
    /// assert_eq!(w.check_flight_time(10.0, 33.0e-9), Verdict::Impossible(Error::FasterThanLight));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn check_flight_time(&self, baseline_m: T, time_s: T) -> Verdict<T> {
        match Motion::try_from_flight_time(self.species, baseline_m, time_s) {
            Ok(motion) => self.check_motion(&motion),
            Err(e) => Verdict::Impossible(e),
        }
    }

    /// The verdict on the dipole field `field_t` (T) that centres the beam on the bending radius
    /// `bending_radius_m` (m): `Bρ = |B| ρ`.
    ///
    /// [`Verdict::Impossible`] with [`Error::ZeroField`], [`Error::ZeroCharge`],
    /// [`Error::NonPositiveLength`] or [`Error::NonFinite`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Species, check::{EnergyWindow, Verdict}};
    /// // A 250 MeV proton has B rho = 2.4321284387255044 T m (mpmath, CODATA 2018): on a 2 m
    /// // radius the centring field is 1.2160642 T.
    /// let w = EnergyWindow::try_around(Species::<f32>::PROTON, 250.0e6, 0.005)?;
    /// assert!(w.check_centring_field(1.216_064_2, 2.0).is_inside());
    /// assert!(matches!(w.check_centring_field(1.3, 2.0), Verdict::High { .. }));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn check_centring_field(&self, field_t: T, bending_radius_m: T) -> Verdict<T> {
        match centred(self.species, field_t, bending_radius_m) {
            Ok(motion) => self.check_motion(&motion),
            Err(e) => Verdict::Impossible(e),
        }
    }

    fn classify(&self, t: T) -> Verdict<T> {
        // Saturated at MAX: a reading far above a tiny (subnormal) nominal energy would overflow.
        let deviation = ((t - self.nominal) / self.nominal).min(T::MAX);
        if t < self.low {
            Verdict::Low {
                kinetic_energy_ev: t,
                deviation,
            }
        } else if t > self.high {
            Verdict::High {
                kinetic_energy_ev: t,
                deviation,
            }
        } else {
            Verdict::Inside {
                kinetic_energy_ev: t,
                deviation,
            }
        }
    }
}

/// The state a dipole field `B` centres on the radius `ρ`: `Bρ = |B| ρ`.
fn centred<T: Real>(species: Species<T>, field_t: T, radius_m: T) -> Result<Motion<T>, Error> {
    let b = try_finite(field_t)?.abs();
    if b == T::ZERO {
        return Err(Error::ZeroField);
    }
    if try_finite(radius_m)? <= T::ZERO {
        return Err(Error::NonPositiveLength);
    }
    Motion::try_from_magnetic_rigidity(species, b * radius_m)
}

/// The direction of a reading's drift across a [`MovingWindow`].
///
/// # Examples
/// ```
/// use fourforce::check::{MovingWindow, Trend};
/// let mut w = MovingWindow::<f32, 4>::new();
/// for x in [1.0, 2.0, 3.0, 4.0] { w.try_push(x)?; }
/// assert_eq!(w.try_trend(1.0)?, Trend::Rising);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Trend {
    /// The drift across the window is within the threshold.
    Steady,
    /// The reading rises by more than the threshold across the window.
    Rising,
    /// The reading falls by more than the threshold across the window.
    Falling,
}

/// The last `N` readings of one quantity, with their mean, spread and drift (no heap).
///
/// A push only stores the reading. Mean, spread and slope are computed from the held readings
/// when asked, in two passes: the mean, then the centred sums (`M₂ = Σ(x − x̄)²`, the sum of
/// squared deviations, never a difference of large sums of squares; the least-squares slope over
/// the sample index). So no rounding carries from one push to the next, and a loop that pushes
/// every cycle and asks for the mean pays `N` additions for it, and nothing per push.
///
/// # Examples
/// ```
/// use fourforce::check::MovingWindow;
/// let mut w = MovingWindow::<f64, 3>::new();
/// for x in [10.0, 11.0, 12.0, 13.0] { w.try_push(x)?; } // 10.0 drops out
/// assert_eq!(w.try_mean()?, 12.0);
/// assert_eq!(w.try_spread()?, 1.0);
/// assert_eq!(w.try_slope()?, 1.0);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct MovingWindow<T: Real, const N: usize> {
    values: [T; N],
    next: usize,
    len: usize,
}

impl<T: Real, const N: usize> Default for MovingWindow<T, N> {
    fn default() -> Self {
        Self::new()
    }
}

impl<T: Real, const N: usize> MovingWindow<T, N> {
    /// An empty window of capacity `N` (`N ≥ 1`, checked at compile time).
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::MovingWindow;
    /// static W: MovingWindow<f32, 8> = MovingWindow::new();
    /// assert!(W.is_empty());
    /// ```
    #[must_use]
    pub const fn new() -> Self {
        const { assert!(N >= 1, "a moving window needs room for one value") };
        Self {
            values: [T::ZERO; N],
            next: 0,
            len: 0,
        }
    }

    /// Number of readings held (at most `N`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::MovingWindow;
    /// let mut w = MovingWindow::<f32, 2>::new();
    /// for x in [1.0, 2.0, 3.0] { w.try_push(x)?; }
    /// assert_eq!(w.len(), 2);
    /// # Ok::<(), fourforce::Error>(())
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
    /// use fourforce::check::MovingWindow;
    /// assert!(MovingWindow::<f64, 4>::new().is_empty());
    /// ```
    #[must_use]
    #[inline]
    pub const fn is_empty(&self) -> bool {
        self.len == 0
    }

    /// True when `N` readings are held (the next push drops the oldest).
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::MovingWindow;
    /// let mut w = MovingWindow::<f32, 1>::new();
    /// w.try_push(5.0)?;
    /// assert!(w.is_full());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn is_full(&self) -> bool {
        self.len == N
    }

    /// Forgets every reading.
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::MovingWindow;
    /// let mut w = MovingWindow::<f32, 4>::new();
    /// w.try_push(1.0)?;
    /// w.clear();
    /// assert!(w.is_empty());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn clear(&mut self) {
        *self = Self::new();
    }

    /// Adds a reading; when full, the oldest one drops out.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for NaN or infinity; the window is unchanged.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, check::MovingWindow};
    /// let mut w = MovingWindow::<f32, 4>::new();
    /// assert_eq!(w.try_push(f32::NAN), Err(Error::NonFinite));
    /// assert!(w.is_empty());
    /// ```
    pub fn try_push(&mut self, x: T) -> Result<(), Error> {
        let x = try_finite(x)?;
        let Some(slot) = self.values.get_mut(self.next) else {
            return Err(Error::OutOfBounds);
        };
        *slot = x;
        if self.len < N {
            self.len += 1;
        }
        self.next = if self.next + 1 >= N { 0 } else { self.next + 1 };
        Ok(())
    }

    /// Mean of the held readings.
    ///
    /// # Errors
    /// [`Error::Empty`] when no reading is held; [`Error::Overflow`] when the readings
    /// are so large (near the largest float) that their sums do not fit.
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::MovingWindow;
    /// let mut w = MovingWindow::<f32, 4>::new();
    /// for x in [1.0, 2.0, 6.0] { w.try_push(x)?; }
    /// assert_eq!(w.try_mean()?, 3.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_mean(&self) -> Result<T, Error> {
        if self.len == 0 {
            Err(Error::Empty)
        } else {
            // Readings near the largest float can overflow the sum.
            fits(self.mean())
        }
    }

    /// Sample standard deviation `√(M₂ / (n - 1))` of the held readings; 0 for one reading.
    ///
    /// # Errors
    /// [`Error::Empty`] when no reading is held; [`Error::Overflow`] when the readings
    /// are so large (near the largest float) that their sums do not fit.
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::MovingWindow;
    /// let mut w = MovingWindow::<f64, 4>::new();
    /// for x in [2.0, 4.0, 4.0, 6.0] { w.try_push(x)?; }
    /// assert!((w.try_spread()? - (8.0_f64 / 3.0).sqrt()).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_spread(&self) -> Result<T, Error> {
        match self.len {
            0 => Err(Error::Empty),
            1 => Ok(T::ZERO),
            n => {
                let dof = T::from_u32(u32::try_from(n - 1).unwrap_or(u32::MAX));
                let mean = fits(self.mean())?;
                let mut m2 = T::ZERO;
                for &x in self.held() {
                    m2 += (x - mean) * (x - mean);
                }
                fits((m2 / dof).sqrt())
            }
        }
    }

    /// Least-squares slope of the readings against their index (per reading, oldest first):
    /// `Σ (i - ī)(xᵢ - x̄) / Σ (i - ī)²`.
    ///
    /// # Errors
    /// [`Error::Empty`] with fewer than two readings; [`Error::Overflow`] when the readings
    /// are so large (near the largest float) that their sums do not fit.
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::MovingWindow;
    /// let mut w = MovingWindow::<f32, 8>::new();
    /// for k in 0..8 { w.try_push(100.0 - 0.5 * k as f32)?; }
    /// assert_eq!(w.try_slope()?, -0.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_slope(&self) -> Result<T, Error> {
        if self.len < 2 {
            return Err(Error::Empty);
        }
        let n = T::from_u32(u32::try_from(self.len).unwrap_or(u32::MAX));
        let centre = (n - T::ONE) * T::HALF;
        let mean = fits(self.mean())?;
        let mut sxy = T::ZERO;
        let mut sxx = T::ZERO;
        for (i, x) in self.oldest_first().enumerate() {
            let di = T::from_u32(u32::try_from(i).unwrap_or(u32::MAX)) - centre;
            sxy += di * (x - mean);
            sxx += di * di;
        }
        fits(sxy / sxx)
    }

    /// The fitted change across the window, `slope · (n - 1)`, in the reading's unit.
    ///
    /// # Errors
    /// [`Error::Empty`] with fewer than two readings; [`Error::Overflow`] when the readings
    /// are so large (near the largest float) that their sums do not fit.
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::MovingWindow;
    /// let mut w = MovingWindow::<f64, 5>::new();
    /// for x in [0.0, 1.0, 2.0, 3.0, 4.0] { w.try_push(x)?; }
    /// assert_eq!(w.try_drift()?, 4.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_drift(&self) -> Result<T, Error> {
        let span = T::from_u32(u32::try_from(self.len.saturating_sub(1)).unwrap_or(u32::MAX));
        fits(self.try_slope()? * span)
    }

    /// [`Trend::Rising`] or [`Trend::Falling`] when the drift across the window exceeds
    /// `threshold` (in the reading's unit), else [`Trend::Steady`].
    ///
    /// # Errors
    /// [`Error::Empty`] with fewer than two readings; [`Error::NonFinite`] or
    /// [`Error::NegativeMagnitude`] for a bad threshold; [`Error::Overflow`] as for
    /// [`try_drift`](Self::try_drift).
    ///
    /// # Examples
    /// ```
    /// use fourforce::check::{MovingWindow, Trend};
    /// let mut w = MovingWindow::<f32, 4>::new();
    /// for x in [5.0, 4.9, 5.1, 5.0] { w.try_push(x)?; }
    /// assert_eq!(w.try_trend(0.5)?, Trend::Steady);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_trend(&self, threshold: T) -> Result<Trend, Error> {
        if try_finite(threshold)? < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        let drift = self.try_drift()?;
        Ok(if drift > threshold {
            Trend::Rising
        } else if drift < -threshold {
            Trend::Falling
        } else {
            Trend::Steady
        })
    }

    /// The held readings, oldest first.
    fn oldest_first(&self) -> impl Iterator<Item = T> + '_ {
        let start = if self.len < N { 0 } else { self.next };
        self.values
            .iter()
            .cycle()
            .skip(start)
            .take(self.len)
            .copied()
    }

    /// The held readings in the order of the buffer (the oldest first until it wraps).
    fn held(&self) -> &[T] {
        self.values.get(..self.len).unwrap_or(&[])
    }

    /// Sum of the held readings over their number (not checked; `NaN` or `∞` on overflow; 0/0
    /// when empty).
    fn mean(&self) -> T {
        let (mut sum, rest) = match self.held().split_first() {
            Some((&first, rest)) => (first, rest),
            None => (T::ZERO, &[][..]),
        };
        for &x in rest {
            sum += x;
        }
        sum / T::from_u32(u32::try_from(self.len).unwrap_or(u32::MAX))
    }
}
