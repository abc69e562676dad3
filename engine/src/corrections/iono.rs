//! Broadcast (Klobuchar) ionosphere model, IS-GPS-200 §20.3.3.5.2.5.
//!
//! Cost: 1 cos, 1 sin-free polynomial pair, a handful of multiplies per satellite.

use crate::linalg::Scalar;
use crate::sat::SPEED_OF_LIGHT;
use crate::trig::{cos, sin};

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
        let c = self.map(|v| v);
        klobuchar(
            &c,
            lat_rad,
            lon_rad,
            sin(az_rad),
            cos(az_rad),
            el_rad,
            tow_s,
        ) * SPEED_OF_LIGHT
    }

    /// The same model in single precision, for the per-epoch path on an FPU that has only
    /// f32 (Cortex-M4F): azimuth enters through its sine and cosine (no atan2 needed). One
    /// implementation serves both precisions; `iono_tests.rs` bounds the difference at 1 mm
    /// over the whole model domain.
    pub fn delay_l1_m_f32(
        &self,
        lat_rad: f32,
        lon_rad: f32,
        sin_az: f32,
        cos_az: f32,
        el_rad: f32,
        tow_s: f64,
    ) -> f32 {
        let c = self.map(|v| v as f32);
        klobuchar(&c, lat_rad, lon_rad, sin_az, cos_az, el_rad, tow_s) * SPEED_OF_LIGHT as f32
    }

    fn map<T: Copy>(&self, f: impl Fn(f64) -> T) -> ([T; 4], [T; 4]) {
        (self.alpha.map(&f), self.beta.map(&f))
    }
}

/// IS-GPS-200 Figure 20-4 in precision `T`: the L1 delay in seconds.
#[expect(
    clippy::arithmetic_side_effects,
    reason = "T is f32 or f64 (the only implementations of Scalar): float arithmetic cannot panic"
)]
fn klobuchar<T: Scalar>(
    (alpha, beta): &([T; 4], [T; 4]),
    lat_rad: T,
    lon_rad: T,
    sin_az: T,
    cos_az: T,
    el_rad: T,
    tow_s: f64,
) -> T {
    #[expect(
        clippy::approx_constant,
        reason = "IS-GPS-200 specifies this value of π"
    )]
    let pi = T::of(3.141_592_653_589_8);
    let n = T::of;
    let e = el_rad / pi; // semicircles
    let psi = n(0.0137) / (e + n(0.11)) - n(0.022);
    let phi_i = clamp(lat_rad / pi + psi * cos_az, n(-0.416), n(0.416));
    let lam_i = lon_rad / pi + psi * sin_az / (phi_i * pi).cos();
    let phi_m = phi_i + n(0.064) * ((lam_i - n(1.617)) * pi).cos();
    // Local time in f64 whatever T is: the time of week needs 20 bits before the reduction.
    // The reduction to [0, 86,400) through floor rather than `%`: the remainder routine of
    // the float library costs 3.3 KB of flash on the target, floor a few dozen bytes, and
    // the rounding of t/86,400 is far below the second that the model resolves.
    let t = 43_200.0 * lam_i.to_f64() + tow_s;
    let t = t - 86_400.0 * libm::floor(t / 86_400.0);
    let t = T::of(if t < 0.0 { t + 86_400.0 } else { t });
    let f = n(1.0) + n(16.0) * (n(0.53) - e) * (n(0.53) - e) * (n(0.53) - e);
    let poly = |&[c0, c1, c2, c3]: &[T; 4]| c0 + phi_m * (c1 + phi_m * (c2 + phi_m * c3));
    let amp = max(poly(alpha), n(0.0));
    let per = max(poly(beta), n(72_000.0));
    let x = n(2.0) * pi * (t - n(50_400.0)) / per;
    if x.abs() < n(1.57) {
        f * (n(5e-9) + amp * (n(1.0) - x * x / n(2.0) + x * x * x * x / n(24.0)))
    } else {
        f * n(5e-9)
    }
}

fn clamp<T: Scalar>(v: T, lo: T, hi: T) -> T {
    if v < lo {
        lo
    } else if v > hi {
        hi
    } else {
        v
    }
}

fn max<T: Scalar>(a: T, b: T) -> T {
    if a > b {
        a
    } else {
        b
    }
}

#[cfg(test)]
#[path = "iono_tests.rs"]
mod tests;
