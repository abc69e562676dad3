//! Puts memory.x where the linker finds it, and the frame stream the UART replays into
//! OUT_DIR: the file named by TRACKFIX_FRAMES (written by `cargo xtask test` from recorded and
//! synthetic data), or an empty stream.
use std::{env, fs, path::PathBuf};

fn main() {
    let out = PathBuf::from(env::var_os("OUT_DIR").expect("cargo sets OUT_DIR"));
    fs::copy("memory.x", out.join("memory.x")).expect("memory.x is readable");
    println!("cargo:rustc-link-search={}", out.display());
    println!("cargo:rerun-if-changed=memory.x");
    println!("cargo:rerun-if-env-changed=TRACKFIX_FRAMES");
    let frames = match env::var_os("TRACKFIX_FRAMES") {
        Some(p) => {
            println!("cargo:rerun-if-changed={}", PathBuf::from(&p).display());
            fs::read(&p).expect("TRACKFIX_FRAMES names a readable file")
        }
        None => Vec::new(),
    };
    fs::write(out.join("frames.bin"), frames).expect("OUT_DIR is writable");
}
