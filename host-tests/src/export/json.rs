//! The JSON summary of a run.

use crate::metrics::{Stats, Summary};
use serde_json::{json, Value};

fn stats(s: &Stats) -> Value {
    if s.count == 0 {
        return Value::Null;
    }
    json!({ "count": s.count, "mean": s.mean, "rms": s.rms, "p50": s.p50, "p68": s.p68,
            "p95": s.p95, "p99": s.p99, "max": s.max })
}

/// The summary as pretty-printed JSON (metres, seconds, percent).
pub fn write_summary(name: &str, s: &Summary) -> String {
    let per_sat: serde_json::Map<String, Value> = s
        .residual_rms_by_sat
        .iter()
        .map(|(k, (n, rms))| {
            (
                format!("{}{:02}", k.system.rinex_letter(), k.prn),
                json!({ "count": n, "rms_m": rms }),
            )
        })
        .collect();
    let v = json!({
        "name": name,
        "epochs": s.epochs,
        "fixes": s.fixes,
        "availability_pct": s.availability_pct,
        "cep_m": if s.horizontal.count > 0 { json!(s.cep_m) } else { Value::Null },
        "horizontal_error_m": stats(&s.horizontal),
        "vertical_error_m": stats(&s.vertical),
        "error_3d_m": stats(&s.error_3d),
        "pdop": stats(&s.pdop),
        "ttff_s": stats(&s.ttff_s),
        "wakeups_without_fix": s.wakeups_without_fix,
        "residual_rms_by_satellite": per_sat,
        "caution": "Estimates, not for safety-of-life navigation."
    });
    serde_json::to_string_pretty(&v).unwrap_or_default()
}
