//! Broadcast satellite positions and clocks from a real navigation file against the IGS
//! MGEX final precise orbits of the same day (shared/data/esbc_2020177).
//!
//! Threshold: the GPS SPS Performance Standard, 2001 edition [V: excerpt, via CHECKS.md],
//! bounds the signal-in-space user range error (SIS URE) at ≤ 6 m RMS. We compute the
//! SIS URE of each satellite and epoch with the usual GPS weighting
//! URE = √((R − c·δt)² + (A² + C²)/49) (radial R, along-track A, cross-track C orbit errors,
//! clock error δt; the 1/49 weight of the in-plane errors is the GPS-altitude factor used in
//! performance reports [from memory]) and hold the RMS over the day to 6 m. The precise
//! product refers to the centre of mass, the broadcast to the antenna phase centre (about
//! 1 m radially): part of what we measure, within the budget.

use trackfix_engine::{GnssTime, System, SPEED_OF_LIGHT};
use trackfix_harness::data::{data_dir_or_skip, verify};
use trackfix_harness::replay::load_nav;
use trackfix_harness::sp3;

const NAV: &str = "esbc_2020177/ESBC00DNK_R_20201770000_01D_MN.rnx";
const SP3: &str = "esbc_2020177/GRG0MGXFIN_20201770000_01D_15M_ORB.SP3";

struct Diff {
    time: GnssTime,
    system: System,
    orbit_3d: f64,
    radial: f64,
    in_plane2: f64,
    clock_m: f64,
}

#[test]
fn broadcast_orbits_and_clocks_within_sps_ure() {
    let Some(dir) = data_dir_or_skip("broadcast_orbits_and_clocks_within_sps_ure") else {
        return;
    };
    verify(&dir, NAV).unwrap();
    verify(&dir, SP3).unwrap();
    let (nav, _) = load_nav(&[dir.join(NAV)]).unwrap();
    let precise = sp3::read(&dir.join(SP3)).unwrap();
    let mut diffs = Vec::new();
    for p in &precise {
        if p.sat.system == System::Beidou {
            continue;
        }
        // The newest record a receiver would hold at that time, within its 2-hour validity.
        let Some(rec) = nav
            .iter()
            .filter(|r| r.eph.sat == p.sat && r.transmitted <= p.time && r.eph.health == 0)
            .max_by_key(|r| r.transmitted)
        else {
            continue;
        };
        let toe = rec.eph.toe().unwrap();
        let toc = rec.eph.toc().unwrap();
        if p.time.seconds_since(toe).abs() > 7_200.0 {
            continue;
        }
        let st = rec
            .eph
            .evaluate(p.time.seconds_since(toe), p.time.seconds_since(toc));
        let d = [0, 1, 2].map(|k| st.pos[k] - p.pos[k]);
        let r = p.pos;
        let rn = (r[0] * r[0] + r[1] * r[1] + r[2] * r[2]).sqrt();
        let radial = (d[0] * r[0] + d[1] * r[1] + d[2] * r[2]) / rn;
        let d2 = d.iter().map(|x| x * x).sum::<f64>();
        // Precise clocks exclude the periodic relativistic term: compare without it.
        let clock_m = p
            .clock_s
            .map(|c| (st.clock_s - st.relativity_s - c) * SPEED_OF_LIGHT)
            .unwrap_or(f64::NAN);
        diffs.push(Diff {
            time: p.time,
            system: p.sat.system,
            orbit_3d: d2.sqrt(),
            radial,
            in_plane2: d2 - radial * radial,
            clock_m,
        });
    }
    for system in [System::Gps, System::Galileo] {
        let ds: Vec<&Diff> = diffs
            .iter()
            .filter(|d| d.system == system && d.clock_m.is_finite())
            .collect();
        assert!(ds.len() > 500, "{system:?}: only {} comparisons", ds.len());
        // Each system's broadcast clocks and the precise clocks differ by a common offset
        // per epoch (their time references differ): remove it.
        let mut ure2 = 0.0;
        let mut orbit2 = 0.0;
        for d in &ds {
            let same: Vec<f64> = ds
                .iter()
                .filter(|o| o.time == d.time)
                .map(|o| o.clock_m)
                .collect();
            let mean = same.iter().sum::<f64>() / same.len() as f64;
            let c = d.clock_m - mean;
            ure2 += (d.radial - c).powi(2) + d.in_plane2 / 49.0;
            orbit2 += d.orbit_3d * d.orbit_3d;
        }
        let ure = (ure2 / ds.len() as f64).sqrt();
        let orbit = (orbit2 / ds.len() as f64).sqrt();
        println!(
            "{system:?}: {} comparisons, orbit 3-D RMS {orbit:.2} m, SIS URE RMS {ure:.2} m",
            ds.len()
        );
        assert!(ure <= 6.0, "{system:?} SIS URE {ure} m");
        // shared/data/README.md reports, from an independent computation on these files,
        // 1.41 m (GPS) and 1.14 m (Galileo) 3-D RMS: we hold to 1.5 × those.
        let independent = if system == System::Gps { 1.41 } else { 1.14 };
        assert!(
            orbit <= 1.5 * independent,
            "{system:?} orbit 3-D RMS {orbit} m"
        );
    }
}
