use super::*;

// Source: CHECKS.md "Troposphere" [C]: ZHD 1013.25 hPa, 45°, 0 m → 2.3070 m;
// 1000 hPa, 48°, 200 m → 2.2763 m. ZWD 288.15 K, e = 8.574 hPa → 0.0860 m. Printed to
// 0.1 mm, so 0.1 mm (+rounding) tolerance.
#[test]
fn saastamoinen_reference_values() {
    let z = ZenithDelay::saastamoinen(1013.25, 288.15, 8.574, 45f64.to_radians(), 0.0);
    assert!(
        (z.hydrostatic_m - 2.3070).abs() < 1.5e-4,
        "{}",
        z.hydrostatic_m
    );
    assert!((z.wet_m - 0.0860).abs() < 1.5e-4, "{}", z.wet_m);
    let z = ZenithDelay::saastamoinen(1000.0, 288.15, 0.0, 48f64.to_radians(), 200.0);
    assert!(
        (z.hydrostatic_m - 2.2763).abs() < 1.5e-4,
        "{}",
        z.hydrostatic_m
    );
}

// Source: CHECKS.md [M form; C values]: m(30°) = 1.9940, m(15°) = 3.8111, m(10°) = 5.5823,
// m(5°) = 10.2179.
#[test]
fn mops_mapping_values() {
    for (el, want) in [
        (30.0, 1.9940),
        (15.0, 3.8111),
        (10.0, 5.5823),
        (5.0, 10.2179),
    ] {
        let m = mapping(libm::sin(f64::to_radians(el)));
        assert!((m - want).abs() < 1e-4, "{el}: {m}");
    }
}

// Common practice (CHECKS.md): total zenith delay ≈ 2.3–2.5 m at sea level.
#[test]
fn standard_atmosphere_total_zenith_delay_at_sea_level() {
    let z = ZenithDelay::standard_atmosphere(50f64.to_radians(), 0.0);
    let total = z.hydrostatic_m + z.wet_m;
    assert!((2.3..=2.5).contains(&total), "{total}");
}
