//! Fault detection and exclusion with protection levels, in one pass over one matrix: the
//! weighted least-squares residual test over an epoch's pseudoranges, identification of the
//! faulty satellite by its normalised residual, its exclusion by a rank-one downdate and
//! the test again, up to the configured number of exclusions (Parkinson & Axelrad 1988;
//! Brown 1992 \[M\]; the downdate identities of [`super::raim`]); then the slope-based
//! protection levels of what is left (../shared/CHECKS.md, Integrity) plus the fault-free
//! term `K·σ`, `K` the two-sided normal quantile of the integrity risk, as ARAIM's
//! protection levels add it (Blanch et al. 2012 \[M\]). Without that term, the noise pushed
//! 36 of 10,000 epochs with an 8 σ bias on the worst satellite over the level in the
//! fault-injection Monte Carlo (host-tests/src/faults.rs), against a binomial bound of 19
//! for the 1e-3 risk.
//!
//! The input is each measurement's residual against a linearisation point: the least
//! squares' post-fit residuals, or the filter's innovations at its predicted state (after
//! its gate). The test fits them once more by least squares (position and one clock per
//! system), so a common offset (the receiver clock, an error of the prediction) never counts
//! against a satellite, and both paths apply the same test. Weights are `1/σ²` with σ² the
//! full test variance ([`crate::measurements::record::Outcome::test_variance`]); rows are in
//! east/north/up so the same inverse gives the slopes.
//!
//! **Single precision.** The geometry, the fit, the statistic and the slopes are computed
//! in f32 (the Cortex-M4F's hardware precision; f64 is emulated there at tens of
//! instructions per operation). The residuals enter as f32 after the clock re-seat (metres
//! to kilometres) less their mean in f64, so f32 sees metres, and the statistic is summed from the explicit
//! residuals after the fit, not as `νᵀWν − bᵀN⁻¹b`, which would cancel. fde_tests.rs
//! bounds the loss: the statistic within 1e-4 relative of the closed form, the protection
//! levels within 1e-5 of slope.rs's f64 slopes, and a common offset of 50 km plus a
//! position error of 100 m leave the statistic within 1e-3 of the offset-free one.
//!
//! Cost per epoch (12 satellites): the normal matrix (rotation and 9 multiply-adds per
//! satellite), one 6×6 Cholesky factorisation and inversion in place, the fit and the
//! residuals, then about 30 multiply-adds per satellite for the slopes. An exclusion adds
//! one pass of identification (about 30 per satellite) and a closed-form downdate of the
//! inverse, the fit and the statistic: no factorisation.

use super::table::Thresholds;
use crate::frames::LocalFrame;
use crate::linalg::{factor_in_place, invert_factor_in_place};
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
    /// Horizontal and vertical protection levels, m, when the test passed.
    pub levels: Option<(f64, f64)>,
}

/// The probabilities, limits and frame of the test.
pub(crate) struct TestSetup<'a, const N: usize> {
    pub table: &'a mut Thresholds<N>,
    pub false_alarm: f64,
    pub integrity_risk: f64,
    pub max_exclusions: u8,
    pub ure_sigma_m: f64,
    /// The square of the reflection factor (see `Outcome::test_variance`).
    pub reflection_scale: f64,
    /// The local frame at the fix (or the predicted position).
    pub frame: &'a LocalFrame,
}

/// A 6×6 single-precision matrix.
type Mat6f = [[f32; 6]; 6];

/// One measurement's east/north/up row `[−u, e_system]`, weight and residual less the
/// tested residuals' mean `offset` (which the clocks absorb), in f32; `axes` are the local
/// frame's, in f32 (a direction needs no more). Not inlined: four callers, one copy.
#[inline(never)]
fn row_of(
    m: &Measurement,
    (ure, refl): (f32, f32),
    axes: &[[f32; 3]; 3],
    offset: f64,
) -> ([f32; 6], f32, f32) {
    // As `Outcome::test_variance`: a reflection's factor `refl` (squared) on every term.
    let scale = if m.sat.reflection { refl } else { 1.0 };
    let o = &m.out;
    let r = o.row.map(|x| x as f32);
    let rot = |a: &[f32; 3]| a[0] * r[0] + a[1] * r[1] + a[2] * r[2];
    let mut g = [rot(&axes[0]), rot(&axes[1]), rot(&axes[2]), 0.0, 0.0, 0.0];
    if let Some(c) = g.get_mut(m.sat.sys.saturating_add(3)) {
        *c = 1.0;
    }
    let s = o.sigma_m as f32;
    let var = s * s + (ure * ure + o.model_var_m2 as f32) * scale;
    (g, 1.0 / var, (o.residual_m - offset) as f32)
}

fn dot6(a: &[f32; 6], b: &[f32; 6]) -> f32 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

/// `w·N⁻¹·g` for a row `g` that is a direction plus one clock: 18 multiply-adds, not 36.
fn gain(inv: &Mat6f, g: &[f32; 6], w: f32, sys: usize) -> [f32; 6] {
    let c = sys.saturating_add(3);
    let mut a = [0.0; 6];
    for (ai, row) in a.iter_mut().zip(inv) {
        let clock = row.get(c).copied().unwrap_or(0.0);
        *ai = w * (row[0] * g[0] + row[1] * g[1] + row[2] * g[2] + clock);
    }
    a
}

/// Rounding can leave a tiny negative statistic; NaN stays NaN (`f64::max` would hide it).
fn not_below_zero(x: f32) -> f32 {
    if x < 0.0 {
        0.0
    } else {
        x
    }
}

/// One pass over the tested measurements with the inverse normal matrix: the suspect (the
/// largest normalised residual, with its index, statistic, gain column, redundancy and
/// residual) and the largest squared horizontal and vertical slopes.
struct Scan {
    suspect: Option<(usize, f32, [f32; 6], f32, f32)>,
    h2: f32,
    v2: f32,
}

fn scan(
    meas: &[Measurement],
    tested: fn(&Outcome) -> bool,
    inv: &Mat6f,
    fit: &[f32; 6],
    (ure, axes): ((f32, f32), &[[f32; 3]; 3]),
    offset: f64,
) -> Scan {
    let mut out = Scan {
        suspect: None,
        h2: 0.0,
        v2: 0.0,
    };
    for (i, m) in meas.iter().enumerate().filter(|(_, m)| tested(&m.out)) {
        let (g, w, nu) = row_of(m, ure, axes, offset);
        let a = gain(inv, &g, w, m.sat.sys);
        let r = 1.0 - dot6(&g, &a);
        // A satellite alone in its system never shows in the residuals: its clock absorbs
        // it, and it does not move the position.
        if r < 1e-9 {
            continue;
        }
        let d = w * r;
        out.h2 = out.h2.max((a[0] * a[0] + a[1] * a[1]) / d);
        out.v2 = out.v2.max(a[2] * a[2] / d);
        let v = nu - dot6(&g, fit);
        let stat = v * libm::sqrtf(w / r);
        if out.suspect.is_none_or(|b| stat.abs() > b.1.abs()) {
            out.suspect = Some((i, stat, a, r, v));
        }
    }
    out
}

/// Runs the test over the measurements `tested` accepts, excluding (marking
/// [`Fate::Excluded`]) as many satellites as it takes up to the configured number, and
/// bounds what is left when it passes.
// Not inlined: its matrix is off the stack while the filter updates.
#[inline(never)]
pub(crate) fn check<const N: usize>(
    meas: &mut [Measurement],
    tested: fn(&Outcome) -> bool,
    setup: &mut TestSetup<'_, N>,
) -> Verdict {
    let ure = (setup.ure_sigma_m as f32, setup.reflection_scale as f32);
    let axes = setup.frame.axes.map(|a| a.map(|x| x as f32));
    let axes = &axes;
    let mut inv: Mat6f = [[0.0; 6]; 6];
    let mut rhs = [0.0f32; 6];
    let mut present = [false; 3];
    let (mut n, mut sum) = (0usize, 0.0f64);
    for m in meas.iter().filter(|m| tested(&m.out)) {
        n = n.saturating_add(1);
        sum += m.out.residual_m;
    }
    // Mean residual: only where there is one (n = 0 returns below).
    let offset = if n > 0 { sum / n as f64 } else { 0.0 };
    for m in meas.iter().filter(|m| tested(&m.out)) {
        let (g, w, nu) = row_of(m, ure, axes, offset);
        add_range_row(&mut inv, [g[0], g[1], g[2]], m.sat.sys, w);
        rhs.iter_mut().zip(&g).for_each(|(b, x)| *b += x * w * nu);
        if let Some(p) = present.get_mut(m.sat.sys) {
            *p = true;
        }
    }
    let unknowns = 3usize.saturating_add(present.iter().filter(|p| **p).count());
    let mut verdict = Verdict::default();
    let Some(mut dof) = n.checked_sub(unknowns).filter(|d| *d > 0) else {
        return verdict;
    };
    pin_absent_clocks(&mut inv, &present);
    if !factor_in_place(&mut inv) {
        return verdict;
    }
    invert_factor_in_place(&mut inv);
    let mut fit = [0.0f32; 6];
    for (f, row) in fit.iter_mut().zip(&inv) {
        *f = dot6(row, &rhs);
    }
    let mut sse: f32 = meas
        .iter()
        .filter(|m| tested(&m.out))
        .map(|m| {
            let (g, w, nu) = row_of(m, ure, axes, offset);
            let v = nu - dot6(&g, &fit);
            w * v * v
        })
        .sum();
    let mut sqrt_lambda;
    loop {
        let Some((threshold, l)) = setup
            .table
            .get(dof, setup.false_alarm, setup.integrity_risk)
        else {
            return verdict;
        };
        sqrt_lambda = l;
        verdict.dof = u8::try_from(dof).unwrap_or(u8::MAX);
        verdict.statistic = f64::from(sse);
        verdict.threshold = threshold;
        // NaN fails: a statistic that cannot be computed never passes.
        verdict.passed = verdict.statistic <= threshold;
        if verdict.passed || verdict.excluded >= setup.max_exclusions || dof < 2 {
            break;
        }
        let found = scan(meas, tested, &inv, &fit, (ure, axes), offset);
        let Some((k, stat, a, r, v)) = found.suspect else {
            return verdict;
        };
        let Some(m) = meas.get_mut(k) else {
            return verdict;
        };
        // Rank-one downdate: the fit without k moves by −a v / r, the inverse gains
        // a aᵀ / (w r), the statistic loses stat².
        let (_, w, _) = row_of(m, ure, axes, offset);
        for (f, x) in fit.iter_mut().zip(&a) {
            *f -= x * v / r;
        }
        for (row, ai) in inv.iter_mut().zip(&a) {
            for (x, aj) in row.iter_mut().zip(&a) {
                *x += ai * aj / (w * r);
            }
        }
        sse = not_below_zero(sse - stat * stat);
        m.out.fate = Fate::Excluded { statistic: stat };
        verdict.excluded = verdict.excluded.saturating_add(1);
        dof = dof.saturating_sub(1);
    }
    if verdict.passed {
        let k = setup.table.k_md(setup.false_alarm, setup.integrity_risk);
        let slopes = scan(meas, tested, &inv, &fit, (ure, axes), offset);
        verdict.levels = k.and_then(|k| levels(&slopes, &inv, sqrt_lambda, k));
    }
    verdict
}

/// The protection levels from the largest slopes of what is left and its inverse normal
/// matrix: the slopes times `√λ`, plus `K` times the position σ.
fn levels(slopes: &Scan, inv: &Mat6f, sqrt_lambda: f64, k: f64) -> Option<(f64, f64)> {
    let slope_h = f64::from(libm::sqrtf(slopes.h2));
    let slope_v = f64::from(libm::sqrtf(slopes.v2));
    let h = slope_h * sqrt_lambda + k * f64::from(libm::sqrtf(inv[0][0] + inv[1][1]));
    let v = slope_v * sqrt_lambda + k * f64::from(libm::sqrtf(inv[2][2]));
    (h.is_finite() && v.is_finite() && h > 0.0).then_some((h, v))
}

#[cfg(test)]
#[path = "fde_tests.rs"]
mod tests;
