//! The square root fourforce uses on this chip against libm's `sqrtf`, bit for bit.
//!
//! On hard-float Arm targets `<f32 as Real>::sqrt` is the FPU's `vsqrt.f32` (crate
//! `fourforce-fpu`); elsewhere it is libm's `sqrtf` itself. Both are correctly rounded (IEEE 754
//! §5.4.1), so they must agree on every non-negative input: this check compares them on the
//! edges (zeros, subnormals, the smallest normal, 1, the largest finite value, infinity) and on
//! pseudo-random non-negative bit patterns spread over every exponent.

use crate::board::Out;
use fourforce::Real;

/// Pseudo-random inputs compared after the edges.
const RANDOM: u32 = 1 << 16;

/// Compares the two square roots; prints one line and returns whether every input agreed.
#[inline(never)]
pub fn check(out: &mut Out) -> bool {
    let edges = [
        0.0_f32,
        -0.0,
        f32::from_bits(1),
        f32::from_bits(0x007f_ffff),
        f32::MIN_POSITIVE,
        1.0,
        2.0,
        f32::MAX,
        f32::INFINITY,
    ];
    let mut mismatches = 0u32;
    let mut compare = |x: f32| {
        if <f32 as Real>::sqrt(x).to_bits() != libm::sqrtf(x).to_bits() {
            mismatches += 1;
        }
    };
    for x in edges {
        compare(x);
    }
    // xorshift32 (G. Marsaglia, J. Stat. Softw. 8(14), 2003, from memory); the sign bit cleared,
    // NaN patterns skipped.
    let mut state = 0x2545_f491_u32;
    for _ in 0..RANDOM {
        state ^= state << 13;
        state ^= state >> 17;
        state ^= state << 5;
        let x = f32::from_bits(state & 0x7fff_ffff);
        if !x.is_nan() {
            compare(x);
        }
    }
    out.str("sqrt: fourforce and libm sqrtf on ")
        .u32(edges.len() as u32 + RANDOM)
        .str(" inputs: ");
    if mismatches == 0 {
        out.str("bit-identical").nl();
    } else {
        out.u32(mismatches).str(" differ").nl();
    }
    mismatches == 0
}
