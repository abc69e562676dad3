//! GeoJSON (RFC 7946): a FeatureCollection with the track as a LineString and the run's
//! summary as properties. Positions are [longitude, latitude, ellipsoidal height] on WGS-84
//! (RFC 7946 §4), rounded to 1e-8° (about 1 mm).

use crate::metrics::Summary;
use crate::record::EpochRecord;
use serde_json::json;

/// The GeoJSON document of a run.
pub fn write_run(name: &str, records: &[EpochRecord], summary: &Summary) -> String {
    let round = |v: f64, k: f64| (v * k).round() / k;
    let coords: Vec<[f64; 3]> = records
        .iter()
        .filter_map(|r| r.fix)
        .map(|f| {
            [
                round(f.lat_lon_h[1], 1e8),
                round(f.lat_lon_h[0], 1e8),
                round(f.lat_lon_h[2], 1e3),
            ]
        })
        .collect();
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
                "note": "Trackfix fixes; not for safety-of-life navigation"
            }
        }]
    });
    if !coords.is_empty() {
        fc["bbox"] = json!([w, s, e, n]);
    }
    serde_json::to_string_pretty(&fc).unwrap_or_default()
}
