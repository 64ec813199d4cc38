//! The one table of error budgets of the suite, and the error measures every module uses.
//!
//! A budget is the bound a test holds a result to, per precision: in eps of the format
//! (`f32`: 2⁻²³, `f64`: 2⁻⁵²) for the library's promised accuracy, or as a plain relative error
//! where the physics, not the rounding, sets it (a pusher's truncation error). Each entry names
//! the function or family it bounds; the promised bounds are those of the doc comments. A module
//! that needs a new bound adds it here, with the measured figure it covers.
#![allow(dead_code)]

use fourforce::{FieldTensor, FourVector, Real, ThreeVector};

/// A bound per precision.
#[derive(Clone, Copy, Debug)]
pub struct Budget {
    /// The bound in `f32`.
    pub f32: f64,
    /// The bound in `f64`.
    pub f64: f64,
}

impl Budget {
    /// The same bound in both precisions.
    pub const fn both(x: f64) -> Self {
        Self { f32: x, f64: x }
    }

    /// The bound for precision `T`.
    pub fn of<T: Real>(self) -> f64 {
        if T::MANTISSA_DIGITS == 24 {
            self.f32
        } else {
            self.f64
        }
    }
}

// --- promised accuracy, in eps of the format -------------------------------------------------

/// Every quantity of a `Motion`, from any constructor, 1 eV to 100 TeV, exact inputs.
pub const MOTION: Budget = Budget::both(8.0);
/// γ from a velocity vector (β or m/s), any direction, up to γ = 10³ (f32) and 10⁶ (f64).
pub const GAMMA_FROM_VELOCITY: Budget = Budget::both(4.0);
/// The four-force `K^μ`, per component, relative to `γ|Q|(|E| + |β||cB|)`; measured 1.49 (f32).
pub const FOUR_FORCE: Budget = Budget::both(1.6);
/// `K·u` relative to the four-force scale times `u⁰ + |u|`; measured 0.50 (f32).
pub const FORCE_ORTHOGONALITY: Budget = Budget::both(1.0);
/// A field boost, per component of E′ and cB′, relative to `γ_V(|E| + c|B|)`; measured 1.96 (f32).
pub const FIELD_BOOST: Budget = Budget::both(2.0);
/// A boost of a four-vector, per component, relative to `γ_V(|x⁰| + |x|)`; measured 1.85 (f32).
pub const VECTOR_BOOST: Budget = Budget::both(2.0);
/// `2(B² − E²/c²)` after a boost, relative to `2γ_V²(|E| + c|B|)²/c²`; measured 5.0 (f32).
pub const INVARIANT_AFTER_BOOST: Budget = Budget::both(6.0);
/// A four-velocity from `pc`, per component; measured 1.20 (f32).
pub const FOUR_VELOCITY_FROM_MOMENTUM: Budget = Budget::both(2.0);
/// B read back from a field tensor built from B in T; measured 1.12 (f32).
pub const FIELD_READBACK: Budget = Budget::both(2.0);
/// `four_velocity_deviation`, relative; measured 2.34 (f32).
pub const FOUR_VELOCITY_DEVIATION: Budget = Budget::both(3.0);
/// The near-null invariant from SI fields (`E = cB(1 − 10⁻⁶)`); measured 0.13 (f32), 0.96 (f64).
pub const NEAR_NULL_INVARIANT: Budget = Budget::both(1.5);

/// An energy implied by a witness and the fused energy, against 50-digit values.
pub const WITNESS_ENERGY: Budget = Budget::both(16.0);
/// The first-order uncertainty of a witness and of the fused energy.
pub const WITNESS_SIGMA: Budget = Budget::both(64.0);

// --- the fast path (feature micromath), relative -----------------------------------------------

/// `fourforce::fast`: always high, by at most this relative error.
pub const FAST: f64 = 1.74e-3;

// --- pushers, relative errors (truncation and rounding of the scheme) --------------------------

/// Gyration radius, frequency, advance; 2000 steps per turn. Measured 1.3e-6 (f32, the compensated
/// step; 2.1e-5 before it), 1.2e-6 (f64).
pub const GYRATION: Budget = Budget {
    f32: 5e-5,
    f64: 5e-6,
};
/// The exact discrete orbit at ω_c Δt = 1. Measured 3.2e-7 (f32), 2.3e-15 (f64).
pub const DISCRETE_ORBIT: Budget = Budget {
    f32: 2e-6,
    f64: 1e-12,
};
/// Crossed fields from rest, one period at ω_c Δt = 0.05 (truncation). Measured 3.1e-4.
pub const CROSSED: Budget = Budget::both(5e-4);
/// Energy gain and transit time across a uniform-field gap. Measured 6.7e-8 (f32, the compensated
/// step; 5.1e-5 before it), 9.1e-12 (f64).
pub const GAP: Budget = Budget {
    f32: 1e-4,
    f64: 1e-7,
};
/// Force-free E × B (Vay, Higuera–Cary). Measured 1.0e-5 (f32, the rounding of E = βcB, which the
/// compensated sum keeps), 4.7e-14.
pub const FORCE_FREE: Budget = Budget {
    f32: 1e-4,
    f64: 1e-12,
};
/// Change of |u| over 10⁶ steps in pure B. Measured 2.0e-5 (f32), 2.5e-14 (f64).
pub const NORM_DRIFT_1E6: Budget = Budget {
    f32: 1e-3,
    f64: 1e-12,
};
/// Error ratio when Δt halves (second order), as a band. Measured 3.99–4.30 (f32), 3.999–4.030.
pub const ORDER_BAND: (Budget, Budget) =
    (Budget { f32: 3.5, f64: 3.9 }, Budget { f32: 4.5, f64: 4.1 });

/// An f32 run of the compensated step against the f64 run of the same scheme: energy gain,
/// position and time over 10² to 10⁶ steps, and the orbit errors' difference (the doc of
/// `Pusher::try_step`). Measured 2.3e-7.
pub const PUSH_F32_AGAINST_F64: f64 = 1.0e-5;

// --- error measures ------------------------------------------------------------------------------

/// The machine epsilon of `T`, as f64.
pub fn eps<T: Real>() -> f64 {
    T::EPSILON.to_f64()
}

/// Relative error `|got − want| / |want|` in eps of `T` (both in f64); `|got|` in eps when
/// `want` is 0.
pub fn eps_rel<T: Real>(got: T, want: f64) -> f64 {
    if want == 0.0 {
        return got.to_f64().abs() / eps::<T>();
    }
    ((got.to_f64() - want) / want).abs() / eps::<T>()
}

/// `|got − want| / scale` in eps of `T`: for components that may cancel below their scale.
pub fn eps_abs<T: Real>(got: T, want: f64, scale: f64) -> f64 {
    (got.to_f64() - want).abs() / (scale * eps::<T>())
}

/// The largest of `|got_i − want_i| / scale` in eps of `T`, over four components.
pub fn eps_four<T: Real>(got: FourVector<T>, want: [f64; 4], scale: f64) -> f64 {
    got.to_array()
        .iter()
        .zip(want)
        .map(|(g, w)| eps_abs(*g, w, scale))
        .fold(0.0, f64::max)
}

/// The largest of `|got_i − want_i| / scale` in eps of `T`, over three components.
pub fn eps_three<T: Real>(got: ThreeVector<T>, want: [f64; 3], scale: f64) -> f64 {
    got.to_array()
        .iter()
        .zip(want)
        .map(|(g, w)| eps_abs(*g, w, scale))
        .fold(0.0, f64::max)
}

/// Plain relative error `|got/want − 1|`, measured in f64 (not in eps).
pub fn rel<T: Real>(got: T, want: f64) -> f64 {
    (got.to_f64() / want - 1.0).abs()
}

/// Signed relative error `(got − want)/want` (positive = high), measured in f64.
pub fn rel_signed<T: Real>(got: T, want: f64) -> f64 {
    (got.to_f64() - want) / want
}

/// Relative distance of two values of `T` in eps of `T`; 0 when they are equal (infinities too).
pub fn eps_apart<T: Real>(got: T, want: T) -> f64 {
    let (g, w) = (got.to_f64(), want.to_f64());
    if g == w {
        0.0
    } else {
        ((g - w) / w).abs() / eps::<T>()
    }
}

/// The name of the precision, for printed figures.
pub fn precision<T: Real>() -> &'static str {
    if T::MANTISSA_DIGITS == 24 {
        "f32"
    } else {
        "f64"
    }
}

// --- inputs ----------------------------------------------------------------------------------

/// An f64 literal in `T` (test inputs only).
pub fn t<T: Real>(x: f64) -> T {
    T::from_f64(x)
}

/// A three-vector of f64 literals in `T`.
pub fn v3<T: Real>(x: f64, y: f64, z: f64) -> ThreeVector<T> {
    ThreeVector::new(T::from_f64(x), T::from_f64(y), T::from_f64(z))
}

/// A three-vector widened to f64.
pub fn wide3<T: Real>(v: ThreeVector<T>) -> ThreeVector<f64> {
    ThreeVector::new(v.x.to_f64(), v.y.to_f64(), v.z.to_f64())
}

/// A four-vector widened to f64.
pub fn wide4<T: Real>(v: FourVector<T>) -> FourVector<f64> {
    FourVector::from_parts(v.time.to_f64(), wide3(v.space))
}

/// A field tensor widened to f64 (its stored E and cB).
pub fn wide_field<T: Real>(f: &FieldTensor<T>) -> FieldTensor<f64> {
    FieldTensor::from_scaled(wide3(f.e()), wide3(f.c_b()))
}

/// `|E| + |cB|` in V/m, the natural scale of the field tensor's components.
pub fn field_scale<T: Real>(f: &FieldTensor<T>) -> f64 {
    wide3(f.e()).norm() + wide3(f.c_b()).norm()
}

/// A small deterministic generator (xorshift64*), so that every run sees the same cases.
pub struct Rng(pub u64);
impl Rng {
    pub fn next(&mut self) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        let x = self.0.wrapping_mul(0x2545_f491_4f6c_dd1d);
        (x >> 11) as f64 / (1u64 << 53) as f64
    }
    /// Uniform in [-1, 1).
    pub fn signed(&mut self) -> f64 {
        2.0 * self.next() - 1.0
    }
    /// Log-uniform magnitude in [lo, hi].
    pub fn log_uniform(&mut self, lo: f64, hi: f64) -> f64 {
        (lo.ln() + self.next() * (hi.ln() - lo.ln())).exp()
    }
    /// A random direction times a log-uniform length, rounded to f32.
    pub fn vector(&mut self, lo: f64, hi: f64) -> ThreeVector<f32> {
        let d = ThreeVector::new(self.signed(), self.signed(), self.signed());
        let d = d / d.norm();
        let v = d * self.log_uniform(lo, hi);
        ThreeVector::new(v.x as f32, v.y as f32, v.z as f32)
    }
}

/// The speed of light, m/s (SI 2019, exact).
pub const C: f64 = 299_792_458.0;
