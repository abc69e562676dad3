//! Reader tests on small hand-written snippets laid out by the RINEX 2.11 and 3.05 format
//! descriptions (IGS/RTCM), including malformed input.

use super::*;
use std::io::Cursor;

fn hdr(label: &str, body: &str) -> String {
    format!("{body:<60}{label}\n")
}

fn v3_obs(body: &str) -> String {
    let mut s = hdr(
        "RINEX VERSION / TYPE",
        "     3.05           OBSERVATION DATA    M",
    );
    s += &hdr("MARKER NAME", "TESTMARK");
    s += &hdr(
        "APPROX POSITION XYZ",
        "  3582105.2910   532589.7313  5232754.8054",
    );
    s += &hdr(
        "ANTENNA: DELTA H/E/N",
        "        0.2160        0.0000        0.0000",
    );
    s += &hdr("SYS / # / OBS TYPES", "G    3 C1C D1C S1C");
    s += &hdr("END OF HEADER", "");
    s + body
}

#[test]
fn reads_a_v3_epoch() {
    let body = "> 2020 06 25 00 00 00.0000000  0  2\n\
G01  21000000.123 5      -100.500 5        45.250  \n\
G02  22000000.000 6                        40.000  \n";
    let mut r = ObsReader::new(Cursor::new(v3_obs(body)), Path::new("t.rnx")).unwrap();
    assert_eq!(r.header.marker, "TESTMARK");
    assert_eq!(r.header.antenna_delta_hen[0], 0.216);
    let e = r.next().unwrap().unwrap();
    assert_eq!(e.sats.len(), 2);
    assert_eq!(e.value(&r.header, &e.sats[0], "C1C"), Some(21_000_000.123));
    assert_eq!(e.value(&r.header, &e.sats[0], "S1C"), Some(45.25));
    assert_eq!(e.value(&r.header, &e.sats[1], "D1C"), None);
    assert_eq!(e.time.week(), 2111);
    assert_eq!(e.time.tow_s(), 345_600.0);
    assert!(r.next().is_none());
}

#[test]
fn malformed_value_names_file_and_line() {
    let body = "> 2020 06 25 00 00 00.0000000  0  1\nG01  21000x00.123 5\n";
    let mut r = ObsReader::new(Cursor::new(v3_obs(body)), Path::new("bad.rnx")).unwrap();
    let e = r.next().unwrap().unwrap_err();
    assert_eq!(e.line, 8);
    assert!(e.to_string().starts_with("bad.rnx:8:"), "{e}");
    assert!(r.next().is_none(), "reader stops after an error");
}

#[test]
fn truncated_epoch_is_an_error() {
    let body = "> 2020 06 25 00 00 00.0000000  0  2\nG01  21000000.123 5\n";
    let mut r = ObsReader::new(Cursor::new(v3_obs(body)), Path::new("cut.rnx")).unwrap();
    let e = r.next().unwrap().unwrap_err();
    assert!(e.what.contains("ends inside"), "{e}");
}

#[test]
fn unknown_version_and_missing_header_fields() {
    let s = hdr(
        "RINEX VERSION / TYPE",
        "     9.00           OBSERVATION DATA    M",
    );
    let e = ObsReader::new(Cursor::new(s), Path::new("v9.rnx"))
        .err()
        .unwrap();
    assert!(e.what.contains("unsupported RINEX version"), "{e}");
    let mut s = hdr(
        "RINEX VERSION / TYPE",
        "     3.05           OBSERVATION DATA    M",
    );
    s += &hdr("END OF HEADER", "");
    let e = ObsReader::new(Cursor::new(s), Path::new("notypes.rnx"))
        .err()
        .unwrap();
    assert!(e.what.contains("OBS TYPES"), "{e}");
    let e = ObsReader::new(Cursor::new("garbage\n"), Path::new("g.rnx"))
        .err()
        .unwrap();
    assert_eq!(e.line, 1);
}

#[test]
fn reads_a_v2_nav_record_with_d_exponents() {
    let mut s = hdr(
        "RINEX VERSION / TYPE",
        "     2.11           N: GPS NAV DATA",
    );
    s += &hdr(
        "ION ALPHA",
        "    0.7451D-08 -0.1490D-07 -0.5960D-07  0.1192D-06",
    );
    s += &hdr(
        "ION BETA",
        "    0.9011D+05 -0.6554D+05 -0.1311D+06  0.4588D+06",
    );
    s += &hdr("END OF HEADER", "");
    s += " 1 21  1  1  2  0  0.0 7.874774746600D-04-5.911715561520D-12 0.000000000000D+00
    5.200000000000D+01-7.362500000000D+01 4.318037039040D-09 2.893520298160D-02
   -3.784894943240D-06 1.022444642150D-02 1.076608896260D-06 5.153693731310D+03
    4.392000000000D+05-2.048909664150D-08-8.087355908090D-01 1.639127731320D-07
    9.827409334590D-01 3.673750000000D+02 8.219747770630D-01-8.439637433360D-09
   -3.007268045700D-10 1.000000000000D+00 2.138000000000D+03 0.000000000000D+00
    0.000000000000D+00 0.000000000000D+00 5.122274160390D-09 5.200000000000D+01
    4.329780000000D+05
";
    let f = NavFile::parse(Cursor::new(s), Path::new("n.21n")).unwrap();
    assert_eq!(f.iono.unwrap().alpha[0], 0.7451e-8);
    let r = &f.records[0];
    assert_eq!(r.eph.sat.prn, 1);
    assert_eq!(r.eph.week, 2138);
    assert_eq!(r.eph.toe_s, 439_200.0);
    assert_eq!(r.eph.sqrt_a, 5.153693731310e3);
    assert_eq!(r.eph.iode, 52);
    assert_eq!(r.eph.iodc, 52);
    assert_eq!(r.eph.validate(), Ok(()));
    assert_eq!(r.transmitted.tow_s(), 432_978.0);
}

#[test]
fn short_nav_record_names_its_line() {
    let mut s = hdr(
        "RINEX VERSION / TYPE",
        "     3.05           NAVIGATION DATA     MIXED",
    );
    s += &hdr("END OF HEADER", "");
    s += "G01 2020 06 25 04 00 00 1.604342833161e-05 7.048583938740e-12 0.000000000000e+00\n     5.8e+01\n";
    let e = NavFile::parse(Cursor::new(s), Path::new("short.rnx")).unwrap_err();
    assert_eq!(e.line, 3);
    assert!(e.what.contains("8 expected"), "{e}");
}

#[test]
fn reads_v4_klobuchar_record_and_skips_other_messages() {
    let mut s = hdr(
        "RINEX VERSION / TYPE",
        "     4.00           NAVIGATION DATA     MIXED",
    );
    s += &hdr("END OF HEADER", "");
    s += "> STO E01 IFNV
    2022 06 08 09 59 57 GAGP               3.000000000000E+05 1.0E-09 0.0E+00
> ION G29 LNAV
    2022 06 08 09 59 48 1.024454832077E-08 2.235174179077E-08-5.960464477539E-08
    -1.192092895508E-07 9.625600000000E+04 1.310720000000E+05-6.553600000000E+04
    -5.898240000000E+05 0.000000000000E+00
";
    let f = NavFile::parse(Cursor::new(s), Path::new("v4.rnx")).unwrap();
    let k = f.iono.unwrap();
    assert_eq!(
        k.alpha,
        [
            1.024454832077e-8,
            2.235174179077e-8,
            -5.960464477539e-8,
            -1.192092895508e-7
        ]
    );
    assert_eq!(k.beta, [9.6256e4, 1.31072e5, -6.5536e4, -5.89824e5]);
    assert!(f.records.is_empty());
}

mod never_panics {
    use super::*;
    use proptest::prelude::*;

    const V3_NAV: &str =
        "     3.05           NAVIGATION DATA     MIXED               RINEX VERSION / TYPE
GPSA   4.6566e-09  1.4901e-08 -5.9605e-08 -1.1921E-07       IONOSPHERIC CORR
                                                            END OF HEADER
G01 2020 06 25 04 00 00 1.604342833161e-05 7.048583938740e-12 0.000000000000e+00
     5.800000000000e+01-3.968750000000e+01 4.304822170265e-09 6.342094507864e-01
    -2.177432179451e-06 1.000394229777e-02 1.937150955200e-06 5.153707128525e+03
     3.600000000000e+05-1.508742570877e-07 2.572838528869e+00 1.359730958939e-07
     9.806518601091e-01 3.539687500000e+02 7.941703015008e-01-8.384634967987e-09
    -5.714523747137e-11 1.000000000000e+00 2.111000000000e+03 0.000000000000e+00
     2.000000000000e+00 0.000000000000e+00 5.122274160385e-09 5.800000000000e+01
     3.561060000000e+05 4.000000000000e+00
";

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(400))]
        // Property: corrupting any bytes of a valid file (or cutting it anywhere) gives
        // records or a named error, never a panic.
        #[test]
        fn corrupted_files_give_errors_not_panics(
            flips in proptest::collection::vec((any::<prop::sample::Index>(), any::<u8>()), 0..8),
            cut in any::<prop::sample::Index>(),
        ) {
            for text in [V3_NAV.to_string(), v3_obs("> 2020 06 25 00 00 00.0000000  0  1\nG01  21000000.123 5      -100.500 5        45.250\n")] {
                let mut bytes = text.into_bytes();
                for (i, b) in &flips {
                    let k = i.index(bytes.len());
                    bytes[k] = *b;
                }
                bytes.truncate(cut.index(bytes.len() + 1));
                let _ = NavFile::parse(Cursor::new(bytes.clone()), Path::new("fuzz.rnx"));
                if let Ok(r) = ObsReader::new(Cursor::new(bytes), Path::new("fuzz.rnx")) {
                    for e in r {
                        if let Err(e) = e {
                            prop_assert!(e.to_string().starts_with("fuzz.rnx:"));
                        }
                    }
                }
            }
        }
    }
}
