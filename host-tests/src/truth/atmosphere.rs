//! Ionosphere and troposphere truth, apart from the engine's implementation.

use trackfix_engine::SPEED_OF_LIGHT;

/// Klobuchar broadcast coefficients (α, β) as the ICD lists them.
pub type Klobuchar = ([f64; 4], [f64; 4]);

/// IS-GPS-200 §20.3.3.5.2.5 (Figure 20-4): L1 ionospheric delay in metres for a user at
/// `lat`, `lon` (rad) looking at azimuth `az` and elevation `el` (rad) at GPS time of week
/// `tow_s`. Angles in the algorithm are semicircles; the ICD's π is used.
pub fn klobuchar_l1_m(k: &Klobuchar, lat: f64, lon: f64, az: f64, el: f64, tow_s: f64) -> f64 {
    #[expect(
        clippy::approx_constant,
        reason = "IS-GPS-200 specifies this value of π"
    )]
    const ICD_PI: f64 = 3.141_592_653_589_8;
    let (alpha, beta) = k;
    let el_sc = el / ICD_PI;
    // Earth-centred angle, semicircles.
    let psi = 0.0137 / (el_sc + 0.11) - 0.022;
    // Ionospheric pierce point, semicircles.
    let phi_i = (lat / ICD_PI + psi * az.cos()).clamp(-0.416, 0.416);
    let lam_i = lon / ICD_PI + psi * az.sin() / (phi_i * ICD_PI).cos();
    // Geomagnetic latitude, semicircles.
    let phi_m = phi_i + 0.064 * ((lam_i - 1.617) * ICD_PI).cos();
    let local = (4.32e4 * lam_i + tow_s).rem_euclid(86_400.0);
    let slant = 1.0 + 16.0 * (0.53 - el_sc).powi(3);
    let amplitude = (0..4)
        .map(|n| alpha[n] * phi_m.powi(n as i32))
        .sum::<f64>()
        .max(0.0);
    let period = (0..4)
        .map(|n| beta[n] * phi_m.powi(n as i32))
        .sum::<f64>()
        .max(72_000.0);
    let x = 2.0 * ICD_PI * (local - 50_400.0) / period;
    let seconds = if x.abs() < 1.57 {
        slant * (5.0e-9 + amplitude * (1.0 - x.powi(2) / 2.0 + x.powi(4) / 24.0))
    } else {
        slant * 5.0e-9
    };
    seconds * SPEED_OF_LIGHT
}

/// Slant tropospheric delay, m, at elevation `el` (rad) for a receiver at latitude `lat`
/// (rad) and height `h` (m) in a standard atmosphere: Saastamoinen hydrostatic delay in the
/// Davis et al. (1985) form, 0.0022768·P/(1 − 0.00266·cos 2φ − 2.8e-7·h), and wet delay
/// 0.002277·(1255/T + 0.05)·e; pressure 1013.25·(1 − 2.2557e-5·h)^5.2568 hPa, temperature
/// 288.15 − 0.0065·h K, 50 % relative humidity with the Magnus saturation pressure (common
/// practice); mapped by 1.001/√(0.002001 + sin²E) (the SBAS MOPS form, CHECKS.md [M]).
pub fn troposphere_m(lat: f64, h: f64, el: f64) -> f64 {
    let h = h.clamp(-500.0, 11_000.0);
    let pressure = 1013.25 * (1.0 - 2.2557e-5 * h).powf(5.2568);
    let kelvin = 288.15 - 0.0065 * h;
    let celsius = kelvin - 273.15;
    let vapour = 0.5 * 6.1078 * (17.27 * celsius / (celsius + 237.3)).exp();
    let zhd = 0.002_276_8 * pressure / (1.0 - 0.002_66 * (2.0 * lat).cos() - 2.8e-7 * h);
    let zwd = 0.002_277 * (1255.0 / kelvin + 0.05) * vapour;
    (zhd + zwd) * 1.001 / (0.002_001 + el.sin().powi(2)).sqrt()
}
