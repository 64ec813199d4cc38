//! The Higuera-Cary pusher: a Boris-like rotation with the γ of the mean `u`.
//!
//! A. V. Higuera, J. R. Cary, "Structure-preserving second-order integration of relativistic
//! charged particle trajectories in electromagnetic fields", Physics of Plasmas 24, 052104
//! (2017).
//!
//! Half kick `u⁻ = uⁿ + ε`, rotation `u⁺ - u⁻ = (u⁺ + u⁻) × τ/γ̄`, half kick `uⁿ⁺¹ = u⁺ + ε`,
//! where `γ̄ = √(1 + |ū|²)` is the γ of the mean `ū = (u⁺ + u⁻)/2`. Derivation of `γ̄` (ours):
//! the rotation is `ū = u⁻ + ū × τ/γ̄`, the implicit equation of [`Vay`](super::Vay) with `u⁻` in
//! place of `u'`, so `γ̄²` is the positive root of `γ⁴ - σγ² - (|τ|² + (u⁻·τ)²) = 0` with
//! `σ = 1 + |u⁻|² - |τ|²`. The rotation itself is done as in Boris, with `t = τ/γ̄`:
//!
//! ```text
//! u' = u⁻ + u⁻ × t      u⁺ = u⁻ + u' × (2t / (1 + |t|²))
//! ```
//!
//! Properties (Higuera and Cary 2017, abstract): second order, volume-preserving like Boris, and
//! the exact `E × B` velocity like Vay: if `E + vⁿ × B = 0` then `ū = uⁿ` solves the rotation and
//! `uⁿ⁺¹ = uⁿ`. In a pure magnetic field it turns by `2 arctan(|τ|/γ̄)` per step, a little more
//! than Boris.
//!
//! Cost: 3 square roots (the quartic's two, and `γⁿ⁺¹` for the drift), 3 divisions (with the drift's `1/γ`).

use super::{Pusher, StepFactors, implicit_gamma_squared};
use crate::{FieldTensor, Real, ThreeVector};

/// The Higuera-Cary pusher (Higuera and Cary 2017), with its step factors precomputed.
///
/// # Examples
/// ```
/// use fourforce::{FieldTensor, Species, ThreeVector};
/// use fourforce::push::{HigueraCary, Particle, Pusher};
/// // A proton at the E × B velocity of E = 0.6 cB keeps its γβ.
/// let fields = FieldTensor::try_from_fields(
///     ThreeVector::new(0.0, 0.6 * 299_792_458.0, 0.0),
///     ThreeVector::new(0.0, 0.0, 1.0_f64),
/// )?;
/// let pusher = HigueraCary::try_new(Species::PROTON, 1.0e-8)?;
/// let mut p = Particle::try_new(ThreeVector::ZERO, ThreeVector::new(0.75, 0.0, 0.0), 0.0)?;
/// pusher.try_run(&mut p, &fields, 100)?;
/// assert!((p.beta_gamma() - ThreeVector::new(0.75, 0.0, 0.0)).norm() < 1e-13);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct HigueraCary<T: Real> {
    factors: StepFactors<T>,
}

impl<T: Real> Pusher<T> for HigueraCary<T> {
    #[inline]
    fn from_factors(factors: StepFactors<T>) -> Self {
        Self { factors }
    }

    #[inline]
    fn factors(&self) -> &StepFactors<T> {
        &self.factors
    }

    #[inline]
    fn beta_gamma_change(
        &self,
        beta_gamma: ThreeVector<T>,
        _gamma: T,
        field: &FieldTensor<T>,
    ) -> ThreeVector<T> {
        // ε = kick·E and τ = kick·cB: one factor for both halves of the field.
        let eps = field.e() * self.factors.kick;
        let tau = field.c_b() * self.factors.kick;
        let u_minus = beta_gamma + eps;
        let tau_sq = tau.norm_squared();
        let u_star = u_minus.dot(tau);
        let sigma = T::ONE + u_minus.norm_squared() - tau_sq;
        let gamma_bar = implicit_gamma_squared(sigma, tau_sq + u_star * u_star).sqrt();
        let t = tau * (T::ONE / gamma_bar);
        let s = T::TWO / (T::ONE + t.norm_squared());
        let u_prime = u_minus + u_minus.cross(t);
        // uⁿ⁺¹ − uⁿ = 2ε + (u⁺ − u⁻): the two half kicks and the rotation, never u minus u.
        (eps + eps) + u_prime.cross(t * s)
    }
}
