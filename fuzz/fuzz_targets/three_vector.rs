//! Door: three-vectors from outside numbers (`ThreeVector::try_new`, `try_unit`, `norm`).
#![no_main]

use fourforce::{Error, ThreeVector};
use fuzzkit::{Bits, Input, both_precisions, finite, refused, within};
use libfuzzer_sys::fuzz_target;

fn run<T: Bits>(input: &mut Input<'_>) {
    let (x, y, z) = (input.real::<T>(), input.real::<T>(), input.real::<T>());
    let all_finite = x.is_finite() && y.is_finite() && z.is_finite();
    let v = match ThreeVector::try_new(x, y, z) {
        Ok(v) => {
            assert!(all_finite, "try_new accepted ({x:?}, {y:?}, {z:?})");
            v
        }
        Err(e) => {
            assert!(!all_finite);
            assert_eq!(e, Error::NonFinite);
            refused(
                "try_unit of a non-finite vector",
                ThreeVector::new(x, y, z).try_unit(),
                &[Error::NonFinite],
            );
            return;
        }
    };
    // The norm of a finite vector is finite unless the true length exceeds MAX.
    let n = v.norm();
    let largest = x.abs().max(y.abs()).max(z.abs());
    assert!(
        n >= largest,
        "norm {n:?} below the largest component {largest:?}"
    );
    if largest <= T::MAX / T::TWO {
        finite("norm", n);
    }
    let zero = x == T::ZERO && y == T::ZERO && z == T::ZERO;
    match v.try_unit() {
        Ok(u) => {
            assert!(!zero);
            // A unit vector has length 1 within a few ulps, and finite components.
            let len = within("unit x", u.x, -T::ONE, T::ONE) * u.x
                + within("unit y", u.y, -T::ONE, T::ONE) * u.y
                + within("unit z", u.z, -T::ONE, T::ONE) * u.z;
            let tol = T::from_f64(8.0) * T::EPSILON;
            assert!(
                (len - T::ONE).abs() <= tol,
                "try_unit({x:?}, {y:?}, {z:?}) = {u:?} has squared length {len:?}"
            );
        }
        Err(e) => {
            assert!(
                zero,
                "try_unit refused the non-zero vector ({x:?}, {y:?}, {z:?}) with {e:?}"
            );
            assert_eq!(e, Error::ZeroDirection);
        }
    }
}

fuzz_target!(|data: &[u8]| both_precisions!(data, run));
