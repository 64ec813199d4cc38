//! A timing and steering loop with fourforce on an emulated Cortex-M4F.
#![no_std]
#![no_main]

mod board;

use board::{Bench, Out};
use cortex_m_rt::entry;

#[entry]
fn main() -> ! {
    board::paint_stack();
    let mut out = Out::open();
    let mut bench = Bench::new();
    bench.measure(&mut out, "markers", 1, || ());
    out.str("stack ").u32(board::stack_high_water()).nl();
    out.str("PASS").nl();
    board::exit(true)
}
