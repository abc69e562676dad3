//! The engine configuration as a file: the same struct the engine takes, read from TOML
//! (serde), with defaults for what is left out, and refusals that name the key.

use trackfix_engine::config::{IonoModel, Problem};
use trackfix_engine::{Config, Engine, System};

#[test]
fn a_partial_file_keeps_the_other_defaults() {
    let c: Config = toml::from_str(
        "[measurements.systems]\nbeidou = false\n[corrections]\nionosphere = \"off\"\n[snapshot]\nelevation_mask_deg = 15.0\n",
    )
    .unwrap();
    assert!(c.uses(System::Gps) && c.uses(System::Galileo) && !c.uses(System::Beidou));
    assert_eq!(c.corrections.ionosphere, IonoModel::Off);
    assert_eq!(c.snapshot.elevation_mask_deg, 15.0);
    assert_eq!(
        c.snapshot.sigma_floor_m,
        Config::default().snapshot.sigma_floor_m
    );
    assert_eq!(c.validate(), Ok(()));
}

#[test]
fn the_defaults_round_trip_through_toml() {
    let text = toml::to_string(&Config::default()).unwrap();
    let back: Config = toml::from_str(&text).unwrap();
    assert_eq!(back, Config::default());
}

#[test]
fn an_unknown_key_is_refused_by_name_and_line() {
    let e = toml::from_str::<Config>("[snapshot]\nelevation_mask = 15.0\n").unwrap_err();
    let msg = e.to_string();
    assert!(msg.contains("elevation_mask"), "{msg}");
    assert!(msg.contains("line 2"), "{msg}");
}

#[test]
fn a_bad_value_is_refused_by_the_engine_by_field() {
    let c: Config = toml::from_str("[snapshot]\nelevation_mask_deg = 95.0\n").unwrap();
    let e = Engine::<12, 32>::new(c).err().unwrap();
    assert_eq!(e.field, "snapshot.elevation_mask_deg");
    assert!(matches!(e.problem, Problem::OutOfRange { .. }));
    assert_eq!(
        e.to_string(),
        "snapshot.elevation_mask_deg: 95 is outside 0…60"
    );
}

// An integrity probability outside (0, 1), or an integrity risk below what the engine can
// evaluate, read from a file: the engine refuses it naming the key and the range.
#[test]
fn a_bad_integrity_probability_is_refused_by_field() {
    for (text, field) in [
        ("[integrity]\nfalse_alarm = 1.5\n", "integrity.false_alarm"),
        ("[integrity]\nfalse_alarm = 0.0\n", "integrity.false_alarm"),
        (
            "[integrity]\nintegrity_risk = 1e-15\n",
            "integrity.integrity_risk",
        ),
    ] {
        let c: Config = toml::from_str(text).unwrap();
        let e = Engine::<12, 16>::new(c).unwrap_err();
        assert_eq!(e.field, field);
        assert!(matches!(e.problem, Problem::OutOfRange { .. }), "{e}");
        assert!(e.to_string().starts_with(field), "{e}");
    }
}
