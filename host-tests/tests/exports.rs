//! Exports against published definitions: NMEA 0183 example sentences (CHECKS.md; their
//! checksums verified there [C]), RFC 7946 rules for GeoJSON, and the GPX 1.1 element order.
//! (`cargo xtask test` also validates a GPX file against the GPX 1.1 XSD and parses the NMEA
//! output with pynmea2, both pinned Python packages.)

use trackfix_engine::Config;
use trackfix_harness::export::{csv, geojson, gpx, nmea};
use trackfix_harness::metrics::Summary;
use trackfix_harness::scenario::{parse, run};

fn body(s: &str) -> &str {
    &s[1..s.find('*').unwrap()]
}

#[test]
fn published_checksums() {
    for s in [
        "$GPGGA,123519,4807.038,N,01131.000,E,1,08,0.9,545.4,M,46.9,M,,*47",
        "$GPRMC,123519,A,4807.038,N,01131.000,E,022.4,084.4,230394,003.1,W*6A",
        "$GPGSA,A,3,04,05,,09,12,,,24,,,,,2.5,1.3,2.1*39",
        "$GPGST,172814.0,0.006,0.023,0.020,273.6,0.023,0.020,0.031*6A",
    ] {
        let want = u8::from_str_radix(&s[s.len() - 2..], 16).unwrap();
        assert_eq!(nmea::checksum(body(s)), want, "{s}");
        assert_eq!(nmea::sentence(body(s)), s);
    }
}

#[test]
fn gga_reproduces_the_published_example() {
    let style = nmea::Style {
        talker: "GP",
        time_decimals: 0,
        minute_decimals: 3,
    };
    let s = nmea::gga(
        &style,
        (12, 35, 19.0),
        48.0 + 7.038 / 60.0,
        11.0 + 31.0 / 60.0,
        1,
        8,
        0.9,
        545.4,
        46.9,
    );
    assert_eq!(
        s,
        "$GPGGA,123519,4807.038,N,01131.000,E,1,08,0.9,545.4,M,46.9,M,,*47"
    );
}

#[test]
fn gst_reproduces_the_published_example() {
    let style = nmea::Style {
        talker: "GP",
        time_decimals: 1,
        minute_decimals: 3,
    };
    let s = nmea::gst(
        &style,
        (17, 28, 14.0),
        0.006,
        0.023,
        0.020,
        273.6,
        0.023,
        0.020,
        0.031,
        3,
    );
    assert_eq!(
        s,
        "$GPGST,172814.0,0.006,0.023,0.020,273.6,0.023,0.020,0.031*6A"
    );
}

#[test]
fn rmc_and_gsa_field_layout() {
    let style = nmea::Style {
        talker: "GP",
        time_decimals: 0,
        minute_decimals: 3,
    };
    let s = nmea::rmc(
        &style,
        (12, 35, 19.0),
        true,
        48.0 + 7.038 / 60.0,
        11.0 + 31.0 / 60.0,
        22.4,
        84.4,
        (23, 3, 1994),
    );
    // Published: $GPRMC,123519,A,4807.038,N,01131.000,E,022.4,084.4,230394,003.1,W*6A — the
    // same fields in the same order; we leave magnetic variation empty and add the NMEA 2.3
    // mode indicator.
    assert_eq!(
        s,
        nmea::sentence("GPRMC,123519,A,4807.038,N,01131.000,E,22.4,84.4,230394,,,A")
    );
    let g = nmea::gsa(&style, 3, &[4, 5, 9, 12, 24], 2.5, 1.3, 2.1);
    assert_eq!(
        g,
        nmea::sentence("GPGSA,A,3,04,05,09,12,24,,,,,,,,2.5,1.3,2.1")
    );
    assert_eq!(body(&g).split(',').count(), 18);
}

#[test]
fn angle_minutes_carry_into_degrees() {
    assert_eq!(nmea::angle_field(47.999_999_999, true, 3), "4800.000,N");
    assert_eq!(nmea::angle_field(-8.5, false, 3), "00830.000,W");
}

fn demo_run() -> (Vec<trackfix_harness::record::EpochRecord>, Summary) {
    let spec = parse(
        "duration_s = 120\norigin = [47.6, 8.9, 400.0]\nmotion = \"truck\"\n",
        "t",
    )
    .unwrap();
    let r = run(&spec, Config::default()).unwrap();
    let s = Summary::of(&r);
    (r, s)
}

#[test]
fn every_emitted_sentence_checks_out() {
    let (r, _) = demo_run();
    let text = nmea::write_run(&r);
    let mut kinds = std::collections::BTreeSet::new();
    for line in text.lines() {
        assert!(
            line.starts_with('$') && line.len() <= 82,
            "NMEA 0183 limits a sentence to 82 characters: {line}"
        );
        let (b, c) = line[1..].split_once('*').unwrap();
        assert_eq!(u8::from_str_radix(c, 16).unwrap(), nmea::checksum(b));
        kinds.insert(&b[2..5]);
    }
    assert_eq!(
        kinds.into_iter().collect::<Vec<_>>(),
        ["GGA", "GSA", "GST", "RMC"]
    );
}

// RFC 7946: a FeatureCollection of Features; positions are [lon, lat(, h)] in WGS-84
// decimal degrees (§3.1.1, §4); no "crs" member (§4); a bbox is [west, south, east, north]
// (§5); LineString has ≥ 2 positions (§3.1.4).
#[test]
fn geojson_follows_rfc_7946() {
    let (r, s) = demo_run();
    let v: serde_json::Value = serde_json::from_str(&geojson::write_run("truck", &r, &s)).unwrap();
    assert_eq!(v["type"], "FeatureCollection");
    assert!(v.get("crs").is_none());
    let f = &v["features"][0];
    assert_eq!(f["type"], "Feature");
    assert_eq!(f["geometry"]["type"], "LineString");
    let coords = f["geometry"]["coordinates"].as_array().unwrap();
    assert!(coords.len() >= 2);
    for c in coords {
        let c = c.as_array().unwrap();
        assert!(c.len() == 2 || c.len() == 3);
        let (lon, lat) = (c[0].as_f64().unwrap(), c[1].as_f64().unwrap());
        assert!((-180.0..=180.0).contains(&lon) && (-90.0..=90.0).contains(&lat));
        assert!(
            (lon - 8.9).abs() < 0.1 && (lat - 47.6).abs() < 0.1,
            "lon/lat order"
        );
    }
    let b: Vec<f64> = v["bbox"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_f64().unwrap())
        .collect();
    assert!(b[0] <= b[2] && b[1] <= b[3]);
}

// GPX 1.1 schema: trkpt children in the order ele, time, …, fix, sat, hdop, vdop, pdop; fix
// one of none/2d/3d/dgps/pps.
#[test]
fn gpx_point_children_in_schema_order() {
    let (r, _) = demo_run();
    let g = gpx::write_run("truck", &r);
    assert!(g.contains(r#"xmlns="http://www.topografix.com/GPX/1/1""#));
    let order = [
        "<ele>", "<time>", "<fix>", "<sat>", "<hdop>", "<vdop>", "<pdop>",
    ];
    let pt = &g[g.find("<trkpt").unwrap()..g.find("</trkpt>").unwrap()];
    let pos: Vec<usize> = order.iter().map(|t| pt.find(t).unwrap()).collect();
    assert!(pos.windows(2).all(|w| w[0] < w[1]), "{pt}");
    assert_eq!(
        g.matches("<trkpt").count(),
        r.iter().filter(|e| e.fix.is_some()).count()
    );
}

#[test]
fn csv_rows_have_the_header_width() {
    let (r, _) = demo_run();
    let text = csv::write_run(&r);
    let width = csv::HEADER.split(',').count();
    for line in text.lines() {
        assert_eq!(line.split(',').count(), width, "{line}");
    }
    assert_eq!(text.lines().count(), r.len() + 1);
}
