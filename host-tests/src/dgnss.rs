//! Differential corrections computed at a reference station of known position (issue 10,
//! second part; host side). Each satellite's correction is the geometric range from the
//! known antenna position (the satellite rotated for the Earth's turn during the signal's
//! flight) less the satellite clock (with its group delay) less the measured pseudorange,
//! taken with the engine's own satellite models: a rover using the same ephemeris issue
//! cancels the orbit and clock errors with it. The reference receiver's clock, common to a
//! system's satellites, is removed by subtracting each system's median correction (the
//! rover's clock would absorb it anyway, and it keeps the corrections within their range).

use trackfix_engine::corrections::dgnss::RangeCorrection;
use trackfix_engine::{Engine, Epoch, System, SPEED_OF_LIGHT};

/// The Earth's rotation rate (WGS-84, IS-GPS-200), rad/s.
const OMEGA_E: f64 = 7.292_115_146_7e-5;

/// The corrections of every observation of `epoch` with an ephemeris in `engine`, for a
/// reference antenna at `antenna` (ECEF, m), each with σ `sigma_m`.
pub fn reference_corrections<const N: usize, const E: usize>(
    engine: &Engine<N, E>,
    epoch: &Epoch<N>,
    antenna: [f64; 3],
    sigma_m: f32,
) -> Vec<RangeCorrection> {
    let mut out = Vec::new();
    for o in &epoch.obs {
        let Some(held) = engine.store().get(o.sat) else {
            continue;
        };
        if o.pseudorange_m <= 0.0 || !o.pseudorange_m.is_finite() {
            continue;
        }
        let s = held.state_at_transmit(epoch.time, o.pseudorange_m);
        let d0 = [0, 1, 2].map(|k| s.pos[k] - antenna[k]);
        let tau = (d0[0] * d0[0] + d0[1] * d0[1] + d0[2] * d0[2]).sqrt() / SPEED_OF_LIGHT;
        let th = OMEGA_E * tau;
        let sat = [
            s.pos[0] * th.cos() + s.pos[1] * th.sin(),
            -s.pos[0] * th.sin() + s.pos[1] * th.cos(),
            s.pos[2],
        ];
        let d = [0, 1, 2].map(|k| sat[k] - antenna[k]);
        let range = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
        let clock_m = (s.clock_s - held.eph.group_delay_s(o.signal)) * SPEED_OF_LIGHT;
        out.push(RangeCorrection {
            sat: o.sat,
            signal: o.signal,
            correction_m: range - clock_m - o.pseudorange_m,
            rate_mps: 0.0,
            reference_time: epoch.time,
            iode: held.eph.iode,
            sigma_m,
        });
    }
    for system in System::ALL {
        let mut v: Vec<f64> = out
            .iter()
            .filter(|c| c.sat.system == system)
            .map(|c| c.correction_m)
            .collect();
        if v.is_empty() {
            continue;
        }
        v.sort_by(f64::total_cmp);
        let median = v[v.len() / 2];
        for c in out.iter_mut().filter(|c| c.sat.system == system) {
            c.correction_m -= median;
        }
    }
    out
}

/// The same corrections with their rates, from two reference epochs `dt_s` apart: the rate
/// of each satellite present in both (the later set's values, the difference's slope).
pub fn with_rates(earlier: &[RangeCorrection], later: &[RangeCorrection]) -> Vec<RangeCorrection> {
    later
        .iter()
        .map(|c| {
            let mut c = *c;
            if let Some(e) = earlier
                .iter()
                .find(|e| e.sat == c.sat && e.signal == c.signal && e.iode == c.iode)
            {
                let dt = c.reference_time.seconds_since(e.reference_time);
                if dt > 0.0 {
                    c.rate_mps = (c.correction_m - e.correction_m) / dt;
                }
            }
            c
        })
        .collect()
}
