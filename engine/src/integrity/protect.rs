//! Slope-based protection levels of a fix: the largest horizontal and vertical slope of the
//! measurements it used times the square root of the non-centrality the residual test
//! detects with the configured integrity risk (Brown 1992; Parkinson & Axelrad 1988 \[M\];
//! ../shared/CHECKS.md, Integrity), plus the fault-free term `K·σ` with `K` the two-sided
//! normal quantile of the integrity risk, as ARAIM's protection levels add it (Blanch et
//! al. 2012 \[M\]). The slope term alone bounds the error of the fault at the detectable
//! size only on average: in the fault-injection Monte Carlo (host-tests/src/faults.rs) the
//! noise pushed 36 of 10,000 epochs with an 8 σ bias on the worst satellite above it,
//! against a binomial bound of 19 for the 1e-3 risk; with the term, see docs/accuracy.md. Filtered fixes get the bound of the same epoch's
//! measurements taken as a snapshot: the filter's own error is smaller than the snapshot's
//! under the same fault, so the bound is conservative for it (docs/integrity.md).
//!
//! Cost: the normal matrix, one 6×6 Cholesky and inverse, then about 60 multiplications and
//! two square roots per satellite.

use super::slope::{slope_of, SlopeRow};
use crate::frames::LocalFrame;
use crate::linalg::{Cholesky6, Mat6};
use crate::measurements::record::Measurement;
use crate::snapshot::wls::{add_range_row, pin_absent_clocks};

/// The horizontal and vertical protection levels, m, of the measurements the fix used, for
/// a detectable `√λ` and the fault-free quantile `k_md`; `None` for a singular geometry.
pub(crate) fn protection_levels(
    meas: &[Measurement],
    frame: &LocalFrame,
    sqrt_lambda: f64,
    k_md: f64,
    ure_sigma_m: f64,
) -> Option<(f64, f64)> {
    let rows = || {
        meas.iter().filter(|m| m.out.used()).map(|m| {
            let u = m.out.row;
            SlopeRow {
                los_enu: frame.rotate([-u[0], -u[1], -u[2]]),
                system: m.sat.sys,
                weight: 1.0 / m.out.test_variance(ure_sigma_m),
            }
        })
    };
    let mut normal: Mat6 = [[0.0; 6]; 6];
    let mut present = [false; 3];
    for r in rows() {
        let [e, n, u] = r.los_enu;
        add_range_row(&mut normal, [-e, -n, -u], r.system, r.weight);
        if let Some(p) = present.get_mut(r.system) {
            *p = true;
        }
    }
    pin_absent_clocks(&mut normal, &present);
    let inv = Cholesky6::factor(normal)?.inverse();
    let (mut h, mut v) = (0.0f64, 0.0f64);
    for r in rows() {
        let s = slope_of(&inv, &r);
        // A satellite alone in its system never shows in the residuals: it has no slope
        // (its clock absorbs it) and does not move the position.
        if s.redundancy < 1e-9 {
            continue;
        }
        h = h.max(s.horizontal);
        v = v.max(s.vertical);
    }
    let sigma_h = libm::sqrt(inv[0][0] + inv[1][1]);
    let sigma_v = libm::sqrt(inv[2][2]);
    let (h, v) = (
        h * sqrt_lambda + k_md * sigma_h,
        v * sqrt_lambda + k_md * sigma_v,
    );
    (h.is_finite() && v.is_finite() && h > 0.0).then_some((h, v))
}
