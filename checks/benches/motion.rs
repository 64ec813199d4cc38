//! Benchmarks of the motion modules: ns per push step for each scheme in f32 and f64 beside a
//! naive baseline written here (a non-relativistic explicit Euler step), ns per transport through
//! a 16-element beam line, ns per steering step.
//!
//! Run bounded: `nice cargo bench -p fourforce-checks --bench motion -- --warm-up-time 1 --measurement-time 2`.

use criterion::{BenchmarkId, Criterion, black_box, criterion_group, criterion_main};
use fourforce::beamline::{BeamLine, BeamState, Element, KickDirection};
use fourforce::push::{Boris, HigueraCary, Particle, Pusher, Vay};
use fourforce::steer::SteeringSetup;
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

/// The baseline: a non-relativistic explicit Euler step, v += (q/m)(E + v × B) dt, x += v dt,
/// with q/m and dt premultiplied (the cheapest thing one could write; wrong at any speed).
#[derive(Clone, Copy)]
struct NaiveEuler<T: Real> {
    q_dt_over_m: T,
    dt: T,
}

impl<T: Real> NaiveEuler<T> {
    #[inline]
    fn step(
        &self,
        x: &mut ThreeVector<T>,
        v: &mut ThreeVector<T>,
        (e, b): (ThreeVector<T>, ThreeVector<T>),
    ) {
        let a = (e + v.cross(b)) * self.q_dt_over_m;
        *x += *v * self.dt;
        *v += a;
    }
}

fn push_group<T: Real>(c: &mut Criterion, name: &str) {
    let mut group = c.benchmark_group(format!("push step {name}"));
    let species = Species::<T>::ELECTRON;
    let dt: T = t(1.0e-12);
    let (e, field_b) = crossed::<T>();
    let field = FieldTensor::try_from_fields(e, field_b).unwrap();
    let start = Particle::try_new(
        ThreeVector::ZERO,
        ThreeVector::new(t(0.3), t(0.1), t(0.2)),
        T::ZERO,
    )
    .unwrap();
    let naive = NaiveEuler {
        q_dt_over_m: t(-1.758_820_010_76e11 * 1.0e-12),
        dt,
    };
    group.bench_function("naive non-relativistic Euler (baseline)", |b| {
        let mut x = ThreeVector::<T>::ZERO;
        let mut v = ThreeVector::new(t(9.0e7), t(3.0e7), t(6.0e7));
        b.iter(|| {
            naive.step(&mut x, &mut v, black_box((e, field_b)));
            black_box(&x);
        });
    });
    macro_rules! scheme {
        ($label:expr, $p:ty) => {
            let pusher = <$p>::try_new(species, dt).unwrap();
            group.bench_function($label, |b| {
                let mut p = start;
                b.iter(|| {
                    let _ = pusher.try_step(&mut p, black_box(&field));
                    black_box(&p);
                });
            });
        };
    }
    scheme!("Boris", Boris<T>);
    scheme!("Vay", Vay<T>);
    scheme!("Higuera-Cary", HigueraCary<T>);
    group.finish();
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

fn steer_group<T: Real>(c: &mut Criterion, name: &str) {
    let setup = SteeringSetup::try_new(t::<T>(2.4), t(0.5), t(4e-3), t(5e-5)).unwrap();
    let beam = Motion::try_from_kinetic_energy(Species::<T>::PROTON, t(12e6)).unwrap();
    c.bench_with_input(BenchmarkId::new("steering step", name), &beam, |b, m| {
        b.iter(|| {
            black_box(setup.try_next_setting(
                black_box(m),
                black_box(t(1.2e-4)),
                T::ZERO,
                black_box(t(-4e-4)),
            ))
        });
    });
}

fn benches(c: &mut Criterion) {
    push_group::<f32>(c, "f32");
    push_group::<f64>(c, "f64");
    line_group::<f32>(c, "f32");
    line_group::<f64>(c, "f64");
    steer_group::<f32>(c, "f32");
    steer_group::<f64>(c, "f64");
}

criterion_group!(motion, benches);
criterion_main!(motion);
