//! The truth models against the engine's: two implementations written apart agree when
//! neither is wrong (agreement of independent implementations; the outside values each is
//! held to are in tests/models_reference.rs and the generator under tools/refvectors).

use super::*;
use crate::synth::constellation;
use trackfix_engine::{IonoCoefficients, LocalFrame, System};

fn start() -> GnssTime {
    GnssTime::from_week_tow(2300, 597_000.0).unwrap()
}

// Orbit: MEO, IGSO and GEO, across the end of the week, to 1 mm.
#[test]
fn orbit_agrees_with_the_engine() {
    let toe = start();
    let c = constellation(5, toe, &[System::Gps, System::Galileo, System::Beidou]);
    for eph in &c.ephemerides {
        for dt in [-7_000.0, 0.0, 1_234.5, 7_100.0] {
            let t = orbit::shift(toe, dt);
            let ours = orbit::position(eph, t);
            let engine = eph.evaluate(t.seconds_since(eph.toe().unwrap()), 0.0).pos;
            let d = (0..3)
                .map(|k| (ours[k] - engine[k]).powi(2))
                .sum::<f64>()
                .sqrt();
            assert!(d < 1e-3, "{:?} at {dt} s: {d} m", eph.sat);
        }
    }
}

// Clock with relativity and group delay: the vector form of the relativistic term differs
// from F·e·√A·sin Ek only through the harmonic corrections (zero in these synthetic sets)
// and the finite-difference velocity: 1e-12 s (0.3 mm).
#[test]
fn clock_and_group_delay_agree_with_the_engine() {
    let toe = start();
    let c = constellation(6, toe, &[System::Gps, System::Galileo, System::Beidou]);
    for eph in &c.ephemerides {
        let t = orbit::shift(toe, 2_000.0);
        let dt = t.seconds_since(eph.toe().unwrap());
        let engine = eph.evaluate(dt, dt).clock_s;
        let ours = clock::offset_s(eph, t, &Mutation::default());
        assert!(
            (ours - engine).abs() < 1e-12,
            "{:?}: {ours} vs {engine}",
            eph.sat
        );
        for s in [
            Signal::GpsL1Ca,
            Signal::GpsL2,
            Signal::GalE1,
            Signal::GalE5a,
            Signal::GalE5b,
            Signal::BdsB1I,
            Signal::BdsB2I,
            Signal::BdsB3I,
        ] {
            let (a, b) = (clock::group_delay_s(eph, s), eph.group_delay_s(s));
            assert!((a - b).abs() < 1e-18, "{s:?}: {a} vs {b}");
            let (a, b) = (clock::iono_scale_from_l1(s), s.iono_scale_from_l1());
            assert!((a - b).abs() < 1e-12, "{s:?}: {a} vs {b}");
        }
    }
}

// Klobuchar and troposphere, over elevations, azimuths and a day: 0.1 mm.
#[test]
fn atmosphere_agrees_with_the_engine() {
    let k = IonoCoefficients {
        alpha: [3.82e-8, 1.49e-8, -1.79e-7, 0.0],
        beta: [1.43e5, 0.0, -3.28e5, 1.13e5],
    };
    for lat in [-80.0f64, -30.0, 0.0, 47.0, 79.0] {
        for el in [3.0f64, 10.0, 30.0, 60.0, 90.0] {
            for (az, tow) in [(0.0f64, 0.0), (120.0, 50_400.0), (250.0, 600_000.0)] {
                let (lat, el, az) = (lat.to_radians(), el.to_radians(), az.to_radians());
                let ours = atmosphere::klobuchar_l1_m(&(k.alpha, k.beta), lat, 0.3, az, el, tow);
                let engine = k.delay_l1_m(lat, 0.3, az, el, tow);
                assert!((ours - engine).abs() < 1e-4, "iono {ours} vs {engine}");
            }
            let h = 350.0;
            let ours = atmosphere::troposphere_m(lat.to_radians(), h, el.to_radians());
            let z = trackfix_engine::tropo::ZenithDelay::standard_atmosphere(lat.to_radians(), h);
            let engine = z.slant_m(el.to_radians().sin());
            assert!((ours - engine).abs() < 1e-4, "tropo {ours} vs {engine}");
        }
    }
}

// The deliberate mutations move the range by what they should: a flipped relativistic term
// by twice that term, a flipped group delay by twice the delay.
#[test]
fn mutations_move_the_range() {
    let toe = start();
    let c = constellation(7, toe, &[System::Gps]);
    let rx = [3_582_000.0, 532_000.0, 5_232_000.0];
    let frame = LocalFrame::at_ecef(rx);
    let eph = c
        .ephemerides
        .iter()
        .find(|e| frame.az_el(orbit::position(e, toe)).1 > 0.3)
        .unwrap();
    let at = |m: Mutation| pseudorange(eph, Signal::GpsL1Ca, toe, rx, 0.0, &m).pseudorange_m;
    let base = at(Mutation::default());
    let dt = toe.seconds_since(eph.toe().unwrap());
    let rel = eph.evaluate(dt, dt).relativity_s * SPEED_OF_LIGHT;
    let flipped = at(Mutation {
        relativity: -1.0,
        ..Mutation::default()
    });
    assert!(
        (flipped - base - 2.0 * rel).abs() < 0.01,
        "{}",
        flipped - base
    );
    let gd = eph.tgd_s * SPEED_OF_LIGHT;
    let flipped = at(Mutation {
        group_delay: -1.0,
        ..Mutation::default()
    });
    assert!(
        (flipped - base + 2.0 * gd).abs() < 1e-6,
        "{}",
        flipped - base
    );
}
