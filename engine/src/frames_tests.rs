use super::*;

fn dms(d: f64, m: f64, s: f64) -> f64 {
    d + m / 60.0 + s / 3600.0
}

// Source: EPSG Guidance Note 7-2, method 9602 worked example [V, via CHECKS.md]:
// 53°48′33.820″ N, 2°07′46.380″ E, h = 73.0 m ↔ X 3,771,793.968, Y 140,253.342,
// Z 5,124,304.349 m. The note prints millimetres, so 1 mm is the tolerance.
#[test]
fn epsg_9602_worked_example_both_ways() {
    let g = Geodetic::from_degrees(dms(53.0, 48.0, 33.820), dms(2.0, 7.0, 46.380), 73.0);
    let p = g.to_ecef();
    let want = [3_771_793.968, 140_253.342, 5_124_304.349];
    for k in 0..3 {
        assert!(
            (p[k] - want[k]).abs() < 1e-3,
            "axis {k}: {} vs {}",
            p[k],
            want[k]
        );
    }
    let back = Geodetic::from_ecef(want);
    // 1e-3″ of latitude is 3 cm; the note's 3-decimal seconds allow ±0.5e-3″.
    assert!((back.lat_rad.to_degrees() - g.lat_rad.to_degrees()).abs() * 3600.0 < 6e-4);
    assert!((back.lon_rad.to_degrees() - g.lon_rad.to_degrees()).abs() * 3600.0 < 6e-4);
    assert!((back.height_m - 73.0).abs() < 1e-3);
}

// Source: EPSG Guidance Note 7-2, methods 9836/9837 (geocentric ↔ topocentric) worked
// example [V, via CHECKS.md; C: pymap3d.ecef2enu reproduces it to 1 mm]: topocentric origin
// 55° N, 5° E, 200 m (X0 3,652,755.3058, Y0 319,574.6799, Z0 5,201,547.3536); the point
// X 3,771,793.968, Y 140,253.342, Z 5,124,304.349 is at E −189,013.869, N −128,642.040,
// U −4,220.171 m. The note prints millimetres (origin: 0.1 mm), hence the tolerances.
#[test]
fn epsg_9836_topocentric_example() {
    let g = Geodetic::from_degrees(55.0, 5.0, 200.0);
    let o = g.to_ecef();
    let want = [3_652_755.3058, 319_574.6799, 5_201_547.3536];
    for k in 0..3 {
        assert!((o[k] - want[k]).abs() < 1e-4, "origin axis {k}");
    }
    let enu = LocalFrame::new(o, &g).enu([3_771_793.968, 140_253.342, 5_124_304.349]);
    let want = [-189_013.869, -128_642.040, -4_220.171];
    for k in 0..3 {
        assert!(
            (enu[k] - want[k]).abs() < 1e-3,
            "ENU axis {k}: {} vs {}",
            enu[k],
            want[k]
        );
    }
}

// WGS-84 derived constants (NGA TR8350.2; CHECKS.md [C]): b = 6,356,752.314245 m,
// e² = 6.694379990141e-3.
#[test]
fn wgs84_derived_constants() {
    assert!((WGS84_B - 6_356_752.314_245).abs() < 1e-6);
    assert!((WGS84_E2 - 6.694_379_990_141e-3).abs() < 1e-15);
}

#[test]
fn poles_and_centre_do_not_blow_up() {
    let north = Geodetic::from_ecef([0.0, 0.0, WGS84_B + 10.0]);
    assert!((north.lat_rad - core::f64::consts::FRAC_PI_2).abs() < 1e-12);
    assert!((north.height_m - 10.0).abs() < 1e-6);
    let centre = Geodetic::from_ecef([0.0, 0.0, 0.0]);
    assert!(centre.height_m.is_finite());
}

#[test]
fn azimuth_elevation_of_zenith_and_north() {
    let g = Geodetic::from_degrees(45.0, 10.0, 0.0);
    let f = LocalFrame::new(g.to_ecef(), &g);
    let up = Geodetic::from_degrees(45.0, 10.0, 20_000_000.0).to_ecef();
    let (_, el) = f.az_el(up);
    assert!((el.to_degrees() - 90.0).abs() < 1e-9);
    let north = Geodetic::from_degrees(45.01, 10.0, 0.0).to_ecef();
    let (az, _) = f.az_el(north);
    assert!(az.to_degrees().abs() < 1e-6 || (az.to_degrees() - 360.0).abs() < 1e-6);
}

// The first-order step (or, beyond its limit, the exact conversion) stays within 2 mm of the
// exact conversion for moves of metres to 100 m, at mid latitudes and near a pole.
#[test]
fn a_nudged_position_matches_the_exact_conversion() {
    for (lat, lon, h) in [
        (47.6, 8.9, 412.0),
        (-33.62, 150.31, 40.0),
        (89.0, 20.0, 0.0),
    ] {
        let g = Geodetic::from_degrees(lat, lon, h);
        let origin = g.to_ecef();
        let frame = LocalFrame::new(origin, &g);
        for d in [[60.0, -70.0, 30.0], [1.0, 2.0, -3.0], [-57.0, 0.0, 57.0]] {
            let p = [origin[0] + d[0], origin[1] + d[1], origin[2] + d[2]];
            let (a, b) = (g.nudged(origin, &frame, p), Geodetic::from_ecef(p));
            let back = a.to_ecef();
            let miss =
                ((back[0] - p[0]).powi(2) + (back[1] - p[1]).powi(2) + (back[2] - p[2]).powi(2))
                    .sqrt();
            assert!(miss < 2e-3, "{lat} {d:?}: {miss} m");
            assert!((a.height_m - b.height_m).abs() < 2e-3);
        }
    }
}
