//! The dataset manifest: every synthetic scenario and recorded dataset the harness gates,
//! with its thresholds, in one TOML file (`host-tests/manifest.toml`). Rows run in parallel.

use crate::data::{data_dir, report_skip, required, verify, REQUIRE_VAR};
use crate::faults::{FaultFigures, FaultKind, FaultRow};
use crate::metrics::Summary;
use crate::record::EpochRecord;
use crate::replay::{replay, Dataset, Truth};
use crate::scenario::{self, ScenarioSpec};
use rayon::prelude::*;
use serde::Deserialize;
use std::fmt::Write as _;
use std::path::Path;
use trackfix_engine::Config;

/// The manifest file, relative to the workspace root.
pub const MANIFEST: &str = "host-tests/manifest.toml";

/// Limits a row must stay within; absent limits are not checked.
#[derive(Clone, Copy, Debug, Default, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct Threshold {
    /// Horizontal error, 50th percentile, at most, m.
    pub h50_m: Option<f64>,
    /// Horizontal error, 95th percentile, at most, m.
    pub h95_m: Option<f64>,
    /// Vertical error, 50th percentile, at most, m.
    pub v50_m: Option<f64>,
    /// Vertical error, 95th percentile, at most, m.
    pub v95_m: Option<f64>,
    /// Share of epochs with a fix, at least, %.
    pub availability_min_pct: Option<f64>,
    /// Time to first fix after wake-up, 95th percentile, at most, s.
    pub ttff95_s: Option<f64>,
    /// 3-D velocity error RMS against the truth velocity, at most, m/s.
    pub vel_rms_mps: Option<f64>,
    /// Held position: 95 % of its horizontal distance from its mean, at most, m.
    pub hold_spread95_m: Option<f64>,
    /// Held position: drift over a parking, at most, m.
    pub hold_drift_m: Option<f64>,
    /// Position change at a receiver clock step, at most, m.
    pub clock_step_m: Option<f64>,
    /// Horizontal error at the first updated fix after an outage, at most, m.
    pub post_outage_h_m: Option<f64>,
    /// Epochs with an interference or spoofing flag, at most.
    pub flagged_max: Option<f64>,
    /// Epochs whose error exceeds its protection level, at most.
    pub misleading_max: Option<f64>,
    /// Satellite-epochs received by reflection that were down-weighted or kept out, at
    /// least, %.
    pub reflected_caught_min_pct: Option<f64>,
}

/// A synthetic row.
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ScenarioRow {
    /// Row name.
    pub name: String,
    /// What it represents.
    pub note: String,
    /// The scenario.
    pub spec: ScenarioSpec,
    /// Systems the engine uses (default: all it is given).
    #[serde(default)]
    pub engine_systems: Option<Vec<crate::scenario::spec::SystemName>>,
    /// Limits of the snapshot-only run.
    pub threshold: Threshold,
    /// Limits of the default (filtered) run.
    pub filtered: Threshold,
}

/// A recorded row.
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DatasetRow {
    /// Row name.
    pub name: String,
    /// What it represents.
    pub note: String,
    /// Observation file inside the data folder.
    pub obs: String,
    /// Navigation files inside the data folder.
    pub nav: Vec<String>,
    /// Known marker position, ECEF m (the header's antenna offset is added).
    pub marker: Option<[f64; 3]>,
    /// Systems the engine uses.
    pub systems: Vec<crate::scenario::spec::SystemName>,
    /// Limits of the snapshot-only run.
    pub threshold: Threshold,
    /// Limits of the default (filtered) run.
    pub filtered: Threshold,
}

/// The whole manifest.
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Manifest {
    /// Synthetic rows.
    #[serde(default)]
    pub scenario: Vec<ScenarioRow>,
    /// Recorded rows.
    #[serde(default)]
    pub dataset: Vec<DatasetRow>,
    /// Fault-injection Monte Carlo rows.
    #[serde(default)]
    pub integrity: Vec<FaultRow>,
}

/// One fault-injection row's outcome.
#[derive(Clone, Debug)]
pub struct FaultResult {
    /// The row.
    pub row: FaultRow,
    /// What it measured, or why it could not run.
    pub figures: Result<FaultFigures, String>,
}

/// One row's outcome, run twice: with the default configuration (the navigation filter)
/// and snapshot-only.
#[derive(Clone, Debug)]
pub struct RowResult {
    /// Row name.
    pub name: String,
    /// "synthetic" or "recorded".
    pub kind: &'static str,
    /// The default run's summary, or why the row could not run (a missing data folder is
    /// `Skipped`).
    pub outcome: RowOutcome,
    /// Limits of the default run.
    pub threshold: Threshold,
    /// The snapshot-only run.
    pub snapshot: RowOutcome,
    /// Limits of the snapshot-only run.
    pub snapshot_threshold: Threshold,
}

/// Whether a row ran.
#[derive(Clone, Debug)]
pub enum RowOutcome {
    /// It ran.
    Ran(Box<Summary>),
    /// The recorded data folder is absent.
    Skipped,
    /// It could not run.
    Error(String),
}

impl Manifest {
    /// Reads the manifest from `path`.
    ///
    /// # Errors
    /// A message naming the file, line and key.
    pub fn read(path: &Path) -> Result<Manifest, String> {
        let text = std::fs::read_to_string(path).map_err(|e| format!("{}: {e}", path.display()))?;
        toml::from_str(&text).map_err(|e| format!("{}: {e}", path.display()))
    }

    /// Runs every row (in parallel).
    pub fn run(&self) -> Vec<RowResult> {
        let mut out: Vec<RowResult> = self.scenario.par_iter().map(run_scenario).collect();
        out.extend(self.dataset.par_iter().map(run_dataset).collect::<Vec<_>>());
        out
    }

    /// Runs every fault-injection row (in parallel).
    pub fn run_faults(&self) -> Vec<FaultResult> {
        self.integrity
            .par_iter()
            .map(|row| FaultResult {
                row: row.clone(),
                figures: row.run(),
            })
            .collect()
    }

    /// Runs every row of every kind: the tables and whether every row passed.
    pub fn run_tables(&self) -> (String, bool, Vec<RowResult>) {
        let results = self.run();
        let (mut text, ok) = table(&results);
        let (faults, faults_ok) = fault_table(&self.run_faults());
        text.push_str(&faults);
        (text, ok && faults_ok, results)
    }
}

/// The fault-injection table (Markdown) and whether every row passed.
pub fn fault_table(results: &[FaultResult]) -> (String, bool) {
    let mut s = String::new();
    heading(
        &mut s,
        "Fault injection (Monte Carlo, fixed seeds; host-tests/src/faults.rs): residual-test alarms against the binomial 99 % interval of the configured false-alarm probability, detection and right exclusions, epochs whose error exceeds the protection level against the binomial 99 % bound of the integrity risk, and the delay from an attack to its flag.",
        &[
            "row",
            "epochs",
            "tested",
            "alarms (99 % interval)",
            "detected %",
            "right exclusion %",
            "error > PL (bound)",
            "flag delay max s",
            "clean-part flags",
        ],
    );
    let mut all_ok = true;
    for r in results {
        let f = match &r.figures {
            Ok(f) => f,
            Err(e) => {
                all_ok = false;
                let _ = writeln!(s, "| {} | **ERROR** {e} | | | | | | | |", r.row.name);
                continue;
            }
        };
        let t = &r.row.threshold;
        let ok = f.passes(t);
        all_ok &= ok;
        let test_row = matches!(r.row.kind, FaultKind::FaultFree | FaultKind::Bias);
        let dash = || "–".to_string();
        let (alarms, detected, right, bounded) = match r.row.kind {
            FaultKind::FaultFree => (
                format!(
                    "{} ({}–{})",
                    f.alarms, f.alarm_interval.0, f.alarm_interval.1
                ),
                dash(),
                dash(),
                format!(
                    "{} of {} (≤ {})",
                    f.misleading, f.protected, f.misleading_bound
                ),
            ),
            FaultKind::Bias => (
                f.alarms.to_string(),
                cell(f.detection_pct(), t.detection_min_pct, true, 2).0,
                cell(f.exclusion_pct(), t.exclusion_min_pct, true, 2).0,
                format!(
                    "{} of {} (≤ {})",
                    f.misleading, f.protected, f.misleading_bound
                ),
            ),
            _ => (dash(), dash(), dash(), dash()),
        };
        let (detected, delay, clean) = if test_row {
            (detected, dash(), dash())
        } else if matches!(r.row.kind, FaultKind::TrackedBias | FaultKind::TrackedRamp) {
            (
                cell(f.detection_pct(), t.detection_min_pct, true, 2).0,
                format!(
                    "median {:.0}; {}",
                    f.delay_median_s(),
                    cell(f.delay_max_s(), t.delay_max_s, false, 0).0
                ),
                cell(f.clean_flags as f64, t.clean_flags_max, false, 0).0,
            )
        } else {
            (
                detected,
                cell(f.delay_max_s(), t.delay_max_s, false, 0).0,
                cell(f.clean_flags as f64, t.clean_flags_max, false, 0).0,
            )
        };
        let mark = if ok { "" } else { " **FAIL**" };
        let _ = writeln!(
            s,
            "| {}{mark} | {} | {} | {alarms} | {detected} | {right} | {bounded} | {delay} | {clean} |",
            r.row.name,
            f.epochs,
            if test_row { f.tested.to_string() } else { dash() },
        );
    }
    (s, all_ok)
}

/// The engine configuration for a row: defaults with only the listed systems on.
pub fn config_for(systems: &[crate::scenario::spec::SystemName]) -> Config {
    let systems: Vec<trackfix_engine::System> = systems.iter().map(|s| (*s).into()).collect();
    Config::default().with_systems(&systems)
}

/// The same without the navigation filter: every fix a snapshot.
pub fn snapshot_config(systems: &[crate::scenario::spec::SystemName]) -> Config {
    let mut c = config_for(systems);
    c.filter.mode = trackfix_engine::config::FilterMode::Snapshot;
    c
}

impl ScenarioRow {
    /// Runs the scenario through the engine.
    ///
    /// # Errors
    /// A message naming the scenario field that cannot be used.
    pub fn records(&self) -> Result<Vec<EpochRecord>, String> {
        self.records_with(config_for(self.systems()))
    }

    /// The systems the engine uses.
    pub fn systems(&self) -> &[crate::scenario::spec::SystemName] {
        self.engine_systems.as_deref().unwrap_or(&self.spec.systems)
    }

    /// Runs the scenario through the engine configured with `cfg`.
    ///
    /// # Errors
    /// A message naming the scenario field that cannot be used.
    pub fn records_with(&self, cfg: Config) -> Result<Vec<EpochRecord>, String> {
        scenario::run(&self.spec, cfg).map_err(|e| format!("scenario {}: {e}", self.name))
    }
}

impl DatasetRow {
    /// Checks the files against SHA256SUMS in `dir` and replays them.
    ///
    /// # Errors
    /// A digest mismatch or the first reading error.
    pub fn records(&self, dir: &Path) -> Result<Vec<EpochRecord>, String> {
        self.records_with(dir, config_for(&self.systems))
    }

    /// As [`DatasetRow::records`], with the engine configured by `cfg`.
    ///
    /// # Errors
    /// A digest mismatch or the first reading error.
    pub fn records_with(&self, dir: &Path, cfg: Config) -> Result<Vec<EpochRecord>, String> {
        std::iter::once(&self.obs)
            .chain(self.nav.iter())
            .try_for_each(|f| verify(dir, f))?;
        let ds = Dataset {
            obs: dir.join(&self.obs),
            nav: self.nav.iter().map(|n| dir.join(n)).collect(),
            truth: self.marker.map(Truth::Marker),
        };
        replay(&ds, cfg).map_err(|e| e.to_string())
    }
}

fn summarise(r: Result<Vec<EpochRecord>, String>) -> RowOutcome {
    match r {
        Ok(r) => RowOutcome::Ran(Box::new(Summary::of(&r))),
        Err(e) => RowOutcome::Error(e),
    }
}

fn run_scenario(row: &ScenarioRow) -> RowResult {
    RowResult {
        name: row.name.clone(),
        kind: "synthetic",
        outcome: summarise(row.records()),
        threshold: row.filtered,
        snapshot: summarise(row.records_with(snapshot_config(row.systems()))),
        snapshot_threshold: row.threshold,
    }
}

fn run_dataset(row: &DatasetRow) -> RowResult {
    // The folder is looked up, and a missing one reported, once for both runs.
    let dir = data_dir();
    if dir.is_none() && !required() {
        report_skip(&format!("manifest row {}", row.name));
    }
    let run = |cfg: Config| match &dir {
        None if required() => RowOutcome::Error(format!(
            "recorded data folder not found and {REQUIRE_VAR} is set"
        )),
        None => RowOutcome::Skipped,
        Some(dir) => summarise(row.records_with(dir, cfg)),
    };
    RowResult {
        name: row.name.clone(),
        kind: "recorded",
        outcome: run(config_for(&row.systems)),
        threshold: row.filtered,
        snapshot: run(snapshot_config(&row.systems)),
        snapshot_threshold: row.threshold,
    }
}

impl RowResult {
    /// Both runs with their limits: the default (filtered) one, then snapshot-only.
    pub fn runs(&self) -> [(&'static str, &RowOutcome, &Threshold); 2] {
        [
            ("filtered", &self.outcome, &self.threshold),
            ("snapshot", &self.snapshot, &self.snapshot_threshold),
        ]
    }
}

/// A table's introduction, header row and separator (Markdown).
fn heading(s: &mut String, intro: &str, columns: &[&str]) {
    let _ = writeln!(s, "\n{intro}\n");
    let _ = writeln!(s, "| {} |", columns.join(" | "));
    let _ = writeln!(s, "|{}", "---|".repeat(columns.len()));
}

/// One measured value against its limit: (text, passed).
fn cell(measured: f64, limit: Option<f64>, at_least: bool, decimals: usize) -> (String, bool) {
    if measured.is_nan() {
        return ("–".to_string(), limit.is_none());
    }
    match limit {
        None => (format!("{measured:.decimals$}"), true),
        Some(l) => {
            let ok = if at_least {
                measured >= l
            } else {
                measured <= l
            };
            let op = if at_least { "≥" } else { "≤" };
            let mark = if ok { "" } else { " **FAIL**" };
            (
                format!("{measured:.decimals$} ({op} {l:.decimals$}){mark}"),
                ok,
            )
        }
    }
}

/// The measured-versus-threshold tables (Markdown): accuracy of both runs of every row, then
/// the filter's own figures; and whether every row passed.
pub fn table(results: &[RowResult]) -> (String, bool) {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "| row | run | epochs | availability % | H 50 % m | H 95 % m | V 50 % m | V 95 % m | TTFF 95 % s | velocity RMS m/s |"
    );
    let _ = writeln!(s, "|---|---|---|---|---|---|---|---|---|---|");
    let mut all_ok = true;
    for r in results {
        for (run, outcome, t) in r.runs() {
            all_ok &= accuracy_line(&mut s, &r.name, run, r.kind, outcome, t);
        }
    }
    heading(
        &mut s,
        "The filtered runs: share of epochs per fix kind, and the filter's own figures (see below).",
        &[
            "row",
            "snapshot / filtered / predicted / held / none %",
            "held spread 95 % m",
            "held drift m",
            "position change at a clock step m",
            "H error after an outage m",
            "H error / σ_H, 95 %",
        ],
    );
    for r in results {
        if let RowOutcome::Ran(m) = &r.outcome {
            let f = &m.filter;
            let t = &r.threshold;
            let opt = |v: Option<f64>| v.unwrap_or(f64::NAN);
            let cells = [
                cell(opt(f.hold_spread95_m), t.hold_spread95_m, false, 2),
                cell(opt(f.hold_drift_m), t.hold_drift_m, false, 2),
                cell(opt(f.clock_step_m), t.clock_step_m, false, 2),
                cell(opt(f.post_outage_h_m), t.post_outage_h_m, false, 2),
                cell(opt(f.h_over_sigma95), None, false, 2),
            ];
            all_ok &= cells.iter().all(|c| c.1);
            let shares = f.shares_pct().map(|p| format!("{p:.1}")).join(" / ");
            let _ = writeln!(
                s,
                "| {} | {shares} | {} |",
                r.name,
                cells
                    .iter()
                    .map(|c| c.0.as_str())
                    .collect::<Vec<_>>()
                    .join(" | ")
            );
        }
    }
    heading(
        &mut s,
        "Integrity, both runs: share of epochs per state, epochs with an interference or spoofing flag, the median horizontal protection level, epochs whose error exceeds its protection level (of those with a level), and the share of reflected satellite-epochs caught (synthetic canyon truth).",
        &[
            "row",
            "run",
            "verified / excluded / unavailable / alert %",
            "flagged epochs",
            "HPL 50 % m",
            "error > PL",
            "reflections caught %",
        ],
    );
    for r in results {
        for (run, outcome, t) in r.runs() {
            if let RowOutcome::Ran(m) = outcome {
                let i = &m.integrity;
                let cells = [
                    cell(i.flagged as f64, t.flagged_max, false, 0),
                    cell(i.hpl50_m.unwrap_or(f64::NAN), None, false, 1),
                    cell(i.misleading as f64, t.misleading_max, false, 0),
                    cell(
                        i.reflected_caught_pct.unwrap_or(f64::NAN),
                        t.reflected_caught_min_pct,
                        true,
                        1,
                    ),
                ];
                all_ok &= cells.iter().all(|c| c.1);
                let shares = i.shares_pct().map(|p| format!("{p:.1}")).join(" / ");
                let _ = writeln!(
                    s,
                    "| {} | {run} | {shares} | {} | {} | {} of {} | {} |",
                    r.name, cells[0].0, cells[1].0, cells[2].0, i.bounded_epochs, cells[3].0
                );
            }
        }
    }
    (s, all_ok)
}

/// One run's accuracy line; whether it passed.
fn accuracy_line(
    s: &mut String,
    name: &str,
    run: &str,
    kind: &str,
    outcome: &RowOutcome,
    t: &Threshold,
) -> bool {
    match outcome {
        RowOutcome::Skipped => {
            let _ = writeln!(
                s,
                "| {name} | {run} | skipped: no data folder ({kind}) | | | | | | | |"
            );
            true
        }
        RowOutcome::Error(e) => {
            let _ = writeln!(s, "| {name} | {run} | **ERROR** {e} | | | | | | | |");
            false
        }
        RowOutcome::Ran(m) => {
            // No truth (or no fix): no error statistics to show.
            let or_nan = |count: usize, v: f64| if count > 0 { v } else { f64::NAN };
            let (h, v) = (&m.horizontal, &m.vertical);
            let cells = [
                cell(m.availability_pct, t.availability_min_pct, true, 1),
                cell(or_nan(h.count, h.p50), t.h50_m, false, 2),
                cell(or_nan(h.count, h.p95), t.h95_m, false, 2),
                cell(or_nan(v.count, v.p50), t.v50_m, false, 2),
                cell(or_nan(v.count, v.p95), t.v95_m, false, 2),
                cell(or_nan(m.ttff_s.count, m.ttff_s.p95), t.ttff95_s, false, 1),
                cell(
                    or_nan(m.velocity_error.count, m.velocity_error.rms),
                    t.vel_rms_mps,
                    false,
                    3,
                ),
            ];
            let _ = writeln!(
                s,
                "| {name} | {run} | {} | {} |",
                m.epochs,
                cells
                    .iter()
                    .map(|c| c.0.as_str())
                    .collect::<Vec<_>>()
                    .join(" | ")
            );
            cells.iter().all(|c| c.1)
        }
    }
}

/// The accuracy page of docs/: the table between markers, so a test can check it is current.
pub const TABLE_BEGIN: &str = "<!-- manifest-table:begin (generated by `cargo run -p trackfix-tools -- manifest --write-docs`) -->";
/// End marker of the generated table.
pub const TABLE_END: &str = "<!-- manifest-table:end -->";

/// Replaces the generated block of `page` with `table`.
pub fn splice(page: &str, table: &str) -> Option<String> {
    let a = page.find(TABLE_BEGIN)?;
    let b = page.find(TABLE_END)?;
    (a < b).then(|| format!("{}{TABLE_BEGIN}\n{table}{}", &page[..a], &page[b..]))
}
