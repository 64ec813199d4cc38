//! Benchmarks of the foundation (criterion): the four-force contraction `F^μ_ν u^ν`, the boost of
//! a four-vector and the boost of the field tensor, in f32 and f64, each side by side with two
//! baselines measured in the same run:
//! (a) a naive full 4×4 loop written here (16 multiplications for a contraction, 128 for
//!     `Λ F Λᵀ`), and
//! (b) nalgebra's `Matrix4 × Vector4` (and `Λ F Λᵀ` as two `Matrix4` products).
//!
//! Every input reaches the code through `black_box(&x)` (by reference), the same for the three
//! contenders: passing a four-vector by value through `black_box` forces a store and a reload
//! that costs more than the arithmetic.
//!
//! Run: `nice cargo bench -p fourforce-checks --bench foundation -- --warm-up-time 1 --measurement-time 2`.

// The naive baseline is the plain index loop on purpose.
#![allow(clippy::needless_range_loop)]

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use fourforce::{Boost, FieldTensor, FourVector, Real, ThreeVector};
use nalgebra::{Matrix4, Vector4};

/// The naive 4×4 matrix-vector loop.
#[inline]
fn naive_mat_vec<T: Real>(m: &[[T; 4]; 4], v: &[T; 4]) -> [T; 4] {
    let mut out = [T::ZERO; 4];
    for i in 0..4 {
        for j in 0..4 {
            out[i] += m[i][j] * v[j];
        }
    }
    out
}

/// The naive `Λ F Λᵀ` by two full 4×4 loops.
#[inline]
fn naive_congruence<T: Real>(l: &[[T; 4]; 4], f: &[[T; 4]; 4]) -> [[T; 4]; 4] {
    let mut lf = [[T::ZERO; 4]; 4];
    for i in 0..4 {
        for j in 0..4 {
            for k in 0..4 {
                lf[i][j] += l[i][k] * f[k][j];
            }
        }
    }
    let mut out = [[T::ZERO; 4]; 4];
    for i in 0..4 {
        for j in 0..4 {
            for k in 0..4 {
                out[i][j] += lf[i][k] * l[j][k];
            }
        }
    }
    out
}

macro_rules! bench_precision {
    ($c:ident, $t:ty, $label:literal) => {{
        type T = $t;
        let f = FieldTensor::<T>::try_from_fields(
            ThreeVector::new(1.2e5, -3.4e5, 0.7e5),
            ThreeVector::new(0.02, 0.5, -0.3),
        )
        .unwrap();
        let u = FourVector::<T>::try_four_velocity(ThreeVector::new(0.3, -0.2, 0.6)).unwrap();
        let boost = Boost::<T>::try_from_beta(ThreeVector::new(0.1, 0.5, -0.4)).unwrap();
        let mixed = f.to_mixed_matrix();
        let upper = f.to_matrix();
        let lambda = boost.to_transform().to_matrix();
        let na_mixed = Matrix4::<T>::from_fn(|i, j| mixed[i][j]);
        let na_upper = Matrix4::<T>::from_fn(|i, j| upper[i][j]);
        let na_lambda = Matrix4::<T>::from_fn(|i, j| lambda[i][j]);
        let na_u = Vector4::<T>::from(u.to_array());
        let u_arr = u.to_array();

        let mut g = $c.benchmark_group(concat!("contraction F u/", $label));
        g.bench_function("specialised (12 mul)", |b| {
            b.iter(|| black_box(&f).contract(*black_box(&u)))
        });
        g.bench_function("naive 4x4 loop", |b| {
            b.iter(|| naive_mat_vec(black_box(&mixed), black_box(&u_arr)))
        });
        g.bench_function("nalgebra Matrix4 x Vector4", |b| {
            b.iter(|| black_box(&na_mixed) * black_box(&na_u))
        });
        g.finish();

        // The same contraction over a batch of 256 four-velocities, as a control loop would run it.
        let batch: Vec<FourVector<T>> = (0..256_u16)
            .map(|i| {
                let b = <T as Real>::from_f64(f64::from(i) / 512.0);
                FourVector::try_four_velocity(ThreeVector::new(b, -b / 2.0, 0.25)).unwrap()
            })
            .collect();
        let batch_arr: Vec<[T; 4]> = batch.iter().map(|u| u.to_array()).collect();
        let batch_na: Vec<Vector4<T>> = batch_arr.iter().map(|a| Vector4::from(*a)).collect();
        let mut out = vec![[<T as Real>::ZERO; 4]; 256];
        let mut g = $c.benchmark_group(concat!("contraction F u, batch of 256/", $label));
        g.bench_function("specialised (12 mul)", |b| {
            b.iter(|| {
                let f = black_box(&f);
                for (o, u) in out.iter_mut().zip(black_box(&batch)) {
                    *o = f.contract(*u).to_array();
                }
                black_box(&out);
            })
        });
        g.bench_function("naive 4x4 loop", |b| {
            b.iter(|| {
                let m = black_box(&mixed);
                for (o, u) in out.iter_mut().zip(black_box(&batch_arr)) {
                    *o = naive_mat_vec(m, u);
                }
                black_box(&out);
            })
        });
        g.bench_function("nalgebra Matrix4 x Vector4", |b| {
            b.iter(|| {
                let m = black_box(&na_mixed);
                for (o, u) in out.iter_mut().zip(black_box(&batch_na)) {
                    let r = m * u;
                    *o = [r[0], r[1], r[2], r[3]];
                }
                black_box(&out);
            })
        });
        g.finish();

        let mut g = $c.benchmark_group(concat!("boost of a vector/", $label));
        g.bench_function("specialised (8 mul)", |b| {
            b.iter(|| black_box(&boost).apply(*black_box(&u)))
        });
        g.bench_function("naive 4x4 loop", |b| {
            b.iter(|| naive_mat_vec(black_box(&lambda), black_box(&u_arr)))
        });
        g.bench_function("nalgebra Matrix4 x Vector4", |b| {
            b.iter(|| black_box(&na_lambda) * black_box(&na_u))
        });
        g.finish();

        let mut g = $c.benchmark_group(concat!("boost of a vector, batch of 256/", $label));
        g.bench_function("specialised (8 mul)", |b| {
            b.iter(|| {
                let bst = black_box(&boost);
                for (o, u) in out.iter_mut().zip(black_box(&batch)) {
                    *o = bst.apply(*u).to_array();
                }
                black_box(&out);
            })
        });
        g.bench_function("naive 4x4 loop", |b| {
            b.iter(|| {
                let m = black_box(&lambda);
                for (o, u) in out.iter_mut().zip(black_box(&batch_arr)) {
                    *o = naive_mat_vec(m, u);
                }
                black_box(&out);
            })
        });
        g.bench_function("nalgebra Matrix4 x Vector4", |b| {
            b.iter(|| {
                let m = black_box(&na_lambda);
                for (o, u) in out.iter_mut().zip(black_box(&batch_na)) {
                    let r = m * u;
                    *o = [r[0], r[1], r[2], r[3]];
                }
                black_box(&out);
            })
        });
        g.finish();

        let mut g = $c.benchmark_group(concat!("boost of the field tensor/", $label));
        g.bench_function("specialised (30 mul)", |b| {
            b.iter(|| black_box(&boost).apply_field(black_box(&f)))
        });
        g.bench_function("naive 4x4 loops (L F L^T)", |b| {
            b.iter(|| naive_congruence(black_box(&lambda), black_box(&upper)))
        });
        g.bench_function("nalgebra Matrix4 (L F L^T)", |b| {
            b.iter(|| {
                black_box(&na_lambda) * black_box(&na_upper) * black_box(&na_lambda).transpose()
            })
        });
        g.finish();
    }};
}

/// The four-force written by hand from γ and β: `K = γ(Q E·β, Q(E + β × cB))` (eV/m), on arrays.
#[inline]
fn hand_four_force<T: Real>(q: T, gamma: T, beta: &[T; 3], e: &[T; 3], cb: &[T; 3]) -> [T; 4] {
    let qg = q * gamma;
    [
        qg * (e[0] * beta[0] + e[1] * beta[1] + e[2] * beta[2]),
        qg * (e[0] + beta[1] * cb[2] - beta[2] * cb[1]),
        qg * (e[1] + beta[2] * cb[0] - beta[0] * cb[2]),
        qg * (e[2] + beta[0] * cb[1] - beta[1] * cb[0]),
    ]
}

/// The smallest time per call of `f` over `rounds` rounds of `calls` calls, in ns.
fn min_ns(rounds: u32, calls: u32, mut f: impl FnMut()) -> f64 {
    let mut best = f64::INFINITY;
    for _ in 0..rounds {
        let start = std::time::Instant::now();
        for _ in 0..calls {
            f();
        }
        best = best.min(start.elapsed().as_secs_f64() * 1e9 / f64::from(calls));
    }
    best
}

/// `FieldTensor::four_force` against the hand-written `γ(Q E·β, Q(E + β × cB))` over a batch of 256
/// four-velocities, measured in alternation and compared by their fastest rounds (robust on a
/// loaded machine): printed as `ratio four-force <precision> <r>`.
fn four_force_ratio<T: Real>(name: &str) {
    let f = FieldTensor::<T>::try_from_fields(
        ThreeVector::new(T::from_f64(1.2e5), T::from_f64(-3.4e5), T::from_f64(0.7e5)),
        ThreeVector::new(T::from_f64(0.02), T::from_f64(0.5), T::from_f64(-0.3)),
    )
    .unwrap();
    let (e, cb) = (f.e().to_array(), f.c_b().to_array());
    let q = T::from_f64(-1.0);
    let us: Vec<FourVector<T>> = (0..256_u16)
        .map(|i| {
            let b = T::from_f64(f64::from(i) / 512.0);
            FourVector::try_four_velocity(ThreeVector::new(b, -b / T::TWO, T::from_f64(0.25)))
                .unwrap()
        })
        .collect();
    let gb: Vec<(T, [T; 3])> = us
        .iter()
        .map(|u| (u.time, (u.space / u.time).to_array()))
        .collect();
    let mut out = vec![[T::ZERO; 4]; 256];
    let (mut ours, mut hand) = (f64::MAX, f64::MAX);
    for _ in 0..5 {
        ours = ours.min(min_ns(40, 200, || {
            for (o, u) in out.iter_mut().zip(black_box(&us)) {
                *o = black_box(&f).four_force(q, *u).to_array();
            }
            black_box(&out);
        }));
        hand = hand.min(min_ns(40, 200, || {
            for (o, (g, b)) in out.iter_mut().zip(black_box(&gb)) {
                *o = hand_four_force(q, *g, b, black_box(&e), black_box(&cb));
            }
            black_box(&out);
        }));
    }
    println!(
        "ratio four-force {name} {:.2} ({:.2} ns / {:.2} ns per four-velocity)",
        ours / hand,
        ours / 256.0,
        hand / 256.0
    );
}

fn foundation(c: &mut Criterion) {
    four_force_ratio::<f32>("f32");
    four_force_ratio::<f64>("f64");
    bench_precision!(c, f32, "f32");
    bench_precision!(c, f64, "f64");
}

criterion_group!(benches, foundation);
criterion_main!(benches);
