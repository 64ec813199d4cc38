//! A fixed-capacity beam line and the transport of one particle through it, element by element.
//!
//! A [`BeamLine<T, N>`] holds up to `N` [`Element`]s in a `heapless::Vec` (no heap): drifts,
//! thin magnetic kicks (correctors), hard-edge dipoles, accelerating gaps and thin electrostatic
//! kicks. A [`BeamState`] is one particle on the line: its offsets `x`, `y` (m) and slopes
//! `x' = dx/ds`, `y' = dy/ds` (rad, small) from the line's straight axis `s`, its state of motion
//! ([`Motion`]), its kinetic energy and its time of arrival.
//!
//! # Conventions
//! - The line's axis is straight; `x` is horizontal, `y` vertical, `s` along the line.
//! - Signs follow [`optics`]: a positive integrated field (or field) deflects a
//!   positive charge toward `+x` (or along the kick direction), a negative charge the other way.
//! - Thin elements change slopes, not offsets, and take no time.
//!
//! # Elements
//! | element | effect |
//! | --- | --- |
//! | [`Element::Drift`] | `x += L x'`, `y += L y'`; time `+= L √(1 + x'² + y'²) / (βc)` |
//! | [`Element::MagneticKick`] | slope `+= θ` along the direction, `θ = ±∫B dl / Bρ` (small angle) |
//! | [`Element::HardEdgeDipole`] | exact circular arc in the horizontal plane over a length `L` of the axis |
//! | [`Element::AcceleratingGap`] | `T += Q V` (the crate's sign convention); slopes scale by `p_s/p_s'` (transverse momentum kept) |
//! | [`Element::ElectrostaticKick`] | slope `+= θ`, `θ = ±∫E dl / Eρ` (small angle, energy unchanged) |
//!
//! # Precision of energy gains
//! In `f32` a gain below `2⁻²⁵ T` vanishes when added to `T` (an `f32` 1 GeV has a spacing of
//! 64 eV). A [`BeamState`] therefore keeps the initial kinetic energy and the
//! sum of the gains apart, the gains in a compensated (two-sum) pair: a thousand 10 eV gaps on a
//! 1 GeV proton add exactly 10 keV in `f32` (see the tests). The [`Motion`] used for rigidities
//! and speeds is rebuilt from the rounded total after each gap, which is as accurate as `f32`
//! can hold it. The time of arrival is a compensated sum too.
//!
//! # For firmware authors
//! Transport is a loop over at most `N` elements, a few dozen flops each (a gap rebuilds the
//! [`Motion`]: one square root and a few divisions; a dipole needs an `asin`). Nothing allocates.
//!
//! # Examples
//! ```
//! use fourforce::{Motion, Species};
//! use fourforce::beamline::{BeamLine, BeamState, Element, KickDirection};
//! // An invented 2 MeV proton line: 1 m drift, a 1 mT m horizontal corrector, 2 m drift.
//! let mut line = BeamLine::<f32, 8>::new();
//! line.try_push(Element::Drift { length_m: 1.0 })?;
//! line.try_push(Element::MagneticKick { integrated_field_tm: 1.0e-3, direction: KickDirection::Horizontal })?;
//! line.try_push(Element::Drift { length_m: 2.0 })?;
//! let proton = Motion::try_from_kinetic_energy(Species::PROTON, 2.0e6)?;
//! let end = line.try_transport(BeamState::on_axis(proton))?;
//! // theta = 1e-3 / 0.2046 T m = 4.89 mrad; x = 2 m * theta = 9.78 mm
//! assert!((end.x() - 2.0 * 1.0e-3 / proton.try_magnetic_rigidity()?).abs() < 1e-8);
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::compensated::two_sum;
use crate::{Error, Motion, Real, optics, try_finite};

/// The direction of a thin kick in the transverse plane.
///
/// # Examples
/// ```
/// use fourforce::beamline::KickDirection;
/// let d = KickDirection::Angle(core::f32::consts::FRAC_PI_2);
/// let (cx, cy) = d.components();
/// assert!(cx.abs() < 1e-7 && (cy - 1.0).abs() < 1e-7); // the same as Vertical
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum KickDirection<T: Real> {
    /// Deflects in the horizontal plane (changes `x'`).
    Horizontal,
    /// Deflects in the vertical plane (changes `y'`).
    Vertical,
    /// Deflects along the direction at this angle (rad) from `+x` toward `+y` (a rotated kick).
    Angle(T),
}

impl<T: Real> KickDirection<T> {
    /// The unit vector `(cos φ, sin φ)` of the kick in the `(x, y)` plane.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::KickDirection;
    /// assert_eq!(KickDirection::<f64>::Horizontal.components(), (1.0, 0.0));
    /// ```
    #[must_use]
    #[inline]
    pub fn components(self) -> (T, T) {
        match self {
            Self::Horizontal => (T::ONE, T::ZERO),
            Self::Vertical => (T::ZERO, T::ONE),
            Self::Angle(phi) => (phi.cos(), phi.sin()),
        }
    }

    fn check(self) -> Result<Self, Error> {
        if let Self::Angle(phi) = self {
            try_finite(phi)?;
        }
        Ok(self)
    }
}

/// One element of a beam line.
///
/// # Examples
/// ```
/// use fourforce::beamline::Element;
/// let gap = Element::AcceleratingGap { voltage_v: 50.0e3_f32 };
/// assert_eq!(gap.try_check(), Ok(gap));
/// assert!(Element::Drift { length_m: -1.0_f32 }.try_check().is_err());
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Element<T: Real> {
    /// Field-free drift of length `length_m` (m, ≥ 0) along the axis.
    Drift {
        /// Length along the axis in m.
        length_m: T,
    },
    /// Thin magnetic kick (a corrector): integrated field `∫B dl` (T m) deflecting along a
    /// direction, by `θ = ±∫B dl / Bρ` (small angle).
    MagneticKick {
        /// Integrated field in T m (signed).
        integrated_field_tm: T,
        /// Direction of the deflection.
        direction: KickDirection<T>,
    },
    /// Hard-edge dipole: a uniform field `field_t` (T, signed) over `length_m` (m, > 0) of the
    /// axis, bending in the horizontal plane on an exact circular arc.
    HardEdgeDipole {
        /// Field in T (signed: positive bends a positive charge toward `+x`).
        field_t: T,
        /// Length of the field region along the axis in m.
        length_m: T,
    },
    /// Thin accelerating gap of voltage `voltage_v` (V): the kinetic energy changes by `Q V`
    /// (positive voltage accelerates positive charges).
    AcceleratingGap {
        /// Gap voltage in V.
        voltage_v: T,
    },
    /// Thin electrostatic kick: integrated transverse field `∫E dl` (V) deflecting along a
    /// direction by `θ = ±∫E dl / Eρ` (small angle; the energy is unchanged).
    ElectrostaticKick {
        /// Integrated transverse field in V (that is, V/m times m).
        integrated_field_v: T,
        /// Direction of the deflection.
        direction: KickDirection<T>,
    },
}

impl<T: Real> Element<T> {
    /// Returns the element if its parameters are possible, else the reason.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for any NaN or infinite parameter; [`Error::NonPositiveLength`] for a
    /// negative drift length or a dipole length that is not positive.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, beamline::Element};
    /// let bad = Element::HardEdgeDipole { field_t: 0.5_f64, length_m: 0.0 };
    /// assert_eq!(bad.try_check(), Err(Error::NonPositiveLength));
    /// ```
    pub fn try_check(self) -> Result<Self, Error> {
        match self {
            Self::Drift { length_m } => {
                if try_finite(length_m)? < T::ZERO {
                    return Err(Error::NonPositiveLength);
                }
            }
            Self::MagneticKick {
                integrated_field_tm,
                direction,
            } => {
                try_finite(integrated_field_tm)?;
                direction.check()?;
            }
            Self::HardEdgeDipole { field_t, length_m } => {
                try_finite(field_t)?;
                if try_finite(length_m)? <= T::ZERO {
                    return Err(Error::NonPositiveLength);
                }
            }
            Self::AcceleratingGap { voltage_v } => {
                try_finite(voltage_v)?;
            }
            Self::ElectrostaticKick {
                integrated_field_v,
                direction,
            } => {
                try_finite(integrated_field_v)?;
                direction.check()?;
            }
        }
        Ok(self)
    }

    /// The state after this element.
    ///
    /// # Errors
    /// As [`try_check`](Self::try_check); [`Error::ZeroCharge`] for a kick or dipole with a
    /// non-zero field on a neutral particle; [`Error::AngleOutOfRange`] when the particle turns
    /// back (inside a dipole, or in a decelerating gap that takes more than its longitudinal
    /// momentum); [`Error::BelowRestEnergy`] when a gap takes more than the kinetic energy;
    /// [`Error::Overflow`] when a result does not fit the precision (a drift of a particle at
    /// rest, which never arrives).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// use fourforce::beamline::{BeamState, Element};
    /// let slow = BeamState::on_axis(Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e3)?);
    /// let brake = Element::AcceleratingGap { voltage_v: -2.0e3 };
    /// assert_eq!(brake.try_apply(&slow), Err(Error::BelowRestEnergy));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_apply(&self, state: &BeamState<T>) -> Result<BeamState<T>, Error> {
        let element = self.try_check()?;
        let mut next = *state;
        match element {
            Self::Drift { length_m } => {
                next.x += length_m * state.x_slope;
                next.y += length_m * state.y_slope;
                let path = length_m * state.path_per_axis_length();
                next.add_time(path * state.motion.flight_time_per_metre());
            }
            Self::MagneticKick {
                integrated_field_tm,
                direction,
            } => {
                if integrated_field_tm != T::ZERO {
                    let theta = optics::try_kick_angle(&state.motion, integrated_field_tm)?;
                    next.kick(theta, direction);
                }
            }
            Self::ElectrostaticKick {
                integrated_field_v,
                direction,
            } => {
                if integrated_field_v != T::ZERO {
                    let erho = state.motion.try_electric_rigidity()?;
                    let sign = T::ONE.copysign(state.motion.species().charge());
                    let theta = try_finite(sign * integrated_field_v / erho)
                        .map_err(|_| Error::Overflow)?;
                    next.kick(theta, direction);
                }
            }
            Self::HardEdgeDipole { field_t, length_m } => {
                if field_t == T::ZERO {
                    return Self::Drift { length_m }.try_apply(state);
                }
                next.dipole(field_t, length_m)?;
            }
            Self::AcceleratingGap { voltage_v } => {
                if voltage_v != T::ZERO {
                    next.gap(voltage_v)?;
                }
            }
        }
        if next.is_finite() {
            Ok(next)
        } else {
            Err(Error::Overflow)
        }
    }
}

/// One particle on the line: offsets (m), slopes (rad), state of motion, energy, time (s).
///
/// # Examples
/// ```
/// use fourforce::{Motion, Species};
/// use fourforce::beamline::BeamState;
/// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 10.0e3)?;
/// let s = BeamState::try_new(e, 1.0e-3, 0.0, 0.0, 2.0e-3, 0.0)?;
/// assert_eq!((s.x(), s.y_slope()), (1.0e-3, 2.0e-3));
/// assert_eq!(s.kinetic_energy(), 10.0e3);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BeamState<T: Real> {
    motion: Motion<T>,
    x: T,
    x_slope: T,
    y: T,
    y_slope: T,
    initial_kinetic: T,
    gain: T,
    gain_carry: T,
    time: T,
    time_carry: T,
}

impl<T: Real> BeamState<T> {
    /// A particle of state of motion `motion` at offsets `x`, `y` (m) with slopes `x'`, `y'`
    /// (rad) at time `time_s` (s).
    ///
    /// # Errors
    /// [`Error::NonFinite`] if an input is NaN or infinite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// use fourforce::beamline::BeamState;
    /// let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e6)?;
    /// assert_eq!(BeamState::try_new(p, f32::NAN, 0.0, 0.0, 0.0, 0.0), Err(Error::NonFinite));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_new(
        motion: Motion<T>,
        x_m: T,
        x_slope: T,
        y_m: T,
        y_slope: T,
        time_s: T,
    ) -> Result<Self, Error> {
        let state = Self {
            motion,
            x: x_m,
            x_slope,
            y: y_m,
            y_slope,
            initial_kinetic: motion.kinetic_energy(),
            gain: T::ZERO,
            gain_carry: T::ZERO,
            time: time_s,
            time_carry: T::ZERO,
        };
        if state.is_finite() {
            Ok(state)
        } else {
            Err(Error::NonFinite)
        }
    }

    /// A particle on the axis (all offsets and slopes zero) at time 0.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::BeamState;
    /// let s = BeamState::on_axis(Motion::try_from_kinetic_energy(Species::<f32>::ALPHA, 5.0e6)?);
    /// assert_eq!((s.x(), s.time()), (0.0, 0.0));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn on_axis(motion: Motion<T>) -> Self {
        Self {
            motion,
            x: T::ZERO,
            x_slope: T::ZERO,
            y: T::ZERO,
            y_slope: T::ZERO,
            initial_kinetic: motion.kinetic_energy(),
            gain: T::ZERO,
            gain_carry: T::ZERO,
            time: T::ZERO,
            time_carry: T::ZERO,
        }
    }

    /// Horizontal offset `x` in m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, beamline::BeamState};
    /// let m = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e6)?;
    /// assert_eq!(BeamState::try_new(m, 0.5, 0.0, 0.0, 0.0, 0.0)?.x(), 0.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn x(&self) -> T {
        self.x
    }

    /// Horizontal slope `x' = dx/ds` in rad.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, beamline::BeamState};
    /// let m = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e6)?;
    /// assert_eq!(BeamState::try_new(m, 0.0, 1e-3, 0.0, 0.0, 0.0)?.x_slope(), 1e-3);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn x_slope(&self) -> T {
        self.x_slope
    }

    /// Vertical offset `y` in m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, beamline::BeamState};
    /// let m = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e6)?;
    /// assert_eq!(BeamState::try_new(m, 0.0, 0.0, -0.5, 0.0, 0.0)?.y(), -0.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn y(&self) -> T {
        self.y
    }

    /// Vertical slope `y' = dy/ds` in rad.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, beamline::BeamState};
    /// let m = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e6)?;
    /// assert_eq!(BeamState::try_new(m, 0.0, 0.0, 0.0, -2e-3, 0.0)?.y_slope(), -2e-3);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn y_slope(&self) -> T {
        self.y_slope
    }

    /// The state of motion (rebuilt after each gap from the kinetic energy).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, beamline::BeamState};
    /// let m = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e6)?;
    /// assert_eq!(BeamState::on_axis(m).motion(), m);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub const fn motion(&self) -> Motion<T> {
        self.motion
    }

    /// Kinetic energy in eV: the initial energy plus the compensated sum of the gains, rounded
    /// once.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species, beamline::BeamState};
    /// let m = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e6)?;
    /// assert_eq!(BeamState::on_axis(m).kinetic_energy(), 1.0e6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn kinetic_energy(&self) -> T {
        kinetic_after(self.initial_kinetic, self.gain, self.gain_carry)
    }

    /// The sum of the energy gains (eV) since the state was built, kept apart from the energy so
    /// that small gains are not lost in `f32`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::{BeamState, Element};
    /// let m = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e9)?;
    /// let s = Element::AcceleratingGap { voltage_v: 10.0 }.try_apply(&BeamState::on_axis(m))?;
    /// assert_eq!(s.energy_gain(), 10.0); // where 1e9 + 10 == 1e9 in f32
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn energy_gain(&self) -> T {
        self.gain + self.gain_carry
    }

    /// Time of arrival in s (a compensated sum of the element times, plus the start time).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::{BeamState, Element};
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e9)?;
    /// let s = Element::Drift { length_m: 10.0 }.try_apply(&BeamState::on_axis(p))?;
    /// // 3.8120493548822230 ns/m (mpmath, CODATA 2018)
    /// assert!((s.time() - 38.120_493_548_822_23e-9).abs() < 1e-22);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn time(&self) -> T {
        // The carry, the two-sum's error, is below half an ulp of the time: the time itself is
        // the rounded total, and the carry only serves the next addition.
        self.time
    }

    /// `√(1 + x'² + y'²)`: path length per unit length of axis.
    #[inline]
    fn path_per_axis_length(&self) -> T {
        (T::ONE + self.x_slope * self.x_slope + self.y_slope * self.y_slope).sqrt()
    }

    fn is_finite(&self) -> bool {
        self.x.is_finite()
            && self.x_slope.is_finite()
            && self.y.is_finite()
            && self.y_slope.is_finite()
            && self.gain.is_finite()
            && self.gain_carry.is_finite()
            && self.time.is_finite()
            && self.time_carry.is_finite()
    }

    fn add_time(&mut self, dt: T) {
        let (sum, carry) = two_sum(self.time, dt + self.time_carry);
        self.time = sum;
        self.time_carry = carry;
    }

    fn kick(&mut self, theta: T, direction: KickDirection<T>) {
        let (cx, cy) = direction.components();
        self.x_slope += theta * cx;
        self.y_slope += theta * cy;
    }

    /// Exact arc in a field `B ŷ` over the axis length `L`. With `α` the horizontal angle
    /// (`sin α = x'/√(1 + x'²)`) and `k` the signed curvature of the horizontal projection,
    /// `sin α₁ = sin α₀ + k L`, `Δx = L (sin α₀ + sin α₁)/(cos α₀ + cos α₁)`, the horizontal arc
    /// `(α₁ - α₀)/k`, and `y` advances with it at `dy/ds_h = y' cos α₀`.
    fn dipole(&mut self, field_t: T, length_m: T) -> Result<(), Error> {
        let brho = self.motion.try_magnetic_rigidity()?;
        let sign = T::ONE.copysign(self.motion.species().charge());
        let horizontal = (T::ONE + self.x_slope * self.x_slope).sqrt();
        let total = self.path_per_axis_length();
        // curvature of the full orbit is Q B / p; the horizontal projection turns faster by
        // total/horizontal (its radius is shorter by the cosine of the vertical pitch)
        let k = sign * field_t / brho * (total / horizontal);
        let (s0, c0) = (self.x_slope / horizontal, T::ONE / horizontal);
        let s1 = s0 + k * length_m;
        if !s1.is_finite() || s1.abs() >= T::ONE {
            return Err(Error::AngleOutOfRange);
        }
        let c1 = ((T::ONE - s1) * (T::ONE + s1)).sqrt();
        // arc angle α₁ - α₀ without cancellation: asin(s1 c0 - s0 c1)
        let turn = (s1 * c0 - s0 * c1).asin();
        let arc_h = if k == T::ZERO { length_m } else { turn / k };
        let y_rate = self.y_slope * c0; // dy per unit horizontal arc
        self.x += length_m * (s0 + s1) / (c0 + c1);
        self.y += arc_h * y_rate;
        self.x_slope = s1 / c1;
        self.y_slope = y_rate / c1;
        let path = arc_h * (T::ONE + y_rate * y_rate).sqrt();
        self.add_time(path * self.motion.flight_time_per_metre());
        Ok(())
    }

    /// Thin gap: `T += Q V` ([`optics::try_energy_gain`]), transverse momentum kept,
    /// longitudinal momentum from the new total.
    fn gap(&mut self, voltage_v: T) -> Result<(), Error> {
        let species = self.motion.species();
        let delta = optics::try_energy_gain(species, voltage_v)?;
        let (gain, carry) = two_sum(self.gain, delta + self.gain_carry);
        let kinetic = kinetic_after(self.initial_kinetic, gain, carry);
        if kinetic < T::ZERO {
            return Err(Error::BelowRestEnergy);
        }
        let after = Motion::try_from_kinetic_energy(species, kinetic)?;
        // p_⊥ is kept; p_s = p / √(1 + x'² + y'²) becomes √(p'² - p_⊥²), so the slopes scale by
        // p_s / p_s' = 1 / √((p'/p_s)² - x'² - y'²)
        // (a particle at rest has no transverse momentum: it leaves along the axis; one on the
        // axis has none to keep, and may be brought to rest)
        let p_before = self.motion.momentum();
        let slope_sq = self.x_slope * self.x_slope + self.y_slope * self.y_slope;
        let scale = if p_before == T::ZERO {
            T::ZERO
        } else if slope_sq == T::ZERO {
            T::ONE
        } else {
            let ratio = after.momentum() / p_before * self.path_per_axis_length();
            let denominator = ratio * ratio - slope_sq;
            if denominator.is_nan() || denominator <= T::ZERO {
                return Err(Error::AngleOutOfRange);
            }
            T::ONE / denominator.sqrt()
        };
        self.x_slope *= scale;
        self.y_slope *= scale;
        self.gain = gain;
        self.gain_carry = carry;
        self.motion = after;
        Ok(())
    }
}

/// `T₀ + (gain + carry)` with one rounding: `T₀ + gain` exactly as a two-sum, then the carries.
/// (Adding the carry to the gain first would lose it, since it lies below half an ulp of the gain;
/// braking 1 MeV to 590.4 eV in f32 then read 590.375.)
fn kinetic_after<T: Real>(initial: T, gain: T, carry: T) -> T {
    let (sum, error) = two_sum(initial, gain);
    sum + (error + carry)
}

/// A beam line of at most `N` elements, held without heap in a `heapless::Vec`.
///
/// # Examples
/// ```
/// use fourforce::beamline::{BeamLine, Element};
/// static LINE: BeamLine<f32, 4> = BeamLine::new();
/// assert!(LINE.is_empty());
/// let mut line = BeamLine::<f32, 1>::new();
/// line.try_push(Element::Drift { length_m: 1.0 })?;
/// assert_eq!(line.try_push(Element::Drift { length_m: 1.0 }), Err(fourforce::Error::CapacityFull));
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Debug, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct BeamLine<T: Real, const N: usize> {
    elements: heapless::Vec<Element<T>, N>,
}

impl<T: Real, const N: usize> BeamLine<T, N> {
    /// An empty line of capacity `N`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::BeamLine;
    /// const EMPTY: BeamLine<f64, 16> = BeamLine::new();
    /// assert_eq!(EMPTY.capacity(), 16);
    /// ```
    #[must_use]
    pub const fn new() -> Self {
        Self {
            elements: heapless::Vec::new(),
        }
    }

    /// Appends an element after checking it.
    ///
    /// # Errors
    /// As [`Element::try_check`]; [`Error::CapacityFull`] when the line already holds `N`
    /// elements (the element is `Copy`: the caller still has it). The line is unchanged on error.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, beamline::{BeamLine, Element}};
    /// let mut line = BeamLine::<f32, 4>::new();
    /// assert_eq!(line.try_push(Element::Drift { length_m: f32::NAN }), Err(Error::NonFinite));
    /// assert!(line.is_empty());
    /// ```
    pub fn try_push(&mut self, element: Element<T>) -> Result<(), Error> {
        let element = element.try_check()?;
        self.elements.push(element).map_err(|_| Error::CapacityFull)
    }

    /// A line holding `elements`, checked one by one.
    ///
    /// # Errors
    /// As [`try_push`](Self::try_push).
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::{BeamLine, Element};
    /// let line = BeamLine::<f64, 4>::try_from_elements(&[
    ///     Element::Drift { length_m: 0.5 },
    ///     Element::AcceleratingGap { voltage_v: 1.0e5 },
    /// ])?;
    /// assert_eq!(line.len(), 2);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_elements(elements: &[Element<T>]) -> Result<Self, Error> {
        let mut line = Self::new();
        for &element in elements {
            line.try_push(element)?;
        }
        Ok(line)
    }

    /// The elements, in order.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::{BeamLine, Element};
    /// let line = BeamLine::<f32, 2>::try_from_elements(&[Element::Drift { length_m: 3.0 }])?;
    /// assert_eq!(line.elements(), &[Element::Drift { length_m: 3.0 }]);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn elements(&self) -> &[Element<T>] {
        &self.elements
    }

    /// Number of elements.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::BeamLine;
    /// assert_eq!(BeamLine::<f32, 3>::new().len(), 0);
    /// ```
    #[must_use]
    #[inline]
    pub fn len(&self) -> usize {
        self.elements.len()
    }

    /// True when the line has no element.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::BeamLine;
    /// assert!(BeamLine::<f32, 3>::new().is_empty());
    /// ```
    #[must_use]
    #[inline]
    pub fn is_empty(&self) -> bool {
        self.elements.is_empty()
    }

    /// The capacity `N`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::BeamLine;
    /// assert_eq!(BeamLine::<f32, 3>::new().capacity(), 3);
    /// ```
    #[must_use]
    #[inline]
    pub const fn capacity(&self) -> usize {
        N
    }

    /// The state after the whole line.
    ///
    /// # Errors
    /// The first error of [`Element::try_apply`] along the line; use [`states`](Self::states) to
    /// learn at which element.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::{BeamLine, BeamState, Element};
    /// let line = BeamLine::<f32, 4>::try_from_elements(&[
    ///     Element::AcceleratingGap { voltage_v: 1.0e6 },
    ///     Element::AcceleratingGap { voltage_v: 1.0e6 },
    /// ])?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 1.0e6)?;
    /// assert_eq!(line.try_transport(BeamState::on_axis(p))?.kinetic_energy(), 3.0e6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_transport(&self, start: BeamState<T>) -> Result<BeamState<T>, Error> {
        self.elements
            .iter()
            .try_fold(start, |state, element| element.try_apply(&state))
    }

    /// An iterator over the states after each element: `Ok((index, state))`, then at most one
    /// `Err` at the first element that fails, after which it ends. For the state after element
    /// `i`, take `states(start).nth(i)`; to watch every element, loop over it.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// use fourforce::beamline::{BeamLine, BeamState, Element};
    /// let line = BeamLine::<f32, 4>::try_from_elements(&[
    ///     Element::AcceleratingGap { voltage_v: -0.5e3 },
    ///     Element::AcceleratingGap { voltage_v: -1.0e3 }, // more than is left
    ///     Element::Drift { length_m: 1.0 },
    /// ])?;
    /// let p = BeamState::on_axis(Motion::try_from_kinetic_energy(Species::PROTON, 1.0e3)?);
    /// let mut it = line.states(p);
    /// assert_eq!(it.next().map(|r| r.map(|(i, s)| (i, s.kinetic_energy()))), Some(Ok((0, 500.0))));
    /// assert_eq!(it.next().map(|r| r.map(|(i, _)| i)), Some(Err(Error::BelowRestEnergy)));
    /// assert!(it.next().is_none());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn states(&self, start: BeamState<T>) -> States<'_, T> {
        States {
            elements: &self.elements,
            index: 0,
            state: Some(start),
        }
    }
}

/// Iterator over the states after each element of a [`BeamLine`] (see [`BeamLine::states`]).
///
/// # Examples
/// ```
/// use fourforce::{Motion, Species};
/// use fourforce::beamline::{BeamLine, BeamState, Element};
/// let line = BeamLine::<f64, 2>::try_from_elements(&[Element::Drift { length_m: 2.0 }])?;
/// let p = BeamState::on_axis(Motion::try_from_kinetic_energy(Species::PROTON, 1.0e6)?);
/// assert_eq!(line.states(p).count(), 1);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Debug)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct States<'a, T: Real> {
    elements: &'a [Element<T>],
    index: usize,
    state: Option<BeamState<T>>,
}

impl<T: Real> Iterator for States<'_, T> {
    type Item = Result<(usize, BeamState<T>), Error>;

    fn next(&mut self) -> Option<Self::Item> {
        let state = self.state.take()?;
        let index = self.index;
        let element = self.elements.get(index)?;
        self.index = index + 1;
        match element.try_apply(&state) {
            Ok(next) => {
                self.state = Some(next);
                Some(Ok((index, next)))
            }
            Err(e) => Some(Err(e)),
        }
    }
}
