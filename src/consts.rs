//! Physical constants, CODATA 2018, in one place.
//!
//! Every value here is an `f64` copied digit for digit from its source. The same values, rounded
//! once to the working precision, are the associated constants of [`Real`](crate::Real)
//! (`<f32 as Real>::SPEED_OF_LIGHT` and so on), which the rest of the crate uses.
//!
//! Sources:
//! - exact by the definition of the SI (26th CGPM, 2018; in force since 20 May 2019): `c`, `e`;
//! - CODATA 2018 recommended values (E. Tiesinga, P. J. Mohr, D. B. Newell, B. N. Taylor,
//!   Rev. Mod. Phys. 93, 025010 (2021)): every particle rest energy and the atomic mass constant.
//!
//! Masses are held as rest energies `m c²` in eV, taken from the published MeV values; the
//! published kg values agree with them only to their printed digits (up to 2.6e-11 relative), so
//! the crate uses one of the two, the rest energies, throughout.
//!
//! # Examples
//! ```
//! use fourforce::consts;
//! assert_eq!(consts::SPEED_OF_LIGHT, 299_792_458.0);
//! assert_eq!(consts::ELECTRON_REST_ENERGY, 510_998.95);
//! ```

/// Speed of light in vacuum `c` in m/s; exact (SI 2019).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::SPEED_OF_LIGHT, 299_792_458.0);
/// ```
pub const SPEED_OF_LIGHT: f64 = 299_792_458.0;
/// Elementary charge `e` in C; exact (SI 2019).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::ELEMENTARY_CHARGE, 1.602_176_634e-19);
/// ```
pub const ELEMENTARY_CHARGE: f64 = 1.602_176_634e-19;
/// Electron rest energy `mₑc²` in eV (CODATA 2018: 0.510 998 950 00 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::ELECTRON_REST_ENERGY, 0.510_998_950_00e6);
/// ```
pub const ELECTRON_REST_ENERGY: f64 = 510_998.95;
/// Proton rest energy `mₚc²` in eV (CODATA 2018: 938.272 088 16 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::PROTON_REST_ENERGY, 938.272_088_16e6);
/// ```
pub const PROTON_REST_ENERGY: f64 = 938_272_088.16;
/// Neutron rest energy `mₙc²` in eV (CODATA 2018: 939.565 420 52 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::NEUTRON_REST_ENERGY, 939.565_420_52e6);
/// ```
pub const NEUTRON_REST_ENERGY: f64 = 939_565_420.52;
/// Muon rest energy `m_μc²` in eV (CODATA 2018: 105.658 3755 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::MUON_REST_ENERGY, 105.658_375_5e6);
/// ```
pub const MUON_REST_ENERGY: f64 = 105_658_375.5;
/// Deuteron rest energy `m_dc²` in eV (CODATA 2018: 1875.612 942 57 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::DEUTERON_REST_ENERGY, 1875.612_942_57e6);
/// ```
pub const DEUTERON_REST_ENERGY: f64 = 1_875_612_942.57;
/// Triton rest energy `m_tc²` in eV (CODATA 2018: 2808.921 132 98 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::TRITON_REST_ENERGY, 2808.921_132_98e6);
/// ```
pub const TRITON_REST_ENERGY: f64 = 2_808_921_132.98;
/// Helion (³He nucleus) rest energy `m_hc²` in eV (CODATA 2018: 2808.391 607 43 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::HELION_REST_ENERGY, 2808.391_607_43e6);
/// ```
pub const HELION_REST_ENERGY: f64 = 2_808_391_607.43;
/// Alpha-particle rest energy `m_αc²` in eV (CODATA 2018: 3727.379 4066 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::ALPHA_REST_ENERGY, 3727.379_406_6e6);
/// ```
pub const ALPHA_REST_ENERGY: f64 = 3_727_379_406.6;
/// Atomic mass constant energy equivalent `m_u c²` in eV (CODATA 2018: 931.494 102 42 MeV).
///
/// # Examples
/// ```
/// assert_eq!(fourforce::consts::ATOMIC_MASS_UNIT_ENERGY, 931.494_102_42e6);
/// ```
pub const ATOMIC_MASS_UNIT_ENERGY: f64 = 931_494_102.42;
/// Electron relative atomic mass `A_r(e)` in u (CODATA 2018: 5.485 799 090 65 × 10⁻⁴).
///
/// # Examples
/// ```
/// use fourforce::consts::{ATOMIC_MASS_UNIT_ENERGY, ELECTRON_REST_ENERGY, ELECTRON_RELATIVE_MASS};
/// // A_r(e) m_u c^2 is the electron's rest energy to the printed digits (CODATA 2018).
/// assert!((ELECTRON_RELATIVE_MASS * ATOMIC_MASS_UNIT_ENERGY / ELECTRON_REST_ENERGY - 1.0).abs() < 1e-12);
/// ```
pub const ELECTRON_RELATIVE_MASS: f64 = 5.485_799_090_65e-4;

/// Speed of light split into two parts exactly representable in `f32`, `c = C_F32_HI + C_F32_LO`.
///
/// `c` itself rounds to 299 792 448 m/s in `f32`, 10 m/s off; code that takes a speed in m/s
/// near `c` uses the pair instead (see the kinematics module).
///
/// # Examples
/// ```
/// use fourforce::consts::{C_F32_HI, C_F32_LO, SPEED_OF_LIGHT};
/// assert_eq!(C_F32_HI as f64 + C_F32_LO as f64, SPEED_OF_LIGHT);
/// ```
pub const C_F32_HI: f32 = 299_792_448.0;
/// The low part of `c` for `f32`: `c - C_F32_HI = 10` m/s, exact.
///
/// # Examples
/// ```
/// use fourforce::consts::{C_F32_HI, C_F32_LO, SPEED_OF_LIGHT};
/// assert_eq!((SPEED_OF_LIGHT - f64::from(C_F32_HI)) as f32, C_F32_LO);
/// ```
pub const C_F32_LO: f32 = 10.0;
