extern crate std;
use super::*;
use std::string::ToString;

// Every error prints a sentence naming what was wrong (not the Debug name).
#[test]
fn errors_name_what_was_wrong() {
    assert!(TimeError::TimeOfWeekOutOfRange
        .to_string()
        .contains("604800"));
    assert!(EphemerisError::Eccentricity
        .to_string()
        .contains("eccentricity"));
    assert!(WireError::Oversize { declared: 900 }
        .to_string()
        .contains("900"));
    let e = NoFixReason::TooFewSatellites {
        usable: 3,
        needed: 4,
    };
    assert!(e.to_string().starts_with("3 usable satellites, 4 needed"));
    let boxed: &dyn core::error::Error = &WireError::BadCrc;
    assert_eq!(boxed.to_string(), "frame CRC mismatch");
}
