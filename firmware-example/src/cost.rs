//! Deterministic instruction counting under QEMU: with `-icount shift=0` every instruction
//! takes 1 ns of virtual time, and the mps2-an386 SysTick runs from the 25 MHz core clock, so
//! one tick is 40 instructions. SysTick counts down 24 bits; wraps are counted in its
//! exception. On hardware the same code counts core cycles.

use core::sync::atomic::{AtomicU32, Ordering};
use cortex_m::peripheral::syst::SystClkSource;
use cortex_m::peripheral::SYST;
use cortex_m_rt::exception;

/// Instructions per SysTick tick under `-icount shift=0` at 25 MHz.
pub const INSTRUCTIONS_PER_TICK: u64 = 40;

static WRAPS: AtomicU32 = AtomicU32::new(0);

#[exception]
fn SysTick() {
    WRAPS.fetch_add(1, Ordering::Relaxed);
}

/// Starts the counter (and waits until it runs: the first reload takes a tick).
pub fn start(mut syst: SYST) -> SYST {
    syst.set_clock_source(SystClkSource::Core);
    syst.set_reload(0x00FF_FFFF);
    syst.clear_current();
    syst.enable_interrupt();
    syst.enable_counter();
    while SYST::get_current() == 0 {}
    syst
}

/// Ticks since `start`.
pub fn ticks() -> u64 {
    loop {
        let w = WRAPS.load(Ordering::Relaxed);
        let cur = SYST::get_current();
        if WRAPS.load(Ordering::Relaxed) == w {
            return (u64::from(w) << 24) | u64::from(0x00FF_FFFF - cur);
        }
    }
}
