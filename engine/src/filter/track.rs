//! The filter as a pipeline stage. While it tracks, it replaces the least-squares solution:
//! the epoch's corrections are computed at the predicted position and each pseudorange and
//! Doppler updates the state directly, so a tracked epoch costs no least-squares iteration.
//! A least-squares fix starts it, and starts it again after a gap, a divergence or a long
//! outage.
//!
//! One epoch while tracking, in order:
//! 1. predict across the gap since the last epoch (the held profile while held and the gap
//!    is short; a gap beyond `filter.max_gap_s` ends tracking);
//! 2. corrections at the predicted position, and each pseudorange's innovation;
//! 3. **clock event**: when the median innovation exceeds five σ of the predicted clock and
//!    position plus 30 m, the receiver clock jumped (a whole-millisecond step of a steering
//!    receiver, or the new clock of a wake-up): the clock bias is re-seated at the predicted
//!    bias plus that median, and the position kept (common practice);
//! 4. sequential scalar updates, each gated by its χ²(1) statistic: pseudorange
//!    `h(x) = |s − p| + b + isb(system) − c·dt_sat + delay` with the satellite rotated for
//!    the Earth's rotation during the flight, then its range rate
//!    `h(x) = u·(v_sat − v) + ḃ − ḋ_sat`;
//! 5. **release** of a held position when those innovations show motion (see
//!    [`super::hold`]), else the zero-velocity updates while held;
//! 6. the stationary detector, and the divergence test over the window (see
//!    [`super::window`]);
//! 7. no pseudorange applied: a predicted fix, for at most `filter.max_coast_s` since the
//!    last update.

use super::hold::{
    shows_motion, Stillness, HELD_PROFILE, RELEASE_SIGMA_MPS, ZERO_VELOCITY_SIGMA_MPS,
};
use super::report::{report, Report};
use super::state::{VEL_X, VEL_Y, VEL_Z};
use super::window::NisWindow;
use super::{Batch, FilterState, FixPrior, MeasurementRow, ProcessNoise};
use crate::config::Config;
use crate::corrections::iono::IonoCoefficients;
use crate::corrections::site::Site;
use crate::frames::{dot, sub};
use crate::measurements::record::{Candidate, Fate, Measurement, Outcome};
use crate::solution::{FilterEvent, Fix, FixSource};
use crate::time::GnssTime;
use heapless::Vec;

/// What the engine keeps of the filter between epochs.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) struct Tracked {
    state: FilterState,
    /// Time of the state.
    time: GnssTime,
    /// Last epoch whose pseudoranges updated the state.
    updated: GnssTime,
    still: Stillness,
    window: NisWindow,
}

impl Tracked {
    /// The filter's position, ECEF, m.
    pub fn position(&self) -> [f64; 3] {
        self.state.position()
    }
}

/// The epoch's inputs besides the candidates.
pub(crate) struct Context<'a> {
    pub cfg: &'a Config,
    pub iono: Option<&'a IonoCoefficients>,
    /// GPS time of week of the epoch, s.
    pub tow_s: f64,
    pub time: GnssTime,
}

/// What the filter noticed at an epoch besides its fix, for the integrity indicators.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub(crate) struct Notes {
    /// What it did besides its usual step.
    pub event: FilterEvent,
    /// The receiver clock re-seat, m (0 when none).
    pub clock_shift_m: f64,
    /// Time since the previous epoch, s.
    pub dt_s: f64,
    /// A held asset's pseudoranges showed motion while its Dopplers (at least four) showed
    /// none: their spread statistic and its degrees of freedom.
    pub moved_without_doppler: Option<(f32, u8)>,
}

/// A tracked epoch between its prediction and its update: the site of the corrections and
/// what happened so far.
pub(crate) struct Predicted<'a> {
    site: Site<'a>,
    /// Pseudoranges the gate refused.
    gated: u8,
    notes: Notes,
}

impl Predicted<'_> {
    /// The local frame at the predicted position.
    pub fn frame(&self) -> &crate::frames::LocalFrame {
        &self.site.frame
    }
}

/// The first half of a tracked epoch: predicts across the gap, computes the corrections at
/// the predicted position and each pseudorange's innovation (into `residual_m`), re-seats
/// the clock on a clock event, and gates each innovation (the ones that pass stay pending).
/// The engine then runs the residual test on the pending innovations and calls [`update`].
// Not inlined: its frame and the least-squares one are never on the stack together
// (docs/firmware.md).
#[inline(never)]
pub(crate) fn predict<'a>(
    tracked: &mut Option<Tracked>,
    ctx: &Context<'a>,
    meas: &mut [Measurement],
) -> Result<Predicted<'a>, FilterEvent> {
    let Some(tr) = tracked.as_mut() else {
        return Err(FilterEvent::Started);
    };
    let dt = ctx.time.since(tr.time).as_secs_f64();
    let f = &ctx.cfg.filter;
    let noise = ProcessNoise {
        motion: if tr.still.held() {
            HELD_PROFILE
        } else {
            f.motion
        },
        clock: f.clock,
        isb_psd: f.isb_psd,
    };
    if tr.state.predict(dt, f.max_gap_s, &noise).is_err() {
        *tracked = None;
        return Err(FilterEvent::RestartedAfterGap);
    }
    tr.time = ctx.time;

    let site = Site::new(ctx.cfg, ctx.iono, ctx.tow_s, tr.state.position());
    let mut innovations: Vec<f64, 32> = Vec::new();
    for m in meas.iter_mut() {
        let (c, o) = (&m.sat, &mut m.out);
        let kept = o.excluded();
        *o = Outcome::default();
        let Some((u, rho)) = c.line_of_sight(tr.state.position()) else {
            o.fate = Fate::Masked;
            continue;
        };
        let k = site.apply(c.sat_input(), u);
        o.correct(&k);
        o.row = [-u[0], -u[1], -u[2]];
        o.residual_m = pseudorange_innovation(&tr.state, c, o, rho);
        if kept && !o.masked() {
            o.fate = Fate::KeptOut;
        }
        if !o.masked() {
            let _ = innovations.push(o.residual_m);
        }
    }
    let shift = reseat_on_clock_event(&mut tr.state, &innovations);
    for m in meas.iter_mut() {
        m.out.residual_m -= shift;
    }
    let gated = gate_all(&tr.state, meas, ctx.cfg);
    Ok(Predicted {
        site,
        gated,
        notes: Notes {
            event: if shift != 0.0 {
                FilterEvent::ClockReseated
            } else {
                FilterEvent::None
            },
            clock_shift_m: shift,
            dt_s: dt,
            moved_without_doppler: None,
        },
    })
}

/// The second half of a tracked epoch: updates with the pseudoranges and range rates still
/// pending (gated and tested before), then the hold, the divergence test and the fix,
/// written into `out` (in place: a fix is half a kilobyte). `Err` when tracking ended.
#[inline(never)]
pub(crate) fn update(
    tracked: &mut Option<Tracked>,
    ctx: &Context<'_>,
    meas: &mut [Measurement],
    predicted: Predicted<'_>,
    out: &mut Result<Fix, crate::solution::NoFixReason>,
) -> Result<Notes, FilterEvent> {
    let Some(tr) = tracked.as_mut() else {
        return Err(FilterEvent::Started);
    };
    let Predicted {
        site,
        gated,
        mut notes,
    } = predicted;
    let dt = notes.dt_s;
    let f = &ctx.cfg.filter;
    let held = tr.still.held();
    let mut tally = update_all(&mut tr.state, meas, ctx.cfg, held.then_some(dt));
    tally.gated = gated;
    if held && tally.motion {
        tr.still = Stillness::Moving;
        notes.event = FilterEvent::HoldReleased;
        notes.moved_without_doppler = tally.ranges_only;
    }
    let [vx, vy, vz] = tr.state.velocity();
    let vc = tr.state.velocity_cov();
    let sigma = libm::sqrt(vc[0][0].max(vc[1][1]).max(vc[2][2]));
    let speed = libm::sqrt(vx * vx + vy * vy + vz * vz);
    if tally.applied > 0 {
        tr.updated = ctx.time;
        tr.still = tr.still.after(f, ctx.time, speed, sigma);
    }
    tr.window
        .push(tally.nis_sum as f32, tally.tested, tally.gated);
    if tr.window.diverged() {
        *tracked = None;
        return Err(FilterEvent::RestartedDiverged);
    }
    let source = match (tally.applied, tr.still.held()) {
        (0, _) => FixSource::Predicted,
        (_, true) => FixSource::Held,
        (_, false) => FixSource::Filtered,
    };
    if tally.applied == 0 && ctx.time.since(tr.updated).as_secs_f64() > f.max_coast_s {
        *tracked = None;
        return Err(FilterEvent::CoastEnded);
    }
    let fix = report(&Report {
        state: &tr.state,
        source,
        used: tally.applied,
        rates_used: tally.rates,
        nis_sum: tally.nis_sum,
        meas,
        iono_applied: site.iono_applied(),
        ure_sigma_m: f.ure_sigma_m,
        site: &site,
    });
    match fix {
        Some(fix) if fix_plausible(&fix, ctx.cfg) => {
            *out = Ok(fix);
            Ok(notes)
        }
        _ => {
            *tracked = None;
            Err(FilterEvent::RestartedDiverged)
        }
    }
}

/// Whether the filtered position lies within the configured height span.
fn fix_plausible(fix: &Fix, cfg: &Config) -> bool {
    let (lo, hi) = cfg.snapshot.height_span_m;
    (lo..=hi).contains(&fix.geodetic.height_m)
}

/// Starts the filter in `tracked` from a least-squares fix (written in place: the state is
/// a kilobyte): position and clocks with the fix's largest position variance (at least
/// 1 m²), the Doppler velocity and drift when the fix has them, else zero ± 30 m/s and
/// zero ± 300 m/s (a TCXO's ±1 ppm). `None` when the fix cannot start a filter.
#[inline(never)]
pub(crate) fn start(tracked: &mut Option<Tracked>, fix: &Fix, t: GnssTime) {
    *tracked = None;
    let c = fix.covariance_enu_m2;
    let pos_var = (c[0][0].max(c[1][1]).max(c[2][2])).max(1.0);
    let (velocity, vel_var, drift, drift_var) = match fix.velocity {
        Some(v) => {
            let vc = v.covariance_enu_m2s2;
            let var = vc[0][0].max(vc[1][1]).max(vc[2][2]).max(1e-4);
            (v.ecef_mps, var, v.clock_drift_mps, 4.0 * var)
        }
        None => ([0.0; 3], 900.0, 0.0, 9e4),
    };
    let gps = fix.system_clock_m[0].unwrap_or(fix.clock_bias_m);
    let isb = |k: usize| {
        fix.system_clock_m
            .get(k)
            .copied()
            .flatten()
            .map_or(0.0, |b| b - gps)
    };
    let Ok(state) = FilterState::from_fix(&FixPrior {
        position_m: fix.ecef_m,
        position_var_m2: pos_var,
        velocity_mps: velocity,
        velocity_var_m2ps2: vel_var,
        clock_bias_m: gps,
        clock_bias_var_m2: 4.0 * pos_var,
        clock_drift_mps: drift,
        clock_drift_var_m2ps2: drift_var,
        isb_m: [isb(1), isb(2)],
        isb_var_m2: 100.0,
    }) else {
        return;
    };
    *tracked = Some(Tracked {
        state,
        time: t,
        updated: t,
        still: Stillness::Moving,
        window: NisWindow::default(),
    });
}

/// Re-seats the clock bias when the median innovation exceeds what the prediction allows
/// (see the module documentation). Returns the shift of the bias, m (0 when none).
fn reseat_on_clock_event(state: &mut FilterState, innovations: &[f64]) -> f64 {
    let p = state.position_cov();
    let spread = state.clock_cov()[0][0] + p[0][0] + p[1][1] + p[2][2];
    let limit = 5.0 * libm::sqrt(spread) + 30.0;
    // The median cannot exceed the limit unless some innovation does: most epochs stop here
    // without the O(n²) median.
    if innovations.iter().all(|v| v.abs() <= limit) {
        return 0.0;
    }
    let Some(m) = crate::linalg::lower_median(innovations) else {
        return 0.0;
    };
    if m.abs() <= limit {
        return 0.0;
    }
    let (b, drift) = state.clock();
    let drift_var = state.clock_cov()[1][1];
    let var = 900.0 + p[0][0] + p[1][1] + p[2][2];
    match state.reseat_clock(b + m, var, drift, drift_var) {
        Ok(()) => m,
        Err(_) => 0.0,
    }
}

/// What the update of an epoch did.
struct Tally {
    /// Pseudoranges applied.
    applied: u8,
    /// Pseudoranges the gate refused.
    gated: u8,
    /// Range rates applied.
    rates: u8,
    /// Measurements in the batch (pseudoranges, range rates, zero-velocity rows).
    tested: u8,
    /// The batch's joint NIS.
    nis_sum: f64,
    /// A held asset's innovations show motion (its velocity was freed).
    motion: bool,
    /// Only its pseudoranges did (their spread and its dof): its range rates (at least
    /// four) showed none.
    ranges_only: Option<(f32, u8)>,
}

/// The weighted spread of innovations about their weighted mean, `Σ w ν² − (Σ w ν)²/Σ w`,
/// leaving out the innovation of largest `w ν²`: χ² with n − 2 degrees of freedom when they
/// differ only by noise and a common offset (the clock bias or drift), whatever that offset
/// (common practice: a residual test with the common mode removed). Leaving the largest out
/// keeps one faulty or reflected satellite from releasing a hold (catching it is the
/// integrity stage's task), where an asset that moved shows in all of them.
#[derive(Default)]
struct Spread {
    w: f64,
    wn: f64,
    wn2: f64,
    n: u16,
    /// The largest `w ν²` so far, with its `w` and `w ν`, in single precision (they are
    /// only taken out of the sums again: a relative 1e-7 of the largest term, and 12 bytes
    /// less on the filter's deepest frame).
    largest: (f32, f32, f32),
}

impl Spread {
    /// Adds an innovation of weight `w = 1/R`.
    fn add(&mut self, innovation: f64, w: f64) {
        let (wn, wn2) = (w * innovation, w * innovation * innovation);
        self.w += w;
        self.wn += wn;
        self.wn2 += wn2;
        self.n = self.n.saturating_add(1);
        if wn2 > f64::from(self.largest.0) {
            self.largest = (wn2 as f32, w as f32, wn as f32);
        }
    }

    /// The spread without the largest and its degrees of freedom, n − 2.
    fn statistic(&self) -> (f32, u8) {
        let (l2, lw, ln) = self.largest;
        let (l2, lw, ln) = (f64::from(l2), f64::from(lw), f64::from(ln));
        let (w, wn) = (self.w - lw, self.wn - ln);
        let x = if w > 0.0 {
            self.wn2 - l2 - wn * wn / w
        } else {
            0.0
        };
        (
            x as f32,
            u8::try_from(self.n.saturating_sub(2)).unwrap_or(u8::MAX),
        )
    }

    /// Whether the spread without the largest exceeds the 0.999 quantile of χ²(n − 2);
    /// `None` below three values. (`n` is also how many values it holds.)
    fn shows_motion(&self) -> Option<bool> {
        let (x, k) = self.statistic();
        (self.n >= 3).then(|| shows_motion(f64::from(x), u16::from(k)))
    }
}

/// Gates each pending pseudorange and range rate on its own innovation (χ²(1) against the
/// prior `S = hᵀPh + R`), marking the refused pseudoranges [`Fate::Gated`] and keeping each
/// range rate's innovation. A range rate that fails its gate marks its satellite as a
/// reflection and widens its pseudorange's σ by the configured factor (a reflected path's
/// Doppler differs from the direct one's). Returns how many pseudoranges were refused.
#[inline(never)]
fn gate_all(state: &FilterState, meas: &mut [Measurement], cfg: &Config) -> u8 {
    let gate = cfg.filter.gate;
    let mut gated = 0u8;
    for m in meas.iter_mut().filter(|m| m.out.fate == Fate::Pending) {
        let (c, o) = (&mut m.sat, &mut m.out);
        let u = [-o.row[0], -o.row[1], -o.row[2]];
        if let Some(rate) = c.range_rate_mps {
            let nu = rate - predicted_rate(state, c, u);
            let s = doppler_sigma(cfg, c);
            let nis = nu * nu / state.innovation_variance(&MeasurementRow::range_rate(u), s * s);
            o.rate_innovation_mps = Some(nu as f32);
            // NaN fails the gate too.
            o.rate_gated = nis.is_nan() || nis > gate;
            if o.rate_gated && !c.reflection {
                c.reflection = true;
                o.sigma_m *= cfg.integrity.reflection_sigma_factor;
            }
        }
        let r = range_variance(cfg, c, o);
        let row = MeasurementRow::pseudorange(u, c.system());
        let nu = o.residual_m;
        let nis = nu * nu / state.innovation_variance(&row, r);
        // NaN (a zero S) fails the gate too.
        if nis.is_nan() || nis > gate {
            o.fate = Fate::Gated { nis: nis as f32 };
            gated = gated.saturating_add(1);
        }
    }
    gated
}

/// Applies the pending pseudoranges (gated and tested before) and the range rates that
/// passed their gate in one batch (with zero-velocity rows while held and still), and
/// records in each measurement what became of it. `held` is the time since the last epoch,
/// s, when the position is held.
#[inline(never)]
fn update_all(
    state: &mut FilterState,
    meas: &mut [Measurement],
    cfg: &Config,
    held: Option<f64>,
) -> Tally {
    let mut batch = Batch::new();
    let (mut ranges, mut rates) = (Spread::default(), Spread::default());
    let mut t = Tally {
        applied: 0,
        gated: 0,
        rates: 0,
        tested: 0,
        nis_sum: 0.0,
        motion: false,
        ranges_only: None,
    };
    for m in meas
        .iter_mut()
        .filter(|m| matches!(m.out.fate, Fate::Pending | Fate::Gated { .. }))
    {
        let (c, o) = (&m.sat, &mut m.out);
        let u = [-o.row[0], -o.row[1], -o.row[2]];
        let r = range_variance(cfg, c, o);
        let nu = o.residual_m;
        let w = 1.0 / r;
        if held.is_some() {
            ranges.add(nu, w);
        }
        let row = MeasurementRow::pseudorange(u, c.system());
        if o.fate != Fate::Pending || batch.add_weighted(&row, nu, w).is_err() {
            o.rate_innovation_mps = None;
            continue;
        }
        o.fate = Fate::Used;
        t.applied = t.applied.saturating_add(1);
        let Some(nu) = o.rate_innovation_mps.map(f64::from) else {
            continue;
        };
        let s = doppler_sigma(cfg, c);
        let w = 1.0 / (s * s);
        if held.is_some() {
            rates.add(nu, w);
        }
        if o.rate_gated
            || batch
                .add_weighted(&MeasurementRow::range_rate(u), nu, w)
                .is_err()
        {
            o.rate_innovation_mps = None;
            continue;
        }
        t.rates = t.rates.saturating_add(1);
    }
    if let Some(dt) = held {
        let by_rates = rates.shows_motion().unwrap_or(false);
        t.motion = by_rates || ranges.shows_motion().unwrap_or(false);
        if t.motion && !by_rates && rates.n >= 4 {
            t.ranges_only = Some(ranges.statistic());
        }
        if t.motion {
            let moved = RELEASE_SIGMA_MPS * dt.max(1.0);
            let _ = state.free_velocity(RELEASE_SIGMA_MPS * RELEASE_SIGMA_MPS);
            let _ = state.widen_position(moved * moved);
        } else {
            zero_velocity(&mut batch, state);
        }
    }
    t.tested = u8::try_from(batch.count()).unwrap_or(u8::MAX);
    match state.apply(&batch) {
        Ok(nis) => t.nis_sum = nis,
        Err(_) => {
            for m in meas.iter_mut() {
                if m.out.used() {
                    m.out.fate = Fate::Pending;
                }
                m.out.rate_innovation_mps = None;
            }
            t.applied = 0;
            t.rates = 0;
        }
    }
    t
}

/// Zero-velocity measurements on the three axes while held.
fn zero_velocity(batch: &mut Batch, state: &FilterState) {
    for k in [VEL_X, VEL_Y, VEL_Z] {
        let v = state.x().get(k).copied().unwrap_or(0.0);
        let row = MeasurementRow::single(k, 1.0);
        let _ = batch.add(&row, -v, ZERO_VELOCITY_SIGMA_MPS * ZERO_VELOCITY_SIGMA_MPS);
    }
}

/// The filter's pseudorange variance (see [`Outcome::test_variance`]).
fn range_variance(cfg: &Config, c: &Candidate, o: &Outcome) -> f64 {
    o.test_variance(cfg.filter.ure_sigma_m, reflection_scale(cfg, c))
}

/// The square of the reflection factor for a suspected reflection, else 1.
pub(crate) fn reflection_scale(cfg: &Config, c: &Candidate) -> f64 {
    let f = cfg.integrity.reflection_sigma_factor;
    if c.reflection {
        f * f
    } else {
        1.0
    }
}

/// σ of a range rate: the configured Doppler σ scaled like the pseudorange's by C/N0.
fn doppler_sigma(cfg: &Config, c: &Candidate) -> f64 {
    cfg.snapshot.doppler_sigma_mps * f64::from(c.cn0_factor)
}

/// The state's inter-system bias for the candidate's system (0 for GPS).
fn isb(state: &FilterState, c: &Candidate) -> f64 {
    let [e, b] = state.inter_system_biases();
    match c.sys {
        1 => e,
        2 => b,
        _ => 0.0,
    }
}

/// The pseudorange innovation `z − h(x)` at the current state, `rho` the geometric range
/// from [`Candidate::line_of_sight`].
fn pseudorange_innovation(state: &FilterState, c: &Candidate, o: &Outcome, rho: f64) -> f64 {
    let (b, _) = state.clock();
    c.pr_m - (rho + b + isb(state, c) - c.clock_m + o.delay_m)
}

/// The predicted range rate `u·(v_sat − v) + ḃ − ḋ_sat`.
fn predicted_rate(state: &FilterState, c: &Candidate, u: [f64; 3]) -> f64 {
    let (_, drift) = state.clock();
    dot(u, sub(c.vel, state.velocity())) + drift - c.clock_drift_mps
}

#[cfg(test)]
#[path = "track_tests.rs"]
mod tests;
