//! Troposphere: Saastamoinen zenith delays under a standard atmosphere, mapped to the
//! satellite's elevation with the satellite-based augmentation MOPS mapping function
//! m(E) = 1.001/√(0.002001 + sin²E).
//!
//! Cost per satellite: one sqrt; the zenith delays are computed once per epoch.

use crate::trig::cos;
use libm::sqrt;

/// Zenith hydrostatic and wet delays at the receiver, metres.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ZenithDelay {
    /// Zenith hydrostatic delay, m.
    pub hydrostatic_m: f64,
    /// Zenith wet delay, m.
    pub wet_m: f64,
}

impl ZenithDelay {
    /// Saastamoinen zenith delays (Davis et al. 1985 hydrostatic form) from pressure `p_hpa`,
    /// temperature `t_k` and water-vapour partial pressure `e_hpa` at latitude `lat_rad` and
    /// ellipsoidal height `h_m` (used as orthometric: the geoid's ±100 m moves the result
    /// by < 3 cm).
    pub fn saastamoinen(p_hpa: f64, t_k: f64, e_hpa: f64, lat_rad: f64, h_m: f64) -> Self {
        let denom = 1.0 - 0.002_66 * cos(2.0 * lat_rad) - 2.8e-7 * h_m;
        ZenithDelay {
            hydrostatic_m: 0.002_276_8 * p_hpa / denom,
            wet_m: 0.002_277 * (1255.0 / t_k + 0.05) * e_hpa,
        }
    }

    /// Zenith delays under a standard atmosphere at height `h_m` (clamped to −500…11,000 m):
    /// 1013.25 hPa, 15 °C and 50 % relative humidity at sea level, pressure falling as
    /// (1 − 2.2557e-5·h)^5.2568 and temperature by 6.5 K/km (the ICAO/US standard
    /// atmosphere, common practice).
    pub fn standard_atmosphere(lat_rad: f64, h_m: f64) -> Self {
        let h = h_m.clamp(-500.0, 11_000.0);
        // x^5.2568 as exp(5.2568·ln x), in single precision: without the general power
        // routine (2.5 KB of flash on the target), and with the f32 exponential and
        // logarithm (1.2 KB less than the f64 ones); the delay moves by under a micrometre
        // (tropo_tests.rs).
        let p = 1013.25
            * f64::from(libm::expf(
                5.2568 * libm::logf((1.0 - 2.2557e-5 * h) as f32),
            ));
        let t = 288.15 - 6.5e-3 * h;
        // Saturation vapour pressure (Magnus form, common practice), 50 % humidity.
        let tc = t - 273.15;
        let e = 0.5 * 6.1078 * f64::from(libm::expf((17.27 * tc / (tc + 237.3)) as f32));
        Self::saastamoinen(p, t, e, lat_rad, h)
    }

    /// Slant delay at an elevation whose sine is `sin_el`, metres.
    pub fn slant_m(&self, sin_el: f64) -> f64 {
        (self.hydrostatic_m + self.wet_m) * mapping(sin_el)
    }
}

/// The MOPS mapping function m(E) = 1.001/√(0.002001 + sin²E).
pub fn mapping(sin_el: f64) -> f64 {
    1.001 / sqrt(0.002_001 + sin_el * sin_el)
}

#[cfg(test)]
#[path = "tropo_tests.rs"]
mod tests;
