//! Engine API behaviour a tracker relies on, on synthetic data.

use rand::SeedableRng;
use trackfix_engine::{Engine, Geodetic, GnssTime, LocalFrame, System};
use trackfix_harness::synth::{constellation, observe, StaticReceiver};

#[test]
fn a_remembered_position_shortens_the_first_solution() {
    let t0 = GnssTime::from_week_tow(2300, 100_000.0).unwrap();
    let cons = constellation(21, t0, &[System::Gps, System::Galileo]);
    let rx = StaticReceiver {
        position: Geodetic::from_degrees(60.41, 25.62, 30.0).to_ecef(),
        horizon_deg: 10.0,
        clock_bias_m: 5_000.0,
        inter_system_bias_m: 2.0,
    };
    let mut rng = rand::rngs::StdRng::seed_from_u64(8);
    let epoch = observe::<40>(&rx, &cons, t0, 0.5, &mut rng);
    let fresh = || {
        let mut e: Box<Engine<40, 64>> = Box::new(Engine::with_defaults());
        for eph in &cons.ephemerides {
            e.ingest_ephemeris(*eph).unwrap();
        }
        e
    };
    let mut cold = fresh();
    let c = *cold.process(&epoch).unwrap().fix().unwrap();
    let mut warm = fresh();
    // Remembered from yesterday, 300 m away.
    let remembered = LocalFrame::at_ecef(rx.position);
    let p = [0, 1, 2].map(|k| rx.position[k] + 300.0 * remembered.axes[0][k]);
    warm.seed_position(p, t0.add_seconds(-86_400.0)).unwrap();
    let w = *warm.process(&epoch).unwrap().fix().unwrap();
    assert!(
        w.iterations < c.iterations,
        "warm {} vs cold {}",
        w.iterations,
        c.iterations
    );
    // Same answer either way (1 mm).
    for k in 0..3 {
        assert!((w.ecef_m[k] - c.ecef_m[k]).abs() < 1e-3);
    }
    // Nonsense is refused.
    assert_eq!(
        warm.seed_position([f64::NAN, 0.0, 0.0], t0),
        Err(trackfix_engine::InputError::NotFinite)
    );
    assert!(matches!(
        warm.seed_position([0.0, 0.0, 0.0], t0),
        Err(trackfix_engine::InputError::HeightOutOfSpan { .. })
    ));
}
