//! The corrections of every satellite seen from one receiver position: elevation and
//! azimuth, the elevation mask, the ionosphere and troposphere delays and the σ model.
//! Both the least-squares solution (at its iterate) and the navigation filter (at its
//! predicted position) call [`Site::apply`], so the two paths correct alike.
//!
//! Cost per satellite: two single-precision atan2, the f32 Klobuchar model and the
//! troposphere mapping function; once per site one geodetic conversion, one local frame and
//! the standard atmosphere.

use crate::config::{Config, IonoModel, TropoModel};
use crate::corrections::iono::IonoCoefficients;
use crate::corrections::tropo::{mapping, ZenithDelay};
use crate::frames::{Geodetic, LocalFrame};
use libm::sqrt;

/// Lowest sin(elevation) used in the σ model, so a satellite at the horizon (reachable with a
/// mask of 0°) gets a large but finite σ.
const MIN_SIN_EL: f64 = 0.05;

/// σ of the zenith troposphere left by the model, m (RTCA DO-229, σ_tropo = 0.12 m·m(E) \[M\]).
const TROPO_RESIDUAL_M: f64 = 0.12;

/// What one satellite needs from the corrections: its system's ionospheric scale and its
/// C/N0 σ factor.
#[derive(Clone, Copy, Debug)]
pub(crate) struct SatInput {
    /// Ionospheric scale from L1 to the signal's frequency.
    pub iono_scale: f32,
    /// Multiplier of σ from C/N0 (≥ 1).
    pub cn0_factor: f32,
}

/// The corrections of one satellite.
#[derive(Clone, Copy, Debug)]
pub(crate) struct SatCorrection {
    /// Elevation and azimuth, rad.
    pub el_az: (f32, f32),
    /// Below the elevation mask.
    pub masked: bool,
    /// Ionosphere plus troposphere delay, m.
    pub delay_m: f64,
    /// Pseudorange σ, m (the configured code and multipath model).
    pub sigma_m: f64,
    /// Variance of what the atmosphere models leave, m²: half of the broadcast ionosphere
    /// delay (the Klobuchar model removes about half of the delay, Klobuchar 1987 \[M\])
    /// and 0.12 m of zenith troposphere through the mapping function (RTCA DO-229's
    /// σ_tropo \[M\]). The least-squares weights leave it out (it changes them little);
    /// the filter adds it to its measurement variance, whose innovations it tests.
    pub model_var_m2: f64,
}

/// A receiver position with what its corrections need.
pub(crate) struct Site<'a> {
    cfg: &'a Config,
    iono: Option<&'a IonoCoefficients>,
    tow_s: f64,
    /// Geodetic position of the site.
    pub geo: Geodetic,
    /// East/north/up axes at the site.
    pub frame: LocalFrame,
    zenith: Option<ZenithDelay>,
    sin_mask: f64,
}

impl<'a> Site<'a> {
    /// The site at ECEF `pos` (m), for an epoch at GPS time of week `tow_s`; `iono` is used
    /// only when the configuration asks for the broadcast model and the coefficients are
    /// finite.
    pub fn new(
        cfg: &'a Config,
        iono: Option<&'a IonoCoefficients>,
        tow_s: f64,
        pos: [f64; 3],
    ) -> Self {
        let geo = Geodetic::from_ecef(pos);
        let frame = LocalFrame::new(pos, &geo);
        let zenith = (cfg.corrections.troposphere == TropoModel::StandardAtmosphere)
            .then(|| ZenithDelay::standard_atmosphere(geo.lat_rad, geo.height_m));
        Site {
            cfg,
            iono: iono
                .filter(|c| cfg.corrections.ionosphere == IonoModel::Broadcast && c.is_finite()),
            tow_s,
            geo,
            frame,
            zenith,
            sin_mask: crate::trig::sin(cfg.snapshot.elevation_mask_deg.to_radians()),
        }
    }

    /// Whether the broadcast ionosphere is applied.
    pub fn iono_applied(&self) -> bool {
        self.iono.is_some()
    }

    /// The corrections of a satellite in the unit direction `u` (ECEF, from the site).
    pub fn apply(&self, sat: SatInput, u: [f64; 3]) -> SatCorrection {
        let [e, n, up] = self.frame.rotate(u);
        // Elevation and azimuth only feed the ionosphere model and reports: single
        // precision is ample (iono_tests.rs bounds the model's f32 error at 1 mm).
        let hor = sqrt(e * e + n * n);
        let el = libm::atan2f(up as f32, hor as f32);
        let az = libm::atan2f(e as f32, n as f32);
        let mut delay = 0.0;
        let mut iono = 0.0;
        if let Some(k) = self.iono {
            let (sa, ca) = if hor > 0.0 {
                ((e / hor) as f32, (n / hor) as f32)
            } else {
                (0.0, 1.0)
            };
            let d = k.delay_l1_m_f32(
                self.geo.lat_rad as f32,
                self.geo.lon_rad as f32,
                sa,
                ca,
                el,
                self.tow_s,
            );
            iono = f64::from(sat.iono_scale * d);
            delay += iono;
        }
        if let Some(z) = &self.zenith {
            delay += z.slant_m(up);
        }
        let s = &self.cfg.snapshot;
        let tropo = TROPO_RESIDUAL_M * mapping(up);
        SatCorrection {
            el_az: (el, az),
            masked: up < self.sin_mask,
            delay_m: delay,
            sigma_m: (s.sigma_floor_m + s.sigma_elevation_m / up.max(MIN_SIN_EL))
                * f64::from(sat.cn0_factor),
            model_var_m2: 0.25 * iono * iono + tropo * tropo,
        }
    }
}
