//! The beam line against analytic results and the pushers.
//!
//! Sources beside each check: SOURCES.md [mpmath] (mpmath at
//! 50 digits from CODATA 2018), DESIGN's thin-element relations (theta = integral B dl / B rho,
//! sin theta = L / rho, offset rho (1 - cos theta): Jackson 3rd ed. §12.2, from memory), and a
//! cross-check against the Boris pusher of this crate.
#![allow(clippy::float_cmp)]
// Reference values are typed with all their published digits.
#![allow(clippy::excessive_precision)]

use crate::tolerance::{eps, rel, t};
use fourforce::FieldTensor;
use fourforce::beamline::{BeamLine, BeamState, Element, KickDirection};
use fourforce::push::{Boris, Particle, Pusher};
use fourforce::{Error, Motion, Real, Species, ThreeVector};

// [mpmath] from CODATA 2018
const PROTON_250_MEV_BRHO: f64 = 2.4321284387255044;
const PROTON_1_GEV_NS_PER_M: f64 = 3.8120493548822230;
const ALPHA_5_MEV_ERHO: f64 = 4996650.9299730097;
const ELECTRON_10_KEV_SPEED: f64 = 58455214.927781732;

fn corrector_then_drift<T: Real>() {
    let p = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(250e6)).unwrap();
    let line = BeamLine::<T, 4>::try_from_elements(&[
        Element::MagneticKick {
            integrated_field_tm: t(2.0e-3),
            direction: KickDirection::Horizontal,
        },
        Element::Drift { length_m: t(3.0) },
    ])
    .unwrap();
    let end = line.try_transport(BeamState::on_axis(p)).unwrap();
    // theta = integral B dl / B rho (DESIGN; Jackson §12.2 from memory), B rho [mpmath] from CODATA 2018
    let theta = 2.0e-3 / PROTON_250_MEV_BRHO;
    assert!(rel(end.x_slope(), theta) < 4.0 * eps::<T>());
    assert!(rel(end.x(), 3.0 * theta) < 6.0 * eps::<T>());
    assert_eq!(end.y(), T::ZERO);
    // time over the drift: L sqrt(1 + theta^2) / (beta c)
    let expected_time = 3.0 * (1.0 + theta * theta).sqrt() / p.speed().to_f64();
    assert!(rel(end.time(), expected_time) < 8.0 * eps::<T>());
}

fn drift_time_matches_published<T: Real>() {
    let p = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(1e9)).unwrap();
    let mut line = BeamLine::<T, 16>::new();
    for _ in 0..16 {
        line.try_push(Element::Drift { length_m: t(0.625) })
            .unwrap();
    }
    let end = line.try_transport(BeamState::on_axis(p)).unwrap();
    // 10 m at 3.8120493548822230 ns/m ([mpmath] from CODATA 2018)
    let e = rel(end.time(), 10.0 * PROTON_1_GEV_NS_PER_M * 1e-9);
    assert!(e < 6.0 * eps::<T>(), "{e:e}");
}

fn rotated_kick_is_split<T: Real>() {
    let p = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(250e6)).unwrap();
    let phi = core::f64::consts::FRAC_PI_6;
    let kick = Element::MagneticKick {
        integrated_field_tm: t(1.0e-3),
        direction: KickDirection::Angle(t(phi)),
    };
    let s = kick.try_apply(&BeamState::on_axis(p)).unwrap();
    let theta = 1.0e-3 / PROTON_250_MEV_BRHO;
    assert!(rel(s.x_slope(), theta * phi.cos()) < 6.0 * eps::<T>());
    assert!(rel(s.y_slope(), theta * phi.sin()) < 6.0 * eps::<T>());
    let v = Element::MagneticKick {
        integrated_field_tm: t(1.0e-3),
        direction: KickDirection::Vertical,
    }
    .try_apply(&BeamState::on_axis(p))
    .unwrap();
    assert_eq!(v.x_slope(), T::ZERO);
    assert!(rel(v.y_slope(), theta) < 4.0 * eps::<T>());
    // a negative charge goes the other way (sign convention of optics::try_kick_angle)
    let e = Motion::try_from_kinetic_energy(Species::<T>::ELECTRON, t(1e6)).unwrap();
    let s = kick.try_apply(&BeamState::on_axis(e)).unwrap();
    assert!(s.x_slope() < T::ZERO);
}

fn electrostatic_kick_matches_rigidity<T: Real>() {
    let a = Motion::try_from_kinetic_energy(Species::<T>::ALPHA, t(5e6)).unwrap();
    let s = Element::ElectrostaticKick {
        integrated_field_v: t(1.0e4),
        direction: KickDirection::Horizontal,
    }
    .try_apply(&BeamState::on_axis(a))
    .unwrap();
    // theta = integral E dl / E rho, E rho [mpmath] from CODATA 2018
    assert!(rel(s.x_slope(), 1.0e4 / ALPHA_5_MEV_ERHO) < 8.0 * eps::<T>());
    assert_eq!(s.kinetic_energy(), t(5e6));
}

fn dipole_on_axis_matches_circle<T: Real>() {
    let p = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(250e6)).unwrap();
    let (b, l) = (0.5, 0.2);
    let s = Element::HardEdgeDipole {
        field_t: t(b),
        length_m: t(l),
    }
    .try_apply(&BeamState::on_axis(p))
    .unwrap();
    // rho = B rho / B, sin theta = L / rho, offset rho (1 - cos theta) (DESIGN; Jackson §12.2)
    let rho = PROTON_250_MEV_BRHO / b;
    let theta = (l / rho).asin();
    let offset = 2.0 * rho * (0.5 * theta).sin().powi(2); // rho (1 - cos theta), no cancellation
    assert!(
        rel(s.x_slope(), theta.tan()) < 8.0 * eps::<T>(),
        "{:e}",
        rel(s.x_slope(), theta.tan())
    );
    assert!(
        rel(s.x(), offset) < 16.0 * eps::<T>(),
        "{:e}",
        rel(s.x(), offset)
    );
    let time = rho * theta / p.speed().to_f64();
    assert!(
        rel(s.time(), time) < 16.0 * eps::<T>(),
        "{:e}",
        rel(s.time(), time)
    );
}

/// The hard-edge dipole of the beam line against the Boris pusher through the same field region,
/// with an incoming horizontal and vertical slope (the vertical pitch shortens the horizontal
/// radius by its cosine).
#[test]
fn dipole_with_slopes_matches_the_pusher() {
    let species = Species::<f64>::PROTON;
    let p = Motion::try_from_kinetic_energy(species, 10e6).unwrap();
    let (b, l) = (0.8, 0.3);
    let (x0, xs0, y0, ys0) = (2.0e-3, 30.0e-3, -1.0e-3, 50.0e-3);
    let start = BeamState::try_new(p, x0, xs0, y0, ys0, 0.0).unwrap();
    let out = Element::HardEdgeDipole {
        field_t: b,
        length_m: l,
    }
    .try_apply(&start)
    .unwrap();
    // pusher: s along z, x horizontal, y vertical. A positive field here bends a positive charge
    // toward +x: B along -y (F = q v x B, v along +z).
    let field = move |x: ThreeVector<f64>, _t: f64| {
        let inside = x.z >= 0.0 && x.z < l;
        FieldTensor::try_from_fields(
            ThreeVector::ZERO,
            ThreeVector::new(0.0, if inside { -b } else { 0.0 }, 0.0),
        )
        .unwrap()
    };
    let bg = p.beta_gamma();
    let norm = (1.0 + xs0 * xs0 + ys0 * ys0).sqrt();
    let u = ThreeVector::new(xs0, ys0, 1.0) * (bg / norm);
    let steps = 200_000_u32;
    let dt = p.flight_time(l) / f64::from(steps) * 1.05;
    let pusher = Boris::try_new(species, dt).unwrap();
    let mut q = Particle::try_new(ThreeVector::new(x0, y0, 0.0), u, 0.0).unwrap();
    let mut prev = q;
    while q.position().z < l {
        prev = q;
        pusher.try_step(&mut q, &field).unwrap();
    }
    // interpolate to z = L
    let f = (l - prev.position().z) / (q.position().z - prev.position().z);
    let at = |a: f64, c: f64| a + f * (c - a);
    let x = at(prev.position().x, q.position().x);
    let y = at(prev.position().y, q.position().y);
    let time = at(prev.time(), q.time());
    let um = q.beta_gamma();
    let (xs, ys) = (um.x / um.z, um.y / um.z);
    let tol = 1e-5; // the pusher's step: c dt = 1.6e-6 m; field edge sampled per step
    assert!(
        (out.x() - x).abs() < tol * out.x().abs(),
        "x {} vs {x}",
        out.x()
    );
    assert!((out.y() - y).abs() < tol * 1e-2, "y {} vs {y}", out.y());
    assert!(
        (out.x_slope() - xs).abs() < tol * out.x_slope().abs(),
        "x' {} vs {xs}",
        out.x_slope()
    );
    assert!(
        (out.y_slope() - ys).abs() < tol * ys.abs(),
        "y' {} vs {ys}",
        out.y_slope()
    );
    assert!(
        (out.time() / time - 1.0).abs() < tol,
        "t {} vs {time}",
        out.time()
    );
}

fn gap_gains_q_v_exactly<T: Real>() {
    // [Landau–Lifshitz] §20, values [mpmath]: an electron from rest through 10 kV ends at 10 keV, v = 58455214.93
    // m/s ([mpmath], CODATA 2018). A positive voltage accelerates positive charges: the electron needs -10 kV.
    let e = Motion::try_from_kinetic_energy(Species::<T>::ELECTRON, T::ZERO).unwrap();
    let s = Element::AcceleratingGap {
        voltage_v: t(-10e3),
    }
    .try_apply(&BeamState::on_axis(e))
    .unwrap();
    assert_eq!(s.kinetic_energy(), t(10e3));
    assert!(rel(s.motion().speed(), ELECTRON_10_KEV_SPEED) < 4.0 * eps::<T>());
    // the transverse momentum is kept: x' p_s is invariant (thin gap, no transverse field)
    let p = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(1e6)).unwrap();
    let before = BeamState::try_new(p, T::ZERO, t(2e-3), T::ZERO, t(-1e-3), T::ZERO).unwrap();
    let after = Element::AcceleratingGap { voltage_v: t(3e6) }
        .try_apply(&before)
        .unwrap();
    let px = |s: &BeamState<T>| {
        let (a, b) = (s.x_slope().to_f64(), s.y_slope().to_f64());
        s.motion().momentum().to_f64() * a / (1.0 + a * a + b * b).sqrt()
    };
    assert!((px(&after) / px(&before) - 1.0).abs() < 8.0 * eps::<T>());
    assert_eq!(after.kinetic_energy(), t(4e6));
}

fn small_gains_survive<T: Real>() {
    // precision trap ([IEEE 754] single precision): f32 1e9 + 10 == 1e9. The state keeps the
    // gains apart in a compensated pair: 1000 gaps of 10 eV on a 1 GeV proton add 10 keV.
    let p = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(1e9)).unwrap();
    let mut line = BeamLine::<T, 1000>::new();
    for _ in 0..1000 {
        line.try_push(Element::AcceleratingGap { voltage_v: t(10.0) })
            .unwrap();
    }
    let end = line.try_transport(BeamState::on_axis(p)).unwrap();
    assert_eq!(end.energy_gain(), t(10_000.0));
    assert_eq!(end.kinetic_energy(), t::<T>(1e9) + t::<T>(10_000.0));
    // and the naive sum loses it all in f32
    let mut naive = t::<T>(1e9);
    for _ in 0..1000 {
        naive += t(10.0);
    }
    if T::MANTISSA_DIGITS == 24 {
        assert_eq!(naive, t(1e9));
    }
}

fn impossible_elements_are_typed_errors<T: Real>() {
    let mut line = BeamLine::<T, 2>::new();
    assert_eq!(
        line.try_push(Element::Drift { length_m: t(-1.0) }),
        Err(Error::NonPositiveLength)
    );
    assert_eq!(
        line.try_push(Element::HardEdgeDipole {
            field_t: T::INFINITY,
            length_m: t(1.0)
        }),
        Err(Error::NonFinite)
    );
    assert_eq!(
        line.try_push(Element::MagneticKick {
            integrated_field_tm: t(1e-3),
            direction: KickDirection::Angle(T::INFINITY)
        }),
        Err(Error::NonFinite)
    );
    line.try_push(Element::Drift { length_m: T::ZERO }).unwrap();
    line.try_push(Element::Drift { length_m: t(1.0) }).unwrap();
    assert_eq!(
        line.try_push(Element::Drift { length_m: t(1.0) }),
        Err(Error::CapacityFull)
    );
    assert_eq!(line.len(), 2);
    // an energy loss below rest
    let p = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(1e6)).unwrap();
    let brake = Element::AcceleratingGap {
        voltage_v: t(-1.5e6),
    };
    assert_eq!(
        brake.try_apply(&BeamState::on_axis(p)),
        Err(Error::BelowRestEnergy)
    );
    // a dipole that turns the particle back: L > rho
    let bend = Element::HardEdgeDipole {
        field_t: t(1.0),
        length_m: t(1.0),
    };
    assert_eq!(
        bend.try_apply(&BeamState::on_axis(p)),
        Err(Error::AngleOutOfRange)
    );
    // a neutral particle in a corrector
    let n = Motion::try_from_kinetic_energy(Species::<T>::NEUTRON, t(1e6)).unwrap();
    let kick = Element::MagneticKick {
        integrated_field_tm: t(1e-3),
        direction: KickDirection::Horizontal,
    };
    assert_eq!(
        kick.try_apply(&BeamState::on_axis(n)),
        Err(Error::ZeroCharge)
    );
    // a particle at rest never arrives
    let rest = Motion::try_from_kinetic_energy(Species::<T>::PROTON, T::ZERO).unwrap();
    assert_eq!(
        Element::Drift { length_m: t(1.0) }.try_apply(&BeamState::on_axis(rest)),
        Err(Error::Overflow)
    );
}

fn every_element_is_reachable<T: Real>() {
    let p = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(20e6)).unwrap();
    let line = BeamLine::<T, 16>::try_from_elements(&[
        Element::Drift { length_m: t(1.0) },
        Element::MagneticKick {
            integrated_field_tm: t(1e-3),
            direction: KickDirection::Horizontal,
        },
        Element::Drift { length_m: t(1.0) },
        Element::AcceleratingGap { voltage_v: t(1e6) },
        Element::HardEdgeDipole {
            field_t: t(0.1),
            length_m: t(0.5),
        },
        Element::ElectrostaticKick {
            integrated_field_v: t(1e3),
            direction: KickDirection::Vertical,
        },
        Element::Drift { length_m: t(2.0) },
    ])
    .unwrap();
    let start = BeamState::try_new(p, t(1e-3), T::ZERO, T::ZERO, t(1e-4), T::ZERO).unwrap();
    let mut seen = 0;
    let mut last = start;
    for item in line.states(start) {
        let (i, s) = item.unwrap();
        assert_eq!(i, seen);
        let head = BeamLine::<T, 16>::try_from_elements(&line.elements()[..=i]).unwrap();
        assert_eq!(s, head.try_transport(start).unwrap());
        assert!(s.time() >= last.time());
        last = s;
        seen += 1;
    }
    assert_eq!(seen, line.len());
    assert_eq!(last, line.try_transport(start).unwrap());
    assert!(line.states(start).nth(line.len()).is_none());
}

macro_rules! both {
    ($($name:ident),*) => {
        mod f32_checks { $( #[test] fn $name() { super::$name::<f32>(); } )* }
        mod f64_checks { $( #[test] fn $name() { super::$name::<f64>(); } )* }
    };
}

both!(
    corrector_then_drift,
    drift_time_matches_published,
    rotated_kick_is_split,
    electrostatic_kick_matches_rigidity,
    dipole_on_axis_matches_circle,
    gap_gains_q_v_exactly,
    small_gains_survive,
    impossible_elements_are_typed_errors,
    every_element_is_reachable
);

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]

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
}

mod mutants {
    //! Sharper tests that kill mutants cargo-mutants found surviving: each pins a result a wrong
    //! operator or a constant return would change; values exact in both precisions.
    #![allow(clippy::float_cmp)]

    use fourforce::Species;
    macro_rules! sharper_beamline {
        ($t:ident, $name:ident) => {
            /// A drift moves both planes: `y += L y'` as `x += L x'` (straight-line geometry). The
            /// values are exact in both precisions (powers of two).
            #[test]
            fn $name() {
                use fourforce::beamline::{BeamState, Element};
                let m = fourforce::Motion::try_from_kinetic_energy(Species::<$t>::PROTON, 1.0e6)
                    .unwrap();
                let start = BeamState::try_new(m, 0.25, 0.5, 0.125, 0.0625, 0.0).unwrap();
                let end = Element::Drift { length_m: 2.0 }.try_apply(&start).unwrap();
                assert_eq!((end.x(), end.x_slope()), (1.25, 0.5));
                assert_eq!((end.y(), end.y_slope()), (0.25, 0.0625));
            }
        };
    }

    sharper_beamline!(f32, drift_moves_both_planes_f32);
    sharper_beamline!(f64, drift_moves_both_planes_f64);
    macro_rules! sharper_gain {
        ($t:ident, $name:ident) => {
            /// The gain of a line of gaps is a compensated sum: its carry (the rounding error of the
            /// running sum) is added back when the kinetic energy is read. A proton from rest through
            /// +1 V, then +0.375 eps V: the running sum stays 1 and the carry holds 0.375 eps, so the
            /// energy reads `1 + 0.375 eps`, which rounds to 1; with the carry subtracted instead it
            /// would read `1 − 0.375 eps`, which rounds to the float below 1.
            #[test]
            fn $name() {
                use fourforce::beamline::{BeamState, Element};
                let rest =
                    fourforce::Motion::try_from_kinetic_energy(Species::<$t>::PROTON, 0.0).unwrap();
                let small = 0.375 * <$t>::EPSILON;
                let s = Element::AcceleratingGap { voltage_v: 1.0 }
                    .try_apply(&BeamState::on_axis(rest))
                    .unwrap();
                let s = Element::AcceleratingGap { voltage_v: small }
                    .try_apply(&s)
                    .unwrap();
                assert_eq!(s.kinetic_energy(), 1.0);
                assert_eq!(s.energy_gain(), 1.0);
            }
        };
    }

    sharper_gain!(f32, gap_gain_carry_is_added_f32);
    sharper_gain!(f64, gap_gain_carry_is_added_f64);
    /// Survivors of the full run of 2026-12-02 (`ci/mutants`), one test per mutant or group.
    macro_rules! sharper_edges {
        ($t:ident, $name:ident) => {
            mod $name {
                use super::*;
                use fourforce::Error;

                /// The beam line's accessors and the window's bookkeeping say what they hold.
                #[test]
                fn containers_report_their_contents() {
                    use fourforce::beamline::{BeamLine, Element};
                    use fourforce::check::MovingWindow;
                    let mut line = BeamLine::<$t, 3>::new();
                    assert!(line.is_empty());
                    assert_eq!(line.capacity(), 3);
                    line.try_push(Element::Drift { length_m: 1.0 }).unwrap();
                    assert!(!line.is_empty());
                    let mut w = MovingWindow::<$t, 2>::new();
                    assert!(w.is_empty() && !w.is_full());
                    w.try_push(1.0).unwrap();
                    assert!(!w.is_empty() && !w.is_full());
                    w.try_push(2.0).unwrap();
                    assert!(!w.is_empty() && w.is_full());
                    w.clear();
                    assert!(w.is_empty() && !w.is_full() && w.len() == 0);
                    assert_eq!(w.try_mean(), Err(Error::Empty));
                }

                /// A gap that brings the particle exactly to rest is allowed; one that would leave
                /// too little momentum for the slopes it carries is refused.
                #[test]
                fn gap_to_rest_and_gap_too_strong_for_the_slopes() {
                    use fourforce::Motion;
                    use fourforce::beamline::{BeamState, Element};
                    let m = Motion::try_from_kinetic_energy(Species::<$t>::PROTON, 1.0e6).unwrap();
                    let stop = Element::AcceleratingGap { voltage_v: -1.0e6 };
                    let rest = stop.try_apply(&BeamState::on_axis(m)).unwrap();
                    assert_eq!(rest.kinetic_energy(), 0.0);
                    let steep = BeamState::try_new(m, 0.0, 1.0, 0.0, 0.0, 0.0).unwrap();
                    let brake = Element::AcceleratingGap { voltage_v: -0.9e6 };
                    assert_eq!(brake.try_apply(&steep), Err(Error::AngleOutOfRange));
                }
            }
        };
    }

    sharper_edges!(f32, edges_f32);
    sharper_edges!(f64, edges_f64);
    /// The beam state's time and energy gain are compensated sums: after 4096 equal drifts or gaps
    /// in f32 they equal the exactly rounded total (N·τ and N·δ are exact in f64).
    #[test]
    fn f32_beam_state_sums_are_compensated() {
        use fourforce::Motion;
        use fourforce::beamline::{BeamState, Element};
        let m = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e6).unwrap();
        let drift = Element::Drift { length_m: 0.1 };
        let gap = Element::AcceleratingGap { voltage_v: 0.1 };
        let tau = f64::from(drift.try_apply(&BeamState::on_axis(m)).unwrap().time());
        let delta = f64::from(0.1_f32);
        let (mut s, mut g) = (BeamState::on_axis(m), BeamState::on_axis(m));
        for _ in 0..4096 {
            s = drift.try_apply(&s).unwrap();
            g = gap.try_apply(&g).unwrap();
        }
        assert_eq!(s.time(), (4096.0 * tau) as f32);
        assert_eq!(g.energy_gain(), (4096.0 * delta) as f32);
        assert_eq!(g.kinetic_energy(), (1.0e6 + 4096.0 * delta) as f32);
    }
}
