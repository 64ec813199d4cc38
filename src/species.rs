//! Particle species: rest energy and charge.
//!
//! A [`Species`] is the pair (rest energy `mc²` in eV, charge `Q` in units of the elementary
//! charge `e`). The named particles are `const` values built from the CODATA 2018 rest energies;
//! any ion is built from its rest energy and charge state, or from the neutral atom's mass.
//!
//! # For firmware authors
//! The named species are `const`, and a custom one can be built in a `const` with a check at
//! compile time (`Species::<f32>::try_new_const`): put the species of your machine in a `static` and
//! pass it by value (two floats).
//!
//! # Examples
//! ```
//! use fourforce::Species;
//! const BEAM: Species<f32> = Species::PROTON;
//! assert_eq!(BEAM.charge(), 1.0);
//! assert_eq!(BEAM.rest_energy(), 938_272_064.0); // CODATA 2018, rounded to f32
//! ```

use crate::{Error, Real};

/// A particle species: rest energy `mc²` (eV) and charge `Q` (units of `e`, with sign).
///
/// Invariant: the rest energy is finite and at least [`MIN_REST_ENERGY`](Self::MIN_REST_ENERGY)
/// (1 eV), the charge finite (zero allowed). Every way to build one checks it: the named
/// constants, [`try_new`](Self::try_new), [`try_from_atom`](Self::try_from_atom), and the `const`
/// `Species::<f32>::try_new_const` / `Species::<f64>::try_new_const` for `const` tables. So no
/// state of motion built from a species can have `γ < 1` or a non-finite `γ` for lack of a check
/// here.
///
/// # Examples
/// ```
/// use fourforce::Species;
/// let carbon6 = Species::<f64>::try_new(11_174_864_265.448, 6.0)?;
/// assert_eq!(carbon6.charge(), 6.0);
/// # Ok::<(), fourforce::Error>(())
/// ```
///
/// There is no unchecked constructor:
/// ```compile_fail
/// let massless = fourforce::Species::<f32>::new(0.0, 1.0);
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Species<T: Real> {
    rest_energy: T,
    charge: T,
}

impl<T: Real> Species<T> {
    /// Electron: `mₑc²` = 0.510 998 950 00 MeV (CODATA 2018), Q = -1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::ELECTRON.rest_energy(), 510_998.95);
    /// ```
    pub const ELECTRON: Self = Self::constant(T::ELECTRON_REST_ENERGY, T::NEG_ONE);
    /// Positron: the electron's rest energy, Q = +1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::POSITRON.charge(), 1.0);
    /// ```
    pub const POSITRON: Self = Self::constant(T::ELECTRON_REST_ENERGY, T::ONE);
    /// Proton: `mₚc²` = 938.272 088 16 MeV (CODATA 2018), Q = +1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::PROTON.rest_energy(), 938_272_088.16);
    /// ```
    pub const PROTON: Self = Self::constant(T::PROTON_REST_ENERGY, T::ONE);
    /// Antiproton: the proton's rest energy, Q = -1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::ANTIPROTON.charge(), -1.0);
    /// ```
    pub const ANTIPROTON: Self = Self::constant(T::PROTON_REST_ENERGY, T::NEG_ONE);
    /// Negative muon: `m_μc²` = 105.658 3755 MeV (CODATA 2018), Q = -1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::MUON.rest_energy(), 105_658_375.5);
    /// ```
    pub const MUON: Self = Self::constant(T::MUON_REST_ENERGY, T::NEG_ONE);
    /// Positive muon (antimuon): the muon's rest energy, Q = +1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::ANTIMUON.charge(), 1.0);
    /// ```
    pub const ANTIMUON: Self = Self::constant(T::MUON_REST_ENERGY, T::ONE);
    /// Deuteron: `m_dc²` = 1875.612 942 57 MeV (CODATA 2018), Q = +1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::DEUTERON.rest_energy(), 1_875_612_942.57);
    /// ```
    pub const DEUTERON: Self = Self::constant(T::DEUTERON_REST_ENERGY, T::ONE);
    /// Triton: `m_tc²` = 2808.921 132 98 MeV (CODATA 2018), Q = +1.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::TRITON.rest_energy(), 2_808_921_132.98);
    /// ```
    pub const TRITON: Self = Self::constant(T::TRITON_REST_ENERGY, T::ONE);
    /// Helion (³He²⁺): `m_hc²` = 2808.391 607 43 MeV (CODATA 2018), Q = +2.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::HELION.charge(), 2.0);
    /// ```
    pub const HELION: Self = Self::constant(T::HELION_REST_ENERGY, T::TWO);
    /// Alpha particle (⁴He²⁺): `m_αc²` = 3727.379 4066 MeV (CODATA 2018), Q = +2.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::ALPHA.rest_energy(), 3_727_379_406.6);
    /// ```
    pub const ALPHA: Self = Self::constant(T::ALPHA_REST_ENERGY, T::TWO);

    /// Neutron: `m_nc²` = 939.565 420 52 MeV (CODATA 2018), Q = 0 (it has a speed and a
    /// momentum, but no rigidity and no deflection: those refuse it with [`Error::ZeroCharge`]).
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f64>::NEUTRON.rest_energy(), 939_565_420.52);
    /// assert_eq!(Species::<f64>::NEUTRON.charge(), 0.0);
    /// ```
    pub const NEUTRON: Self = Self::constant(T::NEUTRON_REST_ENERGY, T::ZERO);

    /// A named species from its published values; private, so that every species outside this
    /// module comes through a check.
    const fn constant(rest_energy: T, charge: T) -> Self {
        Self {
            rest_energy,
            charge,
        }
    }

    /// The smallest rest energy [`try_new`](Self::try_new) accepts: 1 eV.
    ///
    /// Far below any charged particle's (the electron's is 511 keV); below it the states of
    /// motion lose their consistency to underflow (`m²`, `βγ·m`), in `f32` first.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f32>::MIN_REST_ENERGY, 1.0);
    /// ```
    pub const MIN_REST_ENERGY: T = T::ONE;

    /// Builds a species from a rest energy (eV) and a charge (units of `e`), checking both.
    ///
    /// A zero charge is accepted (a neutral species has a speed and a momentum); the quantities
    /// that need a charge (rigidities, deflections) refuse it with [`Error::ZeroCharge`].
    ///
    /// # Errors
    /// [`Error::NonFinite`] if either value is NaN or infinite; [`Error::NonPositiveMass`] if the
    /// rest energy is zero or negative; [`Error::RestEnergyTooSmall`] if it is below
    /// [`MIN_REST_ENERGY`](Self::MIN_REST_ENERGY) (1 eV).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, Species};
    /// assert!(Species::try_new(1.0e9_f32, 1.0).is_ok());
    /// assert_eq!(Species::try_new(-1.0_f32, 1.0), Err(Error::NonPositiveMass));
    /// assert_eq!(Species::try_new(1.0e-20_f32, 1.0), Err(Error::RestEnergyTooSmall));
    /// ```
    pub fn try_new(rest_energy_ev: T, charge: T) -> Result<Self, Error> {
        if !rest_energy_ev.is_finite() || !charge.is_finite() {
            return Err(Error::NonFinite);
        }
        if rest_energy_ev <= T::ZERO {
            return Err(Error::NonPositiveMass);
        }
        if rest_energy_ev < Self::MIN_REST_ENERGY {
            return Err(Error::RestEnergyTooSmall);
        }
        Ok(Self::constant(rest_energy_ev, charge))
    }

    /// Builds a positive ion from the neutral atom's mass with `electrons_removed` electrons taken
    /// away.
    ///
    /// `mc² = A_r · m_uc² − n · mₑc² + B` in eV, with `A_r` the atom's relative mass in u,
    /// `n = electrons_removed` and `B` the total binding energy (eV) of the removed electrons
    /// (the sum of their ionisation energies). Charge `Q = n`.
    ///
    /// What is neglected: `B` if you pass 0. It is 1030 eV for a bare carbon ion (about 9e-8 of
    /// its rest energy, below f32 resolution but far above f64's) and grows to about 0.8 MeV for a
    /// bare uranium ion (4e-6); pass it when f64 accuracy matters.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite mass or binding energy; [`Error::Overflow`] when
    /// the rest energy of finite inputs does not fit the precision; [`Error::NonPositiveMass`]
    /// when the result is not positive (for example a zero atomic mass);
    /// [`Error::RestEnergyTooSmall`] when it is positive but below 1 eV.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// // Bare carbon-12: B = 1030.108 eV (NIST Atomic Spectra Database, from memory).
    /// let c6 = Species::<f64>::try_from_atom(12.0, 6, 1030.108)?;
    /// assert!((c6.rest_energy() / 11_174_864_265.448 - 1.0).abs() < 1e-15);
    /// assert_eq!(c6.charge(), 6.0);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_from_atom(
        atomic_mass_u: T,
        electrons_removed: u32,
        binding_energy_ev: T,
    ) -> Result<Self, Error> {
        if !atomic_mass_u.is_finite() || !binding_energy_ev.is_finite() {
            return Err(Error::NonFinite);
        }
        let n = T::from_u32(electrons_removed);
        let rest = atomic_mass_u * T::ATOMIC_MASS_UNIT_ENERGY - n * T::ELECTRON_REST_ENERGY
            + binding_energy_ev;
        if !rest.is_finite() {
            return Err(Error::Overflow);
        }
        Self::try_new(rest, n)
    }

    /// Rest energy `mc²` in eV.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f32>::ELECTRON.rest_energy(), 510_998.94);
    /// ```
    #[must_use]
    #[inline]
    pub const fn rest_energy(self) -> T {
        self.rest_energy
    }

    /// Charge `Q` in units of the elementary charge, with sign.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// assert_eq!(Species::<f32>::ELECTRON.charge(), -1.0);
    /// ```
    #[must_use]
    #[inline]
    pub const fn charge(self) -> T {
        self.charge
    }

    /// Charge-to-mass ratio `Q / mc²` in 1/V (units of `e` per eV), the factor of the equation of
    /// motion in scaled units.
    ///
    /// # Examples
    /// ```
    /// use fourforce::Species;
    /// let p = Species::<f64>::PROTON;
    /// // times c² gives q/m in C/kg: 9.578 833 156e7 (CODATA 2018).
    /// let q_over_m = p.charge_over_rest_energy() * 299_792_458.0_f64.powi(2);
    /// assert!((q_over_m / 95_788_331.5595 - 1.0).abs() < 1e-11);
    /// ```
    #[must_use]
    #[inline]
    pub fn charge_over_rest_energy(self) -> T {
        self.charge / self.rest_energy
    }
}

/// The `const` constructor of one precision (float comparisons in `const fn` need a concrete
/// type).
macro_rules! const_constructor {
    ($t:ty) => {
        impl Species<$t> {
            /// [`try_new`](Self::try_new) as a `const fn`, for `const` tables of custom species:
            /// the same checks, in the same order, with the same errors.
            ///
            /// # Errors
            /// As [`try_new`](Self::try_new).
            ///
            /// # Examples
            /// ```
            /// use fourforce::{Error, Species};
            #[doc = concat!("// An invented singly charged ion of 40 GeV rest energy, checked at compile time.")]
            #[doc = concat!("const ION: Species<", stringify!($t), "> = match Species::<", stringify!($t), ">::try_new_const(40.0e9, 1.0) {")]
            ///     Ok(s) => s,
            ///     Err(_) => panic!("not a species"),
            /// };
            /// assert_eq!(ION.rest_energy(), 40.0e9);
            #[doc = concat!("assert_eq!(Species::<", stringify!($t), ">::try_new_const(0.0, 1.0), Err(Error::NonPositiveMass));")]
            /// ```
            pub const fn try_new_const(rest_energy_ev: $t, charge: $t) -> Result<Self, Error> {
                if !rest_energy_ev.is_finite() || !charge.is_finite() {
                    return Err(Error::NonFinite);
                }
                if rest_energy_ev <= 0.0 {
                    return Err(Error::NonPositiveMass);
                }
                if rest_energy_ev < 1.0 {
                    return Err(Error::RestEnergyTooSmall);
                }
                Ok(Self::constant(rest_energy_ev, charge))
            }
        }
    };
}
const_constructor!(f32);
const_constructor!(f64);

#[cfg(test)]
mod tests {
    use super::*;

    static TABLE: [Species<f32>; 2] = [Species::ELECTRON, Species::ALPHA];

    #[test]
    fn a_static_holds_species() {
        assert_eq!(TABLE[1].charge(), 2.0);
    }

    #[test]
    fn bare_carbon_matches_published_rest_energy() {
        // 12 m_u c^2 - 6 m_e c^2 + B_e = 11174.864265448
        // MeV, CODATA 2018 with B_e = 1030.108 eV (NIST ASD, from memory).
        let c6 = Species::<f64>::try_from_atom(12.0, 6, 1030.108).unwrap();
        assert!((c6.rest_energy() / 11_174_864_265.448 - 1.0).abs() < 2e-15);
        let c6f = Species::<f32>::try_from_atom(12.0, 6, 1030.108).unwrap();
        assert!((f64::from(c6f.rest_energy()) / 11_174_864_265.448 - 1.0).abs() < 2.0 * 1.2e-7);
    }

    #[test]
    fn the_const_constructor_agrees_with_try_new() {
        for (m, q) in [
            (1.0e9, 1.0),
            (0.0, 1.0),
            (-5.0, 1.0),
            (f64::NAN, 1.0),
            (0.5, 1.0),
            (1.0, f64::INFINITY),
            (1.0, 0.0),
        ] {
            assert_eq!(Species::<f64>::try_new_const(m, q), Species::try_new(m, q));
            #[allow(clippy::cast_possible_truncation)]
            let (m32, q32) = (m as f32, q as f32);
            assert_eq!(
                Species::<f32>::try_new_const(m32, q32),
                Species::try_new(m32, q32)
            );
        }
    }

    #[test]
    fn bad_species_are_refused() {
        assert_eq!(Species::try_new(0.0_f64, 1.0), Err(Error::NonPositiveMass));
        assert_eq!(Species::try_new(f64::NAN, 1.0), Err(Error::NonFinite));
        assert_eq!(
            Species::try_new(1.0_f64, f64::INFINITY),
            Err(Error::NonFinite)
        );
        assert_eq!(
            Species::<f32>::try_from_atom(0.0, 0, 0.0),
            Err(Error::NonPositiveMass)
        );
        // Fuzz finding: a rest energy of 7.3e-40 eV (f32) gave a state with beta = NaN from
        // E rho = 0; anything below 1 eV is now refused.
        assert_eq!(
            Species::try_new(7.346_84e-40_f32, 1.0),
            Err(Error::RestEnergyTooSmall)
        );
        assert_eq!(
            Species::try_new(0.999_999_94_f32, 1.0),
            Err(Error::RestEnergyTooSmall)
        );
        assert!(Species::try_new(1.0_f64, -1.0).is_ok());
    }

    /// Found by mutation testing: a non-finite input was refused only through the NaN or ∞ it
    /// gave the rest energy, and a finite atomic mass whose rest energy overflows said
    /// `NonFinite`; it is `Overflow` now.
    #[test]
    fn atoms_refuse_each_bad_input_by_its_own_error() {
        for (mass, binding) in [
            (f32::NAN, 0.0),
            (12.0, f32::INFINITY),
            (f32::NEG_INFINITY, 0.0),
        ] {
            assert_eq!(
                Species::<f32>::try_from_atom(mass, 1, binding),
                Err(Error::NonFinite),
                "{mass} u, {binding} eV"
            );
        }
        assert_eq!(
            Species::<f32>::try_from_atom(1.0e30, 1, 0.0),
            Err(Error::Overflow)
        );
    }
}
