use super::*;
use crate::sat::SPEED_OF_LIGHT;

/// The GPS LNAV record of PRN 31, 2018-09-05 (CHECKS.md "Worked satellite position"), used
/// here for identity and property checks; its reference position is held in
/// host-tests/tests/models_reference.rs against tools/refvectors/gen_models.py.
fn prn31() -> BroadcastEphemeris {
    BroadcastEphemeris {
        sat: SatId::gps(31),
        week: 2017,
        toe_s: 287_984.0,
        toc_s: 287_984.0,
        m0: -2.842_285_460_39,
        sqrt_a: 5_153.734_043_12,
        e: 8.845_789_823_68e-3,
        delta_n: 4.531_974_351_35e-9,
        omega0: -1.336_073_942_95,
        omega_dot: -7.791_753_020_57e-9,
        i0: 0.961_978_018_040,
        idot: -4.128_743_458_23e-10,
        omega: -0.114_071_783_319,
        cuc: 1.426_786_184_31e-6,
        cus: 1.050_159_335_14e-5,
        crc: 178.906_25,
        crs: 25.875,
        cic: -1.545_995_473_86e-7,
        cis: -3.539_025_783_54e-8,
        ..Default::default()
    }
}

// IS-GPS-200 §20.3.3.3.3.1: F = −2√μ/c² = −4.442807633e-10 s/√m (CHECKS.md [M; C]).
#[test]
fn relativistic_constant_from_mu_and_c() {
    let f = -2.0 * libm::sqrt(crate::sat::GPS_CONSTANTS.mu) / (SPEED_OF_LIGHT * SPEED_OF_LIGHT);
    assert!((f - crate::sat::GPS_CONSTANTS.f_rel).abs() < 1e-19);
    let f = -2.0 * libm::sqrt(crate::sat::GALILEO_CONSTANTS.mu) / (SPEED_OF_LIGHT * SPEED_OF_LIGHT);
    assert!((f - crate::sat::GALILEO_CONSTANTS.f_rel).abs() < 1e-19);
}

// The analytic velocity agrees with a central difference of positions (a numerical
// identity, no outside source needed): 1 mm/s.
#[test]
fn velocity_matches_finite_difference() {
    let e = prn31();
    let h = 0.5;
    let a = e.evaluate(1600.0 - h, 0.0).pos;
    let b = e.evaluate(1600.0 + h, 0.0).pos;
    let v = e.evaluate(1600.0, 0.0).vel;
    for k in 0..3 {
        assert!(((b[k] - a[k]) / (2.0 * h) - v[k]).abs() < 1e-3, "axis {k}");
    }
    let mut geo = prn31();
    geo.sat = SatId::beidou(3);
    geo.sqrt_a = 6_493.0;
    let a = geo.evaluate(1600.0 - h, 0.0).pos;
    let b = geo.evaluate(1600.0 + h, 0.0).pos;
    let v = geo.evaluate(1600.0, 0.0).vel;
    for k in 0..3 {
        assert!(
            ((b[k] - a[k]) / (2.0 * h) - v[k]).abs() < 1e-3,
            "geo axis {k}"
        );
    }
}

// The inertial speed obeys the vis-viva equation v² = μ(2/r − 1/a) (Kepler's two-body
// problem; any orbital-mechanics textbook, e.g. Vallado, "Fundamentals of Astrodynamics and
// Applications", §1.3 [M]), with the broadcast mean motion n = √(μ/a³) + Δn standing for
// √(μ/a³) (so μ → n²a³). What the two-body motion leaves out moves the speed by at most
// 2n·(|Crc| + |Crs| + r·(|Cuc| + |Cus|)) (harmonic corrections, at twice the orbital
// frequency) + r·(|Ω̇| + |IDOT|) (the plane's own turning): 0.37 m/s for this record. That
// is the bound, against about 3,840 m/s (the "roughly 14,000 km/h" of introductory texts,
// CHECKS.md, common practice).
#[test]
fn orbital_speed_obeys_vis_viva() {
    let eph = prn31();
    let mu = crate::sat::GPS_CONSTANTS.mu;
    let a = eph.sqrt_a * eph.sqrt_a;
    let n = libm::sqrt(mu / (a * a * a)) + eph.delta_n;
    for tk in [-7_200.0, 0.0, 1_600.0, 7_200.0] {
        let s = eph.evaluate(tk, 0.0);
        // Inertial velocity: add back Earth rotation ω×r to the ECEF velocity.
        let w = crate::sat::GPS_CONSTANTS.omega_e;
        let vi = [s.vel[0] - w * s.pos[1], s.vel[1] + w * s.pos[0], s.vel[2]];
        let r = crate::frames::norm(s.pos);
        let vis_viva = libm::sqrt(n * n * a * a * a * (2.0 / r - 1.0 / a));
        let bound = 2.0 * n * (eph.crc.abs() + eph.crs.abs() + r * (eph.cuc.abs() + eph.cus.abs()))
            + r * (eph.omega_dot.abs() + eph.idot.abs());
        let v = crate::frames::norm(vi);
        assert!(
            (v - vis_viva).abs() < bound,
            "tk {tk}: {v} vs {vis_viva} m/s (bound {bound})"
        );
        assert!((13_000.0..15_000.0).contains(&(v * 3.6)));
    }
}

// Kepler's equation is solved to 1e-12 rad even for the most eccentric orbits accepted
// (identity check: M = E − e·sin E).
#[test]
fn kepler_converges_across_accepted_eccentricities() {
    for e in [0.0, 0.01, 0.17, 0.29] {
        for k in 0..64 {
            let m = -core::f64::consts::PI + f64::from(k) * 0.1;
            let (ek, se, ce) = solve_kepler(m, e);
            assert!((ek - e * libm::sin(ek) - m).abs() < 1e-12, "e {e} M {m}");
            // The carried sine and cosine match fresh ones to 1e-14.
            assert!((se - libm::sin(ek)).abs() < 1e-14 && (ce - libm::cos(ek)).abs() < 1e-14);
        }
    }
}

#[test]
fn validation_names_the_broken_field() {
    let mut e = prn31();
    e.e = f64::NAN;
    assert_eq!(e.validate(), Err(EphemerisError::NotFinite));
    let mut e = prn31();
    e.e = 0.5;
    assert_eq!(e.validate(), Err(EphemerisError::Eccentricity));
    let mut e = prn31();
    e.sqrt_a = 100.0;
    assert_eq!(e.validate(), Err(EphemerisError::SemiMajorAxis));
    let mut e = prn31();
    e.iode = 5;
    e.iodc = 6;
    assert_eq!(e.validate(), Err(EphemerisError::IssueMismatch));
    let mut e = prn31();
    e.sat.prn = 0;
    assert_eq!(e.validate(), Err(EphemerisError::Prn));
    assert_eq!(prn31().validate(), Ok(()));
}

#[test]
fn toc_in_the_week_nearest_toe() {
    let mut e = prn31();
    e.toe_s = 604_000.0;
    e.toc_s = 100.0; // belongs to the next week
    let dt = e.toc().unwrap().seconds_since(e.toe().unwrap());
    assert_eq!(dt, 900.0);
}
