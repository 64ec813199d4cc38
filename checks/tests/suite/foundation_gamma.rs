//! γ from an off-axis velocity (β or m/s) against 50-digit mpmath references.
//!
//! Source of every reference value: `checks/tests/reference/gamma_velocity.csv`, written by
//! `checks/tests/reference/generate_gamma.py` with mpmath at 50 significant digits from the very inputs
//! the library gets (each component exact in the precision; c = 299 792 458 m/s exact, SI 2019).
//! Bound (the doc comments of `FourVector::try_four_velocity`,
//! `FourVector::try_four_velocity_from_velocity` and the `Boost` constructors): γ within 4 eps of
//! the exact value, any direction, up to γ = 10³ in `f32` and 10⁶ in `f64`.

use fourforce::{Boost, FourVector, Real, ThreeVector};

const BOUND_EPS: f64 = 4.0;

struct Row {
    prec: String,
    kind: String,
    bits: [u64; 3],
    gamma_hi: f64,
    gamma_lo: f64,
}

fn rows() -> Vec<Row> {
    let text = include_str!("../reference/gamma_velocity.csv");
    text.lines()
        .skip(1)
        .map(|line| {
            let f: Vec<&str> = line.split(',').collect();
            assert_eq!(f.len(), 7, "malformed line {line}");
            let bits = |s: &str| u64::from_str_radix(s, 16).unwrap();
            Row {
                prec: f[0].to_string(),
                kind: f[1].to_string(),
                bits: [bits(f[2]), bits(f[3]), bits(f[4])],
                gamma_hi: f[5].parse().unwrap(),
                gamma_lo: f[6].parse().unwrap(),
            }
        })
        .collect()
}

/// |got − exact| / exact in eps of `T`, measured in f64 with the reference's two parts.
fn err_eps<T: Real>(got: T, row: &Row) -> f64 {
    let d = (got.to_f64() - row.gamma_hi) - row.gamma_lo;
    (d / row.gamma_hi).abs() / T::EPSILON.to_f64()
}

/// Worst error in eps of every γ-from-velocity constructor over the rows of precision `T`.
fn worst<T: Real>(prec: &str, from_bits: impl Fn(u64) -> T) -> Vec<(String, f64, f64)> {
    let mut out: Vec<(String, f64, f64)> = Vec::new();
    let mut note = |name: &str, e: f64, g: f64| match out.iter_mut().find(|(n, _, _)| n == name) {
        Some(w) if e > w.1 => {
            w.1 = e;
            w.2 = g;
        }
        Some(_) => {}
        None => out.push((name.to_string(), e, g)),
    };
    let mut count = 0;
    for row in rows().iter().filter(|r| r.prec == prec) {
        count += 1;
        let [x, y, z] = row.bits.map(&from_bits);
        let v = ThreeVector::new(x, y, z);
        let g = row.gamma_hi;
        match row.kind.as_str() {
            "beta" => {
                let u = FourVector::try_four_velocity(v).unwrap();
                note("FourVector::try_four_velocity", err_eps(u.time, row), g);
                let b = Boost::try_from_beta(v).unwrap();
                note("Boost::try_from_beta", err_eps(b.gamma(), row), g);
            }
            "velocity" => {
                let u = FourVector::try_four_velocity_from_velocity(v).unwrap();
                note(
                    "FourVector::try_four_velocity_from_velocity",
                    err_eps(u.time, row),
                    g,
                );
                let b = Boost::try_from_velocity(v).unwrap();
                note("Boost::try_from_velocity", err_eps(b.gamma(), row), g);
            }
            "speed" => {
                let b = Boost::try_from_speed(ThreeVector::new(T::ONE, y, z), x).unwrap();
                note("Boost::try_from_speed", err_eps(b.gamma(), row), g);
            }
            k => panic!("unknown kind {k}"),
        }
    }
    assert!(count > 1000, "only {count} {prec} rows");
    out
}

fn check(prec: &str, worst: Vec<(String, f64, f64)>) {
    assert_eq!(worst.len(), 5, "every constructor is measured");
    for (name, e, g) in worst {
        println!("{prec} {name}: worst {e:.2} eps (at gamma {g:.4e}), bound {BOUND_EPS}");
        assert!(e <= BOUND_EPS, "{prec} {name}: {e} eps at gamma {g}");
    }
}

#[test]
fn gamma_of_off_axis_velocities_within_4_eps_f32() {
    // Reference: mpmath, 50 digits (checks/tests/reference/gamma_velocity.csv), γ up to 10³.
    check("f32", worst::<f32>("f32", |b| f32::from_bits(b as u32)));
}

#[test]
fn gamma_of_off_axis_velocities_within_4_eps_f64() {
    // Reference: mpmath, 50 digits (checks/tests/reference/gamma_velocity.csv), γ up to 10⁶.
    check("f64", worst::<f64>("f64", f64::from_bits));
}
