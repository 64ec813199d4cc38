//! First-order transfer maps against handbook relations and their own structure.
//!
//! Sources beside each check: the linear-optics relations of H. Wiedemann, Particle Accelerator
//! Physics (Springer), and K. L. Brown's first-order matrix formalism (SLAC-75), both from
//! memory; symplecticity of Hamiltonian maps (a general theorem of mechanics).
#![allow(clippy::float_cmp, clippy::needless_range_loop)]

use crate::tolerance::t;
use fourforce::beamline::{BeamLine, Element};
use fourforce::transfer::TransferMap;
use fourforce::{Motion, Real, Species};

fn motion<T: Real>(species: Species<T>, kinetic_ev: f64) -> Motion<T> {
    Motion::try_from_kinetic_energy(species, t(kinetic_ev)).unwrap()
}

/// `Mᵀ J M − J` in `(x, x', y, y', z = −vΔt, δ)`, its largest entry relative to the largest
/// product of absolute values that makes it up.
fn symplectic_defect(map: &TransferMap<f64>, speed: f64) -> f64 {
    let r = map.to_array();
    // M' = T R T⁻¹, T = diag(1, 1, 1, 1, −v, 1)
    let scale = |i: usize| if i == 4 { -speed } else { 1.0 };
    let mut m = [[0.0; 6]; 6];
    for i in 0..6 {
        for k in 0..6 {
            m[i][k] = scale(i) * r[i][k] / scale(k);
        }
    }
    let j = |a: usize, b: usize| -> f64 {
        match (a, b) {
            (0, 1) | (2, 3) | (4, 5) => 1.0,
            (1, 0) | (3, 2) | (5, 4) => -1.0,
            _ => 0.0,
        }
    };
    let mut worst: f64 = 0.0;
    for a in 0..6 {
        for b in 0..6 {
            let (mut sum, mut scale) = (0.0, 0.0_f64);
            for k in 0..6 {
                for l in 0..6 {
                    let term = m[k][a] * j(k, l) * m[l][b];
                    sum += term;
                    scale = scale.max(term.abs());
                }
            }
            worst = worst.max((sum - j(a, b)).abs() / scale.max(1.0));
        }
    }
    worst
}

/// Every element without a gap, and a line of them, is symplectic in `(x, x', y, y', z, δ)`
/// (Hamiltonian flow; the transformation `z = −vΔt` makes the time row canonical).
#[test]
fn maps_without_gaps_are_symplectic_and_each_plane_has_unit_determinant() {
    for (species, kinetic) in [
        (Species::<f64>::ELECTRON, 3.0e6),
        (Species::PROTON, 250.0e6),
        (Species::ALPHA, 20.0e3),
    ] {
        let p = motion(species, kinetic);
        let maps = [
            TransferMap::try_drift(&p, 1.3).unwrap(),
            TransferMap::try_quadrupole(&p, 0.25, 0.8 * p.try_magnetic_rigidity().unwrap())
                .unwrap(),
            TransferMap::try_quadrupole(&p, 0.25, -2.0 * p.try_magnetic_rigidity().unwrap())
                .unwrap(),
            TransferMap::try_thin_quadrupole(&p, 0.3 * p.try_magnetic_rigidity().unwrap()).unwrap(),
            TransferMap::try_electrostatic_quadrupole(
                &p,
                0.1,
                0.02 * p.try_electric_rigidity().unwrap(),
                0.03,
            )
            .unwrap(),
            TransferMap::try_sector_dipole(&p, 1.2, 0.6, 0.1, -0.2).unwrap(),
            TransferMap::try_sector_dipole(&p, 0.8, -0.4, 0.3, 0.0).unwrap(),
            TransferMap::try_solenoid(&p, 0.4, 3.0 * p.try_magnetic_rigidity().unwrap()).unwrap(),
        ];
        let speed = p.speed();
        let mut line = TransferMap::IDENTITY;
        for m in &maps {
            assert!(symplectic_defect(m, speed) < 8.0 * f64::EPSILON, "{m:?}");
            line = line.then(m);
            let r = m.to_array();
            if !m.is_coupled() {
                let det_x = r[0][0] * r[1][1] - r[0][1] * r[1][0];
                let det_y = r[2][2] * r[3][3] - r[2][3] * r[3][2];
                assert!(
                    (det_x - 1.0).abs() < 8.0 * f64::EPSILON
                        && (det_y - 1.0).abs() < 8.0 * f64::EPSILON
                );
            }
        }
        assert!(symplectic_defect(&line, speed) < 1e-13, "{line:?}");
    }
}

/// Thin-lens limit: a thick quadrupole of length L → 0 at fixed G L tends to the thin lens
/// R21 = −sign(Q) G L/Bρ (Wiedemann, from memory), with an error of order k L² ∝ L.
#[test]
fn a_short_thick_quadrupole_tends_to_the_thin_lens() {
    let p = motion(Species::<f64>::PROTON, 50.0e6);
    let gl = 0.4; // T
    let thin = TransferMap::try_thin_quadrupole(&p, gl).unwrap().to_array();
    let mut previous = f64::INFINITY;
    for l in [0.1, 0.01, 0.001, 0.0001] {
        let thick = TransferMap::try_quadrupole(&p, l, gl / l)
            .unwrap()
            .to_array();
        let gap = (thick[1][0] - thin[1][0]).abs() / thin[1][0].abs();
        assert!(gap < previous / 9.0, "{l}: {gap}"); // O(L): a factor 10 per decade
        previous = gap;
        assert!((thick[3][2] / thin[3][2] - 1.0).abs() < 2.0 * gap + 1e-12);
    }
    assert!(previous < 1e-5);
}

/// A symmetric thin-lens cell (half focusing lenses of focal length 2f at both ends, a
/// defocusing lens −f in the middle, drifts L): cos μ = 1 − L²/(2f²) in both planes
/// (Wiedemann, from memory); the periodic solution of the crate gives the same phase advance.
fn thin_lens_cell<T: Real>(tolerance: f64) {
    let p = motion(Species::<T>::PROTON, 100.0e6);
    let brho = p.try_magnetic_rigidity().unwrap().to_f64();
    let (f, l) = (2.5_f64, 3.0_f64);
    let half = TransferMap::try_thin_quadrupole(&p, t(brho / (2.0 * f))).unwrap();
    let middle = TransferMap::try_thin_quadrupole(&p, t(-brho / f)).unwrap();
    let drift = TransferMap::try_drift(&p, t(l)).unwrap();
    let cell = half
        .then(&drift)
        .then(&middle)
        .then(&drift)
        .then(&half)
        .to_array();
    let expected = 1.0 - l * l / (2.0 * f * f);
    for plane in [0, 2] {
        let half_trace = (cell[plane][plane].to_f64() + cell[plane + 1][plane + 1].to_f64()) / 2.0;
        assert!(
            (half_trace - expected).abs() < tolerance,
            "{half_trace} {expected}"
        );
    }
}

#[test]
fn symmetric_thin_lens_cell_has_the_handbook_phase_advance() {
    thin_lens_cell::<f64>(4.0 * f64::EPSILON);
    thin_lens_cell::<f32>(8.0 * f64::from(f32::EPSILON));
}

/// A rectangular dipole (e₁ = e₂ = θ/2) is horizontally a drift of length ρ sin θ:
/// R11 = R22 = 1, R21 = 0 (Wiedemann, from memory), exactly in both precisions.
fn rectangular<T: Real>() {
    let p = motion(Species::<T>::PROTON, 30.0e6);
    for (l, theta) in [(1.0, 0.3), (2.5, -0.8), (0.4, 1.2), (1.0, 1.0e-4)] {
        let th: T = t(theta);
        let m = TransferMap::try_sector_dipole(&p, t(l), th, th * T::HALF, th * T::HALF)
            .unwrap()
            .to_array();
        assert_eq!((m[0][0], m[1][0], m[1][1]), (T::ONE, T::ZERO, T::ONE));
        let rho_sin = l / theta * theta.sin();
        assert!((m[0][1].to_f64() / rho_sin - 1.0).abs() < 4.0 * T::EPSILON.to_f64());
    }
}

#[test]
fn rectangular_dipole_is_a_drift_horizontally() {
    rectangular::<f32>();
    rectangular::<f64>();
}

/// As k → 0 and θ → 0 the maps approach the drift smoothly and reach it exactly at zero.
#[test]
fn weak_elements_approach_the_drift() {
    let p = motion(Species::<f32>::ELECTRON, 2.0e6);
    let drift = TransferMap::try_drift(&p, 0.5).unwrap();
    assert_eq!(TransferMap::try_quadrupole(&p, 0.5, 0.0).unwrap(), drift);
    assert_eq!(
        TransferMap::try_sector_dipole(&p, 0.5, 0.0, 0.0, 0.0).unwrap(),
        drift
    );
    let d = drift.to_array();
    for g in [1.0e-3_f32, 1.0e-6, 1.0e-9] {
        let q = TransferMap::try_quadrupole(&p, 0.5, g).unwrap().to_array();
        // L sin φ/φ = L (1 − φ²/6 + ...), φ² = k L², k = G/Bρ
        let k = g / p.try_magnetic_rigidity().unwrap();
        assert!((q[0][1] - d[0][1]).abs() <= 0.5 * (1.01 * k * 0.25 / 6.0 + 2.0 * f32::EPSILON));
    }
    for theta in [1.0e-2_f32, 1.0e-4, 1.0e-8] {
        let b = TransferMap::try_sector_dipole(&p, 0.5, theta, 0.0, 0.0)
            .unwrap()
            .to_array();
        // R16 = ρ(1 − cos θ) ≈ L θ/2 with full relative accuracy
        assert!((b[0][5] / (0.25 * theta) - 1.0).abs() < theta * theta + 2.0 * f32::EPSILON);
        // R56 holds ρ(θ − sin θ) ≈ L θ²/6 beside −L/γ²: the series keeps its digits
        let r56 = (0.5 * (1.0 - (f64::from(theta)).sin() / f64::from(theta))
            - 0.5 / p.gamma().to_f64().powi(2))
            * p.flight_time_per_metre().to_f64();
        assert!(
            (f64::from(b[4][5]) / r56 - 1.0).abs() < 8.0 * f64::from(f32::EPSILON),
            "{theta}: {} {r56}",
            b[4][5]
        );
    }
}

// ---- against 50-digit references ----------------------------------------------------------------

/// One element of the `fourforce map` input format, parsed into `T` (each decimal rounded once).
fn element<T: Real + core::str::FromStr>(text: &str) -> Element<T> {
    let mut fields = text.split(',');
    let kind = fields.next().unwrap();
    let v: Vec<T> = fields
        .map(|f| f.parse().unwrap_or_else(|_| panic!("{f}")))
        .collect();
    match (kind, v.as_slice()) {
        ("drift", &[length_m]) => Element::Drift { length_m },
        ("quad", &[length_m, gradient_t_per_m]) => Element::Quadrupole {
            length_m,
            gradient_t_per_m,
        },
        ("thinquad", &[integrated_gradient_t]) => Element::ThinQuadrupole {
            integrated_gradient_t,
        },
        ("equad", &[length_m, voltage_v, aperture_radius_m]) => Element::ElectrostaticQuadrupole {
            length_m,
            voltage_v,
            aperture_radius_m,
        },
        ("bend", &[length_m, angle_rad, entry_angle_rad, exit_angle_rad]) => {
            Element::SectorDipole {
                length_m,
                angle_rad,
                entry_angle_rad,
                exit_angle_rad,
            }
        }
        ("solenoid", &[length_m, field_t]) => Element::Solenoid { length_m, field_t },
        ("gap", &[voltage_v]) => Element::AcceleratingGap { voltage_v },
        _ => panic!("bad element {text}"),
    }
}

fn species<T: Real + core::str::FromStr>(name: &str) -> Species<T> {
    match name {
        "electron" => Species::ELECTRON,
        "antimuon" => Species::ANTIMUON,
        "proton" => Species::PROTON,
        "deuteron" => Species::DEUTERON,
        "alpha" => Species::ALPHA,
        custom => {
            let mut f = custom.strip_prefix("custom:").unwrap().split(':');
            let rest: T = f.next().unwrap().parse().ok().unwrap();
            let charge: T = f.next().unwrap().parse().ok().unwrap();
            Species::try_new(rest * T::from_f64(1.0e6), charge).unwrap()
        }
    }
}

/// A reference row: species, kinetic MeV, the line, 36 exact entries, 36 scales S.
struct Case {
    id: String,
    species: String,
    kinetic_mev: String,
    line: String,
    exact: Vec<f64>,
    scale: Vec<f64>,
}

fn cases() -> Vec<Case> {
    let text = include_str!("../reference/transfer_maps.csv");
    text.lines()
        .skip(1)
        .map(|row| {
            let (head, rest) = row.split_once(",\"").unwrap();
            let (line, numbers) = rest.split_once("\",").unwrap();
            let head: Vec<&str> = head.split(',').collect();
            let numbers: Vec<f64> = numbers.split(',').map(|x| x.parse().unwrap()).collect();
            assert_eq!(numbers.len(), 72);
            Case {
                id: head[0].to_owned(),
                species: head[1].to_owned(),
                kinetic_mev: head[2].to_owned(),
                line: line.to_owned(),
                exact: numbers[..36].to_vec(),
                scale: numbers[36..].to_vec(),
            }
        })
        .collect()
}

/// The worst `|computed − exact| / (eps S)` over every entry of every reference line, and where.
fn worst_ratio<T: Real + core::str::FromStr>() -> (f64, String) {
    let mut worst = (0.0_f64, String::new());
    let all = cases();
    assert!(all.len() >= 100, "{} reference lines", all.len());
    for case in &all {
        let s = species::<T>(&case.species);
        let mev: T = case.kinetic_mev.parse().ok().unwrap();
        let p = Motion::try_from_kinetic_energy(s, mev * T::from_f64(1.0e6)).unwrap();
        let elements: Vec<Element<T>> = case.line.split(';').map(element).collect();
        let line = BeamLine::<T, 16>::try_from_elements(&elements).unwrap();
        let (map, _) = line.try_map(&p).unwrap();
        let m = map.to_array();
        for i in 0..6 {
            for j in 0..6 {
                let k = 6 * i + j;
                let error = (m[i][j].to_f64() - case.exact[k]).abs();
                // an exact zero (S = 0) must come out as an exact zero
                let ratio = if error == 0.0 {
                    0.0
                } else {
                    error / (T::EPSILON.to_f64() * case.scale[k])
                };
                let ratio = if ratio.is_nan() { f64::INFINITY } else { ratio };
                if ratio > worst.0 || worst.1.is_empty() {
                    worst = (
                        ratio,
                        format!("case {} R{}{} ({})", case.id, i + 1, j + 1, case.line),
                    );
                }
            }
        }
    }
    worst
}

/// Every entry of the maps of 119 lines (seven species from the electron to a U²⁸⁺ ion, 1 keV to
/// 10 GeV, every element kind) within a few eps·S of the 50-digit mpmath maps of
/// checks/tests/reference/generate_transfer.py, S the entry's rounding scale plus its sensitivity
/// to the rounding of every input. The promise is 32; the bounds asserted are the measured worst
/// rounded up.
#[test]
fn line_maps_agree_with_the_50_digit_references_entry_by_entry() {
    let (f64_worst, f64_at) = worst_ratio::<f64>();
    let (f32_worst, f32_at) = worst_ratio::<f32>();
    println!(
        "worst |R - R_exact| / (eps S): f64 {f64_worst:.3} at {f64_at}; f32 {f32_worst:.3} at {f32_at}"
    );
    assert!(f64_worst <= 2.0, "f64: {f64_worst} at {f64_at}");
    assert!(f32_worst <= 2.0, "f32: {f32_worst} at {f32_at}");
}
