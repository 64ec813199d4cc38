//! The hardware square root of hard-float Arm targets, for fourforce.
//!
//! fourforce itself is `#![forbid(unsafe_code)]`. Its square roots go through `libm::sqrtf`,
//! which on 32-bit Arm is a software routine (about 80 instructions on a Cortex-M4F), although
//! the FPU of every hard-float Arm core (VFPv2 and later, FPv4-SP of the Cortex-M4F, FPv5 of the
//! M7 and M33) computes the IEEE 754 square root, correctly rounded, in one instruction,
//! `vsqrt.f32`. Stable Rust reaches that instruction only through inline assembly, which is
//! `unsafe`; this crate holds that one block, so that the library keeps its `forbid`.
//!
//! [`sqrtf`] exists only on `target_arch = "arm"` with `target_abi = "eabihf"` (floats passed in
//! FPU registers, so an FPU is present and enabled whenever any `f32` code runs; cortex-m-rt
//! enables it in the reset handler). Elsewhere the crate is empty and fourforce uses libm.
//!
//! Results are bit-identical to libm's `sqrtf` for every non-negative input (both are correctly
//! rounded: IEEE 754 §5.4.1), including subnormals (the FPU's flush-to-zero mode is off after
//! reset) and `+∞`; a negative input gives a NaN in both (fourforce never passes one). The
//! firmware example (examples/firmware in the fourforce repository) compares the two on the
//! emulated chip, bit for bit, over edge values and pseudo-random inputs.
#![no_std]
#![deny(unsafe_code)]

/// `√x` by the FPU instruction `vsqrt.f32`: correctly rounded (round to nearest, ties to even).
///
/// Goes through a core register and saves `s0` around the instruction: the `sreg` operand class
/// of `asm!` needs the double-precision `vfp2` feature, which the single-precision FPU targets
/// (`thumbv7em-none-eabihf`) do not enable. About 7 instructions where inlined.
///
/// # Examples
/// ```ignore
/// // Only on hard-float Arm targets.
/// assert_eq!(fourforce_fpu::sqrtf(2.25), 1.5);
/// ```
#[cfg(all(target_arch = "arm", target_abi = "eabihf"))]
#[inline(always)]
#[must_use]
pub fn sqrtf(x: f32) -> f32 {
    let bits: u32;
    // SAFETY: the block reads one core register and writes one, computes in s0 and restores s0
    // from the stack with a balanced vpush/vpop (so no FPU register visible to the compiler
    // changes); it touches no other memory, leaves the flags alone, and an eabihf target has an
    // enabled FPU whenever f32 code runs.
    #[allow(unsafe_code)]
    unsafe {
        core::arch::asm!(
            "vpush {{s0}}",
            "vmov s0, {x}",
            "vsqrt.f32 s0, s0",
            "vmov {r}, s0",
            "vpop {{s0}}",
            x = in(reg) x.to_bits(),
            r = lateout(reg) bits,
            options(pure, nomem, preserves_flags),
        );
    }
    f32::from_bits(bits)
}
