//! Benchmarks of the motion modules: ns per push step for each scheme in f32 and f64 beside a
//! hand-written scalar step of the same scheme (plain and compensated, the same formulas and sums
//! on plain arrays), ns per transport through a 16-element beam line, ns per orbit-correction iteration.
//!
//! Run bounded: `nice cargo bench -p fourforce-checks --bench motion -- --warm-up-time 1 --measurement-time 2`.

use criterion::{BenchmarkId, Criterion, black_box, criterion_group, criterion_main};
use fourforce::beamline::{BeamLine, BeamState, Element, KickDirection};
use fourforce::orbit::{Corrector, Monitor, Orbit, Response, Tuning};
use fourforce::push::{Boris, HigueraCary, Particle, Pusher, Vay};
use fourforce::{FieldTensor, Motion, Real, Species, ThreeVector};

fn t<T: Real>(x: f64) -> T {
    T::from_f64(x)
}

/// Crossed fields of an invented test stand: E = 1e5 V/m along y, B = 0.01 T along z.
fn crossed<T: Real>() -> (ThreeVector<T>, ThreeVector<T>) {
    (
        ThreeVector::new(T::ZERO, t(1.0e5), T::ZERO),
        ThreeVector::new(T::ZERO, T::ZERO, t(0.01)),
    )
}

// ------------------------------------------------------------------------------------------------
// Hand-written scalar steps of the same three schemes, on plain arrays, for the baseline: the same
// formulas and the same sums as the library (plain, or compensated two carries deep for u and one
// for x and t), without the library's types, checks and trait.

type V<T> = [T; 3];

fn add<T: Real>(a: V<T>, b: V<T>) -> V<T> {
    [a[0] + b[0], a[1] + b[1], a[2] + b[2]]
}
fn sub<T: Real>(a: V<T>, b: V<T>) -> V<T> {
    [a[0] - b[0], a[1] - b[1], a[2] - b[2]]
}
fn scale<T: Real>(a: V<T>, k: T) -> V<T> {
    [a[0] * k, a[1] * k, a[2] * k]
}
fn dot<T: Real>(a: V<T>, b: V<T>) -> T {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}
fn cross<T: Real>(a: V<T>, b: V<T>) -> V<T> {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}
/// Knuth's two-sum.
fn two_sum<T: Real>(a: T, b: T) -> (T, T) {
    let s = a + b;
    let bb = s - a;
    (s, (a - (s - bb)) + (b - bb))
}
/// The quartic root of Vay and Higuera–Cary, `γ² = (σ + √(σ² + 4q))/2`, without cancellation.
fn implicit<T: Real>(sigma: T, q: T) -> T {
    let root = (sigma * sigma + (q + q) * T::TWO).sqrt();
    if sigma >= T::ZERO {
        (sigma + root) * T::HALF
    } else {
        (q + q) / (root - sigma)
    }
}

#[derive(Clone, Copy)]
struct Hand<T: Real> {
    kick: T,
    c_dt: T,
    dt: T,
}

#[derive(Clone, Copy)]
struct HandState<T: Real> {
    x: V<T>,
    x_lo: V<T>,
    u: V<T>,
    u_lo: V<T>,
    u_lo2: V<T>,
    gamma: T,
    t: T,
    t_lo: T,
}

impl<T: Real> Hand<T> {
    fn boris(&self, u: V<T>, _gamma: T, e: V<T>, cb: V<T>) -> V<T> {
        let eps = scale(e, self.kick);
        let tau = scale(cb, self.kick);
        let um = add(u, eps);
        let gm = (T::ONE + dot(um, um)).sqrt();
        let t = scale(tau, T::ONE / gm);
        let s = T::TWO / (T::ONE + dot(t, t));
        let up = add(um, cross(um, t));
        add(add(eps, eps), cross(up, scale(t, s)))
    }

    fn vay(&self, u: V<T>, gamma: T, e: V<T>, cb: V<T>) -> V<T> {
        let eps = scale(e, self.kick);
        let tau = scale(cb, self.kick);
        let kicked = add(add(u, eps), eps);
        let first = add(add(eps, eps), cross(scale(u, T::ONE / gamma), tau));
        let up = add(u, first);
        let tau2 = dot(tau, tau);
        let ustar = dot(kicked, tau);
        let sigma = T::ONE + dot(up, up) - tau2;
        let t = scale(tau, T::ONE / implicit(sigma, tau2 + ustar * ustar).sqrt());
        let t2 = dot(t, t);
        let inv = T::ONE / (T::ONE + t2);
        if t2 <= T::ONE {
            let corr = sub(add(scale(t, dot(up, t)), cross(up, t)), scale(up, t2));
            add(first, scale(corr, inv))
        } else {
            sub(
                scale(add(add(up, scale(t, dot(up, t))), cross(up, t)), inv),
                u,
            )
        }
    }

    fn higuera_cary(&self, u: V<T>, _gamma: T, e: V<T>, cb: V<T>) -> V<T> {
        let eps = scale(e, self.kick);
        let tau = scale(cb, self.kick);
        let um = add(u, eps);
        let tau2 = dot(tau, tau);
        let ustar = dot(um, tau);
        let sigma = T::ONE + dot(um, um) - tau2;
        let gbar = implicit(sigma, tau2 + ustar * ustar).sqrt();
        let t = scale(tau, T::ONE / gbar);
        let s = T::TWO / (T::ONE + dot(t, t));
        let up = add(um, cross(um, t));
        add(add(eps, eps), cross(up, scale(t, s)))
    }

    /// The plain leapfrog around a change of u: u += Δu, x += c Δt u/γ, t compensated.
    #[inline(always)]
    fn plain(&self, p: &mut HandState<T>, du: V<T>) {
        p.u = add(p.u, du);
        p.gamma = (T::ONE + dot(p.u, p.u)).sqrt();
        p.x = add(p.x, scale(p.u, self.c_dt / p.gamma));
        (p.t, p.t_lo) = two_sum(p.t, self.dt + p.t_lo);
    }

    /// The compensated leapfrog: u two carries deep, x and t one.
    #[inline(always)]
    #[allow(clippy::needless_range_loop)] // three parallel arrays, one index
    fn compensated(&self, p: &mut HandState<T>, du: V<T>) {
        for i in 0..3 {
            let (s, e) = two_sum(p.u_lo[i], du[i]);
            let (hi, e1) = two_sum(p.u[i], s);
            let (c, l) = two_sum(e1, e + p.u_lo2[i]);
            let (hi, c) = two_sum(hi, c);
            p.u[i] = hi;
            p.u_lo[i] = c;
            p.u_lo2[i] = l;
        }
        p.gamma = (T::ONE + dot(p.u, p.u) + T::TWO * dot(p.u, p.u_lo)).sqrt();
        let drift = scale(p.u, self.c_dt / p.gamma);
        for i in 0..3 {
            (p.x[i], p.x_lo[i]) = two_sum(p.x[i], drift[i] + p.x_lo[i]);
        }
        (p.t, p.t_lo) = two_sum(p.t, self.dt + p.t_lo);
    }
}

fn push_group<T: Real>(c: &mut Criterion, name: &str) {
    let mut group = c.benchmark_group(format!("push step {name}"));
    let species = Species::<T>::ELECTRON;
    let dt: T = t(1.0e-12);
    let (e, field_b) = crossed::<T>();
    let field = FieldTensor::try_from_fields(e, field_b).unwrap();
    let u0 = ThreeVector::new(t(0.3), t(0.1), t(0.2));
    let start = Particle::try_new(ThreeVector::ZERO, u0, T::ZERO).unwrap();
    let factors = Boris::<T>::try_new(species, dt).unwrap();
    let hand = Hand {
        kick: factors.factors().kick(),
        c_dt: factors.factors().c_dt(),
        dt,
    };
    let (ea, cba) = (field.e().to_array(), field.c_b().to_array());
    let hand_start = HandState {
        x: [T::ZERO; 3],
        x_lo: [T::ZERO; 3],
        u: u0.to_array(),
        u_lo: [T::ZERO; 3],
        u_lo2: [T::ZERO; 3],
        gamma: start.gamma(),
        t: T::ZERO,
        t_lo: T::ZERO,
    };
    macro_rules! scheme {
        ($label:expr, $p:ty, $hand:ident) => {
            let pusher = <$p>::try_new(species, dt).unwrap();
            group.bench_function(concat!($label, ", hand-written plain step"), |b| {
                let mut p = hand_start;
                b.iter(|| {
                    let (e, cb) = black_box((ea, cba));
                    let du = hand.$hand(p.u, p.gamma, e, cb);
                    hand.plain(&mut p, du);
                    black_box(&p);
                });
            });
            group.bench_function(concat!($label, ", try_step_plain"), |b| {
                let mut p = start;
                b.iter(|| {
                    let _ = pusher.try_step_plain(&mut p, black_box(&field));
                    black_box(&p);
                });
            });
            group.bench_function(concat!($label, ", hand-written compensated step"), |b| {
                let mut p = hand_start;
                b.iter(|| {
                    let (e, cb) = black_box((ea, cba));
                    let du = hand.$hand(p.u, p.gamma, e, cb);
                    hand.compensated(&mut p, du);
                    black_box(&p);
                });
            });
            group.bench_function(concat!($label, ", try_step"), |b| {
                let mut p = start;
                b.iter(|| {
                    let _ = pusher.try_step(&mut p, black_box(&field));
                    black_box(&p);
                });
            });
        };
    }
    scheme!("Boris", Boris<T>, boris);
    scheme!("Vay", Vay<T>, vay);
    scheme!("Higuera-Cary", HigueraCary<T>, higuera_cary);
    group.finish();
}

/// The smallest time per call of `f` over `rounds` rounds of `calls` calls each, in ns.
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

/// Ratios of each library step to the hand-written step of the same scheme and form, measured
/// in alternation in the same run and compared by their fastest rounds (robust on a loaded
/// machine, where criterion's means wander): printed as `ratio <scheme> <form> <precision> <r>`.
fn push_ratios<T: Real>(name: &str) {
    let species = Species::<T>::ELECTRON;
    let dt: T = t(1.0e-12);
    let (e, field_b) = crossed::<T>();
    let field = FieldTensor::try_from_fields(e, field_b).unwrap();
    let u0 = ThreeVector::new(t(0.3), t(0.1), t(0.2));
    let start = Particle::try_new(ThreeVector::ZERO, u0, T::ZERO).unwrap();
    let boris = Boris::<T>::try_new(species, dt).unwrap();
    let hand = Hand {
        kick: boris.factors().kick(),
        c_dt: boris.factors().c_dt(),
        dt,
    };
    let (ea, cba) = (field.e().to_array(), field.c_b().to_array());
    let hand_start = HandState {
        x: [T::ZERO; 3],
        x_lo: [T::ZERO; 3],
        u: u0.to_array(),
        u_lo: [T::ZERO; 3],
        u_lo2: [T::ZERO; 3],
        gamma: start.gamma(),
        t: T::ZERO,
        t_lo: T::ZERO,
    };
    let (rounds, calls) = (200, 2000);
    macro_rules! ratio {
        ($label:expr, $p:ty, $hand:ident) => {
            let pusher = <$p>::try_new(species, dt).unwrap();
            let (mut hp, mut hc, mut lp, mut lc) = (f64::MAX, f64::MAX, f64::MAX, f64::MAX);
            for _ in 0..5 {
                let mut p = hand_start;
                hp = hp.min(min_ns(rounds / 5, calls, || {
                    let (e, cb) = black_box((ea, cba));
                    let du = hand.$hand(p.u, p.gamma, e, cb);
                    hand.plain(&mut p, du);
                    black_box(&p);
                }));
                let mut p = start;
                lp = lp.min(min_ns(rounds / 5, calls, || {
                    let _ = pusher.try_step_plain(&mut p, black_box(&field));
                    black_box(&p);
                }));
                let mut p = hand_start;
                hc = hc.min(min_ns(rounds / 5, calls, || {
                    let (e, cb) = black_box((ea, cba));
                    let du = hand.$hand(p.u, p.gamma, e, cb);
                    hand.compensated(&mut p, du);
                    black_box(&p);
                }));
                let mut p = start;
                lc = lc.min(min_ns(rounds / 5, calls, || {
                    let _ = pusher.try_step(&mut p, black_box(&field));
                    black_box(&p);
                }));
            }
            println!(
                "ratio {} plain {name} {:.2} ({lp:.1} ns / {hp:.1} ns); compensated {:.2} ({lc:.1} ns / {hc:.1} ns)",
                $label,
                lp / hp,
                lc / hc
            );
        };
    }
    ratio!("Boris", Boris<T>, boris);
    ratio!("Vay", Vay<T>, vay);
    ratio!("Higuera-Cary", HigueraCary<T>, higuera_cary);
}

/// A 16-element invented line: drifts, two correctors, a dipole, two gaps, a deflector.
fn line16<T: Real>() -> BeamLine<T, 16> {
    let h = KickDirection::Horizontal;
    let v = KickDirection::Vertical;
    BeamLine::try_from_elements(&[
        Element::Drift { length_m: t(1.0) },
        Element::MagneticKick {
            integrated_field_tm: t(1e-3),
            direction: h,
        },
        Element::Drift { length_m: t(0.5) },
        Element::MagneticKick {
            integrated_field_tm: t(-5e-4),
            direction: v,
        },
        Element::Drift { length_m: t(0.8) },
        Element::AcceleratingGap { voltage_v: t(5e5) },
        Element::Drift { length_m: t(0.3) },
        Element::HardEdgeDipole {
            field_t: t(0.2),
            length_m: t(0.4),
        },
        Element::Drift { length_m: t(1.2) },
        Element::ElectrostaticKick {
            integrated_field_v: t(2e3),
            direction: KickDirection::Angle(t(0.3)),
        },
        Element::Drift { length_m: t(0.6) },
        Element::AcceleratingGap { voltage_v: t(5e5) },
        Element::Drift { length_m: t(0.7) },
        Element::MagneticKick {
            integrated_field_tm: t(2e-4),
            direction: h,
        },
        Element::Drift { length_m: t(2.0) },
        Element::Drift { length_m: t(0.25) },
    ])
    .unwrap()
}

fn line_group<T: Real>(c: &mut Criterion, name: &str) {
    let line = line16::<T>();
    let beam = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(12e6)).unwrap();
    let start = BeamState::try_new(beam, t(1e-3), t(2e-4), t(-5e-4), t(1e-4), T::ZERO).unwrap();
    c.bench_with_input(
        BenchmarkId::new("beam line, 16 elements", name),
        &start,
        |b, s| {
            b.iter(|| black_box(line.try_transport(black_box(*s))));
        },
    );
}

/// One correction iteration of a loop with 8 monitors and 6 + 6 correctors, uncoupled planes
/// (no decomposition, no limit: the per-iteration cost).
fn orbit_group<T: Real>(c: &mut Criterion, name: &str) {
    let mut per_kick = [[[T::ZERO; 8]; 2]; 12];
    for (j, column) in per_kick.iter_mut().enumerate() {
        let (plane, first) = (j / 6, j % 6);
        for (i, r) in column[plane].iter_mut().enumerate().skip(first) {
            *r = t(1.0 + 0.3 * (i - first) as f64);
        }
    }
    let response = Response::try_new(per_kick, [t(0.8); 12]).unwrap();
    let monitor = Monitor::try_new(t(0.01), t(1.0e-6), T::ONE).unwrap();
    let corrector = Corrector::try_new(t(-4e-3), t(4e-3), t(1e-3)).unwrap();
    let tuning = Tuning::try_new(t(0.5), t(0.05), t(1e-3)).unwrap();
    let mut orbit =
        Orbit::<T, 8, 12>::try_new(response, [monitor; 8], [corrector; 12], tuning).unwrap();
    // readings that change sign every iteration, so no monitor looks stuck
    let readings = [[[t(1.2e-5), t(-0.7e-5)]; 8], [[t(-1.2e-5), t(0.7e-5)]; 8]];
    orbit.try_step(&readings[0], &mut [T::ZERO; 12]).unwrap();
    let mut k = 0;
    c.bench_with_input(
        BenchmarkId::new("orbit iteration 8 x 12", name),
        &readings,
        |b, r| {
            b.iter(|| {
                k ^= 1;
                let mut settings = [T::ZERO; 12];
                black_box(orbit.try_step(black_box(&r[k]), &mut settings))
            });
        },
    );
}

fn benches(c: &mut Criterion) {
    push_ratios::<f32>("f32");
    push_ratios::<f64>("f64");
    push_group::<f32>(c, "f32");
    push_group::<f64>(c, "f64");
    line_group::<f32>(c, "f32");
    line_group::<f64>(c, "f64");
    orbit_group::<f32>(c, "f32");
    orbit_group::<f64>(c, "f64");
}

criterion_group!(motion, benches);
criterion_main!(motion);
