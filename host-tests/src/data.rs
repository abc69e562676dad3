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

/// The data folder, or a loud skip message on stderr and `None` (for tests).
pub fn data_dir_or_skip(test: &str) -> Option<PathBuf> {
    let d = data_dir();
    if d.is_none() {
        eprintln!(
            "SKIPPED {test}: recorded data folder not found (set TRACKFIX_DATA or place shared/data beside the checkout)"
        );
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
