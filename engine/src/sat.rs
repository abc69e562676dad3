//! Satellite identities, constellations, signals and the per-constellation constants of
//! the broadcast user algorithms.

/// Speed of light in vacuum, m/s (exact by definition of the metre; the value every GNSS
/// ICD uses).
pub const SPEED_OF_LIGHT: f64 = 299_792_458.0;

/// A satellite navigation system the engine can use.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum System {
    /// GPS (IS-GPS-200).
    #[default]
    Gps,
    /// Galileo (OS SIS ICD).
    Galileo,
    /// BeiDou (B1I ICD).
    Beidou,
}

impl System {
    /// Every system, in the order of their receiver clock states.
    pub const ALL: [System; 3] = [System::Gps, System::Galileo, System::Beidou];

    /// Index of this system's receiver clock state (0, 1, 2).
    pub const fn index(self) -> usize {
        match self {
            System::Gps => 0,
            System::Galileo => 1,
            System::Beidou => 2,
        }
    }

    /// The constants of this system's broadcast orbit algorithm.
    pub const fn constants(self) -> &'static OrbitConstants {
        match self {
            System::Gps => &GPS_CONSTANTS,
            System::Galileo => &GALILEO_CONSTANTS,
            System::Beidou => &BEIDOU_CONSTANTS,
        }
    }

    /// The single-letter system code of RINEX 3 (an open exchange standard).
    pub const fn rinex_letter(self) -> char {
        match self {
            System::Gps => 'G',
            System::Galileo => 'E',
            System::Beidou => 'C',
        }
    }
}

/// Constants of one system's broadcast orbit and clock algorithm.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct OrbitConstants {
    /// Earth gravitational constant μ, m³/s².
    pub mu: f64,
    /// Earth rotation rate Ω̇e, rad/s.
    pub omega_e: f64,
    /// Relativistic constant F = −2√μ/c², s/√m.
    pub f_rel: f64,
}

/// IS-GPS-200 §20.3.3.4.3 Table 20-IV: μ = 3.986005e14, Ω̇e = 7.2921151467e-5;
/// F = −4.442807633e-10 (§20.3.3.3.3.1).
pub const GPS_CONSTANTS: OrbitConstants = OrbitConstants {
    mu: 3.986_005e14,
    omega_e: 7.292_115_146_7e-5,
    f_rel: -4.442_807_633e-10,
};

/// Galileo OS SIS ICD §5.1.1: μ = 3.986004418e14, Ω̇e = 7.2921151467e-5,
/// F = −4.442807309e-10.
pub const GALILEO_CONSTANTS: OrbitConstants = OrbitConstants {
    mu: 3.986_004_418e14,
    omega_e: 7.292_115_146_7e-5,
    f_rel: -4.442_807_309e-10,
};

/// BeiDou B1I ICD §5.2.4.12 (CGCS2000): μ = 3.986004418e14, Ω̇e = 7.2921150e-5;
/// F from the same μ.
pub const BEIDOU_CONSTANTS: OrbitConstants = OrbitConstants {
    mu: 3.986_004_418e14,
    omega_e: 7.292_115_0e-5,
    f_rel: -4.442_807_309e-10,
};

/// A satellite: its system and its PRN (slot) number within that system.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct SatId {
    /// The satellite's system.
    pub system: System,
    /// PRN number, 1-based.
    pub prn: u8,
}

impl SatId {
    /// A GPS satellite.
    pub const fn gps(prn: u8) -> Self {
        SatId {
            system: System::Gps,
            prn,
        }
    }

    /// A Galileo satellite.
    pub const fn galileo(prn: u8) -> Self {
        SatId {
            system: System::Galileo,
            prn,
        }
    }

    /// A BeiDou satellite.
    pub const fn beidou(prn: u8) -> Self {
        SatId {
            system: System::Beidou,
            prn,
        }
    }

    /// True for a BeiDou geostationary satellite (PRN 1–5 and 59–63), whose broadcast orbit
    /// is computed in a frame tilted by −5° (B1I ICD §5.2.4.12) [from memory of the ICD's
    /// PRN allocation; common practice].
    pub const fn is_beidou_geo(self) -> bool {
        matches!(self.system, System::Beidou) && (self.prn <= 5 || self.prn >= 59)
    }
}

/// A signal, by its trade name.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum Signal {
    /// GPS L1 C/A, 1575.42 MHz.
    GpsL1Ca,
    /// GPS L1 P(Y) / semi-codeless, 1575.42 MHz.
    GpsL1P,
    /// GPS L2C or L2 P(Y), 1227.60 MHz.
    GpsL2,
    /// GPS L5, 1176.45 MHz.
    GpsL5,
    /// Galileo E1 (B/C), 1575.42 MHz.
    GalE1,
    /// Galileo E5a, 1176.45 MHz.
    GalE5a,
    /// Galileo E5b, 1207.14 MHz.
    GalE5b,
    /// Galileo E6, 1278.75 MHz.
    GalE6,
    /// BeiDou B1I, 1561.098 MHz.
    BdsB1I,
    /// BeiDou B2I / B2b, 1207.14 MHz.
    BdsB2I,
    /// BeiDou B3I, 1268.52 MHz.
    BdsB3I,
}

impl Signal {
    /// Carrier frequency, Hz.
    pub const fn frequency_hz(self) -> f64 {
        match self {
            Signal::GpsL1Ca | Signal::GpsL1P | Signal::GalE1 => 1_575.42e6,
            Signal::GpsL2 => 1_227.60e6,
            Signal::GpsL5 | Signal::GalE5a => 1_176.45e6,
            Signal::GalE5b | Signal::BdsB2I => 1_207.14e6,
            Signal::GalE6 => 1_278.75e6,
            Signal::BdsB1I => 1_561.098e6,
            Signal::BdsB3I => 1_268.52e6,
        }
    }

    /// The system that transmits this signal.
    pub const fn system(self) -> System {
        match self {
            Signal::GpsL1Ca | Signal::GpsL1P | Signal::GpsL2 | Signal::GpsL5 => System::Gps,
            Signal::GalE1 | Signal::GalE5a | Signal::GalE5b | Signal::GalE6 => System::Galileo,
            Signal::BdsB1I | Signal::BdsB2I | Signal::BdsB3I => System::Beidou,
        }
    }

    /// Ionospheric delay scale relative to L1: (f_L1 / f)².
    pub fn iono_scale_from_l1(self) -> f64 {
        let r = 1_575.42e6 / self.frequency_hz();
        r * r
    }
}
