//! A fixed-capacity beam line and the transport of one particle through it, element by element.
//!
//! A [`BeamLine<T, N>`] holds up to `N` [`Element`]s in a `heapless::Vec` (no heap): drifts,
//! thin magnetic kicks (correctors), hard-edge dipoles, accelerating gaps, thin electrostatic
//! kicks, and the elements of linear optics (quadrupoles, sector dipoles, solenoids, monitors).
//! A [`BeamState`] is one particle on the line: its offsets `x`, `y` (m) and slopes
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
//! | [`Element::Quadrupole`], [`Element::ThinQuadrupole`], [`Element::ElectrostaticQuadrupole`], [`Element::Solenoid`] | the element's first-order map at the particle's own rigidity; time `+= L/(βc)` |
//! | [`Element::SectorDipole`] | the first-order map of the bent axis, the particle taken as the dipole's reference |
//! | [`Element::Monitor`] | nothing (a marker where a position is read) |
//!
//! # Optics
//! The line's first-order map ([`BeamLine::try_map`], [`BeamLine::try_map_of`] for elements
//! `i..j`), the envelopes along it ([`BeamLine::envelopes`]) and the aperture verdict
//! ([`BeamLine::check_aperture`]) come from [`transfer`](crate::transfer): each element's [`TransferMap`] at the
//! reference energy of its place, which the gaps before it have changed. About the line's axis
//! the thin kicks are the identity and the straight-axis [`Element::HardEdgeDipole`] a drift at
//! first order: their deflections are the zeroth-order orbit that steering sets.
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
use crate::real::fits;
use crate::transfer::{Envelope, Reference, TransferMap};
use crate::{Error, Motion, Real, optics, try_finite};

/// The direction of a thin kick in the transverse plane (a non-finite angle is refused by
/// [`Element::try_check`]).
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
/// Built directly from its fields, so any numbers fit in it: [`try_check`](Self::try_check)
/// refuses the impossible ones, and [`BeamLine::try_push`] and [`try_apply`](Self::try_apply)
/// call it, so an unchecked element never reaches a computation.
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
    /// Thick magnetic quadrupole: gradient `G = ∂B_y/∂x` over `length_m` (m, > 0); focuses a
    /// positive charge in `x` for `G > 0` ([`TransferMap::try_quadrupole`]).
    Quadrupole {
        /// Length in m.
        length_m: T,
        /// Gradient in T/m (signed).
        gradient_t_per_m: T,
    },
    /// Thin magnetic quadrupole of integrated gradient `∫G dl` (T)
    /// ([`TransferMap::try_thin_quadrupole`]).
    ThinQuadrupole {
        /// Integrated gradient in T (signed).
        integrated_gradient_t: T,
    },
    /// Electrostatic quadrupole: electrode voltage `voltage_v` (V) on an aperture of radius
    /// `aperture_radius_m` (m, > 0), over `length_m` (m, > 0)
    /// ([`TransferMap::try_electrostatic_quadrupole`]).
    ElectrostaticQuadrupole {
        /// Length in m.
        length_m: T,
        /// Electrode voltage in V (signed; the potential is `V (x² − y²)/a²`).
        voltage_v: T,
        /// Aperture radius in m.
        aperture_radius_m: T,
    },
    /// Sector dipole bending the line's axis by `angle_rad` over the arc `length_m` (m, > 0),
    /// with pole-face rotations at the entrance and exit (rad, `|e| < π/2`)
    /// ([`TransferMap::try_sector_dipole`]). Its field follows the reference: `B = Bρ θ/L`.
    SectorDipole {
        /// Arc length in m.
        length_m: T,
        /// Bending angle in rad (signed: `x` points away from the centre of curvature for `θ > 0`).
        angle_rad: T,
        /// Pole-face rotation at the entrance in rad.
        entry_angle_rad: T,
        /// Pole-face rotation at the exit in rad.
        exit_angle_rad: T,
    },
    /// Solenoid of axial field `field_t` (T) over `length_m` (m, > 0), hard edge; couples `x` and
    /// `y` ([`TransferMap::try_solenoid`]).
    Solenoid {
        /// Length in m.
        length_m: T,
        /// Axial field in T (signed, along `+s` for `B > 0`).
        field_t: T,
    },
    /// A beam-position monitor: a marker where the position is read; it does nothing to the beam.
    Monitor {
        /// The monitor's number, as the control system names it.
        id: u16,
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
            Self::Quadrupole {
                length_m,
                gradient_t_per_m,
            } => {
                positive(length_m)?;
                try_finite(gradient_t_per_m)?;
            }
            Self::ThinQuadrupole {
                integrated_gradient_t,
            } => {
                try_finite(integrated_gradient_t)?;
            }
            Self::ElectrostaticQuadrupole {
                length_m,
                voltage_v,
                aperture_radius_m,
            } => {
                positive(length_m)?;
                try_finite(voltage_v)?;
                positive(aperture_radius_m)?;
            }
            Self::SectorDipole {
                length_m,
                angle_rad,
                entry_angle_rad,
                exit_angle_rad,
            } => {
                positive(length_m)?;
                try_finite(angle_rad)?;
                for edge in [entry_angle_rad, exit_angle_rad] {
                    if try_finite(edge)?.abs() >= T::PI * T::HALF {
                        return Err(Error::AngleOutOfRange);
                    }
                }
            }
            Self::Solenoid { length_m, field_t } => {
                positive(length_m)?;
                try_finite(field_t)?;
            }
            Self::Monitor { .. } => {}
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
                    let theta = fits(sign * integrated_field_v / erho)?;
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
            Self::Monitor { .. } => {}
            Self::ThinQuadrupole { .. } => {
                let (map, _) = element.try_map(&state.motion)?;
                next.linear(&map);
            }
            Self::Quadrupole { length_m, .. }
            | Self::ElectrostaticQuadrupole { length_m, .. }
            | Self::Solenoid { length_m, .. } => {
                let (map, _) = element.try_map(&state.motion)?;
                next.linear(&map);
                next.add_time(state.motion.flight_time(length_m));
            }
            Self::SectorDipole { length_m, .. } => {
                // the particle is the dipole's reference: its arrival is L/v plus the path
                // difference of its offset and slope (the map's time row at δ = 0)
                let (map, _) = element.try_map(&state.motion)?;
                let out = map.apply([
                    state.x,
                    state.x_slope,
                    state.y,
                    state.y_slope,
                    T::ZERO,
                    T::ZERO,
                ]);
                next.linear(&map);
                let [.., dt, _] = out;
                next.add_time(state.motion.flight_time(length_m) + dt);
            }
        }
        if next.is_finite() {
            Ok(next)
        } else {
            Err(Error::Overflow)
        }
    }
}

impl<T: Real> Element<T> {
    /// The element's first-order [`TransferMap`] at the reference state `reference`, and the
    /// reference after it (changed only by a gap).
    ///
    /// Kicks and monitors are the identity and the straight-axis [`Element::HardEdgeDipole`] a
    /// drift: about the line's axis their deflection is of zeroth order (see [Optics](self#optics)).
    ///
    /// # Errors
    /// As [`try_check`](Self::try_check) and the [`TransferMap`] constructor of the element.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::Element;
    /// let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 10.0e6)?;
    /// let (map, after) = Element::AcceleratingGap { voltage_v: 1.0e6 }.try_map(&p)?;
    /// assert_eq!(after.kinetic_energy(), 11.0e6);
    /// assert!(map.to_array()[1][1] < 1.0); // adiabatic damping of x'
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline]
    pub fn try_map(&self, reference: &Motion<T>) -> Result<(TransferMap<T>, Motion<T>), Error> {
        let r = reference;
        // the constructors check their own parameters; only the thin kicks, whose map is the
        // identity, are checked here
        let map = match *self {
            Self::Drift { length_m } => TransferMap::try_drift(r, length_m)?,
            Self::HardEdgeDipole { length_m, .. } => {
                self.try_check()?;
                TransferMap::try_drift(r, length_m)?
            }
            Self::MagneticKick { .. } | Self::ElectrostaticKick { .. } => {
                self.try_check()?;
                TransferMap::IDENTITY
            }
            Self::Monitor { .. } => TransferMap::IDENTITY,
            Self::AcceleratingGap { voltage_v } => return TransferMap::try_gap(r, voltage_v),
            Self::Quadrupole {
                length_m,
                gradient_t_per_m,
            } => TransferMap::try_quadrupole(r, length_m, gradient_t_per_m)?,
            Self::ThinQuadrupole {
                integrated_gradient_t,
            } => TransferMap::try_thin_quadrupole(r, integrated_gradient_t)?,
            Self::ElectrostaticQuadrupole {
                length_m,
                voltage_v,
                aperture_radius_m,
            } => TransferMap::try_electrostatic_quadrupole(
                r,
                length_m,
                voltage_v,
                aperture_radius_m,
            )?,
            Self::SectorDipole {
                length_m,
                angle_rad,
                entry_angle_rad,
                exit_angle_rad,
            } => TransferMap::try_sector_dipole(
                r,
                length_m,
                angle_rad,
                entry_angle_rad,
                exit_angle_rad,
            )?,
            Self::Solenoid { length_m, field_t } => {
                TransferMap::try_solenoid(r, length_m, field_t)?
            }
        };
        Ok((map, *reference))
    }

    /// `map = (this element's map) · map` and the reference moved past the element, in place
    /// (the line's loop: no copy of a map per element on the chip).
    #[inline]
    fn try_compose(
        &self,
        map: &mut TransferMap<T>,
        reference: &mut Motion<T>,
        numbers: &mut Reference<T>,
    ) -> Result<(), Error> {
        let r = &*numbers;
        // the most common elements update the map in place, without a map of their own
        let m = match *self {
            Self::Drift { length_m } => {
                map.then_drift(TransferMap::drift_parts(r, length_m)?);
                return Ok(());
            }
            Self::Quadrupole {
                length_m,
                gradient_t_per_m,
            } => {
                map.then_blocks(TransferMap::quadrupole_blocks(
                    r,
                    length_m,
                    gradient_t_per_m,
                )?);
                return Ok(());
            }
            Self::ThinQuadrupole {
                integrated_gradient_t,
            } => {
                map.then_blocks(TransferMap::thin_quadrupole_blocks(
                    r,
                    integrated_gradient_t,
                )?);
                return Ok(());
            }
            Self::ElectrostaticQuadrupole {
                length_m,
                voltage_v,
                aperture_radius_m,
            } => {
                map.then_blocks(TransferMap::electrostatic_quadrupole_blocks(
                    r,
                    length_m,
                    voltage_v,
                    aperture_radius_m,
                )?);
                return Ok(());
            }
            Self::SectorDipole {
                length_m,
                angle_rad,
                entry_angle_rad,
                exit_angle_rad,
            } => {
                TransferMap::sector_dipole(r, length_m, angle_rad, entry_angle_rad, exit_angle_rad)?
            }
            Self::Solenoid { length_m, field_t } => TransferMap::solenoid(r, length_m, field_t)?,
            Self::Monitor { .. } => return Ok(()),
            Self::AcceleratingGap { voltage_v } => {
                let (slope, delta, after) = TransferMap::gap_parts(reference, voltage_v)?;
                map.then_gap(slope, delta);
                *reference = after;
                *numbers = Reference::new(&after);
                return Ok(());
            }
            Self::MagneticKick { .. } | Self::ElectrostaticKick { .. } => {
                self.try_check()?;
                return Ok(());
            }
            Self::HardEdgeDipole { length_m, .. } => {
                self.try_check()?;
                map.then_drift(TransferMap::drift_parts(r, length_m)?);
                return Ok(());
            }
        };
        map.then_in_place(&m);
        Ok(())
    }
}

/// A finite length > 0, else the reason.
fn positive<T: Real>(length_m: T) -> Result<T, Error> {
    if try_finite(length_m)? <= T::ZERO {
        Err(Error::NonPositiveLength)
    } else {
        Ok(length_m)
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

    /// Offsets and slopes through the transverse block of a map (`δ = 0`: the particle is the
    /// map's reference).
    fn linear(&mut self, map: &TransferMap<T>) {
        let [x, x_slope, y, y_slope, _, _] =
            map.apply([self.x, self.x_slope, self.y, self.y_slope, T::ZERO, T::ZERO]);
        self.x = x;
        self.x_slope = x_slope;
        self.y = y;
        self.y_slope = y_slope;
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

impl<T: Real, const N: usize> BeamLine<T, N> {
    /// The first-order map of the whole line for a reference that enters it as `reference`
    /// (the energy flowing through the gaps), and the reference at its end.
    ///
    /// # Errors
    /// The first error of [`Element::try_map`] along the line; [`Error::Overflow`] when an entry
    /// of the product does not fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::{BeamLine, Element};
    /// let line = BeamLine::<f32, 4>::try_from_elements(&[
    ///     Element::Drift { length_m: 1.0 },
    ///     Element::ThinQuadrupole { integrated_gradient_t: 0.2 },
    ///     Element::Drift { length_m: 1.0 },
    /// ])?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 5.0e6)?;
    /// let (map, _) = line.try_map(&p)?;
    /// assert!(map.to_array()[0][0] < 1.0); // focusing in x
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_map(&self, reference: &Motion<T>) -> Result<(TransferMap<T>, Motion<T>), Error> {
        self.try_map_of(reference, 0..self.len())
    }

    /// The first-order map of the elements `range` (`i..j`: element `i` up to, not including,
    /// element `j`) for a reference that enters the LINE (element 0) as `reference`, and the
    /// reference after element `j − 1`. An empty range gives the identity.
    ///
    /// # Errors
    /// [`Error::OutOfBounds`] when the range reaches past the line or ends before it starts;
    /// else as [`try_map`](Self::try_map) (the gaps before `i` included).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::{BeamLine, Element};
    /// let line = BeamLine::<f64, 4>::try_from_elements(&[
    ///     Element::AcceleratingGap { voltage_v: 3.0e6 },
    ///     Element::Drift { length_m: 2.0 },
    /// ])?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 1.0e6)?;
    /// let (map, after) = line.try_map_of(&p, 1..2)?;
    /// assert_eq!(after.kinetic_energy(), 4.0e6); // the drift's map is at 4 MeV
    /// assert_eq!(map.to_array()[0][1], 2.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_map_of(
        &self,
        reference: &Motion<T>,
        range: core::ops::Range<usize>,
    ) -> Result<(TransferMap<T>, Motion<T>), Error> {
        let (before, inside) = self.split(range)?;
        let mut r = *reference;
        for element in before {
            if let Element::AcceleratingGap { .. } = element {
                r = element.try_map(&r)?.1;
            }
        }
        let mut map = TransferMap::IDENTITY;
        let mut numbers = Reference::new(&r);
        for element in inside {
            element.try_compose(&mut map, &mut r, &mut numbers)?;
        }
        Ok((map.try_check()?, r))
    }

    /// The envelope after each element, for a beam entering the line as `start` with the
    /// reference `reference`: `Ok((index, envelope, reference after))`, then at most one `Err` at
    /// the first element whose map fails, after which it ends.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::{BeamLine, Element};
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let line = BeamLine::<f64, 4>::try_from_elements(&[
    ///     Element::Drift { length_m: 1.0 },
    ///     Element::Drift { length_m: 1.0 },
    /// ])?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 5.0e6)?;
    /// let waist = Twiss::try_new(1.0, 0.0)?;
    /// let start = Envelope::try_lattice(waist, waist, [0.0; 4])?;
    /// let betas: Vec<f64> = line
    ///     .envelopes(&p, start)
    ///     .map(|r| r.map(|(_, e, _)| e.try_twiss_x().map(|t| t.beta())))
    ///     .collect::<Result<Result<_, _>, _>>()??;
    /// assert_eq!(betas, [2.0, 5.0]); // beta0 + s^2/beta0
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn envelopes(&self, reference: &Motion<T>, start: Envelope<T>) -> Envelopes<'_, T> {
        Envelopes {
            elements: &self.elements,
            index: 0,
            state: Some((start, *reference)),
        }
    }

    /// Whether a beam entering the line as `start` (its emittances and momentum spread, see
    /// [`Envelope::try_new`]) with the reference `reference` fits the apertures, one per element:
    /// the sizes `√(β ε + (D σ_δ)²)` at the entrance and exit of each element against its
    /// half-width (x) and half-height (y). The verdict names the first element and plane where
    /// the beam does not fit. Run it again whenever the energy changes.
    ///
    /// A check of the `check` kind: it never fails, an impossible question is a verdict
    /// ([`ApertureVerdict::Impossible`]: an element's map fails, or the apertures are not one per
    /// element, [`Error::OutOfBounds`]).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::beamline::{Aperture, ApertureVerdict, BeamLine, Element, Plane};
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let line = BeamLine::<f32, 4>::try_from_elements(&[
    ///     Element::Drift { length_m: 2.0 },
    ///     Element::Drift { length_m: 2.0 },
    /// ])?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 5.0e6)?;
    /// let waist = Twiss::try_new(1.0, 0.0)?;
    /// // 1e-6 m rad: sizes 1 mm at the start, 2.2 mm after 2 m, 4.1 mm after 4 m
    /// let beam = Envelope::try_new(waist, waist, [0.0; 4], 1.0e-6, 1.0e-6, 0.0)?;
    /// let pipe = Aperture::try_new(3.0e-3, 5.0e-3)?;
    /// match line.check_aperture(&p, beam, &[pipe, pipe]) {
    ///     ApertureVerdict::Exceeds { element, plane, .. } => {
    ///         assert_eq!((element, plane), (1, Plane::Horizontal));
    ///     }
    ///     other => panic!("{other:?}"),
    /// }
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn check_aperture(
        &self,
        reference: &Motion<T>,
        start: Envelope<T>,
        apertures: &[Aperture<T>],
    ) -> ApertureVerdict<T> {
        if apertures.len() != self.len() {
            return ApertureVerdict::Impossible(Error::OutOfBounds);
        }
        let mut before = start;
        let mut worst = T::ZERO;
        for (index, (step, aperture)) in self.envelopes(reference, start).zip(apertures).enumerate()
        {
            let after = match step {
                Ok((_, envelope, _)) => envelope,
                Err(e) => return ApertureVerdict::Impossible(e),
            };
            for (plane, limit, sizes) in [
                (
                    Plane::Horizontal,
                    aperture.half_width_m,
                    [before.size_x(), after.size_x()],
                ),
                (
                    Plane::Vertical,
                    aperture.half_height_m,
                    [before.size_y(), after.size_y()],
                ),
            ] {
                let size = sizes[0].max(sizes[1]);
                // a NaN size (never expected) does not fit either
                if size.partial_cmp(&limit).is_none_or(|o| o.is_gt()) {
                    return ApertureVerdict::Exceeds {
                        element: index,
                        plane,
                        size_m: size,
                        aperture_m: limit,
                    };
                }
                worst = worst.max(size / limit);
            }
            before = after;
        }
        ApertureVerdict::Fits { worst_fill: worst }
    }

    /// The elements before `range` and those in it.
    #[allow(clippy::type_complexity)]
    fn split(
        &self,
        range: core::ops::Range<usize>,
    ) -> Result<(&[Element<T>], &[Element<T>]), Error> {
        let before = self.elements.get(..range.start).ok_or(Error::OutOfBounds)?;
        let inside = self.elements.get(range).ok_or(Error::OutOfBounds)?;
        Ok((before, inside))
    }
}

/// Iterator over the envelopes after each element of a [`BeamLine`] (see
/// [`BeamLine::envelopes`]).
///
/// # Examples
/// ```
/// use fourforce::{Motion, Species};
/// use fourforce::beamline::{BeamLine, Element};
/// use fourforce::transfer::{Envelope, Twiss};
/// let line = BeamLine::<f32, 2>::try_from_elements(&[Element::AcceleratingGap { voltage_v: 1.0e6 }])?;
/// let p = Motion::try_from_kinetic_energy(Species::PROTON, 1.0e6)?;
/// let t = Twiss::try_new(1.0, 0.0)?;
/// let beam = Envelope::try_new(t, t, [0.0; 4], 1.0e-6, 1.0e-6, 0.0)?;
/// let (_, after, reference) = line.envelopes(&p, beam).next().unwrap()?;
/// assert_eq!(reference.kinetic_energy(), 2.0e6);
/// // adiabatic damping: the emittance falls by p0/p1 (about 1/sqrt 2 here)
/// assert!((after.emittance_x() / 1.0e-6 - 0.7072).abs() < 1e-3);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Debug)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Envelopes<'a, T: Real> {
    elements: &'a [Element<T>],
    index: usize,
    state: Option<(Envelope<T>, Motion<T>)>,
}

impl<T: Real> Iterator for Envelopes<'_, T> {
    type Item = Result<(usize, Envelope<T>, Motion<T>), Error>;

    fn next(&mut self) -> Option<Self::Item> {
        let (envelope, reference) = self.state.take()?;
        let index = self.index;
        let element = self.elements.get(index)?;
        self.index = index + 1;
        let step = element
            .try_map(&reference)
            .and_then(|(map, after)| Ok((envelope.try_through(&map)?, after)));
        match step {
            Ok((next, after)) => {
                self.state = Some((next, after));
                Some(Ok((index, next, after)))
            }
            Err(e) => Some(Err(e)),
        }
    }
}

/// The transverse plane of an aperture verdict.
///
/// # Examples
/// ```
/// use fourforce::beamline::Plane;
/// assert_ne!(Plane::Horizontal, Plane::Vertical);
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Plane {
    /// `x`.
    Horizontal,
    /// `y`.
    Vertical,
}

/// The free aperture of an element: half-width in `x` and half-height in `y` (m, > 0).
///
/// # Examples
/// ```
/// use fourforce::beamline::Aperture;
/// let a = Aperture::try_new(0.02_f32, 0.01)?;
/// assert_eq!((a.half_width_m, a.half_height_m), (0.02, 0.01));
/// assert!(Aperture::try_new(0.0_f32, 0.01).is_err());
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Aperture<T: Real> {
    /// Half-width in `x`, m.
    pub half_width_m: T,
    /// Half-height in `y`, m.
    pub half_height_m: T,
}

impl<T: Real> Aperture<T> {
    /// An aperture from its half-width and half-height (m, > 0; `T::INFINITY` for none).
    ///
    /// # Errors
    /// [`Error::NonPositiveLength`] for a half-size that is not positive, or NaN.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::Aperture;
    /// assert!(Aperture::try_new(f64::INFINITY, 0.01).is_ok()); // no limit in x
    /// ```
    pub fn try_new(half_width_m: T, half_height_m: T) -> Result<Self, Error> {
        for h in [half_width_m, half_height_m] {
            if h.partial_cmp(&T::ZERO).is_none_or(|o| o.is_le()) {
                return Err(Error::NonPositiveLength);
            }
        }
        Ok(Self {
            half_width_m,
            half_height_m,
        })
    }
}

/// The outcome of [`BeamLine::check_aperture`].
///
/// # Examples
/// ```
/// use fourforce::beamline::ApertureVerdict;
/// let v = ApertureVerdict::Fits { worst_fill: 0.8_f32 };
/// assert!(v.fits());
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum ApertureVerdict<T: Real> {
    /// The beam fits everywhere; `worst_fill` is the largest size/aperture ratio (≤ 1).
    Fits {
        /// Largest ratio of beam size to aperture along the line.
        worst_fill: T,
    },
    /// The beam does not fit at `element` (0-based), in `plane`.
    Exceeds {
        /// Index of the first element where the beam does not fit.
        element: usize,
        /// The plane where it does not fit.
        plane: Plane,
        /// The beam size there (m), the larger of entrance and exit.
        size_m: T,
        /// The aperture there (m).
        aperture_m: T,
    },
    /// The question has no answer; the error says why.
    Impossible(Error),
}

impl<T: Real> ApertureVerdict<T> {
    /// True for [`ApertureVerdict::Fits`].
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, beamline::ApertureVerdict};
    /// assert!(!ApertureVerdict::<f32>::Impossible(Error::OutOfBounds).fits());
    /// ```
    #[must_use]
    pub fn fits(&self) -> bool {
        matches!(self, Self::Fits { .. })
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
