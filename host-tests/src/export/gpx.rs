//! GPX 1.1 (the Topografix schema): one track, one segment, a point per fix with its fix
//! type, satellite count and DOP. `ele` carries the WGS-84 ellipsoidal height.

use crate::export::iso8601;
use crate::record::EpochRecord;
use std::fmt::Write as _;
use trackfix_engine::FixKind;

fn escape(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// The GPX document of a run named `name`.
pub fn write_run(name: &str, records: &[EpochRecord]) -> String {
    let mut s = String::new();
    let _ = writeln!(s, r#"<?xml version="1.0" encoding="UTF-8"?>"#);
    let _ = writeln!(
        s,
        r#"<gpx version="1.1" creator="Trackfix" xmlns="http://www.topografix.com/GPX/1/1" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" xsi:schemaLocation="http://www.topografix.com/GPX/1/1 http://www.topografix.com/GPX/1/1/gpx.xsd">"#
    );
    let _ = writeln!(s, "  <metadata>");
    let _ = writeln!(s, "    <name>{}</name>", escape(name));
    let _ = writeln!(s, "    <desc>Trackfix fixes; not for safety-of-life navigation; heights are WGS-84 ellipsoidal</desc>");
    if let Some(r) = records.first() {
        let _ = writeln!(s, "    <time>{}</time>", iso8601(r.time));
    }
    let _ = writeln!(s, "  </metadata>");
    let _ = writeln!(
        s,
        "  <trk>\n    <name>{}</name>\n    <trkseg>",
        escape(name)
    );
    for r in records {
        let Some(f) = r.fix else { continue };
        let [lat, lon, h] = f.lat_lon_h;
        let _ = writeln!(s, r#"      <trkpt lat="{lat:.8}" lon="{lon:.8}">"#);
        let _ = writeln!(s, "        <ele>{h:.2}</ele>");
        let _ = writeln!(s, "        <time>{}</time>", iso8601(r.time));
        let fix = if f.kind == FixKind::ThreeD {
            "3d"
        } else {
            "2d"
        };
        let _ = writeln!(s, "        <fix>{fix}</fix>");
        let _ = writeln!(s, "        <sat>{}</sat>", f.used);
        let _ = writeln!(s, "        <hdop>{:.2}</hdop>", f.hdop);
        let _ = writeln!(s, "        <vdop>{:.2}</vdop>", f.vdop);
        let _ = writeln!(s, "        <pdop>{:.2}</pdop>", f.pdop);
        let _ = writeln!(s, "      </trkpt>");
    }
    let _ = writeln!(s, "    </trkseg>\n  </trk>\n</gpx>");
    s
}
