extern crate std;
use super::*;

/// Distance in units in the last place between two finite f64 of the same sign region.
fn ulps(a: f64, b: f64) -> f64 {
    let scale = f64::EPSILON * a.abs().max(b.abs()).max(f64::MIN_POSITIVE);
    (a - b).abs() / scale
}

// Against the host's sin_cos (the platform's libm): a million arguments spread over
// ±1e5 rad and a thousand near each of the first multiples of π/2, where the reduction
// is hardest. Errors are counted in ulp of 1 (absolute error / 2.2e-16): what matters for
// a coordinate is the absolute error of the unit vector it multiplies.
#[test]
fn within_two_ulp_of_one_against_the_host() {
    let mut worst: f64 = 0.0;
    let mut state = 12345u64;
    let mut next = || {
        state = state
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    let mut check = |x: f64| {
        let (s, c) = sin_cos(x);
        let (ws, wc) = x.sin_cos();
        worst = worst.max((s - ws).abs()).max((c - wc).abs());
    };
    for _ in 0..1_000_000 {
        check((next() - 0.5) * 2e5);
    }
    for k in -200..200 {
        for j in 0..1_000 {
            let x = f64::from(k) * core::f64::consts::FRAC_PI_2 + (f64::from(j) - 500.0) * 1e-9;
            check(x);
        }
    }
    let in_ulp = worst / f64::EPSILON;
    std::println!("worst absolute error {worst:e} ({in_ulp:.2} ulp of 1)");
    assert!(
        in_ulp <= 2.0,
        "worst absolute error {worst:e} = {in_ulp:.2} ulp of 1"
    );
}

#[test]
fn exact_points_and_non_finite() {
    assert_eq!(sin_cos(0.0), (0.0, 1.0));
    let (s, c) = sin_cos(core::f64::consts::FRAC_PI_2);
    assert!(ulps(s, 1.0) <= 1.0 && c.abs() < 1e-16);
    let (s, c) = sin_cos(-core::f64::consts::PI);
    assert!(s.abs() < 1e-15 && ulps(c, -1.0) <= 1.0);
    assert!(sin(f64::NAN).is_nan() && cos(f64::INFINITY).is_nan());
    // Beyond the exact reduction: finite and on the unit circle.
    let (s, c) = sin_cos(1e12);
    assert!((s * s + c * c - 1.0).abs() < 1e-12);
}

/// The single-precision cosine within 2e-7 of the host's f64 cosine on ±100 rad (a few f32
/// ulp of 1: the reduction and the kernel each round a few times), NaN beyond.
#[test]
fn cos_f32_matches_the_host() {
    let mut worst = 0.0f64;
    for k in -2_000_000..=2_000_000 {
        let x = k as f32 * 5e-5;
        let got = f64::from(cos_f32(x));
        let want = f64::from(x).cos();
        worst = worst.max((got - want).abs());
    }
    std::println!("cos_f32 worst absolute error {worst:e}");
    assert!(worst < 2e-7, "{worst:e}");
    assert!(cos_f32(101.0).is_nan() && cos_f32(f32::NAN).is_nan());
}
