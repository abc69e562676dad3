#!/usr/bin/env python3
"""Reference vectors for the engine's satellite and propagation models, without recorded data.

Usage: python3 gen_models.py > models_reference.csv   (`cargo xtask vectors` does this)

Everything except the time scales is computed here with Python's `math` module in float64,
written from the interface specifications, not from the engine's code:

- broadcast orbit and satellite clock: IS-GPS-200 §20.3.3.3.3 and Table 20-IV, the Galileo
  OS SIS ICD §5.1.1 and the BeiDou B1I ICD §5.2.4.12 (GEO: Rz(Ω̇e·tk)·Rx(−5°)); relativistic
  term Δtr = F·e·√A·sin Ek with F = −2√μ/c² from each system's μ;
- group delays: GPS TGD (L1) and γ·TGD (L2) with γ = (77/60)² (IS-GPS-200 §20.3.3.3.3.2);
  Galileo BGD(E1,E5b) for E1, (154/118)²·BGD(E1,E5b) for E5b and (154/115)²·BGD(E1,E5a) for
  E5a (OS SIS ICD §5.1.5); BeiDou TGD1 for B1I, TGD2 for B2I, none for B3I (B1I ICD
  §5.2.4.10);
- Klobuchar ionosphere (IS-GPS-200 §20.3.3.5.2.5), Saastamoinen zenith delays (Davis et al.
  1985 hydrostatic form), the MOPS mapping function m(E) = 1.001/√(0.002001 + sin²E), and a
  standard atmosphere (common practice);
- time scales from astropy (pinned in requirements.txt) with its bundled leap-second table
  and no network access: GPS week and time of week, GPS − UTC, BeiDou Time (counted from
  2006-01-01 00:00:00 UTC, B1I ICD §5.2.4.1) and Galileo System Time (counted from
  1999-08-22 00:00:00 UTC, 13 s behind the GPS count there; OS SIS ICD §5.1.2).

The broadcast records are the published examples of the RINEX 3.04 format description
(IGS/RTCM, 2018-11-23): GPS G01 of Table A11, Galileo E12 of Table A9 and BeiDou C01 (a GEO)
of Table A15. All three print af2 = 0; af2 is set here to stated non-zero values so that the
quadratic clock term is exercised. The BeiDou MEO record is invented, with values in the
ranges broadcast satellites show. The typed-in values of the project's check list (the worked
PRN 31 position, the Klobuchar, Saastamoinen and mapping values and the GPS time examples) are
asserted below at the precision they were printed, so a fault in this script stops it.

The output is deterministic: no clock, no randomness; computed numbers are written with 13
significant digits (well inside every tolerance of the test that reads them) so that a
last-bit difference between two C maths libraries does not change the file.
"""
import datetime
import math
import sys
from importlib.metadata import version

from astropy.utils import iers

iers.conf.auto_download = False
iers.conf.auto_max_age = None

import astropy  # noqa: E402
import erfa  # noqa: E402
from astropy.time import Time  # noqa: E402

C = 299_792_458.0  # m/s, every ICD
WEEK = 604_800
HALF_WEEK = 302_400.0

# μ (m³/s²) and Ω̇e (rad/s) of each system.
SYSTEMS = {
    "G": (3.986005e14, 7.2921151467e-5),  # IS-GPS-200 Table 20-IV
    "E": (3.986004418e14, 7.2921151467e-5),  # Galileo OS SIS ICD §5.1.1
    "C": (3.986004418e14, 7.2921150e-5),  # BeiDou B1I ICD §5.2.4.12 (CGCS2000)
}


def f_rel(system):
    mu, _ = SYSTEMS[system]
    return -2.0 * math.sqrt(mu) / (C * C)


def g(v):
    """A computed number, 13 significant digits."""
    return format(v, ".12e")


def crossover(dt):
    """IS-GPS-200 §20.3.3.4.3: t − toe (and t − toc) taken within ±302,400 s."""
    if dt > HALF_WEEK:
        return dt - 2 * HALF_WEEK
    if dt < -HALF_WEEK:
        return dt + 2 * HALF_WEEK
    return dt


# ---------------------------------------------------------------- broadcast records


class Record:
    def __init__(self, name, system, prn, week, source, **kw):
        self.name, self.system, self.prn, self.week, self.source = name, system, prn, week, source
        for k in (
            "toe toc af0 af1 af2 sqrt_a e i0 idot omega0 omega_dot omega m0 delta_n "
            "cuc cus crc crs cic cis tgd tgd2"
        ).split():
            setattr(self, k, float(kw.pop(k, 0.0)))
        assert not kw, kw

    def is_geo(self):
        # BeiDou GEO slots: PRN 1–5 and 59–63.
        return self.system == "C" and (self.prn <= 5 or self.prn >= 59)


RECORDS = [
    # RINEX 3.04 Table A11 (mixed GPS/GLONASS example), G01 2006-10-01 00:00:00 GPST, week 1395.
    Record(
        "G01_rinex304_A11", "G", 1, 1395,
        "RINEX 3.04 Table A11 G01 [V]; af2 set to 2^-53 s/s^2 (4 LNAV LSB; printed 0)",
        toc=0.0, af0=0.798045657575e-04, af1=0.227373675443e-11, af2=2.0**-53,
        crs=-0.787500000000e01, delta_n=0.375658504827e-08, m0=0.265129935612e01,
        cuc=-0.411644577980e-06, e=0.640150101390e-02, cus=0.381097197533e-05,
        sqrt_a=0.515371852875e04, toe=0.0, cic=0.782310962677e-07, omega0=0.188667086536e00,
        cis=-0.391155481338e-07, i0=0.989010441512e00, crc=0.320093750000e03,
        omega=-0.178449589759e01, omega_dot=-0.775925177541e-08, idot=0.828605943335e-10,
        tgd=-0.325962901115e-08,
    ),
    # RINEX 3.04 Table A9, first E12 record, 2015-06-19 02:10:00 GST (I/NAV, data sources 516).
    Record(
        "E12_rinex304_A9", "E", 12, 1849,
        "RINEX 3.04 Table A9 E12 [V]; af2 set to 2^-55 s/s^2 (16 I/NAV LSB; printed 0)",
        toc=439800.0, af0=-0.138392508961e-02, af1=-0.131464616970e-09, af2=2.0**-55,
        crs=-0.165531250000e03, delta_n=0.285797618904e-08, m0=0.138275888459e01,
        cuc=-0.782497227192e-05, e=0.346679124050e-03, cus=0.114385038614e-04,
        sqrt_a=0.544062509727e04, toe=0.439800000000e06, cic=0.298023223877e-07,
        omega0=-0.296185101312e01, cis=-0.111758708954e-07, i0=0.965683294025e00,
        crc=0.993750000000e02, omega=-0.629360976005e00, omega_dot=-0.541593988135e-08,
        idot=-0.571452374714e-11,
        # BGD(E1,E5b) and BGD(E1,E5a): the engine's first and second group delays.
        tgd=-0.605359673500e-08, tgd2=-0.651925802231e-08,
    ),
    # RINEX 3.04 Table A15, C01 (GEO) 2014-05-10 00:00:00 BDT, BDT week 435.
    Record(
        "C01_rinex304_A15_geo", "C", 1, 435,
        "RINEX 3.04 Table A15 C01 GEO [V]; af2 set to 2^-57 s/s^2 (512 D1 LSB; printed 0)",
        toc=518400.0, af0=2.969256602228e-04, af1=2.196998138970e-11, af2=2.0**-57,
        crs=4.365468750000e02, delta_n=1.318269196918e-09, m0=-3.118148933476e00,
        cuc=1.447647809982e-05, e=2.822051756084e-04, cus=8.092261850834e-06,
        sqrt_a=6.493480609894e03, toe=5.184000000000e05, cic=-2.654269337654e-08,
        omega0=3.076630958509e00, cis=-3.864988684654e-08, i0=1.103024081152e-01,
        crc=-2.506406250000e02, omega=2.587808789012e00, omega_dot=-3.039412318009e-10,
        idot=2.389385241772e-10, tgd=1.420000000000e-08, tgd2=-1.040000000000e-08,
    ),
    # Invented BeiDou MEO record (values typical of the MEO constellation; not broadcast).
    Record(
        "C11_invented_meo", "C", 11, 1000,
        "invented MEO record, plausible values (not a broadcast)",
        toc=345600.0, af0=-5.412345678901e-04, af1=3.125e-11, af2=2.0**-57,
        crs=-31.28125, delta_n=3.895163e-09, m0=1.301234567, cuc=-1.53e-06,
        e=2.134567e-03, cus=8.765e-06, sqrt_a=5282.623456, toe=345600.0, cic=4.19e-08,
        omega0=-1.212345678, cis=-2.3e-08, i0=0.965432109, crc=201.5,
        omega=-2.098765432, omega_dot=-6.912345e-09, idot=1.234e-10,
        tgd=5.8e-09, tgd2=-2.7e-09,
    ),
    # The project's worked satellite: GPS LNAV PRN 31, 2018-09-05 (CHECKS.md), week 2017.
    Record(
        "G31_worked", "G", 31, 2017,
        "CHECKS.md worked PRN 31 record (clock fields not given: zero)",
        toe=287984.0, toc=287984.0, m0=-2.84228546039, sqrt_a=5153.73404312,
        e=8.84578982368e-3, delta_n=4.53197435135e-9, omega0=-1.33607394295,
        omega_dot=-7.79175302057e-9, i0=0.961978018040, idot=-4.12874345823e-10,
        omega=-0.114071783319, cuc=1.42678618431e-6, cus=1.05015933514e-5, crc=178.90625,
        crs=25.875, cic=-1.54599547386e-7, cis=-3.53902578354e-8,
    ),
    # CHECKS.md second record (week 910), a coarse outside reference exists for it.
    Record(
        "G01_week910", "G", 1, 910,
        "CHECKS.md second record (week 910; clock fields not given: zero)",
        toe=410400.0, toc=410400.0, e=4.27323824e-3, sqrt_a=5153.53571, cic=9.8720193e-8,
        crc=282.28125, cis=-3.9115548e-8, crs=-132.71875, cuc=-6.60121440e-6,
        cus=5.31412661e-6, delta_n=4.3123e-9, omega0=2.29116688, omega=-0.88396725,
        i0=0.97477102, omega_dot=-8.025691e-9, idot=-4.23946e-10, m0=2.24295542,
    ),
]


def kepler(m, e):
    """Eccentric anomaly from M = E − e·sin E (Newton's method to convergence)."""
    ek = m
    for _ in range(50):
        step = (m - (ek - e * math.sin(ek))) / (1.0 - e * math.cos(ek))
        ek += step
        if abs(step) < 1e-15:
            break
    return ek


def rot_x(phi, v):
    # Rx(φ) = [[1, 0, 0], [0, cos φ, sin φ], [0, −sin φ, cos φ]]
    c, s = math.cos(phi), math.sin(phi)
    return (v[0], c * v[1] + s * v[2], -s * v[1] + c * v[2])


def rot_z(phi, v):
    # Rz(φ) = [[cos φ, sin φ, 0], [−sin φ, cos φ, 0], [0, 0, 1]]
    c, s = math.cos(phi), math.sin(phi)
    return (c * v[0] + s * v[1], -s * v[0] + c * v[1], v[2])


def satellite(rec, week, tow):
    """Position, Ek, Δtr and the clock at system time (week, tow) by Table 20-IV."""
    mu, omega_e = SYSTEMS[rec.system]
    t_minus_toe = (week - rec.week) * WEEK + tow - rec.toe
    t_minus_toc = (week - rec.week) * WEEK + tow - rec.toc
    tk = crossover(t_minus_toe)
    a = rec.sqrt_a**2
    n0 = math.sqrt(mu / a**3)
    n = n0 + rec.delta_n
    mk = rec.m0 + n * tk
    ek = kepler(mk, rec.e)
    nu = math.atan2(math.sqrt(1.0 - rec.e**2) * math.sin(ek), math.cos(ek) - rec.e)
    phi = nu + rec.omega
    s2, c2 = math.sin(2.0 * phi), math.cos(2.0 * phi)
    du = rec.cus * s2 + rec.cuc * c2
    dr = rec.crs * s2 + rec.crc * c2
    di = rec.cis * s2 + rec.cic * c2
    u = phi + du
    r = a * (1.0 - rec.e * math.cos(ek)) + dr
    inc = rec.i0 + di + rec.idot * tk
    xp, yp = r * math.cos(u), r * math.sin(u)
    if rec.is_geo():
        node = rec.omega0 + rec.omega_dot * tk - omega_e * rec.toe
    else:
        node = rec.omega0 + (rec.omega_dot - omega_e) * tk - omega_e * rec.toe
    pos = (
        xp * math.cos(node) - yp * math.cos(inc) * math.sin(node),
        xp * math.sin(node) + yp * math.cos(inc) * math.cos(node),
        yp * math.sin(inc),
    )
    if rec.is_geo():
        pos = rot_z(omega_e * tk, rot_x(math.radians(-5.0), pos))
    dtr = f_rel(rec.system) * rec.e * rec.sqrt_a * math.sin(ek)
    dt = crossover(t_minus_toc)
    poly = rec.af0 + rec.af1 * dt + rec.af2 * dt * dt
    drift = rec.af1 + 2.0 * rec.af2 * dt
    return tk, dt, pos, ek, dtr, poly, poly + dtr, drift


# Ratios of carrier frequencies as multiples of 10.23 MHz: L1/E1 154, L2 120, E5a 115,
# E5b 118 (IS-GPS-200 §3.3.1.1, OS SIS ICD §2.3).
GAMMA_L1_L2 = (77.0 / 60.0) ** 2
GAMMA_E1_E5A = (154.0 / 115.0) ** 2
GAMMA_E1_E5B = (154.0 / 118.0) ** 2


def group_delays(rec):
    """(signal, delay in s) pairs: the amount the ICDs subtract from Δt_SV for the signal."""
    if rec.system == "G":
        return [("GpsL1Ca", rec.tgd), ("GpsL1P", rec.tgd), ("GpsL2", GAMMA_L1_L2 * rec.tgd)]
    if rec.system == "E":
        return [
            ("GalE1", rec.tgd),
            ("GalE5b", GAMMA_E1_E5B * rec.tgd),
            ("GalE5a", GAMMA_E1_E5A * rec.tgd2),
        ]
    return [("BdsB1I", rec.tgd), ("BdsB2I", rec.tgd2), ("BdsB3I", 0.0)]


# Evaluation times, seconds from toe: before toe, at toe, and up to the end of a fit interval.
OFFSETS = [-7200.0, -3599.5, 0.0, 1600.0, 5400.0, 7200.0]


def week_tow(rec, offset):
    s = rec.week * WEEK + rec.toe + offset
    return int(s // WEEK), s - (s // WEEK) * WEEK


# ---------------------------------------------------------------- ionosphere and troposphere

PI_ICD = 3.1415926535898  # IS-GPS-200 value of π


def klobuchar(alpha, beta, lat_deg, lon_deg, az_deg, el_deg, tow):
    """IS-GPS-200 §20.3.3.5.2.5, L1 delay in metres (angles converted to semicircles)."""
    el_sc = math.radians(el_deg) / PI_ICD
    lat_sc = math.radians(lat_deg) / PI_ICD
    lon_sc = math.radians(lon_deg) / PI_ICD
    az = math.radians(az_deg)
    psi = 0.0137 / (el_sc + 0.11) - 0.022
    phi_i = lat_sc + psi * math.cos(az)
    phi_i = min(max(phi_i, -0.416), 0.416)
    lam_i = lon_sc + psi * math.sin(az) / math.cos(phi_i * PI_ICD)
    phi_m = phi_i + 0.064 * math.cos((lam_i - 1.617) * PI_ICD)
    t = math.fmod(4.32e4 * lam_i + tow, 86400.0)
    if t < 0.0:
        t += 86400.0
    obliquity = 1.0 + 16.0 * (0.53 - el_sc) ** 3
    amp = sum(alpha[n] * phi_m**n for n in range(4))
    amp = max(amp, 0.0)
    per = sum(beta[n] * phi_m**n for n in range(4))
    per = max(per, 72000.0)
    x = 2.0 * PI_ICD * (t - 50400.0) / per
    if abs(x) < 1.57:
        delay = obliquity * (5.0e-9 + amp * (1.0 - x**2 / 2.0 + x**4 / 24.0))
    else:
        delay = obliquity * 5.0e-9
    return delay * C


IONO_SETS = [
    # CHECKS.md Klobuchar sets [C]
    ([1.49e-8, 2.24e-8, -1.19e-7, -1.19e-7], [1.17e5, 1.80e5, -1.31e5, -4.95e5]),
    ([3.82e-8, 1.49e-8, -1.79e-7, 0.0], [1.43e5, 0.0, -3.28e5, 1.13e5]),
    # RINEX 3.04 Table A11 header GPSA/GPSB [V]
    ([0.1025e-07, 0.7451e-08, -0.5960e-07, -0.5960e-07], [0.8806e05, 0.0, -0.1966e06, -0.6554e05]),
]


def zenith(p_hpa, t_k, e_hpa, lat_deg, h_m):
    zhd = 0.0022768 * p_hpa / (1.0 - 0.00266 * math.cos(2.0 * math.radians(lat_deg)) - 2.8e-7 * h_m)
    zwd = 0.002277 * (1255.0 / t_k + 0.05) * e_hpa
    return zhd, zwd


def mops_mapping(el_deg):
    return 1.001 / math.sqrt(0.002001 + math.sin(math.radians(el_deg)) ** 2)


def standard_atmosphere(h_m):
    """Pressure, temperature and water-vapour pressure at h (common practice: ICAO standard
    atmosphere, 50 % relative humidity with the Magnus saturation pressure)."""
    p = 1013.25 * (1.0 - 2.2557e-5 * h_m) ** 5.2568
    t = 288.15 - 6.5e-3 * h_m
    tc = t - 273.15
    e = 0.5 * 6.1078 * math.exp(17.27 * tc / (tc + 237.3))
    return p, t, e


# ---------------------------------------------------------------- time scales

GPS_EPOCH = datetime.datetime(1980, 1, 6)
BDT_EPOCH_GPS = round(Time("2006-01-01T00:00:00", scale="utc").gps)
GST_EPOCH_GPS = round(Time("1999-08-22T00:00:00", scale="utc").gps) - 13

TIMES = [
    (1980, 1, 6, 0, 0, 0, 0),
    (1999, 8, 22, 0, 0, 0, 0),
    (2006, 1, 1, 0, 0, 0, 0),
    (2008, 12, 31, 23, 59, 60, 0),
    (2014, 5, 9, 23, 59, 58, 0),
    (2015, 6, 19, 2, 9, 43, 500_000_000),
    (2016, 12, 31, 23, 59, 59, 0),
    (2016, 12, 31, 23, 59, 60, 0),
    (2017, 1, 1, 0, 0, 0, 0),
    (2019, 4, 7, 0, 0, 0, 0),
    (2020, 6, 25, 12, 34, 56, 789_000_000),
    (2024, 1, 1, 0, 0, 0, 0),
    (2024, 2, 29, 23, 59, 59, 999_999_999),
]


def time_row(y, mo, d, h, mi, s, ns):
    t = Time(f"{y:04d}-{mo:02d}-{d:02d}T{h:02d}:{mi:02d}:{s:02d}", scale="utc")
    gps_s = t.gps
    assert abs(gps_s - round(gps_s)) < 1e-6, gps_s
    gps_s = round(gps_s)
    # UTC seconds since the GPS epoch without leap seconds; a leap second (:60) counts as
    # one past :59 of the same minute.
    calendar = int((datetime.datetime(y, mo, d, h, mi, min(s, 59)) - GPS_EPOCH).total_seconds())
    calendar += s - min(s, 59)
    gps_minus_utc = gps_s - calendar
    bdt_s = gps_s - BDT_EPOCH_GPS
    gst_s = gps_s - GST_EPOCH_GPS
    return (
        gps_s,
        gps_minus_utc,
        (gps_s // WEEK, gps_s % WEEK),
        (bdt_s // WEEK, bdt_s % WEEK),
        (gst_s // WEEK, gst_s % WEEK),
    )


def close(a, b, tol, what):
    assert abs(a - b) <= tol, f"{what}: {a!r} vs {b!r}"


# ---------------------------------------------------------------- the project's typed values

# CHECKS.md [C]: F for GPS, Galileo (and BeiDou, same μ).
close(f_rel("G"), -4.44280763339e-10, 0.5e-21, "GPS F")
close(f_rel("E"), -4.4428073090e-10, 0.5e-20, "Galileo F")
# Worked PRN 31 at toe + 1600 s, printed to 0.1 mm, 1e-10 rad and 1e-12 s.
_w = next(r for r in RECORDS if r.name == "G31_worked")
_, _, _p, _ek, _dtr, _, _, _ = satellite(_w, 2017, 287984.0 + 1600.0)
for _k, _v in enumerate((24_694_509.0762, -5_477_966.2150, -8_745_700.8732)):
    close(_p[_k], _v, 0.5e-4 + 1e-7, f"PRN 31 axis {_k}")
close(_ek, -2.6133783085, 0.5e-10 + 1e-13, "PRN 31 Ek")
close(_dtr, 1.0208e-8, 0.5e-12 + 1e-16, "PRN 31 relativity")
# Second record: a general RINEX-reader library's test value (other μ), coarse: 0.2 m.
_w = next(r for r in RECORDS if r.name == "G01_week910")
_, _, _p, _, _, _, _, _ = satellite(_w, 910, 403272.930)
for _k, _v in enumerate((-5_678_411.01, -24_923_962.9, 7_056_518.87)):
    close(_p[_k], _v, 0.2, f"week 910 axis {_k}")
# Klobuchar, printed to 0.1 mm.
for _set, _args, _want in [
    (0, (47.1888, 18.4188, 191.1257, 78.2541, 49331.21456), 4.6629),
    (1, (40.0, -100.0, 210.0, 20.0, 50700.0), 10.0975),
    (1, (45.0, 0.0, 0.0, 90.0, 50400.0), 10.1641),
    (1, (45.0, 0.0, 0.0, 90.0, 0.0), 1.4996),
]:
    close(klobuchar(*IONO_SETS[_set], *_args), _want, 0.5e-4 + 1e-9, f"Klobuchar {_args}")
# Saastamoinen and mapping.
close(zenith(1013.25, 288.15, 8.574, 45.0, 0.0)[0], 2.3070, 0.5e-4 + 1e-9, "ZHD 1")
close(zenith(1000.0, 288.15, 0.0, 48.0, 200.0)[0], 2.2763, 0.5e-4 + 1e-9, "ZHD 2")
close(zenith(1013.25, 288.15, 8.574, 45.0, 0.0)[1], 0.0860, 0.5e-4 + 1e-9, "ZWD")
for _el, _want in [(30.0, 1.9940), (15.0, 3.8111), (10.0, 5.5823), (5.0, 10.2179)]:
    close(mops_mapping(_el), _want, 0.5e-4 + 1e-9, f"mapping {_el}")
# GPS time (astropy [C]).
assert time_row(1999, 8, 22, 0, 0, 0, 0)[2] == (1024, 13)
assert time_row(2019, 4, 7, 0, 0, 0, 0)[2] == (2048, 18)
assert time_row(2024, 1, 1, 0, 0, 0, 0)[:3] == (1_388_102_418, 18, (2295, 86418))
assert time_row(2017, 1, 1, 0, 0, 0, 0)[1] == 18

# ---------------------------------------------------------------- output

out = sys.stdout
w = out.write
w(
    f"# generator: tools/refvectors/gen_models.py; library: astropy {astropy.__version__} "
    f"with pyerfa {erfa.__version__} and astropy-iers-data {version('astropy-iers-data')} "
    f"(time scales, leap seconds bundled, no download); models in Python math, float64\n"
)
w("# command: cargo xtask vectors (python3 tools/refvectors/gen_models.py > tools/refvectors/models_reference.csv)\n")
w("# sources: IS-GPS-200 §20.3.3.3.3, Table 20-IV, §20.3.3.5.2.5; Galileo OS SIS ICD §5.1.1, §5.1.2, §5.1.5;\n")
w("#   BeiDou B1I ICD §5.2.4.1, §5.2.4.10, §5.2.4.12; records from the RINEX 3.04 format description\n")
w("#   (IGS/RTCM 2018-11-23) Tables A11, A9, A15 with af2 set non-zero (printed 0); one invented BeiDou MEO.\n")
w("# rows (first field names the kind):\n")
w("#   const,system,mu,omega_e,f_rel\n")
w("#   record,name,system,prn,week,toe,toc,af0,af1,af2,sqrt_a,e,i0,idot,omega0,omega_dot,omega,m0,delta_n,cuc,cus,crc,crs,cic,cis,tgd,tgd2\n")
w("#   orbit,name,week,tow,tk,dt_toc,x,y,z,ek,relativity_s,clock_poly_s,clock_s,clock_drift\n")
w("#   groupdelay,name,signal,delay_s,clock_for_signal_s (at toe + 1600 s)\n")
w("#   iono,a0,a1,a2,a3,b0,b1,b2,b3,lat_deg,lon_deg,az_deg,el_deg,tow,delay_l1_m\n")
w("#   zenith,p_hpa,t_k,e_hpa,lat_deg,h_m,zhd_m,zwd_m\n")
w("#   mapping,el_deg,m\n")
w("#   stdatm,lat_deg,h_m,zhd_m,zwd_m\n")
w("#   time,year,month,day,hour,minute,second,ns,gps_minus_utc,gps_s,gps_week,gps_tow,bdt_week,bdt_tow,gst_week,gst_tow\n")

for s, (mu, om) in SYSTEMS.items():
    w(f"const,{s},{mu!r},{om!r},{g(f_rel(s))}\n")

for rec in RECORDS:
    w(f"# record {rec.name}: {rec.source}\n")
    fields = [rec.toe, rec.toc, rec.af0, rec.af1, rec.af2, rec.sqrt_a, rec.e, rec.i0, rec.idot,
              rec.omega0, rec.omega_dot, rec.omega, rec.m0, rec.delta_n, rec.cuc, rec.cus,
              rec.crc, rec.crs, rec.cic, rec.cis, rec.tgd, rec.tgd2]
    w(f"record,{rec.name},{rec.system},{rec.prn},{rec.week}," + ",".join(repr(v) for v in fields) + "\n")

for rec in RECORDS:
    if rec.name == "G01_week910":
        instants = [(910, 403272.930)]  # the instant of the coarse outside reference
    else:
        instants = [week_tow(rec, off) for off in OFFSETS]
    for week, tow in instants:
        tk, dt, pos, ek, dtr, poly, clock, drift = satellite(rec, week, tow)
        w(
            f"orbit,{rec.name},{week},{tow!r},{tk!r},{dt!r},"
            + ",".join(g(v) for v in (*pos, ek, dtr, poly, clock, drift))
            + "\n"
        )

for rec in RECORDS[:4]:
    week, tow = week_tow(rec, 1600.0)
    clock = satellite(rec, week, tow)[6]
    for signal, delay in group_delays(rec):
        w(f"groupdelay,{rec.name},{signal},{g(delay)},{g(clock - delay)}\n")

# Ionosphere: the check-list vectors, then a grid over latitude (inside and past the ±0.416
# semicircle clamp), longitude, azimuth, elevation and time of day (day and night branches,
# local times that wrap below zero and past a day).
iono_cases = [
    (0, (47.1888, 18.4188, 191.1257, 78.2541, 49331.21456)),
    (1, (40.0, -100.0, 210.0, 20.0, 50700.0)),
    (1, (45.0, 0.0, 0.0, 90.0, 50400.0)),
    (1, (45.0, 0.0, 0.0, 90.0, 0.0)),
]
for k in range(len(IONO_SETS)):
    for lat in (-80.0, -35.0, 0.0, 40.0, 75.0):
        for lon in (-170.0, -20.0, 100.0):
            for az in (0.0, 135.0, 270.0):
                for el in (5.0, 30.0, 90.0):
                    for tow in (0.0, 50400.0, 61000.0, 345600.0):
                        iono_cases.append((k, (lat, lon, az, el, tow)))
for k, args in iono_cases:
    alpha, beta = IONO_SETS[k]
    w("iono," + ",".join(repr(v) for v in (*alpha, *beta, *args)) + f",{g(klobuchar(alpha, beta, *args))}\n")

zenith_cases = [(1013.25, 288.15, 8.574, 45.0, 0.0), (1000.0, 288.15, 0.0, 48.0, 200.0)]
for p in (1013.25, 850.0, 700.0):
    for t_k, e in ((288.15, 8.574), (300.0, 25.0), (260.0, 1.0)):
        for lat in (0.0, -70.0):
            for h in (0.0, 1500.0, 4000.0):
                zenith_cases.append((p, t_k, e, lat, h))
for args in zenith_cases:
    zhd, zwd = zenith(*args)
    w("zenith," + ",".join(repr(v) for v in args) + f",{g(zhd)},{g(zwd)}\n")

for el in (90.0, 60.0, 30.0, 15.0, 10.0, 5.0, 3.0, 1.0):
    w(f"mapping,{el!r},{g(mops_mapping(el))}\n")

for lat in (0.0, 50.0):
    for h in (-400.0, 0.0, 500.0, 2000.0, 5000.0, 10000.0):
        zhd, zwd = zenith(*standard_atmosphere(h), lat, h)
        w(f"stdatm,{lat!r},{h!r},{g(zhd)},{g(zwd)}\n")

for y, mo, d, h, mi, s, ns in TIMES:
    gps_s, leap, (gw, gt), (bw, bt), (ew, et) = time_row(y, mo, d, h, mi, s, ns)
    frac = ns * 1e-9
    w(
        f"time,{y},{mo},{d},{h},{mi},{s},{ns},{leap},{gps_s},{gw},{gt + frac!r},{bw},{bt + frac!r},"
        f"{ew},{et + frac!r}\n"
    )
