//! The firmware example under QEMU: frames made from recorded and synthetic data, the run
//! compared with a host run of the same frames, and the memory and instruction budgets.

use object::{Object, ObjectSection};
use std::collections::BTreeMap;
use std::fmt::Write as _;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};

/// Budgets for 12 satellites, full pipeline (issue: firmware example).
pub const FLASH_BUDGET: u64 = 64 * 1024;
/// RAM budget including stack.
pub const RAM_BUDGET: u64 = 16 * 1024;
/// Instructions per warm epoch with 12 satellites.
pub const INSTR_BUDGET: u64 = 1_500_000;

/// What one firmware run measured.
#[derive(Debug, Default)]
pub struct Measured {
    pub n: usize,
    pub flash_code: u64,
    pub frames_bytes: u64,
    pub static_ram: u64,
    pub stack: u64,
    /// Per observation count: (satellite-state stage, full epoch) instruction counts.
    pub costs: BTreeMap<usize, Vec<(u64, u64)>>,
    pub lines: Vec<String>,
}

fn run(cmd: &mut Command) -> Result<String, String> {
    let out = cmd
        .stderr(Stdio::inherit())
        .output()
        .map_err(|e| format!("{cmd:?}: {e}"))?;
    if !out.status.success() {
        return Err(format!("{cmd:?} failed: {}", out.status));
    }
    Ok(String::from_utf8_lossy(&out.stdout).into_owned())
}

/// qemu-system-arm and defmt-print, installed when missing and allowed.
pub fn ensure_tools() -> Result<(), String> {
    if Command::new("qemu-system-arm")
        .arg("--version")
        .output()
        .is_err()
    {
        let root = Command::new("id")
            .arg("-u")
            .output()
            .map(|o| o.stdout == b"0\n")
            .unwrap_or(false);
        if !root {
            return Err("qemu-system-arm is missing: install it with `apt-get install qemu-system-arm` (as root)".into());
        }
        println!("xtask: installing qemu-system-arm (apt-get)");
        let env = [("DEBIAN_FRONTEND", "noninteractive")];
        run(Command::new("apt-get").arg("update").arg("-qq").envs(env))?;
        run(Command::new("apt-get")
            .args([
                "install",
                "-y",
                "-qq",
                "--no-install-recommends",
                "qemu-system-arm",
            ])
            .envs(env))?;
    }
    if Command::new("defmt-print")
        .arg("--version")
        .output()
        .is_err()
    {
        println!("xtask: installing defmt-print (cargo install, about a minute)");
        run(Command::new("cargo").args([
            "install",
            "--locked",
            "defmt-print",
            "--version",
            "1.2.0",
        ]))?;
    }
    Ok(())
}

/// Writes the frame stream for an `n`-observation build into target/fw.
pub fn make_frames(root: &Path, n: usize) -> Result<PathBuf, String> {
    let dir = root.join("target/fw");
    std::fs::create_dir_all(&dir).map_err(|e| e.to_string())?;
    let tool = root.join("target/release/trackfix");
    let mut parts = Vec::new();
    let data = crate::data_dir(root);
    let esbc = data.join("esbc_2020177");
    if esbc.is_dir() {
        let real = dir.join(format!("real{n}.bin"));
        run(Command::new(&tool)
            .args([
                "frames",
                "rinex",
                "--n",
                &n.to_string(),
                "--epochs",
                "20",
                "--out",
            ])
            .arg(&real)
            .arg("--obs")
            .arg(esbc.join("ESBC00DNK_R_20201770000_01D_30S_MO_first2h.rnx"))
            .arg("--nav")
            .arg(esbc.join("ESBC00DNK_R_20201770000_01D_MN.rnx")))?;
        parts.push(real);
    } else {
        crate::note_skip("recorded epochs for the firmware (synthetic only)");
    }
    let counts = if n >= 24 { "8,12,24" } else { "8,12" };
    let synth = dir.join(format!("synth{n}.bin"));
    run(Command::new(&tool)
        .args([
            "frames",
            "synthetic",
            "--sats",
            counts,
            "--each",
            "4",
            "--out",
        ])
        .arg(&synth))?;
    parts.push(synth);
    let mut all = Vec::new();
    for p in &parts {
        all.extend(std::fs::read(p).map_err(|e| e.to_string())?);
    }
    let file = dir.join(format!("fw{n}.bin"));
    std::fs::write(&file, all).map_err(|e| e.to_string())?;
    Ok(file)
}

fn elf_sizes(elf: &Path) -> Result<(u64, u64), String> {
    let data = std::fs::read(elf).map_err(|e| e.to_string())?;
    let obj = object::File::parse(&*data).map_err(|e| e.to_string())?;
    let size = |name: &str| obj.section_by_name(name).map_or(0, |s| s.size());
    let flash = size(".vector_table") + size(".text") + size(".rodata") + size(".data");
    let ram = size(".data") + size(".bss") + size(".uninit");
    Ok((flash, ram))
}

/// Builds the firmware for `n` observations with `frames`, runs it under QEMU and parses
/// its output.
pub fn run_firmware(root: &Path, n: usize, frames: &Path) -> Result<Measured, String> {
    let fw = root.join("firmware-example");
    let mut build = Command::new("cargo");
    build
        .current_dir(&fw)
        .args(["build", "--release"])
        .env("TRACKFIX_FRAMES", frames);
    if n == 24 {
        build.args(["--features", "n24"]);
    }
    run(&mut build)?;
    let elf = fw.join("target/thumbv7em-none-eabihf/release/trackfix-firmware-example");
    let qemu = Command::new("timeout")
        .args([
            "600",
            "qemu-system-arm",
            "-machine",
            "mps2-an386",
            "-cpu",
            "cortex-m4",
            "-nographic",
            "-icount",
            "shift=0",
        ])
        .args(["-semihosting-config", "enable=on,target=native", "-kernel"])
        .arg(&elf)
        .stdout(Stdio::piped())
        .stderr(Stdio::inherit())
        .spawn()
        .map_err(|e| format!("qemu-system-arm: {e}"))?;
    let out = Command::new("defmt-print")
        .arg("-e")
        .arg(&elf)
        .stdin(qemu.stdout.ok_or("no QEMU output")?)
        .output()
        .map_err(|e| format!("defmt-print: {e}"))?;
    let text = String::from_utf8_lossy(&out.stdout).into_owned();
    let (flash, ram) = elf_sizes(&elf)?;
    // The replayed frames are embedded verbatim in .rodata: not part of the engine's cost.
    let frames_bytes = std::fs::metadata(frames).map(|m| m.len()).unwrap_or(0);
    let mut m = Measured {
        n,
        flash_code: flash.saturating_sub(frames_bytes),
        frames_bytes,
        static_ram: ram,
        ..Measured::default()
    };
    let mut done = false;
    for line in text.lines() {
        let w: Vec<&str> = line.split_whitespace().collect();
        match w.first().copied() {
            Some("FIX" | "NOFIX" | "INTEGRITY") => m.lines.push(w.join(" ")),
            Some("COST") if w.len() == 5 => {
                let p = |i: usize| w[i].parse::<u64>().unwrap_or(0);
                m.costs.entry(p(2) as usize).or_default().push((p(3), p(4)));
            }
            Some("STACK") if w.len() >= 2 => m.stack = w[1].parse().unwrap_or(0),
            Some("DONE") => done = true,
            _ => {}
        }
    }
    if !done {
        return Err(format!("the firmware did not finish; its output:\n{text}"));
    }
    Ok(m)
}

/// The host run of the same frames.
pub fn host_lines(root: &Path, n: usize, frames: &Path) -> Result<Vec<String>, String> {
    let out = run(Command::new(root.join("target/release/trackfix"))
        .args(["frames", "run", "--n", &n.to_string()])
        .arg(frames))?;
    Ok(out
        .lines()
        .map(|l| l.split_whitespace().collect::<Vec<_>>().join(" "))
        .collect())
}

/// Compares target and host lines: identical, or every coordinate and protection level
/// within 1 mm with the same integrity states.
pub fn compare(target: &[String], host: &[String]) -> Result<String, String> {
    if target.len() != host.len() {
        return Err(format!(
            "target printed {} results, host {}",
            target.len(),
            host.len()
        ));
    }
    let epochs = target
        .iter()
        .filter(|l| !l.starts_with("INTEGRITY"))
        .count();
    if target == host {
        return Ok(format!(
            "{epochs} epochs, every coordinate, integrity state and protection level bit-identical on target and host"
        ));
    }
    let mut worst: f64 = 0.0;
    for (t, h) in target.iter().zip(host) {
        let (tw, hw): (Vec<&str>, Vec<&str>) = (t.split(' ').collect(), h.split(' ').collect());
        if t.starts_with("INTEGRITY") {
            // Same state; protection levels (f32 bits) within 1 mm.
            let level = |w: &[&str]| {
                f64::from(f32::from_bits(
                    w.get(3).and_then(|x| x.parse().ok()).unwrap_or(0),
                ))
            };
            if tw.get(..3) != hw.get(..3) {
                return Err(format!("target {t:?} differs from host {h:?}"));
            }
            worst = worst.max((level(&tw) - level(&hw)).abs());
            continue;
        }
        if tw.len() != hw.len() || tw.first() != hw.first() || tw.get(..4) != hw.get(..4) {
            return Err(format!("target {t:?} differs from host {h:?}"));
        }
        for k in 4..tw.len() {
            let a = f64::from_bits(tw[k].parse().unwrap_or(0));
            let b = f64::from_bits(hw[k].parse().unwrap_or(0));
            worst = worst.max((a - b).abs());
        }
    }
    if worst <= 1e-3 {
        Ok(format!(
            "{epochs} epochs within {worst:.1e} m of the host (not bit-identical)"
        ))
    } else {
        Err(format!("target and host differ by up to {worst} m"))
    }
}

fn median(v: &mut [u64]) -> u64 {
    v.sort_unstable();
    v.get(v.len() / 2).copied().unwrap_or(0)
}

/// The budget table (Markdown) and whether the 12-satellite budgets hold.
pub fn table(runs: &[Measured]) -> (String, bool) {
    let mut s = String::new();
    let mut ok = true;
    let _ = writeln!(
        s,
        "| build | flash (code + constants) | replay data (not counted) | static RAM | stack high-water | RAM total |"
    );
    let _ = writeln!(s, "|---|---|---|---|---|---|");
    for m in runs {
        let ram = m.static_ram + m.stack;
        let (f_ok, r_ok) = (m.flash_code <= FLASH_BUDGET, ram <= RAM_BUDGET);
        let mark = |b: bool, gated: bool| {
            if !gated {
                ""
            } else if b {
                " ✓"
            } else {
                " **over**"
            }
        };
        if m.n == 12 {
            ok &= f_ok && r_ok;
        }
        let _ = writeln!(
            s,
            "| N = {} | {} B{} | {} B | {} B | {} B | {} B{} |",
            m.n,
            m.flash_code,
            mark(f_ok, m.n == 12),
            m.frames_bytes,
            m.static_ram,
            m.stack,
            ram,
            mark(r_ok, m.n == 12)
        );
    }
    let _ = writeln!(s);
    let _ = writeln!(
        s,
        "| build | satellites | epochs | satellite states (median) | corrections, filter or least squares, DOP (median of the rest) | full epoch (median) | full epoch (max) |"
    );
    let _ = writeln!(s, "|---|---|---|---|---|---|---|");
    for m in runs {
        for (sats, v) in &m.costs {
            let mut states: Vec<u64> = v.iter().map(|c| c.0).collect();
            let mut rest: Vec<u64> = v.iter().map(|c| c.1.saturating_sub(c.0)).collect();
            let mut full: Vec<u64> = v.iter().map(|c| c.1).collect();
            let max = full.iter().copied().max().unwrap_or(0);
            let med = median(&mut full);
            let gated = m.n == 12 && *sats == 12;
            let mark = if !gated {
                ""
            } else if med <= INSTR_BUDGET {
                " ✓"
            } else {
                " **over**"
            };
            if gated {
                ok &= med <= INSTR_BUDGET;
            }
            let _ = writeln!(
                s,
                "| N = {} | {sats} | {} | {} | {} | {}{mark} | {max} |",
                m.n,
                v.len(),
                median(&mut states),
                median(&mut rest),
                med
            );
        }
    }
    let _ = writeln!(
        s,
        "\nBudgets (12 satellites): flash ≤ {FLASH_BUDGET} B, RAM including stack ≤ {RAM_BUDGET} B, \
         median instructions per epoch ≤ {INSTR_BUDGET}."
    );
    (s, ok)
}

/// Markers of the generated block in docs/firmware.md.
pub const BEGIN: &str = "<!-- firmware-budget:begin (generated by `cargo xtask test`; refresh with `cargo xtask firmware --write-docs`) -->";
/// End marker.
pub const END: &str = "<!-- firmware-budget:end -->";

/// `page` with the generated block replaced by `table`.
pub fn splice(page: &str, table: &str) -> Option<String> {
    let a = page.find(BEGIN)?;
    let b = page.find(END)?;
    (a < b).then(|| format!("{}{BEGIN}\n{table}{}", &page[..a], &page[b..]))
}

/// `12345` as `12,345`.
pub fn thousands(v: u64) -> String {
    let d = v.to_string();
    let mut out = String::new();
    for (i, c) in d.chars().enumerate() {
        if i > 0 && (d.len() - i).is_multiple_of(3) {
            out.push(',');
        }
        out.push(c);
    }
    out
}

/// The figures the README quotes for the N = 12 build: flash, RAM total and the median
/// 12-satellite epoch in millions of instructions.
pub fn readme_figures(runs: &[Measured]) -> Vec<String> {
    let Some(m) = runs.iter().find(|m| m.n == 12) else {
        return Vec::new();
    };
    let mut full: Vec<u64> = m
        .costs
        .get(&12)
        .map(|v| v.iter().map(|c| c.1).collect())
        .unwrap_or_default();
    let med = median(&mut full);
    vec![
        format!("{} B", thousands(m.flash_code)),
        format!("{} B", thousands(m.static_ram + m.stack)),
        format!("{:.2} M", med as f64 / 1e6),
    ]
}

/// Whether two generated tables agree: the same text, except that whole numbers may differ
/// by up to 16 (bytes). Static RAM moves by a few bytes with the checkout path: the crate
/// hashes in symbol names change the link order and with it the padding between small
/// statics. Flash and instruction counts do not move (instruction counts step by 40).
pub fn tables_agree(a: &str, b: &str) -> bool {
    let (ta, tb): (Vec<&str>, Vec<&str>) = (
        a.split_whitespace().collect(),
        b.split_whitespace().collect(),
    );
    ta.len() == tb.len() && ta.iter().zip(&tb).all(|(x, y)| {
        x == y
            || matches!((x.parse::<i64>(), y.parse::<i64>()), (Ok(p), Ok(q)) if (p - q).abs() <= 16)
    })
}

/// Whether `text` quotes `figure` ("15,248 B"-style), allowing the same ±16 B for RAM.
pub fn quotes(text: &str, figure: &str, tolerance: i64) -> bool {
    let want: Option<i64> = figure.trim_end_matches(" B").replace(',', "").parse().ok();
    match want {
        Some(w) if figure.ends_with(" B") => (-tolerance..=tolerance)
            .any(|d| text.contains(&format!("{} B", thousands((w + d).max(0) as u64)))),
        _ => text.contains(figure),
    }
}
