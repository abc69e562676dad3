//! Fault detection and exclusion: the weighted least-squares residual test over one epoch's
//! pseudoranges, identification of the faulty satellite by its normalised residual, its
//! exclusion by a rank-one downdate and the test again, up to the configured number of
//! exclusions (Parkinson & Axelrad 1988; Brown 1992 \[M\]; the downdate identities of
//! [`super::raim`]).
//!
//! The input is each measurement's residual against a linearisation point: the least
//! squares' post-fit residuals, or the filter's innovations at its predicted state. The test
//! fits them once more by least squares (position and one clock per system), so a common
//! offset — the receiver clock, a position error of the prediction — never counts against a
//! satellite, and both paths apply the same test. Weights are `1/σ²` with σ² the full test
//! variance ([`crate::measurements::record::Outcome::test_variance`]).
//!
//! Cost: the normal matrix (9 multiply-adds per satellite), one 6×6 Cholesky and inverse,
//! the fit, and per identification about 60 multiplications per satellite; an exclusion
//! updates the inverse, the fit and the statistic in closed form (no factorisation).

use super::table::Thresholds;
use crate::linalg::{Cholesky6, Mat6};
use crate::measurements::record::{Fate, Measurement, Outcome};
use crate::snapshot::wls::{add_range_row, pin_absent_clocks};

/// What the test found.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub(crate) struct Verdict {
    /// Degrees of freedom of the last test (0: not enough measurements for a test).
    pub dof: u8,
    /// The last statistic.
    pub statistic: f64,
    /// Its threshold.
    pub threshold: f64,
    /// Satellites excluded this epoch.
    pub excluded: u8,
    /// The last test passed.
    pub passed: bool,
}

/// The probabilities and limits of the test.
pub(crate) struct TestSetup<'a, const N: usize> {
    pub table: &'a mut Thresholds<N>,
    pub false_alarm: f64,
    pub integrity_risk: f64,
    pub max_exclusions: u8,
    pub ure_sigma_m: f64,
}

/// One measurement's row `[−u, e_system]`, weight and residual.
fn row_of(m: &Measurement, ure: f64) -> ([f64; 6], f64, f64) {
    let o = &m.out;
    let mut g = [o.row[0], o.row[1], o.row[2], 0.0, 0.0, 0.0];
    if let Some(c) = g.get_mut(m.sat.sys.saturating_add(3)) {
        *c = 1.0;
    }
    (g, 1.0 / o.test_variance(ure), o.residual_m)
}

fn dot6(a: &[f64; 6], b: &[f64; 6]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

fn mul6(m: &Mat6, v: &[f64; 6]) -> [f64; 6] {
    let mut out = [0.0; 6];
    for (o, row) in out.iter_mut().zip(m) {
        *o = dot6(row, v);
    }
    out
}

/// The suspect: the largest normalised residual among the tested measurements (those
/// `tested` accepts), with its index, statistic, gain column and redundancy.
fn identify(
    meas: &[Measurement],
    tested: fn(&Outcome) -> bool,
    inv: &Mat6,
    fit: &[f64; 6],
    ure: f64,
) -> Option<(usize, f64, [f64; 6], f64, f64)> {
    let mut best: Option<(usize, f64, [f64; 6], f64, f64)> = None;
    for (i, m) in meas.iter().enumerate().filter(|(_, m)| tested(&m.out)) {
        let (g, w, nu) = row_of(m, ure);
        let mut a = mul6(inv, &g);
        a.iter_mut().for_each(|x| *x *= w);
        let r = 1.0 - dot6(&g, &a);
        if r < 1e-9 {
            continue;
        }
        let v = nu - dot6(&g, fit);
        let stat = v * libm::sqrt(w / r);
        if best.is_none_or(|b| stat.abs() > b.1.abs()) {
            best = Some((i, stat, a, r, v));
        }
    }
    best
}

/// Runs the test over the measurements `tested` accepts, excluding (marking
/// [`Fate::Excluded`]) as many satellites as it takes, up to the configured number.
pub(crate) fn residual_test<const N: usize>(
    meas: &mut [Measurement],
    tested: fn(&Outcome) -> bool,
    setup: &mut TestSetup<'_, N>,
) -> Verdict {
    let ure = setup.ure_sigma_m;
    let mut normal: Mat6 = [[0.0; 6]; 6];
    let mut rhs = [0.0; 6];
    let mut present = [false; 3];
    let mut n = 0usize;
    for m in meas.iter().filter(|m| tested(&m.out)) {
        let (g, w, nu) = row_of(m, ure);
        add_range_row(&mut normal, [g[0], g[1], g[2]], m.sat.sys, w);
        rhs.iter_mut().zip(&g).for_each(|(b, x)| *b += x * w * nu);
        if let Some(p) = present.get_mut(m.sat.sys) {
            *p = true;
        }
        n = n.saturating_add(1);
    }
    let unknowns = 3usize.saturating_add(present.iter().filter(|p| **p).count());
    let mut verdict = Verdict::default();
    let Some(mut dof) = n.checked_sub(unknowns).filter(|d| *d > 0) else {
        return verdict;
    };
    pin_absent_clocks(&mut normal, &present);
    let Some(chol) = Cholesky6::factor(normal) else {
        return verdict;
    };
    let mut fit = chol.solve(&rhs);
    let mut inv = chol.inverse();
    let mut sse: f64 = meas
        .iter()
        .filter(|m| tested(&m.out))
        .map(|m| {
            let (g, w, nu) = row_of(m, ure);
            let v = nu - dot6(&g, &fit);
            w * v * v
        })
        .sum();
    loop {
        let Some((threshold, _)) = setup
            .table
            .get(dof, setup.false_alarm, setup.integrity_risk)
        else {
            return verdict;
        };
        verdict.dof = u8::try_from(dof).unwrap_or(u8::MAX);
        verdict.statistic = sse;
        verdict.threshold = threshold;
        // NaN fails: a statistic that cannot be computed never passes.
        verdict.passed = sse <= threshold;
        if verdict.passed || verdict.excluded >= setup.max_exclusions || dof < 2 {
            return verdict;
        }
        let Some((k, stat, a, r, v)) = identify(meas, tested, &inv, &fit, ure) else {
            return verdict;
        };
        let Some(m) = meas.get_mut(k) else {
            return verdict;
        };
        // Rank-one downdate: the fit without k moves by −a v / r, the inverse normal matrix
        // gains a aᵀ / (w r) (= a aᵀ r⁻¹ / w with a = w N⁻¹ g), the statistic loses stat².
        let w = 1.0 / m.out.test_variance(ure);
        for (f, x) in fit.iter_mut().zip(&a) {
            *f -= x * v / r;
        }
        for (row, ai) in inv.iter_mut().zip(&a) {
            for (x, aj) in row.iter_mut().zip(&a) {
                *x += ai * aj / (w * r);
            }
        }
        sse = (sse - stat * stat).max(0.0);
        m.out.fate = Fate::Excluded {
            statistic: stat as f32,
        };
        verdict.excluded = verdict.excluded.saturating_add(1);
        dof = dof.saturating_sub(1);
    }
}

#[cfg(test)]
#[path = "fde_tests.rs"]
mod tests;
