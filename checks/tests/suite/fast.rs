//! The micromath fast path (`fourforce::fast`, feature `micromath`) against `f64`: its documented,
//! looser bounds hold over a dense sweep, its errors go the documented way, and its edges.
//!
//! Reference: the same closed forms evaluated in `f64` (`pc = √(T (T + 2m))`, `β = pc / (T + m)`,
//! `Bρ = pc / (c Q)`, `t = L / (β c)`; Jackson 3rd ed. §11.5 and §12.1, from memory) from the
//! same `f32` inputs widened exactly. Their own error (about 1e-15) is 1e12 times below the
//! bounds tested here.
#![cfg(feature = "micromath")]
#![allow(clippy::float_cmp, clippy::unwrap_used)]

// FAST: the bound documented in `src/fast.rs`, relative (1.74e-3 = 14 600 eps of f32).
use crate::tolerance::{C, FAST, rel_signed};
use fourforce::{Error, Species, fast};

fn species() -> [Species<f32>; 10] {
    [
        Species::ELECTRON,
        Species::POSITRON,
        Species::PROTON,
        Species::ANTIPROTON,
        Species::MUON,
        Species::ANTIMUON,
        Species::DEUTERON,
        Species::TRITON,
        Species::HELION,
        Species::ALPHA,
    ]
}

/// Kinetic energies from 1 meV to 1 PeV, 200 per decade.
fn energies() -> impl Iterator<Item = f32> {
    (-600..=3600).map(|i| 10f64.powf(f64::from(i) / 200.0) as f32)
}

#[test]
fn sqrt_is_high_by_at_most_the_bound_over_every_significand() {
    // The estimate and the Newton step scale exactly with powers of four, so [1, 4) covers
    // every normal input; every 5th significand of it.
    let (lo, hi) = (1.0f32.to_bits(), 4.0f32.to_bits());
    let mut worst = 0.0f64;
    for bits in (lo..hi).step_by(5) {
        let x = f32::from_bits(bits);
        let e = rel_signed(fast::sqrt(x), f64::from(x).sqrt());
        // High, apart from the last rounding of the Newton step near exact roots.
        assert!(
            e >= -f64::from(f32::EPSILON),
            "sqrt({x}) below the root by {e}"
        );
        worst = worst.max(e);
    }
    assert!(worst <= FAST, "worst {worst}");
    // The bound is tight, not loose: the theory gives 1.7346e-3 at the worst significand.
    assert!(worst > 1.7e-3, "worst {worst}");
}

#[test]
fn sqrt_edges() {
    assert_eq!(fast::sqrt(0.0), 0.0);
    assert_eq!(fast::sqrt(1.0), 1.0);
    assert_eq!(fast::sqrt(4.0), 2.0);
    assert!(fast::sqrt(-1.0).is_nan());
    assert!(fast::sqrt(f32::NAN).is_nan());
    assert_eq!(fast::sqrt(f32::INFINITY), f32::INFINITY);
    let big = fast::sqrt(f32::MAX);
    assert!(rel_signed(big, f64::from(f32::MAX).sqrt()).abs() <= FAST);
    // Below 1 the result stays at or below 1 (so β ≤ 1).
    for bits in (0.5f32.to_bits()..1.0f32.to_bits()).step_by(3) {
        assert!(fast::sqrt(f32::from_bits(bits)) <= 1.0);
    }
}

#[test]
fn kinematics_within_the_documented_bounds_over_species_and_energies() {
    let mut worst = [0.0f64; 5];
    for s in species() {
        let m = f64::from(s.rest_energy());
        let q = f64::from(s.charge()).abs();
        for t32 in energies() {
            let t = f64::from(t32);
            let pc = (t * (t + 2.0 * m)).sqrt();
            let beta = pc / (t + m);
            let length = 1.5f32;
            let got = [
                rel_signed(fast::try_momentum(s, t32).unwrap(), pc),
                rel_signed(fast::try_beta(s, t32).unwrap(), beta),
                rel_signed(fast::try_speed(s, t32).unwrap(), beta * C),
                rel_signed(fast::try_magnetic_rigidity(s, t32).unwrap(), pc / (C * q)),
                -rel_signed(
                    fast::try_flight_time(s, t32, length).unwrap(),
                    f64::from(length) / (beta * C),
                ),
            ];
            for (w, e) in worst.iter_mut().zip(got) {
                assert!(e > -1.0e-6, "{s:?} T = {t32}: error {e} on the wrong side");
                *w = w.max(e.abs());
            }
            assert!(fast::try_beta(s, t32).unwrap() <= 1.0);
        }
    }
    for (name, w) in ["pc", "beta", "v", "B rho", "flight time"]
        .iter()
        .zip(worst)
    {
        assert!(w <= FAST, "{name}: worst {w}");
    }
}

#[test]
fn errors_at_the_edges() {
    let p = Species::<f32>::PROTON;
    assert_eq!(fast::try_momentum(p, 0.0), Ok(0.0));
    assert_eq!(fast::try_beta(p, 0.0), Ok(0.0));
    assert_eq!(fast::try_speed(p, 0.0), Ok(0.0));
    assert_eq!(fast::try_magnetic_rigidity(p, 0.0), Ok(0.0));
    assert_eq!(fast::try_flight_time(p, 0.0, 1.0), Err(Error::Overflow));
    assert_eq!(fast::try_beta(p, -1.0), Err(Error::NegativeEnergy));
    assert_eq!(fast::try_beta(p, f32::NAN), Err(Error::NonFinite));
    assert_eq!(fast::try_momentum(p, f32::INFINITY), Err(Error::NonFinite));
    assert_eq!(fast::try_momentum(p, 1.0e30), Err(Error::Overflow));
    assert_eq!(
        fast::try_flight_time(p, 1.0e6, 0.0),
        Err(Error::NonPositiveLength)
    );
    assert_eq!(
        fast::try_flight_time(p, 1.0e6, f32::NAN),
        Err(Error::NonFinite)
    );
    assert_eq!(
        fast::try_magnetic_rigidity(Species::NEUTRON, 1.0e6),
        Err(Error::ZeroCharge)
    );
    // Far above the rest energy β rounds to 1 and the flight time to light's, never below it.
    let e = Species::<f32>::ELECTRON;
    assert_eq!(fast::try_beta(e, 1.0e15), Ok(1.0));
    let t = fast::try_flight_time(e, 1.0e15, 1.0).unwrap();
    assert!(f64::from(t) >= 1.0 / C * (1.0 - 1e-7));
}
