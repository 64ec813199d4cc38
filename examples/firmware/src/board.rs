//! What every firmware binary of this crate shares: output through semihosting without
//! `core::fmt` (integers only, so no float formatting lands in flash), the markers of the
//! instruction-counting plugin, stack painting, and the exit verdict.

use core::hint::black_box;
use cortex_m_semihosting::debug;
use cortex_m_semihosting::hio::{self, HostStream};

/// Host standard output, opened once.
pub struct Out(Option<HostStream>);

impl Out {
    /// Opens the semihosting standard output (nothing is printed if there is no host).
    pub fn open() -> Self {
        Self(hio::hstdout().ok())
    }

    /// Writes a string.
    pub fn str(&mut self, s: &str) -> &mut Self {
        if let Some(h) = self.0.as_mut() {
            let _ = h.write_all(s.as_bytes());
        }
        self
    }

    /// Writes an unsigned integer in decimal.
    pub fn u32(&mut self, mut n: u32) -> &mut Self {
        let mut buf = [0u8; 10];
        let mut i = buf.len();
        loop {
            i -= 1;
            if let Some(b) = buf.get_mut(i) {
                *b = b'0' + (n % 10) as u8;
            }
            n /= 10;
            if n == 0 || i == 0 {
                break;
            }
        }
        if let (Some(h), Some(digits)) = (self.0.as_mut(), buf.get(i..)) {
            let _ = h.write_all(digits);
        }
        self
    }

    /// Ends the line.
    pub fn nl(&mut self) -> &mut Self {
        self.str("\n")
    }
}

// Markers for the instruction-counting plugin (insncount.c): it reports the guest instructions
// executed from entering `bench_start` to entering `bench_stop`, one line per interval, in order.

/// Start marker of a counted interval.
#[unsafe(no_mangle)]
#[inline(never)]
pub extern "C" fn bench_start(id: u32) {
    black_box(id);
}

/// Stop marker of a counted interval.
#[unsafe(no_mangle)]
#[inline(never)]
pub extern "C" fn bench_stop(id: u32) {
    black_box(id.wrapping_add(1));
}

/// Runs workloads between the markers and names them.
pub struct Bench {
    intervals: u32,
}

impl Bench {
    /// No interval counted yet.
    pub const fn new() -> Self {
        Self { intervals: 0 }
    }

    /// Runs `f` between the markers and prints `bench <interval> <name> <calls>`, which
    /// ci/firmware joins with the plugin's `insncount: interval <n>: <count> instructions` lines
    /// (the plugin numbers intervals from 1 in program order). Inputs should go through
    /// `black_box` inside `f`, or the optimiser may compute them outside the interval.
    #[inline(always)]
    pub fn measure<R>(
        &mut self,
        out: &mut Out,
        name: &str,
        calls: u32,
        f: impl FnOnce() -> R,
    ) -> R {
        self.interval(out, name, calls, "", f)
    }

    /// As [`measure`](Self::measure), and the interval's instructions per call become the field
    /// `<name>=<n>` of ci/firmware's figures line (`bench <interval> <name> <calls> figure`).
    /// Fields appear in program order; a name must be unique in the run.
    #[inline(always)]
    pub fn figure<R>(&mut self, out: &mut Out, name: &str, calls: u32, f: impl FnOnce() -> R) -> R {
        self.interval(out, name, calls, " figure", f)
    }

    /// One interval of the worst-case table: `f` is a single call of the function `name` on one
    /// adversarial input; ci/firmware keeps the largest count per name
    /// (`bench <interval> <name> 1 worst`) and compares it with the committed table.
    #[inline(always)]
    pub fn worst<R>(&mut self, out: &mut Out, name: &str, f: impl FnOnce() -> R) -> R {
        self.interval(out, name, 1, " worst", f)
    }

    #[inline(always)]
    fn interval<R>(
        &mut self,
        out: &mut Out,
        name: &str,
        calls: u32,
        tag: &str,
        f: impl FnOnce() -> R,
    ) -> R {
        self.intervals += 1;
        let id = self.intervals;
        bench_start(id);
        let r = black_box(f());
        bench_stop(id);
        out.str("bench ")
            .u32(id)
            .str(" ")
            .str(name)
            .str(" ")
            .u32(calls)
            .str(tag)
            .nl();
        r
    }
}

unsafe extern "C" {
    // Provided by cortex-m-rt's link.x: the stack runs from _stack_start (top of RAM) down to
    // _stack_end (end of .bss/.uninit).
    static mut _stack_end: u32;
    static _stack_start: u32;
}
const PAINT: u32 = 0xC0FF_EE00;

/// Fills the unused stack, up to 256 bytes below the current stack pointer, with a pattern.
#[inline(never)]
pub fn paint_stack() {
    let sp = cortex_m::register::msp::read() as usize;
    let mut p = core::ptr::addr_of_mut!(_stack_end);
    while (p as usize) < sp - 256 {
        // SAFETY: the words between the end of .bss and the live stack are unused.
        unsafe {
            p.write_volatile(PAINT);
            p = p.add(1);
        }
    }
}

/// Deepest stack use since `paint_stack`, in bytes.
pub fn stack_high_water() -> u32 {
    let top = core::ptr::addr_of!(_stack_start) as usize;
    let mut p = core::ptr::addr_of!(_stack_end);
    // SAFETY: reads stay within RAM; the loop stops at the first used word.
    while unsafe { p.read_volatile() } == PAINT {
        p = unsafe { p.add(1) };
    }
    (top - p as usize) as u32
}

/// Ends the run: QEMU exits with status 0 when `ok`, 1 otherwise.
pub fn exit(ok: bool) -> ! {
    debug::exit(if ok {
        debug::EXIT_SUCCESS
    } else {
        debug::EXIT_FAILURE
    });
    loop {
        cortex_m::asm::wfi();
    }
}

/// A panic ends the run with exit status 1 (no message: formatting would cost flash, and the
/// release image is checked to contain no panic path at all).
#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    Out::open().str("PANIC").nl();
    exit(false)
}

/// A fault (for example an FPU instruction on a core without one) ends the run with exit
/// status 1 instead of hanging the emulator.
#[cortex_m_rt::exception]
unsafe fn HardFault(ef: &cortex_m_rt::ExceptionFrame) -> ! {
    Out::open().str("HardFault at pc = ").u32(ef.pc()).nl();
    exit(false)
}
