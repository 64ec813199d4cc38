//! Steering a whole line: many correctors, many monitors, limits, failed monitors, magnet
//! currents, and settings that follow the energy.
//!
//! # Model
//! Corrector `j` is a thin kick whose angle is proportional to its setting `s_j` (the integrated
//! field `∫B dl` in T m of a magnetic corrector, or `∫E dl` in V of an electrostatic one):
//! `θ_j = κ_j s_j` with `κ_j = ±1/Bρ` or `±1/Eρ` (the sign of the charge) at the corrector.
//! Monitor `i` reads the offsets `(x_i, y_i)` (m). To first order the readings change by
//! `Δb = R Δθ`, the [`Response`] `R` (2M × C, m/rad): the entries `R₁₂, R₁₄, R₃₂, R₃₄` of the
//! transfer map from the corrector to the monitor (zero for a monitor upstream), with the kick
//! along its direction; the x–y blocks are coupled only when the line couples them (a solenoid
//! or a rotated kick).
//!
//! # Correction
//! With monitor weights `w_i` (1/m: typically one over the monitor's resolution, 0 ignores it),
//! `D = diag(w)` and readings `b` (the offsets from the wanted orbit), the full correction solves
//!
//! ```text
//! min over Δθ of  ‖D (b + R Δθ)‖² + (α σ_max)² ‖Δθ‖²
//! Δθ* = −V diag(1/(σ_k² + (α σ_max)²)) Wᵀ D b     (A = D R = W Vᵀ, W = U Σ)
//! ```
//!
//! `α ≥ 0` is the Tikhonov parameter relative to the largest singular value `σ_max` of `D R`; at
//! `α = 0` this is the minimum-norm least-squares solution. Singular values below
//! `cutoff · σ_max` are dropped in both cases. The decomposition is the one-sided Jacobi SVD of
//! the crate's private `svd` module; it is computed only when the set of monitors in use, the
//! response (the energy) or the set of correctors held at a limit changes, and its result is kept
//! as a gain matrix `G` (kick angle per metre of reading). Every other iteration costs one
//! matrix–vector product: `Δs = g G b / κ` with the loop gain `0 < g < 2`. With an exact model the
//! offsets in the range of `R` shrink by `(1 − g)` per iteration (with `α = 0`).
//!
//! When the line does not couple the planes (every corrector moves only x or only y readings), the
//! two planes are decomposed separately, which costs a quarter of one coupled decomposition.
//!
//! # Promised accuracy
//! The step is within `16 ε (κ + κ² tan θ)` of the exact regularised least-squares step, relative
//! to its largest entry, in `f32` and in `f64` (κ the condition number of the weighted response in
//! kick angles, `tan θ = ‖residual‖/(σ_max ‖step‖)`: the sensitivity of least squares itself;
//! tested against nalgebra and against the `f64` step). A [`Calibration`] returns the drive of a
//! setting within `4 ε` of its segment's largest drive.
//!
//! # Limits (an active-set step)
//! Each corrector has a setting range `[min, max]` (saturation) and a largest change per
//! iteration (rate). A corrector whose step would cross a limit is held at that limit, and the
//! other correctors are solved again for the rest (the readings the held ones leave); this repeats
//! until no free corrector crosses a limit (at most C times). End stops come first: while a
//! corrector saturates, the others' steps belong to a solution that moves it out of range, so
//! none of them is held at its rate in that pass. The [`Outcome`] says which limits acted.
//!
//! # Failed monitors
//! A reading that is not finite, lies outside the monitor's range, or is stuck removes the
//! monitor from the next solve and the decomposition is computed again. Stuck: exactly the same
//! value in `N` consecutive iterations although the steps of the correctors between them should
//! have changed it by more than the monitor's resolution `δ_i`, `|Σ_j R_ij Σ_k Δs_j(k)| > δ_i`
//! over those `N − 1` steps (a run-length count per reading, a compare and an add per iteration,
//! plus the steps kept in a ring; the sum only for a repeated reading, which is rare). A settled
//! loop whose correctors creep along a mode that hardly changes any reading keeps its monitors.
//! [`Outcome::monitor_in_use`] reports the set. A dropped monitor stays out until
//! [`Orbit::restore_monitor`]. When the monitors left cannot determine the correctors (fewer
//! independent readings than correctors in a plane: singular values at the rounding level
//! `16 ε √rows σ_max`), the step is [`State::Hold`]: no corrector moves, never a wild correction. (The cutoff only truncates the solution; it never makes a plane hold.)
//!
//! # Energy
//! A new beam energy changes every `κ_j` and, through the focusing, `R`. [`Orbit::try_set_response`]
//! loads the response of the new energy and rescales every set point by `κ_old/κ_new`, so the
//! kicks, and with them the orbit, stay as they were; a rescaled set point outside its range is
//! held at the limit and reported.
//!
//! # Caution
//! This computes set points. Interlocks, machine protection and the supervision of power
//! supplies are separate, certified systems; they must not rely on this code.
//!
//! # Examples
//! ```
//! use fourforce::orbit::{Corrector, Monitor, Orbit, Response, State, Tuning};
//! // Two monitors, two correctors (one per plane), planes uncoupled: monitor 1 sees corrector h
//! // with 2 m/rad in x, corrector v with 3 m/rad in y; monitor 0 is upstream of both.
//! let mut per_kick = [[[0.0_f64; 2]; 2]; 2]; // [corrector][plane][monitor]
//! per_kick[0][0][1] = 2.0;
//! per_kick[1][1][1] = 3.0;
//! let response = Response::try_new(per_kick, [0.5, 0.5])?; // rad per T m (Bρ = 2 T m)
//! let monitor = Monitor::try_new(0.01, 1.0e-6, 1.0)?; // 10 mm range, 1 µm resolution
//! let corrector = Corrector::try_new(-0.01, 0.01, 0.01)?;
//! let tuning = Tuning::try_new(1.0, 0.0, 1.0e-6)?;
//! let mut orbit = Orbit::<f64, 2, 2>::try_new(response, [monitor; 2], [corrector; 2], tuning)?;
//! let mut settings = [0.0; 2];
//! let outcome = orbit.try_step(&[[0.0, 0.0], [1.0e-3, -2.0e-3]], &mut settings)?;
//! assert_eq!(outcome.state(), State::Correcting);
//! // x: 1 mm / (2 m/rad × 0.5 rad/(T m)) = 1 mT m the other way; y: 2 mm / 1.5 m/(T m).
//! assert!((settings[0] + 1.0e-3).abs() < 1e-15 && (settings[1] - 2.0e-3 / 1.5).abs() < 1e-15);
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::beamline::{BeamLine, Element, KickDirection};
use crate::svd;
use crate::transfer::TransferMap;
use crate::{Error, Motion, Real, optics, try_finite};

/// A place along the line where the response is read or made: a monitor or a corrector.
///
/// # Examples
/// ```
/// use fourforce::beamline::KickDirection;
/// use fourforce::orbit::{Kick, Place};
/// use fourforce::{Motion, Species};
/// let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 10.0e6)?;
/// let h = Place::Corrector { index: 0, kick: Kick::Magnetic, direction: KickDirection::Horizontal, motion: p };
/// assert_ne!(h, Place::Monitor(0));
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Place<T: Real> {
    /// Monitor `i` reads `(x, y)` here.
    Monitor(usize),
    /// Corrector `index` kicks here, along `direction`, on the reference beam `motion` there.
    Corrector {
        /// The corrector's index in the loop.
        index: usize,
        /// Magnetic (`θ = ±∫B dl/Bρ`) or electrostatic (`θ = ±∫E dl/Eρ`).
        kick: Kick,
        /// The direction of the kick.
        direction: KickDirection<T>,
        /// The reference state of motion at the corrector.
        motion: Motion<T>,
    },
}

/// How a corrector kicks.
///
/// # Examples
/// ```
/// use fourforce::orbit::Kick;
/// assert_ne!(Kick::Magnetic, Kick::Electrostatic);
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Kick {
    /// Setting in T m: `θ = ±∫B dl / Bρ`.
    Magnetic,
    /// Setting in V (`∫E dl`): `θ = ±∫E dl / Eρ`.
    Electrostatic,
}

/// The response of the monitor readings to the corrector settings at one energy.
///
/// `per_kick[j][p][i]` (m/rad) is the change of monitor `i`'s reading in plane `p` (0 = x,
/// 1 = y) per radian of corrector `j`'s kick; `kick_per_setting[j]` (rad per T m, or per V) is
/// `κ_j = ±1/Bρ` (magnetic) or `±1/Eρ` (electrostatic) at the corrector, the sign that of the
/// charge.
///
/// # Examples
/// ```
/// use fourforce::orbit::Response;
/// let r = Response::<f32, 1, 1>::try_new([[[2.0], [0.0]]], [0.25])?;
/// assert_eq!(r.reading_per_setting(0, 0, 0), Some(0.5)); // m per T m
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Response<T: Real, const M: usize, const C: usize> {
    per_kick: [[[T; M]; 2]; C],
    kick_per_setting: [T; C],
}

impl<T: Real, const M: usize, const C: usize> Response<T, M, C> {
    /// A response from its entries: `per_kick_m_per_rad[j][p][i]` (m/rad) and
    /// `kick_per_setting[j]` (rad per unit of setting: `±1/Bρ` in 1/(T m) or `±1/Eρ` in 1/V).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite entry; [`Error::ZeroField`] for a zero
    /// `kick_per_setting` (a corrector that cannot kick: a neutral beam).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::Response};
    /// assert_eq!(Response::<f64, 1, 1>::try_new([[[1.0], [0.0]]], [0.0]), Err(Error::ZeroField));
    /// ```
    pub fn try_new(
        per_kick_m_per_rad: [[[T; M]; 2]; C],
        kick_per_setting: [T; C],
    ) -> Result<Self, Error> {
        for column in &per_kick_m_per_rad {
            for x in column.as_flattened() {
                try_finite(*x)?;
            }
        }
        for k in &kick_per_setting {
            if try_finite(*k)? == T::ZERO {
                return Err(Error::ZeroField);
            }
        }
        Ok(Self {
            per_kick: per_kick_m_per_rad,
            kick_per_setting,
        })
    }

    /// The response of a line given as its places in beam order, each with the transfer map from
    /// the place before it (or from the start) to it: a corrector's kick `(0, cos φ, 0, sin φ, 0,
    /// 0)` per radian is carried through every map downstream, and each monitor reads its `x`
    /// and `y` (`R₁₂, R₁₄, R₃₂, R₃₄` of the map between them); monitors upstream read 0.
    /// `κ_j = ±1/Bρ` or `±1/Eρ` comes from the corrector's `motion`. One pass over the places
    /// (any iterator, so firmware can compute the maps as it goes), `C` rays in memory.
    ///
    /// # Errors
    /// [`Error::OutOfBounds`] for an index `≥ M` (`≥ C`) or a monitor or corrector that does not
    /// appear exactly once; [`Error::ZeroCharge`] for a neutral beam; [`Error::Overflow`] for
    /// a rigidity or a response that does not fit the precision; [`Error::NonFinite`] for a
    /// non-finite kick direction or a rotated kick beyond `|φ| = 8192` rad ([`Real::sin_cos`]).
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::KickDirection;
    /// use fourforce::orbit::{Kick, Place, Response};
    /// use fourforce::transfer::TransferMap;
    /// use fourforce::{Motion, Species};
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 10.0e6)?;
    /// let places = [
    ///     (TransferMap::IDENTITY, Place::Corrector { index: 0, kick: Kick::Magnetic, direction: KickDirection::Vertical, motion: p }),
    ///     (TransferMap::try_drift(&p, 2.0)?, Place::Monitor(0)),
    /// ];
    /// let r = Response::<f64, 1, 1>::try_from_places(places)?;
    /// // 2 m of drift: y moves 2 m per rad, θ = ∫B dl/Bρ with Bρ = 0.458 16 T m
    /// assert!((r.reading_per_setting(0, 1, 0).unwrap() - 2.0 / p.try_magnetic_rigidity()?).abs() < 1e-14);
    /// assert_eq!(r.reading_per_setting(0, 0, 0), Some(0.0));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_places<I>(places: I) -> Result<Self, Error>
    where
        I: IntoIterator<Item = (TransferMap<T>, Place<T>)>,
    {
        let mut response = Self::ZERO;
        response.try_fill(places)?;
        Ok(response)
    }

    /// The response of a beam line at the reference `start` (its state of motion entering the
    /// line; the energy flows through the gaps): the line's monitors ([`Element::Monitor`]) are
    /// monitors `0..M` and its kicks ([`Element::MagneticKick`], [`Element::ElectrostaticKick`])
    /// correctors `0..C`, both in beam order; each element's map from [`Element::try_map`].
    ///
    /// # Errors
    /// [`Error::OutOfBounds`] unless the line has exactly `M` monitors and `C` kicks; else as
    /// [`Element::try_map`] and [`try_from_places`](Self::try_from_places).
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::{BeamLine, Element, KickDirection};
    /// use fourforce::orbit::Response;
    /// use fourforce::{Motion, Species};
    /// let line = BeamLine::<f64, 8>::try_from_elements(&[
    ///     Element::MagneticKick { integrated_field_tm: 0.0, direction: KickDirection::Horizontal },
    ///     Element::Drift { length_m: 1.0 },
    ///     Element::ThinQuadrupole { integrated_gradient_t: 0.5 },
    ///     Element::Drift { length_m: 1.0 },
    ///     Element::Monitor { id: 7 },
    /// ])?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6)?;
    /// let r = Response::<f64, 1, 1>::try_from_line(&line, &p)?;
    /// // R12 of drift–lens–drift: 2 L − L²/f, 1/f = ∫G dl/Bρ
    /// let brho = p.try_magnetic_rigidity()?;
    /// let want = (2.0 - 0.5 / brho) / brho;
    /// assert!((r.reading_per_setting(0, 0, 0).unwrap() - want).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_line<const L: usize>(
        line: &BeamLine<T, L>,
        start: &Motion<T>,
    ) -> Result<Self, Error> {
        let mut response = Self::ZERO;
        response.try_fill_from_line(line, start)?;
        Ok(response)
    }

    /// [`try_from_line`](Self::try_from_line) in place.
    fn try_fill_from_line<const L: usize>(
        &mut self,
        line: &BeamLine<T, L>,
        start: &Motion<T>,
    ) -> Result<(), Error> {
        let mut error = None;
        let places = LinePlaces {
            elements: line.elements().iter(),
            reference: *start,
            monitors: 0,
            correctors: 0,
            error: &mut error,
        };
        let filled = self.try_fill(places);
        match error {
            Some(e) => Err(e),
            None => filled,
        }
    }

    /// Every entry zero (no corrector moves any reading; every `κ` zero): the state of an
    /// [`Orbit::new`] before a response is loaded.
    const ZERO: Self = Self {
        per_kick: [[[T::ZERO; M]; 2]; C],
        kick_per_setting: [T::ZERO; C],
    };

    /// [`try_from_places`](Self::try_from_places) in place (no copy of the response on the
    /// stack); on an error the entries are partly written.
    fn try_fill<I>(&mut self, places: I) -> Result<(), Error>
    where
        I: IntoIterator<Item = (TransferMap<T>, Place<T>)>,
    {
        *self = Self::ZERO;
        let Self {
            per_kick,
            kick_per_setting,
        } = self;
        // One pass: the rays of the correctors met so far, carried through each map.
        let mut rays = [[T::ZERO; 6]; C];
        let mut seen_monitors = 0_u32;
        let mut seen_correctors = 0_u32;
        for (map, place) in places {
            for (j, ray) in rays.iter_mut().enumerate() {
                if bit(seen_correctors, j) {
                    *ray = map.apply(*ray);
                }
            }
            match place {
                Place::Monitor(i) => {
                    if i >= M.min(32) || bit(seen_monitors, i) {
                        return Err(Error::OutOfBounds);
                    }
                    seen_monitors |= 1 << i;
                    for (j, (column, ray)) in per_kick.iter_mut().zip(&rays).enumerate() {
                        if !bit(seen_correctors, j) {
                            continue;
                        }
                        for (plane, value) in column.iter_mut().zip([ray[0], ray[2]]) {
                            if let Some(r) = plane.get_mut(i) {
                                *r = try_finite(value).map_err(|_| Error::Overflow)?;
                            }
                        }
                    }
                }
                Place::Corrector {
                    index,
                    kick,
                    direction,
                    motion,
                } => {
                    if index >= C.min(32) || bit(seen_correctors, index) {
                        return Err(Error::OutOfBounds);
                    }
                    seen_correctors |= 1 << index;
                    let kappa = match kick {
                        Kick::Magnetic => optics::try_kick_angle(&motion, T::ONE)?,
                        Kick::Electrostatic => {
                            let sign = T::ONE.copysign(motion.species().charge());
                            try_finite(sign / motion.try_electric_rigidity()?)
                                .map_err(|_| Error::Overflow)?
                        }
                    };
                    let (Some(k), Some(ray)) =
                        (kick_per_setting.get_mut(index), rays.get_mut(index))
                    else {
                        return Err(Error::OutOfBounds);
                    };
                    *k = kappa;
                    // (in the working precision only: no software double on a chip)
                    let (cx, cy) = match direction {
                        KickDirection::Horizontal => (T::ONE, T::ZERO),
                        KickDirection::Vertical => (T::ZERO, T::ONE),
                        KickDirection::Angle(phi) => {
                            let (sin, cos) = phi.sin_cos();
                            (cos, sin)
                        }
                    };
                    *ray = [
                        T::ZERO,
                        try_finite(cx)?,
                        T::ZERO,
                        try_finite(cy)?,
                        T::ZERO,
                        T::ZERO,
                    ];
                }
            }
        }
        let all = |n: usize| if n >= 32 { u32::MAX } else { (1_u32 << n) - 1 };
        if seen_monitors != all(M) || seen_correctors != all(C) {
            return Err(Error::OutOfBounds);
        }
        Ok(())
    }

    /// The change of monitor `monitor`'s reading in plane `plane` (0 = x, 1 = y) per unit of
    /// corrector `corrector`'s setting, `R κ` in m per T m (or per V); `None` past the ends.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Response;
    /// let r = Response::<f64, 1, 1>::try_new([[[2.0], [0.0]]], [-0.5])?;
    /// assert_eq!(r.reading_per_setting(0, 0, 0), Some(-1.0));
    /// assert_eq!(r.reading_per_setting(0, 2, 0), None);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn reading_per_setting(&self, monitor: usize, plane: usize, corrector: usize) -> Option<T> {
        let r = self.per_kick.get(corrector)?.get(plane)?.get(monitor)?;
        Some(*r * *self.kick_per_setting.get(corrector)?)
    }

    /// `κ_j`, the kick per unit of setting of corrector `j` (rad per T m or per V).
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Response;
    /// let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [0.25])?;
    /// assert_eq!(r.kick_per_setting(), &[0.25]);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn kick_per_setting(&self) -> &[T; C] {
        &self.kick_per_setting
    }

    /// The predicted change of the readings `[[Δx, Δy]; M]` (m) for the setting changes
    /// `changes` (T m or V): `R κ Δs`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Response;
    /// let r = Response::<f64, 1, 1>::try_new([[[2.0], [1.0]]], [0.5])?;
    /// assert_eq!(r.predict(&[1.0e-3]), [[1.0e-3, 0.5e-3]]);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn predict(&self, changes: &[T; C]) -> [[T; 2]; M] {
        let mut out = [[T::ZERO; 2]; M];
        for ((column, k), ds) in self
            .per_kick
            .iter()
            .zip(&self.kick_per_setting)
            .zip(changes)
        {
            let kick = *k * *ds;
            for (p, plane) in column.iter().enumerate() {
                for (reading, r) in out.iter_mut().zip(plane) {
                    if let Some(x) = reading.get_mut(p) {
                        *x += *r * kick;
                    }
                }
            }
        }
        out
    }

    fn column_plane(&self, j: usize) -> Plane {
        let Some(column) = self.per_kick.get(j) else {
            return Plane::Both;
        };
        let moves = |p: usize| {
            column
                .get(p)
                .is_some_and(|c| c.iter().any(|r| *r != T::ZERO))
        };
        match (moves(0), moves(1)) {
            (true, true) => Plane::Both,
            (false, true) => Plane::Y,
            _ => Plane::X,
        }
    }
}

/// A beam line's monitors and kicks as places, each with the map from the place before; the
/// first error of an element's map ends the sequence and is kept.
struct LinePlaces<'a, T: Real> {
    elements: core::slice::Iter<'a, Element<T>>,
    reference: Motion<T>,
    monitors: usize,
    correctors: usize,
    error: &'a mut Option<Error>,
}

impl<T: Real> Iterator for LinePlaces<'_, T> {
    type Item = (TransferMap<T>, Place<T>);

    fn next(&mut self) -> Option<Self::Item> {
        let mut map = TransferMap::IDENTITY;
        for element in self.elements.by_ref() {
            let place = match *element {
                Element::Monitor { .. } => {
                    self.monitors += 1;
                    Some(Place::Monitor(self.monitors - 1))
                }
                Element::MagneticKick { direction, .. } => {
                    self.correctors += 1;
                    Some(Place::Corrector {
                        index: self.correctors - 1,
                        kick: Kick::Magnetic,
                        direction,
                        motion: self.reference,
                    })
                }
                Element::ElectrostaticKick { direction, .. } => {
                    self.correctors += 1;
                    Some(Place::Corrector {
                        index: self.correctors - 1,
                        kick: Kick::Electrostatic,
                        direction,
                        motion: self.reference,
                    })
                }
                _ => None,
            };
            if let Some(place) = place {
                return Some((map, place));
            }
            match element.try_map(&self.reference) {
                Ok((m, after)) => {
                    map = map.then(&m);
                    self.reference = after;
                }
                Err(e) => {
                    *self.error = Some(e);
                    return None;
                }
            }
        }
        None
    }
}

/// Which readings a corrector moves.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
enum Plane {
    X,
    Y,
    Both,
}

/// One position monitor: the range of a trustworthy reading, its resolution and its weight in the
/// correction.
///
/// # Examples
/// ```
/// use fourforce::orbit::Monitor;
/// let m = Monitor::try_new(5.0e-3_f32, 1.0e-6, 1.0)?;
/// assert_eq!((m.range(), m.resolution(), m.weight()), (5.0e-3, 1.0e-6, 1.0));
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Monitor<T: Real> {
    range_m: T,
    resolution_m: T,
    weight: T,
}

impl<T: Real> Monitor<T> {
    /// A monitor whose readings `|x|, |y| ≤ range_m` (m) are trusted, that reports a change of a
    /// reading of `resolution_m` (m) or more (the smallest change it resolves: a reading that
    /// stays the same while the correctors should have moved it by more is stuck), weighted by
    /// `weight` (1/m or dimensionless, the same for all monitors of a loop; 0 leaves the monitor
    /// out of the correction).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NonPositiveLength`] for a range or a resolution that is not
    /// positive; [`Error::NegativeMagnitude`] for a negative weight.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::Monitor};
    /// assert_eq!(Monitor::try_new(0.0_f64, 1.0e-6, 1.0), Err(Error::NonPositiveLength));
    /// assert_eq!(Monitor::try_new(1.0e-2_f64, 0.0, 1.0), Err(Error::NonPositiveLength));
    /// ```
    pub fn try_new(range_m: T, resolution_m: T, weight: T) -> Result<Self, Error> {
        if try_finite(range_m)? <= T::ZERO || try_finite(resolution_m)? <= T::ZERO {
            return Err(Error::NonPositiveLength);
        }
        if try_finite(weight)? < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        Ok(Self {
            range_m,
            resolution_m,
            weight,
        })
    }

    /// The largest trusted `|reading|` in m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Monitor;
    /// assert_eq!(Monitor::try_new(2.0e-3_f64, 1.0e-6, 1.0)?.range(), 2.0e-3);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn range(&self) -> T {
        self.range_m
    }

    /// The smallest change of a reading the monitor reports, in m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Monitor;
    /// assert_eq!(Monitor::try_new(2.0e-3_f64, 1.0e-6, 1.0)?.resolution(), 1.0e-6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn resolution(&self) -> T {
        self.resolution_m
    }

    /// The weight of the monitor's readings.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Monitor;
    /// assert_eq!(Monitor::try_new(2.0e-3_f64, 1.0e-6, 0.5)?.weight(), 0.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn weight(&self) -> T {
        self.weight
    }
}

/// One corrector's limits, in the units of its setting (T m for a magnetic corrector, V for an
/// electrostatic one).
///
/// # Examples
/// ```
/// use fourforce::orbit::Corrector;
/// let c = Corrector::try_new(-4.0e-3_f32, 4.0e-3, 0.1e-3)?;
/// assert_eq!((c.min(), c.max(), c.max_step()), (-4.0e-3, 4.0e-3, 0.1e-3));
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Corrector<T: Real> {
    min: T,
    max: T,
    max_step: T,
}

impl<T: Real> Corrector<T> {
    /// A corrector set within `[min, max]` that moves by at most `max_step` per iteration.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::InvalidRange`] for `min > max`;
    /// [`Error::NegativeMagnitude`] for a negative `max_step` (0 freezes the corrector).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::Corrector};
    /// assert_eq!(Corrector::try_new(1.0_f64, -1.0, 0.1), Err(Error::InvalidRange));
    /// ```
    pub fn try_new(min: T, max: T, max_step: T) -> Result<Self, Error> {
        let (min, max, max_step) = (try_finite(min)?, try_finite(max)?, try_finite(max_step)?);
        if min > max {
            return Err(Error::InvalidRange);
        }
        if max_step < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        Ok(Self { min, max, max_step })
    }

    /// Lowest setting.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Corrector;
    /// assert_eq!(Corrector::try_new(-1.0_f32, 2.0, 0.1)?.min(), -1.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn min(&self) -> T {
        self.min
    }

    /// Highest setting.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Corrector;
    /// assert_eq!(Corrector::try_new(-1.0_f32, 2.0, 0.1)?.max(), 2.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn max(&self) -> T {
        self.max
    }

    /// Largest change per iteration.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Corrector;
    /// assert_eq!(Corrector::try_new(-1.0_f32, 2.0, 0.1)?.max_step(), 0.1);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn max_step(&self) -> T {
        self.max_step
    }
}

/// The loop's tuning: gain, Tikhonov parameter and singular-value cutoff.
///
/// # Examples
/// ```
/// use fourforce::orbit::Tuning;
/// let t = Tuning::try_new(0.5_f32, 0.01, 1.0e-3)?;
/// assert_eq!((t.gain(), t.regularisation(), t.cutoff()), (0.5, 0.01, 1.0e-3));
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Tuning<T: Real> {
    gain: T,
    regularisation: T,
    cutoff: T,
    // g/(1 + α²), the factor of the one-corrector step, once at construction.
    single_gain: T,
}

impl<T: Real> Tuning<T> {
    /// Gain `g` (`0 < g < 2`), Tikhonov parameter `α ≥ 0` relative to the largest singular value,
    /// and the relative cutoff below which singular values are dropped (`0 ≤ cutoff < 1`; below
    /// about `10 ε √rows` it drops only exact zeros).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::GainOutOfRange`]; [`Error::NegativeMagnitude`] for a negative
    /// `α`; [`Error::InvalidRange`] for a cutoff outside `[0, 1)`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::Tuning};
    /// assert_eq!(Tuning::try_new(2.0_f64, 0.0, 1e-6), Err(Error::GainOutOfRange));
    /// assert_eq!(Tuning::try_new(1.0_f64, 0.0, 1.0), Err(Error::InvalidRange));
    /// ```
    pub fn try_new(gain: T, regularisation: T, cutoff: T) -> Result<Self, Error> {
        let (gain, regularisation, cutoff) = (
            try_finite(gain)?,
            try_finite(regularisation)?,
            try_finite(cutoff)?,
        );
        if gain <= T::ZERO || gain >= T::TWO {
            return Err(Error::GainOutOfRange);
        }
        if regularisation < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        if !(T::ZERO..T::ONE).contains(&cutoff) {
            return Err(Error::InvalidRange);
        }
        Ok(Self {
            gain,
            regularisation,
            cutoff,
            single_gain: gain / (T::ONE + regularisation * regularisation),
        })
    }

    /// The loop gain `g`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Tuning;
    /// assert_eq!(Tuning::try_new(0.7_f64, 0.0, 0.0)?.gain(), 0.7);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn gain(&self) -> T {
        self.gain
    }

    /// The Tikhonov parameter `α` (relative to `σ_max`).
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Tuning;
    /// assert_eq!(Tuning::try_new(0.7_f64, 0.1, 0.0)?.regularisation(), 0.1);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn regularisation(&self) -> T {
        self.regularisation
    }

    /// The relative singular-value cutoff.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Tuning;
    /// assert_eq!(Tuning::try_new(0.7_f64, 0.0, 1e-4)?.cutoff(), 1e-4);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn cutoff(&self) -> T {
        self.cutoff
    }
}

/// What the loop did in one iteration.
///
/// # Examples
/// ```
/// use fourforce::orbit::State;
/// let hold = State::Hold { rank: 2, correctors: 3 };
/// assert_ne!(hold, State::Correcting);
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum State {
    /// The correctors moved (or stayed, with nothing to correct).
    Correcting,
    /// The monitors in use cannot determine the correctors of a plane: no corrector moved.
    Hold {
        /// Independent readings left (singular values above the rounding level) in the plane
        /// that lacks them.
        rank: u8,
        /// Correctors to determine in that plane.
        correctors: u8,
    },
}

/// The report of one iteration: the state, the limits that acted, the monitors in use.
///
/// Bit `j` of a corrector mask is corrector `j`, bit `i` of the monitor mask monitor `i`.
///
/// # Examples
/// ```
/// use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
/// let r = Response::<f64, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
/// let c = Corrector::try_new(-1.0e-3, 1.0e-3, 1.0)?;
/// let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
/// let mut s = [0.0];
/// let out = orbit.try_step(&[[5.0e-3, 0.0]], &mut s)?;
/// assert!(out.saturated(0) && !out.rate_limited(0) && s[0] == -1.0e-3);
/// assert!(out.monitor_in_use(0));
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Outcome {
    state: State,
    saturated: u32,
    rate_limited: u32,
    in_use: u32,
    decomposed: bool,
}

impl Outcome {
    /// Correcting or holding.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, State, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
    /// # let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// let out = orbit.try_step(&[[0.0, 0.0]], &mut [0.0])?;
    /// assert_eq!(out.state(), State::Correcting);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn state(&self) -> State {
        self.state
    }

    /// True when corrector `j` was held at the end of its range.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
    /// # let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// let out = orbit.try_step(&[[0.5, 0.0]], &mut [0.0])?;
    /// assert!(!out.saturated(0) && !out.saturated(32));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn saturated(&self, j: usize) -> bool {
        bit(self.saturated, j)
    }

    /// True when corrector `j`'s change was cut to its largest step.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// let c = Corrector::try_new(-1.0, 1.0, 0.1)?;
    /// # let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// let mut s = [0.0];
    /// assert!(orbit.try_step(&[[0.5, 0.0]], &mut s)?.rate_limited(0));
    /// assert_eq!(s, [-0.1]);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn rate_limited(&self, j: usize) -> bool {
        bit(self.rate_limited, j)
    }

    /// True when any limit acted.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
    /// # let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// assert!(!orbit.try_step(&[[0.5, 0.0]], &mut [0.0])?.limited());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn limited(&self) -> bool {
        self.saturated | self.rate_limited != 0
    }

    /// True when monitor `i` was used in this iteration's solve.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
    /// # let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// let out = orbit.try_step(&[[f32::NAN, 0.0]], &mut [0.0])?;
    /// assert!(!out.monitor_in_use(0));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn monitor_in_use(&self, i: usize) -> bool {
        bit(self.in_use, i)
    }

    /// The number of monitors in use.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
    /// # let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// assert_eq!(orbit.try_step(&[[0.0, 0.0]], &mut [0.0])?.monitors_in_use(), 1);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn monitors_in_use(&self) -> u32 {
        self.in_use.count_ones()
    }

    /// True when this iteration computed a decomposition (the monitor set, the response or the
    /// set of held correctors changed).
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
    /// # let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// assert!(orbit.try_step(&[[0.0, 0.0]], &mut [0.0])?.decomposed());
    /// assert!(!orbit.try_step(&[[0.0, 0.0]], &mut [0.0])?.decomposed());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn decomposed(&self) -> bool {
        self.decomposed
    }
}

/// One monitor reading one plane, one corrector: the correction in closed form, without a loop
/// object or a decomposition (what [`Orbit`] computes for `M = C = 1`, to rounding; for a
/// controller that steers one beam position with one corrector and knows the rigidity of each
/// cycle). The wanted change is the gained least-squares step with Tikhonov `α`,
///
/// ```text
/// Δs = −g x / (R (1 + α²)),   R = reading per setting (m per T m or per V) = R₁₂ κ
/// ```
///
/// then held within the corrector's rate and range as in [`Orbit::try_step`]. Returns the new
/// setting and the outcome (monitor 0 in use, the limits of corrector 0). Edges: `R = 0` (the
/// corrector does not reach the monitor) holds (`State::Hold { rank: 0, correctors: 1 }`); a
/// setting outside the range is brought to it (by the step itself when that lands inside).
///
/// # Errors
/// [`Error::NonFinite`] for a non-finite reading, response or setting; [`Error::Overflow`] when
/// the step does not fit the precision.
///
/// # Examples
/// ```
/// use fourforce::orbit::{self, Corrector, Tuning};
/// use fourforce::{Motion, Species, optics};
/// // An invented 2 MeV deuteron line: monitor 3 m after the corrector, ±5 mT m, 0.2 mT m/step.
/// let corrector = Corrector::try_new(-5.0e-3_f32, 5.0e-3, 0.2e-3)?;
/// let tuning = Tuning::try_new(0.5, 0.0, 0.0)?;
/// let beam = Motion::try_from_kinetic_energy(Species::DEUTERON, 2.0e6)?;
/// let response = 3.0 * optics::try_kick_angle(&beam, 1.0)?; // m per T m
/// let (setting, out) = orbit::try_single_step(&corrector, &tuning, response, 1.0e-3, 0.0)?;
/// // full correction −Bρ · 1 mm / 3 m = −96.3 µT m (Bρ = 0.289 T m); half of it at g = 0.5
/// assert!((setting + 0.5 * 0.289 * 1.0e-3 / 3.0).abs() < 1e-7);
/// assert!(!out.limited());
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_single_step<T: Real>(
    corrector: &Corrector<T>,
    tuning: &Tuning<T>,
    reading_per_setting: T,
    reading_m: T,
    setting: T,
) -> Result<(T, Outcome), Error> {
    let (r, x, given) = (
        try_finite(reading_per_setting)?,
        try_finite(reading_m)?,
        try_finite(setting)?,
    );
    let s = clamp(given, corrector.min, corrector.max);
    let mut outcome = Outcome {
        state: State::Correcting,
        saturated: 0,
        rate_limited: 0,
        in_use: 1,
        decomposed: false,
    };
    if r == T::ZERO {
        outcome.state = State::Hold {
            rank: 0,
            correctors: 1,
        };
        return Ok((s, outcome));
    }
    let wanted = try_finite(-tuning.single_gain * x / r).map_err(|_| Error::Overflow)?;
    // As the loop: a step within the rate that lands within the range is taken as it is.
    let candidate = given + wanted;
    if wanted.abs() <= corrector.max_step
        && candidate >= corrector.min
        && candidate <= corrector.max
    {
        return Ok((candidate, outcome));
    }
    let (step, clip) = corrector.clip(s, wanted);
    match clip {
        Clip::Saturated => outcome.saturated = 1,
        Clip::RateLimited => outcome.rate_limited = 1,
        Clip::None => {}
    }
    Ok((clamp(s + step, corrector.min, corrector.max), outcome))
}

/// Which limit, if any, clipped a corrector's step.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Clip {
    None,
    Saturated,
    RateLimited,
}

impl<T: Real> Corrector<T> {
    /// The step from the in-range set point `s` toward the finite `wanted`, clipped to the rate
    /// (`|step| ≤ max_step`) and to the range (`min ≤ s + step ≤ max`), and which limit acted.
    #[inline(always)]
    fn clip(&self, s: T, wanted: T) -> (T, Clip) {
        let (lo_range, hi_range) = (self.min - s, self.max - s);
        let lo = if lo_range > -self.max_step {
            lo_range
        } else {
            -self.max_step
        };
        let hi = if hi_range < self.max_step {
            hi_range
        } else {
            self.max_step
        };
        let step = if wanted > hi {
            hi
        } else if wanted < lo {
            lo
        } else {
            wanted
        };
        let clip = if step == wanted {
            Clip::None
        } else if step == hi_range || step == lo_range {
            Clip::Saturated
        } else {
            Clip::RateLimited
        };
        (step, clip)
    }
}

/// `x` brought into `[lo, hi]` by comparisons (finite inputs; libm's `fminf`/`fmaxf` are calls
/// on a chip, and this is on the path of every iteration).
#[inline]
fn clamp<T: Real>(x: T, lo: T, hi: T) -> T {
    if x < lo {
        lo
    } else if x > hi {
        hi
    } else {
        x
    }
}

const fn bit(mask: u32, i: usize) -> bool {
    i < 32 && mask & (1 << i) != 0
}

/// One corrector's column: the readings of both planes, x then y (2M values).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
struct Column<T: Real, const M: usize>([[T; M]; 2]);

impl<T: Real, const M: usize> AsRef<[T]> for Column<T, M> {
    fn as_ref(&self) -> &[T] {
        self.0.as_flattened()
    }
}

impl<T: Real, const M: usize> AsMut<[T]> for Column<T, M> {
    fn as_mut(&mut self) -> &mut [T] {
        self.0.as_flattened_mut()
    }
}

/// A decomposition's result: settings per metre of reading for a set of free correctors.
#[derive(Clone, Copy, Debug)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
struct Gains<T: Real, const M: usize, const C: usize> {
    /// `gain[j]`: the change of corrector `j`'s setting per metre of each reading (x then y);
    /// zero for held correctors and dropped monitors.
    gain: [Column<T, M>; C],
    /// Which readings corrector `j`'s row uses (so the product skips a plane of zeros).
    plane: [Plane; C],
    /// The correctors this was computed for (bit j), or `None` when stale.
    free: Option<u32>,
    /// `Correcting`, or the hold the decomposition found (all-zero bits: `Correcting`).
    hold: State,
}

impl<T: Real, const M: usize, const C: usize> Gains<T, M, C> {
    const STALE: Self = Self {
        gain: [Column([[T::ZERO; M]; 2]); C],
        plane: [Plane::X; C],
        free: None,
        hold: State::Correcting,
    };
}

/// The steering loop of a line with `M` monitors (each reading x and y) and `C` correctors
/// (`M, C ≤ 32`), keeping `N` readings per monitor and plane to recognise a stuck one (and the
/// correctors' steps between them).
///
/// Holds the response, the limits, the state of the monitors and the decompositions; no heap.
/// Its size is about `(5 · 2M · C + C² + N · C) · size_of::<T>()` plus the run counts: place it
/// in a `static` on a small stack.
///
/// # Examples
/// ```
/// use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
/// let r = Response::<f32, 1, 1>::try_new([[[4.0], [0.0]]], [0.5])?;
/// let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
/// let mut orbit = Orbit::<_, 1, 1>::try_new(r, [Monitor::try_new(0.1, 1.0e-6, 1.0)?], [c], Tuning::try_new(0.5, 0.0, 0.0)?)?;
/// let mut s = [0.0];
/// orbit.try_step(&[[2.0e-3, 0.0]], &mut s)?;
/// assert_eq!(s, [-0.5e-3]); // half of the 1 mT m that cancels 2 mm at 2 m per T m
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Debug)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Orbit<T: Real, const M: usize, const C: usize, const N: usize = 4> {
    response: Response<T, M, C>,
    monitors: [Monitor<T>; M],
    correctors: [Corrector<T>; C],
    tuning: Tuning<T>,
    /// Monitors in use (bit i).
    in_use: u32,
    /// The last reading of (p, i), and how many consecutive iterations it has been the same.
    last: [[T; 2]; M],
    runs: [[u16; 2]; M],
    /// The steps of the correctors in each of the last `N − 1` iterations (T m or V), a ring,
    /// and how many iterations it holds.
    recent: [[T; C]; N],
    recent_next: usize,
    recent_len: usize,
    full: Gains<T, M, C>,
    restricted: Gains<T, M, C>,
    work: [Column<T, M>; C],
    v: [[T; C]; C],
    s: [T; C],
    /// `1/κ_j`: the gains are kept in kick angles, so a new energy with the same optics (the
    /// same `R`) needs no new decomposition.
    setting_per_kick: [T; C],
    /// Monitors, correctors and tuning set, and a response loaded.
    configured: bool,
    loaded: bool,
}

impl<T: Real, const M: usize, const C: usize, const N: usize> Default for Orbit<T, M, C, N> {
    fn default() -> Self {
        Self::new()
    }
}

impl<T: Real, const M: usize, const C: usize, const N: usize> Orbit<T, M, C, N> {
    /// A loop with nothing set yet, every byte zero: as a `static` initialiser it costs no flash
    /// and no stack (the way to hold a loop on a chip with a small stack). Then
    /// [`try_configure`](Self::try_configure) and [`try_set_places`](Self::try_set_places) (or
    /// [`try_set_response`](Self::try_set_response)); until both, a step is
    /// [`Error::Empty`]. [`try_new`](Self::try_new) does all three at once.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::{Corrector, Monitor, Orbit, Response, Tuning}};
    /// static mut UNUSED: Orbit<f32, 8, 12> = Orbit::new();
    /// let mut orbit = Orbit::<f64, 1, 1>::new();
    /// assert_eq!(orbit.try_step(&[[0.0, 0.0]], &mut [0.0]), Err(Error::Empty));
    /// orbit.try_configure([Monitor::try_new(1.0, 1.0e-6, 1.0)?], [Corrector::try_new(-1.0, 1.0, 1.0)?], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// orbit.try_set_response(&Response::try_new([[[1.0], [0.0]]], [1.0])?, &mut [0.0])?;
    /// assert!(orbit.try_step(&[[0.0, 0.0]], &mut [0.0]).is_ok());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn new() -> Self {
        Self {
            response: Response::ZERO,
            monitors: [Monitor {
                range_m: T::ZERO,
                resolution_m: T::ZERO,
                weight: T::ZERO,
            }; M],
            correctors: [Corrector {
                min: T::ZERO,
                max: T::ZERO,
                max_step: T::ZERO,
            }; C],
            tuning: Tuning {
                gain: T::ZERO,
                regularisation: T::ZERO,
                cutoff: T::ZERO,
                single_gain: T::ZERO,
            },
            in_use: 0,
            last: [[T::ZERO; 2]; M],
            runs: [[0; 2]; M],
            recent: [[T::ZERO; C]; N],
            recent_next: 0,
            recent_len: 0,
            full: Gains::STALE,
            restricted: Gains::STALE,
            work: [Column([[T::ZERO; M]; 2]); C],
            v: [[T::ZERO; C]; C],
            s: [T::ZERO; C],
            setting_per_kick: [T::ZERO; C],
            configured: false,
            loaded: false,
        }
    }

    /// Sets the monitors, correctors and tuning; every monitor in use, the windows empty.
    ///
    /// # Errors
    /// [`Error::CapacityFull`] for more than 32 monitors or correctors, or `N` outside
    /// `2..=65535`; nothing changes then.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::{Corrector, Monitor, Orbit, Tuning}};
    /// let mut orbit = Orbit::<f32, 1, 1, 1>::new(); // N = 1 cannot see a stuck value
    /// let (m, c, t) = (Monitor::try_new(1.0, 1.0e-6, 1.0)?, Corrector::try_new(-1.0, 1.0, 1.0)?, Tuning::try_new(1.0, 0.0, 0.0)?);
    /// assert_eq!(orbit.try_configure([m], [c], t), Err(Error::CapacityFull));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_configure(
        &mut self,
        monitors: [Monitor<T>; M],
        correctors: [Corrector<T>; C],
        tuning: Tuning<T>,
    ) -> Result<(), Error> {
        if M > 32 || C > 32 || !(2..=usize::from(u16::MAX)).contains(&N) {
            return Err(Error::CapacityFull);
        }
        self.monitors = monitors;
        self.correctors = correctors;
        self.tuning = tuning;
        self.in_use = if M == 32 { u32::MAX } else { (1 << M) - 1 };
        self.runs = [[0; 2]; M];
        self.recent_len = 0;
        self.configured = true;
        self.invalidate();
        Ok(())
    }

    /// A loop for the line described by `response`, with its monitors, correctors and tuning:
    /// [`new`](Self::new), [`try_configure`](Self::try_configure) and the response at once, by
    /// value (on a small stack use those in a `static`). Every monitor starts in use; the first
    /// [`try_step`](Self::try_step) decomposes.
    ///
    /// # Errors
    /// [`Error::CapacityFull`] for more than 32 monitors or correctors, or `N` outside
    /// `2..=65535`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::{Corrector, Monitor, Orbit, Response, Tuning}};
    /// let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// let (m, c, t) = (Monitor::try_new(1.0, 1.0e-6, 1.0)?, Corrector::try_new(-1.0, 1.0, 1.0)?, Tuning::try_new(1.0, 0.0, 0.0)?);
    /// assert!(Orbit::<f32, 1, 1, 1>::try_new(r, [m], [c], t).is_err()); // N = 1 cannot see a stuck value
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_new(
        response: Response<T, M, C>,
        monitors: [Monitor<T>; M],
        correctors: [Corrector<T>; C],
        tuning: Tuning<T>,
    ) -> Result<Self, Error> {
        if M > 32 || C > 32 || !(2..=usize::from(u16::MAX)).contains(&N) {
            return Err(Error::CapacityFull);
        }
        let mut orbit = Self::new();
        orbit.try_configure(monitors, correctors, tuning)?;
        orbit.response = response;
        orbit.loaded_with(
            (orbit.clamped(&[T::ZERO; C])?.0, 0),
            &mut [T::ZERO; C],
            false,
        );
        Ok(orbit)
    }

    /// The response in use.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let (m, c, t) = (Monitor::try_new(1.0, 1.0e-6, 1.0)?, Corrector::try_new(-1.0, 1.0, 1.0)?, Tuning::try_new(1.0, 0.0, 0.0)?);
    /// let orbit = Orbit::<f32, 1, 1>::try_new(r, [m], [c], t)?;
    /// assert_eq!(orbit.response(), &r);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn response(&self) -> &Response<T, M, C> {
        &self.response
    }

    /// The tuning in use.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let (m, c) = (Monitor::try_new(1.0, 1.0e-6, 1.0)?, Corrector::try_new(-1.0, 1.0, 1.0)?);
    /// let t = Tuning::try_new(0.3, 0.0, 0.0)?;
    /// let orbit = Orbit::<f32, 1, 1>::try_new(r, [m], [c], t)?;
    /// assert_eq!(orbit.tuning().gain(), 0.3);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn tuning(&self) -> &Tuning<T> {
        &self.tuning
    }

    /// Sets a new tuning; the next step decomposes again if `α` or the cutoff changed (a new gain
    /// needs no decomposition).
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let (m, c) = (Monitor::try_new(1.0, 1.0e-6, 1.0)?, Corrector::try_new(-1.0, 1.0, 1.0)?);
    /// # let mut orbit = Orbit::<f32, 1, 1>::try_new(r, [m], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// orbit.try_step(&[[0.0, 0.0]], &mut [0.0])?;
    /// orbit.set_tuning(Tuning::try_new(0.5, 0.0, 0.0)?);
    /// assert!(!orbit.try_step(&[[0.0, 0.0]], &mut [0.0])?.decomposed());
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn set_tuning(&mut self, tuning: Tuning<T>) {
        if tuning.regularisation != self.tuning.regularisation
            || tuning.cutoff != self.tuning.cutoff
        {
            self.invalidate();
        }
        self.tuning = tuning;
    }

    /// True when monitor `i` is in use (not dropped as failed).
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let (m, c) = (Monitor::try_new(1.0, 1.0e-6, 1.0)?, Corrector::try_new(-1.0, 1.0, 1.0)?);
    /// # let mut orbit = Orbit::<f32, 1, 1>::try_new(r, [m], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// assert!(orbit.monitor_in_use(0));
    /// orbit.try_step(&[[2.0, 0.0]], &mut [0.0])?; // 2 m is outside the monitor's 1 m range
    /// assert!(!orbit.monitor_in_use(0));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub const fn monitor_in_use(&self, i: usize) -> bool {
        bit(self.in_use, i)
    }

    /// Puts monitor `i` back into use (after a repair); its stuck-detection windows start empty.
    /// Past the end: nothing happens.
    ///
    /// # Examples
    /// ```
    /// # use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// # let r = Response::<f32, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// # let (m, c) = (Monitor::try_new(1.0, 1.0e-6, 1.0)?, Corrector::try_new(-1.0, 1.0, 1.0)?);
    /// # let mut orbit = Orbit::<f32, 1, 1>::try_new(r, [m], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// orbit.try_step(&[[f32::INFINITY, 0.0]], &mut [0.0])?;
    /// orbit.restore_monitor(0);
    /// assert!(orbit.monitor_in_use(0));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn restore_monitor(&mut self, i: usize) {
        if i < M && !bit(self.in_use, i) {
            self.in_use |= 1 << i;
            if let Some(r) = self.runs.get_mut(i) {
                *r = [0, 0];
            }
            self.invalidate();
        }
    }

    /// Loads the response at a new energy and rescales the set points `settings` by
    /// `κ_old/κ_new`, so every kick stays the same; a rescaled set point outside its corrector's
    /// range is held at the limit (bit `j` of the returned mask). The next step decomposes again,
    /// unless only `κ` changed (the same response in kick angles: a drift-only line, or optics
    /// that follow the energy); then the new `κ` is all it takes.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite setting or a rescaled one that overflows; nothing is
    /// changed then.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
    /// let at_1 = Response::<f64, 1, 1>::try_new([[[1.0], [0.0]]], [1.0])?;
    /// let at_2 = Response::<f64, 1, 1>::try_new([[[1.0], [0.0]]], [0.5])?; // Bρ doubled
    /// let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
    /// let mut orbit = Orbit::<f64, 1, 1>::try_new(at_1, [Monitor::try_new(1.0, 1.0e-6, 1.0)?], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// let mut s = [0.3];
    /// assert_eq!(orbit.try_set_response(&at_2, &mut s)?, 0);
    /// assert_eq!(s, [0.6]);
    /// let mut s = [0.7];
    /// assert_eq!(orbit.try_set_response(&at_1, &mut s)?, 0); // back: 0.35
    /// assert_eq!(orbit.try_set_response(&at_2, &mut [0.7])?, 1); // 1.4 is beyond the range
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_set_response(
        &mut self,
        response: &Response<T, M, C>,
        settings: &mut [T; C],
    ) -> Result<u32, Error> {
        let next = if self.loaded {
            self.rescaled(
                &self.response.kick_per_setting,
                &response.kick_per_setting,
                settings,
            )?
        } else {
            self.clamped(settings)?
        };
        let same_optics = self.loaded && self.response.per_kick == response.per_kick;
        self.response = *response;
        Ok(self.loaded_with(next, settings, same_optics))
    }

    /// As [`try_set_response`](Self::try_set_response), the response computed in place from the
    /// line's places (see [`Response::try_from_places`]): on a chip, nothing of the size of the
    /// response lands on the stack.
    ///
    /// # Errors
    /// As [`Response::try_from_places`] and [`try_set_response`](Self::try_set_response). After
    /// an error in the places the loop has no response (a step is [`Error::Empty`]) and the set
    /// points are unchanged.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::KickDirection;
    /// use fourforce::orbit::{Corrector, Kick, Monitor, Orbit, Place, Tuning};
    /// use fourforce::transfer::TransferMap;
    /// use fourforce::{Motion, Species};
    /// let mut orbit = Orbit::<f64, 1, 1>::new();
    /// orbit.try_configure([Monitor::try_new(0.01, 1.0e-6, 1.0)?], [Corrector::try_new(-0.01, 0.01, 0.01)?], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// let line = |p: Motion<f64>| -> Result<_, fourforce::Error> {
    ///     Ok([
    ///         (TransferMap::IDENTITY, Place::Corrector { index: 0, kick: Kick::Magnetic, direction: KickDirection::Horizontal, motion: p }),
    ///         (TransferMap::try_drift(&p, 3.0)?, Place::Monitor(0)),
    ///     ])
    /// };
    /// let mut s = [1.0e-3];
    /// orbit.try_set_places(line(Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6)?)?, &mut s)?;
    /// orbit.try_set_places(line(Motion::try_from_kinetic_energy(Species::PROTON, 40.0e6)?)?, &mut s)?;
    /// let brho = |t| Motion::try_from_kinetic_energy(Species::<f64>::PROTON, t)?.try_magnetic_rigidity();
    /// assert!((s[0] - 1.0e-3 * brho(40.0e6)? / brho(10.0e6)?).abs() < 1e-17);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_set_places<I>(&mut self, places: I, settings: &mut [T; C]) -> Result<u32, Error>
    where
        I: IntoIterator<Item = (TransferMap<T>, Place<T>)>,
    {
        let old = self.response.kick_per_setting;
        let was_loaded = self.loaded;
        self.loaded = false;
        self.invalidate();
        self.response.try_fill(places)?;
        let next = if was_loaded {
            self.rescaled(&old, &self.response.kick_per_setting, settings)?
        } else {
            self.clamped(settings)?
        };
        Ok(self.loaded_with(next, settings, false))
    }

    /// As [`try_set_places`](Self::try_set_places) for a beam line at the reference `start` (see
    /// [`Response::try_from_line`]): the response at a new energy computed in place from the
    /// line's maps, the set points rescaled to keep every kick.
    ///
    /// # Errors
    /// As [`Response::try_from_line`] and [`try_set_response`](Self::try_set_response); after an
    /// error the loop has no response (a step is [`Error::Empty`]) and the set points are
    /// unchanged.
    ///
    /// # Examples
    /// ```
    /// use fourforce::beamline::{BeamLine, Element, KickDirection};
    /// use fourforce::orbit::{Corrector, Monitor, Orbit, Tuning};
    /// use fourforce::{Motion, Species};
    /// let line = BeamLine::<f32, 4>::try_from_elements(&[
    ///     Element::MagneticKick { integrated_field_tm: 0.0, direction: KickDirection::Vertical },
    ///     Element::Drift { length_m: 2.0 },
    ///     Element::Monitor { id: 1 },
    /// ])?;
    /// let mut orbit = Orbit::<f32, 1, 1>::new();
    /// orbit.try_configure([Monitor::try_new(0.01, 1.0e-6, 1.0)?], [Corrector::try_new(-0.01, 0.01, 0.01)?], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// let p = Motion::try_from_kinetic_energy(Species::PROTON, 10.0e6)?;
    /// let mut s = [0.0];
    /// orbit.try_set_line(&line, &p, &mut s)?;
    /// orbit.try_step(&[[0.0, 1.0e-3]], &mut s)?;
    /// // 1 mm at 2 m per rad: −0.5 mrad, times Bρ = 0.458 16 T m
    /// assert!((s[0] + 0.5e-3 * p.try_magnetic_rigidity()?).abs() < 1e-10);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_set_line<const L: usize>(
        &mut self,
        line: &BeamLine<T, L>,
        start: &Motion<T>,
        settings: &mut [T; C],
    ) -> Result<u32, Error> {
        let old = self.response.kick_per_setting;
        let was_loaded = self.loaded;
        self.loaded = false;
        self.invalidate();
        self.response.try_fill_from_line(line, start)?;
        let next = if was_loaded {
            self.rescaled(&old, &self.response.kick_per_setting, settings)?
        } else {
            self.clamped(settings)?
        };
        Ok(self.loaded_with(next, settings, false))
    }

    /// The set points rescaled by `κ_old/κ_new` and clamped to the ranges, with the mask of
    /// those held at a limit.
    fn rescaled(
        &self,
        old: &[T; C],
        new: &[T; C],
        settings: &[T; C],
    ) -> Result<([T; C], u32), Error> {
        let mut next = *settings;
        let mut held = 0;
        for (j, (((s, old), new), c)) in next
            .iter_mut()
            .zip(old)
            .zip(new)
            .zip(&self.correctors)
            .enumerate()
        {
            let scaled = try_finite(try_finite(*s)? * (*old / *new))?;
            *s = clamp(scaled, c.min, c.max);
            if *s != scaled {
                held |= 1 << j;
            }
        }
        Ok((next, held))
    }

    /// The set points clamped to the ranges, with the mask of those held at a limit.
    fn clamped(&self, settings: &[T; C]) -> Result<([T; C], u32), Error> {
        let mut next = *settings;
        let mut held = 0;
        for (j, (s, c)) in next.iter_mut().zip(&self.correctors).enumerate() {
            let x = try_finite(*s)?;
            *s = clamp(x, c.min, c.max);
            if *s != x {
                held |= 1 << j;
            }
        }
        Ok((next, held))
    }

    /// Takes the loaded response into use: `1/κ`, the steps kept for the stuck rule forgotten
    /// (they were taken at the old `κ`), and a new decomposition unless the optics (the response
    /// in kick angles) are the same.
    fn loaded_with(
        &mut self,
        (next, held): ([T; C], u32),
        settings: &mut [T; C],
        same_optics: bool,
    ) -> u32 {
        *settings = next;
        self.loaded = true;
        self.recent_len = 0;
        for (inverse, kappa) in self
            .setting_per_kick
            .iter_mut()
            .zip(&self.response.kick_per_setting)
        {
            *inverse = T::ONE / *kappa;
        }
        if !same_optics {
            self.invalidate();
        }
        held
    }

    /// One iteration: reads the monitors `readings[i] = [x_i, y_i]` (m, offsets from the wanted
    /// orbit), drops failed ones, and moves the set points `settings` (T m or V) by the limited
    /// correction step. Every new set point lies within its range: one found outside is brought
    /// to it (by its step alone when that step is within the rate and lands inside).
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite setting; [`Error::NotConverged`] or
    /// [`Error::Overflow`] from a decomposition that failed (not seen in practice);
    /// [`Error::Overflow`] for a step that does not fit the precision (a response or `κ` at the
    /// edge of the range); [`Error::Empty`] before a configuration and a response. On an error
    /// the settings are unchanged.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::{Corrector, Monitor, Orbit, Response, State, Tuning};
    /// // One plane, two monitors, one corrector: least squares over both readings.
    /// let r = Response::<f64, 2, 1>::try_new([[[1.0, 3.0], [0.0; 2]]], [1.0])?;
    /// let c = Corrector::try_new(-1.0, 1.0, 1.0)?;
    /// let m = Monitor::try_new(1.0, 1.0e-6, 1.0)?;
    /// let mut orbit = Orbit::<f64, 2, 1>::try_new(r, [m; 2], [c], Tuning::try_new(1.0, 0.0, 0.0)?)?;
    /// let mut s = [0.0];
    /// orbit.try_step(&[[1.0e-3, 0.0], [1.0e-3, 0.0]], &mut s)?;
    /// assert!((s[0] + 4.0e-3 / 10.0).abs() < 1e-18); // −(1·1 + 3·1)/(1² + 3²) mm
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_step(
        &mut self,
        readings: &[[T; 2]; M],
        settings: &mut [T; C],
    ) -> Result<Outcome, Error> {
        if !(self.configured && self.loaded) {
            return Err(Error::Empty);
        }
        let b = self.watch(readings);
        let mut decomposed = false;
        if self.full.free.is_none() {
            let all = if C == 32 { u32::MAX } else { (1 << C) - 1 };
            decompose_into(
                &mut self.full,
                all,
                &self.response,
                &self.monitors,
                self.in_use,
                self.tuning,
                &mut self.work,
                &mut self.v,
                &mut self.s,
            )?;
            decomposed = true;
        }
        let mut outcome = Outcome {
            state: State::Correcting,
            saturated: 0,
            rate_limited: 0,
            in_use: self.in_use,
            decomposed,
        };
        if let hold @ State::Hold { .. } = self.full.hold {
            for x in settings.iter() {
                try_finite(*x)?;
            }
            outcome.state = hold;
            self.record_steps(&[T::ZERO; C]);
            return Ok(outcome);
        }
        let g = self.tuning.gain;
        let mut step = [T::ZERO; C];
        apply_gains(&self.full, &b, g, &self.setting_per_kick, &mut step);
        let mut next = *settings;
        let mut held = self.limit(settings, &mut step, &mut outcome, 0, &mut next)?;
        let mut newly = held;
        for _ in 0..C {
            if newly == 0 {
                break;
            }
            // The free correctors solve again for what the held ones leave: b' = b + R_L Δs_L / g.
            let mut rest = b;
            for (j, ds) in step.iter().enumerate() {
                if bit(held, j) && *ds != T::ZERO {
                    add_column(&self.response, j, *ds / g, &mut rest);
                }
            }
            let free = !held & self.full.free.unwrap_or(0);
            if self.restricted.free != Some(free) {
                decompose_into(
                    &mut self.restricted,
                    free,
                    &self.response,
                    &self.monitors,
                    self.in_use,
                    self.tuning,
                    &mut self.work,
                    &mut self.v,
                    &mut self.s,
                )?;
                outcome.decomposed = true;
            }
            let mut free_step = [T::ZERO; C];
            if self.restricted.hold == State::Correcting {
                apply_gains(
                    &self.restricted,
                    &rest,
                    g,
                    &self.setting_per_kick,
                    &mut free_step,
                );
            }
            for (j, (ds, fs)) in step.iter_mut().zip(free_step).enumerate() {
                if !bit(held, j) {
                    *ds = fs;
                }
            }
            newly = self.limit(settings, &mut step, &mut outcome, held, &mut next)?;
            held |= newly;
        }
        *settings = next;
        self.record_steps(&step);
        Ok(outcome)
    }

    /// For every corrector not yet held: its set point brought into range, plus its step, into
    /// `next`; a step that would cross a limit is clipped to it. Returns the correctors newly
    /// held, and reports them: those that saturate if any does, else those rate-limited. The
    /// common case, no limit near, costs an add and three compares.
    fn limit(
        &self,
        settings: &[T; C],
        step: &mut [T; C],
        outcome: &mut Outcome,
        held: u32,
        next: &mut [T; C],
    ) -> Result<u32, Error> {
        let (mut newly, mut saturated) = (0_u32, 0_u32);
        for (j, (((ds, s), c), n)) in step
            .iter_mut()
            .zip(settings)
            .zip(&self.correctors)
            .zip(next.iter_mut())
            .enumerate()
        {
            if held != 0 && bit(held, j) {
                continue;
            }
            let wanted = *ds;
            let candidate = *s + wanted;
            // The common case: within the rate and the range (false for a non-finite setting).
            if wanted.abs() <= c.max_step && candidate >= c.min && candidate <= c.max {
                *n = candidate;
                continue;
            }
            let s = clamp(try_finite(*s)?, c.min, c.max);
            // A step that does not fit the precision (a response or κ at the edge of the range)
            try_finite(wanted).map_err(|_| Error::Overflow)?;
            let (clipped, clip) = c.clip(s, wanted);
            if clip != Clip::None {
                *ds = clipped;
                newly |= 1 << j;
                if clip == Clip::Saturated {
                    outcome.saturated |= 1 << j;
                    saturated |= 1 << j;
                } else {
                    outcome.rate_limited |= 1 << j;
                }
            }
            *n = clamp(s + clipped, c.min, c.max);
        }
        // The end stops first: while a corrector saturates, the steps of the others are those
        // of a solution that moves it beyond its range, not theirs to take; clipped to the rate
        // and held, they would enter the held set for a step they never wanted (the next pass
        // overwrites their steps). Only once the range holds are known does the rate hold.
        if saturated != newly && saturated != 0 {
            outcome.rate_limited &= !(newly ^ saturated);
            newly = saturated;
        }
        Ok(newly)
    }

    /// Updates the health of every monitor from its readings (a failed one leaves `in_use`) and
    /// returns the readings of the monitors in use, 0 for the others.
    fn watch(&mut self, readings: &[[T; 2]; M]) -> Column<T, M> {
        let mut b = Column([[T::ZERO; M]; 2]);
        let mut failed = 0_u32;
        let mut suspects = 0_u32;
        let n = u16::try_from(N).unwrap_or(u16::MAX);
        let [bx, by] = &mut b.0;
        for (i, (((((reading, monitor), last), run), x_out), y_out)) in readings
            .iter()
            .zip(&self.monitors)
            .zip(self.last.iter_mut())
            .zip(self.runs.iter_mut())
            .zip(bx.iter_mut())
            .zip(by.iter_mut())
            .enumerate()
        {
            let [x, y] = *reading;
            // one comparison per plane for non-finite and out of range (false for NaN)
            let trusted = x.abs() <= monitor.range_m && y.abs() <= monitor.range_m;
            if !trusted {
                failed |= 1 << i;
                continue;
            }
            *x_out = x;
            *y_out = y;
            run[0] = if x == last[0] {
                run[0].saturating_add(1)
            } else {
                1
            };
            run[1] = if y == last[1] {
                run[1].saturating_add(1)
            } else {
                1
            };
            *last = [x, y];
            if run[0] >= n || run[1] >= n {
                suspects |= 1 << i;
            }
        }
        // A repeated reading is stuck only if the steps of the last N − 1 iterations should have
        // changed it by more than the monitor resolves (rare: computed only for the suspects).
        let window = N.saturating_sub(1);
        suspects &= self.in_use;
        if suspects != 0 && self.recent_len >= window {
            // the kick of each corrector over the window (rad)
            let mut kick = [T::ZERO; C];
            for steps in self.recent.iter().take(window) {
                for (t, ds) in kick.iter_mut().zip(steps) {
                    *t += *ds;
                }
            }
            for (t, k) in kick.iter_mut().zip(&self.response.kick_per_setting) {
                *t *= *k;
            }
            for (i, (run, monitor)) in self.runs.iter().zip(&self.monitors).enumerate() {
                if !bit(suspects, i) {
                    continue;
                }
                for (p, r) in run.iter().enumerate() {
                    if *r < n {
                        continue;
                    }
                    let predicted =
                        kick.iter()
                            .zip(&self.response.per_kick)
                            .fold(T::ZERO, |a, (t, column)| {
                                a + *t
                                    * column
                                        .get(p)
                                        .and_then(|c| c.get(i))
                                        .copied()
                                        .unwrap_or(T::ZERO)
                            });
                    // false for NaN: an unknown change does not condemn a monitor
                    if predicted.abs() > monitor.resolution_m {
                        failed |= 1 << i;
                    }
                }
            }
        }
        let newly = failed & self.in_use;
        if newly != 0 {
            self.in_use &= !newly;
            self.invalidate();
        }
        let all = if M == 32 { u32::MAX } else { (1_u32 << M) - 1 };
        if self.in_use != all {
            for plane in &mut b.0 {
                for (i, x) in plane.iter_mut().enumerate() {
                    if !bit(self.in_use, i) {
                        *x = T::ZERO;
                    }
                }
            }
        }
        b
    }

    /// Remembers the steps of this iteration (the last `N − 1` are kept).
    fn record_steps(&mut self, step: &[T; C]) {
        if let Some(slot) = self.recent.get_mut(self.recent_next) {
            *slot = *step;
        }
        let window = N.saturating_sub(1);
        self.recent_next = if self.recent_next + 1 >= window {
            0
        } else {
            self.recent_next + 1
        };
        self.recent_len = (self.recent_len + 1).min(window);
    }

    fn invalidate(&mut self) {
        self.full.free = None;
        self.restricted.free = None;
    }
}

/// `step[j] = g Σ_r gain[j][r] b[r]` over the readings the corrector's plane uses.
fn apply_gains<T: Real, const M: usize, const C: usize>(
    gains: &Gains<T, M, C>,
    b: &Column<T, M>,
    g: T,
    setting_per_kick: &[T; C],
    step: &mut [T; C],
) {
    for (((ds, row), plane), inverse) in step
        .iter_mut()
        .zip(&gains.gain)
        .zip(&gains.plane)
        .zip(setting_per_kick)
    {
        let sum = match plane {
            Plane::X => dot(&row.0[0], &b.0[0]),
            Plane::Y => dot(&row.0[1], &b.0[1]),
            Plane::Both => dot(&row.0[0], &b.0[0]) + dot(&row.0[1], &b.0[1]),
        };
        *ds = g * sum * *inverse;
    }
}

/// `Σ a_i b_i` of two rows of fixed length, four products per pass into four partial sums (a
/// quarter of the loop's bookkeeping on a chip; the order of the sums is fixed).
#[inline]
fn dot<T: Real, const M: usize>(a: &[T; M], b: &[T; M]) -> T {
    let mut sums = [T::ZERO; 4];
    let (a4, b4) = (a.chunks_exact(4), b.chunks_exact(4));
    let (ra, rb) = (a4.remainder(), b4.remainder());
    for (x, y) in a4.zip(b4) {
        if let ([x0, x1, x2, x3], [y0, y1, y2, y3]) = (x, y) {
            sums[0] += *x0 * *y0;
            sums[1] += *x1 * *y1;
            sums[2] += *x2 * *y2;
            sums[3] += *x3 * *y3;
        }
    }
    for (x, y) in ra.iter().zip(rb) {
        sums[0] += *x * *y;
    }
    (sums[0] + sums[1]) + (sums[2] + sums[3])
}

/// `b += R κ_j x` (column j of the response in settings units).
fn add_column<T: Real, const M: usize, const C: usize>(
    response: &Response<T, M, C>,
    j: usize,
    x: T,
    b: &mut Column<T, M>,
) {
    let (Some(column), Some(k)) = (response.per_kick.get(j), response.kick_per_setting.get(j))
    else {
        return;
    };
    let kick = *k * x;
    for (bp, rp) in b.0.iter_mut().zip(column) {
        for (bi, ri) in bp.iter_mut().zip(rp) {
            *bi += *ri * kick;
        }
    }
}

/// Multiplication by `2^e`: one multiplication when `2^e` is a normal number, `scalbn`
/// otherwise (exact either way, short of overflow or underflow of the result).
#[derive(Clone, Copy)]
struct PowerOfTwo<T: Real> {
    factor: T,
    exponent: i32,
}

fn power_of_two<T: Real>(exponent: i32) -> PowerOfTwo<T> {
    let factor = T::ONE.scalbn(exponent);
    PowerOfTwo { factor, exponent }
}

impl<T: Real> PowerOfTwo<T> {
    #[inline]
    fn apply(self, x: T) -> T {
        if self.factor.is_finite() && self.factor >= T::MIN_POSITIVE {
            x * self.factor
        } else {
            x.scalbn(self.exponent)
        }
    }
}

/// One block of a decomposition: its correctors, where it sits in the workspace, its rows and
/// its power-of-two scale.
#[derive(Clone, Copy)]
struct Block {
    plane: Plane,
    offset: usize,
    k: usize,
    rows: usize,
    scale_exp: i32,
}

impl Block {
    const NONE: Self = Self {
        plane: Plane::Both,
        offset: 0,
        k: 0,
        rows: 0,
        scale_exp: 0,
    };

    /// Whether reading plane `p` belongs to the block.
    fn has_plane(&self, p: usize) -> bool {
        match self.plane {
            Plane::X => p == 0,
            Plane::Y => p == 1,
            Plane::Both => true,
        }
    }
}

/// Decomposes the weighted response restricted to the correctors `free` and the monitors
/// `in_use`, plane by plane when no free corrector couples them, and writes the gains. `α` and
/// the cutoff are relative to the largest singular value over both planes.
#[allow(clippy::too_many_arguments)]
fn decompose_into<T: Real, const M: usize, const C: usize>(
    out: &mut Gains<T, M, C>,
    free: u32,
    response: &Response<T, M, C>,
    monitors: &[Monitor<T>; M],
    in_use: u32,
    tuning: Tuning<T>,
    work: &mut [Column<T, M>; C],
    v: &mut [[T; C]; C],
    s: &mut [T; C],
) -> Result<(), Error> {
    let mut planes = [Plane::Both; C];
    let mut coupled = false;
    for (j, plane) in planes.iter_mut().enumerate() {
        *plane = response.column_plane(j);
        coupled |= bit(free, j) && *plane == Plane::Both;
    }
    let in_block = |block: &Block, j: usize| {
        bit(free, j) && (block.plane == Plane::Both || planes.get(j) == Some(&block.plane))
    };
    let used = |i: usize, m: &Monitor<T>| bit(in_use, i) && m.weight != T::ZERO;
    let mut blocks = [Block::NONE; 2];
    if coupled {
        blocks[0].plane = Plane::Both;
    } else {
        blocks[0].plane = Plane::X;
        blocks[1].plane = Plane::Y;
    }
    // 1. Gather each block's weighted columns into work[offset..offset + k], the readings of the
    //    monitors in use into rows 0..rows; scale by a power of two (exact) so the sums of squares
    //    neither overflow nor underflow; decompose.
    let mut offset = 0;
    let mut sigma_max = T::ZERO; // over both blocks, unscaled
    for block in blocks.iter_mut().take(if coupled { 1 } else { 2 }) {
        block.offset = offset;
        let mut top = i32::MIN;
        for (j, column) in response.per_kick.iter().enumerate() {
            if !in_block(block, j) {
                continue;
            }
            let Some(dst) = work.get_mut(offset + block.k) else {
                break;
            };
            let mut rows = 0;
            for (p, plane) in column.iter().enumerate() {
                if !block.has_plane(p) {
                    continue;
                }
                for (i, (r, m)) in plane.iter().zip(monitors).enumerate() {
                    if !used(i, m) {
                        continue;
                    }
                    let value = *r * m.weight;
                    if let Some(x) = dst.as_mut().get_mut(rows) {
                        *x = value;
                    }
                    if value != T::ZERO {
                        top = top.max(value.ilogb());
                    }
                    rows += 1;
                }
            }
            block.rows = rows;
            block.k += 1;
        }
        offset += block.k;
        if block.k == 0 {
            continue;
        }
        block.scale_exp = if top == i32::MIN { 0 } else { top };
        let end = block.offset + block.k;
        let cols = work.get_mut(block.offset..end).ok_or(Error::OutOfBounds)?;
        let scale = power_of_two(-block.scale_exp);
        for column in cols.iter_mut() {
            for x in column.as_mut().iter_mut().take(block.rows) {
                *x = scale.apply(*x);
            }
        }
        let vs = v.get_mut(block.offset..end).ok_or(Error::OutOfBounds)?;
        let ss = s.get_mut(block.offset..end).ok_or(Error::OutOfBounds)?;
        svd::try_decompose(cols, block.rows, vs, ss)?;
        for sigma in ss.iter() {
            let sigma = sigma.scalbn(block.scale_exp);
            if sigma > sigma_max {
                sigma_max = sigma;
            }
        }
    }
    // 2. Rank and hold, then the gains (kick angles): G[j][r] = −Σ_l V[j][l] f_l W[r][l] w_r 2^-e with
    //    f_l = 1/(σ_l² + (α σ_max)²), in the block's scaled units.
    // Written in place (no copy of the C × 2M gains on the stack).
    out.free = None;
    for g in out.gain.iter_mut() {
        *g = Column([[T::ZERO; M]; 2]);
    }
    let gains = &mut out.gain;
    let mut hold = State::Correcting;
    for block in &blocks {
        if block.k == 0 {
            continue;
        }
        let end = block.offset + block.k;
        let vs = v.get(block.offset..end).ok_or(Error::OutOfBounds)?;
        let ss = s.get(block.offset..end).ok_or(Error::OutOfBounds)?;
        let alpha = (tuning.regularisation * sigma_max).scalbn(-block.scale_exp);
        let floor = (tuning.cutoff * sigma_max).scalbn(-block.scale_exp);
        // Independent readings: singular values above the rounding level of the decomposition
        // (16 ε √rows σ_max); the cutoff only truncates, it does not make a plane hold.
        let rows_t = T::from_u32(u32::try_from(block.rows).unwrap_or(u32::MAX));
        let noise =
            (T::from_u32(16) * T::EPSILON * rows_t.sqrt() * sigma_max).scalbn(-block.scale_exp);
        let mut rank = 0_u8;
        let mut factors = [T::ZERO; C];
        for (f, sigma) in factors.iter_mut().zip(ss) {
            if *sigma > noise {
                rank = rank.saturating_add(1);
            }
            if *sigma > floor && *sigma > noise {
                *f = T::ONE / (*sigma * *sigma + alpha * alpha);
            }
        }
        if usize::from(rank) < block.k {
            hold = State::Hold {
                rank,
                correctors: u8::try_from(block.k).unwrap_or(u8::MAX),
            };
            break;
        }
        // u_l = f_l w_l in place, then for each corrector acc = Σ_l V[j][l] u_l (contiguous
        // rows), scattered to its readings with the weights, the scale and −1/κ_j.
        let cols = work.get_mut(block.offset..end).ok_or(Error::OutOfBounds)?;
        for (column, f) in cols.iter_mut().zip(&factors) {
            for x in column.as_mut().iter_mut().take(block.rows) {
                *x *= *f;
            }
        }
        let unscale = power_of_two(-block.scale_exp);
        let mut local = 0;
        for (j, g) in gains.iter_mut().enumerate() {
            if !in_block(block, j) {
                continue;
            }
            let mut acc = Column([[T::ZERO; M]; 2]);
            for (vcol, u) in vs.iter().zip(cols.iter()) {
                let coefficient = vcol.get(local).copied().unwrap_or(T::ZERO);
                for (a, x) in acc.as_mut().iter_mut().zip(u.as_ref()).take(block.rows) {
                    *a += coefficient * *x;
                }
            }
            let mut rows = acc.as_ref().iter();
            for (p, plane) in g.0.iter_mut().enumerate() {
                if !block.has_plane(p) {
                    continue;
                }
                for (i, (x, m)) in plane.iter_mut().zip(monitors).enumerate() {
                    if !used(i, m) {
                        continue;
                    }
                    let sum = rows.next().copied().unwrap_or(T::ZERO);
                    *x = -unscale.apply(sum * m.weight);
                }
            }
            local += 1;
        }
    }
    out.plane = planes;
    out.hold = hold;
    out.free = Some(free);
    Ok(())
}

/// A corrector's calibration: its setting (∫B dl in T m, or ∫E dl in V for a deflector) as a
/// strictly increasing function of its drive (the supply current in A, or the supply voltage in
/// V), from `P` measured points, and the inverse for the set point.
///
/// Interpolation is piecewise linear: monotone by construction, its inverse is the same kind of
/// function (exact to rounding, no iteration), and it never overshoots between points. Away from
/// saturation a magnet's excitation curve is nearly straight, so a few points carry it; near
/// saturation, measure more densely. No extrapolation: outside the table is an error.
///
/// # Examples
/// ```
/// use fourforce::orbit::Calibration;
/// // An invented corrector: linear to 8 A, saturating beyond.
/// let cal = Calibration::try_new([-10.0_f64, -8.0, 0.0, 8.0, 10.0], [-4.6e-3, -4.0e-3, 0.0, 4.0e-3, 4.6e-3])?;
/// assert_eq!(cal.try_setting(4.0)?, 2.0e-3);
/// assert_eq!(cal.try_drive(4.3e-3)?, 9.0);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Calibration<T: Real, const P: usize> {
    drive: [T; P],
    setting: [T; P],
}

impl<T: Real, const P: usize> Calibration<T, P> {
    /// A calibration through the points `(drive[i], setting[i])`.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::Empty`] for fewer than two points; [`Error::NotMonotone`]
    /// unless both coordinates strictly increase.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::Calibration};
    /// assert_eq!(Calibration::try_new([0.0_f32, 1.0, 1.0], [0.0, 1.0, 2.0]), Err(Error::NotMonotone));
    /// assert_eq!(Calibration::try_new([0.0_f32], [0.0]), Err(Error::Empty));
    /// ```
    pub fn try_new(drive: [T; P], setting: [T; P]) -> Result<Self, Error> {
        if P < 2 {
            return Err(Error::Empty);
        }
        for x in drive.iter().chain(&setting) {
            try_finite(*x)?;
        }
        let increasing = |v: &[T; P]| v.windows(2).all(|w| matches!(w, [a, b] if a < b));
        if !increasing(&drive) || !increasing(&setting) {
            return Err(Error::NotMonotone);
        }
        Ok(Self { drive, setting })
    }

    /// The setting at the drive `drive` (A or V).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::OutsideCalibration`] outside the table's drives.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, orbit::Calibration};
    /// let cal = Calibration::try_new([0.0_f32, 10.0], [0.0, 5.0e-3])?;
    /// assert_eq!(cal.try_setting(10.0)?, 5.0e-3);
    /// assert_eq!(cal.try_setting(10.5), Err(Error::OutsideCalibration));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_setting(&self, drive: T) -> Result<T, Error> {
        interpolate(&self.drive, &self.setting, try_finite(drive)?)
    }

    /// The drive (A or V) that gives the setting `setting` (T m or V): the inverse.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::OutsideCalibration`] outside the table's settings.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Calibration;
    /// let cal = Calibration::try_new([0.0_f64, 10.0], [0.0, 5.0e-3])?;
    /// assert_eq!(cal.try_drive(2.5e-3)?, 5.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_drive(&self, setting: T) -> Result<T, Error> {
        interpolate(&self.setting, &self.drive, try_finite(setting)?)
    }

    /// The settings at the ends of the table, `(lowest, highest)`: the corrector's range.
    ///
    /// # Examples
    /// ```
    /// use fourforce::orbit::Calibration;
    /// let cal = Calibration::try_new([-5.0_f32, 5.0], [-2.0e-3, 2.0e-3])?;
    /// assert_eq!(cal.setting_range(), (-2.0e-3, 2.0e-3));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn setting_range(&self) -> (T, T) {
        (
            self.setting.first().copied().unwrap_or(T::ZERO),
            self.setting.last().copied().unwrap_or(T::ZERO),
        )
    }
}

/// `y(x)` on the polyline through `(xs[i], ys[i])`, `xs` strictly increasing. The result stays
/// within the segment's ends (no rounding past them), and finite: where `y₁ − y₀` or `x₁ − x₀`
/// overflows, the segment is evaluated as `y₀ (1 − t) + y₁ t`, `t` from halved coordinates.
fn interpolate<T: Real>(xs: &[T], ys: &[T], x: T) -> Result<T, Error> {
    for (xw, yw) in xs.windows(2).zip(ys.windows(2)) {
        if let ([x0, x1], [y0, y1]) = (xw, yw) {
            if x >= *x0 && x <= *x1 {
                if x == *x1 {
                    return Ok(*y1);
                }
                let y = *y0 + (x - *x0) * ((*y1 - *y0) / (*x1 - *x0));
                let y = if y.is_finite() {
                    y
                } else {
                    // The settings span more than the precision holds (y1 − y0 overflows): the
                    // fraction of the interval, then a weighted mean. The drives are halved only
                    // when their own difference overflows (then they are far from subnormal, so
                    // halving is exact and the denominator stays positive).
                    let dx = *x1 - *x0;
                    let t = if dx.is_finite() {
                        (x - *x0) / dx
                    } else {
                        (x * T::HALF - *x0 * T::HALF) / (*x1 * T::HALF - *x0 * T::HALF)
                    };
                    let t = clamp(t, T::ZERO, T::ONE);
                    *y0 * (T::ONE - t) + *y1 * t
                };
                return Ok(clamp(y, *y0, *y1));
            }
        }
    }
    Err(Error::OutsideCalibration)
}
