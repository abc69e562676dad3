use super::*;

// Common practice (CHECKS.md): total zenith delay ≈ 2.3–2.5 m at sea level.
#[test]
fn standard_atmosphere_total_zenith_delay_at_sea_level() {
    let z = ZenithDelay::standard_atmosphere(50f64.to_radians(), 0.0);
    let total = z.hydrostatic_m + z.wet_m;
    assert!((2.3..=2.5).contains(&total), "{total}");
}
