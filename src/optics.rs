//! Beam-line quantities of one [`Motion`]: bends, kicks, revolution frequency, flight times, and
//! the inverse problems a controller meets.
//!
//! Free generic functions, each taking a state of motion (or a species, for the inverse
//! problems) and the element's parameters in SI units; every one returns a typed [`Error`] at its
//! edges (zero charge, zero field, non-positive length, angle out of range, non-finite input).
//!
//! | function | formula | result |
//! | --- | --- | --- |
//! | [`try_bending_radius`] | `ρ = Bρ/|B|` | m |
//! | [`try_electric_bending_radius`] | `ρ = Eρ/|E|` | m |
//! | [`try_revolution_frequency`] | `f = |Q| c² |B| / (2π E)` | Hz |
//! | [`try_lag_behind_light`] | `L (1 − β)/(β c)` | s |
//! | [`try_flight_time_difference`] | `L/c ((1 − β_a)/β_a − (1 − β_b)/β_b)` | s |
//! | [`try_energy_gain`] | `ΔT = Q V` | eV |
//! | [`try_after_voltage`] | the state after a voltage `V` | [`Motion`] |
//! | [`try_kick_angle`] | `θ = ±∫B dl / Bρ` (thin, small angle) | rad |
//! | [`try_kick_angle_hard_edge`] | `sin θ = ±L B / Bρ` | rad |
//! | [`try_integrated_field_for_angle`] | `∫B dl = ±θ Bρ` | T m |
//! | [`try_field_for_angle_hard_edge`] | `B = ±Bρ sin θ / L` | T |
//! | [`try_electrostatic_kick_angle`] | `θ = ±E L / Eρ` | rad |
//! | [`try_deflector_field_for_angle`] | `E = ±θ Eρ / L` | V/m |
//! | [`try_motion_from_dipole`] | `Bρ = B L / sin θ` (hard edge) | [`Motion`] |
//!
//! A state from a time of flight, a rigidity `Bρ = |B| ρ` or `Eρ = |E| ρ` is a [`Motion`]
//! constructor ([`Motion::try_from_flight_time`], [`Motion::try_from_magnetic_rigidity`],
//! [`Motion::try_from_electric_rigidity`]).
//!
//! # Signs
//! Magnitudes (radii, rigidities, frequencies) are positive. Angles and fields carry a sign: a
//! positive integrated field deflects a positive charge by a positive angle, a negative charge
//! by a negative one (`±` above is the sign of `Q`). Which way "positive" points is the sign
//! convention of your beam line; keep it with the magnet polarity.
//!
//! # Accuracy
//! Each function adds a few roundings to the accessor it reads (see [`Motion`]): within 2 eps
//! for the products and quotients, plus `libm`'s `asin`/`sin` (about 1 ulp) for the hard-edge
//! forms. [`try_flight_time_difference`] is exact up to those roundings relative to each term: it
//! never subtracts two large flight times; a difference of two nearly equal states is
//! conditioned by how close they are, as it must be.
//!
//! # For firmware authors
//! No function here costs more than a division and a multiplication or two, except the
//! hard-edge forms (one `asin` or `sin`) and the inverse problems (one state construction).
//!
//! # Examples
//! ```
//! use fourforce::{optics, Motion, Species};
//! // An invented 2 MeV deuteron line: a 0.5 T dipole bends it on a radius of 0.578 m.
//! let d = Motion::try_from_kinetic_energy(Species::<f32>::DEUTERON, 2.0e6)?;
//! let rho = optics::try_bending_radius(&d, 0.5)?;
//! assert!((rho / 0.577_998_4 - 1.0).abs() < 1e-6); // B rho 0.28899920385644361 T m (mpmath)
//! // The rigidity of the field that centres the beam on that radius gives back the energy.
//! let back = Motion::try_from_magnetic_rigidity(Species::<f32>::DEUTERON, 0.5 * rho)?;
//! assert!((back.kinetic_energy() / 2.0e6 - 1.0).abs() < 1e-6);
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::real::fits;
use crate::{Error, Motion, Real, Species, try_finite};

/// `c²/(2π)` in Hz eV per (T e): the revolution frequency factor, mpmath 50 digits from exact c.
const C2_OVER_TWO_PI: f64 = 14_304_132_932_540_443.241_963_75;

/// `|B|` or [`Error::ZeroField`] / [`Error::NonFinite`].
#[inline]
fn nonzero_field<T: Real>(field: T) -> Result<T, Error> {
    let f = try_finite(field)?.abs();
    if f == T::ZERO {
        Err(Error::ZeroField)
    } else {
        Ok(f)
    }
}

/// A length that must be positive and finite.
#[inline]
fn positive_length<T: Real>(length: T) -> Result<T, Error> {
    let l = try_finite(length)?;
    if l <= T::ZERO {
        Err(Error::NonPositiveLength)
    } else {
        Ok(l)
    }
}

/// +1 or −1 with the sign of the charge (for a zero charge, which every deflection refuses, its
/// sign bit).
#[inline]
pub(crate) fn charge_sign<T: Real>(motion: &Motion<T>) -> T {
    T::ONE.copysign(motion.species().charge())
}

/// Bending radius in a magnetic field perpendicular to the motion: `ρ = Bρ/|B|` in m.
///
/// # Errors
/// [`Error::ZeroCharge`] for a neutral species; [`Error::ZeroField`] for `B = 0`;
/// [`Error::NonFinite`] for a non-finite field; [`Error::Overflow`] for a radius that does not fit.
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // 10 MeV proton in 1 T: 0.458155375777 m (mpmath, CODATA 2018).
/// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 10.0e6)?;
/// assert!((optics::try_bending_radius(&p, 1.0)? / 0.458_155_375_777 - 1.0).abs() < 1e-11);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_bending_radius<T: Real>(motion: &Motion<T>, field_t: T) -> Result<T, Error> {
    let b = nonzero_field(field_t)?;
    let brho = motion.try_magnetic_rigidity()?;
    fits(brho / b)
}

/// Bending radius in a transverse electric field: `ρ = Eρ/|E|` in m.
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::ZeroField`] for `E = 0`; [`Error::NonFinite`];
/// [`Error::Overflow`].
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // A 10 keV electron (E rho = 19808.061 V, mpmath) in 20 kV/m bends on 0.99 m.
/// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 10.0e3)?;
/// let rho = optics::try_electric_bending_radius(&e, 20.0e3)?;
/// assert!((rho - 0.990_403_051_676_015_85).abs() < 1e-14);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_electric_bending_radius<T: Real>(
    motion: &Motion<T>,
    field_v_per_m: T,
) -> Result<T, Error> {
    let e = nonzero_field(field_v_per_m)?;
    let erho = motion.try_electric_rigidity()?;
    fits(erho / e)
}

/// Revolution (cyclotron) frequency in a magnetic field, `f = |Q| c² |B| / (2π E)` in Hz.
///
/// `E = γ mc²` is the total energy in eV; `c²/(2π)` is one folded constant (exact `c`).
/// Accuracy: within 8 eps of mpmath from 1 eV to 100 TeV, every species, per tesla (the promise
/// of [`Motion`]); one rounding more for `B`.
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::ZeroField`] for `B = 0`; [`Error::NonFinite`].
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // Proton at rest, 1 T: 15245186.4582 Hz (mpmath, CODATA 2018).
/// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 0.0)?;
/// assert!((optics::try_revolution_frequency(&p, 1.0)? / 15_245_186.458_2 - 1.0).abs() < 1e-11);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_revolution_frequency<T: Real>(motion: &Motion<T>, field_t: T) -> Result<T, Error> {
    let b = nonzero_field(field_t)?;
    let q = motion.species().charge().abs();
    if q == T::ZERO {
        return Err(Error::ZeroCharge);
    }
    let per_tesla = (T::from_f64(C2_OVER_TWO_PI) / motion.total_energy()) * q;
    fits(per_tesla * b)
}

/// How long the particle trails a light signal over `length_m`: `L (1 − β)/(β c)` in s.
///
/// Uses the held `1 − β`, so it stays exact where `L/(βc) − L/c` would cancel to zero (a
/// 10 GeV electron over 100 m trails by 0.435 fs; the textbook form gives 0 in `f32`).
///
/// # Errors
/// [`Error::NonPositiveLength`] for `L ≤ 0`; [`Error::NonFinite`]; [`Error::Overflow`] for a
/// particle at rest (it never arrives).
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 1.0e10)?;
/// // 4.354566569e-16 s (mpmath, CODATA 2018)
/// assert!((optics::try_lag_behind_light(&e, 100.0)? / 4.354_566_6e-16 - 1.0).abs() < 8.0 * f32::EPSILON);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_lag_behind_light<T: Real>(motion: &Motion<T>, length_m: T) -> Result<T, Error> {
    let l = positive_length(length_m)?;
    let x = motion.one_minus_beta() / motion.beta();
    fits(l * x * T::INV_SPEED_OF_LIGHT)
}

/// Difference of the flight times of two states over the same length, `t_a − t_b` in s.
///
/// `t_a − t_b = L/c ((1 − β_a)/β_a − (1 − β_b)/β_b)`: the two terms are the lags behind light,
/// small and exact, so two large nearly equal flight times are never subtracted. Works for two
/// species (time-of-flight separation) or two energies of one species. Positive when `a` is
/// slower.
///
/// # Errors
/// [`Error::NonPositiveLength`]; [`Error::NonFinite`]; [`Error::Overflow`] when either state is
/// at rest.
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // An invented 20 m flight path: a 1 GeV muon vs a 1 GeV electron.
/// let mu = Motion::try_from_kinetic_energy(Species::<f32>::MUON, 1.0e9)?;
/// let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 1.0e9)?;
/// let dt = optics::try_flight_time_difference(&mu, &e, 20.0)?;
/// assert!((dt / 3.067_043_4e-10 - 1.0).abs() < 1e-5); // 0.306704339 ns (mpmath)
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_flight_time_difference<T: Real>(
    a: &Motion<T>,
    b: &Motion<T>,
    length_m: T,
) -> Result<T, Error> {
    let l = positive_length(length_m)?;
    let xa = a.one_minus_beta() / a.beta();
    let xb = b.one_minus_beta() / b.beta();
    fits(l * (xa - xb) * T::INV_SPEED_OF_LIGHT)
}

/// Kinetic energy a voltage `V` gives a particle of charge `Q`: `ΔT = Q V` in eV.
///
/// The crate's one sign convention for energy gains (see the crate manual): `V` is the voltage
/// across the gap or electrode pair in the direction of travel, so `V > 0` accelerates a positive
/// charge; an electron gains energy from a negative `V`. Exact for any path (energy
/// conservation; Jackson, Classical Electrodynamics, 3rd ed., from memory); one rounding.
///
/// # Errors
/// [`Error::NonFinite`] for a non-finite voltage; [`Error::Overflow`] when `Q V` does not fit the
/// precision.
///
/// # Examples
/// ```
/// use fourforce::{optics, Species};
/// // An invented 10 kV electron gun: the electron crosses −10 kV in its direction of travel.
/// assert_eq!(optics::try_energy_gain(Species::<f32>::ELECTRON, -10.0e3)?, 10.0e3);
/// assert_eq!(optics::try_energy_gain(Species::<f32>::ALPHA, 1.0e6)?, 2.0e6);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_energy_gain<T: Real>(species: Species<T>, voltage_v: T) -> Result<T, Error> {
    let v = try_finite(voltage_v)?;
    fits(species.charge() * v)
}

/// The state after a voltage `V`: `T' = T + Q V` ([`try_energy_gain`]).
///
/// In `f32` a gain below `2⁻²⁵ T` is lost in the sum (an f32 `T` of 1 GeV has a spacing of
/// 64 eV): accumulate small gains separately (as [`BeamState`](crate::beamline::BeamState)
/// does), or hold `T` in `f64`.
///
/// # Errors
/// As [`try_energy_gain`]; [`Error::NegativeEnergy`] when the voltage takes more than the kinetic
/// energy (the particle is reflected); as [`Motion::try_from_kinetic_energy`].
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // An electron from rest through −10 kV moves at 58 455 214.93 m/s (mpmath, CODATA 2018).
/// let rest = Motion::at_rest(Species::<f64>::ELECTRON);
/// let e = optics::try_after_voltage(&rest, -10.0e3)?;
/// assert!((e.speed() - 58_455_214.927_781_732).abs() < 1e-6);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_after_voltage<T: Real>(motion: &Motion<T>, voltage_v: T) -> Result<Motion<T>, Error> {
    let gain = try_energy_gain(motion.species(), voltage_v)?;
    Motion::try_from_kinetic_energy(motion.species(), motion.kinetic_energy() + gain)
}

/// Kick angle of a thin magnetic corrector, small-angle form: `θ = ±∫B dl / Bρ` in rad.
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::NonFinite`]; [`Error::Overflow`] for a particle at rest.
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // An invented corrector of 2 mT m on a 250 MeV proton (B rho 2.4321284387 T m): 0.822 mrad.
/// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 250.0e6)?;
/// let theta = optics::try_kick_angle(&p, 2.0e-3)?;
/// assert!((theta - 2.0e-3 / 2.432_128_438_725_504_4).abs() < 1e-18);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_kick_angle<T: Real>(motion: &Motion<T>, integrated_field_tm: T) -> Result<T, Error> {
    let bl = try_finite(integrated_field_tm)?;
    let brho = motion.try_magnetic_rigidity()?;
    fits(charge_sign(motion) * bl / brho)
}

/// Deflection by a hard-edge dipole of field `B` and length `L`: `sin θ = ±L B / Bρ` in rad.
///
/// The exact form for a uniform field that starts and ends abruptly, the beam entering along
/// the magnet's axis (`L = ρ sin θ`).
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::NonFinite`]; [`Error::NonPositiveLength`] for `L ≤ 0`;
/// [`Error::AngleOutOfRange`] when `L |B| > Bρ` (the particle turns back inside the magnet);
/// [`Error::Overflow`] when `Bρ` does not fit the precision (a charge far below e).
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // 0.5 T over 0.2 m on the 250 MeV proton: asin(0.1/2.4321284387) = 41.13 mrad.
/// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 250.0e6)?;
/// let theta = optics::try_kick_angle_hard_edge(&p, 0.5, 0.2)?;
/// assert!((theta - (0.1_f64 / 2.432_128_438_725_504_4).asin()).abs() < 1e-15);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_kick_angle_hard_edge<T: Real>(
    motion: &Motion<T>,
    field_t: T,
    length_m: T,
) -> Result<T, Error> {
    let b = try_finite(field_t)?;
    let l = positive_length(length_m)?;
    let brho = motion.try_magnetic_rigidity()?;
    let s = charge_sign(motion) * l * b / brho;
    if !s.is_finite() || s.abs() > T::ONE {
        return Err(Error::AngleOutOfRange);
    }
    Ok(s.asin())
}

/// Integrated field a thin corrector needs for a wanted angle: `∫B dl = ±θ Bρ` in T m.
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::NonFinite`]; [`Error::Overflow`] when `θ Bρ` does not fit the
/// precision.
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // 1 mrad on a 1 MeV electron (B rho 4.7431804486e-3 T m, mpmath): 4.74 uT m; negative charge.
/// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 1.0e6)?;
/// let bl = optics::try_integrated_field_for_angle(&e, 1.0e-3)?;
/// assert!((bl + 4.743_180_448_575_933e-6).abs() < 1e-20);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_integrated_field_for_angle<T: Real>(
    motion: &Motion<T>,
    angle_rad: T,
) -> Result<T, Error> {
    let theta = try_finite(angle_rad)?;
    let brho = motion.try_magnetic_rigidity()?;
    fits(charge_sign(motion) * theta * brho)
}

/// Field a hard-edge dipole of length `L` needs for a wanted bend: `B = ±Bρ sin θ / L` in T.
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::NonFinite`]; [`Error::NonPositiveLength`];
/// [`Error::AngleOutOfRange`] for `|θ| > π/2`.
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 250.0e6)?;
/// let theta = optics::try_kick_angle_hard_edge(&p, 0.5, 0.2)?;
/// assert!((optics::try_field_for_angle_hard_edge(&p, theta, 0.2)? - 0.5).abs() < 1e-15);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_field_for_angle_hard_edge<T: Real>(
    motion: &Motion<T>,
    angle_rad: T,
    length_m: T,
) -> Result<T, Error> {
    let theta = try_finite(angle_rad)?;
    let l = positive_length(length_m)?;
    if theta.abs() > T::PI * T::HALF {
        return Err(Error::AngleOutOfRange);
    }
    let brho = motion.try_magnetic_rigidity()?;
    fits(charge_sign(motion) * brho * theta.sin() / l)
}

/// Deflection of a thin electrostatic deflector, small-angle form: `θ = ±E L / Eρ` in rad.
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::NonFinite`]; [`Error::NonPositiveLength`];
/// [`Error::Overflow`] for a particle at rest.
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// // An invented 5 kV/m, 0.1 m deflector on a 10 keV electron (E rho 19808.061 V): 25.2 mrad.
/// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 10.0e3)?;
/// let theta = optics::try_electrostatic_kick_angle(&e, 5.0e3, 0.1)?;
/// assert!((theta + 500.0 / 19_808.061_033_520_317).abs() < 1e-15); // negative charge
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_electrostatic_kick_angle<T: Real>(
    motion: &Motion<T>,
    field_v_per_m: T,
    length_m: T,
) -> Result<T, Error> {
    let e = try_finite(field_v_per_m)?;
    let l = positive_length(length_m)?;
    let erho = motion.try_electric_rigidity()?;
    fits(charge_sign(motion) * e * l / erho)
}

/// Field a thin electrostatic deflector of length `L` needs for a wanted angle:
/// `E = ±θ Eρ / L` in V/m.
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::NonFinite`]; [`Error::NonPositiveLength`].
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// let a = Motion::try_from_kinetic_energy(Species::<f64>::ALPHA, 5.0e6)?;
/// // 2 mrad over 0.5 m: 4996650.93 V * 2e-3 / 0.5 = 19986.6 V/m.
/// let e = optics::try_deflector_field_for_angle(&a, 2.0e-3, 0.5)?;
/// assert!((e - 19_986.603_719_892_04).abs() < 1e-9);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_deflector_field_for_angle<T: Real>(
    motion: &Motion<T>,
    angle_rad: T,
    length_m: T,
) -> Result<T, Error> {
    let theta = try_finite(angle_rad)?;
    let l = positive_length(length_m)?;
    let erho = motion.try_electric_rigidity()?;
    fits(charge_sign(motion) * theta * erho / l)
}

/// The state of a particle that a hard-edge dipole of length `L` at field `B` bends by `θ`:
/// `Bρ = |B| L / sin θ`.
///
/// # Errors
/// [`Error::ZeroCharge`]; [`Error::ZeroField`]; [`Error::NonFinite`];
/// [`Error::NonPositiveLength`] for `L ≤ 0`; [`Error::AngleOutOfRange`] for `θ` outside
/// `(0, π/2]`.
///
/// # Examples
/// ```
/// use fourforce::{optics, Motion, Species};
/// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 250.0e6)?;
/// let theta = optics::try_kick_angle_hard_edge(&p, 0.5, 0.2)?;
/// let back = optics::try_motion_from_dipole(Species::<f64>::PROTON, 0.5, 0.2, theta)?;
/// assert!((back.kinetic_energy() / 250.0e6 - 1.0).abs() < 1e-14);
/// # Ok::<(), fourforce::Error>(())
/// ```
pub fn try_motion_from_dipole<T: Real>(
    species: Species<T>,
    field_t: T,
    length_m: T,
    bend_angle_rad: T,
) -> Result<Motion<T>, Error> {
    let b = nonzero_field(field_t)?;
    let l = positive_length(length_m)?;
    let theta = try_finite(bend_angle_rad)?;
    if theta <= T::ZERO || theta > T::PI * T::HALF {
        return Err(Error::AngleOutOfRange);
    }
    Motion::try_from_magnetic_rigidity(species, b * l / theta.sin())
}
