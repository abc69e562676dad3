//! CSV: one row per epoch, every field the harness measures. Columns are documented in
//! docs/exports.md.

use crate::export::iso8601;
use crate::record::EpochRecord;
use std::fmt::Write as _;

/// The header line.
pub const HEADER: &str = "gps_week,tow_s,utc,fix,fix_kind,lat_deg,lon_deg,height_m,east_err_m,north_err_m,up_err_m,used,hdop,vdop,pdop,sigma_east_m,sigma_north_m,sigma_up_m,residual_rms_m,vel_east_mps,vel_north_mps,vel_up_mps,vel_sigma_east_mps,vel_sigma_north_mps,vel_sigma_up_mps,no_fix_reason,filter_event";

/// The CSV document of a run.
pub fn write_run(records: &[EpochRecord]) -> String {
    let mut s = String::from(HEADER);
    s.push('\n');
    for r in records {
        let _ = write!(
            s,
            "{},{:.3},{},",
            r.time.week(),
            r.time.tow_s(),
            iso8601(r.time)
        );
        match r.fix {
            Some(f) => {
                let err = f.enu_error_m.map_or(",,".to_string(), |e| {
                    format!("{:.3},{:.3},{:.3}", e[0], e[1], e[2])
                });
                let vel = f.velocity_enu_mps.map_or(",,".to_string(), |v| {
                    format!("{:.3},{:.3},{:.3}", v[0], v[1], v[2])
                });
                let vel_sigma = f.velocity_sigma_enu_mps.map_or(",,".to_string(), |v| {
                    format!("{:.3},{:.3},{:.3}", v[0], v[1], v[2])
                });
                let _ = writeln!(
                    s,
                    "{:?},{},{:.9},{:.9},{:.3},{err},{},{:.2},{:.2},{:.2},{:.3},{:.3},{:.3},{:.3},{vel},{vel_sigma},,{}",
                    f.kind,
                    f.source.as_str(),
                    f.lat_lon_h[0],
                    f.lat_lon_h[1],
                    f.lat_lon_h[2],
                    f.used,
                    f.hdop,
                    f.vdop,
                    f.pdop,
                    f.sigma_enu_m[0],
                    f.sigma_enu_m[1],
                    f.sigma_enu_m[2],
                    f.residual_rms_m,
                    r.filter_event.as_str()
                );
            }
            None => {
                let reason = r
                    .no_fix
                    .map(|n| format!("{n:?}").replace(',', ";"))
                    .unwrap_or_default();
                let _ = writeln!(
                    s,
                    "None,none,,,,,,,,,,,,,,,,,,,,,,,{reason},{}",
                    r.filter_event.as_str()
                );
            }
        }
    }
    s
}
