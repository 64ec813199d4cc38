//! Shared by the kinematics tests and benchmark: the mpmath reference files, exact error
//! measurement, and the naive textbook formulas we compare against.
#![allow(dead_code, clippy::unwrap_used)]

pub mod naive;

use fourforce::{Motion, Real, Species, optics};

/// The quantities of the reference files, in their column order.
pub const QUANTITIES: [&str; 13] = [
    "gamma",
    "gamma_minus_1",
    "beta",
    "one_minus_beta",
    "beta_gamma",
    "pc_eV",
    "total_eV",
    "brho_Tm",
    "erho_V",
    "v_m_per_s",
    "tof_s_per_m",
    "cyclotron_Hz_per_T",
    "p_kg_m_per_s",
];

/// A 50-digit reference value held as the unevaluated sum `hi + lo` of two f64, so that an f64
/// result can be measured against it to far below one ulp.
#[derive(Clone, Copy, Debug)]
pub struct Exact {
    pub hi: f64,
    pub lo: f64,
}

/// (integer mantissa, power of ten) of a decimal like `-1.2345e-6`; `None` if malformed.
fn decimal(s: &str) -> Option<(i128, i32)> {
    let (mant, exp) = match s.find(['e', 'E']) {
        Some(i) => (&s[..i], s[i + 1..].parse::<i32>().ok()?),
        None => (s, 0),
    };
    let (neg, mant) = match mant.strip_prefix('-') {
        Some(m) => (true, m),
        None => (false, mant.strip_prefix('+').unwrap_or(mant)),
    };
    let (int, frac) = mant.split_once('.').unwrap_or((mant, ""));
    let digits = format!("{int}{frac}");
    let digits = digits.trim_start_matches('0');
    let m: i128 = if digits.is_empty() {
        0
    } else {
        digits.parse().ok()?
    };
    Some((if neg { -m } else { m }, exp - frac.len() as i32))
}

impl Exact {
    /// Parses a decimal of up to about 25 significant digits exactly into `hi + lo`.
    pub fn parse(s: &str) -> Self {
        let hi: f64 = s.parse().unwrap();
        if !hi.is_finite() || hi == 0.0 {
            return Self { hi, lo: 0.0 };
        }
        // hi to 31 significant digits (Rust prints floats exactly rounded), then the decimal
        // difference s - hi in integers.
        let (a, ea) = decimal(s).unwrap();
        let (b, eb) = decimal(&format!("{hi:.30e}")).unwrap();
        let e = ea.min(eb);
        let scale = |m: i128, from: i32| m * 10_i128.pow((from - e) as u32);
        let diff = scale(a, ea) - scale(b, eb);
        let lo: f64 = format!("{diff}e{e}").parse().unwrap();
        Self { hi, lo }
    }

    /// Relative error of `got` in units of the epsilon of `T`.
    pub fn eps_error<T: Real>(self, got: T) -> f64 {
        let g = got.to_f64();
        if g == self.hi && self.lo == 0.0 {
            return 0.0;
        }
        (((g - self.hi) - self.lo) / self.hi).abs() / T::EPSILON.to_f64()
    }
}

/// A species by the name used in the reference files and the table tool.
pub fn species<T: Real>(name: &str, rest_energy_ev: &str) -> Species<T> {
    match name {
        "electron" => Species::ELECTRON,
        "positron" => Species::POSITRON,
        "proton" => Species::PROTON,
        "antiproton" => Species::ANTIPROTON,
        "muon" => Species::MUON,
        "antimuon" => Species::ANTIMUON,
        "deuteron" => Species::DEUTERON,
        "triton" => Species::TRITON,
        "helion" => Species::HELION,
        "alpha" => Species::ALPHA,
        custom => {
            let charge: i32 = custom.rsplit(':').next().unwrap().parse().unwrap();
            Species::try_new(parse::<T>(rest_energy_ev), T::from_i32(charge)).unwrap()
        }
    }
}

/// Parses a decimal straight into `T` (correctly rounded once, no detour through the other
/// precision).
pub fn parse<T: Real>(s: &str) -> T {
    if T::MANTISSA_DIGITS == 24 {
        T::from_f64(f64::from(s.parse::<f32>().unwrap()))
    } else {
        T::from_f64(s.parse::<f64>().unwrap())
    }
}

/// The 13 quantities of a state, in [`QUANTITIES`] order.
pub fn read<T: Real>(m: &Motion<T>) -> [T; 13] {
    [
        m.gamma(),
        m.gamma_minus_one(),
        m.beta(),
        m.one_minus_beta(),
        m.beta_gamma(),
        m.momentum(),
        m.total_energy(),
        m.try_magnetic_rigidity().unwrap(),
        m.try_electric_rigidity().unwrap(),
        m.speed(),
        m.flight_time_per_metre(),
        optics::try_revolution_frequency(m, T::ONE).unwrap(),
        m.momentum_si(),
    ]
}

/// One row of kinematics_forward.csv.
pub struct Forward {
    pub species: String,
    pub rest_energy_ev: String,
    pub kinetic_ev: String,
    pub values: Vec<Exact>,
}

/// One row of kinematics_inverse.csv.
pub struct Inverse {
    pub from: String,
    pub prec: String,
    pub species: String,
    pub rest_energy_ev: String,
    pub input: String,
    pub kinetic_ev: Exact,
    pub values: Vec<Exact>,
}

fn lines(file: &str) -> Vec<Vec<String>> {
    let path = format!("{}/tests/reference/{file}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap();
    text.lines()
        .skip(1)
        .filter(|l| !l.is_empty())
        .map(|l| l.split(',').map(str::to_owned).collect())
        .collect()
}

pub fn forward() -> Vec<Forward> {
    lines("kinematics_forward.csv")
        .into_iter()
        .map(|r| Forward {
            species: r[0].clone(),
            rest_energy_ev: r[1].clone(),
            kinetic_ev: r[2].clone(),
            values: r[3..].iter().map(|s| Exact::parse(s)).collect(),
        })
        .collect()
}

pub fn inverse() -> Vec<Inverse> {
    lines("kinematics_inverse.csv")
        .into_iter()
        .map(|r| Inverse {
            from: r[0].clone(),
            prec: r[1].clone(),
            species: r[2].clone(),
            rest_energy_ev: r[3].clone(),
            input: r[4].clone(),
            kinetic_ev: Exact::parse(&r[5]),
            values: r[6..].iter().map(|s| Exact::parse(s)).collect(),
        })
        .collect()
}

/// Flight-time rows are over this length, in metres (exact in both precisions).
pub const TOF_LENGTH: f64 = 2.5;

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exact_parse_keeps_the_digits_f64_drops() {
        // 0.1 is 0.1000000000000000055511151231257827 in binary64: lo = -5.55e-18.
        let x = Exact::parse("1.0000000000000000000e-1");
        assert_eq!(x.hi, 0.1);
        assert!((x.lo + 5.551_115_123_125_783e-18).abs() < 1e-30);
        // An error of exactly one eps64 relative is measured as 1.
        let y = Exact::parse("1.0000000000000000000");
        assert_eq!(y.lo, 0.0);
        assert!((y.eps_error(1.0 + f64::EPSILON) - 1.0).abs() < 1e-12);
        assert_eq!(decimal("-12.5e3"), Some((-125, 2)));
    }
}
