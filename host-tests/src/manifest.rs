//! The dataset manifest: every synthetic scenario and recorded dataset the harness gates,
//! with its thresholds, in one TOML file (`host-tests/manifest.toml`). Rows run in parallel.

use crate::data::{data_dir, report_skip, required, verify, REQUIRE_VAR};
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
    /// Limits.
    pub threshold: Threshold,
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
    /// Limits.
    pub threshold: Threshold,
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
}

/// One row's outcome.
#[derive(Clone, Debug)]
pub struct RowResult {
    /// Row name.
    pub name: String,
    /// "synthetic" or "recorded".
    pub kind: &'static str,
    /// The summary, or why the row could not run (a missing data folder is `Skipped`).
    pub outcome: RowOutcome,
    /// Limits.
    pub threshold: Threshold,
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
}

/// The engine configuration for a row: defaults with only the listed systems on.
pub fn config_for(systems: &[crate::scenario::spec::SystemName]) -> Config {
    let systems: Vec<trackfix_engine::System> = systems.iter().map(|s| (*s).into()).collect();
    Config::default().with_systems(&systems)
}

impl ScenarioRow {
    /// Runs the scenario through the engine.
    ///
    /// # Errors
    /// A message naming the scenario field that cannot be used.
    pub fn records(&self) -> Result<Vec<EpochRecord>, String> {
        let cfg = config_for(self.engine_systems.as_deref().unwrap_or(&self.spec.systems));
        scenario::run(&self.spec, cfg).map_err(|e| format!("scenario {}: {e}", self.name))
    }
}

impl DatasetRow {
    /// Checks the files against SHA256SUMS in `dir` and replays them.
    ///
    /// # Errors
    /// A digest mismatch or the first reading error.
    pub fn records(&self, dir: &Path) -> Result<Vec<EpochRecord>, String> {
        std::iter::once(&self.obs)
            .chain(self.nav.iter())
            .try_for_each(|f| verify(dir, f))?;
        let ds = Dataset {
            obs: dir.join(&self.obs),
            nav: self.nav.iter().map(|n| dir.join(n)).collect(),
            truth: self.marker.map(Truth::Marker),
        };
        replay(&ds, config_for(&self.systems)).map_err(|e| e.to_string())
    }
}

fn run_scenario(row: &ScenarioRow) -> RowResult {
    RowResult {
        name: row.name.clone(),
        kind: "synthetic",
        outcome: match row.records() {
            Ok(r) => RowOutcome::Ran(Box::new(Summary::of(&r))),
            Err(e) => RowOutcome::Error(e),
        },
        threshold: row.threshold,
    }
}

fn run_dataset(row: &DatasetRow) -> RowResult {
    RowResult {
        name: row.name.clone(),
        kind: "recorded",
        outcome: match data_dir() {
            None if required() => RowOutcome::Error(format!(
                "recorded data folder not found and {REQUIRE_VAR} is set"
            )),
            None => {
                report_skip(&format!("manifest row {}", row.name));
                RowOutcome::Skipped
            }
            Some(dir) => match row.records(&dir) {
                Ok(r) => RowOutcome::Ran(Box::new(Summary::of(&r))),
                Err(e) => RowOutcome::Error(e),
            },
        },
        threshold: row.threshold,
    }
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

/// The measured-versus-threshold table (Markdown), and whether every row passed.
pub fn table(results: &[RowResult]) -> (String, bool) {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "| row | kind | epochs | availability % | H 50 % m | H 95 % m | V 50 % m | V 95 % m | TTFF 95 % s | velocity RMS m/s |"
    );
    let _ = writeln!(s, "|---|---|---|---|---|---|---|---|---|---|");
    let mut all_ok = true;
    for r in results {
        match &r.outcome {
            RowOutcome::Skipped => {
                let _ = writeln!(
                    s,
                    "| {} | {} | skipped: no data folder | | | | | | | |",
                    r.name, r.kind
                );
            }
            RowOutcome::Error(e) => {
                all_ok = false;
                let _ = writeln!(
                    s,
                    "| {} | {} | **ERROR** {e} | | | | | | | |",
                    r.name, r.kind
                );
            }
            RowOutcome::Ran(m) => {
                let t = &r.threshold;
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
                all_ok &= cells.iter().all(|c| c.1);
                let _ = writeln!(
                    s,
                    "| {} | {} | {} | {} |",
                    r.name,
                    r.kind,
                    m.epochs,
                    cells
                        .iter()
                        .map(|c| c.0.as_str())
                        .collect::<Vec<_>>()
                        .join(" | ")
                );
            }
        }
    }
    (s, all_ok)
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
