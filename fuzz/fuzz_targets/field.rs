//! Door: the field tensor and the four-force from outside numbers (`FieldTensor::try_from_scaled`,
//! `try_from_fields`, the invariants, `try_four_force`, `try_four_force_newtons`,
//! `try_three_force_newtons`, `try_power_watts`).
#![no_main]

use fourforce::{Error, FieldTensor, FourVector, ThreeVector};
use fuzzkit::{Bits, Input, both_precisions, finite};
use libfuzzer_sys::fuzz_target;

fn three<T: Bits>(input: &mut Input<'_>) -> ThreeVector<T> {
    ThreeVector::new(input.real(), input.real(), input.real())
}

fn largest<T: Bits>(v: ThreeVector<T>) -> T {
    v.x.abs().max(v.y.abs()).max(v.z.abs())
}

fn run<T: Bits>(input: &mut Input<'_>) {
    let selector = input.u8();
    let (e, b) = (three::<T>(input), three::<T>(input));
    let limit = FieldTensor::<T>::limit();
    let finite_in = e.is_finite() && b.is_finite();
    // Constructors: refused exactly when non-finite or above the limit.
    let f = if selector & 1 == 0 {
        let r = FieldTensor::try_from_scaled(e, b);
        let ok = finite_in && largest(e) <= limit && largest(b) <= limit;
        match r {
            Ok(f) => {
                assert!(ok, "accepted E {e:?}, cB {b:?}");
                f
            }
            Err(err) => {
                assert!(!ok, "refused E {e:?}, cB {b:?} with {err:?}");
                // Either refusal when one vector is non-finite and the other too large.
                let ok = if finite_in {
                    err == Error::Overflow
                } else {
                    matches!(err, Error::NonFinite | Error::Overflow)
                };
                assert!(ok, "E {e:?}, cB {b:?}: {err:?}");
                return;
            }
        }
    } else {
        match FieldTensor::try_from_fields(e, b) {
            Ok(f) => {
                assert!(finite_in && largest(e) <= limit && largest(f.c_b()) <= limit);
                // cB within a few eps of c times B.
                for (cb, bb) in f.c_b().to_array().into_iter().zip(b.to_array()) {
                    let want = bb.to_f64() * 299_792_458.0;
                    let tol = want.abs() * 4.0 * T::EPSILON.to_f64() + T::MIN_POSITIVE.to_f64();
                    assert!((cb.to_f64() - want).abs() <= tol, "cB {cb:?} for B {bb:?}");
                }
                f
            }
            Err(err) => {
                let ok = if finite_in {
                    err == Error::Overflow
                } else {
                    matches!(err, Error::NonFinite | Error::Overflow)
                };
                assert!(ok, "E {e:?}, B {b:?}: {err:?}");
                if err == Error::Overflow {
                    let big = largest(e).to_f64().max(largest(b).to_f64() * 299_792_458.0);
                    assert!(
                        big > limit.to_f64() * (1.0 - 1e-6),
                        "refused E {e:?}, B {b:?}"
                    );
                }
                return;
            }
        }
    };
    // Within the limit every invariant is finite (documented).
    finite("scalar invariant", f.scalar_invariant());
    finite("pseudoscalar invariant", f.pseudoscalar_invariant());
    let d = f.dual();
    assert!(d.is_finite(), "dual {d:?}");
    if selector & 1 == 1 {
        finite(
            "scalar invariant of",
            FieldTensor::try_scalar_invariant_of(e, b).unwrap(),
        );
        finite(
            "pseudoscalar of",
            FieldTensor::try_pseudoscalar_invariant_of(e, b).unwrap(),
        );
    }
    // The four-force on an outside charge and four-vector: Ok values finite, NonFinite for
    // non-finite inputs, Overflow only for non-finite results.
    let charge = input.real::<T>();
    let u = FourVector::new(input.real::<T>(), input.real(), input.real(), input.real());
    let inputs_finite = charge.is_finite() && u.is_finite();
    match f.try_four_force(charge, u) {
        Ok(k) => {
            assert!(inputs_finite && k.is_finite(), "four-force {k:?}");
            match f.try_four_force_newtons(charge, u) {
                Ok(n) => assert!(n.is_finite()),
                Err(err) => assert_eq!(err, Error::Overflow),
            }
        }
        Err(err) => {
            let want = if inputs_finite {
                Error::Overflow
            } else {
                Error::NonFinite
            };
            assert_eq!(err, want, "charge {charge:?}, u {u:?}");
        }
    }
    let v = three::<T>(input);
    let inputs_finite = charge.is_finite() && v.is_finite();
    for r in [
        f.try_three_force_newtons(charge, v).map(|x| x.is_finite()),
        f.try_power_watts(charge, v).map(|x| x.is_finite()),
    ] {
        match r {
            Ok(ok) => assert!(inputs_finite && ok, "accepted charge {charge:?}, v {v:?}"),
            Err(err) => {
                let want = if inputs_finite {
                    Error::Overflow
                } else {
                    Error::NonFinite
                };
                assert_eq!(err, want, "charge {charge:?}, v {v:?}");
            }
        }
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
