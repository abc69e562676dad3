use super::*;

fn eph(prn: u8, toe_s: f64, iode: u16) -> BroadcastEphemeris {
    BroadcastEphemeris {
        sat: SatId::gps(prn),
        week: 2111,
        toe_s,
        toc_s: toe_s,
        sqrt_a: 5153.6,
        e: 0.01,
        iode,
        iodc: iode,
        ..Default::default()
    }
}

#[test]
fn replacement_rules() {
    let mut s: EphemerisStore<2> = EphemerisStore::new();
    assert_eq!(s.ingest(eph(1, 7200.0, 1)), Ok(Ingested::Added));
    assert_eq!(s.ingest(eph(1, 7200.0, 1)), Ok(Ingested::Unchanged));
    assert_eq!(s.ingest(eph(1, 0.0, 9)), Ok(Ingested::Unchanged));
    assert_eq!(s.ingest(eph(1, 7200.0, 2)), Ok(Ingested::Replaced));
    assert_eq!(s.ingest(eph(1, 14_400.0, 3)), Ok(Ingested::Replaced));
    assert_eq!(s.get(SatId::gps(1)).unwrap().eph.iode, 3);
    assert_eq!(s.ingest(eph(2, 7200.0, 1)), Ok(Ingested::Added));
    // Full: the oldest (PRN 2, toe 7200) goes for a newer record.
    assert_eq!(
        s.ingest(eph(3, 21_600.0, 1)),
        Ok(Ingested::Evicted(SatId::gps(2)))
    );
    // Full and the newcomer is the oldest: handed back.
    let old = eph(4, 0.0, 1);
    assert_eq!(s.ingest(old), Err(EphemerisError::StoreFull(old)));
    assert_eq!(s.len(), 2);
}

#[test]
fn invalid_records_are_refused_before_storing() {
    let mut s: EphemerisStore<4> = EphemerisStore::new();
    let mut bad = eph(1, 0.0, 1);
    bad.sqrt_a = f64::INFINITY;
    assert_eq!(s.ingest(bad), Err(EphemerisError::NotFinite));
    assert!(s.is_empty());
}
