//! Accuracy statistics over a run.

use crate::record::EpochRecord;
use std::collections::BTreeMap;
use trackfix_engine::{GnssTime, SatId};

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
