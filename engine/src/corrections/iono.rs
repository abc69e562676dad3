//! Broadcast (Klobuchar) ionosphere model, IS-GPS-200 §20.3.3.5.2.5.
//!
//! Cost: 1 cos, 1 sin-free polynomial pair, a handful of multiplies per satellite.

use crate::sat::SPEED_OF_LIGHT;
use libm::cos;

/// The eight broadcast ionosphere coefficients (GPS LNAV subframe 4 page 18, or the
/// `GPSA`/`GPSB` lines of a RINEX navigation header).
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct IonoCoefficients {
    /// α0…α3: amplitude polynomial, s, s/semicircle, s/semicircle², s/semicircle³.
    pub alpha: [f64; 4],
    /// β0…β3: period polynomial, s, s/semicircle, s/semicircle², s/semicircle³.
    pub beta: [f64; 4],
}

impl IonoCoefficients {
    /// True when every coefficient is finite.
    pub fn is_finite(&self) -> bool {
        self.alpha
            .iter()
            .chain(self.beta.iter())
            .all(|v| v.is_finite())
    }

    /// Ionospheric delay on GPS L1, metres, for a receiver at geodetic latitude `lat_rad`,
    /// longitude `lon_rad`, looking at azimuth `az_rad` and elevation `el_rad`, at GPS
    /// time of week `tow_s`. Scale by [`crate::Signal::iono_scale_from_l1`] for other
    /// frequencies.
    pub fn delay_l1_m(
        &self,
        lat_rad: f64,
        lon_rad: f64,
        az_rad: f64,
        el_rad: f64,
        tow_s: f64,
    ) -> f64 {
        #[expect(
            clippy::approx_constant,
            reason = "IS-GPS-200 specifies this value of π"
        )]
        const PI: f64 = 3.141_592_653_589_8;
        let e = el_rad / PI; // semicircles
        let phi_u = lat_rad / PI;
        let lam_u = lon_rad / PI;
        let psi = 0.0137 / (e + 0.11) - 0.022;
        let phi_i = (phi_u + psi * cos(az_rad)).clamp(-0.416, 0.416);
        let lam_i = lam_u + psi * libm::sin(az_rad) / cos(phi_i * PI);
        let phi_m = phi_i + 0.064 * cos((lam_i - 1.617) * PI);
        let t = (43_200.0 * lam_i + tow_s) % 86_400.0;
        let t = if t < 0.0 { t + 86_400.0 } else { t };
        let f = 1.0 + 16.0 * (0.53 - e) * (0.53 - e) * (0.53 - e);
        let poly = |c: &[f64; 4]| c[0] + phi_m * (c[1] + phi_m * (c[2] + phi_m * c[3]));
        let amp = poly(&self.alpha).max(0.0);
        let per = poly(&self.beta).max(72_000.0);
        let x = 2.0 * PI * (t - 50_400.0) / per;
        let delay_s = if x.abs() < 1.57 {
            f * (5e-9 + amp * (1.0 - x * x / 2.0 + x * x * x * x / 24.0))
        } else {
            f * 5e-9
        };
        delay_s * SPEED_OF_LIGHT
    }
}

impl IonoCoefficients {
    /// The same model in single precision, for the per-epoch path on an FPU that has only
    /// f32 (Cortex-M4F): azimuth enters through its sine and cosine (no atan2 needed), the
    /// time of week through the local-time term only. `iono_tests.rs` bounds the difference
    /// from [`IonoCoefficients::delay_l1_m`] at 1 mm over the whole model domain.
    pub fn delay_l1_m_f32(
        &self,
        lat_rad: f32,
        lon_rad: f32,
        sin_az: f32,
        cos_az: f32,
        el_rad: f32,
        tow_s: f64,
    ) -> f32 {
        const PI: f32 = core::f32::consts::PI;
        let e = el_rad / PI;
        let psi = 0.0137 / (e + 0.11) - 0.022;
        let phi_i = (lat_rad / PI + psi * cos_az).clamp(-0.416, 0.416);
        let lam_i = lon_rad / PI + psi * sin_az / libm::cosf(phi_i * PI);
        let phi_m = phi_i + 0.064 * libm::cosf((lam_i - 1.617) * PI);
        // Local time in f64 first: the time of week needs 20 bits before the reduction.
        let t = (43_200.0 * f64::from(lam_i) + tow_s) % 86_400.0;
        let t = (if t < 0.0 { t + 86_400.0 } else { t }) as f32;
        let f = 1.0 + 16.0 * (0.53 - e) * (0.53 - e) * (0.53 - e);
        let poly = |c: &[f64; 4]| {
            let c = c.map(|x| x as f32);
            c[0] + phi_m * (c[1] + phi_m * (c[2] + phi_m * c[3]))
        };
        let amp = poly(&self.alpha).max(0.0);
        let per = poly(&self.beta).max(72_000.0);
        let x = 2.0 * PI * (t - 50_400.0) / per;
        let delay_s = if x.abs() < 1.57 {
            f * (5e-9 + amp * (1.0 - x * x / 2.0 + x * x * x * x / 24.0))
        } else {
            f * 5e-9
        };
        delay_s * 299_792_458.0
    }
}

#[cfg(test)]
#[path = "iono_tests.rs"]
mod tests;
