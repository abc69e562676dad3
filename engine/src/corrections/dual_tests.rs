use super::*;

/// The L1/L2 coefficients from the ICD frequencies (IS-GPS-200: f₁ = 154·10.23 MHz,
/// f₂ = 120·10.23 MHz, γ = (77/60)² = 1.6469): a₁ = γ/(γ − 1) = 2.5457, a₂ = −1.5457
/// (textbook values, e.g. Misra & Enge, "Global Positioning System", §5.3 [M]); L1/L5 and
/// E1/E5a (f₅ = 115·10.23 MHz): a₁ = (154/115)²/((154/115)² − 1) = 2.2606.
#[test]
fn coefficients_from_the_icd_frequencies() {
    let l1l2 = IonoFree::of(Signal::GpsL1Ca, Signal::GpsL2).unwrap();
    let gamma = (77.0f64 / 60.0).powi(2);
    assert!((l1l2.a1 - gamma / (gamma - 1.0)).abs() < 1e-12);
    assert!((l1l2.a1 - 2.5457).abs() < 1e-4 && (l1l2.a2 + 1.5457).abs() < 1e-4);
    let r = (154.0f64 / 115.0).powi(2);
    for (a, b) in [
        (Signal::GpsL1Ca, Signal::GpsL5),
        (Signal::GalE1, Signal::GalE5a),
    ] {
        let c = IonoFree::of(a, b).unwrap();
        assert!((c.a1 - r / (r - 1.0)).abs() < 1e-12, "{a:?}/{b:?}");
        assert!((c.a1 - 2.2606).abs() < 1e-4);
        assert!((c.a1 + c.a2 - 1.0).abs() < 1e-15);
    }
    // Noise: √(a₁² + a₂²) ≈ 2.98 for L1/L2, 2.59 for L1/L5.
    assert!((l1l2.noise_factor() - 2.978).abs() < 1e-3);
    let l1l5 = IonoFree::of(Signal::GpsL1Ca, Signal::GpsL5).unwrap();
    assert!((l1l5.noise_factor() - 2.588).abs() < 1e-3);
}

/// A constructed pair: range R plus a first-order delay I/f² on each frequency; the
/// combination returns R, whatever I, for every pair the engine knows (to 1e-6 m on
/// 25,000 km, the rounding of the inputs).
#[test]
fn the_combination_removes_a_first_order_delay() {
    let pairs = [
        (Signal::GpsL1Ca, Signal::GpsL2),
        (Signal::GpsL1Ca, Signal::GpsL5),
        (Signal::GalE1, Signal::GalE5a),
        (Signal::GalE1, Signal::GalE5b),
        (Signal::BdsB1I, Signal::BdsB3I),
        (Signal::BdsB1I, Signal::BdsB2I),
    ];
    let range = 23_456_789.123;
    for (a, b) in pairs {
        let c = IonoFree::of(a, b).unwrap();
        for tec_delay_l1 in [0.0, 1.5, 12.0, 60.0] {
            let p1 = range + tec_delay_l1 * a.iono_scale_from_l1();
            let p2 = range + tec_delay_l1 * b.iono_scale_from_l1();
            let got = c.combine(p1, p2);
            assert!((got - range).abs() < 1e-6, "{a:?}/{b:?}: {got}");
        }
    }
}

/// Signals of two systems, or on one frequency, are refused.
#[test]
fn bad_pairs_are_refused() {
    assert_eq!(
        IonoFree::of(Signal::GpsL1Ca, Signal::GalE5a),
        Err(PairError::OtherSystem)
    );
    assert_eq!(
        IonoFree::of(Signal::GpsL1Ca, Signal::GpsL1P),
        Err(PairError::SameFrequency)
    );
}
