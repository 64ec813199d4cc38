//! The Boris pusher: half electric kick, magnetic rotation, half electric kick.
//!
//! J. P. Boris, "Relativistic plasma simulation — optimization of a hybrid code", Proc. Fourth
//! Conf. on Numerical Simulation of Plasmas, Naval Research Laboratory, Washington DC (1970).
//!
//! With `ε = (Q c Δt / 2mc²) E` and `τ = (Q c Δt / 2mc²) cB`:
//!
//! ```text
//! u⁻ = uⁿ + ε                    γ⁻ = √(1 + |u⁻|²)
//! t  = τ / γ⁻                    s  = 2 / (1 + |t|²)
//! u' = u⁻ + u⁻ × t               u⁺ = u⁻ + u' × (s t)
//! uⁿ⁺¹ = u⁺ + ε
//! ```
//!
//! The rotation `u⁻ → u⁺` keeps `|u|` exactly (in exact arithmetic) and turns by
//! `2 arctan(|τ|/γ⁻)`, slightly less than `Ω Δt`. The scheme is volume-preserving (H. Qin et al.,
//! Physics of Plasmas 20, 084503 (2013)). Its weakness: the rotation uses `γ⁻`, which exceeds the
//! particle's `γ` when the half kick is perpendicular to `u`, so in crossed fields near `E = cB`
//! at large steps the `E × B` drift comes out wrong (see [`Vay`](super::Vay)).
//!
//! Cost: 2 square roots (`γ⁻`, and `γⁿ⁺¹` for the drift), 3 divisions (with the drift's `1/γ`); in a
//! magnetic field alone (`E = 0`: no half kicks, `γ⁻` is the given `γⁿ`) one root fewer.
//! The change of `u` is returned as `2ε + u' × (s t)`, the kicks and the rotation themselves.

use super::{Pusher, StepFactors};
use crate::{FieldTensor, Real, ThreeVector};

/// The relativistic Boris pusher (Boris 1970), with its step factors precomputed.
///
/// # Examples
/// ```
/// use fourforce::{FieldTensor, Species, ThreeVector};
/// use fourforce::push::{Boris, Particle, Pusher};
/// // An electron with γβ = 3 in 1 T: |u| is kept while it turns.
/// let b = FieldTensor::try_from_fields(ThreeVector::ZERO, ThreeVector::new(0.0_f32, 0.0, 1.0))?;
/// let pusher = Boris::try_new(Species::ELECTRON, 1.0e-12)?;
/// let mut p = Particle::try_new(ThreeVector::ZERO, ThreeVector::new(3.0, 0.0, 0.0), 0.0)?;
/// pusher.try_run(&mut p, &b, 1000)?;
/// assert!((p.beta_gamma().norm() - 3.0).abs() < 1e-5);
/// # Ok::<(), fourforce::Error>(())
/// ```
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Boris<T: Real> {
    factors: StepFactors<T>,
}

impl<T: Real> Pusher<T> for Boris<T> {
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
        gamma: T,
        field: &FieldTensor<T>,
    ) -> ThreeVector<T> {
        let kick = self.factors.kick;
        if field.e().is_zero() {
            // A magnetic field alone: no half kicks (ε = 0), so u⁻ = uⁿ and γ⁻ = γⁿ, the given
            // one; the rotation is the whole change.
            return rotation(beta_gamma, gamma, field.c_b(), kick);
        }
        // ε = kick·E; uⁿ⁺¹ − uⁿ = 2ε + (u⁺ − u⁻): the two half kicks and the rotation, never u
        // minus u.
        let eps = field.e() * kick;
        let u_minus = beta_gamma + eps;
        let gamma_minus = (T::ONE + u_minus.norm_squared()).sqrt();
        (eps + eps) + rotation(u_minus, gamma_minus, field.c_b(), kick)
    }
}

/// The change `u⁺ − u⁻ = u' × (s t)` of the Boris rotation of `u⁻` (with its `γ⁻`) in the field
/// `cB`: `t = τ/γ⁻ = cB · (kick/γ⁻)`, one division and three products.
#[inline(always)]
fn rotation<T: Real>(
    u_minus: ThreeVector<T>,
    gamma_minus: T,
    c_b: ThreeVector<T>,
    kick: T,
) -> ThreeVector<T> {
    let t = c_b * (kick / gamma_minus);
    let s = T::TWO / (T::ONE + t.norm_squared());
    let u_prime = u_minus + u_minus.cross(t);
    u_prime.cross(t * s)
}
