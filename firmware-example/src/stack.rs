//! Stack high-water mark: paint the free stack with a pattern at start, find the lowest
//! overwritten word at the end.

const PAINT: u32 = 0x5AFE_C0DE;

extern "C" {
    static __sheap: u32;
    static _stack_start: u32;
}

fn bounds() -> (usize, usize) {
    // Only the addresses of the linker symbols are taken, never their contents.
    (
        core::ptr::addr_of!(__sheap) as usize,
        core::ptr::addr_of!(_stack_start) as usize,
    )
}

/// Paints from the end of static RAM up to 256 bytes below the current stack pointer.
pub fn paint() {
    let (bottom, _) = bounds();
    let sp = cortex_m::register::msp::read() as usize;
    let mut p = bottom;
    while p + 4 <= sp.saturating_sub(256) {
        // SAFETY: [bottom, sp − 256) is free stack: nothing lives there yet.
        unsafe { core::ptr::write_volatile(p as *mut u32, PAINT) };
        p += 4;
    }
}

/// Deepest stack use since `paint`, bytes.
pub fn high_water() -> usize {
    let (bottom, top) = bounds();
    let mut p = bottom;
    // SAFETY: reading the painted region.
    while p < top && unsafe { core::ptr::read_volatile(p as *const u32) } == PAINT {
        p += 4;
    }
    top - p
}

/// Stack size available (end of statics to top of RAM), bytes.
pub fn capacity() -> usize {
    let (bottom, top) = bounds();
    top - bottom
}
