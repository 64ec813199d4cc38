//! The textbook formulas, written plainly in the working precision, as a firmware author would
//! type them first: the baseline of the accuracy and speed comparisons.
//!
//! gamma = E/m, beta = sqrt(1 - 1/gamma^2), pc = sqrt(E^2 - m^2), 1 - beta and gamma - 1 by
//! subtraction, c rounded to the precision (PDG "Kinematics" review and Jackson 3rd ed. ch. 11-12
//! for the relations, from memory).

use fourforce::Real;

/// The 13 quantities of a state from the kinetic energy (eV), the naive way, in reference order.
#[inline]
pub fn all<T: Real>(m: T, q: T, t: T) -> [T; 13] {
    let c = T::SPEED_OF_LIGHT;
    let e = t + m;
    let gamma = e / m;
    let beta = (T::ONE - T::ONE / (gamma * gamma)).sqrt();
    let pc = (e * e - m * m).sqrt();
    let qa = q.abs();
    let m_kg = m * T::ELEMENTARY_CHARGE / (c * c);
    [
        gamma,
        gamma - T::ONE,
        beta,
        T::ONE - beta,
        beta * gamma,
        pc,
        e,
        pc / (c * qa),
        pc * beta / qa,
        beta * c,
        T::ONE / (beta * c),
        qa * c * c / (T::TWO * T::PI * gamma * m),
        gamma * m_kg * beta * c,
    ]
}

/// Naive kinetic energy from a momentum: sqrt(pc^2 + m^2) - m.
#[inline]
pub fn kinetic_from_momentum<T: Real>(m: T, pc: T) -> T {
    (pc * pc + m * m).sqrt() - m
}

/// Naive kinetic energy from beta: (1/sqrt(1 - beta^2) - 1) m.
#[inline]
pub fn kinetic_from_beta<T: Real>(m: T, beta: T) -> T {
    (T::ONE / (T::ONE - beta * beta).sqrt() - T::ONE) * m
}

/// Naive kinetic energy from a speed in m/s: as from beta with beta = v/c, c rounded.
#[inline]
pub fn kinetic_from_speed<T: Real>(m: T, v: T) -> T {
    kinetic_from_beta(m, v / T::SPEED_OF_LIGHT)
}

/// Naive kinetic energy from a flight time t over a length l: beta = l/(c t).
#[inline]
pub fn kinetic_from_flight_time<T: Real>(m: T, l: T, t: T) -> T {
    kinetic_from_beta(m, l / (T::SPEED_OF_LIGHT * t))
}

/// Naive kinetic energy from B rho: pc = B rho c Q, then as from momentum.
#[inline]
pub fn kinetic_from_magnetic_rigidity<T: Real>(m: T, q: T, brho: T) -> T {
    kinetic_from_momentum(m, brho * T::SPEED_OF_LIGHT * q.abs())
}

/// Naive kinetic energy from E rho: solve T (T + 2m)/(T + m) = w by the quadratic formula,
/// T = ((w - 2m) + sqrt((w - 2m)^2 + 4 w m))/2.
#[inline]
pub fn kinetic_from_electric_rigidity<T: Real>(m: T, q: T, erho: T) -> T {
    let w = erho * q.abs();
    let b = w - T::TWO * m;
    (b + (b * b + T::TWO * T::TWO * w * m).sqrt()) * T::HALF
}

/// Naive kinetic energy from beta gamma: (sqrt(1 + bg^2) - 1) m.
#[inline]
pub fn kinetic_from_beta_gamma<T: Real>(m: T, bg: T) -> T {
    ((T::ONE + bg * bg).sqrt() - T::ONE) * m
}

/// Naive kinetic energy from gamma: (gamma - 1) m.
#[inline]
pub fn kinetic_from_gamma<T: Real>(m: T, gamma: T) -> T {
    (gamma - T::ONE) * m
}

/// Naive kinetic energy from the total energy: E - m.
#[inline]
pub fn kinetic_from_total_energy<T: Real>(m: T, e: T) -> T {
    e - m
}
