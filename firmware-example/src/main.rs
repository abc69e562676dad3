//! The Trackfix engine on a Cortex-M4F, shaped like tracker firmware: a measurement source
//! decodes the receiver's byte stream, the engine turns each epoch into a solution, the
//! solution goes to an application hook, and the tracker sleeps between fixes.
//!
//! Here the UART replays frames embedded at build time (recorded and synthetic epochs, made
//! by `trackfix frames`), and the output lines are compared with a host run of the same
//! frames by `cargo xtask test`. Each epoch also reports its instruction cost; at the end the
//! stack high-water mark is printed.
#![no_std]
#![no_main]

mod cost;
mod logger;
mod power;
mod source;
mod stack;
mod uart;

use cortex_m_rt::{entry, exception, ExceptionFrame};
use cortex_m_semihosting::debug;
use power::{DelaySleep, LowPower, NoDelay};
use source::{MeasurementSource, SourceError};
use trackfix_engine::wire::{buffer_for, Message};
use trackfix_engine::{Engine, Epoch, FixOutcome, Solution};
use uart::ReplayUart;

/// Observations per epoch.
#[cfg(not(feature = "n24"))]
const N: usize = 12;
/// Observations per epoch.
#[cfg(feature = "n24")]
const N: usize = 24;
/// Ephemeris slots: four more than the 12 observations an epoch carries; the store replaces
/// the record with the oldest toe when full. 16 rather than 24 since the navigation filter
/// took 1 KiB of static RAM and 1.6 KiB more stack (see docs/firmware.md).
const EPH: usize = 16;
/// Frame buffer for epochs of `N` observations.
const B: usize = buffer_for(N);

/// The frame stream the UART replays (see build.rs).
static FRAMES: &[u8] = include_bytes!(concat!(env!("OUT_DIR"), "/frames.bin"));

/// The application's side: what the tracker does with each solution.
trait FixSink<const N: usize> {
    fn on_solution(&mut self, index: u32, epoch: &Epoch<N>, solution: &Solution<N>);
}

/// Logs each solution in the line format the host comparison reads.
struct LogSink;

impl<const N: usize> FixSink<N> for LogSink {
    fn on_solution(&mut self, k: u32, epoch: &Epoch<N>, sol: &Solution<N>) {
        match &sol.outcome {
            FixOutcome::Fix(f) => {
                defmt::println!(
                    "FIX {=u32} {=usize} {=u8} {=u64} {=u64} {=u64}",
                    k,
                    epoch.obs.len(),
                    f.used,
                    f.ecef_m[0].to_bits(),
                    f.ecef_m[1].to_bits(),
                    f.ecef_m[2].to_bits()
                );
                // The integrity state and the bits of the protection level.
                defmt::println!(
                    "INTEGRITY {=u32} {=u8} {=u32}",
                    k,
                    sol.integrity.state as u8,
                    sol.integrity.hpl_m.map_or(0, f32::to_bits)
                );
            }
            FixOutcome::NoFix(reason) => {
                defmt::println!("NOFIX {=u32} {=usize}", k, epoch.obs.len());
                defmt::info!("no fix: {}", reason);
            }
        }
    }
}

/// The satellite-state stage alone (ephemeris evaluation at transmit time, as the engine
/// does it), measured separately so each stage's cost shows.
fn satellite_states<const N: usize, const E: usize>(engine: &Engine<N, E>, epoch: &Epoch<N>) {
    for o in &epoch.obs {
        if let Some(s) = engine.store().get(o.sat) {
            core::hint::black_box(s.state_at_transmit(epoch.time, o.pseudorange_m));
        }
    }
}

fn exit(ok: bool) -> ! {
    debug::exit(if ok {
        debug::EXIT_SUCCESS
    } else {
        debug::EXIT_FAILURE
    });
    #[expect(
        clippy::empty_loop,
        reason = "semihosting exit does not return under QEMU; on a board this parks the core"
    )]
    loop {}
}

#[entry]
fn main() -> ! {
    stack::paint();
    let Some(cp) = cortex_m::Peripherals::take() else {
        exit(false)
    };
    let _syst = cost::start(cp.SYST);
    let Some(engine) = cortex_m::singleton!(: Engine<N, EPH> = Engine::with_defaults()) else {
        exit(false)
    };
    let Some(source) = cortex_m::singleton!(: MeasurementSource<ReplayUart, N, B> = MeasurementSource::new(ReplayUart::new(FRAMES)))
    else {
        exit(false)
    };
    let mut sink = LogSink;
    let mut power = DelaySleep(NoDelay);
    defmt::println!(
        "START N={=usize} EPH={=usize} frames={=usize} bytes",
        N,
        EPH,
        FRAMES.len()
    );
    let mut k = 0u32;
    loop {
        match source.poll() {
            Ok(Message::Ephemeris(e)) => {
                if let Err(err) = engine.ingest_ephemeris(e) {
                    defmt::warn!("ephemeris refused: {}", err);
                }
            }
            Ok(Message::Ionosphere(i)) => {
                if let Err(err) = engine.set_ionosphere(i) {
                    defmt::warn!("ionosphere refused: {}", err);
                }
            }
            Ok(Message::Epoch(epoch)) => {
                let t0 = cost::ticks();
                satellite_states(engine, &epoch);
                let t1 = cost::ticks();
                let result = engine.process(&epoch);
                let t2 = cost::ticks();
                match result {
                    Ok(sol) => sink.on_solution(k, &epoch, &sol),
                    Err(e) => defmt::warn!("epoch refused: {}", e),
                }
                defmt::println!(
                    "COST {=u32} {=usize} {=u64} {=u64}",
                    k,
                    epoch.obs.len(),
                    (t1 - t0) * cost::INSTRUCTIONS_PER_TICK,
                    (t2 - t1) * cost::INSTRUCTIONS_PER_TICK
                );
                k += 1;
                // A tracker sleeps here until its next fix is due.
                power.sleep_s(60);
            }
            Err(nb::Error::WouldBlock) => {}
            Err(nb::Error::Other(SourceError::Frame(e))) => defmt::warn!("frame dropped: {}", e),
            Err(nb::Error::Other(SourceError::Uart(_))) => break,
        }
    }
    let st = source.stats();
    defmt::println!(
        "STACK {=usize} {=usize}",
        stack::high_water(),
        stack::capacity()
    );
    defmt::println!("DONE {=u32} {=u32} {=u32}", k, st.frames, st.dropped);
    exit(true)
}

#[exception]
unsafe fn HardFault(_frame: &ExceptionFrame) -> ! {
    exit(false)
}

#[cfg(not(feature = "panic-check"))]
#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    defmt::error!("panic");
    exit(false)
}

#[cfg(feature = "panic-check")]
#[panic_handler]
fn panic(_: &core::panic::PanicInfo) -> ! {
    extern "Rust" {
        /// Never defined: linking fails if any panic path survives optimisation.
        fn trackfix_panic_path_is_reachable() -> !;
    }
    // SAFETY: never called in a successful link; the symbol does not exist.
    unsafe { trackfix_panic_path_is_reachable() }
}
