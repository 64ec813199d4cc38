//! The compensated step of the three pushers: an `f32` run keeps every kick.
//!
//! `Pusher::try_step` adds the change of `u` and the drift with Knuth's two-sum and carries the
//! rounding error into the next step. The checks compare an `f32` run with an `f64` run of the
//! same scheme from the same (`f32`-exact) start, so the reference is the scheme itself in twice
//! the precision (its own rounding is far below the bounds); the analytic values they would both
//! be compared with are those of the suite module `push` (crossed fields and gyration, [Jackson]
//! §12.2–12.3 from memory, values [mpmath]; see `checks/tests/reference/SOURCES.md`).
//!
//! Bound (the doc of `Pusher::try_step`): over 10² to 10⁶ steps through a uniform electric field,
//! the energy gain, the position and the time of the `f32` run agree with the `f64` run to 10⁻⁵
//! relative; the `f32` error of the crossed-field and gyration orbits follows the `f64` error as
//! the step shrinks, down to that floor. The plain step (`try_step_plain`) is measured beside it
//! and printed: it loses whole energy gains.
//!
//! Measured figures: `cargo test -p fourforce-checks --release --test suite -- push::compensated::
//! --nocapture`.
#![allow(clippy::float_cmp)]

use fourforce::push::{Boris, HigueraCary, Particle, Pusher, Vay};
use fourforce::{FieldTensor, Real, Species, ThreeVector};

use crate::tolerance::PUSH_F32_AGAINST_F64 as FLOOR;

/// A particle state in f64 with its carries: (u, u carry, position, position carry, time, γ).
struct State {
    u: [f64; 3],
    u_lo: [f64; 3],
    x: [f64; 3],
    x_lo: [f64; 3],
    time: f64,
}

fn state<T: Real>(p: &Particle<T>) -> State {
    let a = |v: ThreeVector<T>| [v.x.to_f64(), v.y.to_f64(), v.z.to_f64()];
    State {
        u: a(p.beta_gamma()),
        u_lo: a(p.beta_gamma_carry()),
        x: a(p.position()),
        x_lo: a(p.position_carry()),
        time: p.time().to_f64(),
    }
}

/// γ₁ − γ₀ = (u₁ − u₀)·(u₁ + u₀)/(γ₁ + γ₀), with u₁ − u₀ = (hi − u₀) + lo (the first difference
/// exact when u₁ is near u₀): the energy gain per rest energy, without the cancellation of γ₁ − γ₀.
fn gain(s: &State, u0: [f64; 3]) -> f64 {
    let mut dot = 0.0;
    let (mut n1, mut n0) = (0.0, 0.0);
    for ((&hi, &lo), &start) in s.u.iter().zip(&s.u_lo).zip(&u0) {
        let d = (hi - start) + lo;
        let u1 = hi + lo;
        dot += d * (u1 + start);
        n1 += u1 * u1;
        n0 += start * start;
    }
    dot / ((1.0 + n1).sqrt() + (1.0 + n0).sqrt())
}

fn distance(s: &State, other: &State) -> f64 {
    (0..3)
        .map(|i| ((s.x[i] - other.x[i]) + (s.x_lo[i] - other.x_lo[i])).powi(2))
        .sum::<f64>()
        .sqrt()
}

fn length(s: &State) -> f64 {
    (0..3)
        .map(|i| (s.x[i] + s.x_lo[i]).powi(2))
        .sum::<f64>()
        .sqrt()
}

/// A gap case: species, start kinetic energy (eV), field magnitude (V/m), angle of E to the
/// motion (rad), the time the run spans (s).
struct Gap {
    species: Species<f64>,
    t0_ev: f64,
    field: f64,
    angle: f64,
    span_s: f64,
}

/// Invented cases from slow to fast particles, strong to weak fields: the weak kicks on a fast
/// particle are those a plain f32 sum drops (each below half an ulp of u).
fn gaps() -> Vec<Gap> {
    let mut out = vec![
        // a 1 GeV proton through 1 kV/m for 10 ns: a gain of 3 eV on 1 GeV
        Gap {
            species: Species::PROTON,
            t0_ev: 1.0e9,
            field: 1.0e3,
            angle: 0.0,
            span_s: 1.0e-8,
        },
        // a 10 MeV electron, 10 kV/m at 30°, 30 ns
        Gap {
            species: Species::ELECTRON,
            t0_ev: 1.0e7,
            field: 1.0e4,
            angle: 0.52,
            span_s: 3.0e-8,
        },
        // an alpha from rest in 1 MV/m for 20 ns
        Gap {
            species: Species::ALPHA,
            t0_ev: 0.0,
            field: 1.0e6,
            angle: 0.0,
            span_s: 2.0e-8,
        },
    ];
    // xorshift32 (G. Marsaglia, J. Stat. Softw. 8(14), 2003, from memory), fixed seed
    let mut state = 0x1234_5678_u32;
    let mut next = move || {
        state ^= state << 13;
        state ^= state >> 17;
        state ^= state << 5;
        f64::from(state) / f64::from(u32::MAX)
    };
    let species = [
        Species::ELECTRON,
        Species::PROTON,
        Species::ALPHA,
        Species::DEUTERON,
    ];
    for k in 0..9 {
        out.push(Gap {
            species: species[k % species.len()],
            t0_ev: 10.0_f64.powf(3.0 + 7.0 * next()),
            field: 10.0_f64.powf(2.0 + 5.0 * next()),
            angle: 3.0 * next(),
            span_s: 10.0_f64.powf(-9.0 + 2.0 * next()),
        });
    }
    out
}

fn species_as<T: Real>(s: Species<f64>) -> Species<T> {
    Species::try_new(T::from_f64(s.rest_energy()), T::from_f64(s.charge())).unwrap()
}

/// Runs `steps` steps of the gap case; returns the final state and the f32-exact start `u₀`.
fn run_gap<T: Real, P: Pusher<T>>(g: &Gap, steps: u32, plain: bool) -> (State, [f64; 3]) {
    let m = g.species.rest_energy();
    let u0 = (g.t0_ev * (g.t0_ev + 2.0 * m)).sqrt() / m;
    // the start exact in f32, hence in both precisions
    let u0 = f64::from(u0 as f32);
    let dt = g.span_s / f64::from(steps);
    let pusher = P::try_new(species_as::<T>(g.species), T::from_f64(dt)).unwrap();
    let e = ThreeVector::new(
        T::from_f64(f64::from((g.field * g.angle.cos()) as f32)),
        T::from_f64(f64::from((g.field * g.angle.sin()) as f32)),
        T::ZERO,
    );
    let field = FieldTensor::try_from_fields(e, ThreeVector::ZERO).unwrap();
    let mut p = Particle::try_new(
        ThreeVector::ZERO,
        ThreeVector::new(T::from_f64(u0), T::ZERO, T::ZERO),
        T::ZERO,
    )
    .unwrap();
    for _ in 0..steps {
        if plain {
            pusher.try_step_plain(&mut p, &field).unwrap();
        } else {
            pusher.try_step(&mut p, &field).unwrap();
        }
    }
    (state(&p), [u0, 0.0, 0.0])
}

/// Worst relative f32-against-f64 deviation of (gain, position, time) over the cases, for the
/// compensated and the plain step.
fn gap_agreement<P32: Pusher<f32>, P64: Pusher<f64>>(scheme: &str, steps: u32, cases: usize) {
    let mut worst = [0.0_f64; 3];
    let mut worst_plain = 0.0_f64;
    for g in gaps().iter().take(cases) {
        let (s64, u0) = run_gap::<f64, P64>(g, steps, false);
        let (s32, _) = run_gap::<f32, P32>(g, steps, false);
        let (p32, _) = run_gap::<f32, P32>(g, steps, true);
        let want = gain(&s64, u0);
        let dev = [
            ((gain(&s32, u0) - want) / want).abs(),
            distance(&s32, &s64) / length(&s64),
            ((s32.time - s64.time) / s64.time).abs(),
        ];
        for (w, d) in worst.iter_mut().zip(dev) {
            *w = w.max(d);
        }
        worst_plain = worst_plain.max(((gain(&p32, u0) - want) / want).abs());
    }
    eprintln!(
        "gap {scheme} {steps:>7} steps, {cases} cases: f32 against f64: gain {:.1e}, position {:.1e}, time {:.1e} (plain step: gain {:.1e})",
        worst[0], worst[1], worst[2], worst_plain
    );
    assert!(
        worst.iter().all(|&w| w <= FLOOR),
        "{scheme} {steps}: {worst:?}"
    );
}

/// `|x| / L` after one period of the β_d = 0.5 crossed-field orbit of an electron from rest
/// (0.01 T, E = 1 498 962.29 V/m; back at rest at x = 0.824 436 635 769 m after
/// 5.500 049 209 17 ns: [Jackson] §12.3, from memory; values [mpmath]).
fn crossed_error<T: Real, P: Pusher<T>>(steps: u32) -> f64 {
    let (period, advance) = (5.500_049_209_17e-9, 0.824_436_635_769);
    let pusher = P::try_new(
        Species::<T>::ELECTRON,
        T::from_f64(period / f64::from(steps)),
    )
    .unwrap();
    let field = FieldTensor::try_from_fields(
        ThreeVector::new(T::ZERO, T::from_f64(1_498_962.29), T::ZERO),
        ThreeVector::new(T::ZERO, T::ZERO, T::from_f64(0.01)),
    )
    .unwrap();
    let mut p = Particle::at_rest(ThreeVector::ZERO);
    pusher.try_start_leapfrog(&mut p, &field).unwrap();
    pusher.try_run(&mut p, &field, steps).unwrap();
    let s = state(&p);
    let d = [
        s.x[0] + s.x_lo[0] - advance,
        s.x[1] + s.x_lo[1],
        s.x[2] + s.x_lo[2],
    ];
    (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt() / advance
}

/// Radius error after one turn of a 10 MeV proton in 1 T (radius 0.458 155 375 777 m, period
/// 66.293 573 517 0 ns: [Jackson] §12.2, from memory; values [mpmath]), from the distance of
/// the position after a whole period (the orbit closes) — here the distance from the start.
fn gyration_error<T: Real, P: Pusher<T>>(steps: u32) -> f64 {
    let (period, radius) = (6.629_357_351_70e-8, 0.458_155_375_777);
    let m = 938.272_088_16e6; // CODATA 2018
    let u0 = (10.0e6 * (10.0e6 + 2.0 * m)).sqrt() / m;
    let pusher = P::try_new(Species::<T>::PROTON, T::from_f64(period / f64::from(steps))).unwrap();
    let field = FieldTensor::try_from_fields(
        ThreeVector::ZERO,
        ThreeVector::new(T::ZERO, T::ZERO, T::ONE),
    )
    .unwrap();
    let mut p = Particle::try_new(
        ThreeVector::ZERO,
        ThreeVector::new(T::from_f64(u0), T::ZERO, T::ZERO),
        T::ZERO,
    )
    .unwrap();
    pusher.try_start_leapfrog(&mut p, &field).unwrap();
    pusher.try_run(&mut p, &field, steps).unwrap();
    let s = state(&p);
    let d = [s.x[0] + s.x_lo[0], s.x[1] + s.x_lo[1], s.x[2] + s.x_lo[2]];
    (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt() / radius
}

/// The f32 error follows the f64 error from coarse to fine steps, until the floor.
fn follows_f64(scheme: &str, what: &str, e32: &[f64], e64: &[f64]) {
    let show = |e: &[f64]| {
        e.iter()
            .map(|x| format!("{x:.2e}"))
            .collect::<Vec<_>>()
            .join(" ")
    };
    eprintln!("{what} {scheme} f64, {STEPS:?} steps: {}", show(e64));
    eprintln!("{what} {scheme} f32, {STEPS:?} steps: {}", show(e32));
    for (a, b) in e32.iter().zip(e64) {
        assert!(
            (a - b).abs() <= FLOOR,
            "{what} {scheme}: f32 {a:e}, f64 {b:e}"
        );
    }
}

const STEPS: [u32; 7] = [100, 200, 400, 800, 1600, 3200, 6400];

macro_rules! for_scheme {
    ($modname:ident, $scheme:ident) => {
        mod $modname {
            use super::*;

            #[test]
            fn gap_gain_position_time_f32_as_f64_up_to_1e5_steps() {
                for steps in [100, 1_000, 10_000, 100_000] {
                    gap_agreement::<$scheme<f32>, $scheme<f64>>(stringify!($scheme), steps, 12);
                }
            }

            #[test]
            fn gap_gain_position_time_f32_as_f64_at_1e6_steps() {
                gap_agreement::<$scheme<f32>, $scheme<f64>>(stringify!($scheme), 1_000_000, 3);
            }

            #[test]
            fn crossed_field_error_follows_f64() {
                let e32: Vec<f64> = STEPS
                    .iter()
                    .map(|&n| crossed_error::<f32, $scheme<f32>>(n))
                    .collect();
                let e64: Vec<f64> = STEPS
                    .iter()
                    .map(|&n| crossed_error::<f64, $scheme<f64>>(n))
                    .collect();
                follows_f64(stringify!($scheme), "crossed", &e32, &e64);
            }

            #[test]
            fn gyration_error_follows_f64() {
                let e32: Vec<f64> = STEPS
                    .iter()
                    .map(|&n| gyration_error::<f32, $scheme<f32>>(n))
                    .collect();
                let e64: Vec<f64> = STEPS
                    .iter()
                    .map(|&n| gyration_error::<f64, $scheme<f64>>(n))
                    .collect();
                follows_f64(stringify!($scheme), "gyration", &e32, &e64);
            }
        }
    };
}

for_scheme!(boris, Boris);
for_scheme!(vay, Vay);
for_scheme!(higuera_cary, HigueraCary);

#[test]
fn the_plain_step_drops_kicks_below_half_an_ulp_and_the_compensated_one_keeps_them() {
    // the 1 GeV proton case: each kick is about 2e-12 of u
    let g = &gaps()[0];
    let (s64, u0) = run_gap::<f64, Boris<f64>>(g, 10_000, false);
    let (s32, _) = run_gap::<f32, Boris<f32>>(g, 10_000, false);
    let (p32, _) = run_gap::<f32, Boris<f32>>(g, 10_000, true);
    let want = gain(&s64, u0);
    assert!(want > 0.0);
    assert_eq!(gain(&p32, u0), 0.0, "the plain f32 sum loses every kick");
    assert!(((gain(&s32, u0) - want) / want).abs() < FLOOR);
}

/// Found by fuzzing (target `push`): after steps at a large `u` had built up a carry, a field that
/// braked the particle in one step left that carry, an ulp of the old `u`, beside a new `u` sixty
/// times smaller, so `beta_gamma()` was 16 ulps from the compensated value that `gamma()` used.
/// The state must stay consistent: `γ² = 1 + |u|²` within a few eps after any step.
fn braking_keeps_gamma_consistent<T: Real, P: Pusher<T>>() {
    let t = |x: f64| T::from_f64(x);
    let proton = Species::<T>::PROTON;
    // Δt = 1 s: a kick factor Q c Δt / 2mc² of about 0.16 per V/m.
    let pusher = P::try_new(proton, t(1.0)).unwrap();
    let u0 = t(1.0) / (T::EPSILON * t(0.1)); // 8.4e7 in f32, 4.5e16 in f64
    let mut p =
        Particle::try_new(ThreeVector::ZERO, ThreeVector::new(u0, u0, u0), T::ZERO).unwrap();
    // Kicks of about a fifth of an ulp of u: the carry grows to about an ulp.
    let ulp = u0 * T::EPSILON;
    let weak = FieldTensor::try_from_fields(
        ThreeVector::new(ulp, ulp, ulp) * t(1.234),
        ThreeVector::ZERO,
    )
    .unwrap();
    for _ in 0..7 {
        pusher.try_step(&mut p, &weak).unwrap();
    }
    // One step that takes away all but about 1/64 of u.
    let e = -(u0 * t(63.0 / 64.0) + ulp * t(0.37)) * t(2.0) / t(0.32);
    let brake = FieldTensor::try_from_fields(ThreeVector::new(e, e, e) * t(0.5), ThreeVector::ZERO)
        .unwrap();
    pusher.try_step(&mut p, &brake).unwrap();
    let (g, n) = (p.gamma().to_f64(), p.beta_gamma().norm().to_f64());
    let rel = ((g * g - 1.0 - n * n) / (g * g)).abs();
    assert!(
        rel <= 8.0 * T::EPSILON.to_f64(),
        "gamma {g} vs |u| {n}: {rel:e} relative"
    );
}

#[test]
fn braking_keeps_gamma_consistent_every_scheme_both_precisions() {
    braking_keeps_gamma_consistent::<f32, Boris<f32>>();
    braking_keeps_gamma_consistent::<f64, Boris<f64>>();
    braking_keeps_gamma_consistent::<f32, Vay<f32>>();
    braking_keeps_gamma_consistent::<f64, Vay<f64>>();
    braking_keeps_gamma_consistent::<f32, HigueraCary<f32>>();
    braking_keeps_gamma_consistent::<f64, HigueraCary<f64>>();
}
