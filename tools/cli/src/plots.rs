//! SVG plots of a run (plotters): error against time, error distribution, horizontal
//! scatter with CEP and 95 % circles, sky plot, residuals per satellite, DOP against time.

use plotters::prelude::*;
use std::path::Path;
use trackfix_engine::System;
use trackfix_harness::metrics::Summary;
use trackfix_harness::record::EpochRecord;

type Res = Result<(), String>;

fn e<E: std::fmt::Display>(x: E) -> String {
    x.to_string()
}

/// Our palette: horizontal/first series, vertical/second series, circles.
const INK: RGBColor = RGBColor(31, 78, 121);
const EMBER: RGBColor = RGBColor(196, 92, 38);
const MOSS: RGBColor = RGBColor(92, 128, 56);

fn system_colour(s: System) -> RGBColor {
    match s {
        System::Gps => INK,
        System::Galileo => EMBER,
        System::Beidou => MOSS,
    }
}

fn minutes(records: &[EpochRecord], r: &EpochRecord) -> f64 {
    records
        .first()
        .map_or(0.0, |f| r.time.seconds_since(f.time) / 60.0)
}

/// Splits a time series where epochs are missing (outages, sleep), so lines do not bridge
/// the gaps.
fn segments(pts: &[(f64, f64)]) -> Vec<Vec<(f64, f64)>> {
    let mut out: Vec<Vec<(f64, f64)>> = Vec::new();
    let mut steps: Vec<f64> = pts.windows(2).map(|w| w[1].0 - w[0].0).collect();
    steps.sort_by(f64::total_cmp);
    let typical = steps.get(steps.len() / 2).copied().unwrap_or(0.0);
    for (i, p) in pts.iter().enumerate() {
        let gap = i > 0 && p.0 - pts[i - 1].0 > 2.5 * typical;
        if out.is_empty() || gap {
            out.push(Vec::new());
        }
        if let Some(last) = out.last_mut() {
            last.push(*p);
        }
    }
    out
}

fn draw_broken<DB: DrawingBackend>(
    c: &mut ChartContext<
        '_,
        DB,
        Cartesian2d<plotters::coord::types::RangedCoordf64, plotters::coord::types::RangedCoordf64>,
    >,
    pts: &[(f64, f64)],
    colour: RGBColor,
    label: &str,
) -> Res {
    for (k, seg) in segments(pts).into_iter().enumerate() {
        let series = c
            .draw_series(LineSeries::new(seg, &colour))
            .map_err(|e| e.to_string())?;
        if k == 0 {
            series
                .label(label.to_string())
                .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], colour));
        }
    }
    Ok(())
}

fn max_or(v: impl Iterator<Item = f64>, floor: f64) -> f64 {
    v.fold(floor, f64::max)
}

/// Horizontal and vertical error against time.
pub fn error_vs_time(path: &Path, title: &str, records: &[EpochRecord]) -> Res {
    let pts: Vec<(f64, f64, f64, f64)> = records
        .iter()
        .filter_map(|r| {
            let f = r.fix?;
            let d = f.enu_error_m?;
            let sigma_h = f.sigma_enu_m[0].hypot(f.sigma_enu_m[1]);
            Some((minutes(records, r), d[0].hypot(d[1]), d[2], sigma_h))
        })
        .collect();
    let t1 = max_or(pts.iter().map(|p| p.0), 1.0);
    let ymax = max_or(pts.iter().map(|p| p.1.max(p.2.abs())), 1.0) * 1.1;
    let root = SVGBackend::new(path, (900, 420)).into_drawing_area();
    root.fill(&WHITE).map_err(e)?;
    let mut c = ChartBuilder::on(&root)
        .caption(
            format!("{title}: position error against time"),
            ("sans-serif", 18),
        )
        .margin(12)
        .x_label_area_size(36)
        .y_label_area_size(50)
        .build_cartesian_2d(0.0..t1, -ymax..ymax)
        .map_err(e)?;
    c.configure_mesh()
        .x_desc("minutes")
        .y_desc("metres")
        .draw()
        .map_err(e)?;
    let h: Vec<(f64, f64)> = pts.iter().map(|p| (p.0, p.1)).collect();
    let u: Vec<(f64, f64)> = pts.iter().map(|p| (p.0, p.2)).collect();
    // The engine's own horizontal σ, clipped to the plot (it grows to hundreds of metres
    // while an outage is bridged by prediction).
    let sig: Vec<(f64, f64)> = pts.iter().map(|p| (p.0, p.3.min(ymax))).collect();
    draw_broken(&mut c, &h, INK, "horizontal error")?;
    draw_broken(&mut c, &u, EMBER, "up error")?;
    draw_broken(&mut c, &sig, MOSS, "horizontal σ (engine)")?;
    c.configure_series_labels()
        .background_style(WHITE.mix(0.8))
        .border_style(BLACK)
        .draw()
        .map_err(e)?;
    root.present().map_err(e)
}

/// Cumulative distribution of horizontal and vertical error.
pub fn error_cdf(path: &Path, title: &str, records: &[EpochRecord]) -> Res {
    let mut h: Vec<f64> = Vec::new();
    let mut v: Vec<f64> = Vec::new();
    for d in records
        .iter()
        .filter_map(|r| r.fix.and_then(|f| f.enu_error_m))
    {
        h.push(d[0].hypot(d[1]));
        v.push(d[2].abs());
    }
    h.sort_by(f64::total_cmp);
    v.sort_by(f64::total_cmp);
    let xmax = max_or(h.iter().chain(v.iter()).copied(), 1.0) * 1.05;
    let root = SVGBackend::new(path, (700, 420)).into_drawing_area();
    root.fill(&WHITE).map_err(e)?;
    let mut c = ChartBuilder::on(&root)
        .caption(format!("{title}: error distribution"), ("sans-serif", 18))
        .margin(12)
        .x_label_area_size(36)
        .y_label_area_size(50)
        .build_cartesian_2d(0.0..xmax, 0.0..100.0)
        .map_err(e)?;
    c.configure_mesh()
        .x_desc("error, metres")
        .y_desc("% of fixes at or below")
        .draw()
        .map_err(e)?;
    for (data, colour, name) in [(&h, INK, "horizontal"), (&v, EMBER, "vertical (absolute)")] {
        let n = data.len().max(1) as f64;
        c.draw_series(LineSeries::new(
            data.iter()
                .enumerate()
                .map(|(i, x)| (*x, 100.0 * (i + 1) as f64 / n)),
            &colour,
        ))
        .map_err(e)?
        .label(name)
        .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], colour));
    }
    c.draw_series(LineSeries::new([(0.0, 95.0), (xmax, 95.0)], BLACK.mix(0.3)))
        .map_err(e)?;
    c.configure_series_labels()
        .position(SeriesLabelPosition::LowerRight)
        .border_style(BLACK)
        .draw()
        .map_err(e)?;
    root.present().map_err(e)
}

/// East/north errors with the CEP (50 %) and 95 % circles.
pub fn scatter(path: &Path, title: &str, records: &[EpochRecord], s: &Summary) -> Res {
    let pts: Vec<(f64, f64)> = records
        .iter()
        .filter_map(|r| r.fix.and_then(|f| f.enu_error_m))
        .map(|d| (d[0], d[1]))
        .collect();
    let lim = max_or(
        pts.iter().map(|p| p.0.abs().max(p.1.abs())),
        s.horizontal.p95.max(1.0),
    ) * 1.1;
    let root = SVGBackend::new(path, (560, 560)).into_drawing_area();
    root.fill(&WHITE).map_err(e)?;
    let mut c = ChartBuilder::on(&root)
        .caption(format!("{title}: horizontal error"), ("sans-serif", 18))
        .margin(12)
        .x_label_area_size(36)
        .y_label_area_size(50)
        .build_cartesian_2d(-lim..lim, -lim..lim)
        .map_err(e)?;
    c.configure_mesh()
        .x_desc("east, metres")
        .y_desc("north, metres")
        .draw()
        .map_err(e)?;
    c.draw_series(
        pts.iter()
            .map(|p| Circle::new(*p, 2, INK.mix(0.5).filled())),
    )
    .map_err(e)?;
    for (r, colour, name) in [
        (s.cep_m, MOSS, "CEP (50 %)"),
        (s.horizontal.p95, EMBER, "95 %"),
    ] {
        let ring: Vec<(f64, f64)> = (0..=180)
            .map(|k| {
                let a = f64::from(k) / 180.0 * std::f64::consts::TAU;
                (r * a.sin(), r * a.cos())
            })
            .collect();
        c.draw_series(LineSeries::new(ring, colour.stroke_width(2)))
            .map_err(e)?
            .label(format!("{name}: {r:.2} m"))
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], colour));
    }
    c.configure_series_labels()
        .border_style(BLACK)
        .draw()
        .map_err(e)?;
    root.present().map_err(e)
}

/// Satellite tracks on the sky: north up, east right, zenith at the centre, rings every 30°.
pub fn sky(path: &Path, title: &str, records: &[EpochRecord]) -> Res {
    let root = SVGBackend::new(path, (560, 580)).into_drawing_area();
    root.fill(&WHITE).map_err(e)?;
    let mut c = ChartBuilder::on(&root)
        .caption(
            format!("{title}: sky (GPS blue, Galileo orange, BeiDou green)"),
            ("sans-serif", 15),
        )
        .margin(12)
        .build_cartesian_2d(-95.0..95.0, -95.0..95.0)
        .map_err(e)?;
    for el in [0.0, 30.0, 60.0] {
        let r = 90.0 - el;
        let ring: Vec<(f64, f64)> = (0..=120)
            .map(|k| {
                let a = f64::from(k) / 120.0 * std::f64::consts::TAU;
                (r * a.sin(), r * a.cos())
            })
            .collect();
        c.draw_series(LineSeries::new(ring, BLACK.mix(0.25)))
            .map_err(e)?;
    }
    c.draw_series(
        [
            ("N", (0.0, 92.0)),
            ("E", (90.0, 0.0)),
            ("S", (0.0, -88.0)),
            ("W", (-93.0, 0.0)),
        ]
        .into_iter()
        .map(|(t, p)| Text::new(t, p, ("sans-serif", 14))),
    )
    .map_err(e)?;
    let step = (records.len() / 400).max(1);
    let pts = records
        .iter()
        .step_by(step)
        .flat_map(|r| r.sats.iter())
        .filter_map(|s| {
            let (el, az) = s.el_az_deg?;
            if el < 0.0 {
                return None;
            }
            let r = 90.0 - f64::from(el);
            let a = f64::from(az).to_radians();
            Some(((r * a.sin(), r * a.cos()), system_colour(s.sat.system)))
        });
    c.draw_series(pts.map(|(p, col)| Circle::new(p, 1, col.filled())))
        .map_err(e)?;
    root.present().map_err(e)
}

/// RMS post-fit residual per satellite.
pub fn residuals(path: &Path, title: &str, s: &Summary) -> Res {
    let items: Vec<(String, f64, System)> = s
        .residual_rms_by_sat
        .iter()
        .map(|(k, (_, rms))| {
            (
                format!("{}{:02}", k.system.rinex_letter(), k.prn),
                *rms,
                k.system,
            )
        })
        .collect();
    let n = items.len().max(1);
    let ymax = max_or(items.iter().map(|i| i.1), 0.5) * 1.15;
    let root = SVGBackend::new(path, (900, 420)).into_drawing_area();
    root.fill(&WHITE).map_err(e)?;
    let mut c = ChartBuilder::on(&root)
        .caption(
            format!("{title}: RMS post-fit residual per satellite"),
            ("sans-serif", 18),
        )
        .margin(12)
        .x_label_area_size(60)
        .y_label_area_size(50)
        .build_cartesian_2d(0.0..n as f64, 0.0..ymax)
        .map_err(e)?;
    c.configure_mesh()
        .disable_x_mesh()
        .x_labels(n.min(60))
        .x_label_formatter(&|x| {
            items
                .get(x.floor() as usize)
                .map(|i| i.0.clone())
                .unwrap_or_default()
        })
        .y_desc("metres")
        .draw()
        .map_err(e)?;
    c.draw_series(items.iter().enumerate().map(|(i, it)| {
        Rectangle::new(
            [(i as f64 + 0.15, 0.0), (i as f64 + 0.85, it.1)],
            system_colour(it.2).filled(),
        )
    }))
    .map_err(e)?;
    root.present().map_err(e)
}

/// PDOP, HDOP and satellites used against time.
pub fn dop(path: &Path, title: &str, records: &[EpochRecord]) -> Res {
    let pts: Vec<(f64, f64, f64, f64)> = records
        .iter()
        .filter_map(|r| {
            r.fix
                .map(|f| (minutes(records, r), f.pdop, f.hdop, f64::from(f.used)))
        })
        .collect();
    let t1 = max_or(pts.iter().map(|p| p.0), 1.0);
    let ymax = max_or(pts.iter().map(|p| p.1), 2.0).min(20.0) * 1.1;
    let root = SVGBackend::new(path, (900, 420)).into_drawing_area();
    root.fill(&WHITE).map_err(e)?;
    let (upper, lower) = root.split_vertically(240);
    let mut c = ChartBuilder::on(&upper)
        .caption(
            format!("{title}: dilution of precision and satellites used"),
            ("sans-serif", 18),
        )
        .margin(12)
        .x_label_area_size(20)
        .y_label_area_size(50)
        .build_cartesian_2d(0.0..t1, 0.0..ymax)
        .map_err(e)?;
    c.configure_mesh().y_desc("DOP").draw().map_err(e)?;
    let pd: Vec<(f64, f64)> = pts.iter().map(|p| (p.0, p.1)).collect();
    let hd: Vec<(f64, f64)> = pts.iter().map(|p| (p.0, p.2)).collect();
    draw_broken(&mut c, &pd, INK, "PDOP")?;
    draw_broken(&mut c, &hd, EMBER, "HDOP")?;
    c.configure_series_labels()
        .border_style(BLACK)
        .draw()
        .map_err(e)?;
    let smax = max_or(pts.iter().map(|p| p.3), 4.0) + 2.0;
    let mut c2 = ChartBuilder::on(&lower)
        .margin(12)
        .x_label_area_size(36)
        .y_label_area_size(50)
        .build_cartesian_2d(0.0..t1, 0.0..smax)
        .map_err(e)?;
    c2.configure_mesh()
        .x_desc("minutes")
        .y_desc("used")
        .draw()
        .map_err(e)?;
    let used: Vec<(f64, f64)> = pts.iter().map(|p| (p.0, p.3)).collect();
    draw_broken(&mut c2, &used, MOSS, "used")?;
    root.present().map_err(e)
}

/// Horizontal error against horizontal protection level, one point per epoch that has both
/// (a truth and a level), with the diagonal: a point above it is an error the level failed
/// to bound. (A diagram of the kind the satellite-augmentation community draws to show
/// integrity performance; common practice.)
pub fn protection(path: &Path, title: &str, records: &[EpochRecord]) -> Res {
    use trackfix_engine::IntegrityState;
    let pts: Vec<(f64, f64, bool)> = records
        .iter()
        .filter_map(|r| {
            let h = f64::from(r.integrity.hpl_m?);
            let e = r.fix?.enu_error_m?;
            Some((
                h,
                e[0].hypot(e[1]),
                r.integrity.state == IntegrityState::FaultExcluded,
            ))
        })
        .collect();
    let lim = max_or(pts.iter().map(|p| p.0.max(p.1)), 10.0) * 1.1;
    let over = pts.iter().filter(|p| p.1 > p.0).count();
    let root = SVGBackend::new(path, (560, 560)).into_drawing_area();
    root.fill(&WHITE).map_err(e)?;
    let mut c = ChartBuilder::on(&root)
        .caption(
            format!("{title}: horizontal error against protection level"),
            ("sans-serif", 16),
        )
        .margin(12)
        .x_label_area_size(36)
        .y_label_area_size(50)
        .build_cartesian_2d(0.0..lim, 0.0..lim)
        .map_err(e)?;
    c.configure_mesh()
        .x_desc("horizontal protection level, metres")
        .y_desc("horizontal error, metres")
        .draw()
        .map_err(e)?;
    c.draw_series(LineSeries::new(
        vec![(0.0, 0.0), (lim, lim)],
        BLACK.stroke_width(1),
    ))
    .map_err(e)?
    .label(format!(
        "error = level ({over} of {} epochs above)",
        pts.len()
    ))
    .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], BLACK));
    for (excluded, colour, name) in [(false, INK, "verified"), (true, EMBER, "fault excluded")] {
        let n = pts.iter().filter(|p| p.2 == excluded).count();
        c.draw_series(
            pts.iter()
                .filter(|p| p.2 == excluded)
                .map(|p| Circle::new((p.0, p.1), 2, colour.mix(0.5).filled())),
        )
        .map_err(e)?
        .label(format!("{name}: {n} epochs"))
        .legend(move |(x, y)| Circle::new((x + 9, y), 3, colour.filled()));
    }
    c.configure_series_labels()
        .border_style(BLACK)
        .draw()
        .map_err(e)?;
    root.present().map_err(e)
}
