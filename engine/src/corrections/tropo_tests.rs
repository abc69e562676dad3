use super::*;

// Common practice (CHECKS.md): total zenith delay ≈ 2.3–2.5 m at sea level.
#[test]
fn standard_atmosphere_total_zenith_delay_at_sea_level() {
    let z = ZenithDelay::standard_atmosphere(50f64.to_radians(), 0.0);
    let total = z.hydrostatic_m + z.wet_m;
    assert!((2.3..=2.5).contains(&total), "{total}");
}

/// The wet part (issue 10's troposphere item): the standard atmosphere's 50 % humidity at
/// 15 °C gives about 8.5 cm of zenith wet delay at sea level (../shared/data README: "a
/// standard-atmosphere wet delay (about 8.5 cm zenith)"), falling with height as the
/// water vapour does.
#[test]
fn standard_atmosphere_wet_delay() {
    let z = ZenithDelay::standard_atmosphere(50f64.to_radians(), 0.0);
    assert!((z.wet_m - 0.085).abs() < 0.002, "{}", z.wet_m);
    let high = ZenithDelay::standard_atmosphere(50f64.to_radians(), 2_000.0);
    assert!(high.wet_m < z.wet_m && high.hydrostatic_m < z.hydrostatic_m);
}

/// The standard atmosphere in single precision against the same formulas in f64: under a
/// micrometre of zenith delay from −500 m to 11 km.
#[test]
fn single_precision_atmosphere_is_negligible() {
    for k in 0..=115 {
        let h = -500.0 + 100.0 * f64::from(k);
        let z = ZenithDelay::standard_atmosphere(0.8, h);
        let p = 1013.25 * libm::exp(5.2568 * libm::log(1.0 - 2.2557e-5 * h));
        let t = 288.15 - 6.5e-3 * h;
        let tc = t - 273.15;
        let e = 0.5 * 6.1078 * libm::exp(17.27 * tc / (tc + 237.3));
        let want = ZenithDelay::saastamoinen(p, t, e, 0.8, h);
        let d = (z.hydrostatic_m + z.wet_m) - (want.hydrostatic_m + want.wet_m);
        assert!(d.abs() < 1e-6, "{h} m: {d} m");
    }
}
