//! The fix the filter reports: its position, velocity and clocks with their covariance
//! rotated to east/north/up, and the DOP of the pseudoranges it applied.

use super::FilterState;
use crate::corrections::site::Site;
use crate::linalg::Mat6;
use crate::measurements::record::Measurement;
use crate::snapshot::wls::{add_range_row, dop, enu_block, pin_absent_clocks};
use crate::solution::{Dop, Fix, FixKind, FixSource, IonoCorrection, Velocity};

/// What the report needs besides the state.
pub(crate) struct Report<'a> {
    pub state: &'a FilterState,
    pub source: FixSource,
    /// Pseudoranges applied this epoch.
    pub used: u8,
    /// Range rates applied this epoch.
    pub rates_used: u8,
    /// Σ NIS of the applied pseudoranges.
    pub nis_sum: f64,
    /// The measurement records (the DOP is that of the applied pseudoranges).
    pub meas: &'a [Measurement],
    pub iono_applied: bool,
    /// σ of the signal-in-space range error, m (the reported covariance's floor).
    pub ure_sigma_m: f64,
    /// The corrections' site: the predicted position, its geodetic position and frame.
    pub site: &'a Site<'a>,
}

/// The fix; `None` only for a position with no geodetic frame (never for a healthy state).
#[inline(never)]
pub(crate) fn report(r: &Report<'_>) -> Option<Fix> {
    let s = r.state;
    let ecef_m = s.position();
    // The site's frame (at the predicted position, metres away) rotates the covariances:
    // the axes differ by the angle the move subtends, about 1e-6 rad per 6 m.
    let frame = r.site.frame;
    let geodetic = r.site.geo.nudged(frame.origin, &frame, ecef_m);
    if !geodetic.height_m.is_finite() {
        return None;
    }
    let (b, drift) = s.clock();
    let [isb_e, isb_c] = s.inter_system_biases();
    let v = s.velocity();
    let mut geometry: Mat6 = [[0.0; 6]; 6];
    let mut present = [false; 3];
    for m in r.meas.iter().filter(|m| m.out.used()) {
        add_range_row(&mut geometry, m.out.row, m.sat.sys, 1.0);
        if let Some(p) = present.get_mut(m.sat.sys) {
            *p = true;
        }
    }
    pin_absent_clocks(&mut geometry, &present);
    let mut system_clock_m = [None; 3];
    for ((slot, present), isb) in system_clock_m
        .iter_mut()
        .zip(present)
        .zip([0.0, isb_e, isb_c])
    {
        if present {
            *slot = Some(b + isb);
        }
    }
    let dop = if r.used >= 4 {
        dop(&geometry, &present, &frame).unwrap_or_default()
    } else {
        Dop::default()
    };
    Some(Fix {
        kind: FixKind::ThreeD,
        ecef_m,
        geodetic,
        clock_bias_m: system_clock_m.iter().flatten().next().copied().unwrap_or(b),
        system_clock_m,
        covariance_enu_m2: with_floor(enu_block(&frame, &s.position_cov()), &dop, r.ure_sigma_m),
        dop,
        used: r.used,
        iterations: 0,
        iono: if r.iono_applied {
            IonoCorrection::Klobuchar
        } else {
            IonoCorrection::None
        },
        weighted_sse: r.nis_sum,
        velocity: Some(Velocity {
            ecef_mps: v,
            enu_mps: frame.rotate(v),
            clock_drift_mps: drift,
            covariance_enu_m2s2: enu_block(&frame, &s.velocity_cov()),
            used: r.rates_used,
        }),
        source: r.source,
    })
}

/// The reported position covariance, scaled up where its trace falls below `σ_URE²·PDOP²`:
/// the signal-in-space error changes over hours, so averaging epochs cannot take the
/// position's uncertainty below what one epoch's geometry makes of it, although the filter
/// (which treats each epoch's errors as independent) would say so after a long hold. The
/// state keeps its own covariance; only the report is floored.
fn with_floor(cov: [[f64; 3]; 3], dop: &Dop, ure_sigma_m: f64) -> [[f64; 3]; 3] {
    let trace = cov[0][0] + cov[1][1] + cov[2][2];
    let floor = ure_sigma_m * ure_sigma_m * dop.pdop * dop.pdop;
    if !(trace > 0.0 && floor > trace) {
        return cov;
    }
    let k = floor / trace;
    cov.map(|row| row.map(|v| v * k))
}
