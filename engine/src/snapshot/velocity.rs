//! Receiver velocity and clock drift from Doppler: weighted least squares on the range
//! rates of the satellites the position solution used.
//!
//! Model (common practice; the time derivative of the pseudorange equation): the measured
//! range rate −λ·D equals u·(v_sat − v_rx) + ḋ_rx − ḋ_sat, with u the unit line of sight from
//! receiver to satellite, v_sat the satellite's ECEF velocity, ḋ_rx the receiver clock drift
//! and ḋ_sat the satellite's (both in m/s). One receiver drift serves every system: the
//! systems share the receiver's oscillator. Unknowns v_rx (3) and ḋ_rx (1); rows [−u, 1].
//!
//! Cost per satellite: a rank-one update at 4×4 entries; one 6×6 Cholesky (two unknowns
//! pinned) and its inverse per epoch.

use crate::frames::{dot, LocalFrame};
use crate::linalg::{add, Cholesky6, Mat6};
use crate::solution::Velocity;

/// One satellite's range rate, ready for the velocity solution.
#[derive(Clone, Copy, Debug)]
pub(crate) struct RateRow {
    /// Unit line of sight from the receiver to the satellite, ECEF.
    pub los: [f64; 3],
    /// Satellite velocity, ECEF m/s.
    pub sat_vel: [f64; 3],
    /// Satellite clock drift, m/s.
    pub sat_drift_mps: f64,
    /// Measured range rate −λ·D, m/s.
    pub range_rate_mps: f64,
    /// Its standard deviation, m/s.
    pub sigma_mps: f64,
}

impl RateRow {
    /// The range rate with the satellite's motion and clock drift removed: −u·v_rx + ḋ_rx.
    fn reduced(&self) -> f64 {
        self.range_rate_mps - dot(self.los, self.sat_vel) + self.sat_drift_mps
    }
}

/// The velocity and clock drift from `rows` (at least four), expressed also in the local
/// frame `frame`; `residuals` receives the post-fit residual of each row (m/s).
pub(crate) fn solve_velocity(
    rows: &[RateRow],
    frame: &LocalFrame,
    residuals: &mut [f64],
) -> Option<Velocity> {
    if rows.len() < 4 {
        return None;
    }
    let mut normal: Mat6 = [[0.0; 6]; 6];
    let mut rhs = [0.0f64; 6];
    for r in rows {
        let h = [-r.los[0], -r.los[1], -r.los[2], 1.0];
        let w = 1.0 / (r.sigma_mps * r.sigma_mps);
        let y = r.reduced();
        for (i, a) in h.iter().enumerate() {
            for (j, b) in h.iter().enumerate() {
                add(&mut normal, i, j, a * b * w);
            }
            if let Some(x) = rhs.get_mut(i) {
                *x += a * y * w;
            }
        }
    }
    // Two unknowns of the 6×6 kernel are not used here: pin them.
    add(&mut normal, 4, 4, 1.0);
    add(&mut normal, 5, 5, 1.0);
    let chol = Cholesky6::new(&normal)?;
    let x = chol.solve(&rhs);
    if x.iter().any(|v| !v.is_finite()) {
        return None;
    }
    let v = [x[0], x[1], x[2]];
    for (r, out) in rows.iter().zip(residuals.iter_mut()) {
        *out = r.reduced() - (-dot(r.los, v) + x[3]);
    }
    let inv = chol.inverse();
    let cov = crate::snapshot::wls::enu_block(frame, &inv);
    Some(Velocity {
        ecef_mps: v,
        enu_mps: frame.rotate(v),
        clock_drift_mps: x[3],
        covariance_enu_m2s2: cov,
        used: u8::try_from(rows.len()).unwrap_or(u8::MAX),
    })
}
