//! The steering step: the next corrector setting that moves the beam toward a target at a
//! monitor downstream.
//!
//! # Model and assumptions
//! A thin magnetic corrector kicks the beam by `θ = ±∫B dl / Bρ` ([`optics::try_kick_angle`](crate::optics::try_kick_angle)); a
//! field-free drift of length `L` carries it to a position monitor, where the offset changes by
//! `L θ`. So a change `Δ(∫B dl)` of the corrector moves the beam at the monitor by
//! `±L Δ(∫B dl) / Bρ`. The step asks for a fraction `g` (the gain) of the change that would put
//! the beam exactly on target:
//!
//! ```text
//! Δ(∫B dl) = ± g Bρ (x_target - x_measured) / L
//! ```
//!
//! This holds for a thin kick, small angles (`tan θ ≈ θ`), linear optics and a drift-only path
//! from corrector to monitor. Anything else between them (a quadrupole, a dipole) changes the
//! response `L` to the matrix element `R₁₂` of the path: pass that as `L`. With the model right,
//! the error at the monitor shrinks by `(1 - g)` per step, so `0 < g < 2` converges
//! (monotonically for `g ≤ 1`); `g` around 0.3–0.7 tolerates a model error of a factor two and
//! averages monitor noise.
//!
//! # Limits
//! The change is first clipped to `±max_change_tm` (rate limit: supplies slew slowly, and a
//! bad reading cannot throw the beam far in one step), then the setting is clipped to
//! `±max_integrated_field_tm` (saturation). The returned [`SteeringCommand`] says which limit
//! acted, so the loop can report a corrector at its end stop.
//!
//! # For firmware authors
//! One call per loop iteration: two divisions, a few multiplications, no state. The rigidity
//! comes from the beam's [`Motion`] (checked beforehand with [`check`](crate::check), so a wrong
//! energy reading does not mis-scale the correction).
//!
//! # Examples
//! ```
//! use fourforce::{Motion, Species};
//! use fourforce::steer::SteeringSetup;
//! // An invented 2 MeV deuteron line: monitor 3 m after the corrector, ±5 mT m, 0.2 mT m/step.
//! let setup = SteeringSetup::try_new(3.0_f32, 0.5, 5.0e-3, 0.2e-3)?;
//! let beam = Motion::try_from_kinetic_energy(Species::DEUTERON, 2.0e6)?;
//! let cmd = setup.try_next_setting(&beam, 1.0e-3, 0.0, 0.0)?; // beam 1 mm off, corrector at 0
//! // full correction: -0.28900 T m * 1e-3 / 3 = -96.3 uT m; half of it with g = 0.5
//! assert!((cmd.setting() + 0.5 * 0.289 * 1.0e-3 / 3.0).abs() < 1e-7);
//! assert!(!cmd.rate_limited() && !cmd.saturated());
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::{Error, Motion, Real, try_finite};

/// The fixed parameters of one steering loop: drift to the monitor, gain, corrector limits.
///
/// # Examples
/// ```
/// use fourforce::steer::SteeringSetup;
/// let s = SteeringSetup::try_new(2.5_f64, 0.4, 1.0e-2, 1.0e-3)?;
/// assert_eq!(s.gain(), 0.4);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SteeringSetup<T: Real> {
    drift_m: T,
    gain: T,
    max_integrated_field_tm: T,
    max_change_tm: T,
}

impl<T: Real> SteeringSetup<T> {
    /// A loop with the monitor `drift_m` (m) after the corrector, gain `gain`, corrector range
    /// `±max_integrated_field_tm` (T m) and at most `max_change_tm` (T m) change per step.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NonPositiveLength`] for `drift_m ≤ 0`;
    /// [`Error::GainOutOfRange`] unless `0 < gain < 2`; [`Error::NegativeMagnitude`] for a
    /// negative limit (a zero limit is accepted: the corrector is then held at 0, or frozen).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, steer::SteeringSetup};
    /// assert_eq!(SteeringSetup::try_new(2.0_f32, 2.5, 1e-2, 1e-3), Err(Error::GainOutOfRange));
    /// assert_eq!(SteeringSetup::try_new(0.0_f32, 0.5, 1e-2, 1e-3), Err(Error::NonPositiveLength));
    /// ```
    pub fn try_new(
        drift_m: T,
        gain: T,
        max_integrated_field_tm: T,
        max_change_tm: T,
    ) -> Result<Self, Error> {
        let drift_m = try_finite(drift_m)?;
        let gain = try_finite(gain)?;
        let max_integrated_field_tm = try_finite(max_integrated_field_tm)?;
        let max_change_tm = try_finite(max_change_tm)?;
        if drift_m <= T::ZERO {
            return Err(Error::NonPositiveLength);
        }
        if gain <= T::ZERO || gain >= T::TWO {
            return Err(Error::GainOutOfRange);
        }
        if max_integrated_field_tm < T::ZERO || max_change_tm < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        Ok(Self {
            drift_m,
            gain,
            max_integrated_field_tm,
            max_change_tm,
        })
    }

    /// Drift length from corrector to monitor in m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::steer::SteeringSetup;
    /// assert_eq!(SteeringSetup::try_new(2.5_f32, 0.4, 1e-2, 1e-3)?.drift(), 2.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn drift(&self) -> T {
        self.drift_m
    }

    /// Loop gain (dimensionless).
    ///
    /// # Examples
    /// ```
    /// use fourforce::steer::SteeringSetup;
    /// assert_eq!(SteeringSetup::try_new(2.5_f32, 0.4, 1e-2, 1e-3)?.gain(), 0.4);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn gain(&self) -> T {
        self.gain
    }

    /// Corrector range `±max` in T m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::steer::SteeringSetup;
    /// assert_eq!(SteeringSetup::try_new(2.5_f32, 0.4, 1e-2, 1e-3)?.max_integrated_field(), 1e-2);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn max_integrated_field(&self) -> T {
        self.max_integrated_field_tm
    }

    /// Largest change per step in T m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::steer::SteeringSetup;
    /// assert_eq!(SteeringSetup::try_new(2.5_f32, 0.4, 1e-2, 1e-3)?.max_change(), 1e-3);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn max_change(&self) -> T {
        self.max_change_tm
    }

    /// The next corrector setting, from the beam `beam`, the offset measured at the monitor
    /// `measured_m` (m), the wanted offset `target_m` (m) and the present setting
    /// `current_tm` (T m).
    ///
    /// Edge behaviour: on target, the setting is kept (clipped to the range if it was outside);
    /// a current setting outside the range is first clipped to it.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite reading or setting; [`Error::ZeroCharge`] for a
    /// neutral beam; [`Error::Overflow`] for a beam at rest (infinite correction).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::steer::SteeringSetup;
    /// let setup = SteeringSetup::try_new(2.0_f64, 1.0, 1.0e-3, 1.0e-4)?;
    /// let e = Motion::try_from_kinetic_energy(Species::ELECTRON, 1.0e6)?;
    /// // 10 mm off would need 23.7 uT m at once; the rate limit allows 100 uT m, fine here.
    /// let cmd = setup.try_next_setting(&e, 10.0e-3, 0.0, 0.0)?;
    /// // negative charge: the sign flips (B rho 4.7431804486e-3 T m, mpmath, CODATA 2018)
    /// assert!((cmd.setting() - 4.743_180_448_575_933e-3 * 10.0e-3 / 2.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_next_setting(
        &self,
        beam: &Motion<T>,
        measured_m: T,
        target_m: T,
        current_tm: T,
    ) -> Result<SteeringCommand<T>, Error> {
        let measured = try_finite(measured_m)?;
        let target = try_finite(target_m)?;
        let current = clamp(try_finite(current_tm)?, self.max_integrated_field_tm);
        let brho = beam.try_magnetic_rigidity()?;
        let sign = T::ONE.copysign(beam.species().charge());
        let wanted = try_finite(sign * self.gain * brho * (target - measured) / self.drift_m)
            .map_err(|_| Error::Overflow)?;
        let change = clamp(wanted, self.max_change_tm);
        let setting = clamp(current + change, self.max_integrated_field_tm);
        Ok(SteeringCommand {
            setting_tm: setting,
            change_tm: setting - current,
            rate_limited: change != wanted,
            saturated: setting != current + change,
        })
    }
}

fn clamp<T: Real>(x: T, limit: T) -> T {
    x.min(limit).max(-limit)
}

/// The result of one steering step: the new corrector setting and which limit acted.
///
/// # Examples
/// ```
/// use fourforce::{Motion, Species, steer::SteeringSetup};
/// let setup = SteeringSetup::try_new(1.0_f32, 1.0, 1.0e-3, 1.0e-5)?;
/// let p = Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6)?;
/// let cmd = setup.try_next_setting(&p, 5.0e-3, 0.0, 0.0)?;
/// assert!(cmd.rate_limited());
/// assert_eq!(cmd.change(), -1.0e-5);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SteeringCommand<T: Real> {
    setting_tm: T,
    change_tm: T,
    rate_limited: bool,
    saturated: bool,
}

impl<T: Real> SteeringCommand<T> {
    /// The new corrector setting (integrated field) in T m, within the range.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, steer::SteeringSetup};
    /// let setup = SteeringSetup::try_new(1.0_f32, 0.5, 1.0e-3, 1.0e-3)?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6)?;
    /// assert_eq!(setup.try_next_setting(&p, 0.0, 0.0, 2.0e-4)?.setting(), 2.0e-4);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn setting(&self) -> T {
        self.setting_tm
    }

    /// The change applied in this step (T m), after both limits.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, steer::SteeringSetup};
    /// let setup = SteeringSetup::try_new(1.0_f32, 0.5, 1.0e-3, 1.0e-3)?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6)?;
    /// assert_eq!(setup.try_next_setting(&p, 0.0, 0.0, 2.0e-4)?.change(), 0.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn change(&self) -> T {
        self.change_tm
    }

    /// True when the rate limit cut the wanted change.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, steer::SteeringSetup};
    /// let setup = SteeringSetup::try_new(1.0_f32, 0.5, 1.0, 1.0)?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6)?;
    /// assert!(!setup.try_next_setting(&p, 1.0e-3, 0.0, 0.0)?.rate_limited());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn rate_limited(&self) -> bool {
        self.rate_limited
    }

    /// True when the corrector range cut the setting (the corrector is at its end stop).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, steer::SteeringSetup};
    /// let setup = SteeringSetup::try_new(1.0_f32, 1.0, 1.0e-4, 1.0)?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6)?;
    /// let cmd = setup.try_next_setting(&p, -0.1, 0.0, 0.0)?;
    /// assert!(cmd.saturated() && cmd.setting() == 1.0e-4);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn saturated(&self) -> bool {
        self.saturated
    }
}
