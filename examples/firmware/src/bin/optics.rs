//! The first-order map of a 16-element line at a new energy (`fourforce::transfer`), computed
//! on the emulated chip in f32: a binary of its own so that the control loop's image keeps its
//! flash budget. Counted per element (the `map_element` field of ci/firmware's figures line: the
//! state of motion at the new energy and the line's map, divided by the 16 elements) and checked
//! against the host's f64 maps (`fourforce map --f64`, printed below to 10 digits) within 16 eps
//! of each row's largest entry. Exits through semihosting: status 0 when every check holds.
#![no_std]
#![no_main]

#[path = "../board.rs"]
#[allow(dead_code)] // the helpers this binary does not need
mod board;

use core::hint::black_box;
use fourforce::beamline::{BeamLine, Element, KickDirection};
use fourforce::transfer::TransferMap;
use fourforce::{Motion, Species};

use board::{Bench, Out};
use cortex_m_rt::entry;

/// The invented 16-element proton line: a doublet, a monitor, a bend with pole faces, a thin
/// lens, a solenoid, a gap, an electrostatic lens, a corrector and a monitor.
const LINE: [Element<f32>; 16] = [
    Element::Drift { length_m: 0.4 },
    Element::Quadrupole {
        length_m: 0.15,
        gradient_t_per_m: 6.0,
    },
    Element::Drift { length_m: 0.25 },
    Element::Quadrupole {
        length_m: 0.15,
        gradient_t_per_m: -6.0,
    },
    Element::Drift { length_m: 0.4 },
    Element::Monitor { id: 1 },
    Element::SectorDipole {
        length_m: 0.9,
        angle_rad: 0.35,
        entry_angle_rad: 0.12,
        exit_angle_rad: 0.12,
    },
    Element::Drift { length_m: 0.3 },
    Element::ThinQuadrupole {
        integrated_gradient_t: 0.4,
    },
    Element::Drift { length_m: 0.3 },
    Element::Solenoid {
        length_m: 0.25,
        field_t: 0.6,
    },
    Element::AcceleratingGap { voltage_v: 0.5e6 },
    Element::ElectrostaticQuadrupole {
        length_m: 0.1,
        voltage_v: 8.0e3,
        aperture_radius_m: 0.03,
    },
    Element::Drift { length_m: 0.5 },
    Element::MagneticKick {
        integrated_field_tm: 1.0e-3,
        direction: KickDirection::Horizontal,
    },
    Element::Monitor { id: 2 },
];

/// The energies the line is set to, one after the other (eV).
const ENERGIES: [f32; 4] = [20.0e6, 35.0e6, 50.0e6, 70.0e6];

/// The host's f64 maps at those energies (`fourforce map --f64 --species proton`).
const EXPECTED: [[[f32; 6]; 6]; 4] = [
    [
        [
            -8.974451680e-01,
            1.966784712e+00,
            -2.815763920e-02,
            2.476124134e-01,
            0.000000000e+00,
            4.525485282e-01,
        ],
        [
            -1.865272743e-01,
            -6.770730068e-01,
            -6.152322157e-02,
            7.562360338e-02,
            0.000000000e+00,
            1.519494984e-01,
        ],
        [
            1.085127713e-01,
            -2.411579474e-01,
            -2.404138168e-01,
            2.220861629e+00,
            0.000000000e+00,
            -5.454049083e-02,
        ],
        [
            2.971006167e-02,
            5.473746247e-02,
            -5.262445967e-01,
            8.078634782e-01,
            0.000000000e+00,
            -2.137121089e-02,
        ],
        [
            -8.750010398e-10,
            1.019375778e-08,
            0.000000000e+00,
            0.000000000e+00,
            1.000000000e+00,
            -5.757085799e-08,
        ],
        [
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            9.758615288e-01,
        ],
    ],
    [
        [
            -4.609341406e-01,
            2.498966568e+00,
            4.448338599e-02,
            2.436170547e-01,
            0.000000000e+00,
            5.083341033e-01,
        ],
        [
            -3.520503902e-01,
            -2.290082107e-01,
            -1.604475008e-02,
            8.035148346e-02,
            0.000000000e+00,
            2.059423886e-01,
        ],
        [
            4.082112692e-02,
            -2.241951755e-01,
            5.276100525e-01,
            2.859634560e+00,
            0.000000000e+00,
            -4.526477306e-02,
        ],
        [
            3.186826964e-02,
            8.289053531e-03,
            -1.529097194e-01,
            1.038748101e+00,
            0.000000000e+00,
            -1.970334835e-02,
        ],
        [
            1.070438625e-09,
            8.038553748e-09,
            0.000000000e+00,
            0.000000000e+00,
            1.000000000e+00,
            -4.278042415e-08,
        ],
        [
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            9.861640387e-01,
        ],
    ],
    [
        [
            -2.094364949e-01,
            2.746463665e+00,
            5.481034719e-02,
            2.205900630e-01,
            0.000000000e+00,
            5.359862598e-01,
        ],
        [
            -3.602362973e-01,
            -1.526899764e-03,
            -5.552101212e-03,
            7.275387417e-02,
            0.000000000e+00,
            2.324518003e-01,
        ],
        [
            1.521470133e-02,
            -2.032773197e-01,
            7.711007283e-01,
            3.089016983e+00,
            0.000000000e+00,
            -3.948549944e-02,
        ],
        [
            2.617264174e-02,
            -7.091890963e-03,
            -4.770031435e-02,
            1.092397631e+00,
            0.000000000e+00,
            -1.793947613e-02,
        ],
        [
            1.549673771e-09,
            6.860295159e-09,
            0.000000000e+00,
            0.000000000e+00,
            1.000000000e+00,
            -3.514190581e-08,
        ],
        [
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            9.903429085e-01,
        ],
    ],
    [
        [
            -4.473993920e-03,
            2.927668414e+00,
            5.417360412e-02,
            1.946072584e-01,
            0.000000000e+00,
            5.575898511e-01,
        ],
        [
            -3.393173093e-01,
            1.745513933e-01,
            -1.340409327e-03,
            6.333636071e-02,
            0.000000000e+00,
            2.529854407e-01,
        ],
        [
            1.127561586e-04,
            -1.810317591e-01,
            9.012186217e-01,
            3.228580886e+00,
            0.000000000e+00,
            -3.437223104e-02,
        ],
        [
            2.040372076e-02,
            -1.515787625e-02,
            1.547840086e-03,
            1.106973302e+00,
            0.000000000e+00,
            -1.609568879e-02,
        ],
        [
            1.726253265e-09,
            5.905041164e-09,
            0.000000000e+00,
            0.000000000e+00,
            1.000000000e+00,
            -2.897459417e-08,
        ],
        [
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            0.000000000e+00,
            9.931450776e-01,
        ],
    ],
];

/// The line's map at the kinetic energy `t` (eV): the state of motion, then the map.
#[inline(never)]
fn map_at(line: &BeamLine<f32, 16>, t: f32) -> Option<TransferMap<f32>> {
    let reference = Motion::try_from_kinetic_energy(Species::PROTON, t).ok()?;
    line.try_map(&reference).ok().map(|(map, _)| map)
}

/// Counts the map per element and checks it against the host.
#[inline(never)]
fn measure(out: &mut Out, bench: &mut Bench) -> Result<(), &'static str> {
    let line = BeamLine::<f32, 16>::try_from_elements(&LINE).map_err(|_| "line")?;
    let calls = (ENERGIES.len() * LINE.len()) as u32;
    bench.figure(out, "map_element", calls, || {
        for &t in &ENERGIES {
            black_box(map_at(black_box(&line), black_box(t)));
        }
    });
    for (&t, expected) in ENERGIES.iter().zip(&EXPECTED) {
        let map = map_at(&line, t).ok_or("map")?.to_array();
        for (row, want) in map.iter().zip(expected) {
            let scale = want.iter().fold(0.0_f32, |s, x| s.max(x.abs()));
            for (x, w) in row.iter().zip(want) {
                if (x - w).abs() > 16.0 * f32::EPSILON * scale {
                    return Err("map entry");
                }
            }
        }
    }
    Ok(())
}

#[entry]
fn main() -> ! {
    board::paint_stack();
    let mut out = Out::open();
    let mut bench = Bench::new();
    // The markers alone: subtracted from every other interval.
    bench.measure(&mut out, "markers", 1, || ());
    let result = measure(&mut out, &mut bench);
    if let Err(what) = result {
        out.str("FAIL: ").str(what).nl();
    }
    out.str("stack ").u32(board::stack_high_water()).nl();
    out.str(if result.is_ok() { "PASS" } else { "FAIL" }).nl();
    board::exit(result.is_ok())
}
