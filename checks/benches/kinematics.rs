//! Speed of each `Motion` conversion against the naive textbook formulas, in f32 and f64, in one
//! criterion run.
//!
//! Each benchmark turns a batch of 64 inputs (a log grid over 1 eV .. 100 TeV of a proton, held
//! behind `black_box`) into full states: ours is `Motion::try_from_*`, which computes every
//! quantity at once; the naive one finds T by the textbook formula for that input and then every
//! quantity the textbook way (tests/suite/reference/naive.rs). The result sums a few
//! quantities so that nothing is optimised away.
//!
//! Run bounded: `nice cargo bench -p fourforce-checks --bench kinematics -- --warm-up-time 1 --measurement-time 2`.

#[path = "../tests/suite/reference/naive.rs"]
mod naive;

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use fourforce::{Motion, Real, Species};

const N: usize = 64;

/// The inputs of one conversion for a proton, from kinetic energies 1 eV .. 100 TeV.
fn inputs<T: Real>(from: &str) -> [T; N] {
    let p = Species::<T>::PROTON;
    core::array::from_fn(|i| {
        let t = T::from_f64(10f64.powf(14.0 * i as f64 / (N - 1) as f64));
        let m = Motion::try_from_kinetic_energy(p, t).unwrap();
        match from {
            "kinetic_energy" => t,
            "total_energy" => m.total_energy(),
            "gamma" => m.gamma(),
            "beta" => m.beta().min(T::from_f64(0.999_999)),
            "beta_gamma" => m.beta_gamma(),
            "momentum" => m.momentum(),
            "magnetic_rigidity" => m.try_magnetic_rigidity().unwrap(),
            "electric_rigidity" => m.try_electric_rigidity().unwrap(),
            "speed" => m.speed().min(T::from_f64(2.99e8)),
            _ => m.flight_time(T::ONE).max(T::from_f64(3.4e-9)),
        }
    })
}

/// Sums `f` over the batch; `f` is a closure, so each conversion is its own inlined loop.
#[inline]
fn batch<T: Real>(xs: &[T; N], f: impl Fn(T) -> T) -> T {
    let mut acc = T::ZERO;
    for &x in black_box(xs) {
        acc += f(x);
    }
    acc
}

/// What a caller reads from our state: enough to keep every field alive.
#[inline]
fn ours<T: Real>(m: Result<Motion<T>, fourforce::Error>) -> T {
    match m {
        Ok(m) => m.gamma_minus_one() + m.one_minus_beta() + m.momentum() + m.speed(),
        Err(_) => T::ZERO,
    }
}

/// The same reads from the naive state, after the naive T.
#[inline]
fn textbook<T: Real>(s: Species<T>, t: T) -> T {
    let all = naive::all(s.rest_energy(), s.charge(), t);
    all[1] + all[3] + all[5] + all[9]
}

macro_rules! conversion {
    ($c:expr, $t:ty, $label:expr, $from:literal, $ours:expr, $naive:expr) => {{
        let s = Species::<$t>::PROTON;
        let (m, q, one) = (s.rest_energy(), s.charge(), <$t as Real>::ONE);
        let _ = (m, q, one);
        let xs = inputs::<$t>($from);
        let mut group = $c.benchmark_group(format!("{}/from_{}", $label, $from));
        group.bench_function("ours", |b| b.iter(|| batch(&xs, |x| ours($ours(s, x)))));
        group.bench_function("naive", |b| {
            b.iter(|| batch(&xs, |x| textbook(s, $naive(m, q, one, x))))
        });
        group.finish();
    }};
}

macro_rules! precision {
    ($c:expr, $t:ty, $label:expr) => {{
        conversion!(
            $c,
            $t,
            $label,
            "kinetic_energy",
            Motion::try_from_kinetic_energy,
            |_, _, _, x| x
        );
        conversion!(
            $c,
            $t,
            $label,
            "total_energy",
            Motion::try_from_total_energy,
            |m, _, _, x| naive::kinetic_from_total_energy(m, x)
        );
        conversion!(
            $c,
            $t,
            $label,
            "gamma",
            Motion::try_from_gamma,
            |m, _, _, x| naive::kinetic_from_gamma(m, x)
        );
        conversion!(
            $c,
            $t,
            $label,
            "beta",
            Motion::try_from_beta,
            |m, _, _, x| naive::kinetic_from_beta(m, x)
        );
        conversion!(
            $c,
            $t,
            $label,
            "beta_gamma",
            Motion::try_from_beta_gamma,
            |m, _, _, x| naive::kinetic_from_beta_gamma(m, x)
        );
        conversion!(
            $c,
            $t,
            $label,
            "momentum",
            Motion::try_from_momentum,
            |m, _, _, x| naive::kinetic_from_momentum(m, x)
        );
        conversion!(
            $c,
            $t,
            $label,
            "magnetic_rigidity",
            Motion::try_from_magnetic_rigidity,
            |m, q, _, x| naive::kinetic_from_magnetic_rigidity(m, q, x)
        );
        conversion!(
            $c,
            $t,
            $label,
            "electric_rigidity",
            Motion::try_from_electric_rigidity,
            |m, q, _, x| naive::kinetic_from_electric_rigidity(m, q, x)
        );
        conversion!(
            $c,
            $t,
            $label,
            "speed",
            Motion::try_from_speed,
            |m, _, _, x| naive::kinetic_from_speed(m, x)
        );
        conversion!(
            $c,
            $t,
            $label,
            "flight_time",
            |s, x| Motion::try_from_flight_time(s, 1.0, x),
            |m, _, one, x| naive::kinetic_from_flight_time(m, one, x)
        );
    }};
}

fn all(c: &mut Criterion) {
    precision!(c, f32, "f32");
    precision!(c, f64, "f64");
}

criterion_group!(benches, all);
criterion_main!(benches);
