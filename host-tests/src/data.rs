//! Where the recorded reference data lives, and its integrity check.
//!
//! Set `TRACKFIX_DATA` to the folder; the default is `../shared/data` beside the checkout.
//! The files are never copied into this repository.

use sha2::{Digest, Sha256};
use std::path::{Path, PathBuf};

/// The data folder, if present.
pub fn data_dir() -> Option<PathBuf> {
    let dir = std::env::var_os("TRACKFIX_DATA").map_or_else(
        || Path::new(env!("CARGO_MANIFEST_DIR")).join("../../shared/data"),
        PathBuf::from,
    );
    dir.is_dir().then_some(dir)
}

/// The variable that makes a missing data folder a failure instead of a skip.
/// `cargo xtask test` sets it (CI always has the data); any value but empty or `0` counts.
pub const REQUIRE_VAR: &str = "TRACKFIX_REQUIRE_DATA";

/// The variable naming a file to which every skip appends one line, so that the test
/// command can count the skips of all test binaries at the end.
pub const SKIP_LOG_VAR: &str = "TRACKFIX_SKIP_LOG";

/// True when a missing data folder must fail the test (see [`REQUIRE_VAR`]).
pub fn required() -> bool {
    std::env::var(REQUIRE_VAR).is_ok_and(|v| !v.is_empty() && v != "0")
}

/// Reports a test or row skipped for want of the data folder: written straight to the
/// process's standard error (the test harness captures only the `print!` macros, so this
/// reaches the terminal) and appended to the skip log when one is set.
pub fn report_skip(what: &str) {
    use std::io::Write;
    let line = format!(
        "SKIPPED {what}: recorded data folder not found (set TRACKFIX_DATA or place shared/data beside the checkout)\n"
    );
    let _ = std::io::stderr().write_all(line.as_bytes());
    if let Some(log) = std::env::var_os(SKIP_LOG_VAR) {
        if let Ok(mut f) = std::fs::OpenOptions::new()
            .create(true)
            .append(true)
            .open(log)
        {
            let _ = f.write_all(line.as_bytes());
        }
    }
}

/// The data folder for a test; `None` after a visible skip report when it is absent.
///
/// # Panics
/// When the folder is absent and [`REQUIRE_VAR`] is set: in CI a missing data folder fails.
pub fn data_dir_or_skip(test: &str) -> Option<PathBuf> {
    let d = data_dir();
    if d.is_none() {
        assert!(
            !required(),
            "{test}: recorded data folder not found and {REQUIRE_VAR} is set (set TRACKFIX_DATA or place shared/data beside the checkout)"
        );
        report_skip(test);
    }
    d
}

/// Checks `rel` (a path inside the data folder) against the folder's `SHA256SUMS`.
///
/// # Errors
/// A message when the file is missing, unlisted or its digest differs.
pub fn verify(dir: &Path, rel: &str) -> Result<(), String> {
    let sums =
        std::fs::read_to_string(dir.join("SHA256SUMS")).map_err(|e| format!("SHA256SUMS: {e}"))?;
    let want = sums
        .lines()
        .filter_map(|l| l.split_once(char::is_whitespace))
        .find(|(_, name)| name.trim().trim_start_matches('*').trim_start_matches("./") == rel)
        .map(|(h, _)| h.to_lowercase())
        .ok_or_else(|| format!("{rel} is not listed in SHA256SUMS"))?;
    let bytes = std::fs::read(dir.join(rel)).map_err(|e| format!("{rel}: {e}"))?;
    let got = format!("{:x}", Sha256::digest(&bytes));
    if got == want {
        Ok(())
    } else {
        Err(format!(
            "{rel}: SHA-256 {got} differs from SHA256SUMS {want}"
        ))
    }
}
