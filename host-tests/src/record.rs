//! What a run keeps of each epoch: compact enough for a day at 1 Hz, complete enough for
//! every metric, plot and export.

use trackfix_engine::{
    FilterEvent, FixKind, FixOutcome, FixSource, GnssTime, Integrity, IonoCorrection, LocalFrame,
    NoFixReason, SatId, SatStatus, Solution,
};

/// A fix, reduced to what metrics and reports use.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FixSummary {
    /// 2-D or 3-D.
    pub kind: FixKind,
    /// ECEF position, m.
    pub ecef_m: [f64; 3],
    /// Latitude, longitude (degrees) and ellipsoidal height (m).
    pub lat_lon_h: [f64; 3],
    /// East/north/up error against the truth, m, when a truth is known.
    pub enu_error_m: Option<[f64; 3]>,
    /// Horizontal, vertical and position DOP.
    pub hdop: f64,
    /// Vertical DOP.
    pub vdop: f64,
    /// Position DOP.
    pub pdop: f64,
    /// 1-σ east, north, up from the engine's covariance, m.
    pub sigma_enu_m: [f64; 3],
    /// Satellites used.
    pub used: u8,
    /// Root mean square of the post-fit residuals, m.
    pub residual_rms_m: f64,
    /// Ionosphere correction applied.
    pub iono: IonoCorrection,
    /// Velocity east/north/up from Doppler, m/s, when the fix has one.
    pub velocity_enu_mps: Option<[f64; 3]>,
    /// 1-σ of that velocity, east/north/up, m/s.
    pub velocity_sigma_enu_mps: Option<[f64; 3]>,
    /// Snapshot, filtered or predicted.
    pub source: FixSource,
}

/// One satellite's view in an epoch.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SatSummary {
    /// The satellite.
    pub sat: SatId,
    /// Elevation and azimuth, degrees, when known.
    pub el_az_deg: Option<(f32, f32)>,
    /// Post-fit residual, m, when used.
    pub residual_m: Option<f32>,
    /// Status.
    pub status: SatStatus,
    /// Taken for a reflection and down-weighted.
    pub reflection: bool,
}

/// One epoch of a run.
#[derive(Clone, Debug, PartialEq)]
pub struct EpochRecord {
    /// Receiver time tag.
    pub time: GnssTime,
    /// True antenna position, when known.
    pub truth_ecef_m: Option<[f64; 3]>,
    /// The fix, if any.
    pub fix: Option<FixSummary>,
    /// Why there was no fix, if none.
    pub no_fix: Option<NoFixReason>,
    /// True on the first epoch after the receiver woke up (duty-cycled runs).
    pub wake_start: bool,
    /// True antenna velocity, ECEF m/s, when known (zero for a reference station).
    pub truth_velocity_ecef_mps: Option<[f64; 3]>,
    /// What the navigation filter did besides its usual step.
    pub filter_event: FilterEvent,
    /// The fix's integrity: state, protection levels, indicators.
    pub integrity: Integrity,
    /// Satellites received only by reflection, when a synthetic scenario knows it.
    pub reflected_truth: Vec<SatId>,
    /// Per satellite.
    pub sats: Vec<SatSummary>,
}

impl EpochRecord {
    /// Condenses a solution; `truth` is the true antenna position, if known.
    pub fn from_solution<const N: usize>(
        sol: &Solution<N>,
        truth: Option<[f64; 3]>,
        wake_start: bool,
    ) -> Self {
        let sats = sol
            .sats
            .iter()
            .map(|s| SatSummary {
                sat: s.sat,
                el_az_deg: s.elevation_deg.zip(s.azimuth_deg),
                residual_m: s.residual_m.map(|r| r as f32),
                status: s.status,
                reflection: s.reflection,
            })
            .collect::<Vec<_>>();
        let (fix, no_fix) = match &sol.outcome {
            FixOutcome::Fix(f) => {
                let enu_error_m = truth.map(|t| LocalFrame::at_ecef(t).enu(f.ecef_m));
                let res: Vec<f64> = sol.sats.iter().filter_map(|s| s.residual_m).collect();
                let rms = if res.is_empty() {
                    0.0
                } else {
                    (res.iter().map(|r| r * r).sum::<f64>() / res.len() as f64).sqrt()
                };
                let c = f.covariance_enu_m2;
                (
                    Some(FixSummary {
                        kind: f.kind,
                        ecef_m: f.ecef_m,
                        lat_lon_h: [
                            f.geodetic.lat_rad.to_degrees(),
                            f.geodetic.lon_rad.to_degrees(),
                            f.geodetic.height_m,
                        ],
                        enu_error_m,
                        hdop: f.dop.hdop,
                        vdop: f.dop.vdop,
                        pdop: f.dop.pdop,
                        sigma_enu_m: [
                            c[0][0].max(0.0).sqrt(),
                            c[1][1].max(0.0).sqrt(),
                            c[2][2].max(0.0).sqrt(),
                        ],
                        used: f.used,
                        residual_rms_m: rms,
                        iono: f.iono,
                        velocity_enu_mps: f.velocity.map(|v| v.enu_mps),
                        velocity_sigma_enu_mps: f.velocity.map(|v| {
                            let c = v.covariance_enu_m2s2;
                            [0, 1, 2].map(|k| c[k][k].max(0.0).sqrt())
                        }),
                        source: f.source,
                    }),
                    None,
                )
            }
            FixOutcome::NoFix(r) => (None, Some(*r)),
        };
        EpochRecord {
            time: sol.time,
            truth_ecef_m: truth,
            fix,
            no_fix,
            wake_start,
            truth_velocity_ecef_mps: None,
            filter_event: sol.filter_event,
            integrity: sol.integrity,
            reflected_truth: Vec::new(),
            sats,
        }
    }

    /// East/north/up velocity error against the truth velocity, m/s, when both are known.
    pub fn velocity_error_enu_mps(&self) -> Option<[f64; 3]> {
        let f = self.fix?;
        let v = f.velocity_enu_mps?;
        let t = self.truth_velocity_ecef_mps?;
        let t = LocalFrame::at_ecef(f.ecef_m).rotate(t);
        Some([v[0] - t[0], v[1] - t[1], v[2] - t[2]])
    }
}
