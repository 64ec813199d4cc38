//! The four-force on a proton in an invented bending dipole, in f32 as a firmware would compute it.
//!
//! Invented scenario: a 250 MeV proton enters a 1.4 T dipole of our own test bench along +x; the
//! dipole field points along +z, and a stray electric field leaks in: 200 kV/m along +y from a
//! nearby kicker and 50 kV/m along +x from an accelerating gap. The example prints the four-velocity, the four-force in eV/m and in N, the
//! three-force and power, the bending radius they imply (checked against B rho / B), and the
//! fields seen in the proton's rest frame with their invariants.
//!
//! Run: `cargo run --example four_force`.

use fourforce::{Boost, Error, FieldTensor, Motion, Species, ThreeVector};

fn main() -> Result<(), Error> {
    let proton = Species::<f32>::PROTON;
    let motion = Motion::try_from_kinetic_energy(proton, 250.0e6)?;
    let pc = motion.momentum(); // eV
    let direction = ThreeVector::new(1.0_f32, 0.0, 0.0);

    let u = motion.try_four_velocity(direction)?;
    let e_field = ThreeVector::new(5.0e4_f32, 2.0e5, 0.0); // V/m
    let b_field = ThreeVector::new(0.0_f32, 0.0, 1.4); // T
    let field = FieldTensor::try_from_fields(e_field, b_field)?;

    println!(
        "proton, T = 250 MeV (f32): gamma = {:.7}, pc = {:.6} MeV",
        motion.gamma(),
        pc * 1e-6
    );
    println!(
        "four-velocity u = ({:.7}, {:.7}, {:.7}, {:.7}); |u.u - 1|/u0^2 = {:.1} eps",
        u.time,
        u.space.x,
        u.space.y,
        u.space.z,
        u.four_velocity_deviation().abs() / f32::EPSILON
    );

    let k = field.four_force(proton.charge(), u); // eV/m
    let k_newton = field.try_four_force_newtons(proton.charge(), u)?;
    println!(
        "four-force K = ({:.4e}, {:.4e}, {:.4e}, {:.4e}) eV/m",
        k.time, k.space.x, k.space.y, k.space.z
    );
    println!(
        "           K = ({:.4e}, {:.4e}, {:.4e}, {:.4e}) N",
        k_newton.time, k_newton.space.x, k_newton.space.y, k_newton.space.z
    );
    let scale = k.time.abs() * u.time + k.space.norm() * u.space.norm();
    println!(
        "K.u = {:.2e} of its scale (0 in exact arithmetic)",
        k.inner(u) / scale
    );

    let velocity = direction * motion.speed();
    let force = field.try_three_force_newtons(proton.charge(), velocity)?;
    let power = field.try_power_watts(proton.charge(), velocity)?;
    println!(
        "three-force q(E + v x B) = ({:.4e}, {:.4e}, {:.4e}) N; power qE.v = {:.4e} W",
        force.x, force.y, force.z, power
    );

    // Radius of curvature from the transverse force, rho = pc beta / |F_perp| (F in eV/m), against
    // B rho / B for the magnetic part alone.
    let f_ev = field.three_force(proton.charge(), direction * motion.beta());
    let f_perp = f_ev - direction * f_ev.dot(direction);
    let rho = pc * motion.beta() / f_perp.norm();
    let rho_magnetic = motion.try_magnetic_rigidity()? / b_field.z;
    println!(
        "bending radius from the force: {rho:.4} m (B rho / B alone: {rho_magnetic:.4} m; the stray E field bends against B)"
    );

    let rest = Boost::try_from_four_velocity(u)?.apply_field(&field);
    println!(
        "in the proton's rest frame: E' = ({:.4e}, {:.4e}, {:.4e}) V/m, B' = ({:.4}, {:.4}, {:.4}) T",
        rest.e().x,
        rest.e().y,
        rest.e().z,
        rest.b().x,
        rest.b().y,
        rest.b().z
    );
    println!(
        "invariants: 2(B^2 - E^2/c^2) = {:.6} T^2 in the lab, {:.6} T^2 at rest; E.B = {} and {:.3e} V T/m",
        field.scalar_invariant(),
        rest.scalar_invariant(),
        field.pseudoscalar_invariant(),
        rest.pseudoscalar_invariant()
    );
    Ok(())
}
