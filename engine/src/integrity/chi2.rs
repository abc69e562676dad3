//! Quantiles of the χ² distribution in `no_std`: the thresholds of the residual and
//! innovation tests for any degree of freedom the engine can meet and any false-alarm
//! probability, without a table.
//!
//! `Q(k, x) = Γ(k/2, x/2) / Γ(k/2)` is the upper tail of χ²(k). It is evaluated by the
//! series of the lower incomplete gamma function below `x/2 = k/2 + 1` and by its
//! continued fraction (modified Lentz) above, the textbook split (Numerical Recipes,
//! "Incomplete gamma function" \[M\]); `ln Γ(k/2)` is exact for half-integers by the
//! recurrence from `Γ(1/2) = √π` and `Γ(1) = 1`. The quantile `x` with `Q(k, x) = p` is found
//! by Newton's method on `ln Q` from the Wilson–Hilferty start, safeguarded by bisection.
//! Checked against scipy.stats.chi2 (tools/refvectors/chi2_scipy.csv, pinned scipy) for
//! 1 to 8,000 degrees of freedom and tail probabilities from 0.975 to 3.3e-7: within 1e-9
//! relative (integrity/chi2_tests.rs).
//!
//! Cost: a few hundred double-precision operations and a few `exp`/`ln` per Newton step,
//! five to ten steps: meant to run when the configuration changes, not per epoch.

/// Largest degree of freedom accepted (the engine's epochs hold far fewer measurements).
pub const MAX_DOF: u32 = 100_000;

/// `ln Γ(k/2)` for a positive integer `k`, exact up to rounding.
pub(crate) fn ln_gamma_half(k: u32) -> f64 {
    // Γ(1/2) = √π, Γ(1) = 1; Γ(a + 1) = a Γ(a).
    let (mut a, mut acc) = if k % 2 == 1 {
        (0.5, 0.5 * libm::log(core::f64::consts::PI))
    } else {
        (1.0, 0.0)
    };
    let target = f64::from(k) / 2.0;
    while a < target {
        acc += libm::log(a);
        a += 1.0;
    }
    acc
}

/// The regularised lower incomplete gamma function `P(a, y)` by its series, given
/// `ln Γ(a)` (for `y < a + 1`, where the series converges fast).
fn lower_series(a: f64, y: f64, ln_gamma_a: f64) -> f64 {
    let (mut term, mut sum, mut ap) = (1.0 / a, 1.0 / a, a);
    for _ in 0..10_000 {
        ap += 1.0;
        term *= y / ap;
        sum += term;
        if term.abs() < sum.abs() * 1e-17 {
            break;
        }
    }
    libm::exp(a * libm::log(y) - y - ln_gamma_a) * sum
}

/// The lower-tail probability of χ²(k) at `x > 0` (scipy's `chi2.cdf`); NaN for `k` of 0
/// or above [`MAX_DOF`], or `x` not positive and finite.
pub fn cdf(k: u32, x: f64) -> f64 {
    if k == 0 || k > MAX_DOF || !(x > 0.0 && x.is_finite()) {
        return f64::NAN;
    }
    cdf_given(k, x, ln_gamma_half(k))
}

/// [`cdf`] with `ln Γ(k/2)` supplied: callers stepping through `k` update it by the
/// recurrence `ln Γ(a + 1) = ln Γ(a) + ln a` instead of summing it again.
pub(crate) fn cdf_given(k: u32, x: f64, ln_gamma: f64) -> f64 {
    let (a, y) = (f64::from(k) / 2.0, x / 2.0);
    if y < a + 1.0 {
        lower_series(a, y, ln_gamma)
    } else {
        1.0 - libm::exp(upper_fraction(a, y, ln_gamma))
    }
}

/// `ln Q(k, x)`, the log of the upper-tail probability of χ²(k) at `x > 0`.
fn ln_upper_tail(k: u32, x: f64) -> f64 {
    let (a, y) = (f64::from(k) / 2.0, x / 2.0);
    if y < a + 1.0 {
        let p = lower_series(a, y, ln_gamma_half(k));
        libm::log((1.0 - p).max(f64::MIN_POSITIVE))
    } else {
        upper_fraction(a, y, ln_gamma_half(k))
    }
}

/// `ln Q(a, y)` by its continued fraction (modified Lentz), for `y ≥ a + 1`.
fn upper_fraction(a: f64, y: f64, ln_gamma_a: f64) -> f64 {
    let tiny = 1e-300;
    let mut b = y + 1.0 - a;
    let mut c = 1.0 / tiny;
    let mut d = 1.0 / b;
    let mut h = d;
    for i in 1..10_000 {
        let fi = f64::from(i);
        let an = -fi * (fi - a);
        b += 2.0;
        d = an * d + b;
        if d.abs() < tiny {
            d = tiny;
        }
        c = b + an / c;
        if c.abs() < tiny {
            c = tiny;
        }
        d = 1.0 / d;
        let delta = d * c;
        h *= delta;
        if (delta - 1.0).abs() < 1e-16 {
            break;
        }
    }
    a * libm::log(y) - y - ln_gamma_a + libm::log(h)
}

/// The density of χ²(k) at `x`, as its logarithm.
fn ln_density(k: u32, x: f64) -> f64 {
    let a = f64::from(k) / 2.0;
    (a - 1.0) * libm::log(x) - x / 2.0 - a * core::f64::consts::LN_2 - ln_gamma_half(k)
}

/// The `x` with upper-tail probability `p` under χ²(k) (scipy's `chi2.isf(p, k)`); `None`
/// for `k` of 0 or above [`MAX_DOF`], or `p` outside (0, 1).
pub fn isf(p: f64, k: u32) -> Option<f64> {
    if k == 0 || k > MAX_DOF || !(p > 0.0 && p < 1.0) {
        return None;
    }
    let target = libm::log(p);
    // Wilson–Hilferty start, with the normal quantile from a rough inverse (refined below).
    let kf = f64::from(k);
    let z = normal_isf_rough(p);
    let c = 1.0 - 2.0 / (9.0 * kf) + z * libm::sqrt(2.0 / (9.0 * kf));
    let mut x = (kf * c * c * c).max(1e-8);
    // Bracket: ln Q decreases in x.
    let (mut lo, mut hi) = (0.0_f64, f64::INFINITY);
    for _ in 0..200 {
        let g = ln_upper_tail(k, x) - target;
        if g > 0.0 {
            lo = x;
        } else {
            hi = x;
        }
        if g.abs() < 1e-13 {
            return Some(x);
        }
        // d ln Q / dx = −f(x) / Q(x).
        let slope = -libm::exp(ln_density(k, x) - ln_upper_tail(k, x));
        let mut next = x - g / slope;
        if !(next > lo && next < hi && next.is_finite()) {
            next = if hi.is_finite() {
                0.5 * (lo + hi)
            } else {
                2.0 * x.max(1.0)
            };
        }
        if (next - x).abs() <= 1e-15 * x {
            return Some(next);
        }
        x = next;
    }
    Some(x)
}

/// A rough standard normal upper quantile (a start for Newton's method only): the
/// logistic-style approximation `z ≈ √(−2 ln p) − …` for small `p`, mirrored for large.
fn normal_isf_rough(p: f64) -> f64 {
    let q = if p < 0.5 { p } else { 1.0 - p };
    let t = libm::sqrt(-2.0 * libm::log(q));
    // Abramowitz & Stegun 26.2.23 (|error| < 4.5e-4).
    let z = t
        - (2.515_517 + 0.802_853 * t + 0.010_328 * t * t)
            / (1.0 + 1.432_788 * t + 0.189_269 * t * t + 0.001_308 * t * t * t);
    if p < 0.5 {
        z
    } else {
        -z
    }
}

#[cfg(test)]
#[path = "chi2_tests.rs"]
mod tests;
