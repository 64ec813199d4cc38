//! Door: energy witnesses from outside numbers (`Reading::try_estimate` of every kind,
//! `Estimate::try_new`, `Watch::try_push`, `try_assess` at every level, `try_assess_with`,
//! `try_check_species`) in both precisions: no panic; every estimate finite, `T ≥ 0`, `σ > 0`;
//! every impossible reading its documented `Err`; the fused estimate finite, `χ²` finite and not
//! negative, the verdict and the outlier as documented; a refused watch names the first reading
//! that fails, with that reading's own error.
#![no_main]

use fourforce::witness::{Alpha, Reading, SpeciesVerdict, Watch};
use fourforce::{Error, Species};
use fuzzkit::{Bits, Input, both_precisions};
use libfuzzer_sys::fuzz_target;

const N: usize = 5;

/// A parameter: raw bits (NaN, infinities, subnormals, extremes) or, for one flag byte in two,
/// a modest number `k/16 · 10^e` so that the usual paths are reached as well.
fn param<T: Bits>(input: &mut Input<'_>) -> T {
    let flag = input.u8();
    if flag & 1 == 0 {
        input.real()
    } else {
        let k = f64::from(input.u8() as i8) / 16.0;
        let e = i32::from(flag >> 1) % 24 - 12;
        T::from_f64(k * 10f64.powi(e))
    }
}

fn species<T: Bits>(input: &mut Input<'_>) -> Option<Species<T>> {
    Some(match input.u8() % 6 {
        0 => Species::ELECTRON,
        1 => Species::PROTON,
        2 => Species::ALPHA,
        3 => Species::NEUTRON,
        4 => Species::try_new(param::<T>(input), param::<T>(input)).ok()?,
        _ => Species::try_new(T::ALPHA_REST_ENERGY, T::NEG_ONE).ok()?,
    })
}

fn reading<T: Bits>(input: &mut Input<'_>) -> Reading<T> {
    match input.u8() % 5 {
        0 => Reading::Kinetic {
            kinetic_ev: param(input),
            sigma_ev: param(input),
        },
        1 => Reading::FlightTime {
            time_s: param(input),
            sigma_s: param(input),
            baseline_m: param(input),
        },
        2 => Reading::Dipole {
            field_t: param(input),
            sigma_t: param(input),
            radius_m: param(input),
        },
        3 => Reading::Deflector {
            field_v_per_m: param(input),
            sigma_v_per_m: param(input),
            radius_m: param(input),
        },
        _ => Reading::Speed {
            speed_m_per_s: param(input),
            sigma_m_per_s: param(input),
        },
    }
}

/// Whether no species of charge `charged` could give the reading, by its documentation.
fn impossible<T: Bits>(r: &Reading<T>, charged: bool) -> bool {
    let fin = |xs: &[T]| xs.iter().all(|x| x.is_finite());
    let z = T::ZERO;
    match *r {
        Reading::Kinetic {
            kinetic_ev,
            sigma_ev,
        } => !fin(&[kinetic_ev, sigma_ev]) || kinetic_ev < z || sigma_ev <= z,
        Reading::FlightTime {
            time_s,
            sigma_s,
            baseline_m,
        } => {
            !fin(&[time_s, sigma_s, baseline_m])
                || time_s <= z
                || sigma_s <= z
                || baseline_m <= z
                // c t ≤ L, with a margin for the rounding of c t
                || time_s.to_f64() * 299_792_458.0 <= baseline_m.to_f64() * (1.0 - 1e-6)
        }
        Reading::Dipole {
            field_t,
            sigma_t,
            radius_m,
        } => {
            !fin(&[field_t, sigma_t, radius_m])
                || field_t <= z
                || sigma_t <= z
                || radius_m <= z
                || !charged
        }
        Reading::Deflector {
            field_v_per_m,
            sigma_v_per_m,
            radius_m,
        } => {
            !fin(&[field_v_per_m, sigma_v_per_m, radius_m])
                || field_v_per_m <= z
                || sigma_v_per_m <= z
                || radius_m <= z
                || !charged
        }
        Reading::Speed {
            speed_m_per_s,
            sigma_m_per_s,
        } => {
            !fin(&[speed_m_per_s, sigma_m_per_s])
                || speed_m_per_s <= z
                || sigma_m_per_s <= z
                || speed_m_per_s.to_f64() >= 299_792_458.0 * (1.0 + 1e-6)
        }
    }
}

const DOCUMENTED: [Error; 12] = [
    Error::NonFinite,
    Error::NonPositiveUncertainty,
    Error::NegativeEnergy,
    Error::NonPositiveLength,
    Error::FasterThanLight,
    Error::ZeroField,
    Error::NegativeMagnitude,
    Error::ZeroSpeed,
    Error::SpeedNotBelowLight,
    Error::ZeroCharge,
    Error::Overflow,
    Error::BelowRestEnergy,
];

fn run<T: Bits>(input: &mut Input<'_>) {
    let Some(species) = species::<T>(input) else {
        return;
    };
    let charged = species.charge() != T::ZERO;
    let mut watch = Watch::<T, N>::new();
    let count = input.u8() as usize % (N + 2);
    let mut estimates = Vec::new();
    for i in 0..count {
        let r = reading::<T>(input);
        let e = r.try_estimate(species);
        match e {
            Ok(e) => {
                assert!(!impossible(&r, charged), "{r:?} of {species:?} gave {e:?}");
                let (t, s) = (e.kinetic_energy(), e.uncertainty());
                assert!(
                    t.is_finite() && t >= T::ZERO && !t.is_sign_negative(),
                    "{r:?}: {e:?}"
                );
                assert!(s.is_finite() && s > T::ZERO, "{r:?}: {e:?}");
            }
            Err(err) => {
                assert!(DOCUMENTED.contains(&err), "{r:?} refused with {err:?}");
                if let Reading::Kinetic {
                    kinetic_ev,
                    sigma_ev,
                } = r
                {
                    assert!(impossible(&r, charged), "{r:?} refused with {err:?}");
                    assert_eq!(
                        fourforce::witness::Estimate::try_new(kinetic_ev, sigma_ev),
                        Err(err)
                    );
                }
                if !charged && matches!(r, Reading::Dipole { .. } | Reading::Deflector { .. }) {
                    // the rigidity B r or E r may overflow before the charge is looked at
                    assert!(
                        matches!(err, Error::ZeroCharge | Error::Overflow) || impossible(&r, true),
                        "{r:?} of a neutral species refused with {err:?}"
                    );
                }
            }
        }
        estimates.push(e);
        let pushed = watch.try_push(r);
        assert_eq!(pushed.is_ok(), i < N, "push {i}: {pushed:?}");
    }
    let n = count.min(N);
    assert_eq!(watch.len(), n);
    let alpha = Alpha::ALL[input.u8() as usize % Alpha::ALL.len()];
    match watch.try_assess(species, alpha) {
        Ok(a) => {
            assert!(n >= 1);
            assert!(estimates[..n].iter().all(|e| e.is_ok()));
            let f = a.fused();
            let (t, s) = (f.kinetic_energy(), f.uncertainty());
            assert!(
                t.is_finite() && t >= T::ZERO,
                "fused {f:?} of {estimates:?}"
            );
            assert!(s.is_finite() && s > T::ZERO, "fused {f:?} of {estimates:?}");
            let min_sigma = a
                .estimates()
                .iter()
                .map(|e| e.uncertainty())
                .fold(T::MAX, |m, x| m.min(x));
            assert!(
                s <= min_sigma,
                "fused sigma {s:?} above the smallest {min_sigma:?}"
            );
            let x = a.chi_squared();
            assert!(
                x.is_finite() && x >= T::ZERO,
                "chi^2 = {x:?} of {estimates:?}"
            );
            assert_eq!(a.degrees_of_freedom(), n - 1);
            assert_eq!(a.estimates().len(), n);
            if n == 1 {
                assert!(a.is_consistent() && x == T::ZERO);
            }
            let crit = alpha.critical_value::<T>(n - 1).unwrap_or(T::INFINITY);
            if n >= 2 {
                assert_eq!(a.is_consistent(), x <= crit, "chi^2 {x:?} vs {crit:?}");
            }
            if let Some(j) = a.outlier() {
                assert!(j < n && n >= 3 && !a.is_consistent());
            }
            // The same readings, the same table passed by hand: the same assessment.
            let by_hand = watch
                .try_assess_with(species, |k| alpha.critical_value(k).unwrap_or(T::INFINITY))
                .unwrap();
            assert_eq!(by_hand.chi_squared().to_bits_u64(), x.to_bits_u64());
            assert_eq!(by_hand.outlier(), a.outlier());
        }
        Err(e) => {
            if n == 0 {
                assert_eq!((e.index(), e.error()), (0, Error::Empty));
            } else {
                let i = e.index();
                assert!(i < n, "{e:?}");
                assert!(estimates[..i].iter().all(|x| x.is_ok()), "{e:?}");
                assert_eq!(estimates[i], Err(e.error()), "{e:?}");
            }
        }
    }
    // The species check among a few candidates.
    let candidates = [Species::PROTON, Species::ALPHA, species, Species::NEUTRON];
    match watch.try_check_species(&candidates, alpha) {
        Ok(v) => match v {
            SpeciesVerdict::One(i) => assert!(i < candidates.len()),
            SpeciesVerdict::Several { best, count } => {
                assert!(best < candidates.len() && count >= 2 && count <= candidates.len())
            }
            SpeciesVerdict::NoneConsistent { closest } => {
                assert!(closest.is_none_or(|i| i < candidates.len()))
            }
        },
        Err(e) => {
            assert!(
                !matches!(e.error(), Error::ZeroCharge | Error::Overflow),
                "species check refused with {e:?}"
            );
            assert!(n == 0 || e.index() < n, "{e:?}");
            if n == 0 {
                assert_eq!(e.error(), Error::Empty);
            }
        }
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
