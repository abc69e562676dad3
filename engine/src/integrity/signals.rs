//! What the signals themselves say: reflections (C/N0 far below what the elevation leads to
//! expect) and the interference and spoofing indicators that look at all satellites at
//! once. docs/integrity.md names the published method behind each.

use crate::config::IntegrityConfig;
use crate::frames::{norm, sub};
use crate::measurements::observation::Observation;
use crate::measurements::record::Measurement;

/// How much a line-of-sight signal gains from the horizon to the zenith, dB: the gain
/// pattern of a tracker's patch antenna and the longer path through the atmosphere at low
/// elevation, about 10–15 dB in total (from memory; common practice). The expectation is
/// relative: each epoch's satellites set the receiver's own level.
const ZENITH_GAIN_DB: f32 = 12.0;

/// Fewest satellites with C/N0 for an epoch-wide judgement (a median, a mean, a spread).
const MIN_SATS: usize = 4;

/// Fewest satellites for the uniform-C/N0 indicator: a few genuine signals can be alike by
/// chance.
const MIN_UNIFORM_SATS: usize = 6;

/// A measurement's C/N0 (from its observation in `obs`) less what a line-of-sight signal
/// gains at its elevation seen from `at` (ECEF, m), with `up` the unit vertical there;
/// `None` without a usable C/N0.
fn excess(m: &Measurement, obs: &[Observation], at: [f64; 3], up: [f32; 3]) -> Option<f32> {
    let c = obs
        .get(m.index)?
        .cn0_dbhz
        .filter(|c| c.is_finite() && *c > 0.0)?;
    // The difference in f64, the rest in f32 (2 m in 20,000 km is nothing here); the
    // pseudorange stands in for the range: a receiver clock error of even a millisecond
    // (300 km) moves sin(E) by under 2 %, nothing for a C/N0 expectation.
    let d = sub(m.sat.pos, at).map(|x| x as f32);
    let sin_el = (d[0] * up[0] + d[1] * up[1] + d[2] * up[2]) / m.sat.pr_m as f32;
    Some(c - ZENITH_GAIN_DB * sin_el.max(0.0))
}

/// Marks as reflections the measurements whose C/N0 lies more than the configured margin
/// below the epoch's level (the lower median of every satellite's C/N0 less its elevation
/// gain) at their elevation, seen from `at` (ECEF, m; the last fix), and multiplies their
/// σ factor. Returns how many. O(n²) comparisons for the median, no sorting code.
#[inline(never)]
pub(crate) fn mark_reflections(
    meas: &mut [Measurement],
    obs: &[Observation],
    at: [f64; 3],
    cfg: &IntegrityConfig,
) -> u8 {
    let r = norm(at);
    if r < 6.0e6 || cfg.reflection_sigma_factor <= 1.0 {
        return 0;
    }
    // Geocentric up: within 0.2° of the ellipsoid's normal, ample for a C/N0 expectation.
    let up = at.map(|x| (x / r) as f32);
    // Each satellite's excess once (up to 32), then their lower median.
    let mut values = [0.0f32; 32];
    let mut n = 0usize;
    for (v, e) in values
        .iter_mut()
        .zip(meas.iter().filter_map(|m| excess(m, obs, at, up)))
    {
        *v = e;
        n = n.saturating_add(1);
    }
    let values = values.get(..n).unwrap_or(&[]);
    if n < MIN_SATS {
        return 0;
    }
    let Some(level) = crate::linalg::lower_median(values) else {
        return 0;
    };
    let limit = level - cfg.reflection_margin_db as f32;
    let mut count = 0u8;
    for m in meas.iter_mut() {
        if excess(m, obs, at, up).is_some_and(|e| e < limit) {
            m.sat.reflection = true;
            m.sat.cn0_factor *= cfg.reflection_sigma_factor as f32;
            count = count.saturating_add(1);
        }
    }
    count
}

/// The mean and the spread (largest minus smallest) of the C/N0 values, with their number.
pub(crate) fn cn0_mean_spread(values: impl Iterator<Item = f32>) -> (f32, f32, usize) {
    let (mut sum, mut lo, mut hi, mut n) = (0.0f32, f32::INFINITY, f32::NEG_INFINITY, 0usize);
    for v in values.filter(|v| v.is_finite() && *v > 0.0) {
        sum += v;
        lo = lo.min(v);
        hi = hi.max(v);
        n = n.saturating_add(1);
    }
    if n == 0 {
        return (f32::NAN, f32::NAN, 0);
    }
    (sum / n as f32, hi - lo, n)
}

/// Whether the C/N0 spread of `n` satellites is suspiciously small.
pub(crate) fn uniform(spread_db: f32, n: usize, cfg: &IntegrityConfig) -> bool {
    n >= MIN_UNIFORM_SATS && spread_db < cfg.uniform_cn0_db as f32
}

/// Whether a drop of the mean C/N0 over `n` satellites is jamming.
pub(crate) fn jammed(drop_db: f32, n: usize, cfg: &IntegrityConfig) -> bool {
    n >= MIN_SATS && drop_db > cfg.jamming_drop_db as f32
}

/// Whether a receiver clock re-seat of `shift_m` is not a whole millisecond step (to within
/// 300 m, the bias a clock drift of up to 1 ppm adds over a second plus the prediction's
/// spread): whole-millisecond steps are the receiver steering its clock, a receiver event.
pub(crate) fn odd_clock_jump(shift_m: f64) -> bool {
    const MS_M: f64 = crate::sat::SPEED_OF_LIGHT * 1e-3;
    let ms = libm::floor(shift_m / MS_M + 0.5);
    (shift_m - ms * MS_M).abs() > 300.0
}

/// Margin of [`too_fast`] for the error of two fixes, m (a few times a snapshot fix's 95 %
/// error in a street canyon).
const JUMP_MARGIN_M: f64 = 200.0;

/// Whether moving `moved_m` in `dt_s` seconds is beyond the configured top speed (plus a
/// margin for the error of the two fixes).
pub(crate) fn too_fast(moved_m: f64, dt_s: f64, cfg: &IntegrityConfig) -> bool {
    moved_m > cfg.max_speed_mps * dt_s.max(0.0) + JUMP_MARGIN_M
}
