//! `trackfix`: run the engine on the built-in demo scenario, on recorded RINEX files or on a
//! manifest row, and write reports.
//!
//! Not for safety-of-life navigation. Positions are estimates; follow local regulations
//! and licensed practice where a position carries legal or safety weight.

mod frames;
mod plots;
mod report;

use clap::{Parser, Subcommand};
use indicatif::{ProgressBar, ProgressStyle};
use std::path::{Path, PathBuf};
use std::process::ExitCode;
use std::time::{Duration, Instant};
use trackfix_engine::config::FilterMode;
use trackfix_engine::{Config, System};
use trackfix_harness::manifest::{config_for, splice, Manifest, MANIFEST};
use trackfix_harness::metrics::Summary;
use trackfix_harness::record::EpochRecord;
use trackfix_harness::replay::{read_truth_csv, replay_with_progress, Dataset, Truth};
use trackfix_harness::scenario;

const CAUTION: &str = "Trackfix output is an estimate: not for safety-of-life navigation; \
follow local regulations and licensed practice.";

/// The demo: an invented pallet tracker on an invented delivery round.
const DEMO: &str = r#"
seed = 2026
duration_s = 600
origin = [46.287, 4.118, 170.0]
motion = "truck"
systems = ["gps", "galileo"]
[errors]
multipath_m = 0.8
"#;

#[derive(Parser)]
#[command(name = "trackfix", version, about = "Trackfix positioning engine tools", after_help = CAUTION)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Run the built-in demo: pallet tracker PT-0417 on a delivery truck through the
    /// (invented) streets of Old Quay, GPS + Galileo, synthetic measurements.
    Demo {
        /// Print every k-th epoch in the table.
        #[arg(long, default_value_t = 20)]
        every: usize,
        /// Also write a report (plots, exports, JSON summary) into this folder.
        #[arg(long)]
        out: Option<PathBuf>,
        /// Engine configuration file (TOML, the engine's `Config`; missing keys keep their
        /// defaults, see docs/architecture.md).
        #[arg(long)]
        config: Option<PathBuf>,
        /// Snapshot fixes only: every epoch its own least-squares solution, no navigation
        /// filter (overrides the configuration file's `filter.mode`).
        #[arg(long)]
        snapshot_only: bool,
    },
    /// Replay a recorded RINEX observation file with its navigation file(s).
    Replay {
        /// RINEX observation file.
        #[arg(long)]
        obs: PathBuf,
        /// RINEX navigation file(s).
        #[arg(long, required = true, num_args = 1..)]
        nav: Vec<PathBuf>,
        /// Known marker position "X,Y,Z" in ECEF metres (the header's antenna offset is added).
        #[arg(long, value_parser = parse_xyz, conflicts_with = "truth_csv")]
        truth: Option<[f64; 3]>,
        /// Truth trajectory CSV (gps_week,tow_s,x_m,y_m,z_m; see docs/exports.md).
        #[arg(long)]
        truth_csv: Option<PathBuf>,
        /// Systems to use, any of g (GPS), e (Galileo), c (BeiDou). Default "ge", or the
        /// configuration file's when one is given.
        #[arg(long)]
        systems: Option<String>,
        /// Write a report (plots, exports, JSON summary) into this folder.
        #[arg(long)]
        out: Option<PathBuf>,
        /// Engine configuration file (TOML, the engine's `Config`; missing keys keep their
        /// defaults).
        #[arg(long)]
        config: Option<PathBuf>,
        /// Snapshot fixes only: every epoch its own least-squares solution, no navigation
        /// filter (overrides the configuration file's `filter.mode`).
        #[arg(long)]
        snapshot_only: bool,
    },
    /// Run one row of the dataset manifest (synthetic or recorded) and write its report.
    Report {
        /// Row name, as in host-tests/manifest.toml.
        #[arg(long)]
        row: String,
        /// Folder for the report.
        #[arg(long)]
        out: PathBuf,
        /// Snapshot fixes only: every epoch its own least-squares solution, no navigation
        /// filter (overrides the configuration file's `filter.mode`).
        #[arg(long)]
        snapshot_only: bool,
    },
    /// Write a wire-frame stream for the firmware example, or run one on the host.
    Frames {
        #[command(subcommand)]
        what: FramesCmd,
    },
    /// Run every row of the dataset manifest and print measured against thresholds.
    Manifest {
        /// Also write the table into docs/accuracy.md.
        #[arg(long)]
        write_docs: bool,
    },
}

#[derive(Subcommand)]
enum FramesCmd {
    /// Convert recorded RINEX into frames (ephemerides as a receiver would decode them).
    Rinex {
        #[arg(long)]
        obs: PathBuf,
        #[arg(long, required = true, num_args = 1..)]
        nav: Vec<PathBuf>,
        /// Systems, any of g, e, c.
        #[arg(long, default_value = "ge")]
        systems: String,
        /// Observations per epoch (the firmware's N).
        #[arg(long, default_value_t = 12)]
        n: usize,
        /// Epochs to convert.
        #[arg(long, default_value_t = 20)]
        epochs: usize,
        #[arg(long)]
        out: PathBuf,
    },
    /// Synthetic epochs with exactly the given satellite counts.
    Synthetic {
        /// Satellite counts, e.g. 8,12,24.
        #[arg(long, value_delimiter = ',', default_value = "8,12")]
        sats: Vec<usize>,
        /// Epochs per count.
        #[arg(long, default_value_t = 3)]
        each: usize,
        #[arg(long)]
        out: PathBuf,
    },
    /// Run a frame file through the engine on the host and print the firmware's lines.
    Run {
        /// Observations per epoch (12 or 24, as the firmware build).
        #[arg(long, default_value_t = 12)]
        n: usize,
        /// Frame files, run one after the other through one engine.
        #[arg(required = true)]
        files: Vec<PathBuf>,
    },
}

fn frames_cmd(what: FramesCmd) -> Result<(), String> {
    match what {
        FramesCmd::Rinex {
            obs,
            nav,
            systems,
            n,
            epochs,
            out,
        } => {
            let sys = [
                systems.contains('g'),
                systems.contains('e'),
                systems.contains('c'),
            ];
            let bytes = frames::from_rinex(&obs, &nav, sys, n, epochs)?;
            std::fs::write(&out, &bytes).map_err(|e| format!("{}: {e}", out.display()))?;
            println!(
                "{} bytes of frames written to {}",
                bytes.len(),
                out.display()
            );
        }
        FramesCmd::Synthetic { sats, each, out } => {
            let bytes = frames::synthetic(&sats, each)?;
            std::fs::write(&out, &bytes).map_err(|e| format!("{}: {e}", out.display()))?;
            println!(
                "{} bytes of frames written to {}",
                bytes.len(),
                out.display()
            );
        }
        FramesCmd::Run { n, files } => {
            let mut stream = Vec::new();
            for f in &files {
                stream.extend(std::fs::read(f).map_err(|e| format!("{}: {e}", f.display()))?);
            }
            let lines = match n {
                12 => frames::run_host::<12>(&stream),
                24 => frames::run_host::<24>(&stream),
                _ => return Err("n must be 12 or 24 (the firmware builds)".into()),
            };
            for l in lines {
                println!("{l}");
            }
        }
    }
    Ok(())
}

fn parse_xyz(s: &str) -> Result<[f64; 3], String> {
    let v: Vec<f64> = s
        .split(',')
        .map(|x| x.trim().parse::<f64>().map_err(|e| format!("{x:?}: {e}")))
        .collect::<Result<_, _>>()?;
    <[f64; 3]>::try_from(v).map_err(|_| "expected three comma-separated numbers X,Y,Z".to_string())
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let result = match cli.command {
        Command::Demo {
            every,
            out,
            config,
            snapshot_only,
        } => load_config(config.as_deref())
            .map(|cfg| mode(cfg, snapshot_only))
            .and_then(|cfg| demo(every.max(1), out.as_deref(), cfg)),
        Command::Replay {
            obs,
            nav,
            truth,
            truth_csv,
            systems,
            out,
            config,
            snapshot_only,
        } => load_config(config.as_deref()).and_then(|cfg| {
            let cfg = mode(cfg, snapshot_only);
            let cfg = match (systems.as_deref(), &config) {
                (Some(letters), _) => with_system_letters(cfg, letters),
                (None, Some(_)) => cfg,
                (None, None) => with_system_letters(cfg, "ge"),
            };
            replay_cmd(obs, nav, truth, truth_csv, cfg, out.as_deref())
        }),
        Command::Report {
            row,
            out,
            snapshot_only,
        } => report_cmd(&row, &out, snapshot_only),
        Command::Frames { what } => frames_cmd(what),
        Command::Manifest { write_docs } => manifest_cmd(write_docs),
    };
    match result {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("trackfix: {e}");
            ExitCode::FAILURE
        }
    }
}

/// The engine configuration: the defaults, or `path` read as TOML and validated. Errors
/// name the file, and the line and key (unknown key, wrong type) or the field (value out of
/// its documented range).
fn load_config(path: Option<&Path>) -> Result<Config, String> {
    let Some(path) = path else {
        return Ok(Config::default());
    };
    let text = std::fs::read_to_string(path).map_err(|e| format!("{}: {e}", path.display()))?;
    let cfg: Config = toml::from_str(&text).map_err(|e| format!("{}: {e}", path.display()))?;
    cfg.validate()
        .map_err(|e| format!("{}: {e}", path.display()))?;
    Ok(cfg)
}

/// `cfg` without the navigation filter when `snapshot_only` is set.
fn mode(mut cfg: Config, snapshot_only: bool) -> Config {
    if snapshot_only {
        cfg.filter.mode = FilterMode::Snapshot;
    }
    cfg
}

/// `cfg` with only the systems whose letters (g, e, c) appear in `letters`.
fn with_system_letters(cfg: Config, letters: &str) -> Config {
    let wanted: Vec<System> = [
        ('g', System::Gps),
        ('e', System::Galileo),
        ('c', System::Beidou),
    ]
    .into_iter()
    .filter(|(letter, _)| letters.contains(*letter))
    .map(|(_, s)| s)
    .collect();
    cfg.with_systems(&wanted)
}

fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../..")
}

fn print_summary(s: &Summary) {
    println!(
        "{} epochs, {} with a fix ({:.1} %)",
        s.epochs, s.fixes, s.availability_pct
    );
    if s.horizontal.count > 0 {
        println!(
            "horizontal error 50/95 %: {:.2} / {:.2} m; vertical 50/95 %: {:.2} / {:.2} m; CEP {:.2} m",
            s.horizontal.p50, s.horizontal.p95, s.vertical.p50, s.vertical.p95, s.cep_m
        );
    }
    let i = &s.integrity;
    let [v, x, u, a] = i.shares_pct();
    println!(
        "integrity: verified {v:.1} %, fault excluded {x:.1} %, unavailable {u:.1} %, alert {a:.1} %; {} epochs flagged{}",
        i.flagged,
        if i.bounded_epochs > 0 {
            format!("; error beyond its protection level in {} of {} epochs", i.misleading, i.bounded_epochs)
        } else {
            String::new()
        }
    );
}

fn demo(every: usize, out: Option<&Path>, cfg: Config) -> Result<(), String> {
    println!("Trackfix demo: pallet tracker PT-0417 on a delivery truck through Old Quay (an invented town)");
    println!("{CAUTION}\n");
    let spec = scenario::parse(DEMO, "built-in demo")?;
    let records = scenario::run(&spec, cfg)?;
    println!(
        "{:>7} {:>11} {:>11} {:>7} {:>6} {:>6} {:>6} {:>6} {:>6} {:>4} {:>5} {:<9} integrity",
        "t s", "lat °", "lon °", "h m", "E m", "N m", "U m", "σH m", "HPL m", "sats", "HDOP", "fix"
    );
    let t0 = records.first().map(|r| r.time);
    for r in records.iter().step_by(every) {
        let t = t0.map_or(0.0, |t0| r.time.seconds_since(t0));
        match (r.fix, r.no_fix) {
            (Some(f), _) => {
                let [e, n, u] = f.enu_error_m.unwrap_or([f64::NAN; 3]);
                let sigma_h = f.sigma_enu_m[0].hypot(f.sigma_enu_m[1]);
                let i = &r.integrity;
                let hpl = i.hpl_m.map_or("–".to_string(), |h| format!("{h:.1}"));
                let flags: Vec<&str> = i.flags.names().collect();
                println!(
                    "{t:>7.0} {:>11.6} {:>11.6} {:>7.1} {e:>6.2} {n:>6.2} {u:>6.2} {sigma_h:>6.2} {hpl:>6} {:>4} {:>5.2} {:<9} {}{}",
                    f.lat_lon_h[0], f.lat_lon_h[1], f.lat_lon_h[2], f.used, f.hdop, f.source.as_str(),
                    i.state.as_str(),
                    if flags.is_empty() { String::new() } else { format!(" [{}]", flags.join(", ")) }
                );
            }
            (None, reason) => println!("{t:>7.0} no fix: {reason:?}"),
        }
    }
    println!(
        "\n(E/N/U: error against the scenario's truth; σH: the engine's own horizontal 1-σ; HPL: its horizontal protection level)"
    );
    let s = Summary::of(&records);
    print_summary(&s);
    if let Some(dir) = out {
        report::write(dir, "demo", &records, &s)?;
        println!("report written to {}", dir.display());
    }
    Ok(())
}

fn progress_bar() -> (ProgressBar, Instant) {
    let bar = ProgressBar::hidden();
    bar.set_style(
        ProgressStyle::with_template("{bar:40} {percent:>3}% {elapsed}")
            .unwrap_or_else(|_| ProgressStyle::default_bar()),
    );
    bar.set_length(1000);
    (bar, Instant::now())
}

fn replay_cmd(
    obs: PathBuf,
    nav: Vec<PathBuf>,
    truth: Option<[f64; 3]>,
    truth_csv: Option<PathBuf>,
    cfg: Config,
    out: Option<&Path>,
) -> Result<(), String> {
    println!("{CAUTION}");
    let truth = match (truth, truth_csv) {
        (Some(m), _) => Some(Truth::Marker(m)),
        (None, Some(p)) => Some(Truth::Trajectory(read_truth_csv(&p)?)),
        (None, None) => None,
    };
    let name = obs
        .file_name()
        .map_or("replay".into(), |n| n.to_string_lossy().into_owned());
    let ds = Dataset { obs, nav, truth };
    // The bar appears only for replays that take longer than a second.
    let (bar, start) = progress_bar();
    let records = replay_with_progress(&ds, cfg, |f| {
        if bar.is_hidden() && start.elapsed() > Duration::from_secs(1) {
            bar.set_draw_target(indicatif::ProgressDrawTarget::stderr());
        }
        bar.set_position((f * 1000.0) as u64);
    })
    .map_err(|e| e.to_string())?;
    bar.finish_and_clear();
    let s = Summary::of(&records);
    print_summary(&s);
    if let Some(dir) = out {
        report::write(dir, &name, &records, &s)?;
        println!("report written to {}", dir.display());
    }
    Ok(())
}

fn report_cmd(row: &str, out: &Path, snapshot_only: bool) -> Result<(), String> {
    println!("{CAUTION}");
    let m = Manifest::read(&root().join(MANIFEST))?;
    let records: Vec<EpochRecord> = if let Some(r) = m.scenario.iter().find(|r| r.name == row) {
        r.records_with(mode(config_for(r.systems()), snapshot_only))?
    } else if let Some(r) = m.dataset.iter().find(|r| r.name == row) {
        let dir = trackfix_harness::data::data_dir()
            .ok_or("recorded data folder not found (set TRACKFIX_DATA)")?;
        r.records_with(&dir, mode(config_for(&r.systems), snapshot_only))?
    } else {
        let names: Vec<&str> = m
            .scenario
            .iter()
            .map(|r| r.name.as_str())
            .chain(m.dataset.iter().map(|r| r.name.as_str()))
            .collect();
        return Err(format!(
            "no manifest row {row:?}; rows: {}",
            names.join(", ")
        ));
    };
    let s = Summary::of(&records);
    print_summary(&s);
    report::write(out, row, &records, &s)?;
    println!("report written to {}", out.display());
    Ok(())
}

fn manifest_cmd(write_docs: bool) -> Result<(), String> {
    let root = root();
    let m = Manifest::read(&root.join(MANIFEST))?;
    let (text, ok, _) = m.run_tables();
    println!("{text}");
    if write_docs {
        let path = root.join("docs/accuracy.md");
        let page =
            std::fs::read_to_string(&path).map_err(|e| format!("{}: {e}", path.display()))?;
        let new =
            splice(&page, &text).ok_or("docs/accuracy.md lacks the manifest-table markers")?;
        std::fs::write(&path, new).map_err(|e| format!("{}: {e}", path.display()))?;
        println!("wrote {}", path.display());
    }
    if ok {
        Ok(())
    } else {
        Err("a row crossed its threshold".into())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn file(name: &str, text: &str) -> PathBuf {
        let dir = std::env::temp_dir().join(format!("trackfix-cli-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let p = dir.join(name);
        std::fs::write(&p, text).unwrap();
        p
    }

    // A configuration file: read with defaults for what it leaves out; an unknown key or a
    // value out of range refused naming the file and the line and key, or the field.
    #[test]
    fn configuration_files_are_read_or_refused_by_name() {
        let ok = file("ok.toml", "[snapshot]\nelevation_mask_deg = 15.0\n");
        let c = load_config(Some(&ok)).unwrap();
        assert_eq!(c.snapshot.elevation_mask_deg, 15.0);
        assert_eq!(c.nav, Config::default().nav);

        let unknown = file("unknown.toml", "[snapshot]\nmask = 15.0\n");
        let e = load_config(Some(&unknown)).unwrap_err();
        assert!(
            e.contains("unknown.toml") && e.contains("line 2") && e.contains("mask"),
            "{e}"
        );

        let bad = file("bad.toml", "[measurements]\ncn0_mask_dbhz = 99.0\n");
        let e = load_config(Some(&bad)).unwrap_err();
        assert!(
            e.contains("bad.toml") && e.contains("measurements.cn0_mask_dbhz"),
            "{e}"
        );

        let c = with_system_letters(Config::default(), "c");
        assert!(c.uses(System::Beidou) && !c.uses(System::Gps));
    }
}
