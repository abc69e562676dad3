//! Receiver trajectories: a sequence of legs (duration, acceleration, turn rate) drawn from
//! the seed for each motion profile, integrated on the ellipsoid.

use super::spec::Motion;
use rand::{Rng, SeedableRng};
use std::collections::VecDeque;
use trackfix_engine::frames::{WGS84_A, WGS84_E2};
use trackfix_engine::Geodetic;

/// One piece of a trajectory.
#[derive(Clone, Copy, Debug)]
struct Leg {
    duration_s: f64,
    accel_mps2: f64,
    turn_dps: f64,
    max_speed_mps: f64,
}

/// The moving antenna.
#[derive(Clone, Debug)]
pub struct Mover {
    lat: f64,
    lon: f64,
    h: f64,
    speed: f64,
    heading: f64,
    legs: VecDeque<Leg>,
    left: f64,
    profile: Motion,
    rng: rand::rngs::StdRng,
}

/// Where the antenna is and where it is going.
#[derive(Clone, Copy, Debug)]
pub struct Kinematics {
    /// Position.
    pub geodetic: Geodetic,
    /// ECEF position, m.
    pub ecef: [f64; 3],
    /// Speed over ground, m/s.
    pub speed_mps: f64,
    /// Heading, radians from north through east.
    pub heading_rad: f64,
}

impl Mover {
    /// A mover starting at `origin` (lat °, lon °, h m) with `profile`.
    pub fn new(origin: [f64; 3], profile: Motion, seed: u64) -> Self {
        let mut rng = rand::rngs::StdRng::seed_from_u64(seed ^ 0x6d6f_7469_6f6e);
        let heading = rng.random_range(0.0..std::f64::consts::TAU);
        Mover {
            lat: origin[0].to_radians(),
            lon: origin[1].to_radians(),
            h: origin[2],
            speed: 0.0,
            heading,
            legs: VecDeque::new(),
            left: 0.0,
            profile,
            rng,
        }
    }

    /// Current kinematics.
    pub fn now(&self) -> Kinematics {
        let geodetic = Geodetic {
            lat_rad: self.lat,
            lon_rad: self.lon,
            height_m: self.h,
        };
        Kinematics {
            geodetic,
            ecef: geodetic.to_ecef(),
            speed_mps: self.speed,
            heading_rad: self.heading,
        }
    }

    /// The next legs of the profile (one "cycle" of its pattern).
    fn plan(&mut self) {
        let r = &mut self.rng;
        let leg = |d: f64, a: f64, t: f64, v: f64| Leg {
            duration_s: d,
            accel_mps2: a,
            turn_dps: t,
            max_speed_mps: v,
        };
        let turn = if r.random_bool(0.5) { 1.0 } else { -1.0 };
        match self.profile {
            Motion::Static => self.legs.push_back(leg(3_600.0, 0.0, 0.0, 0.0)),
            Motion::Pedestrian => {
                let v = r.random_range(1.2..1.6);
                self.legs.push_back(leg(2.0, v / 2.0, 0.0, v));
                self.legs.push_back(leg(
                    r.random_range(30.0..90.0),
                    0.0,
                    r.random_range(-1.0..1.0),
                    v,
                ));
                self.legs
                    .push_back(leg(3.0, 0.0, turn * r.random_range(10.0..30.0), v));
                if r.random_bool(0.3) {
                    self.legs.push_back(leg(2.0, -1.0, 0.0, v));
                    self.legs
                        .push_back(leg(r.random_range(5.0..30.0), 0.0, 0.0, 0.0));
                }
            }
            Motion::Truck => {
                let v = 13.9; // 50 km/h
                self.legs.push_back(leg(8.0, 2.0, 0.0, v));
                self.legs
                    .push_back(leg(r.random_range(30.0..110.0), 0.0, 0.0, v));
                self.legs.push_back(leg(8.0, -2.0, 0.0, v));
                if r.random_bool(0.5) {
                    // Delivery stop.
                    self.legs
                        .push_back(leg(r.random_range(20.0..60.0), 0.0, 0.0, 0.0));
                }
                // Right-angle turn at walking pace.
                self.legs.push_back(leg(2.0, 2.0, 0.0, 4.0));
                self.legs.push_back(leg(9.0, 0.0, turn * 10.0, 4.0));
            }
            Motion::Ship => {
                self.legs.push_back(leg(20.0, 0.4, 0.0, 7.7)); // 15 kn
                self.legs.push_back(leg(
                    r.random_range(300.0..900.0),
                    0.0,
                    r.random_range(-0.02..0.02),
                    7.7,
                ));
                self.legs
                    .push_back(leg(60.0, 0.0, turn * r.random_range(0.1..0.3), 7.7));
            }
            Motion::Train => {
                let v = 33.3; // 120 km/h
                self.legs.push_back(leg(56.0, 0.6, 0.0, v));
                self.legs.push_back(leg(
                    r.random_range(180.0..420.0),
                    0.0,
                    r.random_range(-0.03..0.03),
                    v,
                ));
                self.legs.push_back(leg(56.0, -0.6, 0.0, v));
                self.legs.push_back(leg(60.0, 0.0, 0.0, 0.0)); // station
            }
        }
    }

    /// Advances by `dt` seconds (integrated in 0.1 s steps).
    pub fn advance(&mut self, dt: f64) {
        let mut remaining = dt;
        while remaining > 1e-9 {
            if self.left <= 0.0 {
                if self.legs.is_empty() {
                    self.plan();
                }
                self.left = self.legs.front().map_or(1.0, |l| l.duration_s);
            }
            let Some(leg) = self.legs.front().copied() else {
                return;
            };
            let step = remaining.min(0.1).min(self.left);
            self.speed =
                (self.speed + leg.accel_mps2 * step).clamp(0.0, leg.max_speed_mps.max(0.0));
            if self.speed > 0.1 {
                self.heading = (self.heading + leg.turn_dps.to_radians() * step)
                    .rem_euclid(std::f64::consts::TAU);
            }
            let (sl, cl) = self.lat.sin_cos();
            let w = (1.0 - WGS84_E2 * sl * sl).sqrt();
            let n = WGS84_A / w;
            let m = WGS84_A * (1.0 - WGS84_E2) / (w * w * w);
            let (ve, vn) = (
                self.speed * self.heading.sin(),
                self.speed * self.heading.cos(),
            );
            self.lat += vn * step / (m + self.h);
            self.lon += ve * step / ((n + self.h) * cl.max(1e-6));
            self.left -= step;
            remaining -= step;
            if self.left <= 0.0 {
                self.legs.pop_front();
            }
        }
    }
}
