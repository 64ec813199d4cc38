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

/// The places of the line in beam order with the maps between them, computed as the iterator
/// goes (nothing stored), at the kinetic energy `kinetic_ev`, quadrupoles scaled by `quad_scale`.
fn places<T: Real>(motion: Motion<T>, quad_scale: T) -> impl Iterator<Item = Step<T>> {
    let gl = T::from_f64(QUAD_T) * quad_scale;
    (0..CELLS).flat_map(move |cell| {
        let mut out: [Option<Step<T>>; 3] = [None, None, None];
        let drift = |l: f64| TransferMap::try_drift(&motion, T::from_f64(l));
        let corrector = |index: usize, direction| Place::Corrector {
            index,
            kick: Kick::Magnetic,
            direction,
            motion,
        };
        let first = (|| {
            let q = TransferMap::try_thin_quadrupole(&motion, gl)?;
            Ok(q.then(&drift(0.4)?))
        })();
        let qd_to_monitor = (|| {
            let m = drift(0.6)?
                .then(&TransferMap::try_thin_quadrupole(&motion, -gl)?)
                .then(&drift(0.6)?);
            Ok(m)
        })();
        if cell < PER_PLANE {
            out[0] = Some(first.map(|m| (m, corrector(cell, KickDirection::Horizontal))));
            out[1] =
                Some(drift(0.2).map(|m| (m, corrector(PER_PLANE + cell, KickDirection::Vertical))));
            out[2] = Some(qd_to_monitor.map(|m| (m, Place::Monitor(cell))));
        } else {
            // no correctors: the maps are joined up to the monitor
            out[0] = Some((|| {
                let m = first?.then(&drift(0.2)?).then(&qd_to_monitor?);
                Ok((m, Place::Monitor(cell)))
            })());
        }
        out.into_iter().flatten()
    })
}

/// The response of the line at `kinetic_ev`, quadrupoles scaled by `quad_scale`.
pub fn try_response<T: Real>(
    kinetic_ev: T,
    quad_scale: T,
) -> Result<Response<T, MONITORS, CORRECTORS>, Error> {
    let motion = Motion::try_from_kinetic_energy(Species::PROTON, kinetic_ev)?;
    let mut error = None;
    let r = Response::try_from_places(tail_drifts(motion, places(motion, quad_scale)).map_while(
        |p| match p {
            Ok(p) => Some(p),
            Err(e) => {
                error = Some(e);
                None
            }
        },
    ));
    match error {
        Some(e) => Err(e),
        None => r,
    }
}

/// Puts the 0.6 m drift that follows each monitor in front of the next map.
fn tail_drifts<T: Real>(
    motion: Motion<T>,
    inner: impl Iterator<Item = Step<T>>,
) -> impl Iterator<Item = Step<T>> {
    let mut after_monitor = false;
    inner.map(move |p| {
        let (map, place) = p?;
        let map = if after_monitor {
            TransferMap::try_drift(&motion, T::from_f64(0.6))?.then(&map)
        } else {
            map
        };
        after_monitor = matches!(place, Place::Monitor(_));
        Ok((map, place))
    })
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
    for p in tail_drifts(motion, places(motion, quad_scale)) {
        let (map, place) = p?;
        v = map.apply(v);
        if let Place::Monitor(i) = place {
            if let Some(o) = out.get_mut(i) {
                *o = [v[0], v[2]];
            }
        }
    }
    Ok(out)
}

/// Every corrector's calibration (invented): ∫B dl in T m against the supply current in A,
/// straight to 8 A, saturating beyond.
pub fn calibration<T: Real>() -> Result<Calibration<T, 7>, Error> {
    let a = [-10.0, -8.0, -4.0, 0.0, 4.0, 8.0, 10.0].map(T::from_f64);
    let tm = [-2.2e-3, -1.9e-3, -0.95e-3, 0.0, 0.95e-3, 1.9e-3, 2.2e-3].map(T::from_f64);
    Calibration::try_new(a, tm)
}

/// The loop: monitors trusted to ±10 mm, weight 1 each; correctors over the calibrated range,
/// at most 0.25 mT m per iteration (H0 is a short corrector with half the range); gain 0.5,
/// α = 0.1 (the early monitors see one corrector each: without it the solution follows the
/// weak modes), cutoff 0.01.
pub fn try_orbit<T: Real>() -> Result<Orbit<T, MONITORS, CORRECTORS>, Error> {
    let response = try_response(T::from_f64(NOMINAL_EV), T::ONE)?;
    let (lo, hi) = calibration::<T>()?.setting_range();
    let step = T::from_f64(0.25e-3);
    let mut correctors = [Corrector::try_new(lo, hi, step)?; CORRECTORS];
    // H0 is a short corrector: half the range.
    correctors[0] = Corrector::try_new(lo * T::HALF, hi * T::HALF, step)?;
    let monitor = Monitor::try_new(T::from_f64(10.0e-3), T::ONE)?;
    let tuning = Tuning::try_new(T::from_f64(GAIN), T::from_f64(ALPHA), T::from_f64(CUTOFF))?;
    Orbit::try_new(response, [monitor; MONITORS], correctors, tuning)
}

/// The simulated machine: the real line (quadrupoles 3 % off the model) at the present energy.
pub struct Machine<T: Real> {
    pub kinetic_ev: T,
    truth: Response<T, MONITORS, CORRECTORS>,
    free: [[T; 2]; MONITORS],
    frozen: Option<[T; 2]>,
}

impl<T: Real> Machine<T> {
    pub fn try_new(kinetic_ev: T, entry: [f64; 4]) -> Result<Self, Error> {
        let scale = T::from_f64(QUAD_ERROR);
        Ok(Self {
            kinetic_ev,
            truth: try_response(kinetic_ev, scale)?,
            free: try_free_orbit(kinetic_ev, scale, entry.map(T::from_f64))?,
            frozen: None,
        })
    }

    /// The true offsets at the monitors for the settings `settings`.
    pub fn orbit(&self, settings: &[T; CORRECTORS]) -> [[T; 2]; MONITORS] {
        let mut b = self.truth.predict(settings);
        for (o, f) in b.iter_mut().zip(&self.free) {
            o[0] += f[0];
            o[1] += f[1];
        }
        b
    }

    /// What the monitors report: the true orbit, with the stuck one's frozen value.
    pub fn readings(&self, settings: &[T; CORRECTORS]) -> [[T; 2]; MONITORS] {
        let mut b = self.orbit(settings);
        if let (Some(f), Some(o)) = (self.frozen, b.get_mut(STUCK_MONITOR)) {
            *o = f;
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
    pub rescale_held: u64,
}

/// Runs the whole scenario; `step` performs each iteration (the firmware wraps it in its
/// counting markers), `record` receives each iteration's record.
pub fn try_run<T: Real>(
    orbit: &mut Orbit<T, MONITORS, CORRECTORS>,
    mut step: impl FnMut(
        &mut Orbit<T, MONITORS, CORRECTORS>,
        &[[T; 2]; MONITORS],
        &mut [T; CORRECTORS],
    ) -> Result<Outcome, Error>,
    mut record: impl FnMut(&Record<T>),
) -> Result<(), Error> {
    let mut machine = Machine::try_new(T::from_f64(NOMINAL_EV), ENTRY)?;
    let mut settings = [T::ZERO; CORRECTORS];
    for iteration in 0..ITERATIONS {
        let mut rescale_held = 0;
        if iteration == SHIFT_AT {
            let frozen = machine.readings(&settings).get(STUCK_MONITOR).copied();
            machine = Machine::try_new(machine.kinetic_ev, SHIFTED_ENTRY)?;
            machine.frozen = frozen;
        }
        if iteration == ENERGY_AT {
            let kinetic = T::from_f64(STEPPED_EV);
            let frozen = machine.frozen;
            machine = Machine::try_new(kinetic, SHIFTED_ENTRY)?;
            machine.frozen = frozen;
            rescale_held = orbit.try_set_response(try_response(kinetic, T::ONE)?, &mut settings)?;
        }
        let readings = machine.readings(&settings);
        let true_orbit = machine.orbit(&settings);
        let outcome = step(orbit, &readings, &mut settings)?;
        record(&Record {
            iteration,
            kinetic_ev: machine.kinetic_ev,
            readings,
            true_orbit,
            settings,
            outcome,
            rescale_held,
        });
    }
    Ok(())
}
