//! The filter as a pipeline stage: after the snapshot solution, carry the state across the
//! gap since the last epoch, then update it with the pseudoranges and Dopplers the snapshot
//! used, or predict through an outage.
//!
//! - Start (or restart after a gap longer than `max_gap_s`, or a refused step) from the
//!   epoch's least-squares fix: its position and clock, its Doppler velocity when there is
//!   one; that epoch's fix stays the snapshot's.
//! - Receiver clock events: when the least-squares GPS clock and the predicted clock differ
//!   by more than five predicted σ plus 30 m (a whole-millisecond step of a steering
//!   receiver, or the oscillator restarted by a wake-up), the clock states are re-seated
//!   from the least-squares clock and the position is kept (common practice).
//! - Each pseudorange: h(x) = |s − p| + b + isb(system) − c·dt_sat + atmosphere, with the
//!   snapshot's corrections and σ, the satellite rotated for the Earth's rotation during
//!   the flight to the filter's position; each Doppler: h(x) = u·(v_sat − v) + ḃ − ḋ_sat.
//!   Sequential scalar updates, each gated by its χ²(1) statistic.
//! - No usable measurement: a predicted fix for at most `max_coast_s` since the last update.

use super::{FilterState, FixPrior, MeasurementRow, ProcessNoise, UpdateOutcome};
use crate::config::Config;
use crate::frames::{dot, norm, sub, Geodetic, LocalFrame};
use crate::sat::System;
use crate::snapshot::wls::{sagnac, Candidate, Outcome};
use crate::solution::{Dop, Fix, FixKind, FixSource, IonoCorrection, Velocity};
use crate::time::GnssTime;

/// What the engine keeps of the filter between epochs.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) struct Tracked {
    state: FilterState,
    /// Time of the state.
    time: GnssTime,
    /// Last epoch whose measurements updated the state.
    updated: GnssTime,
}

/// Runs the filter stage. `fates` receives, per candidate, what the filter did with its
/// pseudorange. Returns the fix to report: `None` to keep the snapshot's outcome.
pub(crate) fn track(
    tracked: &mut Option<Tracked>,
    cfg: &Config,
    t: GnssTime,
    snapshot: Option<&Fix>,
    cands: &[Candidate],
    outcomes: &[Outcome],
    fates: &mut [Option<UpdateOutcome>],
) -> Option<Fix> {
    let f = &cfg.filter;
    let noise = ProcessNoise {
        motion: f.motion,
        clock: f.clock,
        isb_psd: f.isb_psd,
    };
    let carried = tracked.take().and_then(|mut tr| {
        let dt = t.since(tr.time).as_secs_f64();
        tr.state.predict(dt, f.max_gap_s, &noise).ok()?;
        tr.time = t;
        Some(tr)
    });
    let Some(mut tr) = carried else {
        *tracked = snapshot.and_then(|fix| start(fix, t));
        return None;
    };
    let Some(fix) = snapshot else {
        if t.since(tr.updated).as_secs_f64() > f.max_coast_s {
            return None;
        }
        *tracked = Some(tr);
        return Some(report(&tr.state, None, FixSource::Predicted));
    };
    reseat_clock_on_event(&mut tr.state, fix);
    let mut applied = false;
    for ((c, o), fate) in cands.iter().zip(outcomes).zip(fates.iter_mut()) {
        if !o.used {
            continue;
        }
        *fate = pseudorange_update(&mut tr.state, c, o, f.gate);
        applied |= matches!(fate, Some(UpdateOutcome::Applied { .. }));
        if let Some(rate) = c.range_rate_mps {
            let sigma = cfg.snapshot.doppler_sigma_mps * f64::from(c.cn0_factor);
            let _ = range_rate_update(&mut tr.state, c, rate, sigma, f.gate);
        }
    }
    if applied {
        tr.updated = t;
    }
    *tracked = Some(tr);
    Some(report(&tr.state, Some(fix), FixSource::Filtered))
}

/// A filter started from a least-squares fix (σ from its covariance, at least 1 m; the
/// velocity from its Doppler solution or zero ± 30 m/s; the clock drift likewise, or zero
/// ± 300 m/s, a TCXO's ±1 ppm).
fn start(fix: &Fix, t: GnssTime) -> Option<Tracked> {
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
            .map(|b| b - gps)
    };
    let state = FilterState::from_fix(&FixPrior {
        position_m: fix.ecef_m,
        position_var_m2: pos_var,
        velocity_mps: velocity,
        velocity_var_m2ps2: vel_var,
        clock_bias_m: gps,
        clock_bias_var_m2: 4.0 * pos_var,
        clock_drift_mps: drift,
        clock_drift_var_m2ps2: drift_var,
        isb_m: [isb(1).unwrap_or(0.0), isb(2).unwrap_or(0.0)],
        isb_var_m2: 100.0,
    })
    .ok()?;
    Some(Tracked {
        state,
        time: t,
        updated: t,
    })
}

/// Re-seats the clock states from the least-squares fix when they disagree beyond what the
/// prediction allows (see the module documentation).
fn reseat_clock_on_event(state: &mut FilterState, fix: &Fix) {
    let Some(gps) = fix.system_clock_m[0] else {
        return;
    };
    let (b, drift) = state.clock();
    let var = state.clock_cov()[0][0];
    if (gps - b).abs() > 5.0 * libm::sqrt(var) + 30.0 {
        let drift_var = state.clock_cov()[1][1];
        let _ = state.reseat_clock(gps, 100.0, drift, drift_var.max(1.0));
    }
}

/// The state's inter-system bias for `sys` (0 for GPS).
fn isb(state: &FilterState, sys: usize) -> f64 {
    let [e, c] = state.inter_system_biases();
    match sys {
        1 => e,
        2 => c,
        _ => 0.0,
    }
}

/// Unit line of sight from the filter's position to the candidate's satellite, and range.
fn line_of_sight(state: &FilterState, c: &Candidate) -> Option<([f64; 3], f64)> {
    let p = state.position();
    let sat = sagnac(c.pos, p, c.omega_e());
    let d = sub(sat, p);
    let rho = norm(d);
    (rho > 0.0).then(|| ([d[0] / rho, d[1] / rho, d[2] / rho], rho))
}

fn pseudorange_update(
    state: &mut FilterState,
    c: &Candidate,
    o: &Outcome,
    gate: f64,
) -> Option<UpdateOutcome> {
    let (u, rho) = line_of_sight(state, c)?;
    let (b, _) = state.clock();
    let predicted = rho + b + isb(state, c.sys) - c.clock_m + o.delay_m;
    let system = System::ALL.get(c.sys).copied().unwrap_or(System::Gps);
    let row = MeasurementRow::pseudorange(u, system);
    state
        .update(&row, c.pr_m - predicted, o.sigma_m * o.sigma_m, gate)
        .ok()
}

fn range_rate_update(
    state: &mut FilterState,
    c: &Candidate,
    rate: f64,
    sigma: f64,
    gate: f64,
) -> Option<UpdateOutcome> {
    let (u, _) = line_of_sight(state, c)?;
    let (_, drift) = state.clock();
    let v = state.velocity();
    let predicted = dot(u, sub(c.vel, v)) + drift - c.clock_drift_mps;
    let row = MeasurementRow::range_rate(u);
    state
        .update(&row, rate - predicted, sigma * sigma, gate)
        .ok()
}

/// The fix the filter reports: its position, velocity and clock with their covariance,
/// with the snapshot's geometry figures when there is a snapshot this epoch.
fn report(state: &FilterState, snapshot: Option<&Fix>, source: FixSource) -> Fix {
    let ecef_m = state.position();
    let geodetic = Geodetic::from_ecef(ecef_m);
    let frame = LocalFrame::new(ecef_m, &geodetic);
    let (b, drift) = state.clock();
    let [isb_e, isb_c] = state.inter_system_biases();
    let v = state.velocity();
    let velocity = Velocity {
        ecef_mps: v,
        enu_mps: frame.rotate(v),
        clock_drift_mps: drift,
        covariance_enu_m2s2: rotate_cov(&frame, &state.velocity_cov()),
        used: snapshot.and_then(|f| f.velocity).map_or(0, |v| v.used),
    };
    let base = snapshot.copied().unwrap_or(Fix {
        kind: FixKind::ThreeD,
        ecef_m,
        geodetic,
        clock_bias_m: b,
        system_clock_m: [Some(b), None, None],
        covariance_enu_m2: [[0.0; 3]; 3],
        dop: Dop::default(),
        used: 0,
        iterations: 0,
        iono: IonoCorrection::None,
        weighted_sse: 0.0,
        velocity: None,
        source,
    });
    let mut system_clock_m = base.system_clock_m;
    for (k, s) in system_clock_m.iter_mut().enumerate() {
        if s.is_some() {
            *s = Some(b + [0.0, isb_e, isb_c].get(k).copied().unwrap_or(0.0));
        }
    }
    Fix {
        ecef_m,
        geodetic,
        clock_bias_m: system_clock_m.iter().flatten().next().copied().unwrap_or(b),
        system_clock_m,
        covariance_enu_m2: rotate_cov(&frame, &state.position_cov()),
        velocity: Some(velocity),
        source,
        ..base
    }
}

/// R·C·Rᵀ: a 3×3 ECEF covariance in east/north/up.
fn rotate_cov(frame: &LocalFrame, c: &[[f64; 3]; 3]) -> [[f64; 3]; 3] {
    let mut out = [[0.0; 3]; 3];
    for (row, a) in out.iter_mut().zip(frame.axes) {
        for (v, b) in row.iter_mut().zip(frame.axes) {
            let mut s = 0.0;
            for (i, x) in a.iter().enumerate() {
                for (j, y) in b.iter().enumerate() {
                    let cij = c.get(i).and_then(|r| r.get(j)).copied().unwrap_or(0.0);
                    s += x * cij * y;
                }
            }
            *v = s;
        }
    }
    out
}
