//! The non-centrality a fault must give a χ² residual test to be detected with a given
//! probability: the bound behind slope-based protection levels.
//!
//! A bias `b` on one measurement makes the test statistic non-central χ²(k, λ) with
//! `λ = b²·(1 − hᵢᵢ)/σᵢ²`. The fault is missed with probability `F(T; k, λ)`, the
//! non-central χ² distribution function at the threshold `T` (Brown 1992, Parkinson &
//! Axelrad 1988 \[M\]). [`detectable_noncentrality`] finds the λ at which that probability
//! equals the allowed missed-detection probability; `√λ` is the "pbias" that multiplies each
//! satellite's slope. `F` is the Poisson mixture of central χ²(k + 2j) distribution functions
//! (common practice; the series scipy's `ncx2` documents). Checked against
//! scipy.stats.ncx2 with brentq (tools/refvectors/ncx2_scipy.csv) for 1 to 20 degrees of
//! freedom: within 1e-8 relative (integrity/ncx2_tests.rs). Host-side or configuration-time
//! cost: a few hundred incomplete-gamma evaluations.

use super::chi2::{cdf_given, ln_gamma_half, MAX_DOF};

/// Largest non-centrality searched (a bias of 100 σ): beyond it nothing is detectable that
/// matters.
const MAX_LAMBDA: f64 = 1e4;

/// `F(x; k, λ)`, the non-central χ² distribution function; NaN for `k` of 0 or above
/// [`MAX_DOF`], `λ` outside `[0, 1e4]` or `x` not positive and finite (the bounds keep the
/// Poisson sum finite).
pub fn ncx2_cdf(k: u32, lambda: f64, x: f64) -> f64 {
    if k == 0 || k > MAX_DOF || !(0.0..=MAX_LAMBDA).contains(&lambda) || !(x > 0.0 && x.is_finite())
    {
        return f64::NAN;
    }
    let half = lambda / 2.0;
    let mut weight = libm::exp(-half);
    let mut sum = 0.0;
    let mut total_weight = 0.0;
    let mut j = 0u32;
    // ln Γ((k + 2j)/2), stepped by ln Γ(a + 1) = ln Γ(a) + ln a.
    let mut ln_gamma = ln_gamma_half(k);
    // Terms up to far past the Poisson mean, until the weights left are negligible.
    let last = (half + 12.0 * libm::sqrt(half) + 40.0) as u32;
    while j <= last {
        let dof = k.saturating_add(j.saturating_mul(2));
        sum += weight * cdf_given(dof, x, ln_gamma);
        ln_gamma += libm::log(f64::from(dof) / 2.0);
        total_weight += weight;
        j = j.saturating_add(1);
        weight *= half / f64::from(j);
        if total_weight > 1.0 - 1e-17 && weight < 1e-300 {
            break;
        }
    }
    sum
}

/// The λ with `F(threshold; k, λ) = p_md`: `None` when `p_md` is not in (0, 1), `k` is 0,
/// the threshold is not positive and finite, or no λ up to 1e4 reaches it.
pub fn detectable_noncentrality(k: u32, threshold: f64, p_md: f64) -> Option<f64> {
    if k == 0 || !(p_md > 0.0 && p_md < 1.0) || !(threshold > 0.0 && threshold.is_finite()) {
        return None;
    }
    // F decreases in λ from F(0) = the central cdf.
    if ncx2_cdf(k, 0.0, threshold) <= p_md || ncx2_cdf(k, MAX_LAMBDA, threshold) > p_md {
        return None;
    }
    let (mut lo, mut hi) = (0.0_f64, MAX_LAMBDA);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if ncx2_cdf(k, mid, threshold) > p_md {
            lo = mid;
        } else {
            hi = mid;
        }
        if hi - lo <= 1e-13 * hi {
            break;
        }
    }
    Some(0.5 * (lo + hi))
}

#[cfg(test)]
#[path = "ncx2_tests.rs"]
mod tests;
