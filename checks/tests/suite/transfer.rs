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

// ---- against tracking through the fields with the crate's own pusher ------------------------------

mod tracking {
    use fourforce::beamline::Element;
    use fourforce::push::{Boris, FieldSource, Particle, Pusher};
    use fourforce::transfer::TransferMap;
    use fourforce::{FieldTensor, Motion, Species, ThreeVector};

    /// A field given by a function of the position: (E in V/m, B in T).
    struct Field<F: Fn(ThreeVector<f64>) -> ([f64; 3], [f64; 3])>(F);

    impl<F: Fn(ThreeVector<f64>) -> ([f64; 3], [f64; 3])> FieldSource<f64> for Field<F> {
        fn field_at(&self, r: ThreeVector<f64>, _t: f64) -> FieldTensor<f64> {
            let (e, b) = (self.0)(r);
            FieldTensor::try_from_fields(
                ThreeVector::new(e[0], e[1], e[2]),
                ThreeVector::new(b[0], b[1], b[2]),
            )
            .unwrap()
        }
    }

    /// A smooth ramp `(1 + sin(π u/w))/2` from 0 to 1 over `width` centred on `u = 0` (a short
    /// fringe), and its derivative: continuous, so that the pusher's samples integrate it well.
    fn ramp(u: f64, width: f64) -> (f64, f64) {
        use std::f64::consts::PI;
        if u <= -width / 2.0 {
            (0.0, 0.0)
        } else if u >= width / 2.0 {
            (1.0, 0.0)
        } else {
            let phase = PI * u / width;
            (0.5 + 0.5 * phase.sin(), 0.5 * PI / width * phase.cos())
        }
    }

    const FRINGE: f64 = 2.0e-3; // m
    const MARGIN: f64 = 0.05; // m of field-free drift before and after

    /// Where a tracked particle ends on the exit plane (point `q`, direction `d` of the reference,
    /// horizontal unit `xh`): (x, x', y, y', t).
    fn on_plane(p: &Particle<f64>, q: [f64; 2], d: [f64; 2], xh: [f64; 2]) -> [f64; 5] {
        let r = p.position();
        let v = p.beta();
        // (X, Z) components
        let (rx, rz, vx, vy, vz) = (r.x, r.z, v.x, v.y, v.z);
        let along = d[0] * vx + d[1] * vz;
        let dt = (d[0] * (q[0] - rx) + d[1] * (q[1] - rz)) / along; // in units of c·s: metres / β
        let (fx, fy, fz) = (rx + vx * dt, r.y + vy * dt, rz + vz * dt);
        let x = xh[0] * (fx - q[0]) + xh[1] * (fz - q[1]);
        let x_slope = (xh[0] * vx + xh[1] * vz) / along;
        let t = p.time() + dt / 299_792_458.0;
        [x, x_slope, fy, vy / along, t]
    }

    /// Tracks a particle of `species` with kinetic energy from `reference` scaled to momentum
    /// `(1 + δ)`, starting at Z = −MARGIN with (x, x', y, y'), through `field`, until it is past
    /// the exit plane; returns its coordinates there.
    #[allow(clippy::too_many_arguments)]
    fn track<S: FieldSource<f64>>(
        reference: &Motion<f64>,
        start: [f64; 5],
        field: &S,
        step_m: f64,
        q: [f64; 2],
        d: [f64; 2],
        xh: [f64; 2],
    ) -> [f64; 5] {
        let [x, xp, y, yp, delta] = start;
        let species = reference.species();
        let m = Motion::try_from_momentum(species, reference.momentum() * (1.0 + delta)).unwrap();
        // start on the plane Z = −MARGIN
        let direction = ThreeVector::new(xp, yp, 1.0);
        let mut p =
            Particle::try_from_motion(&m, direction, ThreeVector::new(x, y, -MARGIN)).unwrap();
        let pusher = Boris::try_new(species, step_m / m.speed()).unwrap();
        for _ in 0..10_000_000 {
            let r = p.position();
            if d[0] * (r.x - q[0]) + d[1] * (r.z - q[1]) > 0.0 {
                break;
            }
            pusher.try_step(&mut p, field).unwrap();
        }
        on_plane(&p, q, d, xh)
    }

    /// The map of an element measured by tracking: (tracked(a e_j) − tracked(0))/a for the
    /// columns x, x', y, y', δ; rows x, x', y, y', Δt.
    fn measured<S: FieldSource<f64>>(
        reference: &Motion<f64>,
        field: &S,
        step_m: f64,
        exit: ([f64; 2], [f64; 2], [f64; 2]),
        amplitude: f64,
    ) -> [[f64; 5]; 5] {
        let (q, d, xh) = exit;
        let zero = track(reference, [0.0; 5], field, step_m, q, d, xh);
        let mut columns = [[0.0; 5]; 5];
        for (j, column) in columns.iter_mut().enumerate() {
            let mut start = [0.0; 5];
            start[j] = amplitude;
            let end = track(reference, start, field, step_m, q, d, xh);
            for i in 0..5 {
                column[i] = (end[i] - zero[i]) / amplitude;
            }
        }
        columns
    }

    /// The largest difference between the measured and the computed map, each row relative to
    /// the largest entry of that row (and the time row to the flight time per metre times 1 m).
    fn difference(measured: &[[f64; 5]; 5], map: &TransferMap<f64>, per_metre: f64) -> f64 {
        let r = map.to_array();
        let cols = [0, 1, 2, 3, 5];
        let mut worst: f64 = 0.0;
        for (i, &row) in [0usize, 1, 2, 3, 4].iter().enumerate() {
            let scale = if row == 4 {
                per_metre
            } else {
                cols.iter().map(|&c| r[row][c].abs()).fold(1.0, f64::max)
            };
            for (j, &c) in cols.iter().enumerate() {
                worst = worst.max((measured[j][i] - r[row][c]).abs() / scale);
            }
        }
        worst
    }

    /// The straight element `element` of length `length` between two drifts of MARGIN: the map
    /// of the crate against tracking through `field` at two amplitudes. Returns the differences.
    fn straight<F: Fn(ThreeVector<f64>) -> ([f64; 3], [f64; 3])>(
        reference: &Motion<f64>,
        element: Element<f64>,
        length: f64,
        fringe: f64,
        field: F,
    ) -> (f64, f64) {
        let field = Field(field);
        let end = length + MARGIN;
        let exit = ([0.0, end], [0.0, 1.0], [1.0, 0.0]);
        let drift = TransferMap::try_drift(reference, MARGIN).unwrap();
        let (map, _) = element.try_map(reference).unwrap();
        let total = drift.then(&map).then(&drift);
        // Boris's leapfrog misplaces a fringe's kick by an error of order (step/fringe)²
        let step = fringe / 128.0;
        let per_metre = reference.flight_time_per_metre();
        let big = difference(
            &measured(reference, &field, step, exit, 1.0e-3),
            &total,
            per_metre,
        );
        let small = difference(
            &measured(reference, &field, step, exit, 1.0e-4),
            &total,
            per_metre,
        );
        (big, small)
    }

    fn assert_converges(name: &str, (big, small): (f64, f64), bound: f64) {
        println!("{name}: difference {big:.2e} at amplitude 1e-3, {small:.2e} at 1e-4");
        assert!(small < bound, "{name}: {small} at 1e-4 (bound {bound})");
        assert!(
            small < big / 3.0 || small < bound / 10.0,
            "{name}: {big} -> {small} does not shrink"
        );
    }

    fn proton() -> Motion<f64> {
        Motion::try_from_kinetic_energy(Species::PROTON, 20.0e6).unwrap()
    }

    /// Thick magnetic quadrupole: B = G (y, x, 0) inside (hard edge with a 0.2 mm ramp).
    #[test]
    fn quadrupole_map_matches_tracking() {
        let p = proton();
        let (l, g) = (0.2, 4.0);
        let result = straight(
            &p,
            Element::Quadrupole {
                length_m: l,
                gradient_t_per_m: g,
            },
            l,
            FRINGE,
            |r| {
                let s = ramp(r.z, FRINGE).0 * (1.0 - ramp(r.z - l, FRINGE).0);
                ([0.0; 3], [g * s * r.y, g * s * r.x, 0.0])
            },
        );
        assert_converges("quadrupole", result, 2.0e-3);
    }

    /// Electrostatic quadrupole: the potential V (x² − y²)/a², E = −∇φ.
    #[test]
    fn electrostatic_quadrupole_map_matches_tracking() {
        let p = Motion::try_from_kinetic_energy(Species::ALPHA, 200.0e3).unwrap();
        let (l, v, a) = (0.1, 3.0e3, 0.02);
        let element = Element::ElectrostaticQuadrupole {
            length_m: l,
            voltage_v: v,
            aperture_radius_m: a,
        };
        let result = straight(&p, element, l, FRINGE, |r| {
            let s = ramp(r.z, FRINGE).0 * (1.0 - ramp(r.z - l, FRINGE).0);
            let k = 2.0 * v / (a * a) * s;
            ([-k * r.x, k * r.y, 0.0], [0.0; 3])
        });
        assert_converges("electrostatic quadrupole", result, 2.0e-3);
    }

    /// Solenoid: B_z = B inside, with the fringe's radial field B_r = −(r/2) dB_z/dz.
    #[test]
    fn solenoid_map_matches_tracking() {
        let e = Motion::try_from_kinetic_energy(Species::ELECTRON, 1.0e6).unwrap();
        let (l, b) = (0.5, 0.005);
        // a shorter fringe: the hard-edge map differs from a fringe of width w by order K² w L
        let w = FRINGE / 4.0;
        let result = straight(
            &e,
            Element::Solenoid {
                length_m: l,
                field_t: b,
            },
            l,
            w,
            |r| {
                let (s1, d1) = ramp(r.z, w);
                let (s2, d2) = ramp(r.z - l, w);
                let bz = b * s1 * (1.0 - s2);
                let dbz = b * (d1 * (1.0 - s2) - s1 * d2);
                ([0.0; 3], [-r.x / 2.0 * dbz, -r.y / 2.0 * dbz, bz])
            },
        );
        assert_converges("solenoid", result, 2.0e-3);
    }

    /// Drift: no field at all.
    #[test]
    fn drift_map_matches_tracking() {
        let p = Motion::try_from_kinetic_energy(Species::DEUTERON, 5.0e6).unwrap();
        let result = straight(&p, Element::Drift { length_m: 0.5 }, 0.5, FRINGE, |_| {
            ([0.0; 3], [0.0; 3])
        });
        assert_converges("drift", result, 1.0e-3);
    }

    /// Thin gap: a uniform accelerating field E_z = V/g over a short gap g, the map compared with
    /// drift(g/2) · gap · drift(g/2) between the margins.
    #[test]
    fn gap_map_matches_tracking() {
        let p = proton();
        let (g, v) = (1.0e-3, 2.0e6);
        let field = Field(move |r: ThreeVector<f64>| {
            let s =
                ramp(r.z - g / 2.0, g).0 * 0.0 + if (0.0..g).contains(&r.z) { 1.0 } else { 0.0 };
            ([0.0, 0.0, v / g * s], [0.0; 3])
        });
        let exit = ([0.0, g + MARGIN], [0.0, 1.0], [1.0, 0.0]);
        let before = TransferMap::try_drift(&p, MARGIN + g / 2.0).unwrap();
        let (gap, after) = TransferMap::try_gap(&p, v).unwrap();
        let behind = TransferMap::try_drift(&after, MARGIN + g / 2.0).unwrap();
        let total = before.then(&gap).then(&behind);
        let per_metre = p.flight_time_per_metre();
        let big = difference(
            &measured(&p, &field, g / 200.0, exit, 1.0e-3),
            &total,
            per_metre,
        );
        let small = difference(
            &measured(&p, &field, g / 200.0, exit, 1.0e-4),
            &total,
            per_metre,
        );
        // the gap's own length (1 mm against 100 mm of drift) bounds the agreement
        assert_converges("gap", (big, small), 2.0e-2);
    }

    /// Sector dipole with pole faces: B = ∇(y B₀ F(X, Z)), F the wedge between the rotated faces
    /// with 0.2 mm ramps (curl-free; its divergence is of second order in y), B₀ = sign(Q) Bρ θ/L;
    /// the exit plane is normal to the reference's exit direction.
    fn dipole(p: &Motion<f64>, l: f64, theta: f64, e1: f64, e2: f64, bound: f64) {
        let rho = l / theta;
        let b0 = p.species().charge().signum() * p.try_magnetic_rigidity().unwrap() / rho;
        let n1 = [-e1.sin(), e1.cos()];
        let centre = [-rho, 0.0];
        let p2 = [centre[0] + rho * theta.cos(), rho * theta.sin()];
        let n2 = [-(theta - e2).sin(), (theta - e2).cos()];
        let field = Field(move |r: ThreeVector<f64>| {
            let u1 = n1[0] * r.x + n1[1] * r.z;
            let u2 = n2[0] * (p2[0] - r.x) + n2[1] * (p2[1] - r.z);
            let (s1, d1) = ramp(u1, FRINGE);
            let (s2, d2) = ramp(u2, FRINGE);
            let f = s1 * s2;
            let fx = d1 * n1[0] * s2 - s1 * d2 * n2[0];
            let fz = d1 * n1[1] * s2 - s1 * d2 * n2[1];
            ([0.0; 3], [r.y * b0 * fx, b0 * f, r.y * b0 * fz])
        });
        let d = [-theta.sin(), theta.cos()];
        let q = [p2[0] + MARGIN * d[0], p2[1] + MARGIN * d[1]];
        let xh = [theta.cos(), theta.sin()];
        let drift = TransferMap::try_drift(p, MARGIN).unwrap();
        let bend = TransferMap::try_sector_dipole(p, l, theta, e1, e2).unwrap();
        let total = drift.then(&bend).then(&drift);
        let per_metre = p.flight_time_per_metre();
        let step = FRINGE / 128.0;
        let big = difference(
            &measured(p, &field, step, (q, d, xh), 1.0e-3),
            &total,
            per_metre,
        );
        let small = difference(
            &measured(p, &field, step, (q, d, xh), 1.0e-4),
            &total,
            per_metre,
        );
        assert_converges(
            &format!("dipole θ = {theta}, e = {e1}, {e2}"),
            (big, small),
            bound,
        );
    }

    #[test]
    fn sector_dipole_map_matches_tracking() {
        let p = proton();
        dipole(&p, 0.8, 0.4, 0.0, 0.0, 2.0e-3);
        let e = Motion::try_from_kinetic_energy(Species::ELECTRON, 3.0e6).unwrap();
        dipole(&e, 0.5, -0.3, 0.0, 0.0, 2.0e-3);
    }

    #[test]
    fn dipole_pole_faces_match_tracking() {
        let p = proton();
        // the fringe's own length adds a vertical correction of order (fringe/ρ)
        dipole(&p, 0.8, 0.4, 0.2, 0.2, 2.0e-3);
        dipole(&p, 0.6, -0.3, -0.25, 0.15, 2.0e-3);
    }
}

// ---- the line: sub-lines, transport, envelopes, apertures, periodic cells -------------------------

mod line {
    use fourforce::beamline::{Aperture, ApertureVerdict, BeamLine, BeamState, Element, Plane};
    use fourforce::transfer::{Envelope, TransferMap, Twiss};
    use fourforce::{Error, Motion, Species};

    /// An invented 12 MeV deuteron line: a doublet, a bend, a gap, a solenoid, monitors.
    fn line() -> BeamLine<f64, 16> {
        BeamLine::try_from_elements(&[
            Element::Drift { length_m: 0.5 },
            Element::Quadrupole {
                length_m: 0.2,
                gradient_t_per_m: 3.0,
            },
            Element::Drift { length_m: 0.3 },
            Element::Quadrupole {
                length_m: 0.2,
                gradient_t_per_m: -3.0,
            },
            Element::Monitor { id: 1 },
            Element::SectorDipole {
                length_m: 1.0,
                angle_rad: 0.3,
                entry_angle_rad: 0.1,
                exit_angle_rad: 0.1,
            },
            Element::AcceleratingGap { voltage_v: 2.0e6 },
            Element::Drift { length_m: 0.4 },
            Element::Solenoid {
                length_m: 0.3,
                field_t: 0.8,
            },
            Element::ThinQuadrupole {
                integrated_gradient_t: 0.1,
            },
            Element::ElectrostaticQuadrupole {
                length_m: 0.1,
                voltage_v: 5.0e3,
                aperture_radius_m: 0.02,
            },
            Element::Monitor { id: 2 },
        ])
        .unwrap()
    }

    fn deuteron() -> Motion<f64> {
        Motion::try_from_kinetic_energy(Species::DEUTERON, 12.0e6).unwrap()
    }

    fn close(a: &TransferMap<f64>, b: &TransferMap<f64>, tolerance: f64) -> bool {
        let (a, b) = (a.to_array(), b.to_array());
        a.iter()
            .flatten()
            .zip(b.iter().flatten())
            .all(|(x, y)| (x - y).abs() <= tolerance * (1.0 + y.abs()))
    }

    /// The map of 0..j then j..n is the map of the line; energies flow through the gap.
    #[test]
    fn sub_line_maps_compose_to_the_line() {
        let l = line();
        let p = deuteron();
        let (whole, end) = l.try_map(&p).unwrap();
        assert_eq!(end.kinetic_energy(), 14.0e6);
        for j in 0..=l.len() {
            let (head, middle) = l.try_map_of(&p, 0..j).unwrap();
            let (tail, last) = l.try_map_of(&p, j..l.len()).unwrap();
            assert_eq!(last, end);
            assert_eq!(middle.kinetic_energy(), if j > 6 { 14.0e6 } else { 12.0e6 });
            assert!(close(&head.then(&tail), &whole, 4.0 * f64::EPSILON), "{j}");
        }
        #[allow(clippy::reversed_empty_ranges)] // a range that ends before it starts
        let backwards = 3..2;
        assert_eq!(l.try_map_of(&p, backwards).err(), Some(Error::OutOfBounds));
        assert_eq!(l.try_map_of(&p, 0..13).err(), Some(Error::OutOfBounds));
    }

    /// Transporting particles of small amplitude reproduces the map to first order: the
    /// difference divided by the amplitude shrinks with the amplitude (δ = 0 through the bend, whose
    /// field follows the particle; δ ≠ 0 through a line without bend).
    #[test]
    fn state_transport_agrees_with_the_map_to_first_order() {
        let p = deuteron();
        let full = line();
        let no_bend = BeamLine::<f64, 16>::try_from_elements(
            &full
                .elements()
                .iter()
                .copied()
                .filter(|e| !matches!(e, Element::SectorDipole { .. }))
                .collect::<Vec<_>>(),
        )
        .unwrap();
        for (l, deltas) in [(&full, false), (&no_bend, true)] {
            let (map, _) = l.try_map(&p).unwrap();
            let reference = l.try_transport(BeamState::on_axis(p)).unwrap();
            let mut previous = f64::INFINITY;
            for a in [1.0e-3, 1.0e-4, 1.0e-5] {
                let mut worst: f64 = 0.0;
                for j in [0usize, 1, 2, 3, 5] {
                    if j == 5 && !deltas {
                        continue;
                    }
                    let mut v = [0.0; 6];
                    v[j] = a;
                    let motion =
                        Motion::try_from_momentum(p.species(), p.momentum() * (1.0 + v[5]))
                            .unwrap();
                    let start = BeamState::try_new(motion, v[0], v[1], v[2], v[3], 0.0).unwrap();
                    let end = l.try_transport(start).unwrap();
                    let expected = map.apply(v);
                    let got = [
                        end.x(),
                        end.x_slope(),
                        end.y(),
                        end.y_slope(),
                        end.time() - reference.time(),
                    ];
                    for i in 0..4 {
                        worst = worst.max((got[i] - expected[i]).abs() / a);
                    }
                    worst = worst.max((got[4] - expected[4]).abs() / a / p.flight_time_per_metre());
                }
                assert!(
                    worst < previous / 5.0 || worst < 1.0e-9,
                    "{a}: {worst} after {previous}"
                );
                previous = worst;
            }
            assert!(previous < 1.0e-4, "{previous}");
        }
    }

    /// Envelopes: in a drift β(s) = β₀ + s²/β₀ from a waist, the size √(βε + (Dσ_δ)²) with the
    /// dispersion of a bend; adiabatic damping of the emittance by p₀/p₁ through a gap
    /// (Wiedemann, from memory).
    #[test]
    fn envelopes_follow_the_handbook_forms() {
        let p = deuteron();
        let waist = Twiss::try_new(2.0, 0.0).unwrap();
        let beam = Envelope::try_new(waist, waist, [0.0; 4], 4.0e-6, 1.0e-6, 2.0e-3).unwrap();
        let l = BeamLine::<f64, 4>::try_from_elements(&[
            Element::Drift { length_m: 3.0 },
            Element::SectorDipole {
                length_m: 1.0,
                angle_rad: 0.5,
                entry_angle_rad: 0.0,
                exit_angle_rad: 0.0,
            },
            Element::AcceleratingGap { voltage_v: 36.0e6 },
        ])
        .unwrap();
        let steps: Vec<_> = l.envelopes(&p, beam).map(Result::unwrap).collect();
        let (_, after_drift, _) = steps[0];
        let beta = 2.0 + 9.0 / 2.0;
        assert!((after_drift.try_twiss_x().unwrap().beta() - beta).abs() < 1e-14);
        assert!((after_drift.size_x() - (beta * 4.0e-6_f64).sqrt()).abs() < 1e-17);
        let (_, after_bend, _) = steps[1];
        let r16 = 2.0 * (1.0 - 0.5_f64.cos());
        assert!((after_bend.dispersion()[0] - r16).abs() < 1e-15);
        let betatron = after_bend.emittance_x() * after_bend.try_twiss_x().unwrap().beta();
        let size = (betatron + (r16 * 2.0e-3_f64).powi(2)).sqrt();
        assert!((after_bend.size_x() / size - 1.0).abs() < 1e-14);
        let (_, after_gap, reference) = steps[2];
        let damping = p.momentum() / reference.momentum();
        assert!((after_gap.emittance_x() / (4.0e-6 * damping) - 1.0).abs() < 1e-14);
        assert!((after_gap.emittance_y() / (1.0e-6 * damping) - 1.0).abs() < 1e-14);
        // a coupled line: the projected emittances exchange, the 4D beam is kept
        let solenoid = BeamLine::<f64, 2>::try_from_elements(&[Element::Solenoid {
            length_m: 0.5,
            field_t: 2.0,
        }])
        .unwrap();
        let (_, twisted, _) = solenoid.envelopes(&p, beam).next().unwrap().unwrap();
        assert!(twisted.emittance_x() < 4.0e-6 && twisted.emittance_y() > 1.0e-6);
    }

    /// The aperture verdict names the first element and plane where the beam does not fit, fits
    /// with the worst fill otherwise, and follows the energy: the same line at a lower energy
    /// focuses harder (an invented case).
    #[test]
    fn aperture_verdict_names_the_element() {
        let l = BeamLine::<f32, 8>::try_from_elements(&[
            Element::Drift { length_m: 1.0 },
            Element::Quadrupole {
                length_m: 0.2,
                gradient_t_per_m: 2.0,
            },
            Element::Drift { length_m: 2.0 },
            Element::Monitor { id: 7 },
        ])
        .unwrap();
        let waist = Twiss::try_new(1.0, 0.0).unwrap();
        let beam = Envelope::try_new(waist, waist, [0.0; 4], 1.0e-6, 1.0e-6, 1.0e-3).unwrap();
        let pipe = Aperture::try_new(0.01, 0.01).unwrap();
        let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 50.0e6).unwrap();
        match l.check_aperture(&p, beam, &[pipe; 4]) {
            ApertureVerdict::Fits { worst_fill } => assert!(worst_fill > 0.0 && worst_fill < 1.0),
            other => panic!("{other:?}"),
        }
        let tight = Aperture::try_new(1.0, 2.5e-3).unwrap();
        match l.check_aperture(&p, beam, &[pipe, pipe, tight, pipe]) {
            ApertureVerdict::Exceeds {
                element,
                plane,
                size_m,
                aperture_m,
            } => {
                assert_eq!((element, plane, aperture_m), (2, Plane::Vertical, 2.5e-3));
                assert!(size_m > 2.5e-3);
            }
            other => panic!("{other:?}"),
        }
        // at 1 MeV the quadrupole over-focuses in x and the beam grows past the pipe
        let slow = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e6).unwrap();
        let verdict = l.check_aperture(&slow, beam, &[pipe; 4]);
        assert!(
            matches!(verdict, ApertureVerdict::Exceeds { element: 2, .. }),
            "{verdict:?}"
        );
        assert_eq!(
            l.check_aperture(&p, beam, &[pipe; 3]),
            ApertureVerdict::Impossible(Error::OutOfBounds)
        );
    }

    /// The periodic solution of a cell is reproduced after one turn through it; an unstable
    /// cell and a coupled one are typed errors.
    #[test]
    fn periodic_cell_repeats_itself() {
        let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 150.0e6).unwrap();
        let cell = BeamLine::<f64, 8>::try_from_elements(&[
            Element::Quadrupole {
                length_m: 0.1,
                gradient_t_per_m: 8.0,
            },
            Element::Drift { length_m: 1.0 },
            Element::SectorDipole {
                length_m: 1.0,
                angle_rad: 0.2,
                entry_angle_rad: 0.1,
                exit_angle_rad: 0.1,
            },
            Element::Drift { length_m: 0.2 },
            Element::Quadrupole {
                length_m: 0.2,
                gradient_t_per_m: -8.0,
            },
            Element::Drift { length_m: 1.2 },
            Element::Quadrupole {
                length_m: 0.1,
                gradient_t_per_m: 8.0,
            },
        ])
        .unwrap();
        let (map, _) = cell.try_map(&p).unwrap();
        let optics = map.try_periodic().unwrap();
        let start = Envelope::try_lattice(optics.x, optics.y, optics.dispersion).unwrap();
        let (_, end, _) = cell.envelopes(&p, start).last().unwrap().unwrap();
        let (a, b) = (end.try_twiss_x().unwrap(), optics.x);
        assert!((a.beta() / b.beta() - 1.0).abs() < 1e-12 && (a.alpha() - b.alpha()).abs() < 1e-12);
        let (a, b) = (end.try_twiss_y().unwrap(), optics.y);
        assert!((a.beta() / b.beta() - 1.0).abs() < 1e-12 && (a.alpha() - b.alpha()).abs() < 1e-12);
        for (d, e) in end.dispersion().iter().zip(optics.dispersion) {
            assert!((d - e).abs() < 1e-12, "{d} {e}");
        }
        assert!(optics.dispersion[0] > 0.0);
        let strong = BeamLine::<f64, 4>::try_from_elements(&[
            Element::ThinQuadrupole {
                integrated_gradient_t: 20.0,
            },
            Element::Drift { length_m: 2.0 },
            Element::ThinQuadrupole {
                integrated_gradient_t: -20.0,
            },
            Element::Drift { length_m: 2.0 },
        ])
        .unwrap();
        assert_eq!(
            strong.try_map(&p).unwrap().0.try_periodic().err(),
            Some(Error::Unstable)
        );
        let coupled = BeamLine::<f64, 2>::try_from_elements(&[Element::Solenoid {
            length_m: 1.0,
            field_t: 1.0,
        }])
        .unwrap();
        assert_eq!(
            coupled.try_map(&p).unwrap().0.try_periodic().err(),
            Some(Error::Coupled)
        );
    }

    /// f32 against f64 on the invented line: every entry within a few eps of the f32 precision
    /// relative to the entry's row scale (the 50-digit comparison above is the sharper one).
    #[test]
    fn f32_follows_f64() {
        let (m64, _) = line().try_map(&deuteron()).unwrap();
        let elements: Vec<Element<f32>> = line()
            .elements()
            .iter()
            .map(|e| match *e {
                Element::Drift { length_m } => Element::Drift {
                    length_m: length_m as f32,
                },
                Element::Quadrupole {
                    length_m,
                    gradient_t_per_m,
                } => Element::Quadrupole {
                    length_m: length_m as f32,
                    gradient_t_per_m: gradient_t_per_m as f32,
                },
                Element::Monitor { id } => Element::Monitor { id },
                Element::SectorDipole {
                    length_m,
                    angle_rad,
                    entry_angle_rad,
                    exit_angle_rad,
                } => Element::SectorDipole {
                    length_m: length_m as f32,
                    angle_rad: angle_rad as f32,
                    entry_angle_rad: entry_angle_rad as f32,
                    exit_angle_rad: exit_angle_rad as f32,
                },
                Element::AcceleratingGap { voltage_v } => Element::AcceleratingGap {
                    voltage_v: voltage_v as f32,
                },
                Element::Solenoid { length_m, field_t } => Element::Solenoid {
                    length_m: length_m as f32,
                    field_t: field_t as f32,
                },
                Element::ThinQuadrupole {
                    integrated_gradient_t,
                } => Element::ThinQuadrupole {
                    integrated_gradient_t: integrated_gradient_t as f32,
                },
                Element::ElectrostaticQuadrupole {
                    length_m,
                    voltage_v,
                    aperture_radius_m,
                } => Element::ElectrostaticQuadrupole {
                    length_m: length_m as f32,
                    voltage_v: voltage_v as f32,
                    aperture_radius_m: aperture_radius_m as f32,
                },
                other => panic!("{other:?}"),
            })
            .collect();
        let l32 = BeamLine::<f32, 16>::try_from_elements(&elements).unwrap();
        let p32 = Motion::try_from_kinetic_energy(Species::<f32>::DEUTERON, 12.0e6).unwrap();
        let (m32, _) = l32.try_map(&p32).unwrap();
        let (a, b) = (m32.to_array(), m64.to_array());
        let mut worst: f64 = 0.0;
        for (ra, rb) in a.iter().zip(&b) {
            let scale = rb.iter().fold(0.0_f64, |s, x| s.max(x.abs()));
            for (x, y) in ra.iter().zip(rb) {
                worst = worst.max((f64::from(*x) - y).abs() / scale / f64::from(f32::EPSILON));
            }
        }
        println!("f32 against f64: worst {worst:.2} eps of the row scale");
        assert!(worst < 16.0, "{worst}");
    }
}

mod regressions {
    //! Regressions: bugs that fuzzing, the f32 sweep and mutation testing found, each with the
    //! input that exposed it.
    #![allow(clippy::float_cmp)]
    use fourforce::beamline::{BeamLine, Element};
    use fourforce::transfer::{Envelope, TransferMap, Twiss};
    use fourforce::{Error, Motion, Species};

    /// Found by the `transfer` fuzz target: `Twiss::try_new(1.9e-306, 2.7e20)` (f64) was accepted
    /// and its `gamma()` = (1 + α²)/β was infinite. Now refused with `Overflow`.
    #[test]
    fn twiss_whose_gamma_does_not_fit_is_refused() {
        assert_eq!(
            Twiss::try_new(1.923_298_555_634_927e-306_f64, 2.683_425_495_865_023_5e20),
            Err(Error::Overflow)
        );
        assert_eq!(Twiss::try_new(1.0e-40_f32, 0.0), Err(Error::Overflow));
        let t = Twiss::try_new(1.0e-30_f32, 0.0).unwrap();
        assert!(t.gamma().is_finite());
    }

    /// Found by the `transfer` fuzz target: a gap that takes an f32 proton from a subnormal
    /// kinetic energy (1e-40 eV) to 1 MeV gave a map with `R66 = v₀p₀/(v₁p₁) = 0` (underflow): a
    /// singular map, and envelopes divided by it. Now refused with `Overflow`.
    #[test]
    fn gap_whose_delta_factor_underflows_is_refused() {
        let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e-40).unwrap();
        assert_eq!(TransferMap::try_gap(&p, 1.0e6).err(), Some(Error::Overflow));
        let gap = Element::AcceleratingGap { voltage_v: 1.0e6 };
        assert_eq!(gap.try_map(&p).err(), Some(Error::Overflow));
    }

    /// Found by the `transfer` fuzz target: each gap's `R66` fits, their product over a line does
    /// not (f32 proton from 1e-36 eV through five gaps, each factor about 1e-10): the line's map
    /// had `R66 = 0`. Now `try_map` refuses it with `Overflow`.
    #[test]
    fn line_whose_gaps_product_underflows_is_refused() {
        let p = Motion::try_from_kinetic_energy(Species::<f32>::PROTON, 1.0e-36).unwrap();
        let gaps = [1.0e-26_f32, 1.0e-16, 1.0e-6, 1.0e4, 1.0e14]
            .map(|v| Element::AcceleratingGap { voltage_v: v });
        let line = BeamLine::<f32, 6>::try_from_elements(&gaps).unwrap();
        let mut r = p;
        for g in &gaps {
            let (m, after) = g.try_map(&r).unwrap();
            assert!(m.to_array()[5][5] > 0.0, "{g:?}");
            r = after;
        }
        assert_eq!(line.try_map(&p).err(), Some(Error::Overflow));
    }

    /// Found by the `transfer` fuzz target: four gaps of nearly no voltage (the last 6.25e-10 V)
    /// at a 4 MeV proton (f64) gave a map with `R12 = 0` and a trace that rounded just below 2;
    /// `try_periodic` then built `β = R12/sin μ = 0` and was refused with the undocumented
    /// `NonPositiveLength`. `R12 = 0` with `det = 1` means `|trace| ≥ 2`: now `Unstable`.
    #[test]
    fn periodic_cell_with_no_r12_is_unstable() {
        let p = Motion::try_from_kinetic_energy(Species::<f64>::PROTON, 4.0e6).unwrap();
        let gaps = [
            3.45317e-319_f64,
            -3.186_953_085_783_205_6e-219,
            1.840_992_343_711_475_3e-245,
            6.25e-10,
        ]
        .map(|v| Element::AcceleratingGap { voltage_v: v });
        let line = BeamLine::<f64, 4>::try_from_elements(&gaps).unwrap();
        let (m, _) = line.try_map(&p).unwrap();
        let a = m.to_array();
        assert_eq!(a[0][1], 0.0);
        assert_eq!(m.try_periodic().err(), Some(Error::Unstable));
    }

    /// Found writing the `transfer` fuzz target: an envelope whose moments fit but whose size
    /// `√(Σ₁₁ + (D σ_δ)²)` does not (f64, D = 1e300 m, σ_δ = 1e10) had `size_x() = ∞`, and one
    /// whose `Σ₁₁Σ₂₂` does not (β = 1e300 m, α = 1e150, ε = 1e8) read `emittance_x() = 0`
    /// (∞ − ∞ = NaN, clamped). Now both are refused with `Overflow`.
    #[test]
    fn envelope_whose_size_or_emittance_does_not_fit_is_refused() {
        let waist = Twiss::try_new(1.0_f64, 0.0).unwrap();
        assert_eq!(
            Envelope::try_new(waist, waist, [1.0e300, 0.0, 0.0, 0.0], 1.0, 1.0, 1.0e10),
            Err(Error::Overflow)
        );
        let long = Twiss::try_new(1.0e300_f64, 1.0e150).unwrap();
        assert_eq!(
            Envelope::try_new(long, waist, [0.0; 4], 1.0e8, 1.0, 0.0),
            Err(Error::Overflow)
        );
    }
}
