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
//! [`Machine::corrector_length_m`] kicks the beam; a position monitor
//! [`Machine::monitor_distance_m`] downstream reads its offset. Each cycle:
//!
//! 1. **kinematics** from the measured time of flight ([`Motion::try_from_flight_time`]);
//! 2. **plausibility**: the kinetic energy must lie in the machine's window, else the cycle is
//!    refused and the set point is left alone;
//! 3. **set point**: the corrector's integrated field for the angle that cancels the offset at
//!    the monitor (`θ = −x / d`, [`optics::integrated_field_for_angle`]);
//! 4. **four-force** on the beam inside the corrector ([`FieldTensor::four_force`]);
//! 5. **push**: one Boris step through the corrector ([`Boris`]), whose kick is compared with
//!    the wanted angle.

use fourforce::push::{Boris, Particle, Pusher, UniformField};
use fourforce::{Error, FieldTensor, FourVector, Motion, Real, Species, ThreeVector, optics};

/// The invented injector line.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Machine<T: Real> {
    /// The beam's species.
    pub species: Species<T>,
    /// Distance between the two timing pickups, m.
    pub flight_base_m: T,
    /// Magnetic length of the corrector, m.
    pub corrector_length_m: T,
    /// Drift from the corrector to the position monitor, m.
    pub monitor_distance_m: T,
    /// Lowest plausible kinetic energy, eV.
    pub min_kinetic_ev: T,
    /// Highest plausible kinetic energy, eV.
    pub max_kinetic_ev: T,
}

/// Nominal kinetic energy of the injector's protons, eV.
pub const NOMINAL_KINETIC_EV: f64 = 2.5e6;

impl<T: Real> Machine<T> {
    /// The injector (every number is exact in `f32`).
    pub fn injector() -> Self {
        Self {
            species: Species::PROTON,
            flight_base_m: T::from_f64(1.25),
            corrector_length_m: T::from_f64(0.125),
            monitor_distance_m: T::from_f64(2.5),
            min_kinetic_ev: T::from_f64(2.0e6),
            max_kinetic_ev: T::from_f64(3.0e6),
        }
    }

    /// The same machine in another precision, every number converted exactly (`f32` → `f64`),
    /// so that both precisions see identical inputs. For the host only.
    pub fn to<U: Real>(&self) -> Machine<U> {
        let c = |x: T| U::from_f64(x.to_f64());
        Machine {
            species: Species::new(c(self.species.rest_energy()), c(self.species.charge())),
            flight_base_m: c(self.flight_base_m),
            corrector_length_m: c(self.corrector_length_m),
            monitor_distance_m: c(self.monitor_distance_m),
            min_kinetic_ev: c(self.min_kinetic_ev),
            max_kinetic_ev: c(self.max_kinetic_ev),
        }
    }
}

/// What the loop reads each cycle.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Reading<T: Real> {
    /// Time of flight between the pickups, s.
    pub flight_time_s: T,
    /// Beam offset at the position monitor, m.
    pub offset_m: T,
}

/// What one cycle computes.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Cycle<T: Real> {
    /// Kinetic energy from the time of flight, eV.
    pub kinetic_ev: T,
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
pub const OUTPUTS: usize = 5;

/// Names of the outputs, in the order of [`Cycle::outputs`].
pub const OUTPUT_NAMES: [&str; OUTPUTS] = ["T", "B rho", "corrector", "K_x", "kick"];

/// Documented `f32` bounds of each output against the `f64` run of the same cycle from the same
/// inputs, in eps = 2⁻²³ relative; checked by the firmware on the chip and by
/// `examples/f32_vs_f64.rs` on the host.
///
/// Measured worst over the host sweep (7 species, 1 keV to 10 GeV, 4 offsets): T 5, Bρ 3,
/// corrector 3, K_x 5, kick 4. The deviation is the computation's alone: both precisions start
/// from the same `f32` reading. (How well an `f32` time of flight pins the energy is another
/// matter: as β → 1 the flight time approaches `L/c` within less than one `f32` step, and the
/// energy it gives is only as good as that step; the sweep's electrons above 3.5 GeV fall out of
/// the plausibility window in both precisions for that reason.)
pub const BOUNDS_EPS: [u32; OUTPUTS] = [8; OUTPUTS];

impl<T: Real> Cycle<T> {
    /// The outputs as an array, in the order of [`OUTPUT_NAMES`].
    pub fn outputs(&self) -> [T; OUTPUTS] {
        [
            self.kinetic_ev,
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
    Motion::try_from_flight_time(machine.species, machine.flight_base_m, flight_time_s)
}

/// The corrector's field as a tensor and as a field source, for the set point `corrector_tm`.
#[inline]
pub fn corrector_field<T: Real>(
    machine: &Machine<T>,
    corrector_tm: T,
) -> Result<(FieldTensor<T>, UniformField<T>), Error> {
    let b = ThreeVector::new(T::ZERO, corrector_tm / machine.corrector_length_m, T::ZERO);
    Ok((
        FieldTensor::try_from_fields(ThreeVector::ZERO, b)?,
        UniformField::try_new(ThreeVector::ZERO, b)?,
    ))
}

/// The beam's four-velocity `u = (γ, 0, 0, βγ)`, travelling along +z.
#[inline]
pub fn four_velocity<T: Real>(motion: &Motion<T>) -> FourVector<T> {
    FourVector::new(motion.gamma(), T::ZERO, T::ZERO, motion.beta_gamma())
}

/// One cycle: kinematics, plausibility, set point, four-force, push.
///
/// # Errors
/// Whatever the library refuses (a flight time shorter than light's, a non-finite reading ...),
/// and [`Error::InvalidRange`] when the kinetic energy is outside the machine's window.
pub fn cycle<T: Real>(machine: &Machine<T>, reading: Reading<T>) -> Result<Cycle<T>, Error> {
    // 1. Kinematics from the measured value.
    let motion = kinematics(machine, reading.flight_time_s)?;
    // 2. Plausibility: refuse a kinetic energy outside the window.
    let t = motion.kinetic_energy();
    if t < machine.min_kinetic_ev || t > machine.max_kinetic_ev {
        return Err(Error::InvalidRange);
    }
    // 3. Set point: the angle that brings the beam back to the axis at the monitor.
    let angle = -reading.offset_m / machine.monitor_distance_m;
    let corrector_tm = optics::integrated_field_for_angle(&motion, angle)?;
    // 4. Four-force on the beam inside the corrector.
    let (tensor, source) = corrector_field(machine, corrector_tm)?;
    let force = tensor.try_four_force(machine.species.charge(), four_velocity(&motion))?;
    // 5. One push step through the corrector, its length in one step.
    let pusher = Boris::try_new(machine.species, machine.corrector_length_m / motion.speed())?;
    let start = ThreeVector::new(T::ZERO, T::ZERO, motion.beta_gamma());
    let mut particle = Particle::try_new(ThreeVector::ZERO, start, T::ZERO)?;
    pusher.try_step(&mut particle, &source)?;
    let u = particle.momentum();
    Ok(Cycle {
        kinetic_ev: t,
        rigidity_tm: motion.magnetic_rigidity()?,
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
