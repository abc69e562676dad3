//! Runs every manifest row and fails with the measured-versus-threshold table when a limit
//! is crossed; checks that docs/accuracy.md shows the table the code produces now.

use std::path::Path;
use trackfix_harness::manifest::{splice, Manifest, MANIFEST};

#[test]
fn every_row_within_its_threshold_and_docs_current() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let manifest = Manifest::read(&root.join(MANIFEST)).unwrap();
    let (text, ok, results) = manifest.run_tables();
    println!("{text}");
    assert!(ok, "a manifest row crossed its threshold:\n{text}");
    let page = std::fs::read_to_string(root.join("docs/accuracy.md")).unwrap();
    let want = splice(&page, &text).expect("docs/accuracy.md has the manifest-table markers");
    if results
        .iter()
        .all(|r| !matches!(r.outcome, trackfix_harness::manifest::RowOutcome::Skipped))
    {
        assert!(
            page == want,
            "docs/accuracy.md is out of date: run `cargo run -p trackfix-tools -- manifest --write-docs`"
        );
    }
}
