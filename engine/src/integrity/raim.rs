//! Identification and exclusion in the weighted least-squares residual test, without a
//! re-solve: with each satellite's redundancy `r_i = 1 − P_ii` and gain column `a_i` from
//! [`super::slope`], and the post-fit residuals `v`,
//! ```text
//! normalised residual   w_i = v_i √(w_i / r_i)                      (Baarda's w-test)
//! statistic without i   SSE − w_i²                                  (dof − 1)
//! position change       −a_i v_i / r_i   (the solution without i minus the solution with it)
//! ```
//! These are the rank-one downdate of the normal equations written out (common practice:
//! the leave-one-out identities of least squares); the largest |w_i| identifies the
//! suspect. Checked against numpy re-solving every geometry without each satellite
//! (tools/refvectors/gen_slopes.py → slopes_numpy.csv): within 1e-9 (integrity/raim_tests.rs).
//! Cost per satellite: a square root and a few multiplications, against a full 6×6 solve.

use super::slope::Slope;

/// What removing one satellite would do.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LeaveOneOut {
    /// Its normalised residual (w-test statistic); NaN for a satellite whose residual is
    /// always zero.
    pub normalised_residual: f64,
    /// The weighted sum of squared residuals without it.
    pub statistic_without: f64,
    /// The change of the east/north/up position when it is removed, m.
    pub shift_enu: [f64; 3],
}

/// The leave-one-out figures of one satellite: its slope figures, weight `1/σ²`, post-fit
/// residual (m) and the weighted sum of squared residuals of the full solution.
pub fn leave_one_out(slope: &Slope, weight: f64, residual_m: f64, sse: f64) -> LeaveOneOut {
    let r = slope.redundancy;
    if r.is_nan() || r < 1e-9 {
        return LeaveOneOut {
            normalised_residual: f64::NAN,
            statistic_without: sse,
            shift_enu: [f64::NAN; 3],
        };
    }
    let w = residual_m * libm::sqrt(weight / r);
    let k = -residual_m / r;
    let [e, n, u] = slope.gain_enu;
    LeaveOneOut {
        normalised_residual: w,
        statistic_without: sse - w * w,
        shift_enu: [e * k, n * k, u * k],
    }
}

#[cfg(test)]
#[path = "raim_tests.rs"]
mod tests;
