//! Shared helpers of the fuzz targets: raw-bit float readers and the checks every target makes.
//!
//! Every float a target feeds the crate comes from raw bits (`f32::from_bits`, `f64::from_bits`),
//! so NaN (both signs, every payload), both infinities, subnormals, `-0.0` and the extremes all
//! reach the library. A target picks the precision from its first byte and runs the same generic
//! body for `f32` and `f64`.

use fourforce::{Error, Real};

/// Reads the fuzzer's bytes as a stream of numbers; past the end it reads zeros.
pub struct Input<'a> {
    data: &'a [u8],
}

impl<'a> Input<'a> {
    /// Wraps the fuzzer's input.
    pub fn new(data: &'a [u8]) -> Self {
        Self { data }
    }

    /// The next `N` bytes, zero-padded past the end of the input.
    pub fn bytes<const N: usize>(&mut self) -> [u8; N] {
        let mut out = [0u8; N];
        let n = N.min(self.data.len());
        out[..n].copy_from_slice(&self.data[..n]);
        self.data = &self.data[n..];
        out
    }

    /// The next byte.
    pub fn u8(&mut self) -> u8 {
        self.bytes::<1>()[0]
    }

    /// The next `u32`, little-endian.
    pub fn u32(&mut self) -> u32 {
        u32::from_le_bytes(self.bytes())
    }

    /// The next `u64`, little-endian.
    pub fn u64(&mut self) -> u64 {
        u64::from_le_bytes(self.bytes())
    }

    /// The next float of precision `T`, from raw bits.
    pub fn real<T: Bits>(&mut self) -> T {
        T::take(self)
    }

    /// Whatever is left, for text doors.
    pub fn rest(self) -> &'a [u8] {
        self.data
    }
}

/// A float that can be read from raw bits: `f32` from a `u32`, `f64` from a `u64`.
pub trait Bits: Real {
    /// Reads one value from the input's next 4 or 8 bytes.
    fn take(input: &mut Input<'_>) -> Self;
    /// The distance in units in the last place of `Self` between `self` and a reference value.
    fn ulps_from(self, reference: f64) -> f64;
}

impl Bits for f32 {
    fn take(input: &mut Input<'_>) -> Self {
        f32::from_bits(input.u32())
    }
    fn ulps_from(self, reference: f64) -> f64 {
        ulps(self as f64, reference, 24)
    }
}

impl Bits for f64 {
    fn take(input: &mut Input<'_>) -> Self {
        f64::from_bits(input.u64())
    }
    fn ulps_from(self, reference: f64) -> f64 {
        ulps(self, reference, 53)
    }
}

/// `|x - reference|` in units of the last place of `reference` in a format with `digits`
/// significand bits (subnormal spacing below the normal range).
pub fn ulps(x: f64, reference: f64, digits: i32) -> f64 {
    if x == reference {
        return 0.0;
    }
    let min_exp = if digits == 24 { -126 } else { -1022 };
    let e = if reference == 0.0 {
        min_exp
    } else {
        (reference.abs().log2().floor() as i32).max(min_exp)
    };
    (x - reference).abs() / 2f64.powi(e - (digits - 1))
}

/// Runs `body` for `f32` or `f64`, chosen by the low bit of the input's first byte.
#[macro_export]
macro_rules! both_precisions {
    ($data:expr, $body:ident) => {{
        let mut input = $crate::Input::new($data);
        if input.u8() & 1 == 0 {
            $body::<f32>(&mut input)
        } else {
            $body::<f64>(&mut input)
        }
    }};
}

/// Asserts that `x` is finite; names the quantity in the panic message.
#[track_caller]
pub fn finite<T: Real>(what: &str, x: T) -> T {
    assert!(x.is_finite(), "{what} = {x:?} is not finite");
    x
}

/// Asserts that `x` is finite and inside `[lo, hi]`.
#[track_caller]
pub fn within<T: Real>(what: &str, x: T, lo: T, hi: T) -> T {
    assert!(
        x.is_finite() && x >= lo && x <= hi,
        "{what} = {x:?} outside [{lo:?}, {hi:?}]"
    );
    x
}

/// Asserts that `x` is finite and not negative (`-0.0` allowed).
#[track_caller]
pub fn non_negative<T: Real>(what: &str, x: T) -> T {
    within(what, x, T::ZERO, T::MAX)
}

/// Asserts that a result is an error, and one of the listed errors.
#[track_caller]
pub fn refused<V: core::fmt::Debug>(what: &str, r: Result<V, Error>, allowed: &[Error]) {
    match r {
        Ok(v) => panic!("{what}: accepted an impossible input, gave {v:?}"),
        Err(e) => assert!(
            allowed.contains(&e),
            "{what}: refused with {e:?}, expected one of {allowed:?}"
        ),
    }
}

/// True when every value is finite.
pub fn all_finite<T: Real>(xs: &[T]) -> bool {
    xs.iter().all(|x| x.is_finite())
}
