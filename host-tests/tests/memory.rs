//! Fixed memory of the engine and its per-epoch buffers, printed and kept equal to the
//! table in the README (so the published figures are always the current ones).

use std::mem::size_of;
use trackfix_engine::{Engine, Epoch, Solution};

fn row<const N: usize>() -> String {
    format!(
        "| {N} | {} | {} | {} |",
        size_of::<Engine<N, 32>>(),
        size_of::<Epoch<N>>(),
        size_of::<Solution<N>>()
    )
}

#[test]
fn size_table_matches_readme() {
    let table = [row::<12>(), row::<24>(), row::<32>()].join("\n");
    println!("| N | Engine<N, 32> bytes | Epoch<N> bytes | Solution<N> bytes |\n|---|---|---|---|\n{table}");
    let readme =
        std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/../README.md")).unwrap();
    assert!(
        readme.contains(&table),
        "README.md's memory table is out of date; it should read:\n{table}"
    );
}
