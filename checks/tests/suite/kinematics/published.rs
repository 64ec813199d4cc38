//! The worked examples, exact factors and precision traps of `checks/tests/reference/SOURCES.md`, asserted in
//! both precisions.
//!
//! Sources, as named in that file: constants CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93,
//! 025010 (2021)) and the exact c and e of the SI 2019; derived values computed with mpmath at
//! 50 digits from them; the relations are those of the PDG "Kinematics" review and Jackson 3rd
//! ed. ch. 11-12 (from memory). The precision traps were measured with IEEE single precision (numpy
//! float32) against mpmath; here the naive formula is run again in f32 to show it still fails,
//! beside ours.
#![allow(clippy::float_cmp, clippy::unwrap_used)]
// Published values are typed with all the digits their source prints.
#![allow(clippy::excessive_precision, clippy::inconsistent_digit_grouping)]

use crate::tolerance::eps_rel;
use fourforce::{Error, Motion, Real, Species};

/// The carbon-12 ion stripped of all six electrons: 11174.864265448 MeV ([CODATA 2018], [NIST ASD]:
/// CODATA 2018 m_u c^2 and m_e c^2, binding energy 1030.108 eV from the NIST Atomic Spectra
/// Database, from memory), Q = 6.
fn carbon6<T: Real>() -> Species<T> {
    Species::try_new(T::from_f64(11_174_864_265.448), T::from_f64(6.0)).unwrap()
}

#[derive(Clone, Copy, Debug)]
enum Q {
    GammaMinusOne,
    Gamma,
    Beta,
    OneMinusBeta,
    BetaGamma,
    MomentumMev,
    Brho,
    Erho,
    Speed,
    TofNsPerM,
    CyclotronHzPerT,
}

/// (species name, kinetic energy in eV as an exact decimal, quantity, value): mpmath at 50
/// digits from CODATA 2018 ([mpmath]).
const ROWS: &[(&str, f64, Q, f64)] = &[
    ("e", 1.0, Q::GammaMinusOne, 1.9569511835591834e-6),
    ("e", 1.0, Q::Beta, 0.0019783555995256616),
    ("e", 1.0, Q::Speed, 593096.08797986174),
    ("e", 1.0, Q::MomentumMev, 0.0010109396124398331),
    ("e", 1.0, Q::Brho, 3.3721315712346343e-6),
    ("e", 1.0, Q::Erho, 1.9999980430526461),
    ("e", 1.0, Q::TofNsPerM, 1686.0674353899203),
    ("e", 1.0e3, Q::GammaMinusOne, 0.0019569511835591834),
    ("e", 1.0e3, Q::Beta, 0.062469538960751055),
    ("e", 1.0e3, Q::Speed, 18727896.635170324),
    ("e", 1.0e3, Q::Brho, 1.0668826883859977e-4),
    ("e", 1.0e3, Q::Erho, 1998.0468709945597),
    ("e", 1.0e4, Q::Beta, 0.19498560876999024),
    ("e", 1.0e4, Q::Speed, 58455214.927781732),
    ("e", 1.0e4, Q::Erho, 19808.061033520317),
    ("e", 1.0e5, Q::Gamma, 1.1956951183559183),
    ("e", 1.0e5, Q::Beta, 0.54822086195235685),
    ("e", 1.0e5, Q::Speed, 164352479.73157574),
    ("e", 1.0e5, Q::MomentumMev, 0.33496237102098498),
    ("e", 1.0e5, Q::Brho, 0.0011173142021504256),
    ("e", 1.0e6, Q::Gamma, 2.9569511835591834),
    ("e", 1.0e6, Q::Beta, 0.94107922802734013),
    ("e", 1.0e6, Q::BetaGamma, 2.7827253371384061),
    ("e", 1.0e6, Q::MomentumMev, 1.4219697254161215),
    ("e", 1.0e6, Q::Brho, 0.0047431804485759329),
    ("e", 1.0e6, Q::Erho, 1338186.1714728524),
    ("e", 1.0e6, Q::Speed, 282128454.94305879),
    ("e", 1.0e6, Q::TofNsPerM, 3.5444847284256643),
    ("e", 1.0e6, Q::CyclotronHzPerT, 9466672979.8458452),
    ("e", 1.0e10, Q::Gamma, 19570.511835591834),
    ("e", 1.0e10, Q::OneMinusBeta, 1.3054662135760086e-9),
    ("e", 1.0e10, Q::Brho, 33.358113985291354),
    ("p", 1.0e3, Q::GammaMinusOne, 1.0657889247894517e-6),
    ("p", 1.0e3, Q::Beta, 0.0014599912471880266),
    ("p", 1.0e3, Q::Speed, 437694.36465298407),
    ("p", 1.0e3, Q::Erho, 1999.9989342122111),
    ("p", 250.0e6, Q::Gamma, 1.2664472311973629),
    ("p", 250.0e6, Q::Beta, 0.61360842359451601),
    ("p", 250.0e6, Q::MomentumMev, 729.13376281722135),
    ("p", 250.0e6, Q::Brho, 2.4321284387255044),
    ("p", 1.0e9, Q::Gamma, 2.0657889247894517),
    ("p", 1.0e9, Q::Beta, 0.87502564669301833),
    ("p", 1.0e9, Q::BetaGamma, 1.8076182898451650),
    ("p", 1.0e9, Q::MomentumMev, 1696.0377874092310),
    ("p", 1.0e9, Q::Brho, 5.6573730997903591),
    ("p", 1.0e9, Q::Speed, 262326089.43513954),
    ("p", 1.0e9, Q::TofNsPerM, 3.8120493548822230),
    ("p", 1.0e9, Q::CyclotronHzPerT, 7379837.4438334631),
    ("p", 7.0e12, Q::Gamma, 7461.5224735261616),
    ("p", 7.0e12, Q::OneMinusBeta, 8.9808016261921282e-9),
    ("p", 7.0e12, Q::MomentumMev, 7000938.2092141222),
    ("p", 7.0e12, Q::Brho, 23352.616192946796),
    ("p", 1.0e14, Q::Gamma, 106579.89247894517),
    ("p", 1.0e14, Q::OneMinusBeta, 4.4016899571534549e-11),
    ("p", 1.0e14, Q::Brho, 333567.22492227082),
    ("mu", 1.0e9, Q::Gamma, 10.464465029561239),
    ("mu", 1.0e9, Q::Beta, 0.99542352757996080),
    ("mu", 1.0e9, Q::MomentumMev, 1100.5983604385389),
    ("mu", 1.0e9, Q::Brho, 3.6712009627625085),
    ("d", 2.0e6, Q::Beta, 0.046143579286142601),
    ("d", 2.0e6, Q::Speed, 13833497.055110576),
    ("d", 2.0e6, Q::Brho, 0.28899920385644361),
    ("a", 5.0e6, Q::Beta, 0.051744192122256112),
    ("a", 5.0e6, Q::Speed, 15512518.543555396),
    ("a", 5.0e6, Q::MomentumMev, 193.12895708826266),
    ("a", 5.0e6, Q::Brho, 0.32210442913854534),
    ("a", 5.0e6, Q::Erho, 4996650.9299730097),
    ("c6", 4.8e9, Q::Gamma, 1.4295354185948645),
    ("c6", 4.8e9, Q::Beta, 0.71460522556146550),
    ("c6", 4.8e9, Q::MomentumMev, 11415.721481724263),
    ("c6", 4.8e9, Q::Brho, 6.3464580118091023),
];

fn species<T: Real>(name: &str) -> Species<T> {
    match name {
        "e" => Species::ELECTRON,
        "p" => Species::PROTON,
        "mu" => Species::MUON,
        "d" => Species::DEUTERON,
        "a" => Species::ALPHA,
        _ => carbon6(),
    }
}

fn read<T: Real>(m: &Motion<T>, q: Q) -> T {
    match q {
        Q::GammaMinusOne => m.gamma_minus_one(),
        Q::Gamma => m.gamma(),
        Q::Beta => m.beta(),
        Q::OneMinusBeta => m.one_minus_beta(),
        Q::BetaGamma => m.beta_gamma(),
        Q::MomentumMev => m.momentum() * T::from_f64(1e-6),
        Q::Brho => m.try_magnetic_rigidity().unwrap(),
        Q::Erho => m.try_electric_rigidity().unwrap(),
        Q::Speed => m.speed(),
        Q::TofNsPerM => m.flight_time_per_metre() * T::from_f64(1e9),
        Q::CyclotronHzPerT => fourforce::optics::try_revolution_frequency(m, T::ONE).unwrap(),
    }
}

fn published_rows<T: Real>() {
    let mut worst = 0.0_f64;
    for &(name, t_ev, q, want) in ROWS {
        let t = T::from_f64(t_ev);
        // Inputs not exact in the precision (7e12 and 1e14 in f32) start with up to 0.5 eps of
        // error, and every quantity here has condition <= 2 in T ([mpmath], CODATA 2018): 1 eps
        // more for them. Unit conversions (MeV, ns) add one rounding each: 0.5 eps, rounded up.
        let input_slack = if t.to_f64() == t_ev { 0.0 } else { 1.0 };
        let unit_slack = match q {
            Q::MomentumMev | Q::TofNsPerM => 1.0,
            _ => 0.0,
        };
        let m = Motion::try_from_kinetic_energy(species::<T>(name), t).unwrap();
        let err = eps_rel(read(&m, q), want);
        let bound = 8.0 + input_slack + unit_slack;
        assert!(
            err <= bound,
            "{name} T = {t_ev} eV {q:?}: {err:.2} eps > {bound}"
        );
        worst = worst.max(err);
    }
    println!(
        "[mpmath], CODATA 2018, {} digits: worst {worst:.2} eps",
        T::MANTISSA_DIGITS
    );
}

#[test]
fn published_worked_examples_f32() {
    published_rows::<f32>();
}

#[test]
fn published_worked_examples_f64() {
    published_rows::<f64>();
}

fn seven_tev_total<T: Real>() {
    // [mpmath] from CODATA 2018: a proton of total energy 7 TeV.
    let p = Motion::try_from_total_energy(Species::<T>::PROTON, T::from_f64(7.0e12)).unwrap();
    let slack = if T::MANTISSA_DIGITS == 24 { 1.0 } else { 0.0 }; // 7e12 rounds in f32
    assert!(eps_rel(p.gamma(), 7460.5224735261616) <= 8.0 + slack);
    assert!(eps_rel(p.momentum(), 6999999.9371175346e6) <= 8.0 + slack);
    assert!(eps_rel(p.try_magnetic_rigidity().unwrap(), 23349.486454117317) <= 8.0 + slack);
    // A momentum of exactly 7 TeV/c: B rho = 23349.486663870643 T m.
    let q = Motion::try_from_momentum(Species::<T>::PROTON, T::from_f64(7.0e12)).unwrap();
    assert!(eps_rel(q.try_magnetic_rigidity().unwrap(), 23349.486663870643) <= 8.0 + slack);
}

#[test]
fn seven_tev_proton_both_precisions() {
    seven_tev_total::<f32>();
    seven_tev_total::<f64>();
}

fn exact_factors<T: Real>() {
    // [CODATA 2018], [NIST ASD]: B rho per GeV/c at Q = 1 is 10^9/c = 3.3356409519815205 T m, and the
    // light travel time 1/c = 3.3356409519815205 ns/m (exact from c, SI 2019).
    let brho = Motion::try_from_momentum(Species::<T>::PROTON, T::from_f64(1e9))
        .unwrap()
        .try_magnetic_rigidity()
        .unwrap();
    assert!(eps_rel(brho, 3.3356409519815205) <= 1.0);
    // Non-relativistic limit of E rho: 2T/Q (common practice): a 1 eV proton has E rho = 2 V up
    // to the relativistic correction, relative T/(2m) = 5.3e-10.
    let e = Motion::try_from_kinetic_energy(Species::<T>::PROTON, T::ONE).unwrap();
    let rel = (e.try_electric_rigidity().unwrap().to_f64() / 2.0 - 1.0).abs();
    assert!(rel <= 0.5 / 938.272_088_16e6 + 8.0 * T::EPSILON.to_f64());
}

#[test]
fn exact_factors_both_precisions() {
    exact_factors::<f32>();
    exact_factors::<f64>();
}

fn at_rest_cyclotron<T: Real>() {
    // [mpmath] from CODATA 2018 (Jackson 3rd ed. §12.2, from memory):
    // cyclotron frequency per tesla at rest.
    let cases: [(Species<T>, f64); 5] = [
        (Species::ELECTRON, 2.79924898721e10),
        (Species::PROTON, 15245186.4582),
        (Species::DEUTERON, 7626377.81383),
        (Species::ALPHA, 7675168.72965),
        (Species::MUON, 135380965.918),
    ];
    for (s, want) in cases {
        let m = Motion::try_from_kinetic_energy(s, T::ZERO).unwrap();
        let f = fourforce::optics::try_revolution_frequency(&m, T::ONE).unwrap();
        // The published values carry 12 significant digits: compare to 5e-12 or 8 eps.
        let tol = (8.0 * T::EPSILON.to_f64()).max(5e-12);
        assert!(((f.to_f64() - want) / want).abs() <= tol, "{f} vs {want}");
    }
}

#[test]
fn cyclotron_at_rest_both_precisions() {
    at_rest_cyclotron::<f32>();
    at_rest_cyclotron::<f64>();
}

// ---- precision traps, f32, inputs exact in f32, exact values from mpmath on the same f32
// inputs ([IEEE 754] single precision against [mpmath]). Each case runs the naive formula in f32 to show the trap, then
// ours within 8 eps.

const M_E: f32 = 510_998.94; // CODATA 2018 electron rest energy, rounded to f32 (CODATA 2018)
const M_P: f32 = 938_272_064.0; // CODATA 2018 proton rest energy, rounded to f32 (CODATA 2018)

#[test]
fn trap_gamma_minus_one_of_1_ev_electron() {
    let naive = (1.0_f32 + M_E) / M_E - 1.0;
    assert!(eps_rel(naive, 1.956951179e-6) > 1e5); // 2.98e5 eps, [IEEE 754] single precision against [mpmath]
    let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 1.0).unwrap();
    assert!(eps_rel(e.gamma_minus_one(), 1.956951179e-6) <= 8.0);
}

#[test]
fn trap_gamma_minus_one_of_1_kev_proton() {
    let naive = (1000.0_f32 + M_P) / M_P - 1.0;
    assert!(eps_rel(naive, 1.065788975e-6) > 1e4); // 5.58e4 eps, [IEEE 754] single precision against [mpmath]
    let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1000.0).unwrap();
    assert!(eps_rel(p.gamma_minus_one(), 1.065788975e-6) <= 8.0);
}

#[test]
fn trap_one_minus_beta_of_10_gev_electron_and_100_tev_proton() {
    let t = 1.0e10_f32;
    let pc = (t * (t + 2.0 * M_E)).sqrt();
    assert_eq!(1.0 - pc / (t + M_E), 0.0); // [IEEE 754] single precision against [mpmath]: naive gives 0
    let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, t).unwrap();
    assert!(eps_rel(e.one_minus_beta(), 1.305466214e-9) <= 8.0);
    // Lag behind light over 100 m, L/c (1 - beta)/beta: 4.354566569e-7 ns ([IEEE 754] single precision against [mpmath]).
    let lag_ns = 100.0 * e.one_minus_beta() / e.beta() * 1e9 / f32::SPEED_OF_LIGHT;
    assert!(eps_rel(lag_ns, 4.354566569e-7) <= 8.0);

    // [IEEE 754] single precision against [mpmath], in MeV as measured there: naive beta = pc/E exceeds 1 for a 100 TeV proton.
    let (t_mev, m_mev) = (1.0e8_f32, 938.272_1_f32);
    let pc = (t_mev * (t_mev + 2.0 * m_mev)).sqrt();
    assert!(pc / (t_mev + m_mev) > 1.0);
    let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e14).unwrap();
    assert!(p.beta() <= 1.0);
    assert!(eps_rel(p.one_minus_beta(), 4.401689957e-11) <= 8.0);
}

#[test]
fn trap_beta_from_gamma_at_low_energy() {
    // [IEEE 754] single precision against [mpmath]: sqrt(1 - 1/gamma^2) of a 1 eV electron is 1.07e5 eps off in f32. Here the
    // state is built from the exact gamma - 1 path (kinetic energy), and from beta gamma.
    let g = 1.0_f32 + 1.0 / M_E;
    let naive = (1.0 - 1.0 / (g * g)).sqrt();
    assert!(eps_rel(naive, 0.001978355597) > 1e4);
    let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, 1.0).unwrap();
    assert!(eps_rel(e.beta(), 0.001978355597) <= 8.0);
}

#[test]
fn trap_momentum_and_back_at_low_energy() {
    // [IEEE 754] single precision against [mpmath]: pc of a 1 eV electron, naive sqrt(E^2 - m^2) is 8.6e4 eps off; T from pc,
    // naive sqrt(pc^2 + m^2) - m is 3.9e5 eps off.
    let (t, e_tot) = (1.0_f32, 1.0_f32 + M_E);
    let naive_pc = (e_tot * e_tot - M_E * M_E).sqrt();
    assert!(eps_rel(naive_pc, 1010.939611) > 1e4);
    let e = Motion::try_from_kinetic_energy(Species::<f32>::ELECTRON, t).unwrap();
    assert!(eps_rel(e.momentum(), 1010.939611) <= 8.0);
    // As measured there, in MeV: pc = 0.0010109395952895284 MeV (the f32 pc of a 1 eV electron).
    let (pc_mev, m_mev) = (0.001_010_939_6_f32, 0.510_998_95_f32);
    let naive_t = (pc_mev * pc_mev + m_mev * m_mev).sqrt() - m_mev;
    assert!(eps_rel(naive_t, 0.9999999975e-6) > 1e4);
    let pc = 1010.939_6_f32;
    let back = Motion::try_from_momentum(Species::<f32>::ELECTRON, pc).unwrap();
    // Exact T for this f32 pc (mpmath on the f32 inputs), [IEEE 754] single precision against [mpmath]: 9.999999975e-7 MeV.
    assert!(eps_rel(back.kinetic_energy(), 0.9999999975) <= 8.0);
}

#[test]
fn trap_gamma_from_speed_near_c() {
    // [IEEE 754] single precision against [mpmath]: v = 299762464 and 299792160 m/s (exact in f32); exact gamma 70.69505278 and
    // 709.2303786 (mpmath); naive f32 1/sqrt(1 - v^2/c^2) gives 70.70481 and 724.0773.
    for (v, want) in [
        (299_762_464.0_f32, 70.69505278),
        (299_792_160.0, 709.2303786),
    ] {
        let c = f32::SPEED_OF_LIGHT;
        let naive = 1.0 / (1.0 - v * v / (c * c)).sqrt();
        assert!(eps_rel(naive, want) > 1e3);
        let e = Motion::try_from_speed(Species::<f32>::ELECTRON, v).unwrap();
        assert!(eps_rel(e.gamma(), want) <= 8.0, "{} vs {want}", e.gamma());
    }
    // gamma - 1 from speed, electron 1 eV: 1.956951015e-6 for v = 593096.0880 (exact f32 input).
    let v = 593_096.1_f32;
    let e = Motion::try_from_speed(Species::<f32>::ELECTRON, v).unwrap();
    let b = f64::from(v) / 299_792_458.0;
    let want = 1.0 / (1.0 - b * b).sqrt() - 1.0; // f64 is ample here (condition 1 in b)
    assert!(eps_rel(e.gamma_minus_one(), want) <= 8.0);
}

#[test]
fn trap_c_itself_in_f32() {
    // SI 2019: c = 299792458 m/s exactly; f32 holds 299792448. The largest f32 speed below c is
    // accepted, the next is refused.
    assert!(Motion::try_from_speed(Species::<f32>::ELECTRON, 299_792_448.0).is_ok());
    assert_eq!(
        Motion::try_from_speed(Species::<f32>::ELECTRON, 299_792_480.0),
        Err(Error::SpeedNotBelowLight)
    );
}
