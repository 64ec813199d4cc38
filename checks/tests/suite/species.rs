//! `Species` keeps its invariant: no rest energy that is zero, negative, below 1 eV or not finite,
//! no charge that is not finite, whichever way a species is built; so no state of motion built
//! from a species has `γ < 1` or a non-finite `γ`.

use fourforce::push::Particle;
use fourforce::{Error, FourVector, Motion, Real, Species, ThreeVector};

fn t<T: Real>(x: f64) -> T {
    T::from_f64(x)
}

fn nan<T: Real>() -> T {
    T::from_f64(f64::NAN)
}

/// The bad pairs of the issue (rest energy 0, −5, NaN; charge ∞) and their neighbours, with the
/// error each must give.
fn bad<T: Real>() -> [(T, T, Error); 8] {
    [
        (T::ZERO, T::ONE, Error::NonPositiveMass),
        (t(-5.0), T::ONE, Error::NonPositiveMass),
        (nan::<T>(), T::ONE, Error::NonFinite),
        (t(1.0e9), T::INFINITY, Error::NonFinite),
        (t(1.0e9), -T::INFINITY, Error::NonFinite),
        (t(1.0e9), nan::<T>(), Error::NonFinite),
        (T::INFINITY, T::ONE, Error::NonFinite),
        (t(0.5), T::ONE, Error::RestEnergyTooSmall),
    ]
}

fn refused<T: Real>() {
    for (m, q, want) in bad::<T>() {
        assert_eq!(Species::try_new(m, q), Err(want), "{m:?} eV, Q = {q:?}");
    }
    // From an atom: a zero, negative or NaN mass.
    assert_eq!(
        Species::<T>::try_from_atom(T::ZERO, 0, T::ZERO),
        Err(Error::NonPositiveMass)
    );
    assert_eq!(
        Species::<T>::try_from_atom(t(-5.0), 1, T::ZERO),
        Err(Error::NonPositiveMass)
    );
    assert_eq!(
        Species::<T>::try_from_atom(nan::<T>(), 1, T::ZERO),
        Err(Error::NonFinite)
    );
}

#[test]
fn bad_species_are_refused_in_both_precisions() {
    refused::<f32>();
    refused::<f64>();
    for (m, q, want) in bad::<f32>() {
        assert_eq!(Species::<f32>::try_new_const(m, q), Err(want));
    }
    for (m, q, want) in bad::<f64>() {
        assert_eq!(Species::<f64>::try_new_const(m, q), Err(want));
    }
}

/// The species at the edges of what is accepted.
fn edge_species<T: Real>() -> Vec<Species<T>> {
    let mut v = vec![
        Species::ELECTRON,
        Species::PROTON,
        Species::NEUTRON,
        Species::ALPHA,
    ];
    for (m, q) in [
        (1.0, 1.0),
        (1.0, -1.0e30),
        (1.0e30, 1.0e-30),
        (1.0e35, 1.0),
        (1.0, 0.0),
    ] {
        v.push(Species::try_new(t(m), t(q)).unwrap());
    }
    v.push(Species::try_new(T::MAX, T::MAX).unwrap());
    v.push(Species::try_new(T::MAX, -T::MAX).unwrap());
    v
}

/// Every state a constructor accepts has a finite `γ ≥ 1`, a finite `βγ ≥ 0` and `0 ≤ β ≤ 1`
/// (β rounds to 1 in `f32` far above the rest energy; `1 − β` is the state's exact form).
fn check_state<T: Real>(r: Result<Motion<T>, Error>) -> bool {
    let Ok(m) = r else { return false };
    assert!(m.gamma().is_finite() && m.gamma() >= T::ONE, "{m:?}");
    assert!(
        m.gamma_minus_one().is_finite() && m.gamma_minus_one() >= T::ZERO,
        "{m:?}"
    );
    assert!(
        m.beta_gamma().is_finite() && m.beta_gamma() >= T::ZERO,
        "{m:?}"
    );
    assert!(m.beta() >= T::ZERO && m.beta() <= T::ONE, "{m:?}");
    assert!(
        m.one_minus_beta() > T::ZERO && m.one_minus_beta() <= T::ONE,
        "{m:?}"
    );
    assert!(
        m.kinetic_energy().is_finite() && m.total_energy().is_finite(),
        "{m:?}"
    );
    let u = m.try_four_velocity(ThreeVector::new(T::ZERO, T::ZERO, T::ONE));
    assert!(u.is_ok_and(FourVector::is_finite), "{m:?}");
    true
}

fn states_stay_physical<T: Real>() {
    let inputs: Vec<T> = [
        0.0, 1.0e-30, 1.0e-6, 0.5, 0.999, 1.0, 1.5, 2.0, 1.0e3, 1.0e9, 1.0e20, 1.0e30,
    ]
    .iter()
    .map(|&x| t(x))
    .chain([T::MAX])
    .collect();
    let mut accepted = 0;
    for s in edge_species::<T>() {
        for &x in &inputs {
            for r in [
                Motion::try_from_kinetic_energy(s, x),
                Motion::try_from_total_energy(s, x),
                Motion::try_from_gamma(s, x),
                Motion::try_from_beta(s, x),
                Motion::try_from_beta_gamma(s, x),
                Motion::try_from_momentum(s, x),
                Motion::try_from_magnetic_rigidity(s, x),
                Motion::try_from_electric_rigidity(s, x),
                Motion::try_from_speed(s, x * t(1.0e8)),
                Motion::try_from_flight_time(s, T::ONE, x),
            ] {
                accepted += usize::from(check_state(r));
            }
            let p = Particle::try_new(
                ThreeVector::ZERO,
                ThreeVector::new(x, T::ZERO, T::ZERO),
                T::ZERO,
            );
            if let Ok(p) = p {
                assert!(p.gamma() >= T::ONE && p.gamma().is_finite());
                check_state(p.try_motion(s));
            }
        }
    }
    assert!(
        accepted > 100,
        "only {accepted} states accepted: the check checks little"
    );
}

#[test]
fn no_species_gives_a_state_with_gamma_below_one_or_not_finite() {
    states_stay_physical::<f32>();
    states_stay_physical::<f64>();
}

#[test]
fn the_named_species_are_valid() {
    for s in edge_species::<f64>().into_iter().take(4) {
        assert_eq!(Species::try_new(s.rest_energy(), s.charge()), Ok(s));
    }
}

mod mutants {
    //! Sharper tests that kill mutants cargo-mutants found surviving: each pins a result a wrong
    //! operator or a constant return would change; values exact in both precisions.
    #![allow(clippy::float_cmp)]

    use fourforce::Species;
    macro_rules! sharper {
        ($t:ident) => {
            mod $t {
                use super::*;

                #[test]
                fn charge_over_rest_energy_is_a_quotient() {
                    let s = Species::<$t>::try_new(4.0, -2.0).unwrap();
                    assert_eq!(s.charge_over_rest_energy(), -0.5);
                }
            }
        };
    }

    sharper!(f32);
    sharper!(f64);
}
