//! One cycle of the timing and steering loop of an invented proton injector, generic over the
//! scalar, so that the same code runs in `f32` on the chip and in `f64` on the host.
//!
//! Three programs include this file: the firmware (`src/main.rs`, `f32` on the Cortex-M), its
//! build script (`build.rs`, the `f64` reference values the firmware checks itself against), and
//! the host check `examples/f32_vs_f64.rs` of the fourforce crate (both precisions over a sweep
//! of species and energies).
//!
//! The machine (our own invention): two timing pickups [`Machine::flight_base_m`] apart measure
//! the bunch's time of flight; a thin horizontal corrector of length
//! [`Machine::corrector_length_m`] kicks the beam; a position monitor downstream reads its offset
//! and the corrector's supply reads back its present setting. Each cycle:
//!
//! 1. **kinematics** from the measured time of flight ([`Motion::try_from_flight_time`]);
//! 2. **plausibility**: the energy must lie in the machine's window ([`EnergyWindow`]); a reading
//!    outside it is refused and the corrector is left alone; plausible energies feed a moving
//!    window ([`MovingWindow`]) whose mean the loop reports;
//! 3. **set point**: the one-monitor, one-corrector case of the orbit correction
//!    ([`orbit::try_single_step`]: the response of the monitor to the corrector across the drift,
//!    at the rigidity of this cycle) from the offset and the read-back setting;
//! 4. **four-force** on the beam inside the corrector at the new setting
//!    ([`FieldTensor::try_four_force`]);
//! 5. **push**: one Boris step through the corrector ([`Boris`]), whose kick the loop reports.

use fourforce::check::{EnergyWindow, MovingWindow, Verdict};
use fourforce::orbit::{self, Corrector, Tuning};
use fourforce::push::{Boris, Particle, Pusher, StepFactors};
use fourforce::{Error, FieldTensor, Motion, Real, Species, ThreeVector, optics};

/// The invented injector line.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Machine<T: Real> {
    /// Distance between the two timing pickups, m.
    pub flight_base_m: T,
    /// Magnetic length of the corrector, m.
    pub corrector_length_m: T,
    /// The plausible energies (and the species).
    pub window: EnergyWindow<T>,
    /// Drift to the monitor, gain and corrector limits.
    pub steering: Steering<T>,
}

/// The steering of the injector: one corrector, one monitor a drift downstream.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Steering<T: Real> {
    /// Drift from the corrector to the monitor, m: the monitor moves `drift` m per rad of kick.
    pub drift_m: T,
    /// The corrector's range and largest change per cycle, T m.
    pub corrector: Corrector<T>,
    /// Gain (no regularisation: one corrector, one reading).
    pub tuning: Tuning<T>,
}

impl<T: Real> Steering<T> {
    /// Monitor `drift_m` downstream, gain `gain`, corrector within `±max_tm`, at most
    /// `max_change_tm` per cycle.
    ///
    /// # Errors
    /// As [`Corrector::try_new`] and [`Tuning::try_new`].
    pub fn try_new(drift_m: T, gain: T, max_tm: T, max_change_tm: T) -> Result<Self, Error> {
        Ok(Self {
            drift_m,
            corrector: Corrector::try_new(-max_tm, max_tm, max_change_tm)?,
            tuning: Tuning::try_new(gain, T::ZERO, T::ZERO)?,
        })
    }

    /// Drift from the corrector to the monitor, m.
    pub fn drift(&self) -> T {
        self.drift_m
    }
}

/// Nominal kinetic energy of the injector's protons, eV.
pub const NOMINAL_KINETIC_EV: f64 = 2.5e6;

/// Readings the moving window of energies holds.
pub const WINDOW: usize = 8;

impl<T: Real> Machine<T> {
    /// The injector for `species` around `nominal_ev` (±20 %); every other number is exact in
    /// `f32`.
    ///
    /// # Errors
    /// As [`EnergyWindow::try_around`] and [`Steering::try_new`].
    pub fn try_injector(species: Species<T>, nominal_ev: T) -> Result<Self, Error> {
        Ok(Self {
            flight_base_m: T::from_f64(1.25),
            corrector_length_m: T::from_f64(0.125),
            window: EnergyWindow::try_around(species, nominal_ev, T::from_f64(0.2))?,
            // Monitor 2.5 m downstream, gain 0.5, ±20 mT m, at most 2 mT m per cycle.
            steering: Steering::try_new(
                T::from_f64(2.5),
                T::HALF,
                T::from_f64(0.02),
                T::from_f64(0.002),
            )?,
        })
    }

    /// The same machine in another precision, every number converted exactly (`f32` → `f64`),
    /// so that both precisions see identical inputs. For the host only.
    ///
    /// # Errors
    /// As [`Machine::try_injector`] (never for a machine that was valid in `T`).
    pub fn try_to<U: Real>(&self) -> Result<Machine<U>, Error> {
        let c = |x: T| U::from_f64(x.to_f64());
        let (w, s) = (self.window, self.steering);
        let species = w.species();
        Ok(Machine {
            flight_base_m: c(self.flight_base_m),
            corrector_length_m: c(self.corrector_length_m),
            window: EnergyWindow::try_new(
                Species::try_new(c(species.rest_energy()), c(species.charge()))?,
                c(w.low()),
                c(w.nominal()),
                c(w.high()),
            )?,
            steering: Steering::try_new(
                c(s.drift_m),
                c(s.tuning.gain()),
                c(s.corrector.max()),
                c(s.corrector.max_step()),
            )?,
        })
    }
}

/// What the loop reads each cycle.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Reading<T: Real> {
    /// Time of flight between the pickups, s.
    pub flight_time_s: T,
    /// Beam offset at the position monitor, m.
    pub offset_m: T,
    /// The corrector supply's read-back setting, T m.
    pub readback_tm: T,
}

/// A read-back setting for test readings (host only): twice the full correction of `offset_m`,
/// on the side the correction moves to, so the new setting never cancels against it and the
/// kick stays a few milliradians at any energy.
pub fn test_readback(rigidity_tm: f64, charge_sign: f64, offset_m: f64, drift_m: f64) -> f64 {
    -2.0 * charge_sign * rigidity_tm * offset_m / drift_m
}

/// What the loop remembers between cycles: the moving window of plausible energies.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
pub struct LoopState<T: Real> {
    /// The last [`WINDOW`] plausible kinetic energies, eV.
    pub energies: MovingWindow<T, WINDOW>,
}

/// The corrector's next setting (T m) from the monitor's offset `offset_m` and the read-back
/// setting `readback_tm`, at the rigidity of `motion`: the one-monitor, one-corrector case of
/// the orbit correction ([`orbit::try_single_step`]), the monitor moving `drift · κ` m per T m
/// (`κ = ±1/Bρ`).
///
/// # Errors
/// As [`optics::try_kick_angle`] and [`orbit::try_single_step`].
pub fn set_point<T: Real>(
    steering: &Steering<T>,
    motion: &Motion<T>,
    offset_m: T,
    readback_tm: T,
) -> Result<T, Error> {
    let response = steering.drift_m * optics::try_kick_angle(motion, T::ONE)?;
    let (setting, _) = orbit::try_single_step(
        &steering.corrector,
        &steering.tuning,
        response,
        offset_m,
        readback_tm,
    )?;
    Ok(setting)
}

/// What one cycle computes.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Cycle<T: Real> {
    /// Kinetic energy from the time of flight, eV.
    pub kinetic_ev: T,
    /// Mean of the moving window of energies, eV.
    pub mean_kinetic_ev: T,
    /// Magnetic rigidity, T m.
    pub rigidity_tm: T,
    /// Corrector set point: integrated field, T m.
    pub corrector_tm: T,
    /// Horizontal component of the four-force inside the corrector, eV/m.
    pub force_x_ev_per_m: T,
    /// Horizontal angle after one Boris step through the corrector, rad.
    pub kick_rad: T,
}

/// Number of outputs of a [`Cycle`], in the order of [`Cycle::outputs`].
pub const OUTPUTS: usize = 6;

/// Names of the outputs, in the order of [`Cycle::outputs`].
pub const OUTPUT_NAMES: [&str; OUTPUTS] = ["T", "T mean", "B rho", "corrector", "K_x", "kick"];

/// Documented `f32` bounds of each output against the `f64` run of the same cycles from the same
/// inputs, in eps = 2⁻²³ relative; checked by the firmware on the chip and by
/// `examples/f32_vs_f64.rs` on the host.
///
/// Measured worst over the host sweep (7 species, 1 keV to 10 GeV, 4 readings each): see
/// `examples/f32_vs_f64.rs`'s output in ci/firmware. The deviation is the computation's alone:
/// both precisions start from the same `f32` readings. (How well an `f32` time of flight pins the
/// energy is another matter: as β → 1 the flight time approaches `L/c` within less than one `f32`
/// step, and the energy it gives is only as good as that step; in the sweep, electrons and
/// positrons above 1.2 GeV fall out of the ±20 % plausibility window in both precisions for that
/// reason.)
pub const BOUNDS_EPS: [u32; OUTPUTS] = [8; OUTPUTS];

impl<T: Real> Cycle<T> {
    /// The outputs as an array, in the order of [`OUTPUT_NAMES`].
    pub fn outputs(&self) -> [T; OUTPUTS] {
        [
            self.kinetic_ev,
            self.mean_kinetic_ev,
            self.rigidity_tm,
            self.corrector_tm,
            self.force_x_ev_per_m,
            self.kick_rad,
        ]
    }
}

/// Kinematics from the measured time of flight (the `convert` figure of ci/firmware).
#[inline]
pub fn kinematics<T: Real>(machine: &Machine<T>, flight_time_s: T) -> Result<Motion<T>, Error> {
    Motion::try_from_flight_time(
        machine.window.species(),
        machine.flight_base_m,
        flight_time_s,
    )
}

/// The corrector's field for the set point `corrector_tm`: the tensor of the four-force, and
/// the (uniform) field source of the pusher.
#[inline]
pub fn corrector_field<T: Real>(
    machine: &Machine<T>,
    corrector_tm: T,
) -> Result<FieldTensor<T>, Error> {
    let b = ThreeVector::new(T::ZERO, corrector_tm / machine.corrector_length_m, T::ZERO);
    FieldTensor::try_from_fields(ThreeVector::ZERO, b)
}

/// The beam's direction of travel, +z.
#[inline]
pub fn beam_axis<T: Real>() -> ThreeVector<T> {
    ThreeVector::new(T::ZERO, T::ZERO, T::ONE)
}

/// One cycle: kinematics, plausibility, set point, four-force, push.
///
/// # Errors
/// Whatever the library refuses (a flight time shorter than light's, a non-finite reading ...),
/// and [`Error::InvalidRange`] when the energy is outside the machine's window (the window's
/// verdict is Low or High); a refused reading leaves `state` unchanged.
pub fn cycle<T: Real>(
    machine: &Machine<T>,
    state: &mut LoopState<T>,
    reading: Reading<T>,
) -> Result<Cycle<T>, Error> {
    // 1. Kinematics from the measured value.
    let motion = kinematics(machine, reading.flight_time_s)?;
    // 2. Plausibility.
    match machine.window.check_motion(&motion) {
        Verdict::Inside { .. } => {}
        Verdict::Low { .. } | Verdict::High { .. } => return Err(Error::InvalidRange),
        Verdict::Impossible(e) => return Err(e),
    }
    let t = motion.kinetic_energy();
    state.energies.try_push(t)?;
    // 3. Set point: the orbit correction toward the axis (target offset 0).
    let corrector_tm = set_point(
        &machine.steering,
        &motion,
        reading.offset_m,
        reading.readback_tm,
    )?;
    // 4. Four-force on the beam inside the corrector; the particle at the corrector's entrance
    // carries the four-velocity (γ, γβ ẑ) (one normalisation of the axis for both steps).
    let field = corrector_field(machine, corrector_tm)?;
    let mut particle = Particle::try_from_motion(&motion, beam_axis(), ThreeVector::ZERO)?;
    let charge = machine.window.species().charge();
    let force = field.try_four_force(charge, particle.four_velocity())?;
    // 5. One push step through the corrector, its length in one step.
    let pusher = Boris::from_factors(StepFactors::try_over_length(
        &motion,
        machine.corrector_length_m,
    )?);
    // One step from a fresh particle: nothing to carry into a next step, so the plain sums (the
    // compensated `try_step` keeps kicks below an ulp over many steps, at about 60 % more cost).
    pusher.try_step_plain(&mut particle, &field)?;
    let u = particle.beta_gamma();
    Ok(Cycle {
        kinetic_ev: t,
        mean_kinetic_ev: state.energies.try_mean()?,
        rigidity_tm: motion.try_magnetic_rigidity()?,
        corrector_tm,
        force_x_ev_per_m: force.space.x,
        kick_rad: u.x / u.z,
    })
}

/// Relative deviation of `got` from `want` in eps = 2⁻²³, rounded up (`u32::MAX` if `want` is 0
/// and `got` is not, or for a non-finite value). Integer-valued so that the firmware prints it
/// without float formatting.
pub fn deviation_eps<T: Real>(got: T, want: T) -> u32 {
    if got == want {
        return 0;
    }
    let rel = ((got - want) / want).abs() / T::from_f64(f64::from(f32::EPSILON));
    if rel.is_finite() && rel < T::from_f64(4.0e9) {
        // Rounded up: a deviation of 1.2 eps counts as 2.
        let mut n = 0u32;
        while T::from_u32(n) < rel {
            n += 1;
            if n > 64 {
                // Beyond any bound: find the value by halving from the top.
                return large_eps(rel);
            }
        }
        n
    } else {
        u32::MAX
    }
}

/// `ceil(rel)` for `64 < rel < 4e9` by bisection on integers (no float-to-integer cast, which
/// `Real` does not offer).
fn large_eps<T: Real>(rel: T) -> u32 {
    let (mut lo, mut hi) = (64u32, 4_000_000_000u32);
    while hi - lo > 1 {
        let mid = lo + (hi - lo) / 2;
        if T::from_u32(mid) < rel {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    hi
}
