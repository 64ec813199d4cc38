//! Energy witnesses (`fourforce::witness`) against 50-digit references, a Monte Carlo, and the
//! published table of chi-square critical values, in both precisions.
//!
//! References (checks/tests/reference/, written by generate_witness.py with mpmath 1.3.0 at 50
//! digits from the CODATA 2018 rest energies and the exact c of the SI 2019):
//! - witness_derivatives.csv: each kind of witness on a grid of six species and 10 keV to 3 GeV,
//!   with the implied T and dT/dx by a 120-digit central finite difference;
//! - witness_cases.txt: 200 random witness sets (a quarter with one witness moved by 40 sigma)
//!   with the exact implied and fused energies, chi^2, the verdict at alpha = 1e-3 and the outlier;
//! - chi2_critical.csv: upper critical values of chi-square, 1 to 15 degrees of freedom.
//!
//! Bounds (the module's promise): implied and fused T within 16 eps, sigmas within 64 eps, chi^2
//! within 1e-8 (f64) and 3e-2 (f32) relative to 1 + chi^2, verdict and outlier exact. The energies
//! are compared in MeV as the host tool prints them (eV / 1e6, one rounding more).
//!
//! `cargo test -p fourforce-checks --test suite -- witness:: --nocapture` prints the worst cases.
#![allow(clippy::unwrap_used, clippy::float_cmp)]

use crate::reference::{Exact, parse};
use crate::tolerance::{WITNESS_ENERGY, WITNESS_SIGMA};
use fourforce::witness::{Alpha, Estimate, Reading, SpeciesVerdict, Watch};
use fourforce::{Error, Motion, Real, Species};

const T_BOUND: f64 = WITNESS_ENERGY.f64;
const SIGMA_BOUND: f64 = WITNESS_SIGMA.f64;

fn label<T: Real>() -> &'static str {
    if T::MANTISSA_DIGITS == 24 {
        "f32"
    } else {
        "f64"
    }
}

/// A species by the name the host tool accepts (named or `custom:<MeV>:<charge>`).
fn species<T: Real>(name: &str) -> Species<T> {
    match name {
        "electron" => Species::ELECTRON,
        "proton" => Species::PROTON,
        "deuteron" => Species::DEUTERON,
        "alpha" => Species::ALPHA,
        "muon" => Species::MUON,
        custom => {
            let mut parts = custom.strip_prefix("custom:").unwrap().split(':');
            let mev: f64 = parts.next().unwrap().parse().unwrap();
            let charge: i32 = parts.next().unwrap().parse().unwrap();
            Species::try_new(T::from_f64(mev * 1e6), T::from_i32(charge)).unwrap()
        }
    }
}

fn reference(file: &str) -> String {
    let path = format!("{}/tests/reference/{file}", env!("CARGO_MANIFEST_DIR"));
    std::fs::read_to_string(path).unwrap()
}

/// A reading from the host tool's line format (`kind,value,sigma[,geometry]`, T in MeV).
fn reading<T: Real>(line: &str) -> Reading<T> {
    let f: Vec<&str> = line.split(',').collect();
    let x = |i: usize| parse::<T>(f[i]);
    match f[0] {
        "kinetic" => Reading::Kinetic {
            kinetic_ev: x(1) * T::from_f64(1e6),
            sigma_ev: x(2) * T::from_f64(1e6),
        },
        "tof" => Reading::FlightTime {
            time_s: x(1),
            sigma_s: x(2),
            baseline_m: x(3),
        },
        "dipole" => Reading::Dipole {
            field_t: x(1),
            sigma_t: x(2),
            radius_m: x(3),
        },
        "deflector" => Reading::Deflector {
            field_v_per_m: x(1),
            sigma_v_per_m: x(2),
            radius_m: x(3),
        },
        "speed" => Reading::Speed {
            speed_m_per_s: x(1),
            sigma_m_per_s: x(2),
        },
        other => panic!("unknown witness {other}"),
    }
}

/// eV to MeV as the host tool prints it.
fn mev<T: Real>(ev: T) -> T {
    ev / T::from_f64(1e6)
}

#[derive(Default)]
struct Worst {
    value: f64,
    at: String,
}

impl Worst {
    fn see(&mut self, value: f64, at: impl FnOnce() -> String) {
        let value = if value.is_nan() { f64::INFINITY } else { value };
        if value > self.value || self.at.is_empty() {
            self.value = value;
            self.at = at();
        }
    }
}

/// Each derivative: sigma_T = |dT/dx| sigma_x against the 120-digit finite difference, and the
/// implied T, for every kind of witness, six species, 10 keV to 3 GeV.
fn derivatives<T: Real>() -> (f64, f64) {
    let text = reference("witness_derivatives.csv");
    let (mut wt, mut ws) = (Worst::default(), Worst::default());
    let mut n = 0;
    for line in text.lines().skip(1) {
        let f: Vec<&str> = line.split(',').collect();
        let s = species::<T>(f[0]);
        let (x, sx, g) = (parse::<T>(f[2]), parse::<T>(f[3]), parse::<T>(f[4]));
        let r = match f[1] {
            "tof" => Reading::FlightTime {
                time_s: x,
                sigma_s: sx,
                baseline_m: g,
            },
            "dipole" => Reading::Dipole {
                field_t: x,
                sigma_t: sx,
                radius_m: g,
            },
            "deflector" => Reading::Deflector {
                field_v_per_m: x,
                sigma_v_per_m: sx,
                radius_m: g,
            },
            "speed" => Reading::Speed {
                speed_m_per_s: x,
                sigma_m_per_s: sx,
            },
            other => panic!("{other}"),
        };
        let e = match r.try_estimate(s) {
            Ok(e) => e,
            // A reading exact in f64 may be out of f32's range; every one must work in f64.
            Err(err) if T::MANTISSA_DIGITS == 24 => {
                assert!(matches!(err, Error::Overflow), "{line}: {err}");
                continue;
            }
            Err(err) => panic!("{line}: {err}"),
        };
        n += 1;
        wt.see(Exact::parse(f[5]).eps_error(e.kinetic_energy()), || {
            line.to_owned()
        });
        ws.see(Exact::parse(f[7]).eps_error(e.uncertainty()), || {
            line.to_owned()
        });
    }
    println!(
        "witness derivatives {} ({n} readings): T worst {:.2} eps at {}; sigma_T worst {:.2} eps at {}",
        label::<T>(),
        wt.value,
        wt.at,
        ws.value,
        ws.at
    );
    assert!(n > 300);
    assert!(wt.value <= T_BOUND, "{}", wt.at);
    assert!(ws.value <= SIGMA_BOUND, "{}", ws.at);
    (wt.value, ws.value)
}

#[test]
fn each_derivative_and_implied_energy_against_mpmath_f32() {
    derivatives::<f32>();
}

#[test]
fn each_derivative_and_implied_energy_against_mpmath_f64() {
    derivatives::<f64>();
}

struct Case {
    species: String,
    lines: Vec<String>,
    readings: Vec<[String; 4]>,
    fused: [String; 6],
}

fn cases() -> Vec<Case> {
    let text = reference("witness_cases.txt");
    let mut out: Vec<Case> = Vec::new();
    for line in text.lines().filter(|l| !l.starts_with('#')) {
        if let Some(rest) = line.strip_prefix("case ") {
            out.push(Case {
                species: rest.split(' ').nth(1).unwrap().to_owned(),
                lines: Vec::new(),
                readings: Vec::new(),
                fused: Default::default(),
            });
        } else if let Some(e) = line.strip_prefix("expect reading,") {
            let f: Vec<String> = e.split(',').map(str::to_owned).collect();
            out.last_mut().unwrap().readings.push(f.try_into().unwrap());
        } else if let Some(e) = line.strip_prefix("expect fused,") {
            let f: Vec<String> = e.split(',').map(str::to_owned).collect();
            out.last_mut().unwrap().fused = f.try_into().unwrap();
        } else {
            out.last_mut().unwrap().lines.push(line.to_owned());
        }
    }
    out
}

/// The random witness sets: implied and fused energies, sigmas, chi^2, verdict and outlier.
fn witness_sets<T: Real>(chi2_bound: f64) {
    let all = cases();
    assert_eq!(all.len(), 200);
    let (mut wt, mut ws, mut wf, mut wfs, mut wc) = Default::default();
    let (mut inconsistent, mut named) = (0, 0);
    for (k, case) in all.iter().enumerate() {
        let s = species::<T>(&case.species);
        let mut watch = Watch::<T, 8>::new();
        for l in &case.lines {
            watch.try_push(reading::<T>(l)).unwrap();
        }
        let a = watch.try_assess(s, Alpha::OnePerMille).unwrap();
        let at = || format!("case {}", k + 1);
        for (e, r) in a.estimates().iter().zip(&case.readings) {
            see(
                &mut wt,
                Exact::parse(&r[2]).eps_error(mev(e.kinetic_energy())),
                at,
            );
            see(
                &mut ws,
                Exact::parse(&r[3]).eps_error(mev(e.uncertainty())),
                at,
            );
        }
        let f = &case.fused;
        see(
            &mut wf,
            Exact::parse(&f[0]).eps_error(mev(a.fused().kinetic_energy())),
            at,
        );
        see(
            &mut wfs,
            Exact::parse(&f[1]).eps_error(mev(a.fused().uncertainty())),
            at,
        );
        let chi2: f64 = f[2].parse().unwrap();
        see(
            &mut wc,
            (a.chi_squared().to_f64() - chi2).abs() / (1.0 + chi2),
            at,
        );
        assert_eq!(a.degrees_of_freedom().to_string(), f[3], "{}", at());
        let verdict = if a.is_consistent() {
            "consistent"
        } else {
            "inconsistent"
        };
        assert_eq!(verdict, f[4], "{} {}", label::<T>(), at());
        let outlier = a.outlier().map_or(0, |j| j + 1);
        assert_eq!(outlier.to_string(), f[5], "{} {}", label::<T>(), at());
        inconsistent += usize::from(!a.is_consistent());
        named += usize::from(a.outlier().is_some());
    }
    println!(
        "witness sets {} (200, {inconsistent} inconsistent, {named} outliers named): implied T {:.2} eps ({}), \
         sigma {:.2} eps ({}), fused T {:.2} eps ({}), fused sigma {:.2} eps ({}), chi^2 {:.2e} of 1 + chi^2 ({})",
        label::<T>(),
        wt.value,
        wt.at,
        ws.value,
        ws.at,
        wf.value,
        wf.at,
        wfs.value,
        wfs.at,
        wc.value,
        wc.at
    );
    assert!(inconsistent >= 40 && named >= 30);
    assert!(wt.value <= T_BOUND && wf.value <= T_BOUND);
    assert!(ws.value <= SIGMA_BOUND && wfs.value <= SIGMA_BOUND);
    assert!(wc.value <= chi2_bound);
}

fn see(w: &mut Worst, v: f64, at: impl Fn() -> String) {
    w.see(v, at);
}

#[test]
fn random_witness_sets_against_mpmath_f32() {
    witness_sets::<f32>(3e-2);
}

#[test]
fn random_witness_sets_against_mpmath_f64() {
    witness_sets::<f64>(1e-8);
}

/// The const table against the 20-digit mpmath values (each entry is the f64 nearest to them) and
/// against the published table.
#[test]
fn critical_values_against_mpmath_and_the_published_table() {
    let text = reference("chi2_critical.csv");
    let mut rows = text.lines();
    let head: Vec<f64> = rows
        .next()
        .unwrap()
        .split(',')
        .skip(1)
        .map(|a| a.parse().unwrap())
        .collect();
    assert_eq!(head, Alpha::ALL.map(Alpha::value));
    let mut n = 0;
    for line in rows {
        let f: Vec<&str> = line.split(',').collect();
        let k: usize = f[0].parse().unwrap();
        for (alpha, x) in Alpha::ALL.iter().zip(&f[1..]) {
            let e = Exact::parse(x);
            let ours: f64 = alpha.critical_value(k).unwrap();
            // The nearest f64: within half an ulp of the 50-digit value.
            assert!(e.eps_error(ours) * 2.0 <= 1.0 + 1e-9, "k = {k}, {alpha:?}");
            let ours32: f32 = alpha.critical_value(k).unwrap();
            assert!(e.eps_error(ours32) <= 0.5 + 1e-6, "k = {k}, {alpha:?}");
            n += 1;
        }
    }
    assert_eq!(n, 15 * 8);
    assert_eq!(Alpha::OnePerMille.critical_value::<f64>(16), None);

    // NIST/SEMATECH e-Handbook of Statistical Methods, section 1.3.6.7.4, "Critical values of the
    // chi-square distribution", upper tail, probabilities 0.10, 0.05, 0.025, 0.01, 0.001, rows
    // 1 to 15, three decimals (from memory). Compared within one unit of the third decimal: a
    // recalled last digit may be one off (32.910 is recalled at k = 12, alpha = 0.001, where the
    // exact 32.90949 sits at the rounding edge).
    const NIST: [[f64; 5]; 15] = [
        [2.706, 3.841, 5.024, 6.635, 10.828],
        [4.605, 5.991, 7.378, 9.210, 13.816],
        [6.251, 7.815, 9.348, 11.345, 16.266],
        [7.779, 9.488, 11.143, 13.277, 18.467],
        [9.236, 11.070, 12.833, 15.086, 20.515],
        [10.645, 12.592, 14.449, 16.812, 22.458],
        [12.017, 14.067, 16.013, 18.475, 24.322],
        [13.362, 15.507, 17.535, 20.090, 26.124],
        [14.684, 16.919, 19.023, 21.666, 27.877],
        [15.987, 18.307, 20.483, 23.209, 29.588],
        [17.275, 19.675, 21.920, 24.725, 31.264],
        [18.549, 21.026, 23.337, 26.217, 32.910],
        [19.812, 22.362, 24.736, 27.688, 34.528],
        [21.064, 23.685, 26.119, 29.141, 36.123],
        [22.307, 24.996, 27.488, 30.578, 37.697],
    ];
    for (k, row) in NIST.iter().enumerate() {
        for (alpha, published) in Alpha::ALL.iter().zip(row) {
            let ours: f64 = alpha.critical_value(k + 1).unwrap();
            assert!(
                (ours - published).abs() <= 0.001,
                "k = {}, {alpha:?}: {ours}",
                k + 1
            );
        }
    }
}

/// A small deterministic generator (SplitMix64) and Box-Muller normals, for the Monte Carlo.
struct Normal(u64);

impl Normal {
    fn uniform(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 * (1.0 / (1u64 << 53) as f64)
    }
    fn next(&mut self) -> f64 {
        let u = 1.0 - self.uniform();
        let v = self.uniform();
        (-2.0 * u.ln()).sqrt() * (std::f64::consts::TAU * v).cos()
    }
}

/// First-order propagation against a Monte Carlo in f64: readings drawn from N(x, sigma^2) with
/// sigma = 1e-6 x, the standard deviation of the implied T against the predicted sigma_T. With
/// 20 000 draws the sample deviation is within 2 % of the true one at 4 standard errors (0.5 %
/// each); second-order terms are about 1e-6 relative.
#[test]
fn propagation_against_a_monte_carlo() {
    let mut rng = Normal(20_261_202);
    let states: [(Species<f64>, f64); 4] = [
        (Species::ELECTRON, 2.0e6),
        (Species::PROTON, 150.0e6),
        (Species::ALPHA, 20.0e6),
        (Species::try_new(221_700.0e6, 28.0).unwrap(), 1.5e9),
    ];
    let mut worst: f64 = 0.0;
    for (s, t) in states {
        let m = Motion::try_from_kinetic_energy(s, t).unwrap();
        let (tof, v) = (m.flight_time(3.0), m.speed());
        let brho = m.try_magnetic_rigidity().unwrap();
        let erho = m.try_electric_rigidity().unwrap();
        let build = |kind: usize, x: f64, sx: f64| match kind {
            0 => Reading::FlightTime {
                time_s: x,
                sigma_s: sx,
                baseline_m: 3.0,
            },
            1 => Reading::Dipole {
                field_t: x,
                sigma_t: sx,
                radius_m: 2.0,
            },
            2 => Reading::Deflector {
                field_v_per_m: x,
                sigma_v_per_m: sx,
                radius_m: 2.0,
            },
            _ => Reading::Speed {
                speed_m_per_s: x,
                sigma_m_per_s: sx,
            },
        };
        for (kind, x) in [tof, brho / 2.0, erho / 2.0, v].into_iter().enumerate() {
            let sx = 1e-6 * x;
            let predicted = build(kind, x, sx).try_estimate(s).unwrap().uncertainty();
            let draws = 20_000;
            let (mut sum, mut sum2) = (0.0, 0.0);
            for _ in 0..draws {
                let d = build(kind, x + sx * rng.next(), sx)
                    .try_estimate(s)
                    .unwrap()
                    .kinetic_energy()
                    - t;
                sum += d;
                sum2 += d * d;
            }
            let mean = sum / f64::from(draws);
            let sd = (sum2 / f64::from(draws) - mean * mean).sqrt();
            let rel = (sd / predicted - 1.0).abs();
            worst = worst.max(rel);
            assert!(
                rel < 0.02,
                "kind {kind}, T = {t}: Monte Carlo {sd}, first order {predicted}"
            );
        }
    }
    println!("witness Monte Carlo: worst |sd/sigma_T - 1| = {worst:.4} (20 000 draws each)");
}

/// Four witnesses of an invented 45 MeV proton beam, each exact, with relative uncertainty 1e-3.
fn four_witnesses<T: Real>(fault: Option<(usize, f64)>) -> Watch<T, 4> {
    let s = Species::<f64>::PROTON;
    let m = Motion::try_from_kinetic_energy(s, 45.0e6).unwrap();
    let mut w = Watch::new();
    let exact: [(f64, f64); 4] = [
        (45.0e6, 45.0e3),
        (m.flight_time(6.0), 0.0),
        (m.try_magnetic_rigidity().unwrap() / 1.8, 0.0),
        (m.speed(), 0.0),
    ];
    for (i, (x, sx)) in exact.into_iter().enumerate() {
        // sigma_x from the wanted sigma_T = 1e-3 T, through the f64 derivative.
        let unit = |r: Reading<f64>| r.try_estimate(s).unwrap().uncertainty();
        let sx = if i == 0 {
            sx
        } else {
            let probe = [
                Reading::FlightTime {
                    time_s: x,
                    sigma_s: x,
                    baseline_m: 6.0,
                },
                Reading::Dipole {
                    field_t: x,
                    sigma_t: x,
                    radius_m: 1.8,
                },
                Reading::Speed {
                    speed_m_per_s: x,
                    sigma_m_per_s: x,
                },
            ][i - 1];
            45.0e3 * x / unit(probe)
        };
        let shift = fault.filter(|&(j, _)| j == i).map_or(0.0, |(_, n)| n * sx);
        let x = T::from_f64(x + shift);
        let sx = T::from_f64(sx);
        w.try_push(match i {
            0 => Reading::Kinetic {
                kinetic_ev: x,
                sigma_ev: sx,
            },
            1 => Reading::FlightTime {
                time_s: x,
                sigma_s: sx,
                baseline_m: T::from_f64(6.0),
            },
            2 => Reading::Dipole {
                field_t: x,
                sigma_t: sx,
                radius_m: T::from_f64(1.8),
            },
            _ => Reading::Speed {
                speed_m_per_s: x,
                sigma_m_per_s: sx,
            },
        })
        .unwrap();
    }
    w
}

fn outliers<T: Real>() {
    let s = Species::<T>::PROTON;
    let clean = four_witnesses::<T>(None)
        .try_assess(s, Alpha::default())
        .unwrap();
    assert!(clean.is_consistent() && clean.outlier().is_none());
    assert!(
        clean.chi_squared().to_f64() < 1e-3,
        "{}",
        clean.chi_squared()
    );
    for j in 0..4 {
        for n in [-40.0, 40.0, 8.0] {
            let a = four_witnesses::<T>(Some((j, n)))
                .try_assess(s, Alpha::default())
                .unwrap();
            assert!(!a.is_consistent(), "{j} {n}");
            assert_eq!(a.outlier(), Some(j), "witness {j} moved by {n} sigma");
        }
        // 2 sigma: still consistent, no outlier named.
        let a = four_witnesses::<T>(Some((j, 2.0)))
            .try_assess(s, Alpha::default())
            .unwrap();
        assert!(a.is_consistent() && a.outlier().is_none());
    }
    // Two faults: the rest do not agree after removing either, so no outlier is named.
    let mut w = Watch::<T, 4>::new();
    for t in [45.0e6, 45.3e6, 44.7e6, 45.0e6] {
        w.try_push(Reading::Kinetic {
            kinetic_ev: T::from_f64(t),
            sigma_ev: T::from_f64(45.0e3),
        })
        .unwrap();
    }
    let a = w.try_assess(s, Alpha::default()).unwrap();
    assert!(!a.is_consistent());
    assert_eq!(a.outlier(), None);
    // Two witnesses that disagree: no outlier (which one is wrong cannot be told).
    let mut w = Watch::<T, 2>::new();
    for t in [45.0e6, 46.0e6] {
        w.try_push(Reading::Kinetic {
            kinetic_ev: T::from_f64(t),
            sigma_ev: T::from_f64(45.0e3),
        })
        .unwrap();
    }
    let a = w.try_assess(s, Alpha::default()).unwrap();
    assert!(!a.is_consistent() && a.outlier().is_none());
}

#[test]
fn the_outlier_of_constructed_faults_f32() {
    outliers::<f32>();
}

#[test]
fn the_outlier_of_constructed_faults_f64() {
    outliers::<f64>();
}

/// An invented implanter: an analysing magnet of radius 0.6 m set for a 180 keV beam of 11B+,
/// a flight time over 1.5 m, and the high-voltage readback. Which isotope and charge state?
fn species_check<T: Real>() {
    let u = 931.494_102_42e6; // atomic mass unit, eV (CODATA 2018)
    let me = 510_998.95; // electron rest energy, eV (CODATA 2018)
    // Atomic masses in u (AME 2016, from memory): 10B 10.012937, 11B 11.009305.
    let ion = |a: f64, q: f64| Species::<f64>::try_new(a * u - q * me, q).unwrap();
    let candidates64 = [
        ion(10.012_937, 1.0),
        ion(11.009_305, 1.0),
        ion(11.009_305, 2.0),
        ion(10.012_937, 2.0),
    ];
    let truth = candidates64[1];
    let m = Motion::try_from_kinetic_energy(truth, 180.0e3).unwrap();
    let b = m.try_magnetic_rigidity().unwrap() / 0.6;
    let t = m.flight_time(1.5);
    let candidates = candidates64.map(|c| {
        Species::<T>::try_new(T::from_f64(c.rest_energy()), T::from_f64(c.charge())).unwrap()
    });
    let mut w = Watch::<T, 3>::new();
    let f = T::from_f64;
    w.try_push(Reading::Dipole {
        field_t: f(b),
        sigma_t: f(b * 3e-4),
        radius_m: f(0.6),
    })
    .unwrap();
    w.try_push(Reading::FlightTime {
        time_s: f(t),
        sigma_s: f(t * 1e-3),
        baseline_m: f(1.5),
    })
    .unwrap();
    assert_eq!(
        w.try_check_species(&candidates, Alpha::default()),
        Ok(SpeciesVerdict::One(1))
    );
    // The readback alone cannot tell the species: every candidate is consistent.
    let mut r = Watch::<T, 1>::new();
    r.try_push(Reading::Kinetic {
        kinetic_ev: f(180.0e3),
        sigma_ev: f(200.0),
    })
    .unwrap();
    assert_eq!(
        r.try_check_species(&candidates, Alpha::default()),
        Ok(SpeciesVerdict::Several { best: 0, count: 4 })
    );
    // A dipole field for none of them.
    let mut x = Watch::<T, 3>::new();
    x.try_push(Reading::Dipole {
        field_t: f(b * 1.3),
        sigma_t: f(b * 3e-4),
        radius_m: f(0.6),
    })
    .unwrap();
    x.try_push(Reading::FlightTime {
        time_s: f(t),
        sigma_s: f(t * 1e-3),
        baseline_m: f(1.5),
    })
    .unwrap();
    assert!(matches!(
        x.try_check_species(&candidates, Alpha::default()),
        Ok(SpeciesVerdict::NoneConsistent { closest: Some(_) })
    ));
    // A neutral candidate cannot give a dipole reading; an impossible reading is an error.
    let neutral = [Species::<T>::try_new(f(1.0e9), T::ZERO).unwrap()];
    assert_eq!(
        w.try_check_species(&neutral, Alpha::default()),
        Ok(SpeciesVerdict::NoneConsistent { closest: None })
    );
    x.try_push(Reading::Speed {
        speed_m_per_s: f(3.1e8),
        sigma_m_per_s: f(1.0),
    })
    .unwrap();
    let e = x
        .try_check_species(&candidates, Alpha::default())
        .unwrap_err();
    assert_eq!((e.index(), e.error()), (2, Error::SpeedNotBelowLight));
}

#[test]
fn the_species_check_tells_isotope_and_charge_state_f32() {
    species_check::<f32>();
}

#[test]
fn the_species_check_tells_isotope_and_charge_state_f64() {
    species_check::<f64>();
}

/// Every impossible reading is a typed error naming the witness.
fn impossible<T: Real>() {
    let f = T::from_f64;
    let ok = Reading::Kinetic {
        kinetic_ev: f(1.0e6),
        sigma_ev: f(1.0e3),
    };
    let bad: [(Reading<T>, Error); 16] = [
        (
            Reading::FlightTime {
                time_s: f(-1e-7),
                sigma_s: f(1e-10),
                baseline_m: f(3.0),
            },
            Error::NonPositiveLength,
        ),
        (
            Reading::FlightTime {
                time_s: f(1e-9),
                sigma_s: f(1e-10),
                baseline_m: f(3.0),
            },
            Error::FasterThanLight,
        ),
        (
            Reading::FlightTime {
                time_s: f(1e-7),
                sigma_s: f(1e-10),
                baseline_m: f(0.0),
            },
            Error::NonPositiveLength,
        ),
        (
            Reading::FlightTime {
                time_s: f(1e-7),
                sigma_s: f(0.0),
                baseline_m: f(3.0),
            },
            Error::NonPositiveUncertainty,
        ),
        (
            Reading::Speed {
                speed_m_per_s: f(3.0e8),
                sigma_m_per_s: f(1.0),
            },
            Error::SpeedNotBelowLight,
        ),
        (
            Reading::Speed {
                speed_m_per_s: f(0.0),
                sigma_m_per_s: f(1.0),
            },
            Error::ZeroSpeed,
        ),
        (
            Reading::Speed {
                speed_m_per_s: f(-1.0e6),
                sigma_m_per_s: f(1.0),
            },
            Error::NegativeMagnitude,
        ),
        (
            Reading::Dipole {
                field_t: f(0.0),
                sigma_t: f(1e-4),
                radius_m: f(1.0),
            },
            Error::ZeroField,
        ),
        (
            Reading::Dipole {
                field_t: f(-0.5),
                sigma_t: f(1e-4),
                radius_m: f(1.0),
            },
            Error::NegativeMagnitude,
        ),
        (
            Reading::Dipole {
                field_t: f(0.5),
                sigma_t: f(1e-4),
                radius_m: f(-1.0),
            },
            Error::NonPositiveLength,
        ),
        (
            Reading::Deflector {
                field_v_per_m: f(0.0),
                sigma_v_per_m: f(1.0),
                radius_m: f(1.0),
            },
            Error::ZeroField,
        ),
        (
            Reading::Deflector {
                field_v_per_m: f(1.0e6),
                sigma_v_per_m: f(-1.0),
                radius_m: f(1.0),
            },
            Error::NonPositiveUncertainty,
        ),
        (
            Reading::Kinetic {
                kinetic_ev: f(-1.0),
                sigma_ev: f(1.0),
            },
            Error::NegativeEnergy,
        ),
        (
            Reading::Kinetic {
                kinetic_ev: T::INFINITY,
                sigma_ev: f(1.0),
            },
            Error::NonFinite,
        ),
        (
            Reading::Kinetic {
                kinetic_ev: f(1.0),
                sigma_ev: f(f64::NAN),
            },
            Error::NonFinite,
        ),
        (
            Reading::Speed {
                speed_m_per_s: f(1.0e6),
                sigma_m_per_s: T::INFINITY,
            },
            Error::NonFinite,
        ),
    ];
    for (r, err) in bad {
        assert_eq!(r.try_estimate(Species::PROTON), Err(err), "{r:?}");
        let mut w = Watch::<T, 3>::new();
        w.try_push(ok).unwrap();
        w.try_push(r).unwrap();
        w.try_push(ok).unwrap();
        let e = w.try_assess(Species::PROTON, Alpha::default()).unwrap_err();
        assert_eq!((e.index(), e.error()), (1, err));
        assert_eq!(e.to_string(), format!("reading 1: {err}"));
    }
    let neutral = Species::<T>::try_new(f(1.0e9), T::ZERO).unwrap();
    let dipole = Reading::Dipole {
        field_t: f(0.5),
        sigma_t: f(1e-4),
        radius_m: f(1.0),
    };
    assert_eq!(dipole.try_estimate(neutral), Err(Error::ZeroCharge));
    // Nothing returns NaN: huge but finite readings are refused or finite.
    let mut accepted = 0;
    for x in [T::MAX, T::MIN_POSITIVE, f(1e-30)] {
        for r in [
            Reading::Dipole {
                field_t: x,
                sigma_t: x,
                radius_m: x,
            },
            Reading::Deflector {
                field_v_per_m: x,
                sigma_v_per_m: x,
                radius_m: x,
            },
            Reading::FlightTime {
                time_s: x,
                sigma_s: x,
                baseline_m: f(1.0),
            },
            Reading::Speed {
                speed_m_per_s: x,
                sigma_m_per_s: x,
            },
            Reading::Kinetic {
                kinetic_ev: x,
                sigma_ev: x,
            },
        ] {
            if let Ok(e) = r.try_estimate(Species::ELECTRON) {
                assert!(
                    e.kinetic_energy().is_finite() && e.uncertainty() > T::ZERO,
                    "{r:?}"
                );
                accepted += 1;
            }
        }
    }
    assert!(
        accepted > 0,
        "no extreme reading accepted: the finiteness check checked nothing"
    );
    assert_eq!(
        Estimate::try_new(f(1.0), f(0.0)),
        Err(Error::NonPositiveUncertainty)
    );
}

#[test]
fn impossible_readings_are_typed_errors_naming_the_witness_f32() {
    impossible::<f32>();
}

#[test]
fn impossible_readings_are_typed_errors_naming_the_witness_f64() {
    impossible::<f64>();
}

/// f32 against f64 on the derivative grid: the same readings (exact in both), T within 16 eps
/// and sigma_T within 64 eps of f32 (the f64 result is exact to f32's eyes).
#[test]
fn f32_against_f64() {
    let text = reference("witness_derivatives.csv");
    let (mut wt, mut ws): (f64, f64) = (0.0, 0.0);
    for line in text.lines().skip(1) {
        let f: Vec<&str> = line.split(',').collect();
        let r = |x: f64, s: f64, g: f64| match f[1] {
            "tof" => Reading::FlightTime {
                time_s: x,
                sigma_s: s,
                baseline_m: g,
            },
            "dipole" => Reading::Dipole {
                field_t: x,
                sigma_t: s,
                radius_m: g,
            },
            "deflector" => Reading::Deflector {
                field_v_per_m: x,
                sigma_v_per_m: s,
                radius_m: g,
            },
            _ => Reading::Speed {
                speed_m_per_s: x,
                sigma_m_per_s: s,
            },
        };
        let (x, s, g): (f64, f64, f64) = (
            f[2].parse().unwrap(),
            f[3].parse().unwrap(),
            f[4].parse().unwrap(),
        );
        let wide = r(x, s, g).try_estimate(species::<f64>(f[0])).unwrap();
        let narrow32 = match r(x, s, g) {
            Reading::FlightTime { .. } => Reading::FlightTime {
                time_s: x as f32,
                sigma_s: s as f32,
                baseline_m: g as f32,
            },
            Reading::Dipole { .. } => Reading::Dipole {
                field_t: x as f32,
                sigma_t: s as f32,
                radius_m: g as f32,
            },
            Reading::Deflector { .. } => Reading::Deflector {
                field_v_per_m: x as f32,
                sigma_v_per_m: s as f32,
                radius_m: g as f32,
            },
            _ => Reading::Speed {
                speed_m_per_s: x as f32,
                sigma_m_per_s: s as f32,
            },
        };
        let Ok(narrow) = narrow32.try_estimate(species::<f32>(f[0])) else {
            continue;
        };
        let eps = f64::from(f32::EPSILON);
        wt = wt.max((f64::from(narrow.kinetic_energy()) / wide.kinetic_energy() - 1.0).abs() / eps);
        ws = ws.max((f64::from(narrow.uncertainty()) / wide.uncertainty() - 1.0).abs() / eps);
    }
    println!("witness f32 against f64: T {wt:.2} eps, sigma_T {ws:.2} eps");
    assert!(wt <= T_BOUND && ws <= SIGMA_BOUND);
}

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]
    use fourforce::witness::{Alpha, Reading, Watch};
    use fourforce::{Real, Species};

    fn watch<T: Real>(readings: &[(T, T)]) -> Watch<T, 4> {
        let mut w = Watch::new();
        for &(kinetic_ev, sigma_ev) in readings {
            w.try_push(Reading::Kinetic {
                kinetic_ev,
                sigma_ev,
            })
            .unwrap();
        }
        w
    }

    /// Found by the `witness` fuzz target: three readbacks (f64) 8.9e-309 ± 7.7e-318 eV,
    /// 9.4e233 ± 1.9e7 eV and 2.35 ± 13.3 eV gave `χ² = ∞`. Now the largest finite value: the
    /// set is inconsistent at every level.
    #[test]
    fn chi_squared_beyond_the_range_is_the_largest_finite_value() {
        let w = watch(&[
            (8.947_088_345_659_79e-309_f64, 7.672_326e-318),
            (9.439_324_952_438_27e233, 18_750_000.0),
            (2.354_632_486_941_659_5, 13.328_022_799_179_488),
        ]);
        let a = w.try_assess(Species::PROTON, Alpha::default()).unwrap();
        assert_eq!(a.chi_squared(), f64::MAX);
        assert!(!a.is_consistent());
        assert!(a.fused().kinetic_energy().is_finite());
    }

    /// Found with the `witness` fuzz target's finding above: the weighted sum of the differences
    /// from the most precise witness overflowed for readbacks near the largest energy (0, 1.5e308
    /// and 1.5e308 eV, all ± 1 eV: Σ w d = 3e308), and the fused energy was infinite. Now the
    /// sum runs on d/16 and the fused energy is their mean, 1e308.
    #[test]
    fn fused_energy_of_readings_near_the_largest_energy_is_finite() {
        let w = watch(&[(0.0_f64, 1.0), (1.5e308, 1.0), (1.5e308, 1.0)]);
        let a = w.try_assess(Species::PROTON, Alpha::default()).unwrap();
        let t = a.fused().kinetic_energy();
        assert!((t / 1.0e308 - 1.0).abs() < 4.0 * f64::EPSILON, "{t}");
        assert_eq!(a.chi_squared(), f64::MAX);
        let w = watch(&[(0.0_f32, 1.0), (3.0e38, 1.0), (3.0e38, 1.0), (3.0e38, 1.0)]);
        let a = w.try_assess(Species::PROTON, Alpha::default()).unwrap();
        let t = a.fused().kinetic_energy();
        assert!((t / 2.25e38 - 1.0).abs() < 4.0 * f32::EPSILON, "{t}");
    }
}
