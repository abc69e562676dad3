//! A report bundle: JSON summary, plots, track exports and an HTML index that links them.

use crate::plots;
use std::path::Path;
use trackfix_harness::export::{csv, geojson, gpx, json, nmea};
use trackfix_harness::metrics::Summary;
use trackfix_harness::record::EpochRecord;

/// Files a report writes, with what each shows.
pub const FILES: [(&str, &str); 13] = [
    ("summary.json", "summary statistics"),
    ("error_time.svg", "position error against time"),
    ("error_cdf.svg", "error distribution"),
    ("scatter.svg", "horizontal error with CEP and 95 % circles"),
    ("sky.svg", "satellite tracks on the sky"),
    ("residuals.svg", "post-fit residual per satellite"),
    ("dop.svg", "DOP and satellites used against time"),
    (
        "protection.svg",
        "horizontal error against protection level (integrity)",
    ),
    ("track.gpx", "GPX 1.1 track"),
    ("track.geojson", "GeoJSON track"),
    ("track.csv", "every epoch as CSV"),
    (
        "satellites.csv",
        "every satellite of every epoch: status, test statistic, reflection",
    ),
    ("track.nmea", "NMEA 0183 GGA/RMC/GSA/GST"),
];

/// Writes the bundle for a run into `dir`.
pub fn write(dir: &Path, name: &str, records: &[EpochRecord], s: &Summary) -> Result<(), String> {
    std::fs::create_dir_all(dir).map_err(|e| format!("{}: {e}", dir.display()))?;
    let w =
        |f: &str, text: String| std::fs::write(dir.join(f), text).map_err(|e| format!("{f}: {e}"));
    w("summary.json", json::write_summary(name, s))?;
    w("track.gpx", gpx::write_run(name, records))?;
    w("track.geojson", geojson::write_run(name, records, s))?;
    w("track.csv", csv::write_run(records))?;
    w("satellites.csv", csv::write_satellites(records))?;
    w("track.nmea", nmea::write_run(records))?;
    plots::error_vs_time(&dir.join("error_time.svg"), name, records)?;
    plots::error_cdf(&dir.join("error_cdf.svg"), name, records)?;
    plots::scatter(&dir.join("scatter.svg"), name, records, s)?;
    plots::sky(&dir.join("sky.svg"), name, records)?;
    plots::residuals(&dir.join("residuals.svg"), name, s)?;
    plots::dop(&dir.join("dop.svg"), name, records)?;
    plots::protection(&dir.join("protection.svg"), name, records)?;
    let mut html = format!(
        "<!doctype html><meta charset=\"utf-8\"><title>Trackfix report: {name}</title>\n\
         <h1>Trackfix report: {name}</h1>\n<p>{} epochs, {} fixes ({:.1} %); horizontal error 50/95 %: \
         {:.2} / {:.2} m; vertical 50/95 %: {:.2} / {:.2} m.</p>\n\
         <p>Integrity: verified / fault excluded / unavailable / alert {}; median horizontal protection level {}; \
         epochs whose error exceeds its protection level: {} of {}; epochs with an interference or spoofing flag: {}.</p>\n\
         <p><em>Estimates: not for safety-of-life navigation; follow local regulations and licensed practice.</em></p>\n<ul>\n",
        s.epochs, s.fixes, s.availability_pct, s.horizontal.p50, s.horizontal.p95, s.vertical.p50, s.vertical.p95,
        s.integrity.shares_pct().map(|p| format!("{p:.1} %")).join(" / "),
        s.integrity.hpl50_m.map_or("–".to_string(), |h| format!("{h:.1} m")),
        s.integrity.misleading,
        s.integrity.bounded_epochs,
        s.integrity.flagged
    );
    for (f, what) in FILES {
        html += &format!("<li><a href=\"{f}\">{f}</a>: {what}</li>\n");
    }
    html += "</ul>\n";
    for (f, _) in FILES.iter().filter(|(f, _)| f.ends_with(".svg")) {
        html += &format!("<p><img src=\"{f}\" alt=\"{f}\"></p>\n");
    }
    w("index.html", html)
}
