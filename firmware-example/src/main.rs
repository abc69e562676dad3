//! The Trackfix engine on a Cortex-M4F: one epoch with no measurements, to show the engine
//! links, fits and runs on the target. (The full replay example grows from here.)
#![no_std]
#![no_main]

use cortex_m_rt::{entry, exception, ExceptionFrame};
use cortex_m_semihosting::{debug, hprintln};
use trackfix_engine::{Config, Engine, Epoch, GnssTime};

#[entry]
fn main() -> ! {
    let mut engine: Engine<12, 32> = Engine::new(Config::default());
    let ok = GnssTime::from_week_tow(2300, 0.0)
        .ok()
        .map(Epoch::<12>::new)
        .and_then(|e| engine.process(&e).ok())
        .is_some_and(|s| s.fix().is_none());
    hprintln!("trackfix firmware example: engine ran, empty epoch gave no fix: {}", ok);
    debug::exit(if ok { debug::EXIT_SUCCESS } else { debug::EXIT_FAILURE });
    loop {}
}

#[exception]
unsafe fn HardFault(_frame: &ExceptionFrame) -> ! {
    debug::exit(debug::EXIT_FAILURE);
    loop {}
}

#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    debug::exit(debug::EXIT_FAILURE);
    loop {}
}
