//! Accuracy statistics over a run.

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
