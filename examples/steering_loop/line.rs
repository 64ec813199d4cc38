//! The invented line and its steering loop, shared by the demo (host, `f32` and `f64`) and the
//! firmware binary `orbit` (Cortex-M4F, `f32`; `build.rs` runs it in `f64` for the reference).
//! `no_std`, no heap: everything here runs on the chip.
//!
//! *The Harlow Brink 70 MeV proton transfer line* (all of it invented): eight cells of 2.4 m,
//! each a thin focusing quadrupole, 0.4 m, a horizontal corrector (cells 0 to 5), 0.2 m, a
//! vertical corrector (cells 0 to 5), 0.6 m, a thin defocusing quadrupole, 0.6 m, a position
//! monitor, 0.6 m. The quadrupoles' integrated gradients (±1.02 T) give about 60° of phase
//! advance per cell at 70 MeV. 8 monitors, 6 correctors per plane.
//!
//! The run: the beam enters 1.5 mm / 0.4 mrad off horizontally and −1.0 mm / 0.3 mrad
//! vertically; the real quadrupoles are 3 % stronger than the model. At iteration
//! [`SHIFT_AT`] the entry angle jumps by 1.0 mrad (an upstream supply drifts), which drives
//! corrector H0 to its end stop, and monitor [`STUCK_MONITOR`]'s reading freezes. At
//! [`ENERGY_AT`] the energy steps from 70 to 74 MeV: the response is rebuilt at the new energy
//! and every set point rescaled.
#![allow(dead_code)]

use fourforce::beamline::KickDirection;
use fourforce::orbit::{
    Calibration, Corrector, Kick, Monitor, Orbit, Outcome, Place, Response, Tuning,
};
use fourforce::transfer::TransferMap;
use fourforce::{Error, Motion, Real, Species};

pub const MONITORS: usize = 8;
pub const PER_PLANE: usize = 6;
pub const CORRECTORS: usize = 2 * PER_PLANE;
pub const CELLS: usize = 8;
pub const CELL_M: f64 = 2.4;
pub const NOMINAL_EV: f64 = 70.0e6;
pub const STEPPED_EV: f64 = 74.0e6;
pub const ITERATIONS: usize = 48;
pub const SHIFT_AT: usize = 12;
pub const STUCK_MONITOR: usize = 4;
pub const ENERGY_AT: usize = 28;
/// Integrated gradient of every quadrupole in T (focusing; the defocusing ones are the negative).
const QUAD_T: f64 = 1.02;
pub const GAIN: f64 = 0.5;
pub const ALPHA: f64 = 0.1;
pub const CUTOFF: f64 = 0.01;
/// The real quadrupoles relative to the model.
const QUAD_ERROR: f64 = 1.03;
/// Entry state (x, x', y, y') before and after the shift.
const ENTRY: [f64; 4] = [1.5e-3, 0.4e-3, -1.0e-3, 0.3e-3];
const SHIFTED_ENTRY: [f64; 4] = [1.5e-3, 1.4e-3, -1.0e-3, 0.3e-3];

/// A place of the line with the map that leads to it, or why it could not be built.
type Step<T> = Result<(TransferMap<T>, Place<T>), Error>;

/// Monitor `i` sits at s = 2.4 i + 1.8 m.
pub fn monitor_s_m(i: usize) -> f64 {
    CELL_M * i as f64 + 1.8
}

/// The places of the line in beam order with the map from the place before (or the entry) to
/// each, computed as the iterator goes (nothing stored), on the reference `motion`, quadrupoles
/// scaled by `quad_scale`.
pub struct Places<T: Real> {
    motion: Motion<T>,
    gl: T,
    next: usize,
}

impl<T: Real> Places<T> {
    pub fn new(motion: Motion<T>, quad_scale: T) -> Self {
        Self {
            motion,
            gl: T::from_f64(QUAD_T) * quad_scale,
            next: 0,
        }
    }

    fn drift(&self, length_m: T) -> Result<TransferMap<T>, Error> {
        TransferMap::try_drift(&self.motion, length_m)
    }

    fn quad(&self, sign: T) -> Result<TransferMap<T>, Error> {
        TransferMap::try_thin_quadrupole(&self.motion, sign * self.gl)
    }

    fn corrector(&self, index: usize, direction: KickDirection<T>) -> Place<T> {
        Place::Corrector {
            index,
            kick: Kick::Magnetic,
            direction,
            motion: self.motion,
        }
    }

    /// The place `k` of the sequence: three per cell with correctors (H, V, monitor), one per
    /// cell without.
    fn place(&self, k: usize) -> Option<Step<T>> {
        let corrected = 3 * PER_PLANE;
        let (cell, part) = if k < corrected {
            (k / 3, k % 3)
        } else if k < corrected + (CELLS - PER_PLANE) {
            (PER_PLANE + k - corrected, 3)
        } else {
            return None;
        };
        // (quadrupole sign, or 0 for a drift of the length in dm) in beam order; the 0.6 m after
        // the previous cell's monitor comes first (integers: no run-time conversion of an f64)
        let tail = if cell == 0 { 0 } else { 6 };
        let (parts, place): (&[(i8, u8)], Place<T>) = match part {
            0 => (
                &[(0, tail), (1, 0), (0, 4)],
                self.corrector(cell, KickDirection::Horizontal),
            ),
            1 => (
                &[(0, 2)],
                self.corrector(PER_PLANE + cell, KickDirection::Vertical),
            ),
            2 => (&[(0, 6), (-1, 0), (0, 6)], Place::Monitor(cell)),
            _ => (
                &[(0, tail), (1, 0), (0, 12), (-1, 0), (0, 6)],
                Place::Monitor(cell),
            ),
        };
        Some(self.compose(parts).map(|m| (m, place)))
    }

    /// The map of quadrupoles (sign ±1) and drifts (sign 0, length in dm) in order, one at a
    /// time.
    fn compose(&self, parts: &[(i8, u8)]) -> Result<TransferMap<T>, Error> {
        let mut map = TransferMap::IDENTITY;
        for &(sign, dm) in parts {
            let next = match sign {
                0 if dm == 0 => continue,
                0 => self.drift(T::from_u32(u32::from(dm)) / T::from_u32(10))?,
                1 => self.quad(T::ONE)?,
                _ => self.quad(T::NEG_ONE)?,
            };
            map = map.then(&next);
        }
        Ok(map)
    }
}

impl<T: Real> Iterator for Places<T> {
    type Item = Step<T>;
    fn next(&mut self) -> Option<Step<T>> {
        let p = self.place(self.next)?;
        self.next += 1;
        Some(p)
    }
}

/// Loads the line's response at `kinetic_ev` into `orbit` (in place), rescaling `settings` when
/// a response was loaded before; returns the set points held at a limit.
pub fn try_load<T: Real>(
    orbit: &mut Orbit<T, MONITORS, CORRECTORS>,
    kinetic_ev: T,
    settings: &mut [T; CORRECTORS],
) -> Result<u32, Error> {
    let motion = Motion::try_from_kinetic_energy(Species::PROTON, kinetic_ev)?;
    let mut error = None;
    let held = orbit.try_set_places(
        Places::new(motion, T::ONE).map_while(|p| match p {
            Ok(p) => Some(p),
            Err(e) => {
                error = Some(e);
                None
            }
        }),
        settings,
    );
    match error {
        Some(e) => Err(e),
        None => held,
    }
}

/// The response of the line at `kinetic_ev`, quadrupoles scaled by `quad_scale`.
pub fn try_response<T: Real>(
    kinetic_ev: T,
    quad_scale: T,
) -> Result<Response<T, MONITORS, CORRECTORS>, Error> {
    let motion = Motion::try_from_kinetic_energy(Species::PROTON, kinetic_ev)?;
    let mut error = None;
    let r = Response::try_from_places(Places::new(motion, quad_scale).map_while(|p| match p {
        Ok(p) => Some(p),
        Err(e) => {
            error = Some(e);
            None
        }
    }));
    match error {
        Some(e) => Err(e),
        None => r,
    }
}

/// The offsets at the monitors of a beam entering with `entry` = (x, x', y, y') and every
/// corrector at zero.
pub fn try_free_orbit<T: Real>(
    kinetic_ev: T,
    quad_scale: T,
    entry: [T; 4],
) -> Result<[[T; 2]; MONITORS], Error> {
    let motion = Motion::try_from_kinetic_energy(Species::PROTON, kinetic_ev)?;
    let mut v = [entry[0], entry[1], entry[2], entry[3], T::ZERO, T::ZERO];
    let mut out = [[T::ZERO; 2]; MONITORS];
    for p in Places::new(motion, quad_scale) {
        let (map, place) = p?;
        v = map.apply(v);
        if let Some(o) = match place {
            Place::Monitor(i) => out.get_mut(i),
            Place::Corrector { .. } => None,
        } {
            *o = [v[0], v[2]];
        }
    }
    Ok(out)
}

/// Every corrector's calibration (invented): ∫B dl in T m against the supply current in A,
/// straight to 8 A, saturating beyond.
pub fn try_calibration<T: Real>() -> Result<Calibration<T, 7>, Error> {
    // (element by element: each conversion folds at compile time, no software double on a chip)
    let f = T::from_f64;
    let a = [f(-10.0), f(-8.0), f(-4.0), f(0.0), f(4.0), f(8.0), f(10.0)];
    let tm = [
        f(-2.2e-3),
        f(-1.9e-3),
        f(-0.95e-3),
        f(0.0),
        f(0.95e-3),
        f(1.9e-3),
        f(2.2e-3),
    ];
    Calibration::try_new(a, tm)
}

/// Sets up the loop in place (nothing of its size on the stack): monitors trusted to ±10 mm,
/// resolving 1 µm (an invented figure for the demo's monitors), weight 1 each; correctors over the calibrated range, at most 0.25 mT m per iteration (H0 is
/// a short corrector with half the range); gain 0.5, α = 0.1 (the first monitors see one
/// corrector each: without it the solution follows the weak modes), cutoff 0.01; the response
/// at the nominal energy from the line's maps.
pub fn try_setup<T: Real>(orbit: &mut Orbit<T, MONITORS, CORRECTORS>) -> Result<(), Error> {
    let (lo, hi) = try_calibration::<T>()?.setting_range();
    let step = T::from_f64(0.25e-3);
    let mut correctors = [Corrector::try_new(lo, hi, step)?; CORRECTORS];
    correctors[0] = Corrector::try_new(lo * T::HALF, hi * T::HALF, step)?;
    let monitor = Monitor::try_new(T::from_f64(10.0e-3), T::from_f64(1.0e-6), T::ONE)?;
    let tuning = Tuning::try_new(T::from_f64(GAIN), T::from_f64(ALPHA), T::from_f64(CUTOFF))?;
    orbit.try_configure([monitor; MONITORS], correctors, tuning)?;
    try_load(orbit, T::from_f64(NOMINAL_EV), &mut [T::ZERO; CORRECTORS])?;
    Ok(())
}

/// The three phases of the run: the start, after the shift of the entry angle, after the
/// energy step.
pub const PHASES: usize = 3;

/// The phase of iteration `i`.
pub fn phase(i: usize) -> usize {
    usize::from(i >= SHIFT_AT) + usize::from(i >= ENERGY_AT)
}

/// The beam's energy in phase `phase`, eV.
pub fn kinetic_ev(phase: usize) -> f64 {
    if phase >= 2 { STEPPED_EV } else { NOMINAL_EV }
}

/// The simulated machine: the true offsets at the monitors for given settings.
pub trait Plant<T: Real> {
    /// The machine in phase `phase`.
    fn try_set_phase(&mut self, phase: usize) -> Result<(), Error>;
    /// The true offsets at the monitors (m) for the settings `settings`.
    fn orbit(&self, settings: &[T; CORRECTORS]) -> [[T; 2]; MONITORS];
}

/// The real line computed from its maps: quadrupoles 3 % off the model.
pub struct Machine<T: Real> {
    truth: Response<T, MONITORS, CORRECTORS>,
    free: [[T; 2]; MONITORS],
}

impl<T: Real> Machine<T> {
    pub fn try_new() -> Result<Self, Error> {
        let mut m = Self {
            truth: Response::try_new([[[T::ZERO; MONITORS]; 2]; CORRECTORS], [T::ONE; CORRECTORS])?,
            free: [[T::ZERO; 2]; MONITORS],
        };
        m.try_set_phase(0)?;
        Ok(m)
    }

    /// The truth as a table: reading per setting `[j][p][i]` (m per T m) and the free orbit.
    pub fn table(&self) -> ([[[T; MONITORS]; 2]; CORRECTORS], [[T; 2]; MONITORS]) {
        let mut t = [[[T::ZERO; MONITORS]; 2]; CORRECTORS];
        for (j, column) in t.iter_mut().enumerate() {
            for (p, plane) in column.iter_mut().enumerate() {
                for (i, x) in plane.iter_mut().enumerate() {
                    *x = self.truth.reading_per_setting(i, p, j).unwrap_or(T::ZERO);
                }
            }
        }
        (t, self.free)
    }
}

impl<T: Real> Plant<T> for Machine<T> {
    fn try_set_phase(&mut self, phase: usize) -> Result<(), Error> {
        let scale = T::from_f64(QUAD_ERROR);
        let kinetic = T::from_f64(kinetic_ev(phase));
        let entry = if phase == 0 { ENTRY } else { SHIFTED_ENTRY };
        self.truth = try_response(kinetic, scale)?;
        self.free = try_free_orbit(kinetic, scale, entry.map(T::from_f64))?;
        Ok(())
    }

    fn orbit(&self, settings: &[T; CORRECTORS]) -> [[T; 2]; MONITORS] {
        let mut b = self.truth.predict(settings);
        for (o, f) in b.iter_mut().zip(&self.free) {
            o[0] += f[0];
            o[1] += f[1];
        }
        b
    }
}

/// One iteration of the run, for logs and checks.
#[derive(Clone, Copy)]
pub struct Record<T: Real> {
    pub iteration: usize,
    pub kinetic_ev: T,
    pub readings: [[T; 2]; MONITORS],
    pub true_orbit: [[T; 2]; MONITORS],
    pub settings: [T; CORRECTORS],
    pub outcome: Outcome,
    /// Set points held at a limit by the energy step's rescaling (bit j).
    pub rescale_held: u32,
}

/// Runs the whole scenario on a loop set up by [`try_setup`]: `step` performs each iteration
/// (the firmware wraps it in its counting markers), `record` receives each iteration's record.
/// At the energy step the response is rebuilt from the maps in place and the set points follow.
pub fn try_run<T: Real>(
    orbit: &mut Orbit<T, MONITORS, CORRECTORS>,
    plant: &mut impl Plant<T>,
    mut step: impl FnMut(
        &mut Orbit<T, MONITORS, CORRECTORS>,
        &[[T; 2]; MONITORS],
        &mut [T; CORRECTORS],
    ) -> Result<Outcome, Error>,
    mut record: impl FnMut(&Record<T>),
) -> Result<(), Error> {
    plant.try_set_phase(0)?;
    let mut settings = [T::ZERO; CORRECTORS];
    let mut frozen = None;
    for iteration in 0..ITERATIONS {
        let mut rescale_held = 0;
        if iteration == SHIFT_AT {
            frozen = plant.orbit(&settings).get(STUCK_MONITOR).copied();
        }
        if iteration == SHIFT_AT || iteration == ENERGY_AT {
            plant.try_set_phase(phase(iteration))?;
        }
        let kinetic = T::from_f64(kinetic_ev(phase(iteration)));
        if iteration == ENERGY_AT {
            rescale_held = try_load(orbit, kinetic, &mut settings)?;
        }
        let true_orbit = plant.orbit(&settings);
        let mut readings = true_orbit;
        if let (Some(f), Some(o)) = (frozen, readings.get_mut(STUCK_MONITOR)) {
            *o = f;
        }
        let outcome = step(orbit, &readings, &mut settings)?;
        record(&Record {
            iteration,
            kinetic_ev: kinetic,
            readings,
            true_orbit,
            settings,
            outcome,
            rescale_held,
        });
    }
    Ok(())
}
