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

/// True when an input is so large or so small that refusing it with `Error::Overflow` is the
/// documented behaviour: some product or quotient of the inputs (and `c`) a formula squares or
/// divides by is beyond the square root of the range of `T` (with a margin). The values are
/// given in f64, already converted to the units the formulas use.
pub fn extreme<T: Real>(values: &[f64]) -> bool {
    let half = if T::MANTISSA_DIGITS == 24 { 56 } else { 500 };
    let hi = 2f64.powi(half);
    let lo = 2f64.powi(-half);
    let c = 299_792_458.0;
    let v: Vec<f64> = values.iter().map(|x| x.abs()).collect();
    let mut probes = v.clone();
    for &a in &v {
        for &b in &v {
            if b != 0.0 {
                probes.push(a * b);
                probes.push(a / b);
                probes.push(a * b * c);
                probes.push(a / b / c);
                probes.push(a * c / b);
            }
        }
        probes.push(a * c);
        probes.push(a / c);
    }
    probes
        .iter()
        .any(|&p| p.is_finite() && (p > hi || (p != 0.0 && p < lo)))
        || probes.iter().any(|p| p.is_infinite())
}

/// Relative error of `x` against `want`, in units of the format's epsilon; 0 when both are 0.
pub fn rel_eps<T: Real>(x: T, want: T) -> f64 {
    let (x, w) = (x.to_f64(), want.to_f64());
    if x == w {
        return 0.0;
    }
    let eps = T::EPSILON.to_f64();
    let floor = T::MIN_POSITIVE.to_f64();
    (x - w).abs() / (w.abs().max(floor) * eps)
}

/// Every check an accepted state must pass: each accessor finite (flight times `+inf` only at
/// rest), inside its documented range, no `-0.0`, rigidities refused exactly for a neutral
/// species, and the door's own quantity read back as given.
#[track_caller]
pub fn check_motion<T: Real>(m: &fourforce::Motion<T>, door: u8, x: T, length: T) {
    let s = m.species();
    let rest = s.rest_energy();
    let c = T::SPEED_OF_LIGHT;
    let values = [
        ("kinetic_energy", m.kinetic_energy()),
        ("kinetic_energy_kev", m.kinetic_energy_kev()),
        ("kinetic_energy_mev", m.kinetic_energy_mev()),
        ("kinetic_energy_gev", m.kinetic_energy_gev()),
        ("total_energy", m.total_energy()),
        ("gamma", m.gamma()),
        ("gamma_minus_one", m.gamma_minus_one()),
        ("beta", m.beta()),
        ("one_minus_beta", m.one_minus_beta()),
        ("beta_gamma", m.beta_gamma()),
        ("momentum", m.momentum()),
        ("momentum_mev", m.momentum_mev()),
        ("momentum_si", m.momentum_si()),
        ("speed", m.speed()),
    ];
    for (name, v) in values {
        assert!(v.is_finite(), "{name} = {v:?} not finite in {m:?}");
        assert!(!v.is_sign_negative(), "{name} = {v:?} negative in {m:?}");
    }
    let beta = m.beta();
    let tpm = m.flight_time_per_metre();
    if beta == T::ZERO && m.momentum() == T::ZERO {
        assert!(
            tpm == T::INFINITY,
            "at rest, flight_time_per_metre = {tpm:?}"
        );
    } else if beta == T::ZERO {
        // Moving, with β = pc/E below the subnormal range: 1/(βc) may or may not fit.
        assert!(tpm > T::ZERO, "flight_time_per_metre = {tpm:?} for {m:?}");
    } else if beta.to_f64() * 299_792_458.0 * T::MAX.to_f64() > 1.0 {
        // Finite for every moving particle whose 1/(βc) fits (fixed on 2026-12-02 after the
        // sweep's finding); +inf, IEEE overflow, only where it does not.
        assert!(
            tpm.is_finite() && tpm.to_f64() * 299_792_458.0 >= 1.0 - 1e-6,
            "flight_time_per_metre = {tpm:?} for {m:?}"
        );
    }
    within("gamma", m.gamma(), T::ONE, T::MAX);
    within("beta", beta, T::ZERO, T::ONE);
    let omb = m.one_minus_beta();
    assert!(
        omb > T::ZERO && omb <= T::ONE,
        "one_minus_beta = {omb:?} for {m:?}"
    );
    assert!(
        m.total_energy() >= rest,
        "total energy below rest energy in {m:?}"
    );
    assert!(m.speed() <= c + T::from_f64(16.0), "speed above c in {m:?}");
    // The rigidities: refused exactly for a neutral species, else finite and not negative.
    for (name, r) in [
        ("magnetic_rigidity", m.try_magnetic_rigidity()),
        ("electric_rigidity", m.try_electric_rigidity()),
    ] {
        if s.charge() == T::ZERO {
            assert_eq!(
                r,
                Err(fourforce::Error::ZeroCharge),
                "{name} of a neutral species"
            );
        } else {
            // The true rigidity: pc/(c|Q|) or about T/|Q| (at most 2T/|Q|); `pc/|Q|` is formed
            // before the division by c.
            let q = s.charge().to_f64().abs();
            let true_size = (m.momentum().to_f64() / q).max(m.kinetic_energy().to_f64() / q);
            let too_big = true_size > T::MAX.to_f64() / 4.0;
            match r {
                // Refused as too large only where it is.
                Err(e) => assert!(
                    e == fourforce::Error::Overflow && too_big,
                    "{name} refused with {e:?} for {m:?}"
                ),
                Ok(v) => {
                    non_negative(name, v);
                }
            }
        }
    }
    // flight_time(L) for a length that keeps L/(βc) in range.
    if length.is_finite()
        && length >= T::ZERO
        && tpm.is_finite()
        && length.to_f64() * tpm.to_f64() < T::MAX.to_f64() / 4.0
    {
        let t = m.flight_time(length);
        assert!(
            t.is_finite() && t >= T::ZERO,
            "flight_time({length:?}) = {t:?} for {m:?}"
        );
    }
    // The door's own quantity, read back as given (where the state keeps it exactly).
    let back = match door {
        0 => Some(m.kinetic_energy()),
        4 => Some(m.total_energy()),
        5 => Some(m.gamma()),
        6 => Some(m.beta()),
        7 => Some(m.beta_gamma()),
        8 => Some(m.momentum()),
        _ => None,
    };
    if let Some(b) = back {
        let want = if x == T::ZERO { T::ZERO } else { x };
        assert!(b == want, "door {door}: x = {x:?} read back as {b:?}");
    }
}
