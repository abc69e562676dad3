//! A defmt global logger over semihosting, written without a single panic path (the
//! ready-made ones panic on re-entry, which would defeat the panic-free link check). This
//! firmware logs from thread mode only, so re-entry cannot happen; if it did, the nested
//! message would be dropped.

use core::cell::RefCell;
use core::sync::atomic::{AtomicBool, Ordering};
use cortex_m_semihosting::hio::{self, HostStream};
use critical_section::Mutex;

#[defmt::global_logger]
struct SemihostingLogger;

static TAKEN: AtomicBool = AtomicBool::new(false);
static STATE: Mutex<RefCell<(defmt::Encoder, Option<HostStream>)>> =
    Mutex::new(RefCell::new((defmt::Encoder::new(), None)));

fn with_state(f: impl FnOnce(&mut defmt::Encoder, &mut HostStream)) {
    critical_section::with(|cs| {
        if let Ok(mut st) = STATE.borrow(cs).try_borrow_mut() {
            let (enc, out) = &mut *st;
            if out.is_none() {
                *out = hio::hstdout().ok();
            }
            if let Some(o) = out.as_mut() {
                f(enc, o);
            }
        }
    });
}

fn put(out: &mut HostStream, bytes: &[u8]) {
    let _ = out.write_all(bytes);
}

// SAFETY (trait contract): acquire/release are paired by defmt's macros; `TAKEN` makes a
// nested acquire a no-op instead of corrupting the frame.
unsafe impl defmt::Logger for SemihostingLogger {
    fn acquire() {
        if TAKEN.swap(true, Ordering::Acquire) {
            return;
        }
        with_state(|enc, out| enc.start_frame(|b| put(out, b)));
    }

    unsafe fn flush() {}

    unsafe fn release() {
        with_state(|enc, out| enc.end_frame(|b| put(out, b)));
        TAKEN.store(false, Ordering::Release);
    }

    unsafe fn write(bytes: &[u8]) {
        with_state(|enc, out| enc.write(bytes, |b| put(out, b)));
    }
}
