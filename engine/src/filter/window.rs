//! The divergence test: the normalised innovations of the applied pseudoranges over the
//! last [`WINDOW`] epochs against the 0.999 quantile of χ² with as many degrees of freedom,
//! and the share of pseudoranges the gate refused over the same epochs.
//!
//! For a consistent filter the innovations of sequential scalar updates are independent
//! with variance S, so Σ ν²/S over m of them is χ²(m) (Bar-Shalom, Li & Kirubarajan 2001,
//! the normalised innovation squared test \[M\]). The sum only counts applied measurements:
//! a satellite the gate refuses (a blunder, a reflection) says nothing about the filter, but
//! a filter that refuses more than half of its measurements over the window has lost track.

/// Epochs in the window.
pub const WINDOW: usize = 10;
/// Fewest applied measurements in the window before the test is made.
pub const MIN_MEASUREMENTS: u16 = 8;
/// Standard normal quantile of 0.999 (3.0902 \[C: scipy.stats.norm.ppf(0.999)\]).
const Z_999: f32 = 3.0902;

/// The 0.999 quantile of χ² with `dof` degrees of freedom by the Wilson–Hilferty cube-root
/// approximation (Wilson & Hilferty 1931): `k·(1 − 2/(9k) + z·√(2/(9k)))³`. Within 1 % of
/// scipy for 8 to 8,000 degrees of freedom (filter/window_tests.rs).
pub fn chi2_999(dof: u16) -> f32 {
    let k = f32::from(dof.max(1));
    let a = 2.0 / (9.0 * k);
    let c = 1.0 - a + Z_999 * libm::sqrtf(a);
    k * c * c * c
}

/// Per-epoch NIS sums and counts, oldest overwritten.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub(crate) struct NisWindow {
    nis: [f32; WINDOW],
    applied: [u8; WINDOW],
    gated: [u8; WINDOW],
    next: usize,
}

impl NisWindow {
    /// Records one epoch: the sum of the applied pseudoranges' NIS, how many were applied
    /// and how many the gate refused.
    pub fn push(&mut self, nis_sum: f32, applied: u8, gated: u8) {
        let i = self.next % WINDOW;
        if let (Some(n), Some(a), Some(g)) = (
            self.nis.get_mut(i),
            self.applied.get_mut(i),
            self.gated.get_mut(i),
        ) {
            *n = nis_sum;
            *a = applied;
            *g = gated;
        }
        self.next = i.saturating_add(1);
    }

    /// Whether the window shows a diverged filter.
    pub fn diverged(&self) -> bool {
        let applied: u16 = self.applied.iter().map(|&a| u16::from(a)).sum();
        let gated: u16 = self.gated.iter().map(|&g| u16::from(g)).sum();
        let nis: f32 = self.nis.iter().sum();
        if gated > applied && gated >= MIN_MEASUREMENTS {
            return true;
        }
        applied >= MIN_MEASUREMENTS && nis > chi2_999(applied)
    }
}

#[cfg(test)]
#[path = "window_tests.rs"]
mod tests;
