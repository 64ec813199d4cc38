//! Door: Lorentz boosts from outside numbers (`Boost::try_from_beta`, `try_from_velocity`,
//! `try_from_speed`, `try_from_rapidity`, `try_from_four_velocity`), their accessors, inverse and
//! matrix form.
#![no_main]

use fourforce::{Boost, Error, FourVector, ThreeVector};
use fuzzkit::{Bits, Input, both_precisions, within};
use libfuzzer_sys::fuzz_target;

fn three<T: Bits>(input: &mut Input<'_>) -> ThreeVector<T> {
    ThreeVector::new(input.real(), input.real(), input.real())
}

fn run<T: Bits>(input: &mut Input<'_>) {
    let door = input.u8() % 5;
    let v = three::<T>(input);
    let s = input.real::<T>();
    let r = match door {
        0 => Boost::try_from_beta(v),
        1 => Boost::try_from_velocity(v),
        2 => Boost::try_from_speed(v, s),
        3 => Boost::try_from_rapidity(v, s),
        _ => Boost::try_from_four_velocity(FourVector::from_parts(s, v)),
    };
    let finite = v.is_finite() && (door < 2 || door == 4 || s.is_finite());
    let zero_direction = v.x == T::ZERO && v.y == T::ZERO && v.z == T::ZERO;
    let b = match r {
        Ok(b) => {
            assert!(finite, "door {door} accepted {v:?}, {s:?}");
            assert!(
                !(matches!(door, 2 | 3) && zero_direction),
                "zero direction accepted"
            );
            b
        }
        Err(e) => {
            let allowed: &[Error] = if !finite {
                &[Error::NonFinite]
            } else {
                match door {
                    0 | 1 => &[Error::SpeedNotBelowLight],
                    2 => &[Error::SpeedNotBelowLight, Error::ZeroDirection],
                    3 => &[Error::Overflow, Error::ZeroDirection],
                    _ => &[Error::Overflow],
                }
            };
            assert!(
                allowed.contains(&e),
                "door {door}: {v:?}, {s:?} refused with {e:?}"
            );
            if e == Error::ZeroDirection {
                assert!(zero_direction);
            }
            if door == 0 && e == Error::SpeedNotBelowLight {
                assert!(
                    v.norm() >= T::ONE * (T::ONE - T::EPSILON),
                    "beta {v:?} refused"
                );
            }
            return;
        }
    };
    let g = within("gamma", b.gamma(), T::ONE, T::MAX);
    let u = b.beta_gamma();
    assert!(u.is_finite(), "beta_gamma {u:?}");
    let beta = b.beta();
    // |β| = |u|/γ is below 1 up to the rounding of the quotients.
    let limit = T::ONE + T::from_f64(4.0) * T::EPSILON;
    assert!(
        beta.is_finite() && beta.norm() <= limit,
        "beta {beta:?} for {b:?}"
    );
    within("rapidity", b.rapidity(), T::ZERO, T::MAX);
    // γ² = 1 + |u|², to a few eps where it is representable.
    let (g64, n64) = (g.to_f64(), u.norm().to_f64());
    if g64 < 1e15 {
        let rel = ((g64 * g64 - 1.0 - n64 * n64) / (g64 * g64)).abs();
        assert!(
            rel <= 8.0 * T::EPSILON.to_f64(),
            "gamma {g:?} vs |u| {n64} ({rel})"
        );
    }
    // The inverse undoes the boost of the frame's own four-velocity: (γ, u) -> (1, 0) -> (γ, u).
    let frame = FourVector::from_parts(g, u);
    let rest = b.apply(frame);
    let back = b.inverse().apply(rest);
    if g64 < 1e3 {
        let tol = 16.0 * T::EPSILON.to_f64() * g64 * g64;
        assert!(
            (rest.time.to_f64() - 1.0).abs() <= tol,
            "rest frame time {rest:?} for {b:?}"
        );
        assert!(
            (back.time.to_f64() - g64).abs() <= tol * g64,
            "round trip {back:?} for {b:?}"
        );
        let dev = b.to_transform().metric_deviation();
        assert!(
            dev.to_f64() <= 16.0 * T::EPSILON.to_f64(),
            "metric deviation {dev:?} for {b:?}"
        );
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
