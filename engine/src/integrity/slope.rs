//! Slopes of the weighted least-squares residual test: how far each satellite's bias can move
//! the position for a given strength in the test statistic. The largest slope times the
//! detectable non-centrality's square root ([`super::ncx2`]) is the slope-based protection
//! level (Brown 1992; Parkinson & Axelrad 1988 \[M\]).
//!
//! For rows `g_i = [−e_i, −n_i, −u_i, clock of its system]` (local east/north/up, one clock
//! per system, absent systems pinned as in the position solution) with weights `w_i = 1/σ_i²`:
//! ```text
//! N = Σ w g gᵀ,   a_i = w_i N⁻¹ g_i   (column i of A = N⁻¹GᵀW),   P_ii = g_iᵀ a_i
//! slope_H,i = √((a_i,E² + a_i,N²) / (w_i (1 − P_ii))),   slope_V,i = |a_i,U| / √(w_i (1 − P_ii))
//! ```
//! A satellite whose residual is always zero (`1 − P_ii` below 1e-9: the only one of its
//! system) has an infinite slope: no test sees its bias. Checked against numpy's explicit
//! matrices (tools/refvectors/gen_slopes.py → slopes_numpy.csv) on 40 geometries of 5 to
//! 12 satellites: within 1e-9 relative (integrity/slope_tests.rs). Cost: one 6×6 Cholesky
//! and inverse, then about 60 multiplications per satellite.

use crate::linalg::{Cholesky6, Mat6};
use crate::snapshot::wls::{add_range_row, pin_absent_clocks};

/// One measurement of the geometry.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SlopeRow {
    /// Unit line of sight from the receiver to the satellite, east/north/up.
    pub los_enu: [f64; 3],
    /// Index of its system's clock (0, 1, 2).
    pub system: usize,
    /// Weight 1/σ², 1/m².
    pub weight: f64,
}

/// One satellite's slopes, metres of position error per unit √λ, with the figures the
/// residual test's identification and exclusion need.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Slope {
    /// Horizontal.
    pub horizontal: f64,
    /// Vertical.
    pub vertical: f64,
    /// Its redundancy `1 − P_ii`: the share of a bias on it that reaches its own residual.
    pub redundancy: f64,
    /// Column i of `A = N⁻¹GᵀW` for east, north and up: the position change per metre of
    /// its measurement.
    pub gain_enu: [f64; 3],
}

/// Why no slopes could be computed.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub enum SlopeError {
    /// A weight is not finite and positive, a system index is not 0–2, or `out` is shorter
    /// than `rows`.
    InvalidInput,
    /// The geometry is singular.
    SingularGeometry,
}

impl core::fmt::Display for SlopeError {
    fn fmt(&self, f: &mut core::fmt::Formatter<'_>) -> core::fmt::Result {
        f.write_str(match self {
            SlopeError::InvalidInput => "slope input: bad weight, system or output length",
            SlopeError::SingularGeometry => "slope input: singular geometry",
        })
    }
}

impl core::error::Error for SlopeError {}

/// The slopes of every row, written into `out` (in the same order).
///
/// # Errors
/// [`SlopeError::InvalidInput`] or [`SlopeError::SingularGeometry`].
pub fn slopes(rows: &[SlopeRow], out: &mut [Slope]) -> Result<(), SlopeError> {
    if out.len() < rows.len()
        || !rows
            .iter()
            .all(|r| r.weight > 0.0 && r.weight.is_finite() && r.system < 3)
    {
        return Err(SlopeError::InvalidInput);
    }
    let mut normal: Mat6 = [[0.0; 6]; 6];
    let mut present = [false; 3];
    for r in rows {
        let [e, n, u] = r.los_enu;
        add_range_row(&mut normal, [-e, -n, -u], r.system, r.weight);
        if let Some(p) = present.get_mut(r.system) {
            *p = true;
        }
    }
    pin_absent_clocks(&mut normal, &present);
    let inv = Cholesky6::factor(normal)
        .ok_or(SlopeError::SingularGeometry)?
        .inverse();
    for (r, s) in rows.iter().zip(out.iter_mut()) {
        *s = slope_of(&inv, r);
    }
    Ok(())
}

/// The slopes of one row given the inverse normal matrix `inv` of the geometry it belongs to
/// (built as [`slopes`] builds it).
pub(crate) fn slope_of(inv: &Mat6, r: &SlopeRow) -> Slope {
    let [e, n, u] = r.los_enu;
    let mut v = [-e, -n, -u, 0.0, 0.0, 0.0];
    if let Some(c) = v.get_mut(r.system.saturating_add(3)) {
        *c = 1.0;
    }
    let mut a = [0.0; 6];
    for (ai, row) in a.iter_mut().zip(inv) {
        *ai = r.weight * row.iter().zip(&v).map(|(x, y)| x * y).sum::<f64>();
    }
    let p_ii: f64 = v.iter().zip(&a).map(|(x, y)| x * y).sum();
    let [ae, an, au, ..] = a;
    let redundancy = (1.0 - p_ii).max(0.0);
    let (horizontal, vertical) = if redundancy < 1e-9 {
        (f64::INFINITY, f64::INFINITY)
    } else {
        let d = r.weight * redundancy;
        (
            libm::sqrt((ae * ae + an * an) / d),
            au.abs() / libm::sqrt(d),
        )
    };
    Slope {
        horizontal,
        vertical,
        redundancy,
        gain_enu: [ae, an, au],
    }
}

#[cfg(test)]
#[path = "slope_tests.rs"]
mod tests;
