//! Receiver velocity and clock drift from Doppler: weighted least squares on the range
//! rates of the satellites the position solution used.
//!
//! Model (common practice; the time derivative of the pseudorange equation): the measured
//! range rate −λ·D equals u·(v_sat − v_rx) + ḋ_rx − ḋ_sat, with u the unit line of sight from
//! receiver to satellite, v_sat the satellite's ECEF velocity, ḋ_rx the receiver clock drift
//! and ḋ_sat the satellite's (both in m/s). One receiver drift serves every system: the
//! systems share the receiver's oscillator. Unknowns v_rx (3) and ḋ_rx (1); rows [−u, 1].
//!
//! Cost per satellite: a rank-one update of the 4×4 normal matrix (and one dot product for
//! its residual); one 4×4 Cholesky and its inverse per epoch. No buffer: the rows are made
//! twice from the candidates, once for the normal equations, once for the residuals.

use crate::frames::{dot, LocalFrame};
use crate::linalg::{add, Cholesky, Mat};
use crate::measurements::record::{Candidate, Outcome};
use crate::snapshot::wls::enu_block;
use crate::solution::Velocity;

/// One satellite's range rate, ready for the velocity solution.
#[derive(Clone, Copy, Debug)]
pub(crate) struct RateRow {
    /// Unit line of sight from the receiver to the satellite, ECEF.
    pub los: [f64; 3],
    /// The range rate with the satellite's motion and clock drift removed, m/s:
    /// −λ·D − u·v_sat + ḋ_sat = −u·v_rx + ḋ_rx.
    pub reduced_mps: f64,
    /// Its standard deviation, m/s.
    pub sigma_mps: f64,
}

impl RateRow {
    /// The row of a candidate the position solution used and whose Doppler is usable;
    /// `sigma_mps` is the Doppler σ at the reference C/N0.
    pub fn of(c: &Candidate, o: &Outcome, sigma_mps: f64) -> Option<RateRow> {
        let rate = c.range_rate_mps.filter(|_| o.used())?;
        let los = [-o.row[0], -o.row[1], -o.row[2]];
        Some(RateRow {
            los,
            reduced_mps: rate - dot(los, c.vel) + c.clock_drift_mps,
            sigma_mps: sigma_mps * f64::from(c.cn0_factor),
        })
    }

    /// Post-fit residual against velocity `v` and drift `drift`, m/s.
    pub fn residual(&self, v: [f64; 3], drift: f64) -> f64 {
        self.reduced_mps - (-dot(self.los, v) + drift)
    }
}

/// The velocity and clock drift from the rows `rows` yields (at least four), also in the
/// local frame `frame`.
#[inline(never)]
pub(crate) fn solve_velocity(
    rows: impl Iterator<Item = RateRow>,
    frame: &LocalFrame,
) -> Option<Velocity> {
    // Solved at the position solution's size, 6×6, with the two spare unknowns pinned by a
    // unit diagonal: the target then links one set of 6×6 kernels instead of a second set
    // of 4×4 ones (1.2 KB of flash for a few hundred multiplications at a restart).
    let mut normal: Mat<6> = [[0.0; 6]; 6];
    add(&mut normal, 4, 4, 1.0);
    add(&mut normal, 5, 5, 1.0);
    let mut rhs = [0.0f64; 6];
    let mut used = 0u8;
    for r in rows {
        let h = [-r.los[0], -r.los[1], -r.los[2], 1.0];
        let w = 1.0 / (r.sigma_mps * r.sigma_mps);
        for (i, a) in h.iter().enumerate() {
            for (j, b) in h.iter().enumerate() {
                add(&mut normal, i, j, a * b * w);
            }
            if let Some(x) = rhs.get_mut(i) {
                *x += a * r.reduced_mps * w;
            }
        }
        used = used.saturating_add(1);
    }
    if used < 4 {
        return None;
    }
    let chol = Cholesky::new(&normal)?;
    let [vx, vy, vz, drift, _, _] = chol.solve(&rhs);
    let v = [vx, vy, vz];
    if !v.iter().chain([&drift]).all(|x| x.is_finite()) {
        return None;
    }
    let cov = enu_block(frame, &chol.inverse());
    Some(Velocity {
        ecef_mps: v,
        enu_mps: frame.rotate(v),
        clock_drift_mps: drift,
        covariance_enu_m2s2: cov,
        used,
    })
}
