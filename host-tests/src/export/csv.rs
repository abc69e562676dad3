//! CSV: one row per epoch, every field the harness measures. Columns are documented in
//! docs/exports.md.

use crate::export::iso8601;
use crate::record::EpochRecord;
use std::fmt::Write as _;

/// The header line.
pub const HEADER: &str = "gps_week,tow_s,utc,fix,fix_kind,lat_deg,lon_deg,height_m,east_err_m,north_err_m,up_err_m,used,hdop,vdop,pdop,sigma_east_m,sigma_north_m,sigma_up_m,residual_rms_m,vel_east_mps,vel_north_mps,vel_up_mps,vel_sigma_east_mps,vel_sigma_north_mps,vel_sigma_up_mps,no_fix_reason,filter_event,integrity,hpl_m,vpl_m,test_statistic,test_threshold,test_dof,excluded,reflections,flags";

/// The satellites file's header line.
pub const SAT_HEADER: &str =
    "gps_week,tow_s,sat,elevation_deg,azimuth_deg,status,statistic,residual_m,reflection";

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
                let _ = write!(
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
                let _ = write!(
                    s,
                    "None,none,,,,,,,,,,,,,,,,,,,,,,,{reason},{}",
                    r.filter_event.as_str()
                );
            }
        }
        let i = &r.integrity;
        let level = |v: Option<f32>| v.map_or(String::new(), |x| format!("{x:.2}"));
        let (stat, thr) = if i.dof > 0 {
            (format!("{:.2}", i.statistic), format!("{:.2}", i.threshold))
        } else {
            (String::new(), String::new())
        };
        let _ = writeln!(
            s,
            ",{},{},{},{stat},{thr},{},{},{},{}",
            i.state.as_str(),
            level(i.hpl_m),
            level(i.vpl_m),
            i.dof,
            i.excluded,
            i.reflections,
            i.flags.names().collect::<Vec<_>>().join("+")
        );
    }
    s
}

/// One satellite's status in plain words and its test statistic, if any.
fn status(s: &trackfix_engine::SatStatus) -> (String, String) {
    use trackfix_engine::SatStatus;
    match s {
        SatStatus::Gated { nis } => ("gated".into(), format!("{nis:.2}")),
        SatStatus::Excluded { statistic } => ("excluded".into(), format!("{statistic:.2}")),
        SatStatus::KeptOut => ("kept-out".into(), String::new()),
        other => (format!("{other:?}").to_lowercase(), String::new()),
    }
}

/// The satellites file: one row per satellite and epoch, with what became of it (used,
/// gated and excluded with their statistic, kept out, screened out and why) and whether it
/// was taken for a reflection.
pub fn write_satellites(records: &[EpochRecord]) -> String {
    let mut s = String::from(SAT_HEADER);
    s.push('\n');
    for r in records {
        for sat in &r.sats {
            let (el, az) = sat
                .el_az_deg
                .map_or((String::new(), String::new()), |(e, a)| {
                    (format!("{e:.1}"), format!("{a:.1}"))
                });
            let (st, stat) = status(&sat.status);
            let res = sat.residual_m.map_or(String::new(), |x| format!("{x:.3}"));
            let _ = writeln!(
                s,
                "{},{:.3},{}{:02},{el},{az},{st},{stat},{res},{}",
                r.time.week(),
                r.time.tow_s(),
                sat.sat.system.rinex_letter(),
                sat.sat.prn,
                u8::from(sat.reflection)
            );
        }
    }
    s
}
