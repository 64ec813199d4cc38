//! Helpers shared by the foundation tests: relative errors in eps of the format, and scales.
#![allow(dead_code)]

use fourforce::{FieldTensor, FourVector, Real, ThreeVector};

/// Relative error `|got − want| / |want|` in eps of `T` (both widened to f64).
pub fn eps_rel<T: Real>(got: T, want: f64) -> f64 {
    let e = T::EPSILON.to_f64();
    if want == 0.0 {
        return got.to_f64().abs() / e;
    }
    ((got.to_f64() - want) / want).abs() / e
}

/// `|got − want| / scale` in eps of `T`: for components that may cancel below their scale.
pub fn eps_abs<T: Real>(got: T, want: f64, scale: f64) -> f64 {
    (got.to_f64() - want).abs() / (scale * T::EPSILON.to_f64())
}

/// The largest of `|a_i − b_i| / scale` in eps of `T`, over four components.
pub fn eps_four<T: Real>(got: FourVector<T>, want: [f64; 4], scale: f64) -> f64 {
    got.to_array()
        .iter()
        .zip(want)
        .map(|(g, w)| eps_abs(*g, w, scale))
        .fold(0.0, f64::max)
}

/// The largest of `|a_i − b_i| / scale` in eps of `T`, over three components.
pub fn eps_three<T: Real>(got: ThreeVector<T>, want: [f64; 3], scale: f64) -> f64 {
    got.to_array()
        .iter()
        .zip(want)
        .map(|(g, w)| eps_abs(*g, w, scale))
        .fold(0.0, f64::max)
}

/// Widens a three-vector to f64.
pub fn wide3<T: Real>(v: ThreeVector<T>) -> ThreeVector<f64> {
    ThreeVector::new(v.x.to_f64(), v.y.to_f64(), v.z.to_f64())
}

/// Widens a four-vector to f64.
pub fn wide4<T: Real>(v: FourVector<T>) -> FourVector<f64> {
    FourVector::from_parts(v.time.to_f64(), wide3(v.space))
}

/// Widens a field tensor to f64 (its stored E and cB).
pub fn wide_field<T: Real>(f: &FieldTensor<T>) -> FieldTensor<f64> {
    FieldTensor::from_scaled(wide3(f.e()), wide3(f.c_b()))
}

/// Narrows an f64 literal vector to `T` (test inputs only).
pub fn v3<T: Real>(x: f64, y: f64, z: f64) -> ThreeVector<T> {
    ThreeVector::new(T::from_f64(x), T::from_f64(y), T::from_f64(z))
}

/// `|E| + |cB|` in V/m, the natural scale of the field tensor's components.
pub fn field_scale<T: Real>(f: &FieldTensor<T>) -> f64 {
    wide3(f.e()).norm() + wide3(f.c_b()).norm()
}
