//! Waiting between duty-cycled fixes, behind a small trait the integrator implements with
//! the board's deepest sleep that keeps the RTC (and, ideally, the receiver's hot-start
//! state) alive.

use embedded_hal::delay::DelayNs;

/// Puts the tracker to sleep until the next fix is due.
pub trait LowPower {
    /// Sleeps for about `seconds`.
    fn sleep_s(&mut self, seconds: u32);
}

/// A `LowPower` built on any `embedded-hal` delay (a busy or WFI-based wait).
pub struct DelaySleep<D: DelayNs>(pub D);

impl<D: DelayNs> LowPower for DelaySleep<D> {
    fn sleep_s(&mut self, seconds: u32) {
        for _ in 0..seconds {
            self.0.delay_ms(1000);
        }
    }
}

/// The replay's delay: returns at once, so the emulator replays as fast as it can and
/// instruction counts measure only the engine.
pub struct NoDelay;

impl DelayNs for NoDelay {
    fn delay_ns(&mut self, _ns: u32) {}
}
