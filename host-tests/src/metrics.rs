//! Accuracy statistics over a run.

use crate::record::EpochRecord;
use std::collections::BTreeMap;
use trackfix_engine::{FilterEvent, FixSource, GnssTime, LocalFrame, SatId};

/// Order statistics of a set of non-negative errors.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
pub struct Stats {
    /// Number of samples.
    pub count: usize,
    /// Mean.
    pub mean: f64,
    /// Root mean square.
    pub rms: f64,
    /// Median.
    pub p50: f64,
    /// 68th percentile.
    pub p68: f64,
    /// 95th percentile.
    pub p95: f64,
    /// 99th percentile.
    pub p99: f64,
    /// Maximum.
    pub max: f64,
}

/// The `q`-quantile (0…1) of sorted data by the nearest-rank method.
pub fn quantile_sorted(sorted: &[f64], q: f64) -> f64 {
    if sorted.is_empty() {
        return f64::NAN;
    }
    let rank = (q * sorted.len() as f64).ceil() as usize;
    sorted[rank.clamp(1, sorted.len()) - 1]
}

impl Stats {
    /// Statistics of `values` (NaNs are ignored).
    pub fn of(values: &[f64]) -> Stats {
        let mut v: Vec<f64> = values.iter().copied().filter(|x| !x.is_nan()).collect();
        if v.is_empty() {
            return Stats::default();
        }
        v.sort_by(f64::total_cmp);
        let n = v.len() as f64;
        Stats {
            count: v.len(),
            mean: v.iter().sum::<f64>() / n,
            rms: (v.iter().map(|x| x * x).sum::<f64>() / n).sqrt(),
            p50: quantile_sorted(&v, 0.50),
            p68: quantile_sorted(&v, 0.68),
            p95: quantile_sorted(&v, 0.95),
            p99: quantile_sorted(&v, 0.99),
            max: *v.last().unwrap_or(&f64::NAN),
        }
    }
}

/// Everything the harness reports about a run.
#[derive(Clone, Debug, Default)]
pub struct Summary {
    /// Epochs in the run.
    pub epochs: usize,
    /// Epochs with a fix.
    pub fixes: usize,
    /// Share of epochs with a fix, %.
    pub availability_pct: f64,
    /// Horizontal error.
    pub horizontal: Stats,
    /// Absolute vertical error.
    pub vertical: Stats,
    /// 3-D error.
    pub error_3d: Stats,
    /// Circular error probable (median horizontal error), m.
    pub cep_m: f64,
    /// PDOP over fixes.
    pub pdop: Stats,
    /// Time to first fix after each wake-up, s (duty-cycled runs).
    pub ttff_s: Stats,
    /// Wake-ups that never reached a fix before sleeping again.
    pub wakeups_without_fix: usize,
    /// Post-fit residual RMS per satellite, m, with the number of residuals.
    pub residual_rms_by_sat: BTreeMap<SatId, (usize, f64)>,
    /// 3-D velocity error against the truth velocity, m/s, where both are known.
    pub velocity_error: Stats,
    /// What the navigation filter made of the run.
    pub filter: FilterFigures,
    /// What integrity made of the run.
    pub integrity: IntegrityFigures,
}

/// Integrity over a run.
#[derive(Clone, Debug, Default)]
pub struct IntegrityFigures {
    /// Epochs per state: verified, fault excluded, unavailable, alert.
    pub states: [usize; 4],
    /// Epochs with any interference or spoofing flag raised.
    pub flagged: usize,
    /// Median horizontal protection level over the epochs that have one, m.
    pub hpl50_m: Option<f64>,
    /// Epochs with a protection level and a truth.
    pub bounded_epochs: usize,
    /// Of those, epochs whose horizontal or vertical error exceeds its protection level
    /// (misleading information).
    pub misleading: usize,
    /// Satellite-epochs received only by reflection (synthetic truth).
    pub reflected: usize,
    /// Of those, the ones the engine down-weighted or kept out of the fix (reflection,
    /// excluded, kept out, gated), %.
    pub reflected_caught_pct: Option<f64>,
}

impl IntegrityFigures {
    /// The figures of a run.
    pub fn of(records: &[EpochRecord]) -> IntegrityFigures {
        use trackfix_engine::{IntegrityState, SatStatus};
        let mut f = IntegrityFigures::default();
        let mut hpl = Vec::new();
        let mut caught = 0usize;
        for r in records {
            let i = &r.integrity;
            let k = match i.state {
                IntegrityState::Verified => 0,
                IntegrityState::FaultExcluded => 1,
                IntegrityState::Alert => 3,
                _ => 2,
            };
            f.states[k] += 1;
            f.flagged += usize::from(!i.flags.is_empty());
            if let (Some(h), Some(v)) = (i.hpl_m, i.vpl_m) {
                hpl.push(f64::from(h));
                if let Some(e) = r.fix.and_then(|x| x.enu_error_m) {
                    f.bounded_epochs += 1;
                    let over = e[0].hypot(e[1]) > f64::from(h) || e[2].abs() > f64::from(v);
                    f.misleading += usize::from(over);
                }
            }
            for sat in &r.reflected_truth {
                f.reflected += 1;
                caught += usize::from(r.sats.iter().any(|s| {
                    s.sat == *sat
                        && (s.reflection
                            || matches!(
                                s.status,
                                SatStatus::Excluded { .. }
                                    | SatStatus::KeptOut
                                    | SatStatus::Gated { .. }
                            ))
                }));
            }
        }
        f.hpl50_m = (!hpl.is_empty()).then(|| Stats::of(&hpl).p50);
        f.reflected_caught_pct =
            (f.reflected > 0).then(|| 100.0 * caught as f64 / f.reflected as f64);
        f
    }

    /// The share of epochs per state, %.
    pub fn shares_pct(&self) -> [f64; 4] {
        let n: usize = self.states.iter().sum();
        self.states.map(|k| {
            if n == 0 {
                0.0
            } else {
                100.0 * k as f64 / n as f64
            }
        })
    }
}

/// The navigation filter's figures over a run.
#[derive(Clone, Debug, Default)]
pub struct FilterFigures {
    /// Epochs per fix kind: snapshot, filtered, predicted, held, none.
    pub kinds: [usize; 5],
    /// Held fixes: the 95th percentile of their horizontal distance from their mean, m.
    pub hold_spread95_m: Option<f64>,
    /// Held fixes: horizontal distance between the mean of the first and of the last tenth
    /// of them, m (the drift of a parked asset's reported position).
    pub hold_drift_m: Option<f64>,
    /// Largest 3-D change of the error against the truth (of the position where there is
    /// no truth) at an epoch where the filter re-seated its clock, m.
    pub clock_step_m: Option<f64>,
    /// Largest horizontal error at the first updated fix after an outage of at least
    /// [`OUTAGE_EPOCHS`] epochs without one (predicted or no fix), m.
    pub post_outage_h_m: Option<f64>,
    /// 95th percentile of the horizontal error over the fix's own horizontal σ
    /// (√(σ_e² + σ_n²)); 1.73 for a circular Gaussian error whose σ is right.
    pub h_over_sigma95: Option<f64>,
}

/// Shortest outage for [`FilterFigures::post_outage_h_m`], epochs.
pub const OUTAGE_EPOCHS: usize = 10;

impl FilterFigures {
    /// The share of epochs of each kind, %, in the order of `kinds`.
    pub fn shares_pct(&self) -> [f64; 5] {
        let n: usize = self.kinds.iter().sum();
        self.kinds.map(|k| {
            if n == 0 {
                0.0
            } else {
                100.0 * k as f64 / n as f64
            }
        })
    }

    /// The figures of a run.
    pub fn of(records: &[EpochRecord]) -> FilterFigures {
        let mut kinds = [0usize; 5];
        for r in records {
            let k = match r.fix.map(|f| f.source) {
                Some(FixSource::Snapshot) => 0,
                Some(FixSource::Filtered) => 1,
                Some(FixSource::Predicted) => 2,
                Some(FixSource::Held) => 3,
                _ => 4,
            };
            kinds[k] += 1;
        }
        // Runs of consecutive held fixes: each is one parking.
        let mut runs: Vec<Vec<[f64; 3]>> = vec![Vec::new()];
        for r in records {
            match r.fix {
                Some(f) if f.source == FixSource::Held => {
                    if let Some(last) = runs.last_mut() {
                        last.push(f.ecef_m);
                    }
                }
                _ => {
                    if runs.last().is_some_and(|l| !l.is_empty()) {
                        runs.push(Vec::new());
                    }
                }
            }
        }
        let (hold_spread95_m, hold_drift_m) = hold_figures(&runs);
        let mut clock_steps = Vec::new();
        for w in records.windows(2) {
            if w[1].filter_event == FilterEvent::ClockReseated {
                if let (Some(a), Some(b)) = (w[0].fix, w[1].fix) {
                    // The error moves only by noise when the truth moves with the fix.
                    let (pa, pb) = match (a.enu_error_m, b.enu_error_m) {
                        (Some(ea), Some(eb)) => (ea, eb),
                        _ => (a.ecef_m, b.ecef_m),
                    };
                    let d: f64 = (0..3).map(|i| (pa[i] - pb[i]).powi(2)).sum();
                    clock_steps.push(d.sqrt());
                }
            }
        }
        let mut post = Vec::new();
        let mut gap = 0usize;
        for r in records {
            match r.fix {
                Some(f) if f.source != FixSource::Predicted => {
                    if gap >= OUTAGE_EPOCHS {
                        if let Some(e) = f.enu_error_m {
                            post.push(e[0].hypot(e[1]));
                        }
                    }
                    gap = 0;
                }
                _ => gap += 1,
            }
        }
        let ratios: Vec<f64> = records
            .iter()
            .filter_map(|r| r.fix)
            .filter_map(|f| {
                let e = f.enu_error_m?;
                let s = f.sigma_enu_m[0].hypot(f.sigma_enu_m[1]);
                (s > 0.0).then(|| e[0].hypot(e[1]) / s)
            })
            .collect();
        let max = |v: &[f64]| {
            v.iter()
                .copied()
                .fold(None, |m: Option<f64>, x| Some(m.map_or(x, |m| m.max(x))))
        };
        FilterFigures {
            kinds,
            hold_spread95_m,
            hold_drift_m,
            clock_step_m: max(&clock_steps),
            post_outage_h_m: max(&post),
            h_over_sigma95: (!ratios.is_empty()).then(|| Stats::of(&ratios).p95),
        }
    }
}

/// Spread (95 %, pooled over the runs) and drift (the largest of the runs) of held
/// positions (see [`FilterFigures`]); runs of fewer than 20 fixes are left out.
fn hold_figures(runs: &[Vec<[f64; 3]>]) -> (Option<f64>, Option<f64>) {
    let mean = |s: &[[f64; 3]]| {
        let n = s.len() as f64;
        [
            s.iter().map(|p| p[0]).sum::<f64>() / n,
            s.iter().map(|p| p[1]).sum::<f64>() / n,
        ]
    };
    let mut deviations = Vec::new();
    let mut drift: Option<f64> = None;
    for run in runs.iter().filter(|r| r.len() >= 20) {
        let frame = LocalFrame::at_ecef(run[0]);
        let enu: Vec<[f64; 3]> = run.iter().map(|p| frame.enu(*p)).collect();
        let m = mean(&enu);
        deviations.extend(enu.iter().map(|p| (p[0] - m[0]).hypot(p[1] - m[1])));
        let tenth = enu.len() / 10;
        let (a, b) = (mean(&enu[..tenth]), mean(&enu[enu.len() - tenth..]));
        let d = (a[0] - b[0]).hypot(a[1] - b[1]);
        drift = Some(drift.map_or(d, |x| x.max(d)));
    }
    if deviations.is_empty() {
        return (None, None);
    }
    (Some(Stats::of(&deviations).p95), drift)
}

impl Summary {
    /// The summary of a run.
    pub fn of(records: &[EpochRecord]) -> Summary {
        let fixes: Vec<_> = records.iter().filter_map(|r| r.fix).collect();
        let errs: Vec<[f64; 3]> = fixes.iter().filter_map(|f| f.enu_error_m).collect();
        let h: Vec<f64> = errs.iter().map(|e| e[0].hypot(e[1])).collect();
        let v: Vec<f64> = errs.iter().map(|e| e[2].abs()).collect();
        let d3: Vec<f64> = errs
            .iter()
            .map(|e| (e[0] * e[0] + e[1] * e[1] + e[2] * e[2]).sqrt())
            .collect();
        let pdop: Vec<f64> = fixes.iter().map(|f| f.pdop).collect();
        let vel: Vec<f64> = records
            .iter()
            .filter_map(EpochRecord::velocity_error_enu_mps)
            .map(|e| (e[0] * e[0] + e[1] * e[1] + e[2] * e[2]).sqrt())
            .collect();

        // Time to first fix: from each wake-up to the first fix before the next wake-up.
        let mut ttff = Vec::new();
        let mut missed = 0;
        let mut wake: Option<GnssTime> = None;
        for r in records {
            if r.wake_start {
                if wake.is_some() {
                    missed += 1;
                }
                wake = Some(r.time);
            }
            if let (Some(w), Some(_)) = (wake, r.fix) {
                ttff.push(r.time.seconds_since(w));
                wake = None;
            }
        }
        missed += usize::from(wake.is_some());

        let mut sums: BTreeMap<SatId, (usize, f64)> = BTreeMap::new();
        for s in records.iter().flat_map(|r| r.sats.iter()) {
            if let Some(res) = s.residual_m {
                let e = sums.entry(s.sat).or_default();
                e.0 += 1;
                e.1 += f64::from(res) * f64::from(res);
            }
        }
        let residual_rms_by_sat = sums
            .into_iter()
            .map(|(k, (n, ss))| (k, (n, (ss / n as f64).sqrt())))
            .collect();
        let horizontal = Stats::of(&h);
        Summary {
            epochs: records.len(),
            fixes: fixes.len(),
            availability_pct: if records.is_empty() {
                0.0
            } else {
                100.0 * fixes.len() as f64 / records.len() as f64
            },
            cep_m: horizontal.p50,
            horizontal,
            vertical: Stats::of(&v),
            error_3d: Stats::of(&d3),
            pdop: Stats::of(&pdop),
            ttff_s: Stats::of(&ttff),
            wakeups_without_fix: missed,
            residual_rms_by_sat,
            velocity_error: Stats::of(&vel),
            filter: FilterFigures::of(records),
            integrity: IntegrityFigures::of(records),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Nearest-rank percentiles of 1..=100 (textbook definition): p50 = 50, p95 = 95.
    #[test]
    fn nearest_rank() {
        let v: Vec<f64> = (1..=100).map(f64::from).collect();
        let s = Stats::of(&v);
        assert_eq!((s.p50, s.p95, s.max, s.count), (50.0, 95.0, 100.0, 100));
        assert!((s.mean - 50.5).abs() < 1e-12);
    }
}
