//! Every recorded file in shared/data reads from end to end: RINEX 2.11, 3.03, 3.05 and 4.00
//! observation and navigation files, and the SP3 product. Counts come from the data
//! README (epochs per file) where it states them.

use trackfix_harness::data::{data_dir_or_skip, verify};
use trackfix_harness::rinex::{NavFile, ObsReader};
use trackfix_harness::sp3;

#[test]
fn every_observation_file_reads() {
    let Some(dir) = data_dir_or_skip("every_observation_file_reads") else {
        return;
    };
    // (file, epochs stated by shared/data/README.md, or None where it gives none)
    let files = [
        (
            "esbc_2020177/ESBC00DNK_R_20201770000_01D_30S_MO_first2h.rnx",
            Some(240),
        ),
        (
            "nya1_2024124/NYA100NOR_S_20241240000_01D_30S_MO_first2h.rnx",
            Some(240),
        ),
        (
            "kms3_2022159/KMS300DNK_R_20221591000_01H_30S_MO.rnx",
            Some(19),
        ),
        ("rinex2_format_only/eijs0010.21o", None),
        ("lowcost_no_truth_2024092/GEOP092I.24o", None),
    ];
    for (f, want) in files {
        verify(&dir, f).unwrap();
        let reader = ObsReader::open(&dir.join(f)).unwrap();
        let mut n = 0;
        let mut last = None;
        for e in reader {
            let e = e.unwrap_or_else(|e| panic!("{e}"));
            assert!(last.is_none_or(|t| e.time > t), "{f}: epochs out of order");
            last = Some(e.time);
            n += 1;
        }
        println!("{f}: {n} epochs");
        if let Some(w) = want {
            assert_eq!(n, w, "{f}");
        }
        assert!(n > 0);
    }
}

#[test]
fn every_navigation_file_reads() {
    let Some(dir) = data_dir_or_skip("every_navigation_file_reads") else {
        return;
    };
    let files = [
        "esbc_2020177/ESBC00DNK_R_20201770000_01D_MN.rnx",
        "nya1_2024124/NYA100NOR_S_20241240000_01D_GN.rnx",
        "nya1_2024124/NYA100NOR_S_20241240000_01D_EN.rnx",
        "nya1_2024124/NYA100NOR_S_20241240000_01D_CN.rnx",
        "kms3_2022159/KMS300DNK_R_20221591000_01H_MN.rnx",
        "rinex2_format_only/cbw10010.21n",
        "lowcost_no_truth_2024092/HERT00GBR_R_20240920000_01D_GN.rnx",
        "lowcost_no_truth_2024092/BRUX00BEL_R_20240920000_01D_EN.rnx",
    ];
    for f in files {
        verify(&dir, f).unwrap();
        let nav = NavFile::read(&dir.join(f)).unwrap_or_else(|e| panic!("{e}"));
        let valid = nav
            .records
            .iter()
            .filter(|r| r.eph.validate().is_ok())
            .count();
        println!("{f}: {} records, {valid} valid", nav.records.len());
        assert!(!nav.records.is_empty(), "{f}");
        // Every record a station archive publishes should pass validation.
        assert_eq!(valid, nav.records.len(), "{f}");
    }
}

#[test]
fn precise_orbit_file_reads() {
    let Some(dir) = data_dir_or_skip("precise_orbit_file_reads") else {
        return;
    };
    let f = "esbc_2020177/GRG0MGXFIN_20201770000_01D_15M_ORB.SP3";
    let p = sp3::read(&dir.join(f)).unwrap();
    // 96 epochs of 15 min in a day.
    let epochs: std::collections::BTreeSet<_> = p.iter().map(|x| x.time).collect();
    assert_eq!(epochs.len(), 96);
}

// A real observation file cut in the middle of an epoch: the reader names the file and the
// line where it ran out.
#[test]
fn truncated_real_file_names_file_and_line() {
    let Some(dir) = data_dir_or_skip("truncated_real_file_names_file_and_line") else {
        return;
    };
    let f = "esbc_2020177/ESBC00DNK_R_20201770000_01D_30S_MO_first2h.rnx";
    let text = std::fs::read_to_string(dir.join(f)).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    let cut = lines.len() / 2;
    // Cut inside an epoch: after the epoch line plus one satellite line.
    let epoch_line = (0..cut).rev().find(|&i| lines[i].starts_with('>')).unwrap();
    let truncated = lines[..epoch_line + 2].join("\n");
    let tmp = std::env::temp_dir().join("trackfix-truncated.rnx");
    std::fs::write(&tmp, truncated).unwrap();
    let errors: Vec<_> = ObsReader::open(&tmp)
        .unwrap()
        .filter_map(Result::err)
        .collect();
    assert_eq!(errors.len(), 1);
    let e = &errors[0];
    assert!(e.to_string().contains("trackfix-truncated.rnx"), "{e}");
    assert_eq!(e.line, epoch_line + 2);
    assert!(e.what.contains("ends inside an epoch"), "{e}");
}
