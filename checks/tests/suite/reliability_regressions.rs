//! Regression tests for the bugs the reliability checks (fuzzing, exhaustive sweeps, mutation
//! testing) found, each with the input that exposed it. Written once for f32 and f64.
#![allow(clippy::float_cmp)]

use fourforce::{Error, ThreeVector};

macro_rules! regressions {
    ($t:ident) => {
        mod $t {
            use super::*;

            fn squared_length(u: ThreeVector<$t>) -> $t {
                u.x * u.x + u.y * u.y + u.z * u.z
            }

            /// Found by the `three_vector` fuzz target: a vector of subnormal components lost
            /// its low bits in `self / |self|` (f32 input (6.816e-42, 1.4e-44, 0) gave a "unit"
            /// vector of squared length 1.0000042).
            #[test]
            fn unit_of_a_subnormal_vector_has_length_one() {
                let tiny = <$t>::MIN_POSITIVE / 1024.0 * 4864.0 / 1024.0;
                let v = ThreeVector::new(tiny, <$t>::from_bits(10), 0.0);
                let u = v.try_unit().unwrap();
                assert!(
                    (squared_length(u) - 1.0).abs() <= 4.0 * <$t>::EPSILON,
                    "{u:?}"
                );
                let w = ThreeVector::new(<$t>::from_bits(1), <$t>::from_bits(1), 0.0);
                let u = w.try_unit().unwrap();
                assert!(
                    (u.x - core::$t::consts::FRAC_1_SQRT_2).abs() <= <$t>::EPSILON,
                    "{u:?}"
                );
            }

            /// Found by reading `try_unit` for the fuzz target: a finite vector whose length
            /// overflows (every component MAX) gave `Ok` of the zero vector.
            #[test]
            fn unit_of_a_huge_vector_is_not_zero() {
                let m = <$t>::MAX;
                let u = ThreeVector::new(m, m, m).try_unit().unwrap();
                assert!(
                    (squared_length(u) - 1.0).abs() <= 4.0 * <$t>::EPSILON,
                    "{u:?}"
                );
                let u = ThreeVector::new(-m, 0.0, m).try_unit().unwrap();
                assert!(
                    (u.x + core::$t::consts::FRAC_1_SQRT_2).abs() <= <$t>::EPSILON,
                    "{u:?}"
                );
            }

            #[test]
            fn unit_still_refuses_zero_and_non_finite() {
                assert_eq!(
                    ThreeVector::<$t>::new(0.0, -0.0, 0.0).try_unit(),
                    Err(Error::ZeroDirection)
                );
                assert_eq!(
                    ThreeVector::<$t>::new(<$t>::NAN, 1.0, 0.0).try_unit(),
                    Err(Error::NonFinite)
                );
            }
        }
    };
}

regressions!(f32);
regressions!(f64);

/// Found by the `four_vector` fuzz target: every component of `pc/m` finite but `|pc/m|` not
/// (f32 pc = (-2.562126e38, -2.562126e38, -2.562126e38) eV, m = 1 eV) gave `Ok` with `u⁰ = +inf`.
#[test]
fn four_velocity_whose_time_part_overflows_is_refused() {
    use fourforce::{FourVector, Species};
    let m = Species::<f32>::try_new(1.0, 1.0).unwrap();
    let m32 = m;
    let pc = ThreeVector::new(-2.562_126e38_f32, -2.562_126e38, -2.562_126e38);
    assert_eq!(
        FourVector::try_four_velocity_from_momentum(m, pc),
        Err(Error::Overflow)
    );
    let m = Species::<f64>::try_new(1.0, 1.0).unwrap();
    let big = f64::MAX * 0.75;
    let pc = ThreeVector::new(big, big, big);
    assert_eq!(
        FourVector::try_four_velocity_from_momentum(m, pc),
        Err(Error::Overflow)
    );
    // The largest that fits is still accepted.
    let pc = ThreeVector::new(1.0e38_f32, 0.0, 0.0);
    let u = FourVector::try_four_velocity_from_momentum(m32, pc).unwrap();
    assert!(u.time.is_finite());
}

/// Found by the `field` fuzz target: a finite B whose cB overflows (f32 B = -1.847577e38 T) was
/// refused with `NonFinite`; the documented refusal of a field above the limit is `Overflow`.
#[test]
fn finite_field_too_large_is_refused_as_overflow() {
    use fourforce::FieldTensor;
    let b = ThreeVector::new(-1.847_577e38_f32, 0.0, 0.0);
    assert_eq!(
        FieldTensor::try_from_fields(ThreeVector::ZERO, b),
        Err(Error::Overflow)
    );
    assert_eq!(
        FieldTensor::try_scalar_invariant_of(ThreeVector::ZERO, b),
        Err(Error::Overflow)
    );
    assert_eq!(
        FieldTensor::try_pseudoscalar_invariant_of(ThreeVector::ZERO, b),
        Err(Error::Overflow)
    );
    let nan = ThreeVector::new(f32::NAN, 0.0, 0.0);
    assert_eq!(
        FieldTensor::try_from_fields(ThreeVector::ZERO, nan),
        Err(Error::NonFinite)
    );
}

/// Found by the `motion` fuzz target: the rigidities of a species of tiny charge (f64, Q = 1e-300)
/// were `Ok(+inf)`, and a finite energy in keV whose eV value overflows (f32 1e36 keV) was refused
/// as `NonFinite`. Both are `Overflow` now.
#[test]
fn rigidity_and_unit_overflows_are_refused_as_overflow() {
    use fourforce::{Motion, Species};
    let s = Species::<f64>::try_new(938.272e6, 1.0e-300).unwrap();
    let m = Motion::try_from_kinetic_energy(s, 1.0e9).unwrap();
    assert_eq!(m.try_magnetic_rigidity(), Err(Error::Overflow));
    assert_eq!(m.try_electric_rigidity(), Err(Error::Overflow));
    let p = Species::<f32>::PROTON;
    assert_eq!(
        Motion::try_from_kinetic_energy_kev(p, 1.0e36),
        Err(Error::Overflow)
    );
    assert_eq!(
        Motion::try_from_kinetic_energy_mev(p, 1.0e33),
        Err(Error::Overflow)
    );
    assert_eq!(
        Motion::try_from_kinetic_energy_gev(p, 1.0e30),
        Err(Error::Overflow)
    );
    assert_eq!(
        Motion::try_from_kinetic_energy_kev(p, f32::NAN),
        Err(Error::NonFinite)
    );
    // Ordinary values are untouched.
    assert!(
        Motion::try_from_kinetic_energy_mev(p, 250.0)
            .unwrap()
            .try_magnetic_rigidity()
            .unwrap()
            > 2.4
    );
}

/// Found by the `optics` fuzz target: the energy gain of an alpha from 2.5525757e38 V (f32) and
/// the integrated field for 3e38 rad on a 1 TeV proton were `Ok(inf)`; both are `Overflow` now.
#[test]
fn optics_products_that_overflow_are_refused() {
    use fourforce::{Motion, Species, optics};
    assert_eq!(
        optics::try_energy_gain(Species::<f32>::ALPHA, 2.552_575_7e38),
        Err(Error::Overflow)
    );
    let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e12).unwrap();
    assert_eq!(
        optics::try_integrated_field_for_angle(&p, 3.0e38),
        Err(Error::Overflow)
    );
    assert_eq!(
        optics::try_energy_gain(Species::<f32>::ALPHA, 1.0e6),
        Ok(2.0e6)
    );
}

/// Found by the `check` fuzz target: readings near `f32::MAX` overflowed the window's sums, and
/// the statistics came back as `Ok`: readings (3e38, 3e38, -3e38, 1, 2) gave mean +inf, spread
/// +inf, drift NaN and trend `Steady` (a corrupted register read as a steady beam); readings
/// (-4.2505569e37, 3.5e-43, 0) gave spread +inf. All are `Overflow` now.
#[test]
fn window_statistics_that_overflow_are_refused() {
    use fourforce::check::MovingWindow;
    let mut w = MovingWindow::<f32, 5>::new();
    for x in [3.0e38_f32, 3.0e38, -3.0e38, 1.0, 2.0] {
        w.try_push(x).unwrap();
    }
    assert_eq!(w.try_mean(), Err(Error::Overflow));
    assert_eq!(w.try_spread(), Err(Error::Overflow));
    assert_eq!(w.try_drift(), Err(Error::Overflow));
    assert_eq!(w.try_trend(1.0), Err(Error::Overflow));
    let mut w = MovingWindow::<f32, 5>::new();
    for x in [-4.250_557e37_f32, 3.5e-43, 0.0] {
        w.try_push(x).unwrap();
    }
    assert_eq!(w.try_spread(), Err(Error::Overflow));
    // Ordinary readings are untouched.
    let mut w = MovingWindow::<f32, 4>::new();
    for x in [1.0_f32, 2.0, 6.0] {
        w.try_push(x).unwrap();
    }
    assert_eq!(w.try_mean(), Ok(3.0));
}

/// Found by the `four_vector` fuzz target: `four_velocity_deviation` was +inf for the
/// four-velocity of a proton with pc = 1e30 eV in f32 (u⁰ ≈ 1.1e21, above √MAX ≈ 1.8e19), which
/// `try_four_velocity_from_momentum` accepts: the squares overflowed. The components are now
/// scaled by a power of two first.
#[test]
fn deviation_of_a_huge_four_velocity_is_finite() {
    use fourforce::{FourVector, Species};
    let u = FourVector::try_four_velocity_from_momentum(
        Species::<f32>::PROTON,
        ThreeVector::new(1.0e30, 2.0e29, -3.0e29),
    )
    .unwrap();
    assert!(u.time > 1.0e21);
    let d = u.four_velocity_deviation();
    assert!(d.abs() <= 8.0 * f32::EPSILON, "deviation {d}");
    // Up to f32::MAX: a stored u⁰ = MAX with |u| = MAX reads as normalised.
    let edge = FourVector::new(f32::MAX, f32::MAX, 0.0, 0.0);
    assert_eq!(edge.four_velocity_deviation(), 0.0);
    // And the ordinary range is the unscaled figure: (1.25² − 1 − 0.75²)/1.25² = 0.
    assert_eq!(
        FourVector::new(1.25_f32, 0.75, 0.0, 0.0).four_velocity_deviation(),
        0.0
    );
    assert_eq!(
        FourVector::new(2.0_f64, 1.0, 1.0, 0.0).four_velocity_deviation(),
        (4.0 - 1.0 - 2.0) / 4.0
    );
}

/// Found by the `check` fuzz target: an `EnergyWindow` around a subnormal nominal energy gave
/// verdicts with a deviation of +inf (f32 nominal 1e-40 eV, reading 1 eV), and
/// `EnergyWindow::try_around(3e38, 0.5)` said `NonFinite` where `nominal (1 + tol)` overflows.
#[test]
fn energy_window_edges_are_finite_or_overflow() {
    use fourforce::Species;
    use fourforce::check::{EnergyWindow, Verdict};
    let w = EnergyWindow::try_new(Species::<f32>::PROTON, 0.0, 1.0e-40, 2.0e-40).unwrap();
    match w.check_kinetic_energy(1.0) {
        Verdict::High { deviation, .. } => assert_eq!(deviation, f32::MAX),
        other => panic!("{other:?}"),
    }
    assert_eq!(
        EnergyWindow::try_around(Species::<f32>::PROTON, 3.0e38, 0.5),
        Err(Error::Overflow)
    );
    assert!(EnergyWindow::try_around(Species::<f32>::PROTON, 2.0e38, 0.5).is_ok());
}

/// Seen by the `push` fuzz target (which tolerated it as a slack of 1 + τ²): with a step far longer than a gyration (|τ| = ω_c Δt/2 ≫ 1)
/// Vay's γ, the root of its implicit quartic, fell below |u| (f32 electron, γ = 1000,
/// |τ| = 5e5: on 198 of 200 steps), a speed above c; and its rotation cancelled terms of size
/// |u||τ|/γ (|u| drifted by 2448 eps in 200 steps at γ = 10, |τ| = 500). γ now comes from the new
/// u, and the rotation takes the uncancelled form for |t| > 1.
#[test]
fn vay_keeps_gamma_consistent_at_long_steps() {
    use fourforce::push::{Pusher, Vay};
    use fourforce::{FieldTensor, Species};
    let pusher = Vay::try_new(Species::<f32>::ELECTRON, 1.0e-9).unwrap();
    let eps = f64::from(f32::EPSILON);
    for gamma0 in [1.5_f64, 10.0, 1000.0] {
        for (tau, drift_bound) in [
            (0.5_f32, 32.0),
            (50.0, 256.0),
            (500.0, 512.0),
            (5.0e5, 1.0e6),
        ] {
            let bz = tau / pusher.factors().rotation().abs();
            let field = FieldTensor::try_from_fields(
                ThreeVector::ZERO,
                ThreeVector::new(0.3 * bz, 0.1 * bz, bz),
            )
            .unwrap();
            let n0 = (gamma0 * gamma0 - 1.0).sqrt();
            let mut u = ThreeVector::new(0.6 * n0 as f32, 0.8 * n0 as f32, 0.0);
            let mut gamma = gamma0 as f32;
            for _ in 0..200 {
                (u, gamma) = pusher.push_beta_gamma(u, gamma, &field);
                let n = f64::from(u.x).hypot(f64::from(u.y)).hypot(f64::from(u.z));
                let consistent = n.hypot(1.0);
                assert!(
                    (f64::from(gamma) / consistent - 1.0).abs() <= 2.0 * eps,
                    "γ0 {gamma0} τ {tau}: γ {gamma} against √(1 + |u|²) = {consistent}"
                );
                assert!(
                    (n / n0 - 1.0).abs() <= drift_bound * eps,
                    "γ0 {gamma0} τ {tau}: |u| {n} from {n0}"
                );
            }
        }
    }
}

/// Found by mutation testing (a survivor in `BeamState`'s gap): the energy gain is carried as a
/// compensated sum, but the kinetic energy was formed as T₀ + (gain + carry), where the carry,
/// below half an ulp of the gain, was rounded away. Braking a 1 MeV proton by 999 000 V and then
/// 4096 times by 0.1 V (f32) read 590.375 eV instead of 590.4 (700 ulps): the result is the
/// difference of nearly equal numbers, where the lost carry is all that remains. Now
/// (T₀ + gain) is formed exactly first.
#[test]
fn braked_beam_keeps_the_carry_of_its_energy_gain() {
    use fourforce::beamline::{BeamState, Element};
    use fourforce::{Motion, Species};
    let m = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e6).unwrap();
    let mut b = Element::AcceleratingGap {
        voltage_v: -999_000.0,
    }
    .try_apply(&BeamState::on_axis(m))
    .unwrap();
    for _ in 0..4096 {
        b = Element::AcceleratingGap { voltage_v: -0.1 }
            .try_apply(&b)
            .unwrap();
    }
    // The exact total in f64: 4096 times the f32 value of 0.1 is exact there.
    let want = (1000.0 - 4096.0 * f64::from(0.1_f32)) as f32;
    assert_eq!(b.kinetic_energy(), want);
    assert_eq!(b.motion().kinetic_energy(), want);
}
