//! The benchmarks' shared scene: a static receiver at an invented place, a synthetic
//! constellation, the broadcast ionosphere of CHECKS.md and a mass-market receiver's errors
//! (code noise 0.5 m at the zenith growing as 1/sin E, the broadcast ionosphere exact,
//! troposphere on).

use trackfix_engine::{Geodetic, GnssTime, IonoCoefficients, System};
use trackfix_harness::synth::{constellation, Constellation, ErrorModel, StaticReceiver};

/// The scene at `t0` with `systems`.
pub fn scene(
    t0: GnssTime,
    systems: &[System],
) -> (Constellation, StaticReceiver, IonoCoefficients, ErrorModel) {
    let cons = constellation(5, t0, systems);
    let rx = StaticReceiver {
        position: Geodetic::from_degrees(47.62, 8.91, 412.0).to_ecef(),
        horizon_deg: 5.0,
        clock_bias_m: 1_000.0,
        inter_system_bias_m: 3.0,
    };
    let iono = IonoCoefficients {
        alpha: [1.49e-8, 2.24e-8, -1.19e-7, -1.19e-7],
        beta: [1.17e5, 1.80e5, -1.31e5, -4.95e5],
    };
    let errors = ErrorModel {
        sigma_m: 0.5,
        constant_sigma: false,
        iono: Some((iono, 1.0)),
        troposphere: true,
    };
    (cons, rx, iono, errors)
}
