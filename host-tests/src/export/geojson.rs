//! GeoJSON (RFC 7946): a FeatureCollection with the track as a LineString and the run's
//! summary as properties. Positions are [longitude, latitude, ellipsoidal height] on WGS-84
//! (RFC 7946 §4), rounded to 1e-8° (about 1 mm). RFC 7946 defines no time member, so the
//! UTC time of each position (ISO 8601, as in the GPX and CSV files) goes in the feature's
//! `times_utc` property, one per coordinate, with `start_utc` and `end_utc`.

use crate::export::iso8601;
use crate::metrics::Summary;
use crate::record::EpochRecord;
use serde_json::json;

/// The GeoJSON document of a run.
pub fn write_run(name: &str, records: &[EpochRecord], summary: &Summary) -> String {
    let round = |v: f64, k: f64| (v * k).round() / k;
    let fixes: Vec<_> = records
        .iter()
        .filter_map(|r| r.fix.map(|f| (r.time, f)))
        .collect();
    let coords: Vec<[f64; 3]> = fixes
        .iter()
        .map(|(_, f)| {
            [
                round(f.lat_lon_h[1], 1e8),
                round(f.lat_lon_h[0], 1e8),
                round(f.lat_lon_h[2], 1e3),
            ]
        })
        .collect();
    let times: Vec<String> = fixes.iter().map(|(t, _)| iso8601(*t)).collect();
    let (mut w, mut s, mut e, mut n) = (180.0f64, 90.0f64, -180.0f64, -90.0f64);
    for c in &coords {
        w = w.min(c[0]);
        e = e.max(c[0]);
        s = s.min(c[1]);
        n = n.max(c[1]);
    }
    let mut fc = json!({
        "type": "FeatureCollection",
        "features": [{
            "type": "Feature",
            "geometry": { "type": "LineString", "coordinates": coords },
            "properties": {
                "name": name,
                "epochs": summary.epochs,
                "fixes": summary.fixes,
                "availability_pct": summary.availability_pct,
                "start_utc": times.first(),
                "end_utc": times.last(),
                "times_utc": times,
                "note": "Trackfix fixes; not for safety-of-life navigation"
            }
        }]
    });
    if !coords.is_empty() {
        fc["bbox"] = json!([w, s, e, n]);
    }
    serde_json::to_string_pretty(&fc).unwrap_or_default()
}
