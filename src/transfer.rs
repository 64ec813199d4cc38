//! First-order transfer maps of focusing elements, and the beam envelopes they carry.
//!
//! A [`TransferMap`] is the 6×6 matrix `R` of a hard-edge element (or a whole line) in the
//! coordinates `(x, x', y, y', Δt, δ)`: offsets in m, slopes in rad, `Δt` the arrival time
//! relative to the reference particle in s (positive = later), `δ = Δp/p₀`. It is built at a
//! reference state of motion ([`Motion`]) and composed with [`then`](TransferMap::then).
//!
//! # Elements
//! | constructor | parameters | focusing |
//! | --- | --- | --- |
//! | [`try_drift`](TransferMap::try_drift) | `L` | none |
//! | [`try_quadrupole`](TransferMap::try_quadrupole) | `L`, gradient `G` (T/m) | `k = sign(Q) G/Bρ`, `k > 0` focuses in `x` |
//! | [`try_thin_quadrupole`](TransferMap::try_thin_quadrupole) | `∫G dl` (T) | `1/f = sign(Q) ∫G dl/Bρ` |
//! | [`try_electrostatic_quadrupole`](TransferMap::try_electrostatic_quadrupole) | `L`, electrode voltage `V`, aperture radius `a` | `k = sign(Q) 2V/(a² Eρ)` |
//! | [`try_sector_dipole`](TransferMap::try_sector_dipole) | arc `L`, angle `θ`, pole faces `e₁`, `e₂` | `ρ = L/θ`; edges `x' += tan e/ρ · x`, `y' −= tan e/ρ · y` |
//! | [`try_solenoid`](TransferMap::try_solenoid) | `L`, axial field `B` | `K = sign(Q) B/(2Bρ)`, couples `x` and `y` |
//! | [`try_gap`](TransferMap::try_gap) | voltage `V` | `ΔT = Q V`; `x'`, `y'` scale by `p₀/p₁`, `δ` by `v₀p₀/(v₁p₁)` |
//!
//! In a dipole `x` points away from the centre of curvature for `θ > 0` (so `R16 = ρ(1 − cos θ)`).
//! The time row is `Δt = Δl/v − (L/v) δ/γ²`, `Δl` the first-order path-length difference, non-zero
//! only in dipoles: `Δl = x₀ sin θ + x₀' ρ(1 − cos θ) + δ ρ(θ − sin θ)`. Thin elements take no time.
//!
//! # Precision
//! Every entry is built from forms that keep full relative accuracy for small arguments:
//! `sin φ/√k` as `L sin φ/φ`, `1 − cos θ = 2 sin²(θ/2)`, `θ − sin θ` by its series below
//! `|θ| = 2`, the edge-corrected dipole entries as `cos(θ − e)/cos e` and
//! `sin(e₁ + e₂ − θ)/(cos e₁ cos e₂)` (a rectangular magnet gives exactly `R11 = R22 = 1`,
//! `R21 = 0`). As `k → 0` or `θ → 0` every map goes smoothly to the drift. The promise: each
//! entry of an element's or a line's map within `32 eps · S` of the exact map, `S` the entry's
//! rounding scale (the same entry of the product of the elements' absolute values) plus its
//! sensitivity to a relative rounding of every input (lengths, fields, angles, kinetic energy,
//! rest energy).
//!
//! # Envelopes
//! An [`Envelope`] is a beam at one place: the second moments `Σ` of its betatron part in
//! `(x, x', y, y')`, its dispersion `(D_x, D_x', D_y, D_y')` and its rms momentum spread `σ_δ`.
//! Through a map, `Σ → A Σ Aᵀ` and `D → (A D + R₆)/R66` (`A` the 4×4 transverse block). The size
//! per plane is `√(β ε + (D σ_δ)²)`; the [`Twiss`] parameters `(β, α, γ)` are read from the
//! projected moments, so they equal the Courant–Snyder functions in a line without coupling and
//! stay meaningful (projected) through solenoids. [`TransferMap::try_periodic`] gives the periodic
//! solution of a cell.
//!
//! # For firmware authors
//! A map is 26 numbers (the structure of the 6×6 is fixed: nothing depends on `Δt`, and `δ` only
//! scales), so composing costs a few dozen multiplications, fewer while no solenoid has coupled the
//! planes. An element costs a division and, for a focusing element, a square root, one sine and
//! cosine and one `expm1` (for both `sinh` and `cosh` of the defocusing plane). The sines and
//! cosines are [`Real::sin_cos`], computed in `f32` arithmetic only (libm's `sinf` computes in
//! `f64`, which a single-precision FPU emulates in software); in `f32` it covers phases up to
//! 8192 rad, and an element whose phase is larger is refused with [`Error::Overflow`]. Nothing
//! allocates. `ci/firmware` counts the map of a 16-element line on the Cortex-M4F per element.
//!
//! # Examples
//! ```
//! use fourforce::{Motion, Species};
//! use fourforce::transfer::TransferMap;
//! // An invented 10 MeV proton line: 0.2 m quadrupole of 5 T/m between two 1 m drifts.
//! let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 10.0e6)?;
//! let d = TransferMap::try_drift(&p, 1.0)?;
//! let q = TransferMap::try_quadrupole(&p, 0.2, 5.0)?;
//! let m = d.then(&q).then(&d).to_array();
//! // Focusing in x, defocusing in y; the planes stay apart.
//! assert!(m[0][0] < 1.0 && m[2][2] > 1.0 && m[0][2] == 0.0);
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::optics::charge_sign;
use crate::real::fits;
use crate::{Error, Motion, Real, try_finite};

/// The numbers of the reference that the elements' maps need, computed once per energy (a line
/// computes them at its start and after each gap, not once per element).
#[derive(Clone, Copy, Debug)]
pub(crate) struct Reference<T: Real> {
    /// `+1` or `−1`, the sign of the charge.
    sign: T,
    /// `Bρ` in T m, or why there is none (a neutral species).
    brho: Result<T, Error>,
    /// `Eρ` in V, or why there is none.
    erho: Result<T, Error>,
    /// `1/v` in s/m.
    per_metre: T,
    /// `γ`.
    gamma: T,
    /// `R56` per metre of straight element, `−1/(v γ²)` in s/m.
    time_per_metre: T,
}

impl<T: Real> Reference<T> {
    #[inline]
    pub(crate) fn new(motion: &Motion<T>) -> Self {
        let per_metre = motion.flight_time_per_metre();
        let gamma = motion.gamma();
        Self {
            sign: charge_sign(motion),
            brho: motion.try_magnetic_rigidity(),
            erho: motion.try_electric_rigidity(),
            per_metre,
            gamma,
            time_per_metre: -(per_metre / gamma) / gamma,
        }
    }
}

/// The horizontal block, the vertical block and `R56` of an element without coupling,
/// dispersion or time row.
pub(crate) type Blocks<T> = ([[T; 2]; 2], [[T; 2]; 2], T);

/// `sin x / x`, 1 at 0.
#[inline]
fn sinc<T: Real>(x: T) -> T {
    sinc_of(x, x.sin_cos().0)
}

/// `sin x / x` from a sine already computed, 1 at 0.
#[inline]
fn sinc_of<T: Real>(x: T, sin: T) -> T {
    if x == T::ZERO { T::ONE } else { sin / x }
}

/// `(x − sin x)/x = 1 − sin x/x`, by its alternating series for `|x| < 2` (no cancellation),
/// directly above (where `1 − sin x/x > 0.54`).
fn one_minus_sinc<T: Real>(x: T) -> T {
    let x2 = x * x;
    if x2 >= T::from_f64(4.0) {
        return T::ONE - x.sin_cos().0 / x;
    }
    // x²/3! (1 − x²/(4·5) (1 − x²/(6·7) (1 − ...))): the neglected term of n factors is below
    // 4ⁿ/(2n+3)!, under 2⁻⁵⁵ for 11 factors and 2⁻²⁸ for 7.
    // (written out so that the constants of T fold at compile time: no conversion at run time)
    let term = |r: T, denominator: f64| T::ONE - x2 / T::from_f64(denominator) * r;
    let mut r = T::ONE;
    if T::MANTISSA_DIGITS > 24 {
        r = term(r, 600.0);
        r = term(r, 506.0);
        r = term(r, 420.0);
        r = term(r, 342.0);
    }
    r = term(r, 272.0);
    r = term(r, 210.0);
    r = term(r, 156.0);
    r = term(r, 110.0);
    r = term(r, 72.0);
    r = term(r, 42.0);
    r = term(r, 20.0);
    x2 / T::from_f64(6.0) * r
}

/// The 2×2 map of one plane of a focusing element of strength `kappa` (1/m², `> 0` focuses)
/// and length `L`: `[[c, L s], [−κ L s, c]]` with `φ = √|κ| L`, `c = cos φ`, `s = sin φ/φ` (or
/// `cosh`, `sinh φ/φ` for `κ < 0`).
fn focusing_plane<T: Real>(kappa: T, length_m: T) -> Result<[[T; 2]; 2], Error> {
    let phi = kappa.abs().sqrt() * length_m;
    let (c, s) = if kappa >= T::ZERO {
        let (sin, cos) = phi.sin_cos();
        (cos, sinc_of(phi, sin))
    } else {
        // one exponential for both: with m = e^φ − 1 (no cancellation),
        // sinh φ = (m/2)(m + 2)/(m + 1), cosh φ = 1 + (m/2) m/(m + 1)
        let m = phi.exp_m1();
        let half = m * T::HALF;
        let sinh = half * ((m + T::TWO) / (m + T::ONE));
        (T::ONE + half * (m / (m + T::ONE)), sinc_of(phi, sinh))
    };
    let r12 = length_m * s;
    let r21 = -kappa * r12;
    // NaN from a phase beyond the f32 reduction, infinity from a long defocusing plane
    if (c + r12 + r21) * T::ZERO == T::ZERO {
        Ok([[c, r12], [r21, c]])
    } else {
        Err(Error::Overflow)
    }
}

/// A first-order transfer map in `(x, x', y, y', Δt, δ)`: see the [module documentation](self).
///
/// Held as its non-trivial parts: the transverse 4×4 block, the dispersion column (`R₁₆..R₄₆`),
/// the time row (`R₅₁..R₅₄`), `R56` and `R66`; `R55 = 1`, and the other entries of the fifth
/// column and the sixth row are zero for every element this crate knows.
///
/// # Examples
/// ```
/// use fourforce::{Motion, Species};
/// use fourforce::transfer::TransferMap;
/// let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 5.0e6)?;
/// let m = TransferMap::try_drift(&e, 2.0)?;
/// let out = m.apply([1.0e-3, 2.0e-3, 0.0, 0.0, 0.0, 0.0]);
/// assert!((out[0] - 5.0e-3).abs() < 1e-9); // x + L x'
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct TransferMap<T: Real> {
    /// `R_ij`, `i, j` in `(x, x', y, y')`.
    transverse: [[T; 4]; 4],
    /// `R_i6`, `i` in `(x, x', y, y')`.
    dispersion: [T; 4],
    /// `R_5j`, `j` in `(x, x', y, y')`, in s/m and s/rad.
    time: [T; 4],
    /// `R56` in s.
    time_per_delta: T,
    /// `R66`.
    delta_scale: T,
    /// True when a block between the planes may be non-zero.
    coupled: bool,
}

impl<T: Real> Default for TransferMap<T> {
    fn default() -> Self {
        Self::IDENTITY
    }
}

impl<T: Real> TransferMap<T> {
    /// The identity map (a marker, a thin element of zero strength).
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::TransferMap;
    /// let m = TransferMap::<f64>::IDENTITY.to_array();
    /// assert_eq!(m[4][4], 1.0);
    /// assert_eq!(m[0][1], 0.0);
    /// ```
    pub const IDENTITY: Self = Self {
        transverse: [
            [T::ONE, T::ZERO, T::ZERO, T::ZERO],
            [T::ZERO, T::ONE, T::ZERO, T::ZERO],
            [T::ZERO, T::ZERO, T::ONE, T::ZERO],
            [T::ZERO, T::ZERO, T::ZERO, T::ONE],
        ],
        dispersion: [T::ZERO; 4],
        time: [T::ZERO; 4],
        time_per_delta: T::ZERO,
        delta_scale: T::ONE,
        coupled: false,
    };

    /// An uncoupled map from its horizontal and vertical blocks and its time per `δ`.
    #[inline]
    fn uncoupled(x: [[T; 2]; 2], y: [[T; 2]; 2], time_per_delta: T) -> Self {
        let [[x11, x12], [x21, x22]] = x;
        let [[y11, y12], [y21, y22]] = y;
        let z = T::ZERO;
        // a literal, not IDENTITY with fields replaced: no copy of the constant on the chip
        Self {
            transverse: [
                [x11, x12, z, z],
                [x21, x22, z, z],
                [z, z, y11, y12],
                [z, z, y21, y22],
            ],
            dispersion: [z; 4],
            time: [z; 4],
            time_per_delta,
            delta_scale: T::ONE,
            coupled: false,
        }
    }

    /// `R56 = −L/(v γ²)` of a straight element of length `L`: the later arrival of a slower
    /// particle (`dv/v = δ/γ²`).
    #[inline]
    fn straight_time(reference: &Reference<T>, length_m: T) -> Result<T, Error> {
        if length_m == T::ZERO {
            // no length, no time, even at rest (avoids 0 · ∞)
            return Ok(T::ZERO);
        }
        fits(length_m * reference.time_per_metre)
    }

    /// A field-free drift of length `L` (m, ≥ 0): `R12 = R34 = L`, `R56 = −L/(v γ²)`.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a NaN or infinite length; [`Error::NonPositiveLength`] for
    /// `L < 0`; [`Error::Overflow`] for a reference at rest (it never arrives) with `L > 0`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e9)?;
    /// let m = TransferMap::try_drift(&p, 10.0)?.to_array();
    /// assert_eq!(m[0][1], 10.0);
    /// // R56 = -L/(v gamma^2): 38.12 ns / 2.0658^2 = 8.93 ns earlier per unit delta
    /// assert!((m[4][5] / -8.932_9e-9 - 1.0).abs() < 1e-4);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_drift(motion: &Motion<T>, length_m: T) -> Result<Self, Error> {
        let (l, r56) = Self::drift_parts(&Reference::new(motion), length_m)?;
        let block = [[T::ONE, l], [T::ZERO, T::ONE]];
        Ok(Self::uncoupled(block, block, r56))
    }

    /// A drift's length (checked) and `R56`.
    #[inline(always)]
    pub(crate) fn drift_parts(reference: &Reference<T>, length_m: T) -> Result<(T, T), Error> {
        let l = nonnegative(length_m)?;
        Ok((l, Self::straight_time(reference, l)?))
    }

    /// A thick magnetic quadrupole of length `L` (m, > 0) and gradient `G = ∂B_y/∂x` (T/m).
    ///
    /// `k = sign(Q) G/Bρ`; with `φ = √|k| L` the focusing plane (`x` for `k > 0`) is
    /// `[[cos φ, sin φ/√|k|], [−√|k| sin φ, cos φ]]`, the other `cosh`/`sinh`; `R56 = −L/(v γ²)`.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NonPositiveLength`] for `L ≤ 0`; [`Error::ZeroCharge`] for a
    /// neutral species; [`Error::Overflow`] when `cosh φ` does not fit (`φ` above about 89 in
    /// `f32`), when `φ` exceeds 8192 rad in `f32` (see [`Real::sin_cos`]), or the reference is at
    /// rest.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 250.0e6)?;
    /// let m = TransferMap::try_quadrupole(&p, 0.3, 10.0)?.to_array();
    /// let k: f64 = 10.0 / 2.432_128_438_725_504_4; // G / B rho
    /// assert!((m[0][0] - (k.sqrt() * 0.3).cos()).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_quadrupole(
        motion: &Motion<T>,
        length_m: T,
        gradient_t_per_m: T,
    ) -> Result<Self, Error> {
        let (x, y, r56) =
            Self::quadrupole_blocks(&Reference::new(motion), length_m, gradient_t_per_m)?;
        Ok(Self::uncoupled(x, y, r56))
    }

    /// The horizontal and vertical blocks and `R56` of a magnetic quadrupole.
    #[inline(always)]
    pub(crate) fn quadrupole_blocks(
        reference: &Reference<T>,
        length_m: T,
        gradient_t_per_m: T,
    ) -> Result<Blocks<T>, Error> {
        let l = positive(length_m)?;
        let g = try_finite(gradient_t_per_m)?;
        let k = fits(reference.sign * g / reference.brho?)?;
        Self::lens_blocks(reference, k, l)
    }

    /// A thick quadrupole lens of strength `k` (1/m², `> 0` focuses in `x`) and length `L`.
    #[inline(always)]
    fn lens_blocks(reference: &Reference<T>, k: T, length_m: T) -> Result<Blocks<T>, Error> {
        Ok((
            focusing_plane(k, length_m)?,
            focusing_plane(-k, length_m)?,
            Self::straight_time(reference, length_m)?,
        ))
    }

    /// A thin magnetic quadrupole of integrated gradient `∫G dl` (T): `1/f = sign(Q) ∫G dl/Bρ`,
    /// `R21 = −1/f`, `R43 = +1/f`; no length, no time.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::ZeroCharge`] for a neutral species; [`Error::Overflow`]
    /// when `1/f` does not fit.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 1.0e9)?;
    /// let m = TransferMap::try_thin_quadrupole(&e, 0.5)?.to_array();
    /// // An electron: a positive gradient defocuses in x.
    /// assert!(m[1][0] > 0.0 && m[3][2] < 0.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_thin_quadrupole(
        motion: &Motion<T>,
        integrated_gradient_t: T,
    ) -> Result<Self, Error> {
        let (x, y, r56) =
            Self::thin_quadrupole_blocks(&Reference::new(motion), integrated_gradient_t)?;
        Ok(Self::uncoupled(x, y, r56))
    }

    /// The blocks of a thin quadrupole (no time).
    #[inline(always)]
    pub(crate) fn thin_quadrupole_blocks(
        reference: &Reference<T>,
        integrated_gradient_t: T,
    ) -> Result<Blocks<T>, Error> {
        let gl = try_finite(integrated_gradient_t)?;
        let inverse_focal = fits(reference.sign * gl / reference.brho?)?;
        Ok((
            [[T::ONE, T::ZERO], [-inverse_focal, T::ONE]],
            [[T::ONE, T::ZERO], [inverse_focal, T::ONE]],
            T::ZERO,
        ))
    }

    /// An electrostatic quadrupole of length `L` (m, > 0), electrode voltage `V` (V) and aperture
    /// radius `a` (m, > 0): the potential `V (x² − y²)/a²` gives `k = sign(Q) 2V/(a² Eρ)`, then
    /// as [`try_quadrupole`](Self::try_quadrupole).
    ///
    /// # Errors
    /// As [`try_quadrupole`](Self::try_quadrupole); [`Error::NonPositiveLength`] also for
    /// `a ≤ 0`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// // An invented 30 keV Ar+ implanter lens: 0.1 m, 2 kV on a 25 mm radius.
    /// let ion = fourforce::Species::<f64>::try_from_atom(39.962_383_12, 1, 15.76)?;
    /// let a = Motion::try_from_kinetic_energy(ion, 30.0e3)?;
    /// let m = TransferMap::try_electrostatic_quadrupole(&a, 0.1, 2.0e3, 0.025)?.to_array();
    /// let k: f64 = 2.0 * 2.0e3 / (0.025 * 0.025 * 60.0e3); // E rho = 2T/Q at low energy
    /// assert!((m[1][0] / (-(k.sqrt()) * (k.sqrt() * 0.1).sin()) - 1.0).abs() < 1e-5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_electrostatic_quadrupole(
        motion: &Motion<T>,
        length_m: T,
        voltage_v: T,
        aperture_radius_m: T,
    ) -> Result<Self, Error> {
        let (x, y, r56) = Self::electrostatic_quadrupole_blocks(
            &Reference::new(motion),
            length_m,
            voltage_v,
            aperture_radius_m,
        )?;
        Ok(Self::uncoupled(x, y, r56))
    }

    /// The blocks and `R56` of an electrostatic quadrupole.
    #[inline(always)]
    pub(crate) fn electrostatic_quadrupole_blocks(
        reference: &Reference<T>,
        length_m: T,
        voltage_v: T,
        aperture_radius_m: T,
    ) -> Result<Blocks<T>, Error> {
        let l = positive(length_m)?;
        let v = try_finite(voltage_v)?;
        let a = positive(aperture_radius_m)?;
        let k = fits(reference.sign * ((v + v) / (a * a)) / reference.erho?)?;
        Self::lens_blocks(reference, k, l)
    }

    /// A sector dipole of arc length `L` (m, > 0) bending by `θ` (rad, signed; `ρ = L/θ`), with
    /// pole-face rotations `e₁` at the entrance and `e₂` at the exit (rad, `|e| < π/2`) as thin
    /// edge lenses `x' += tan e/ρ · x`, `y' −= tan e/ρ · y`.
    ///
    /// Body: `R11 = R22 = cos θ`, `R12 = ρ sin θ`, `R21 = −sin θ/ρ`, `R16 = ρ(1 − cos θ)`,
    /// `R26 = sin θ`, vertically a drift; time row `R51 = sin θ/v`, `R52 = ρ(1 − cos θ)/v`,
    /// `R56 = (ρ(θ − sin θ) − L/γ²)/v`. With the edges, `R11 = cos(θ − e₁)/cos e₁`,
    /// `R22 = cos(θ − e₂)/cos e₂`, `R21 = sin(e₁ + e₂ − θ)/(ρ cos e₁ cos e₂)`. `θ = 0` is a drift.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NonPositiveLength`] for `L ≤ 0`;
    /// [`Error::AngleOutOfRange`] for `|e| ≥ π/2`; [`Error::Overflow`] when an entry does not
    /// fit, the reference is at rest, or `|θ|` exceeds 8192 rad in `f32`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 250.0e6)?;
    /// // A rectangular magnet (e1 = e2 = theta/2) is horizontally a drift of rho sin(theta).
    /// let (l, theta) = (1.4, 0.7);
    /// let m = TransferMap::try_sector_dipole(&p, l, theta, theta / 2.0, theta / 2.0)?.to_array();
    /// assert_eq!((m[0][0], m[1][0], m[1][1]), (1.0, 0.0, 1.0));
    /// assert!((m[0][1] - l / theta * theta.sin()).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_sector_dipole(
        motion: &Motion<T>,
        length_m: T,
        angle_rad: T,
        entry_rad: T,
        exit_rad: T,
    ) -> Result<Self, Error> {
        Self::sector_dipole(
            &Reference::new(motion),
            length_m,
            angle_rad,
            entry_rad,
            exit_rad,
        )
    }

    /// [`try_sector_dipole`](Self::try_sector_dipole) at a reference computed once.
    #[inline(always)]
    pub(crate) fn sector_dipole(
        reference: &Reference<T>,
        length_m: T,
        angle_rad: T,
        entry_rad: T,
        exit_rad: T,
    ) -> Result<Self, Error> {
        let l = positive(length_m)?;
        let theta = try_finite(angle_rad)?;
        let (e1, e2) = (edge_angle(entry_rad)?, edge_angle(exit_rad)?);
        let (s, _) = theta.sin_cos();
        let (s1, c1) = e1.sin_cos();
        let (s2, c2) = e2.sin_cos();
        let (t1, t2) = (s1 / c1, s2 / c2);
        let h = theta / l; // 1/ρ
        let half = theta * T::HALF;
        let sinc_half = sinc(half);
        // ρ(1 − cos θ) = 2ρ sin²(θ/2) = L (θ/2) (sin(θ/2)/(θ/2))²
        let r16 = l * half * sinc_half * sinc_half;
        let one_minus_cos = theta * half * sinc_half * sinc_half;
        let r12 = l * sinc_of(theta, s);
        let r11 = (theta - e1).sin_cos().1 / c1;
        let r22 = (theta - e2).sin_cos().1 / c2;
        let r21 = h * ((e1 + e2 - theta).sin_cos().0 / (c1 * c2));
        let r26 = s + t2 * one_minus_cos;
        // vertical: exit edge · drift · entry edge
        let y11 = T::ONE - theta * t1;
        let y22 = T::ONE - theta * t2;
        let y21 = -h * (t1 + t2 - theta * t1 * t2);
        let (per_metre, gamma) = (reference.per_metre, reference.gamma);
        // (ρ(θ − sin θ) − L/γ²)/v
        let r56 = (l * one_minus_sinc(theta) - l / gamma / gamma) * per_metre;
        let z = T::ZERO;
        Self {
            transverse: [
                [r11, r12, z, z],
                [r21, r22, z, z],
                [z, z, y11, l],
                [z, z, y21, y22],
            ],
            dispersion: [r16, r26, z, z],
            // R51 after the entry edge: (sin θ + tan e₁ (1 − cos θ))/v; R52 = ρ(1 − cos θ)/v
            time: [(s + t1 * one_minus_cos) * per_metre, r16 * per_metre, z, z],
            time_per_delta: r56,
            delta_scale: T::ONE,
            coupled: false,
        }
        .checked()
    }

    /// A solenoid of length `L` (m, > 0) and axial field `B` (T), hard edge (its fringe fields
    /// included): with `K = sign(Q) B/(2Bρ)`, `C = cos KL`, `S = sin KL`,
    ///
    /// ```text
    /// [[ C²,    SC/K,  SC,    S²/K ],
    ///  [ −K SC, C²,    −K S², SC   ],
    ///  [ −SC,   −S²/K, C²,    SC/K ],
    ///  [ K S²,  −SC,   −K SC, C²   ]]
    /// ```
    ///
    /// (a rotation by `KL` times a focusing of strength `K²` in both planes); `R56 = −L/(v γ²)`.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NonPositiveLength`] for `L ≤ 0`; [`Error::ZeroCharge`];
    /// [`Error::Overflow`] for a reference at rest, or a rotation `KL` beyond 8192 rad in `f32`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let e = Motion::try_from_kinetic_energy(Species::<f64>::ELECTRON, 100.0e3)?;
    /// let m = TransferMap::try_solenoid(&e, 0.1, 0.01)?.to_array();
    /// assert!(m[0][2] != 0.0); // x and y are coupled
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_solenoid(motion: &Motion<T>, length_m: T, field_t: T) -> Result<Self, Error> {
        Self::solenoid(&Reference::new(motion), length_m, field_t)
    }

    /// [`try_solenoid`](Self::try_solenoid) at a reference computed once.
    #[inline(always)]
    pub(crate) fn solenoid(
        reference: &Reference<T>,
        length_m: T,
        field_t: T,
    ) -> Result<Self, Error> {
        let l = positive(length_m)?;
        let b = try_finite(field_t)?;
        let brho = reference.brho?;
        let kappa = fits(reference.sign * b / (brho + brho))?;
        let phi = kappa * l;
        let (s, c) = phi.sin_cos();
        let sl = l * sinc_of(phi, s); // S/K
        let (cc, sc, ss) = (c * c, s * c, s * s);
        let (sc_k, ss_k) = (sl * c, sl * s);
        let (ksc, kss) = (kappa * sc, kappa * ss);
        let z = T::ZERO;
        Self {
            transverse: [
                [cc, sc_k, sc, ss_k],
                [-ksc, cc, -kss, sc],
                [-sc, -ss_k, cc, sc_k],
                [kss, -sc, -ksc, cc],
            ],
            dispersion: [z; 4],
            time: [z; 4],
            time_per_delta: Self::straight_time(reference, l)?,
            delta_scale: T::ONE,
            coupled: true,
        }
        .checked()
    }

    /// A thin accelerating gap of voltage `V` (V): the reference gains `ΔT = Q V`; `x'` and `y'`
    /// scale by `p₀/p₁` (adiabatic damping), `δ` by `v₀p₀/(v₁p₁)` (the same energy gain for
    /// every particle). Returns the map and the reference after the gap.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::BelowRestEnergy`] when the gap takes more than the kinetic
    /// energy; [`Error::Overflow`] when it brings the reference to rest (no map exists), the
    /// reference starts at rest, or a factor `p₀/p₁`, `v₀p₀/(v₁p₁)` does not fit the precision
    /// (overflows, or underflows to zero).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e6)?;
    /// let (m, after) = TransferMap::try_gap(&p, 3.0e6)?;
    /// assert_eq!(after.kinetic_energy(), 4.0e6);
    /// // Non-relativistic: p ~ sqrt(T), so x' scales by 1/2 and delta by 1/4.
    /// let m = m.to_array();
    /// assert!((m[1][1] - 0.5).abs() < 1e-3 && (m[5][5] - 0.25).abs() < 1e-3);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[inline(always)]
    pub fn try_gap(motion: &Motion<T>, voltage_v: T) -> Result<(Self, Motion<T>), Error> {
        let (slope, delta, after) = Self::gap_parts(motion, voltage_v)?;
        let block = [[T::ONE, T::ZERO], [T::ZERO, slope]];
        let m = Self {
            delta_scale: delta,
            ..Self::uncoupled(block, block, T::ZERO)
        };
        Ok((m, after))
    }

    /// A gap's slope factor `p₀/p₁`, its `δ` factor `v₀p₀/(v₁p₁)` and the reference after it.
    #[inline(always)]
    pub(crate) fn gap_parts(motion: &Motion<T>, voltage_v: T) -> Result<(T, T, Motion<T>), Error> {
        let v = try_finite(voltage_v)?;
        let species = motion.species();
        let gain = species.charge() * v;
        if gain == T::ZERO {
            return Ok((T::ONE, T::ONE, *motion));
        }
        let kinetic = motion.kinetic_energy() + gain;
        if kinetic < T::ZERO {
            return Err(Error::BelowRestEnergy);
        }
        let after = Motion::try_from_kinetic_energy(species, kinetic)?;
        if motion.momentum() == T::ZERO || after.momentum() == T::ZERO {
            return Err(Error::Overflow);
        }
        let slope = motion.momentum() / after.momentum();
        // v p = Eρ |Q|: the ratio of the electric rigidities, each free of cancellation
        let delta = fits(motion.try_electric_rigidity()? / after.try_electric_rigidity()?)?;
        // a ratio that underflows to zero would make the map singular
        if slope == T::ZERO || delta == T::ZERO {
            return Err(Error::Overflow);
        }
        Ok((fits(slope)?, delta, after))
    }

    /// `Ok(self)` if every entry is finite and `R66 ≠ 0`, else [`Error::Overflow`] (a product of
    /// maps can overflow, or the product of many gaps' `R66` underflow, where no element does).
    ///
    /// # Errors
    /// [`Error::Overflow`] when an entry is infinite or NaN, or `R66` is zero.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::TransferMap;
    /// assert!(TransferMap::<f32>::IDENTITY.try_check().is_ok());
    /// ```
    pub fn try_check(self) -> Result<Self, Error> {
        self.checked()
    }

    #[inline]
    fn checked(self) -> Result<Self, Error> {
        // a sum is NaN when a term is NaN or two infinities meet, infinite when one is: finite
        // exactly when every entry is (written out: iterator chains cost on the chip)
        let [r0, r1, r2, r3] = self.transverse;
        let sum = |[a, b, c, d]: [T; 4]| a * T::ZERO + b * T::ZERO + c * T::ZERO + d * T::ZERO;
        let all = sum(r0)
            + sum(r1)
            + sum(r2)
            + sum(r3)
            + sum(self.dispersion)
            + sum(self.time)
            + (self.time_per_delta + self.delta_scale) * T::ZERO;
        // and R66 ≠ 0: the product of many gaps' factors may underflow (a singular map)
        if all == T::ZERO && self.delta_scale != T::ZERO {
            Ok(self)
        } else {
            Err(Error::Overflow)
        }
    }

    /// The map of `self` followed by `next` (apply `self` first): the matrix product
    /// `next · self`.
    ///
    /// Rounding: each entry is a sum of products, rounded once per term (the rounding scale is
    /// the product of the absolute values). The result may overflow to infinity for absurd
    /// lines; [`BeamLine`](crate::beamline::BeamLine)'s maps check for that.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e6)?;
    /// let two = TransferMap::try_drift(&p, 1.0)?.then(&TransferMap::try_drift(&p, 2.0)?);
    /// assert_eq!(two, TransferMap::try_drift(&p, 3.0)?);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn then(&self, next: &Self) -> Self {
        let mut out = *self;
        out.then_in_place(next);
        out
    }

    /// `self = next · self`, in place (no copy of the 26 numbers on the chip).
    #[inline(always)]
    pub(crate) fn then_in_place(&mut self, next: &Self) {
        // Written out with the structure in view (a loop over zeros costs several times more on
        // the chip): while neither map couples, only the diagonal 2×2 blocks are non-zero; the
        // sums keep the order of the full product, so the results are the same.
        let [
            [a00, a01, a02, a03],
            [a10, a11, a12, a13],
            [a20, a21, a22, a23],
            [a30, a31, a32, a33],
        ] = self.transverse;
        let [
            [b00, b01, b02, b03],
            [b10, b11, b12, b13],
            [b20, b21, b22, b23],
            [b30, b31, b32, b33],
        ] = next.transverse;
        let [d0, d1, d2, d3] = self.dispersion;
        let [e0, e1, e2, e3] = next.dispersion;
        let [t0, t1, t2, t3] = self.time;
        let [u0, u1, u2, u3] = next.time;
        let s = self.delta_scale;
        let z = T::ZERO;
        let coupled = self.coupled || next.coupled;
        let (transverse, carried) = if !coupled {
            (
                [
                    [b00 * a00 + b01 * a10, b00 * a01 + b01 * a11, z, z],
                    [b10 * a00 + b11 * a10, b10 * a01 + b11 * a11, z, z],
                    [z, z, b22 * a22 + b23 * a32, b22 * a23 + b23 * a33],
                    [z, z, b32 * a22 + b33 * a32, b32 * a23 + b33 * a33],
                ],
                [
                    b00 * d0 + b01 * d1,
                    b10 * d0 + b11 * d1,
                    b22 * d2 + b23 * d3,
                    b32 * d2 + b33 * d3,
                ],
            )
        } else {
            let row = |[p, q, r, w]: [T; 4]| {
                [
                    p * a00 + q * a10 + r * a20 + w * a30,
                    p * a01 + q * a11 + r * a21 + w * a31,
                    p * a02 + q * a12 + r * a22 + w * a32,
                    p * a03 + q * a13 + r * a23 + w * a33,
                ]
            };
            let dot = |[p, q, r, w]: [T; 4]| p * d0 + q * d1 + r * d2 + w * d3;
            let (r0, r1) = ([b00, b01, b02, b03], [b10, b11, b12, b13]);
            let (r2, r3) = ([b20, b21, b22, b23], [b30, b31, b32, b33]);
            (
                [row(r0), row(r1), row(r2), row(r3)],
                [dot(r0), dot(r1), dot(r2), dot(r3)],
            )
        };
        // time = t_b A + t_a: only dipoles have a time row (skipped for the other elements)
        let z4 = [z; 4];
        if next.time != z4 {
            self.time = [
                u0 * a00 + u1 * a10 + u2 * a20 + u3 * a30 + t0,
                u0 * a01 + u1 * a11 + u2 * a21 + u3 * a31 + t1,
                u0 * a02 + u1 * a12 + u2 * a22 + u3 * a32 + t2,
                u0 * a03 + u1 * a13 + u2 * a23 + u3 * a33 + t3,
            ];
            // R56 = t_b · d_a + R56_a + R56_b s_a
            self.time_per_delta = (u0 * d0 + u1 * d1 + u2 * d2 + u3 * d3)
                + self.time_per_delta
                + next.time_per_delta * s;
        } else {
            self.time_per_delta += next.time_per_delta * s;
        }
        let [c0, c1, c2, c3] = carried;
        self.transverse = transverse;
        // dispersion = B d_a + d_b s_a
        self.dispersion = if next.dispersion != z4 {
            [c0 + e0 * s, c1 + e1 * s, c2 + e2 * s, c3 + e3 * s]
        } else {
            carried
        };
        self.delta_scale = next.delta_scale * s;
        self.coupled = coupled;
    }

    /// `self = E · self` for an element `E` without coupling, dispersion or time row: the
    /// blocks `x`, `y` and `R56` (the same sums as [`then`](Self::then), fewer of them).
    #[inline(always)]
    pub(crate) fn then_blocks(&mut self, (x, y, r56): Blocks<T>) {
        let [[x00, x01], [x10, x11]] = x;
        let [[y00, y01], [y10, y11]] = y;
        self.time_per_delta += r56 * self.delta_scale;
        let [r0, r1, r2, r3] = self.transverse;
        let [d0, d1, d2, d3] = self.dispersion;
        let pair = |p: T, q: T, a: [T; 4], b: [T; 4]| {
            let [a0, a1, a2, a3] = a;
            let [b0, b1, b2, b3] = b;
            [
                p * a0 + q * b0,
                p * a1 + q * b1,
                p * a2 + q * b2,
                p * a3 + q * b3,
            ]
        };
        if self.coupled {
            self.transverse = [
                pair(x00, x01, r0, r1),
                pair(x10, x11, r0, r1),
                pair(y00, y01, r2, r3),
                pair(y10, y11, r2, r3),
            ];
        } else {
            let ([a0, a1, _, _], [b0, b1, _, _]) = (r0, r1);
            let ([_, _, c2, c3], [_, _, e2, e3]) = (r2, r3);
            let z = T::ZERO;
            self.transverse = [
                [x00 * a0 + x01 * b0, x00 * a1 + x01 * b1, z, z],
                [x10 * a0 + x11 * b0, x10 * a1 + x11 * b1, z, z],
                [z, z, y00 * c2 + y01 * e2, y00 * c3 + y01 * e3],
                [z, z, y10 * c2 + y11 * e2, y10 * c3 + y11 * e3],
            ];
        }
        self.dispersion = [
            x00 * d0 + x01 * d1,
            x10 * d0 + x11 * d1,
            y00 * d2 + y01 * d3,
            y10 * d2 + y11 * d3,
        ];
    }

    /// `self = G · self` for a gap: the rows of `x'` and `y'` scale by `slope`, `δ` by `delta`.
    #[inline(always)]
    pub(crate) fn then_gap(&mut self, slope: T, delta: T) {
        let [_, r1, _, r3] = &mut self.transverse;
        for a in r1.iter_mut().chain(r3.iter_mut()) {
            *a = slope * *a;
        }
        let [_, d1, _, d3] = &mut self.dispersion;
        *d1 = slope * *d1;
        *d3 = slope * *d3;
        self.delta_scale = delta * self.delta_scale;
    }

    /// `self = D · self` for a drift of length `l` and `R56 = r56`: `x += l x'`, `y += l y'` on
    /// every column (the same sums as [`then`](Self::then): the other terms are products by 1 and
    /// 0).
    #[inline(always)]
    pub(crate) fn then_drift(&mut self, (l, r56): (T, T)) {
        self.time_per_delta += r56 * self.delta_scale;
        let [
            [a0, a1, a2, a3],
            [b0, b1, b2, b3],
            [c0, c1, c2, c3],
            [e0, e1, e2, e3],
        ] = self.transverse;
        let [d0, d1, d2, d3] = self.dispersion;
        if self.coupled {
            self.transverse[0] = [a0 + l * b0, a1 + l * b1, a2 + l * b2, a3 + l * b3];
            self.transverse[2] = [c0 + l * e0, c1 + l * e1, c2 + l * e2, c3 + l * e3];
        } else {
            let z = T::ZERO;
            self.transverse[0] = [a0 + l * b0, a1 + l * b1, z, z];
            self.transverse[2] = [z, z, c2 + l * e2, c3 + l * e3];
        }
        self.dispersion = [d0 + l * d1, d1, d2 + l * d3, d3];
    }

    /// The state `(x, x', y, y', Δt, δ)` after the map.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e9)?;
    /// let out = TransferMap::try_drift(&p, 10.0)?.apply([0.0, 0.0, 0.0, 0.0, 0.0, 1.0e-3]);
    /// assert!(out[4] < 0.0); // a faster particle arrives earlier
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn apply(&self, v: [T; 6]) -> [T; 6] {
        let [x, xp, y, yp, dt, delta] = v;
        let u = [x, xp, y, yp];
        let row =
            |r: &[T; 4], d: T| r.iter().zip(&u).fold(T::ZERO, |s, (&a, &b)| s + a * b) + d * delta;
        let [r0, r1, r2, r3] = &self.transverse;
        let [d0, d1, d2, d3] = self.dispersion;
        [
            row(r0, d0),
            row(r1, d1),
            row(r2, d2),
            row(r3, d3),
            row(&self.time, self.time_per_delta) + dt,
            self.delta_scale * delta,
        ]
    }

    /// The full 6×6 matrix, rows and columns in `(x, x', y, y', Δt, δ)`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 1.0e6)?;
    /// let m = TransferMap::try_sector_dipole(&p, 1.0, 0.5, 0.0, 0.0)?.to_array();
    /// assert!((m[0][5] - 2.0 * (1.0 - 0.5_f64.cos())).abs() < 1e-15); // rho (1 - cos theta)
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn to_array(&self) -> [[T; 6]; 6] {
        let mut m = [[T::ZERO; 6]; 6];
        for (i, (row, src)) in m.iter_mut().zip(&self.transverse).enumerate() {
            row[..4].copy_from_slice(src);
            row[5] = column(&self.dispersion, i);
        }
        let [.., time_row, delta_row] = &mut m;
        time_row[..4].copy_from_slice(&self.time);
        time_row[4] = T::ONE;
        time_row[5] = self.time_per_delta;
        delta_row[5] = self.delta_scale;
        m
    }

    /// True when the map may couple the planes (it contains a solenoid).
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::TransferMap;
    /// assert!(!TransferMap::<f32>::IDENTITY.is_coupled());
    /// ```
    #[must_use]
    #[inline]
    pub fn is_coupled(&self) -> bool {
        self.coupled
    }
}

impl<T: Real> TransferMap<T> {
    /// The periodic solution of a cell whose map is `self`: per plane `cos μ = (R11 + R22)/2`,
    /// `β = R12/sin μ`, `α = (R11 − R22)/(2 sin μ)` (the sign of `sin μ` that makes `β > 0`), and
    /// the periodic dispersion `D = (I − R)⁻¹ R₆` of the 2×2 block.
    ///
    /// # Errors
    /// [`Error::Coupled`] for a cell that couples the planes (a solenoid); [`Error::Unstable`]
    /// when `|R11 + R22| ≥ 2` or `R12 = 0` in a plane, or the cell changes the energy (`R66 ≠ 1`:
    /// no periodic solution); [`Error::Overflow`] when a result does not fit (or `β` underflows
    /// to zero).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Motion, Species};
    /// use fourforce::transfer::TransferMap;
    /// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 100.0e6)?;
    /// let brho = p.try_magnetic_rigidity()?;
    /// // An invented thin-lens cell, f = 2.5 m, drifts of 3 m: cos mu = 1 - L^2/(2 f^2) = 0.28.
    /// let half = TransferMap::try_thin_quadrupole(&p, brho / 5.0)?;
    /// let d = TransferMap::try_drift(&p, 3.0)?;
    /// let middle = TransferMap::try_thin_quadrupole(&p, -brho / 2.5)?;
    /// let cell = half.then(&d).then(&middle).then(&d).then(&half).try_periodic()?;
    /// assert!((cell.phase_advance_x_rad.cos() - 0.28).abs() < 1e-14);
    /// let drift = TransferMap::try_drift(&p, 1.0)?;
    /// assert_eq!(drift.try_periodic().err(), Some(Error::Unstable)); // trace = 2
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_periodic(&self) -> Result<CellOptics<T>, Error> {
        if self.coupled {
            return Err(Error::Coupled);
        }
        if self.delta_scale != T::ONE {
            return Err(Error::Unstable);
        }
        let (x, mu_x, dx) = periodic_plane(&self.transverse, &self.dispersion, 0)?;
        let (y, mu_y, dy) = periodic_plane(&self.transverse, &self.dispersion, 2)?;
        Ok(CellOptics {
            x,
            y,
            dispersion: [dx[0], dx[1], dy[0], dy[1]],
            phase_advance_x_rad: mu_x,
            phase_advance_y_rad: mu_y,
        })
    }
}

/// The periodic Twiss parameters, phase advance and dispersion of the plane at `base`.
fn periodic_plane<T: Real>(
    a: &[[T; 4]; 4],
    d: &[T; 4],
    base: usize,
) -> Result<(Twiss<T>, T, [T; 2]), Error> {
    let (m11, m12) = (entry(a, base, base), entry(a, base, base + 1));
    let (m21, m22) = (entry(a, base + 1, base), entry(a, base + 1, base + 1));
    let half_trace = (m11 + m22) * T::HALF;
    // R12 = 0 with det R = 1 means |trace| = |R11 + 1/R11| ≥ 2: unstable however the trace
    // rounded
    if !half_trace.is_finite() || half_trace.abs() >= T::ONE || m12 == T::ZERO {
        return Err(Error::Unstable);
    }
    // sin μ with the sign of R12, so that β = R12/sin μ > 0
    let sin_mu = ((T::ONE - half_trace) * (T::ONE + half_trace))
        .sqrt()
        .copysign(m12);
    let beta = fits(m12 / sin_mu)?;
    let alpha = fits((m11 - m22) * T::HALF / sin_mu)?;
    if beta == T::ZERO {
        // R12/sin μ underflowed
        return Err(Error::Overflow);
    }
    let mut mu = sin_mu.atan2(half_trace);
    if mu < T::ZERO {
        mu = mu + T::PI + T::PI;
    }
    // (I − R) D = R₆: det(I − R) = 2 − trace (det R = 1)
    let det = (T::ONE - half_trace) * T::TWO;
    let (d1, d2) = (column(d, base), column(d, base + 1));
    let dispersion = [
        fits(((T::ONE - m22) * d1 + m12 * d2) / det)?,
        fits((m21 * d1 + (T::ONE - m11) * d2) / det)?,
    ];
    Ok((Twiss::try_new(beta, alpha)?, mu, dispersion))
}

/// The periodic solution of a cell ([`TransferMap::try_periodic`]).
///
/// # Examples
/// ```
/// use fourforce::{Motion, Species};
/// use fourforce::transfer::TransferMap;
/// let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 100.0e6)?;
/// let q = TransferMap::try_thin_quadrupole(&p, 0.3)?;
/// let cell = q.then(&TransferMap::try_drift(&p, 2.0)?)
///     .then(&TransferMap::try_thin_quadrupole(&p, -0.3)?)
///     .then(&TransferMap::try_drift(&p, 2.0)?)
///     .try_periodic()?;
/// assert!(cell.x.beta() > 0.0 && cell.dispersion == [0.0; 4]);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct CellOptics<T: Real> {
    /// Horizontal Twiss parameters at the cell's start (and end).
    pub x: Twiss<T>,
    /// Vertical Twiss parameters.
    pub y: Twiss<T>,
    /// Periodic dispersion `(D_x [m], D_x' [rad], D_y [m], D_y' [rad])`.
    pub dispersion: [T; 4],
    /// Horizontal phase advance per cell `μ_x` in rad, in `(0, 2π)`.
    pub phase_advance_x_rad: T,
    /// Vertical phase advance per cell `μ_y` in rad, in `(0, 2π)`.
    pub phase_advance_y_rad: T,
}

/// Courant–Snyder (Twiss) parameters of one plane: `β` (m), `α`, and `γ = (1 + α²)/β` (1/m).
///
/// # Examples
/// ```
/// use fourforce::transfer::Twiss;
/// let t = Twiss::try_new(2.0_f64, -1.0)?;
/// assert_eq!(t.gamma(), 1.0);
/// assert!(Twiss::try_new(0.0_f64, 0.0).is_err());
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Twiss<T: Real> {
    beta_m: T,
    alpha: T,
}

impl<T: Real> Twiss<T> {
    /// Twiss parameters from `β` (m, > 0) and `α`.
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NonPositiveLength`] for `β ≤ 0`; [`Error::Overflow`] when
    /// `γ = (1 + α²)/β` does not fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, transfer::Twiss};
    /// assert_eq!(Twiss::try_new(-1.0_f32, 0.0), Err(Error::NonPositiveLength));
    /// ```
    pub fn try_new(beta_m: T, alpha: T) -> Result<Self, Error> {
        let beta_m = positive(beta_m)?;
        let alpha = try_finite(alpha)?;
        // γ is read on demand: it must fit, as β and α do
        fits((T::ONE + alpha * alpha) / beta_m)?;
        Ok(Self { beta_m, alpha })
    }

    /// `β` in m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::Twiss;
    /// assert_eq!(Twiss::try_new(3.0_f32, 0.5)?.beta(), 3.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn beta(&self) -> T {
        self.beta_m
    }

    /// `α = −β'/2`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::Twiss;
    /// assert_eq!(Twiss::try_new(3.0_f32, 0.5)?.alpha(), 0.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn alpha(&self) -> T {
        self.alpha
    }

    /// `γ = (1 + α²)/β` in 1/m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::Twiss;
    /// assert_eq!(Twiss::try_new(4.0_f32, 1.0)?.gamma(), 0.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn gamma(&self) -> T {
        (T::ONE + self.alpha * self.alpha) / self.beta_m
    }
}

/// A beam at one place of a line: the second moments `Σ` of its betatron part in
/// `(x, x', y, y')` (m², m·rad, rad²), its dispersion `(D_x, D_x', D_y, D_y')` (m, rad) and its rms
/// momentum spread `σ_δ` (see [Envelopes](self#envelopes)).
///
/// # Examples
/// ```
/// use fourforce::{Motion, Species};
/// use fourforce::transfer::{Envelope, TransferMap, Twiss};
/// let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 10.0e6)?;
/// let waist = Twiss::try_new(1.0, 0.0)?;
/// // 1 mm mrad in each plane, 1e-3 momentum spread, no dispersion at the start
/// let beam = Envelope::try_new(waist, waist, [0.0; 4], 1.0e-6, 1.0e-6, 1.0e-3)?;
/// let after = beam.try_through(&TransferMap::try_drift(&p, 1.0)?)?;
/// // beta(s) = beta0 + s^2/beta0 = 2 m: size sqrt(2e-6) m
/// assert!((after.size_x() - 2.0e-6_f64.sqrt()).abs() < 1e-18);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Envelope<T: Real> {
    sigma: [[T; 4]; 4],
    dispersion: [T; 4],
    momentum_spread: T,
}

impl<T: Real> Envelope<T> {
    /// A beam of emittances `ε_x`, `ε_y` (m·rad, geometric, > 0) whose betatron part has the
    /// Twiss parameters `x`, `y`, with dispersion `(D_x, D_x', D_y, D_y')` and momentum spread
    /// `σ_δ ≥ 0`: `Σ = ε_x [[β, −α], [−α, γ]] ⊕ ε_y [[β, −α], [−α, γ]]`.
    ///
    /// For the size of a beam's edge rather than its rms, give the edge's emittance and spread
    /// (for `n` standard deviations, `n²ε` and `n σ_δ`).
    ///
    /// # Errors
    /// [`Error::NonFinite`]; [`Error::NonPositiveEmittance`] for `ε ≤ 0`;
    /// [`Error::NegativeMagnitude`] for `σ_δ < 0`; [`Error::Overflow`] when a moment does not fit
    /// the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, transfer::{Envelope, Twiss}};
    /// let t = Twiss::try_new(1.0_f32, 0.0)?;
    /// assert_eq!(Envelope::try_new(t, t, [0.0; 4], 0.0, 1.0e-6, 0.0), Err(Error::NonPositiveEmittance));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_new(
        x: Twiss<T>,
        y: Twiss<T>,
        dispersion: [T; 4],
        emittance_x_m: T,
        emittance_y_m: T,
        momentum_spread: T,
    ) -> Result<Self, Error> {
        for e in [emittance_x_m, emittance_y_m] {
            if try_finite(e)? <= T::ZERO {
                return Err(Error::NonPositiveEmittance);
            }
        }
        if try_finite(momentum_spread)? < T::ZERO {
            return Err(Error::NegativeMagnitude);
        }
        for d in dispersion {
            try_finite(d)?;
        }
        let (ex, ey) = (emittance_x_m, emittance_y_m);
        let (ax, ay) = (-x.alpha * ex, -y.alpha * ey);
        let z = T::ZERO;
        let sigma = [
            [x.beta_m * ex, ax, z, z],
            [ax, x.gamma() * ex, z, z],
            [z, z, y.beta_m * ey, ay],
            [z, z, ay, y.gamma() * ey],
        ];
        let envelope = Self {
            sigma,
            dispersion,
            momentum_spread,
        };
        envelope.checked()
    }

    /// The lattice functions alone: unit emittances (1 m·rad) and no momentum spread, so that
    /// the moments carry `β`, `α`, `γ` and the sizes read `√β`.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite dispersion.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(4.0_f64, 0.0)?;
    /// assert_eq!(Envelope::try_lattice(t, t, [0.0; 4])?.size_x(), 2.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_lattice(x: Twiss<T>, y: Twiss<T>, dispersion: [T; 4]) -> Result<Self, Error> {
        Self::try_new(x, y, dispersion, T::ONE, T::ONE, T::ZERO)
    }

    fn checked(self) -> Result<Self, Error> {
        let all = self.sigma.iter().flatten().chain(self.dispersion.iter());
        // the moments, and what the accessors compute from them (sizes, emittances)
        let derived = [
            self.size(0),
            self.size(2),
            self.emittance_squared(0),
            self.emittance_squared(2),
        ];
        if all
            .chain(derived.iter())
            .fold(self.momentum_spread.is_finite(), |ok, x| {
                ok && x.is_finite()
            })
        {
            Ok(self)
        } else {
            Err(Error::Overflow)
        }
    }

    /// The beam after `map`: `Σ → A Σ Aᵀ`, `D → (A D + R₆)/R66`, `σ_δ → |R66| σ_δ`.
    ///
    /// # Errors
    /// [`Error::Overflow`] when a moment does not fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Motion, Species};
    /// use fourforce::transfer::{Envelope, TransferMap, Twiss};
    /// let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 10.0e6)?;
    /// let t = Twiss::try_new(2.0, 0.0)?;
    /// let e = Envelope::try_lattice(t, t, [0.0; 4])?;
    /// let bend = TransferMap::try_sector_dipole(&p, 1.0, 0.2, 0.0, 0.0)?;
    /// let d = e.try_through(&bend)?.dispersion();
    /// assert!((d[0] - 5.0 * (1.0 - 0.2_f32.cos())).abs() < 1e-6); // R16
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_through(&self, map: &TransferMap<T>) -> Result<Self, Error> {
        let a = &map.transverse;
        // A Σ
        let mut a_sigma = [[T::ZERO; 4]; 4];
        for (row, a_row) in a_sigma.iter_mut().zip(a) {
            for (j, v) in row.iter_mut().enumerate() {
                *v = a_row
                    .iter()
                    .zip(&self.sigma)
                    .fold(T::ZERO, |s, (&aik, s_row)| s + aik * column(s_row, j));
            }
        }
        // (A Σ) Aᵀ
        let mut sigma = [[T::ZERO; 4]; 4];
        for (row, left) in sigma.iter_mut().zip(&a_sigma) {
            for (v, a_row) in row.iter_mut().zip(a) {
                *v = left
                    .iter()
                    .zip(a_row)
                    .fold(T::ZERO, |s, (&l, &r)| s + l * r);
            }
        }
        let s = map.delta_scale;
        let mut dispersion = [T::ZERO; 4];
        for ((d, a_row), &r6) in dispersion.iter_mut().zip(a).zip(&map.dispersion) {
            let carried = a_row
                .iter()
                .zip(&self.dispersion)
                .fold(T::ZERO, |sum, (&aik, &dk)| sum + aik * dk);
            *d = (carried + r6) / s;
        }
        Self {
            sigma,
            dispersion,
            momentum_spread: self.momentum_spread * s.abs(),
        }
        .checked()
    }

    /// The beam size `√(Σ₁₁ + (D_x σ_δ)²) = √(β_x ε_x + (D_x σ_δ)²)` in m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(4.0_f64, 0.0)?;
    /// let e = Envelope::try_new(t, t, [0.3, 0.0, 0.0, 0.0], 1.0e-6, 1.0e-6, 1.0e-2)?;
    /// assert!((e.size_x() - (4.0e-6_f64 + 9.0e-6).sqrt()).abs() < 1e-18);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn size_x(&self) -> T {
        self.size(0)
    }

    /// The beam size `√(Σ₃₃ + (D_y σ_δ)²)` in m.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(4.0_f64, 0.0)?;
    /// assert_eq!(Envelope::try_new(t, t, [0.0; 4], 1.0, 1.0, 0.0)?.size_y(), 2.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn size_y(&self) -> T {
        self.size(2)
    }

    fn size(&self, i: usize) -> T {
        let d = column(&self.dispersion, i) * self.momentum_spread;
        (entry(&self.sigma, i, i) + d * d).sqrt()
    }

    /// The projected emittance `√(Σ₁₁Σ₂₂ − Σ₁₂²)` of the horizontal plane in m·rad (the
    /// emittance given, times the adiabatic damping `p₀/p`, in a line without coupling).
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(4.0_f64, 1.0)?;
    /// let e = Envelope::try_new(t, t, [0.0; 4], 2.0e-6, 1.0e-6, 0.0)?;
    /// assert!((e.emittance_x() / 2.0e-6 - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn emittance_x(&self) -> T {
        self.emittance(0)
    }

    /// The projected emittance of the vertical plane in m·rad.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(4.0_f64, 1.0)?;
    /// let e = Envelope::try_new(t, t, [0.0; 4], 2.0e-6, 1.0e-6, 0.0)?;
    /// assert!((e.emittance_y() / 1.0e-6 - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    pub fn emittance_y(&self) -> T {
        self.emittance(2)
    }

    fn emittance(&self, i: usize) -> T {
        self.emittance_squared(i).max(T::ZERO).sqrt()
    }

    /// `Σᵢᵢ Σᵢ₊₁ᵢ₊₁ − Σᵢᵢ₊₁²`: not finite when a product does not fit.
    fn emittance_squared(&self, i: usize) -> T {
        let (a, b, c) = (
            entry(&self.sigma, i, i),
            entry(&self.sigma, i, i + 1),
            entry(&self.sigma, i + 1, i + 1),
        );
        a * c - b * b
    }

    /// The horizontal Twiss parameters of the projected moments: `β = Σ₁₁/ε`, `α = −Σ₁₂/ε`.
    ///
    /// # Errors
    /// [`Error::NonPositiveEmittance`] when the projected emittance has rounded to zero;
    /// [`Error::Overflow`] when `β`, `α` or `γ` does not fit the precision.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(4.0_f64, 1.0)?;
    /// let e = Envelope::try_new(t, t, [0.0; 4], 2.0e-6, 1.0e-6, 0.0)?;
    /// assert!((e.try_twiss_x()?.beta() - 4.0).abs() < 1e-14);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_twiss_x(&self) -> Result<Twiss<T>, Error> {
        self.twiss(0)
    }

    /// The vertical Twiss parameters of the projected moments.
    ///
    /// # Errors
    /// As [`try_twiss_x`](Self::try_twiss_x).
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(4.0_f64, 1.0)?;
    /// let e = Envelope::try_lattice(t, t, [0.0; 4])?;
    /// assert!((e.try_twiss_y()?.alpha() - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_twiss_y(&self) -> Result<Twiss<T>, Error> {
        self.twiss(2)
    }

    fn twiss(&self, i: usize) -> Result<Twiss<T>, Error> {
        let e = self.emittance(i);
        if e <= T::ZERO {
            return Err(Error::NonPositiveEmittance);
        }
        // a quotient that does not fit (or underflows to β = 0) is an overflow, not a bad input
        let beta = fits(entry(&self.sigma, i, i) / e)?;
        let alpha = fits(-entry(&self.sigma, i, i + 1) / e)?;
        if beta <= T::ZERO {
            return Err(Error::Overflow);
        }
        Twiss::try_new(beta, alpha)
    }

    /// The dispersion `(D_x [m], D_x' [rad], D_y [m], D_y' [rad])`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(1.0_f32, 0.0)?;
    /// assert_eq!(Envelope::try_lattice(t, t, [0.5, 0.0, 0.0, 0.0])?.dispersion()[0], 0.5);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn dispersion(&self) -> [T; 4] {
        self.dispersion
    }

    /// The rms momentum spread `σ_δ`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::transfer::{Envelope, Twiss};
    /// let t = Twiss::try_new(1.0_f32, 0.0)?;
    /// assert_eq!(Envelope::try_new(t, t, [0.0; 4], 1.0, 1.0, 1.0e-3)?.momentum_spread(), 1.0e-3);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn momentum_spread(&self) -> T {
        self.momentum_spread
    }
}

/// `a[i][j]`, 0 outside (never happens for the fixed indices used here).
#[inline]
fn entry<T: Real>(a: &[[T; 4]; 4], i: usize, j: usize) -> T {
    a.get(i).and_then(|r| r.get(j)).copied().unwrap_or(T::ZERO)
}

/// `v[j]`, 0 outside.
#[inline]
fn column<T: Real>(v: &[T; 4], j: usize) -> T {
    v.get(j).copied().unwrap_or(T::ZERO)
}

/// A finite length ≥ 0.
fn nonnegative<T: Real>(length_m: T) -> Result<T, Error> {
    if try_finite(length_m)? < T::ZERO {
        Err(Error::NonPositiveLength)
    } else {
        Ok(length_m)
    }
}

/// A finite length > 0.
fn positive<T: Real>(length_m: T) -> Result<T, Error> {
    if try_finite(length_m)? <= T::ZERO {
        Err(Error::NonPositiveLength)
    } else {
        Ok(length_m)
    }
}

/// A finite pole-face angle below π/2 in magnitude.
fn edge_angle<T: Real>(angle_rad: T) -> Result<T, Error> {
    if try_finite(angle_rad)?.abs() >= T::PI * T::HALF {
        Err(Error::AngleOutOfRange)
    } else {
        Ok(angle_rad)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::Species;

    #[test]
    fn one_minus_sinc_series_meets_the_direct_form_at_the_threshold() {
        for x in [1.9_f64, 1.99, 2.0, -1.999] {
            let direct = 1.0 - x.sin() / x;
            assert!(
                (one_minus_sinc(x) / direct - 1.0).abs() < 4.0 * f64::EPSILON,
                "{x}"
            );
        }
        // tiny argument: x²/6 exactly enough
        assert!((one_minus_sinc(1.0e-10_f64) / (1.0e-20 / 6.0) - 1.0).abs() < 2.0 * f64::EPSILON);
        let y = 0.5_f32;
        let exact = 1.0 - 0.5_f64.sin() / 0.5;
        assert!((f64::from(one_minus_sinc(y)) / exact - 1.0).abs() < 2.0 * f64::from(f32::EPSILON));
    }

    #[test]
    fn uncoupled_and_coupled_products_agree() {
        let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 5.0e6).unwrap();
        let q = TransferMap::try_quadrupole(&p, 0.2, 3.0).unwrap();
        let b = TransferMap::try_sector_dipole(&p, 1.0, 0.3, 0.1, -0.05).unwrap();
        let mut forced = q;
        forced.coupled = true;
        assert_eq!(forced.then(&b).to_array(), q.then(&b).to_array());
    }
}
