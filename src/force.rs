//! The Lorentz force: four-force, three-force and power, in eV/m inside and N and W outside.
//!
//! With the field tensor in V/m ([`FieldTensor`]), the four-velocity in units of c
//! (`u = γ(1, β)`) and the charge `Q` in units of e, the four-force is
//!
//! ```text
//! K^μ = Q c F^μ_ν u^ν = γ Q (E·β, E + β × cB)        in eV/m
//!     = γ (qE·v/c, q(E + v × B))                      in N, after × e
//! ```
//!
//! (the convention `F^{i0} = Eⁱ/c`, `F^{ij} = −ε^{ijk}Bᵏ`; Jackson 3rd ed. §11.9 and §12.1, from
//! memory). It is orthogonal to the four-velocity, `K·u = 0`: the rest mass does not change. Its
//! spatial part is γ times the three-force `q(E + v × B)` and its time part is γ/c times the power
//! `qE·v`. In eV/m the equation of motion reads `du^μ/ds = K^μ / mc²` with `s = cτ` in metres and
//! `mc²` in eV, every factor of order one.
//!
//! # For firmware authors
//! [`FieldTensor::four_force`] costs the 12 multiplications of the contraction plus 4 for the
//! charge; the SI forms (`*_newtons`, `*_watts`) add one multiplication per component by `e` and
//! check their result for overflow.
//!
//! # Examples
//! ```
//! use fourforce::{FieldTensor, FourVector, Species, ThreeVector};
//! // An invented dipole of 0.2 T and a proton at β = 0.6 along x.
//! let f = FieldTensor::try_from_fields(ThreeVector::ZERO, ThreeVector::new(0.0_f64, 0.0, 0.2))?;
//! let u = FourVector::try_four_velocity(ThreeVector::new(0.6, 0.0, 0.0))?;
//! let k = f.four_force(Species::PROTON.charge(), u);
//! assert!(k.inner(u).abs() < 1e-9); // K·u = 0
//! assert!(k.space.y < 0.0);           // bends towards −y
//! # Ok::<(), fourforce::Error>(())
//! ```

use crate::{Error, FieldTensor, FourVector, Real, ThreeVector};

/// Returns `Ok(v)` when every component of `v` is finite, else `Err(Overflow)`.
#[inline]
fn finite_result<T: Real>(v: FourVector<T>) -> Result<FourVector<T>, Error> {
    if v.is_finite() {
        Ok(v)
    } else {
        Err(Error::Overflow)
    }
}

impl<T: Real> FieldTensor<T> {
    /// The four-force `K^μ = Q c F^μ_ν u^ν = γQ(E·β, E + β × cB)` in eV/m.
    ///
    /// `charge` is Q in units of e (with sign), `u` the four-velocity in units of c. For an
    /// unchecked four-velocity or field the result may overflow to infinity; see
    /// [`try_four_force`](Self::try_four_force). Accuracy up to γ = 10⁴ (checked on random cases
    /// in `f32`, fields from SI): each component within 1.6 eps × `γ|Q|(|E| + |β||cB|)`, and
    /// `K·u` within 1 eps of that scale times `u⁰ + |u|`. Edges: zero field or zero charge give
    /// the zero vector.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, FourVector, ThreeVector};
    /// // An electron at rest in 1 MV/m along x: K = (0, 1e6, 0, 0) eV/m times Q = −1.
    /// let f = FieldTensor::try_from_fields(ThreeVector::new(1e6_f32, 0.0, 0.0), ThreeVector::ZERO)?;
    /// assert_eq!(f.four_force(-1.0, FourVector::AT_REST), FourVector::new(0.0, -1e6, 0.0, 0.0));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn four_force(&self, charge: T, u: FourVector<T>) -> FourVector<T> {
        if self.e().is_zero() {
            // A magnetic field alone: K = Q(0, u × cB), the same products as the contraction
            // without the electric terms (which are zero); 0·u⁰ keeps a non-finite u⁰ visible.
            return FourVector::from_parts(T::ZERO * u.time, u.space.cross(self.c_b()) * charge);
        }
        self.contract(u) * charge
    }

    /// The four-force in eV/m, as [`four_force`](Self::four_force), checking inputs and result.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite charge, field or four-velocity; [`Error::Overflow`]
    /// if a component of the result is not finite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{Error, FieldTensor, FourVector, ThreeVector};
    /// let f = FieldTensor::try_from_fields(ThreeVector::new(1e18_f32, 0.0, 0.0), ThreeVector::ZERO)?;
    /// let fast = FourVector::new(1e30_f32, 1e30, 0.0, 0.0);
    /// assert_eq!(f.try_four_force(1.0, fast), Err(Error::Overflow));
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_four_force(&self, charge: T, u: FourVector<T>) -> Result<FourVector<T>, Error> {
        // Every input enters some product of the result (Q all of them, each component of u and
        // of the field at least one), so a non-finite input always gives a non-finite result: the
        // inputs are examined only then, to tell NonFinite from Overflow.
        let k = self.four_force(charge, u);
        if k.is_finite() {
            Ok(k)
        } else if !charge.is_finite() || !u.is_finite() || !self.is_finite() {
            Err(Error::NonFinite)
        } else {
            Err(Error::Overflow)
        }
    }

    /// The four-force `K^μ = γ(qE·v/c, q(E + v × B))` in newtons.
    ///
    /// `e·K` with K from [`four_force`](Self::four_force); `charge` in units of e, `u` in units
    /// of c.
    ///
    /// # Errors
    /// As [`try_four_force`](Self::try_four_force).
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, FourVector, ThreeVector};
    /// // Electron at rest, E = 1 MV/m along x: K = (0, −1.602 176 634e-13, 0, 0) N
    /// // (q(E + v × B) with the CODATA 2018 e).
    /// let f = FieldTensor::try_from_fields(ThreeVector::new(1e6_f64, 0.0, 0.0), ThreeVector::ZERO)?;
    /// let k = f.try_four_force_newtons(-1.0, FourVector::AT_REST)?;
    /// assert!((k.space.x / -1.602_176_634e-13 - 1.0).abs() < 1e-15);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_four_force_newtons(
        &self,
        charge: T,
        u: FourVector<T>,
    ) -> Result<FourVector<T>, Error> {
        finite_result(self.try_four_force(charge, u)? * T::ELEMENTARY_CHARGE)
    }

    /// The three-force `Q(E + β × cB)` in eV/m from β = v/c.
    ///
    /// The spatial part of the four-force divided by γ. Edges: β = 0 gives `QE`.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::ZERO, ThreeVector::new(0.0_f32, 0.0, 100.0))?;
    /// let force = f.three_force(1.0, ThreeVector::new(0.5, 0.0, 0.0));
    /// assert_eq!(force, ThreeVector::new(0.0, -50.0, 0.0)); // x̂ × ẑ = −ŷ
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn three_force(&self, charge: T, beta: ThreeVector<T>) -> ThreeVector<T> {
        (self.e() + beta.cross(self.c_b())) * charge
    }

    /// The three-force `q(E + v × B)` in newtons from a velocity in m/s.
    ///
    /// `v × B` is formed as `(v/c) × cB`.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite charge, field or velocity; [`Error::Overflow`] if the
    /// result is not finite. Speeds at or above c are not refused: the Lorentz force formula holds
    /// for any v, and checking it is the caller's business.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// // Proton at 0.6 c along x in B = 1 T along z: F = (0, −2.881 922 827 54e-11, 0) N
    /// // (Jackson, Classical Electrodynamics, 3rd ed., §12.1, from memory; value mpmath).
    /// let f = FieldTensor::try_from_fields(ThreeVector::ZERO, ThreeVector::new(0.0_f64, 0.0, 1.0))?;
    /// let v = ThreeVector::new(0.6 * 299_792_458.0, 0.0, 0.0);
    /// let force = f.try_three_force_newtons(1.0, v)?;
    /// assert!((force.y / -2.881_922_827_54e-11 - 1.0).abs() < 1e-11);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_three_force_newtons(
        &self,
        charge: T,
        v_m_per_s: ThreeVector<T>,
    ) -> Result<ThreeVector<T>, Error> {
        if !charge.is_finite() || !v_m_per_s.is_finite() || !self.is_finite() {
            return Err(Error::NonFinite);
        }
        let beta = v_m_per_s * T::INV_SPEED_OF_LIGHT;
        let f = self.three_force(charge * T::ELEMENTARY_CHARGE, beta);
        if f.is_finite() {
            Ok(f)
        } else {
            Err(Error::Overflow)
        }
    }

    /// The power per unit `ct`, `Q E·β`, in eV/m: the energy gained per metre of light travel.
    ///
    /// The time part of the four-force divided by γ. Only E does work: the magnetic field never
    /// enters. Edges: β = 0 or E ⟂ β give 0.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// let f = FieldTensor::try_from_scaled(ThreeVector::new(2e6_f32, 0.0, 0.0), ThreeVector::new(0.0, 0.0, 1e8))?;
    /// assert_eq!(f.power(1.0, ThreeVector::new(0.5, 0.0, 0.0)), 1e6);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    #[must_use]
    #[inline]
    pub fn power(&self, charge: T, beta: ThreeVector<T>) -> T {
        self.e().dot(beta) * charge
    }

    /// The power `qE·v` in watts from a velocity in m/s.
    ///
    /// # Errors
    /// [`Error::NonFinite`] for a non-finite charge, field or velocity; [`Error::Overflow`] if the
    /// result is not finite.
    ///
    /// # Examples
    /// ```
    /// use fourforce::{FieldTensor, ThreeVector};
    /// // Proton at 0.6 c along x in E = 1 MV/m along x: 2.881 922 827 54e-5 W
    /// // (Jackson, Classical Electrodynamics, 3rd ed., §12.1, from memory; value mpmath).
    /// let f = FieldTensor::try_from_fields(ThreeVector::new(1e6_f64, 0.0, 0.0), ThreeVector::ZERO)?;
    /// let p = f.try_power_watts(1.0, ThreeVector::new(0.6 * 299_792_458.0, 0.0, 0.0))?;
    /// assert!((p / 2.881_922_827_54e-5 - 1.0).abs() < 1e-11);
    /// # Ok::<(), fourforce::Error>(())
    /// ```
    pub fn try_power_watts(&self, charge: T, v_m_per_s: ThreeVector<T>) -> Result<T, Error> {
        if !charge.is_finite() || !v_m_per_s.is_finite() || !self.is_finite() {
            return Err(Error::NonFinite);
        }
        let p = self.e().dot(v_m_per_s) * (charge * T::ELEMENTARY_CHARGE);
        if p.is_finite() {
            Ok(p)
        } else {
            Err(Error::Overflow)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bad_inputs_are_refused() {
        let f = FieldTensor::<f64>::ZERO;
        assert_eq!(
            f.try_four_force(f64::NAN, FourVector::AT_REST),
            Err(Error::NonFinite)
        );
        assert_eq!(
            f.try_three_force_newtons(1.0, ThreeVector::new(f64::INFINITY, 0.0, 0.0)),
            Err(Error::NonFinite)
        );
        assert_eq!(
            f.try_power_watts(1.0, ThreeVector::new(0.0, f64::NAN, 0.0)),
            Err(Error::NonFinite)
        );
    }

    #[test]
    fn every_non_finite_input_is_named_even_where_it_meets_a_zero() {
        // Q and the field zero, u at rest: each non-finite input still reaches the result.
        let zero = FieldTensor::<f32>::ZERO;
        let rest = FourVector::AT_REST;
        let inf = f32::INFINITY;
        assert_eq!(zero.try_four_force(inf, rest), Err(Error::NonFinite));
        for u in [
            FourVector::new(inf, 0.0, 0.0, 0.0),
            FourVector::new(1.0, 0.0, f32::NAN, 0.0),
            FourVector::new(1.0, 0.0, 0.0, -inf),
        ] {
            assert_eq!(zero.try_four_force(0.0, u), Err(Error::NonFinite));
        }
        for (e, cb) in [
            (ThreeVector::new(inf, 0.0, 0.0), ThreeVector::ZERO),
            (ThreeVector::ZERO, ThreeVector::new(0.0, 0.0, inf)),
            (ThreeVector::ZERO, ThreeVector::new(f32::NAN, 0.0, 0.0)),
        ] {
            let f = FieldTensor::from_scaled(e, cb);
            assert_eq!(f.try_four_force(0.0, rest), Err(Error::NonFinite));
        }
        let big =
            FieldTensor::from_scaled(ThreeVector::new(3.0e38_f32, 0.0, 0.0), ThreeVector::ZERO);
        assert_eq!(
            big.try_four_force(1.0, FourVector::new(2.0, 1.0, 0.0, 0.0)),
            Err(Error::Overflow)
        );
    }

    #[test]
    fn zero_charge_or_field_gives_zero_force() {
        let f = FieldTensor::from_scaled(
            ThreeVector::new(1.0_f32, 2.0, 3.0),
            ThreeVector::new(3.0, 2.0, 1.0),
        );
        let u = FourVector::new(2.0_f32, 1.0, 1.0, 1.0);
        assert_eq!(f.four_force(0.0, u), FourVector::ZERO);
        assert_eq!(FieldTensor::ZERO.four_force(1.0, u), FourVector::ZERO);
    }
}
