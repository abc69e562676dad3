//! `trackfix`: run the engine on the built-in demo scenario or on recorded RINEX files.
//!
//! Not for safety-of-life navigation. Positions are estimates; follow local regulations
//! and licensed practice where a position carries legal or safety weight.

use clap::{Parser, Subcommand};
use rand::SeedableRng;
use std::path::PathBuf;
use std::process::ExitCode;
use trackfix_engine::{
    Config, Engine, FixOutcome, Geodetic, GnssTime, IonoCoefficients, LocalFrame, System,
};
use trackfix_harness::metrics::Stats;
use trackfix_harness::metrics::Summary;
use trackfix_harness::replay::{replay, Dataset, Truth};
use trackfix_harness::synth::{constellation, observe_with, ErrorModel, StaticReceiver};

const CAUTION: &str = "Trackfix output is an estimate: not for safety-of-life navigation; \
follow local regulations and licensed practice.";

#[derive(Parser)]
#[command(name = "trackfix", version, about = "Trackfix positioning engine tools", after_help = CAUTION)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Run the built-in demo: a pallet tracker parked at the (invented) Saltmarsh Lane depot,
    /// GPS + Galileo, synthetic measurements with noise and atmosphere.
    Demo {
        /// Number of one-second epochs.
        #[arg(long, default_value_t = 120)]
        epochs: u32,
        /// Random seed of the scenario.
        #[arg(long, default_value_t = 2026)]
        seed: u64,
        /// Print every k-th epoch in the table.
        #[arg(long, default_value_t = 10)]
        every: u32,
    },
    /// Replay a recorded RINEX observation file with its navigation file(s).
    Replay {
        /// RINEX observation file.
        #[arg(long)]
        obs: PathBuf,
        /// RINEX navigation file(s).
        #[arg(long, required = true, num_args = 1..)]
        nav: Vec<PathBuf>,
        /// Known marker position "X,Y,Z" in ECEF metres, to measure errors against.
        #[arg(long, value_parser = parse_xyz)]
        truth: Option<[f64; 3]>,
        /// Systems to use, any of g (GPS), e (Galileo), c (BeiDou).
        #[arg(long, default_value = "ge")]
        systems: String,
    },
    /// Run every row of the dataset manifest and print measured against thresholds.
    Manifest {
        /// Also write the table into docs/accuracy.md.
        #[arg(long)]
        write_docs: bool,
    },
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
            epochs,
            seed,
            every,
        } => demo(epochs, seed, every.max(1)),
        Command::Replay {
            obs,
            nav,
            truth,
            systems,
        } => replay_cmd(obs, nav, truth, &systems),
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

fn demo(epochs: u32, seed: u64, every: u32) -> Result<(), String> {
    println!("Trackfix demo: pallet tracker PT-0417 parked at the Saltmarsh Lane depot (an invented site)");
    println!("{CAUTION}\n");
    let start = GnssTime::from_week_tow(2400, 302_000.0).map_err(|e| format!("{e:?}"))?;
    let cons = constellation(
        seed,
        start.add_seconds(1_800.0),
        &[System::Gps, System::Galileo],
    );
    let site = Geodetic::from_degrees(47.62, 8.91, 412.0);
    let rx = StaticReceiver {
        position: site.to_ecef(),
        horizon_deg: 5.0,
        clock_bias_m: 84_000.0,
        inter_system_bias_m: 6.5,
    };
    let iono = IonoCoefficients {
        alpha: [1.49e-8, 2.24e-8, -1.19e-7, -1.19e-7],
        beta: [1.17e5, 1.80e5, -1.31e5, -4.95e5],
    };
    let errors = ErrorModel {
        sigma_m: 0.8,
        constant_sigma: false,
        // The true ionosphere is 30 % stronger than the broadcast model says.
        iono: Some((iono, 1.3)),
        troposphere: true,
    };
    let mut engine: Box<Engine<40, 64>> = Box::new(Engine::new(Config::default()));
    for e in &cons.ephemerides {
        engine
            .ingest_ephemeris(*e)
            .map_err(|e| format!("ephemeris refused: {e:?}"))?;
    }
    engine.set_ionosphere(iono);
    let frame = LocalFrame::at_ecef(rx.position);
    let mut rng = rand::rngs::StdRng::seed_from_u64(seed);
    let (mut h, mut v) = (Vec::new(), Vec::new());
    println!(
        "{:>9} {:>11} {:>11} {:>8} {:>7} {:>7} {:>7} {:>4} {:>5} fix",
        "GPS TOW", "lat °", "lon °", "h m", "E m", "N m", "U m", "sats", "HDOP"
    );
    for k in 0..epochs {
        let t = start.add_seconds(f64::from(k));
        let epoch = observe_with::<40>(&rx, &cons, t, &errors, &mut rng);
        let sol = engine.process(&epoch).map_err(|e| format!("{e:?}"))?;
        let show = k % every == 0;
        match sol.outcome {
            FixOutcome::Fix(f) => {
                let [e, n, u] = frame.enu(f.ecef_m);
                h.push(e.hypot(n));
                v.push(u.abs());
                if show {
                    println!(
                        "{:>9.1} {:>11.6} {:>11.6} {:>8.1} {:>7.2} {:>7.2} {:>7.2} {:>4} {:>5.2} {:?}",
                        sol.time.tow_s(),
                        f.geodetic.lat_rad.to_degrees(),
                        f.geodetic.lon_rad.to_degrees(),
                        f.geodetic.height_m,
                        e,
                        n,
                        u,
                        f.used,
                        f.dop.hdop,
                        f.kind
                    );
                }
            }
            FixOutcome::NoFix(reason) if show => {
                println!("{:>9.1} no fix: {reason:?}", sol.time.tow_s())
            }
            FixOutcome::NoFix(_) => {}
        }
    }
    let (hs, vs) = (Stats::of(&h), Stats::of(&v));
    println!(
        "\n{} of {epochs} epochs fixed. Horizontal error 50/95 %: {:.2} / {:.2} m; vertical 50/95 %: {:.2} / {:.2} m",
        hs.count, hs.p50, hs.p95, vs.p50, vs.p95
    );
    Ok(())
}

fn replay_cmd(
    obs: PathBuf,
    nav: Vec<PathBuf>,
    truth: Option<[f64; 3]>,
    systems: &str,
) -> Result<(), String> {
    println!("{CAUTION}");
    let mut cfg = Config::default();
    cfg.systems = [
        systems.contains('g'),
        systems.contains('e'),
        systems.contains('c'),
    ];
    let ds = Dataset {
        obs,
        nav,
        truth: truth.map(Truth::Marker),
    };
    let results = replay(&ds, cfg).map_err(|e| e.to_string())?;
    let a = Summary::of(&results);
    println!("{} epochs, {} fixes", a.epochs, a.fixes);
    if truth.is_some() {
        println!(
            "horizontal 50/95 %: {:.2} / {:.2} m; vertical 50/95 %: {:.2} / {:.2} m",
            a.horizontal.p50, a.horizontal.p95, a.vertical.p50, a.vertical.p95
        );
    }
    Ok(())
}

fn manifest_cmd(write_docs: bool) -> Result<(), String> {
    use trackfix_harness::manifest::{splice, table, Manifest, MANIFEST};
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../..");
    let m = Manifest::read(&root.join(MANIFEST))?;
    let (text, ok) = table(&m.run());
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
