#!/usr/bin/env python3
"""Hand mutations of the physics, each applied to a temporary copy of the working tree, with
the whole workspace test suite run WITHOUT the recorded data: every mutation must be caught
by at least one test that does not need the data folder.

Usage: python3 tools/mutations/run.py [--only NAME] [--markdown FILE]

Copies the tracked and untracked (not ignored) files to a temporary folder, builds in
target/mutants (kept between runs, so dependencies are not rebuilt), runs
`cargo test --release --workspace --no-fail-fast` with TRACKFIX_DATA pointing nowhere and
TRACKFIX_REQUIRE_DATA unset, and prints a Markdown table: mutation, file, caught or not,
and the failing tests. Python standard library only. Not part of CI (about 2 minutes per
mutation on two cores).
"""
import argparse
import os
import re
import shutil
import subprocess
import sys
import tempfile

ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), "..", ".."))

# (name, file, exact text, replacement). Each text must occur exactly once.
MUTATIONS = [
    ("relativity sign", "engine/src/nav/ephemeris.rs",
     "let relativity_s = c.f_rel * self.e", "let relativity_s = -c.f_rel * self.e"),
    ("F sign (GPS constant)", "engine/src/sat.rs",
     "f_rel: -4.442_807_633e-10,", "f_rel: 4.442_807_633e-10,"),
    ("TGD sign inside group_delay_s", "engine/src/nav/ephemeris.rs",
     "self.tgd_s * signal.iono_scale_from_l1()", "-self.tgd_s * signal.iono_scale_from_l1()"),
    ("TGD sign where the clock takes it", "engine/src/engine.rs",
     "state.clock_s - held.eph.group_delay_s(obs.signal)",
     "state.clock_s + held.eph.group_delay_s(obs.signal)"),
    ("Sagnac sign", "engine/src/snapshot/wls.rs",
     "let theta = omega_e * norm(sub(sat, rx)) / SPEED_OF_LIGHT;",
     "let theta = -omega_e * norm(sub(sat, rx)) / SPEED_OF_LIGHT;"),
    ("reception time +1 s", "engine/src/engine.rs",
     "self.screen(obs, earlier, epoch.time,", "self.screen(obs, earlier, epoch.time.add_seconds(1.0),"),
    ("reception time −1 s", "engine/src/engine.rs",
     "self.screen(obs, earlier, epoch.time,", "self.screen(obs, earlier, epoch.time.add_seconds(-1.0),"),
    ("RINEX epoch +1 s", "host-tests/src/rinex/mod.rs",
     "trackfix_engine::GnssTime::from_utc(utc, 0).ok()",
     "trackfix_engine::GnssTime::from_utc(utc, 0).ok().map(|t| t.add_seconds(1.0))"),
    ("RINEX epoch −1 s", "host-tests/src/rinex/mod.rs",
     "trackfix_engine::GnssTime::from_utc(utc, 0).ok()",
     "trackfix_engine::GnssTime::from_utc(utc, 0).ok().map(|t| t.add_seconds(-1.0))"),
    ("navigation week +1", "host-tests/src/rinex/nav.rs",
     "let week = week as u32;", "let week = week as u32 + 1;"),
    ("navigation week −1", "host-tests/src/rinex/nav.rs",
     "let week = week as u32;", "let week = week as u32 - 1;"),
    ("BeiDou week offset", "engine/src/time.rs",
     "pub const BDT_WEEK_OFFSET: u32 = 1356;", "pub const BDT_WEEK_OFFSET: u32 = 1357;"),
    ("BeiDou GEO tilt sign", "engine/src/nav/ephemeris.rs",
     "let (sx, cx) = (-0.087_155_742_747_658_17,", "let (sx, cx) = (0.087_155_742_747_658_17,"),
    ("GPS−UTC in exports", "host-tests/src/export/mod.rs",
     "pub const GPS_MINUS_UTC_S: i32 = 18;", "pub const GPS_MINUS_UTC_S: i32 = 19;"),
]


def copy_tree(dest):
    files = subprocess.run(
        ["git", "ls-files", "-co", "--exclude-standard", "-z"],
        cwd=ROOT, check=True, capture_output=True).stdout.decode().split("\0")
    for f in filter(None, files):
        src = os.path.join(ROOT, f)
        if not os.path.isfile(src):
            continue
        os.makedirs(os.path.dirname(os.path.join(dest, f)), exist_ok=True)
        # Fresh modification times: cargo then rebuilds whatever a previous run left in the
        # shared target folder from an older tree.
        shutil.copy(src, os.path.join(dest, f))


def run_tests(tree, target):
    env = dict(os.environ)
    env["CARGO_TARGET_DIR"] = target
    env["TRACKFIX_DATA"] = os.path.join(tree, "no-recorded-data-here")
    env.pop("TRACKFIX_REQUIRE_DATA", None)
    env.pop("TRACKFIX_SKIP_LOG", None)
    p = subprocess.run(
        ["cargo", "test", "--release", "--workspace", "--no-fail-fast"],
        cwd=tree, env=env, capture_output=True, text=True)
    out = p.stdout + p.stderr
    failed = sorted(set(re.findall(r"^test (\S+) \.\.\. FAILED", out, re.M)))
    if p.returncode != 0 and not failed and "error[" in out:
        failed = ["(does not compile)"]
    return p.returncode == 0, failed, out


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--only", help="run only the mutations whose name contains this text")
    ap.add_argument("--markdown", help="also write the table to this file")
    args = ap.parse_args()
    target = os.path.join(ROOT, "target", "mutants")
    rows = []
    with tempfile.TemporaryDirectory(prefix="trackfix-mutants-") as tmp:
        tree = os.path.join(tmp, "tree")
        copy_tree(tree)
        print(f"copied the working tree to {tree}; building in {target}", flush=True)
        ok, failed, out = run_tests(tree, target)
        if not ok:
            print(out[-4000:])
            sys.exit(f"the unmutated tree fails without the recorded data: {failed}")
        print("unmutated tree: all tests pass without the recorded data", flush=True)
        for name, rel, old, new in MUTATIONS:
            if args.only and args.only not in name:
                continue
            path = os.path.join(tree, rel)
            original = open(path, encoding="utf-8").read()
            if original.count(old) != 1:
                sys.exit(f"{name}: the text to mutate occurs {original.count(old)} times in {rel}")
            open(path, "w", encoding="utf-8").write(original.replace(old, new))
            try:
                ok, failed, _ = run_tests(tree, target)
            finally:
                open(path, "w", encoding="utf-8").write(original)
            caught = not ok
            shown = ", ".join(f"`{t}`" for t in failed[:4]) + (" …" if len(failed) > 4 else "")
            rows.append(f"| {name} | `{rel}` | {'caught' if caught else '**NOT CAUGHT**'} | {len(failed)} | {shown} |")
            print(rows[-1], flush=True)
    table = "| mutation | file | without the data | failing tests | some of them |\n|---|---|---|---|---|\n" + "\n".join(rows) + "\n"
    print("\n" + table)
    if args.markdown:
        open(args.markdown, "w", encoding="utf-8").write(table)
    if any("NOT CAUGHT" in r for r in rows):
        sys.exit(1)


if __name__ == "__main__":
    main()
