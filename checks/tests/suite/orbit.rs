//! The orbit correction (`fourforce::orbit`): the solver against nalgebra's SVD, the convergence
//! the theory predicts, limits, failed monitors, the hold state, the energy, `f32` against `f64`.
//!
//! Sources beside the checks:
//! - the least-squares and Tikhonov solutions `x = −V diag(σ/(σ² + α²)) Uᵀ b` are computed here
//!   with nalgebra's SVD (a general-purpose library, `SVD::new`), independently of the crate's
//!   Jacobi decomposition;
//! - with an exact model and gain `g`, the part of the offsets in the range of the response
//!   shrinks by `(1 − g)` per iteration (the fixed-point iteration `b ← (I − g A A⁺) b`; common
//!   practice of orbit feedback, derived here in one line);
//! - the error bound of a backward-stable least-squares solver: the relative error of the
//!   solution is of order `ε (κ + κ² ‖r‖/(‖A‖ ‖x‖))`, κ the condition number and r the residual
//!   (G. H. Golub and C. F. Van Loan, Matrix Computations, 4th ed., §5.3, from memory).
#![allow(clippy::float_cmp, clippy::needless_range_loop)]

use fourforce::Error;
use fourforce::orbit::{Corrector, Monitor, Orbit, Response, State, Tuning};
use nalgebra::{DMatrix, DVector};

/// Seeded xorshift64 (G. Marsaglia, J. Stat. Softw. 8, 2003, from memory), uniform in [-1, 1).
struct Rng(u64);
impl Rng {
    fn next(&mut self) -> f64 {
        let mut x = self.0;
        x ^= x << 13;
        x ^= x >> 7;
        x ^= x << 17;
        self.0 = x;
        (x >> 11) as f64 / (1u64 << 52) as f64 - 1.0
    }
}

const M: usize = 8;
const C: usize = 6;

/// A response for M monitors and C correctors: `coupled` fills every entry, otherwise the first
/// half of the correctors act on x, the rest on y. Entries in m/rad around ±10.
fn random_response(rng: &mut Rng, coupled: bool) -> [[[f64; M]; 2]; C] {
    let mut r = [[[0.0; M]; 2]; C];
    for j in 0..C {
        for p in 0..2 {
            if coupled || (p == 0) == (j < C / 2) {
                for i in 0..M {
                    r[j][p][i] = 10.0 * rng.next();
                }
            }
        }
    }
    r
}

fn kappa(rng: &mut Rng) -> [f64; C] {
    let mut k = [0.0; C];
    for x in &mut k {
        *x = 0.5 + 0.25 * rng.next(); // rad per T m: Bρ between 1.3 and 4 T m
    }
    k
}

/// `κ + κ² ‖r‖/(‖A‖ ‖x‖)`, the sensitivity of the least-squares solution `x` of `A x ≈ −b`.
fn sensitivity(a: &DMatrix<f64>, b: &DVector<f64>, x: &DVector<f64>) -> f64 {
    let sv = a.clone().svd(false, false).singular_values;
    let kappa = sv.max() / sv.min();
    let residual = (b + a * x).norm();
    kappa + kappa * kappa * residual / (sv.max() * x.norm())
}

/// The response in settings units as a 2M × C nalgebra matrix (rows x then y).
fn dense(r: &[[[f64; M]; 2]; C], k: &[f64; C]) -> DMatrix<f64> {
    DMatrix::from_fn(2 * M, C, |row, j| r[j][row / M][row % M] * k[j])
}

fn flat(b: &[[f64; 2]; M]) -> DVector<f64> {
    DVector::from_fn(2 * M, |row, _| b[row % M][row / M])
}

/// nalgebra's Tikhonov / minimum-norm least-squares step `−V diag(σ/(σ² + (α σ_max)²)) Uᵀ b`,
/// singular values at or below `cutoff σ_max` dropped.
///
/// A block-diagonal matrix (planes not coupled) is decomposed block by block: nalgebra's SVD of
/// the whole loses up to 10³ ε on some of them (seen here), its SVD of each block does not.
fn reference_step(a: &DMatrix<f64>, b: &DVector<f64>, alpha: f64, cutoff: f64) -> DVector<f64> {
    let (rows, cols) = a.shape();
    let (rh, ch) = (rows / 2, cols / 2);
    let split = rows % 2 == 0
        && cols % 2 == 0
        && a.view((0, ch), (rh, cols - ch)).iter().all(|x| *x == 0.0)
        && a.view((rh, 0), (rows - rh, ch)).iter().all(|x| *x == 0.0);
    let smax = a.clone().svd(false, false).singular_values.max();
    if !split {
        return reference_block(a, b, alpha * smax, cutoff * smax);
    }
    let x0 = reference_block(
        &a.view((0, 0), (rh, ch)).into_owned(),
        &b.rows(0, rh).into_owned(),
        alpha * smax,
        cutoff * smax,
    );
    let x1 = reference_block(
        &a.view((rh, ch), (rows - rh, cols - ch)).into_owned(),
        &b.rows(rh, rows - rh).into_owned(),
        alpha * smax,
        cutoff * smax,
    );
    DVector::from_fn(cols, |j, _| if j < ch { x0[j] } else { x1[j - ch] })
}

fn reference_block(a: &DMatrix<f64>, b: &DVector<f64>, alpha: f64, floor: f64) -> DVector<f64> {
    let svd = a.clone().svd(true, true);
    let (u, vt, s) = (svd.u.unwrap(), svd.v_t.unwrap(), svd.singular_values);
    let mut x = DVector::zeros(a.ncols());
    for l in 0..s.len() {
        if s[l] > floor {
            let f = s[l] / (s[l] * s[l] + alpha * alpha);
            let c = u.column(l).dot(b) * f;
            x -= vt.row(l).transpose() * c;
        }
    }
    x
}

fn loose_corrector() -> Corrector<f64> {
    Corrector::try_new(-1.0e3, 1.0e3, 1.0e3).unwrap()
}

fn orbit_f64(r: [[[f64; M]; 2]; C], k: [f64; C], tuning: Tuning<f64>) -> Orbit<f64, M, C> {
    let response = Response::try_new(r, k).unwrap();
    let monitor = Monitor::try_new(1.0, 1.0e-6, 1.0).unwrap();
    Orbit::try_new(response, [monitor; M], [loose_corrector(); C], tuning).unwrap()
}

fn readings(rng: &mut Rng) -> [[f64; 2]; M] {
    let mut b = [[0.0; 2]; M];
    for x in b.as_flattened_mut() {
        *x = 1.0e-3 * rng.next();
    }
    b
}

/// The step of the crate (gain 1, no limits) against nalgebra's SVD solution, coupled and
/// uncoupled, α = 0 and α > 0, full rank and rank-deficient (held): within 256 ε (κ + κ² tan θ)
/// of nalgebra's SVD (whose own error reaches 52 ε (κ + κ² tan θ) on one of these matrices: the
/// crate agrees with the third, independent reference, nalgebra's normal equations, within
/// 16 ε κ²; both figures are printed).
#[test]
fn step_matches_nalgebra_svd_in_f64() {
    let mut rng = Rng(0x5eed_0f0f_1234_9876);
    let (mut worst_svd, mut worst_normal) = (0.0_f64, 0.0_f64);
    for case in 0..200 {
        let coupled = case % 2 == 0;
        let mut r = random_response(&mut rng, coupled);
        if case % 5 == 0 {
            // rank-deficient: corrector 1 repeats corrector 0 (same plane)
            r[1] = r[0];
        }
        let k = kappa(&mut rng);
        let alpha = if case % 3 == 0 {
            0.0
        } else {
            0.05 * (case % 7) as f64
        };
        let cutoff = 1.0e-9;
        let tuning = Tuning::try_new(1.0, alpha, cutoff).unwrap();
        let mut orbit = orbit_f64(r, k, tuning);
        let b = readings(&mut rng);
        let mut s = [0.0; C];
        let out = orbit.try_step(&b, &mut s).unwrap();
        let bn = flat(&b);
        if case % 5 == 0 {
            // the repeated column leaves the problem under-determined: the loop holds
            assert!(
                matches!(out.state(), State::Hold { .. }),
                "case {case}: {out:?}"
            );
            assert_eq!(s, [0.0; C]);
            continue;
        }
        assert_eq!(out.state(), State::Correcting);
        // The crate regularises the kicks (rad), so the reference solves for them too.
        let a_kick = dense(&r, &[1.0; C]);
        let mut want = reference_step(&a_kick, &bn, alpha, cutoff);
        for j in 0..C {
            want[j] /= k[j];
        }
        let x_kick = DVector::from_fn(C, |j, _| want[j] * k[j]);
        let sense = sensitivity(&a_kick, &bn, &x_kick);
        // nalgebra's normal equations (AᵀA + (α σ_max)² I) x = −Aᵀ b, solved by LU: error
        // of order ε κ², small for these matrices (κ < 20).
        let smax = a_kick.clone().svd(false, false).singular_values.max();
        let normal =
            a_kick.transpose() * &a_kick + DMatrix::identity(C, C) * (alpha * smax).powi(2);
        let x_normal = -normal.lu().solve(&(a_kick.transpose() * &bn)).unwrap();
        let kappa2 = {
            let sv = a_kick.clone().svd(false, false).singular_values;
            (sv.max() / sv.min()).powi(2)
        };
        let scale = want.amax();
        for j in 0..C {
            let err = (s[j] - want[j]).abs() / scale;
            worst_svd = worst_svd.max(err / (f64::EPSILON * sense));
            assert!(
                err <= 256.0 * f64::EPSILON * sense,
                "case {case} corrector {j}: {} vs nalgebra's SVD {} (sensitivity {sense:.1})",
                s[j],
                want[j]
            );
            let err = (s[j] * k[j] - x_normal[j]).abs() / x_normal.amax();
            worst_normal = worst_normal.max(err / (f64::EPSILON * kappa2));
            assert!(
                err <= 16.0 * f64::EPSILON * kappa2,
                "case {case} corrector {j}: {} vs nalgebra's normal equations {}",
                s[j] * k[j],
                x_normal[j]
            );
        }
    }
    eprintln!(
        "orbit f64 against nalgebra: worst step error {worst_svd:.1} ε (κ + κ² tan θ) against its \
         SVD, {worst_normal:.2} ε κ² against its normal equations"
    );
}

/// The same problems in `f32`: the step agrees with the `f64` one within 16 ε₃₂ (κ + κ² tan θ)
/// (relative to its largest entry).
#[test]
fn f32_step_is_bounded_by_the_condition_number() {
    let mut rng = Rng(0x0bad_cafe_2026_0001);
    let mut worst = 0.0_f64;
    for case in 0..200 {
        let r = random_response(&mut rng, case % 2 == 0);
        let k = kappa(&mut rng);
        let a = dense(&r, &[1.0; C]);
        let b = readings(&mut rng);
        let mut s64 = [0.0; C];
        orbit_f64(r, k, Tuning::try_new(1.0, 0.0, 0.0).unwrap())
            .try_step(&b, &mut s64)
            .unwrap();
        let r32 = r.map(|c| c.map(|p| p.map(|x| x as f32)));
        let k32 = k.map(|x| x as f32);
        let b32 = b.map(|m| m.map(|x| x as f32));
        let response = Response::try_new(r32, k32).unwrap();
        let monitor = Monitor::try_new(1.0_f32, 1.0e-6, 1.0).unwrap();
        let corrector = Corrector::try_new(-1.0e3_f32, 1.0e3, 1.0e3).unwrap();
        let mut orbit = Orbit::<f32, M, C>::try_new(
            response,
            [monitor; M],
            [corrector; C],
            Tuning::try_new(1.0, 0.0, 0.0).unwrap(),
        )
        .unwrap();
        let mut s32 = [0.0_f32; C];
        orbit.try_step(&b32, &mut s32).unwrap();
        let x_kick = DVector::from_fn(C, |j, _| s64[j] * k[j]);
        let sense = sensitivity(&a, &flat(&b), &x_kick);
        let scale = s64.iter().fold(0.0_f64, |a, b| a.max(b.abs()));
        for j in 0..C {
            let err = (f64::from(s32[j]) - s64[j]).abs() / scale;
            let bound = 16.0 * f64::from(f32::EPSILON) * sense;
            worst = worst.max(err / (f64::from(f32::EPSILON) * sense));
            assert!(
                err <= bound,
                "case {case} corrector {j}: error {err:e} > {bound:e}"
            );
        }
    }
    eprintln!("orbit f32 against f64: worst step error {worst:.2} ε (κ + κ² tan θ)");
}

/// Simulates the loop on its own model: readings = offsets at the start + R κ s.
fn simulate<const N: usize>(
    orbit: &mut Orbit<f64, M, C, N>,
    start: &[[f64; 2]; M],
    settings: &mut [f64; C],
) -> ([[f64; 2]; M], fourforce::orbit::Outcome) {
    let now = orbit.response().predict(settings);
    let mut b = *start;
    for i in 0..M {
        for p in 0..2 {
            b[i][p] += now[i][p];
        }
    }
    let out = orbit.try_step(&b, settings).unwrap();
    (b, out)
}

fn rms(b: &[[f64; 2]; M]) -> f64 {
    (b.as_flattened().iter().map(|x| x * x).sum::<f64>() / (2 * M) as f64).sqrt()
}

/// Offsets in the range of the response shrink by exactly (1 − g) per iteration, so reaching a
/// factor 10⁻⁶ takes ⌈ln 10⁻⁶ / ln|1 − g|⌉ iterations, no more.
#[test]
fn convergence_takes_the_iterations_theory_says() {
    let mut rng = Rng(42);
    for &g in &[0.3, 0.5, 0.8, 1.5] {
        let r = random_response(&mut rng, false);
        let k = kappa(&mut rng);
        let mut orbit = orbit_f64(r, k, Tuning::try_new(g, 0.0, 1.0e-9).unwrap());
        // a start the correctors can cancel exactly: the orbit of some settings
        let mut kick = [0.0; C];
        for x in &mut kick {
            *x = 1.0e-3 * rng.next();
        }
        let start = orbit.response().predict(&kick);
        let first = rms(&start);
        let want = (1.0e-6_f64.ln() / (1.0 - g).abs().ln()).ceil() as usize;
        let mut settings = [0.0; C];
        let mut took = None;
        for n in 0..want + 5 {
            let (b, _) = simulate(&mut orbit, &start, &mut settings);
            if n > 0 && rms(&b) <= 1.0e-6 * first {
                took = Some(n);
                break;
            }
        }
        assert_eq!(took, Some(want), "gain {g}");
    }
}

/// As many independent correctors as readings (a square, full-rank system per plane): gain 1
/// reaches zero offset in one step (to rounding).
#[test]
fn exactly_solvable_reaches_zero_in_one_step() {
    const K: usize = 3;
    let mut rng = Rng(7);
    // 3 monitors, 6 correctors (3 per plane): 3 readings per plane, 3 correctors per plane.
    let mut r = [[[0.0; K]; 2]; 2 * K];
    for j in 0..2 * K {
        let p = j / K;
        for i in 0..K {
            r[j][p][i] = 5.0 * rng.next();
        }
    }
    let response = Response::try_new(r, [0.4; 2 * K]).unwrap();
    let monitor = Monitor::try_new(1.0, 1.0e-6, 1.0).unwrap();
    let mut orbit = Orbit::<f64, K, { 2 * K }>::try_new(
        response,
        [monitor; K],
        [loose_corrector(); 2 * K],
        Tuning::try_new(1.0, 0.0, 1.0e-12).unwrap(),
    )
    .unwrap();
    let start = [[1.0e-3, -2.0e-3], [0.5e-3, 0.7e-3], [-1.5e-3, 0.1e-3]];
    let mut s = [0.0; 2 * K];
    orbit.try_step(&start, &mut s).unwrap();
    let moved = orbit.response().predict(&s);
    for i in 0..K {
        for p in 0..2 {
            assert!((start[i][p] + moved[i][p]).abs() < 1.0e-15, "{i} {p}");
        }
    }
}

/// A corrector at its end stop is held there; the others solve the least-squares problem for
/// the rest (nalgebra on the remaining columns); the outcome names the saturated corrector.
#[test]
fn saturated_corrector_is_held_and_the_rest_resolved() {
    let mut rng = Rng(99);
    let r = random_response(&mut rng, false);
    let k = [0.5; C];
    let response = Response::try_new(r, k).unwrap();
    let monitor = Monitor::try_new(1.0, 1.0e-6, 1.0).unwrap();
    let mut correctors = [loose_corrector(); C];
    correctors[1] = Corrector::try_new(-1.0e-6, 1.0e-6, 1.0).unwrap();
    let mut orbit = Orbit::<f64, M, C>::try_new(
        response,
        [monitor; M],
        correctors,
        Tuning::try_new(1.0, 0.0, 1e-12).unwrap(),
    )
    .unwrap();
    let b = readings(&mut rng);
    let mut s = [0.0; C];
    let out = orbit.try_step(&b, &mut s).unwrap();
    assert!(out.saturated(1) && out.limited());
    assert!(
        (0..C)
            .filter(|&j| j != 1)
            .all(|j| !out.saturated(j) && !out.rate_limited(j))
    );
    assert_eq!(s[1].abs(), 1.0e-6);
    // the rest: min ‖b + a₁ s₁ + A_F s_F‖ over the free correctors
    let a = dense(&r, &k);
    let rest = flat(&b) + a.column(1) * s[1];
    let free: Vec<usize> = (0..C).filter(|&j| j != 1).collect();
    let af = DMatrix::from_fn(2 * M, C - 1, |row, c| a[(row, free[c])]);
    let want = reference_step(&af, &rest, 0.0, 1e-12);
    for (c, &j) in free.iter().enumerate() {
        assert!(
            (s[j] - want[c]).abs() < 1e-12 * want.amax(),
            "{j}: {} vs {}",
            s[j],
            want[c]
        );
    }
    // the next iteration with the same held set needs no new decomposition
    let out = orbit.try_step(&b, &mut s.clone()).unwrap();
    assert!(out.saturated(1));
}

/// The rate limit cuts a corrector's change; the others re-solve; a small step is not limited.
#[test]
fn rate_limit_acts_and_reports() {
    let mut rng = Rng(5);
    let r = random_response(&mut rng, true);
    let response = Response::try_new(r, [1.0; C]).unwrap();
    let monitor = Monitor::try_new(1.0, 1.0e-6, 1.0).unwrap();
    let correctors = [Corrector::try_new(-1.0, 1.0, 1.0e-5).unwrap(); C];
    let mut orbit = Orbit::<f64, M, C>::try_new(
        response,
        [monitor; M],
        correctors,
        Tuning::try_new(1.0, 0.0, 1e-12).unwrap(),
    )
    .unwrap();
    let mut s = [0.0; C];
    let out = orbit.try_step(&[[1.0e-2, 1.0e-2]; M], &mut s).unwrap();
    assert!((0..C).any(|j| out.rate_limited(j)));
    assert!(s.iter().all(|x| x.abs() <= 1.0e-5));
    let mut s = [0.0; C];
    let out = orbit.try_step(&[[1.0e-9, -1.0e-9]; M], &mut s).unwrap();
    assert!(!out.limited());
}

/// A non-finite reading, one outside the range and a stuck one each drop their monitor; the
/// decomposition is computed again and the correction uses the others.
#[test]
fn failed_monitors_are_dropped() {
    let mut rng = Rng(11);
    let r = random_response(&mut rng, false);
    let k = kappa(&mut rng);
    let mut orbit = orbit_f64(r, k, Tuning::try_new(0.5, 0.0, 1e-12).unwrap());
    let start = readings(&mut rng);
    let mut s = [0.0; C];
    let (_, out) = simulate(&mut orbit, &start, &mut s);
    assert!(out.decomposed() && out.monitors_in_use() == M as u32);
    let (_, out) = simulate(&mut orbit, &start, &mut s);
    assert!(!out.decomposed());
    // non-finite
    let mut b = start;
    b[2][0] = f64::NAN;
    let out = orbit.try_step(&b, &mut s).unwrap();
    assert!(!out.monitor_in_use(2) && out.decomposed() && out.monitors_in_use() == M as u32 - 1);
    assert!(s.iter().all(|x| x.is_finite()));
    // outside the range (1 m)
    let mut b = start;
    b[5][1] = -1.5;
    let out = orbit.try_step(&b, &mut s).unwrap();
    assert!(!out.monitor_in_use(5) && out.decomposed());
    // stuck: monitor 7 repeats a new reading while the correctors that move it change
    let frozen = [start[7][0] + 1.0e-6, start[7][1] + 1.0e-6];
    let mut dropped_at = None;
    for n in 0..10 {
        let now = orbit.response().predict(&s);
        let mut b = start;
        for i in 0..M {
            for p in 0..2 {
                b[i][p] += now[i][p];
            }
        }
        b[7] = frozen;
        let out = orbit.try_step(&b, &mut s).unwrap();
        if !out.monitor_in_use(7) {
            dropped_at = Some(n);
            break;
        }
    }
    // N = 4 identical readings with 3 moves between them: dropped at the fourth.
    assert_eq!(dropped_at, Some(3));
    assert!(orbit.monitor_in_use(0) && !orbit.monitor_in_use(7));
    orbit.restore_monitor(7);
    assert!(orbit.monitor_in_use(7));
}

/// A reading that does not change is not stuck when nothing that moves it changed.
#[test]
fn steady_reading_without_moves_is_not_stuck() {
    let mut rng = Rng(12);
    let r = random_response(&mut rng, false);
    let mut orbit = orbit_f64(r, [1.0; C], Tuning::try_new(0.5, 0.0, 1e-12).unwrap());
    let mut s = [0.0; C];
    for _ in 0..20 {
        orbit.try_step(&[[0.0, 0.0]; M], &mut s).unwrap();
    }
    assert!((0..M).all(|i| orbit.monitor_in_use(i)));
}

/// Losing monitors until a plane has fewer readings than correctors holds every corrector.
#[test]
fn under_determined_holds() {
    let mut rng = Rng(13);
    let r = random_response(&mut rng, false);
    let mut orbit = orbit_f64(r, [1.0; C], Tuning::try_new(1.0, 0.0, 1e-12).unwrap());
    let mut b = readings(&mut rng);
    for i in 0..M - 2 {
        b[i] = [f64::INFINITY, 0.0];
    }
    let mut s = [0.25; C];
    let out = orbit.try_step(&b, &mut s).unwrap();
    assert_eq!(
        out.state(),
        State::Hold {
            rank: 2,
            correctors: 3
        }
    );
    assert_eq!(s, [0.25; C]);
    assert_eq!(out.monitors_in_use(), 2);
}

/// A new energy rescales every set point by κ_old/κ_new (the kicks stay); the response is
/// decomposed again only when the optics changed.
#[test]
fn energy_step_rescales_set_points() {
    let mut rng = Rng(14);
    let r = random_response(&mut rng, false);
    let k = kappa(&mut rng);
    let mut orbit = orbit_f64(r, k, Tuning::try_new(1.0, 0.0, 1e-12).unwrap());
    let mut s = [0.0; C];
    let start = readings(&mut rng);
    simulate(&mut orbit, &start, &mut s);
    let before = orbit.response().predict(&s);
    let k2 = k.map(|x| x / 1.1); // Bρ up by 10 %
    let mut s2 = s;
    let held = orbit
        .try_set_response(&Response::try_new(r, k2).unwrap(), &mut s2)
        .unwrap();
    assert_eq!(held, 0);
    for j in 0..C {
        assert!((s2[j] / s[j] - 1.1).abs() < 4.0 * f64::EPSILON);
    }
    let after = orbit.response().predict(&s2);
    // each term r κ s keeps its value within a few ε; the sums may cancel, so the bound is
    // relative to the largest reading
    let scale = before
        .as_flattened()
        .iter()
        .fold(0.0_f64, |a, b| a.max(b.abs()));
    for i in 0..M {
        for p in 0..2 {
            assert!((after[i][p] - before[i][p]).abs() <= 8.0 * f64::EPSILON * scale);
        }
    }
    // Only κ changed (the same response in kick angles): no new decomposition, and the step is
    // the one a loop built at the new energy takes.
    let mut fresh = orbit_f64(r, k2, Tuning::try_new(1.0, 0.0, 1e-12).unwrap());
    let mut s3 = s2;
    let (b, out) = simulate(&mut orbit, &start, &mut s2);
    assert!(!out.decomposed());
    fresh.try_step(&b, &mut s3).unwrap();
    for j in 0..C {
        assert!(
            (s2[j] - s3[j]).abs() <= 4.0 * f64::EPSILON * s3[j].abs().max(1e-6),
            "{j}"
        );
    }
    // New optics: decomposed again.
    let mut r2 = r;
    r2[0][0][M - 1] *= 1.01;
    orbit
        .try_set_response(&Response::try_new(r2, k2).unwrap(), &mut s2)
        .unwrap();
    let (_, out) = simulate(&mut orbit, &start, &mut s2);
    assert!(out.decomposed());
    assert_eq!(
        orbit.try_set_response(&Response::try_new(r, k).unwrap(), &mut [f64::NAN; C]),
        Err(Error::NonFinite)
    );
}

/// Calibration: the inverse of the piecewise-linear map returns the drive within 4 ε of the
/// interval's scale (both precisions); outside the table is an error (invented table).
#[test]
fn calibration_inverse_within_a_few_eps() {
    use fourforce::orbit::Calibration;
    let a = [-10.0, -8.0, -4.0, 0.0, 4.0, 8.0, 10.0];
    let tm = [-2.2e-3, -1.9e-3, -0.95e-3, 0.0, 0.95e-3, 1.9e-3, 2.2e-3];
    let c64 = Calibration::try_new(a, tm).unwrap();
    let c32 = Calibration::try_new(a.map(|x| x as f32), tm.map(|x| x as f32)).unwrap();
    for k in 0..=2000 {
        let drive = -10.0 + 0.01 * f64::from(k);
        let back = c64.try_drive(c64.try_setting(drive).unwrap()).unwrap();
        assert!(
            (back - drive).abs() <= 4.0 * f64::EPSILON * 10.0,
            "{drive}: {back}"
        );
        let d32 = drive as f32;
        let back = c32.try_drive(c32.try_setting(d32).unwrap()).unwrap();
        assert!(
            (back - d32).abs() <= 4.0 * f32::EPSILON * 10.0,
            "{d32}: {back}"
        );
    }
    assert_eq!(c64.try_setting(10.01), Err(Error::OutsideCalibration));
    assert_eq!(c64.try_drive(-2.3e-3), Err(Error::OutsideCalibration));
}

/// The response of a line with focusing, a gap and a solenoid (`Response::try_from_line`, from
/// the transfer maps) against the crate's own element-by-element tracking (`BeamLine::states`)
/// of a small kick from each corrector: the finite difference agrees to 10⁻⁶ relative (the
/// tracking is exact, the response first order; the kick is 1 µrad). Invented line.
#[test]
fn line_response_matches_tracking() {
    use fourforce::beamline::{BeamLine, BeamState, Element, KickDirection};
    use fourforce::{Motion, Species};
    let kick = |tm: f64, direction| Element::MagneticKick {
        integrated_field_tm: tm,
        direction,
    };
    let deflect = |v: f64, direction| Element::ElectrostaticKick {
        integrated_field_v: v,
        direction,
    };
    let build = |settings: [f64; 4]| {
        BeamLine::<f64, 24>::try_from_elements(&[
            kick(settings[0], KickDirection::Horizontal),
            Element::Drift { length_m: 0.5 },
            Element::Quadrupole {
                length_m: 0.2,
                gradient_t_per_m: 3.0,
            },
            Element::Drift { length_m: 0.4 },
            Element::Monitor { id: 10 },
            deflect(settings[1], KickDirection::Vertical),
            Element::AcceleratingGap { voltage_v: 2.0e6 },
            Element::Drift { length_m: 0.6 },
            Element::ThinQuadrupole {
                integrated_gradient_t: -0.4,
            },
            Element::Drift { length_m: 0.3 },
            Element::Monitor { id: 11 },
            kick(settings[2], KickDirection::Angle(0.3)),
            Element::Solenoid {
                length_m: 0.5,
                field_t: 0.8,
            },
            Element::Drift { length_m: 0.7 },
            Element::Monitor { id: 12 },
            kick(settings[3], KickDirection::Vertical),
            Element::Drift { length_m: 1.1 },
            Element::Monitor { id: 13 },
        ])
        .unwrap()
    };
    let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 20.0e6).unwrap();
    let r = Response::<f64, 4, 4>::try_from_line(&build([0.0; 4]), &p).unwrap();
    let readings = |settings: [f64; 4]| {
        let mut out = Vec::new();
        for step in build(settings).states(BeamState::on_axis(p)) {
            let (index, state) = step.unwrap();
            if matches!(build([0.0; 4]).elements()[index], Element::Monitor { .. }) {
                out.push([state.x(), state.y()]);
            }
        }
        out
    };
    // settings of a microradian or less each (Bρ = 0.65 T m, Eρ of tens of MV at 20 MeV)
    let step = [0.67e-6, 13.0, 0.67e-6, 0.67e-6];
    let mut coupled = false;
    for j in 0..4 {
        let mut s = [0.0; 4];
        s[j] = step[j];
        let got = readings(s);
        for i in 0..4 {
            for plane in 0..2 {
                let tracked = got[i][plane] / step[j];
                let model = r.reading_per_setting(i, plane, j).unwrap();
                let scale = (0..4)
                    .flat_map(|m| (0..2).map(move |q| (m, q)))
                    .map(|(m, q)| r.reading_per_setting(m, q, j).unwrap().abs())
                    .fold(0.0, f64::max);
                assert!(
                    (tracked - model).abs() <= 1e-6 * scale,
                    "corrector {j} monitor {i} plane {plane}: tracked {tracked:e}, map {model:e}"
                );
                if j == 2 && i == 3 && plane == 1 && model != 0.0 {
                    coupled = true;
                }
            }
        }
    }
    assert!(coupled, "the rotated kick and the solenoid move y");
    // upstream monitors read nothing
    assert_eq!(r.reading_per_setting(0, 0, 1), Some(0.0));
    // a line with a monitor too many is refused
    assert_eq!(
        Response::<f64, 3, 4>::try_from_line(&build([0.0; 4]), &p),
        Err(Error::OutOfBounds)
    );
}

/// The one-corrector closed form (`orbit::try_single_step`) is the `M = C = 1` case of the loop:
/// the same set point to a few ε for any response, reading, gain, α and limits (the loop's
/// first step, before any monitor history).
#[test]
fn single_step_is_the_one_by_one_loop() {
    use fourforce::orbit::try_single_step;
    let mut rng = Rng(2026);
    for case in 0..2000 {
        let r = 5.0 * rng.next();
        let kappa = 0.2 + rng.next().abs();
        let x = 1.0e-3 * rng.next();
        let s0 = 2.0e-3 * rng.next();
        let gain = 1.0 + 0.9 * rng.next();
        let alpha = if case % 2 == 0 {
            0.0
        } else {
            0.3 * rng.next().abs()
        };
        let max = 1.0e-3 + 2.0e-3 * rng.next().abs();
        let rate = if case % 3 == 0 { 1.0 } else { 1.0e-4 };
        let corrector = Corrector::try_new(-max, max, rate).unwrap();
        let tuning = Tuning::try_new(gain, alpha, 0.0).unwrap();
        let response = Response::<f64, 1, 1>::try_new([[[r], [0.0]]], [kappa]).unwrap();
        let monitor = Monitor::try_new(1.0, 1.0e-6, 1.0).unwrap();
        let mut orbit =
            Orbit::<f64, 1, 1>::try_new(response, [monitor], [corrector], tuning).unwrap();
        let mut s = [s0];
        let looped = orbit.try_step(&[[x, 0.0]], &mut s).unwrap();
        let (single, out) = try_single_step(&corrector, &tuning, r * kappa, x, s0).unwrap();
        assert!(
            (single - s[0]).abs() <= 8.0 * f64::EPSILON * max,
            "case {case}: {single} vs {}",
            s[0]
        );
        assert_eq!(out.saturated(0), looped.saturated(0), "case {case}");
        assert_eq!(out.rate_limited(0), looped.rate_limited(0), "case {case}");
    }
    // a corrector that does not reach the monitor holds
    let c = Corrector::try_new(-1.0, 1.0, 1.0).unwrap();
    let t = Tuning::try_new(1.0, 0.0, 0.0).unwrap();
    let (s, out) = try_single_step(&c, &t, 0.0, 1.0e-3, 0.25).unwrap();
    assert_eq!(
        (s, out.state()),
        (
            0.25,
            State::Hold {
                rank: 0,
                correctors: 1
            }
        )
    );
    assert_eq!(
        try_single_step(&c, &t, 1.0, f64::NAN, 0.0),
        Err(Error::NonFinite)
    );
    assert_eq!(
        try_single_step(&c, &t, 1.0e-300, 1.0e10, 0.0),
        Err(Error::Overflow)
    );
}

/// After a monitor fails, the step is the one a loop built without that monitor takes (weight 0),
/// to rounding, coupled or not.
#[test]
fn decomposition_after_a_failure_matches_a_fresh_one() {
    let mut rng = Rng(77);
    for case in 0..40 {
        let r = random_response(&mut rng, case % 2 == 0);
        let k = kappa(&mut rng);
        let tuning = Tuning::try_new(0.8, 0.05 * (case % 3) as f64, 1e-9).unwrap();
        let mut orbit = orbit_f64(r, k, tuning);
        let b = readings(&mut rng);
        let mut s = [0.0; C];
        orbit.try_step(&b, &mut s).unwrap();
        let failed = case % M;
        let mut b2 = readings(&mut rng);
        b2[failed] = [f64::NAN, 0.0];
        let start = s;
        let out = orbit.try_step(&b2, &mut s).unwrap();
        assert!(out.decomposed() && !out.monitor_in_use(failed));
        let response = Response::try_new(r, k).unwrap();
        let mut monitors = [Monitor::try_new(1.0, 1.0e-6, 1.0).unwrap(); M];
        monitors[failed] = Monitor::try_new(1.0, 1.0e-6, 0.0).unwrap();
        let mut fresh =
            Orbit::<f64, M, C>::try_new(response, monitors, [loose_corrector(); C], tuning)
                .unwrap();
        let mut s_fresh = start;
        b2[failed] = [0.0, 0.0];
        fresh.try_step(&b2, &mut s_fresh).unwrap();
        let scale = s_fresh
            .iter()
            .zip(&start)
            .fold(0.0_f64, |a, (x, y)| a.max((x - y).abs()));
        for j in 0..C {
            assert!(
                (s[j] - s_fresh[j]).abs() <= 1e-10 * scale,
                "case {case} corrector {j}: {} vs {}",
                s[j],
                s_fresh[j]
            );
        }
    }
}

#[path = "../../../examples/steering_loop/line.rs"]
mod line;

/// The demo's line (8 cells with focusing, 8 monitors, 6 + 6 correctors; its response from the
/// transfer maps): an orbit the correctors can cancel shrinks by exactly (1 − g) per iteration
/// with α = 0, so the iterations to a factor 10⁻⁶ are the ones the theory gives (one at g = 1).
#[test]
fn known_line_converges_as_theory_says() {
    for &g in &[0.4, 0.7, 1.0] {
        let r64 = line::try_response::<f64>(line::NOMINAL_EV, 1.0).unwrap();
        let monitor = Monitor::try_new(0.01, 1.0e-6, 1.0).unwrap();
        let mut orbit = Orbit::<f64, 8, 12>::try_new(
            r64,
            [monitor; 8],
            [Corrector::try_new(-1.0, 1.0, 1.0).unwrap(); 12],
            Tuning::try_new(g, 0.0, 1e-9).unwrap(),
        )
        .unwrap();
        let kicks: [f64; 12] = core::array::from_fn(|j| 1.0e-4 * (j as f64 - 5.5));
        let start = r64.predict(&kicks);
        let first = start
            .as_flattened()
            .iter()
            .map(|x| x * x)
            .sum::<f64>()
            .sqrt();
        let want = if g == 1.0 {
            1
        } else {
            (1.0e-6_f64.ln() / (1.0 - g).ln()).ceil() as usize
        };
        let mut settings = [0.0; 12];
        let mut took = None;
        for n in 1..=want + 3 {
            let moved = r64.predict(&settings);
            let mut b = start;
            for (o, m) in b.iter_mut().zip(&moved) {
                o[0] += m[0];
                o[1] += m[1];
            }
            let rms = b.as_flattened().iter().map(|x| x * x).sum::<f64>().sqrt();
            if rms <= 1.0e-6 * first {
                took = Some(n - 1);
                break;
            }
            orbit.try_step(&b, &mut settings).unwrap();
        }
        assert_eq!(took, Some(want), "gain {g}");
    }
}

/// The demo's run (in `f32`, as the demo, and in `f64`): after the energy step corrector H0 sits
/// at its end stop. Under constant conditions the loop must reach a steady state: the full
/// solution's step for the other correctors (which would move H0 further) is not theirs to take,
/// so it must neither rate-limit them nor change the held set. Regression: the held set grew by
/// the correctors the full step rate-limited every few iterations, the step was re-solved twice
/// and the orbit jumped by 20 µm in a cycle of 5 iterations.
#[test]
fn saturated_steady_state_does_not_cycle() {
    fn run<T: fourforce::Real>(settle: usize, tolerance: T) {
        let mut orbit = Orbit::<T, 8, 12>::new();
        line::try_setup(&mut orbit).unwrap();
        let mut machine = line::Machine::<T>::try_new().unwrap();
        let mut settings = [T::ZERO; 12];
        line::try_run(
            &mut orbit,
            &mut machine,
            |orbit, readings, s| {
                let out = orbit.try_step(readings, s);
                settings = *s;
                out
            },
            |_| {},
        )
        .unwrap();
        let rms = |b: &[[T; 2]; 8]| {
            (b.as_flattened().iter().fold(T::ZERO, |a, x| a + *x * *x) / T::from_u32(16)).sqrt()
        };
        // settle at constant readings (the frozen monitor is out of use already)
        for _ in 0..settle {
            let b = line::Plant::orbit(&machine, &settings);
            orbit.try_step(&b, &mut settings).unwrap();
        }
        let before = rms(&line::Plant::orbit(&machine, &settings));
        for n in 0..10 {
            let b = line::Plant::orbit(&machine, &settings);
            let out = orbit.try_step(&b, &mut settings).unwrap();
            assert!(out.saturated(0), "iteration {n}: H0 not at its end stop");
            assert!(!out.decomposed(), "iteration {n}: decomposed again");
            assert!(
                (0..12).all(|j| !out.rate_limited(j)),
                "iteration {n}: rate limit acted"
            );
            let now = rms(&line::Plant::orbit(&machine, &settings));
            assert!(
                (now - before).abs() <= tolerance * before,
                "iteration {n}: rms {now:?} moved from {before:?}"
            );
        }
    }
    run::<f32>(10, 1.0e-4);
    run::<f64>(60, 1.0e-9);
}

/// The settled demo line kept running at the machine's constant readings: the correctors creep
/// along a mode that hardly changes any reading, so healthy readings repeat exactly while
/// correctors move by far less than a monitor resolves; no healthy monitor is taken for stuck
/// and the loop never holds (before the resolution entered the rule, f32 dropped M5 after 26
/// more iterations and held the y plane after 44, f64 dropped one after 96 and held after 133).
#[test]
fn settled_loop_keeps_its_healthy_monitors() {
    fn run<T: fourforce::Real>() {
        let mut orbit = Orbit::<T, 8, 12>::new();
        line::try_setup(&mut orbit).unwrap();
        let mut machine = line::Machine::<T>::try_new().unwrap();
        let mut settings = [T::ZERO; 12];
        let mut frozen = [T::ZERO; 2];
        line::try_run(
            &mut orbit,
            &mut machine,
            |orbit, readings, s| orbit.try_step(readings, s),
            |record| {
                settings = record.settings;
                frozen = record.readings[line::STUCK_MONITOR];
            },
        )
        .unwrap();
        assert!(!orbit.monitor_in_use(line::STUCK_MONITOR));
        for n in 0..200 {
            let mut b = line::Plant::orbit(&machine, &settings);
            b[line::STUCK_MONITOR] = frozen;
            let out = orbit.try_step(&b, &mut settings).unwrap();
            assert_eq!(out.state(), State::Correcting, "iteration {n}");
            for i in (0..8).filter(|i| *i != line::STUCK_MONITOR) {
                assert!(out.monitor_in_use(i), "iteration {n}: M{i} dropped");
            }
        }
    }
    run::<f32>();
    run::<f64>();
}

/// A repeated reading is stuck only when the steps since it began should have moved it by more
/// than the monitor resolves: the same frozen reading is dropped with a 1 µm resolution and kept
/// with a 10 mm one (the correctors' steps predict about 1 mm over the window).
#[test]
fn stuck_means_more_change_than_the_resolution() {
    let dropped_at = |resolution: f64| {
        let r = Response::<f64, 2, 1>::try_new([[[1.0, 1.0], [0.0; 2]]], [1.0]).unwrap();
        let c = Corrector::try_new(-1.0, 1.0, 1.0).unwrap();
        let monitors = [
            Monitor::try_new(1.0, 1.0e-6, 1.0).unwrap(),
            Monitor::try_new(1.0, resolution, 1.0).unwrap(),
        ];
        let t = Tuning::try_new(0.5, 0.0, 0.0).unwrap();
        let mut orbit = Orbit::<f64, 2, 1>::try_new(r, monitors, [c], t).unwrap();
        let mut s = [0.0];
        for n in 0..20 {
            let b = [[1.0e-3 + s[0], 0.0], [1.0e-3, 0.0]];
            let out = orbit.try_step(&b, &mut s).unwrap();
            if !out.monitor_in_use(1) {
                return Some(n);
            }
        }
        None
    };
    assert_eq!(dropped_at(1.0e-6), Some(3));
    assert_eq!(dropped_at(1.0e-2), None);
}

/// Found by fuzzing (target `orbit`): a table whose settings span more than the precision holds
/// (their difference overflows) and whose drives are subnormal returned NaN: the fallback halved
/// the drives, and two subnormals that differ can halve to the same value (0/0). The setting must
/// stay finite and within the interval, both ways round.
#[test]
fn calibration_of_extreme_tables_stays_finite() {
    use fourforce::orbit::Calibration;
    let ulp = f32::from_bits(1); // the smallest subnormal
    let (a, b) = (3.0 * ulp, 4.0 * ulp); // halved, both round to 2 ulp
    let cal = Calibration::try_new([a, b], [-f32::MAX, f32::MAX]).unwrap();
    for x in [a, b] {
        let s = cal.try_setting(x).unwrap();
        assert!(
            s.is_finite() && (-f32::MAX..=f32::MAX).contains(&s),
            "{x:e} -> {s:e}"
        );
    }
    assert_eq!(cal.try_setting(a), Ok(-f32::MAX));
    let wide = Calibration::try_new([-f64::MAX, f64::MAX], [-f64::MAX, f64::MAX]).unwrap();
    let s = wide.try_setting(0.0).unwrap();
    assert!(s.is_finite() && s.abs() <= f64::MAX * 1e-15, "{s:e}");
    let d = wide.try_drive(f64::MAX * 0.5).unwrap();
    assert!(
        d.is_finite() && (d / (f64::MAX * 0.5) - 1.0).abs() < 1e-15,
        "{d:e}"
    );
}
