#!/usr/bin/env python3
"""Reference vectors for the engine's Kalman filter, from filterpy's KalmanFilter.

Usage: python3 gen_filter.py > filter_filterpy.csv   (`cargo xtask vectors` does this)

filterpy is a general-purpose Kalman-filter library on PyPI (version pinned in
requirements.txt and recorded in the output header). Its `KalmanFilter.predict(F, Q)` forms
x = F x, P = F P F' + Q with dense matrix products, and `KalmanFilter.update(z, R, H)` the
Joseph form P = (I - K H) P (I - K H)' + K R K' (read in filterpy 1.4.5's
filterpy/kalman/kalman_filter.py).

The sequence is fixed (no clock, a seeded Python `random.Random` for the measurement noise)
and at realistic scales: ECEF positions near 6e6 m, a receiver clock near 1e5 m, variances
from 1e-2 to 1e10. It runs 4 predictions (dt 1, 5, 30 and 600 s with road-vehicle,
pedestrian and static-asset PSDs and the TCXO clock) and 34 scalar updates: a coarse clock
measurement, pseudoranges from GPS, Galileo and BeiDou (the latter two with their
inter-system bias), Doppler range rates, an up-axis position constraint and one outlier
that the chi-square gate rejects. F and Q are written out here from the filter's model
equations (docs in engine/src/filter/), with the rotation east/north/up -> ECEF built from
explicit unit vectors, not from the engine's code:

  F: p += v dt, b += d dt
  Q_pp = A dt^3/3, Q_pv = A dt^2/2, Q_vv = A dt,  A = R' diag(qh, qh, qv) R,
     R rows: east, north, up at the position before the step; up = the WGS-84 ellipsoid
     normal as the gradient (x, y, z/(1 - e^2)) normalised, east = (-y, x, 0)/|.|,
     north = up x east
  Q_clock = c^2 [[Sf dt + Sg dt^3/3, Sg dt^2/2], [Sg dt^2/2, Sg dt]], Sf = h0/2,
     Sg = 2 pi^2 h-2 (Brown & Hwang's two-state clock model)
  Q_isb = q_isb dt on each inter-system bias

An update whose normalised innovation squared y^2/S exceeds its gate is written as gated
with the state unchanged (S = H P H' + R from numpy); every other goes through
filterpy's update and its NIS is filterpy's y^2/S.

Determinism: numpy's matrix products go through OpenBLAS, whose kernel is chosen for the
CPU at run time (with or without fused multiply-add), so the last bits of a product can
differ between machines. On x86-64 the script pins OpenBLAS to its baseline Nehalem kernel
(SSE only, present on every x86-64 CPU) and one thread before numpy is imported, so the
file is byte-identical wherever it is regenerated. Numbers are written with repr (shortest
round-trip, 17 significant digits at most).
"""
import math
import os
import platform
import random
import sys
from importlib.metadata import version

if platform.machine().lower() in ("x86_64", "amd64"):
    os.environ["OPENBLAS_CORETYPE"] = "Nehalem"
os.environ["OPENBLAS_NUM_THREADS"] = "1"

import numpy as np  # noqa: E402  (after the OpenBLAS settings)
from filterpy.kalman import KalmanFilter  # noqa: E402

N = 10
C = 299792458.0  # m/s (IS-GPS-200)
E2 = 0.00669437999014  # WGS-84 first eccentricity squared (NGA TR8350.2)
GATE_999 = 10.827566170662733  # chi2(1) 0.999 quantile (scipy.stats.chi2.ppf(0.999, 1))
GATE_95 = 3.841458820694124  # chi2(1) 0.95 quantile (scipy.stats.chi2.ppf(0.95, 1))
TCXO = (2e-19, 2e-20)  # h0 (s), h-2 (1/s): Brown & Hwang's TCXO row [from memory]
ISB_PSD = 1e-5  # m^2/s
ROAD = (5.0, 0.1)
PEDESTRIAN = (0.5, 0.05)
STATIC = (1e-4, 1e-4)


def enu_axes(p):
    """Rows east, north, up at ECEF position p (up: the ellipsoid's gradient there)."""
    x, y, z = p
    g = np.array([x, y, z / (1.0 - E2)])
    up = g / math.sqrt(float(g @ g))
    rho = math.hypot(x, y)
    east = np.array([-y / rho, x / rho, 0.0])
    north = np.cross(up, east)
    return np.array([east, north, up])


def transition(dt):
    f = np.eye(N)
    for k in range(3):
        f[k, 3 + k] = dt
    f[6, 7] = dt
    return f


def process_noise(p, dt, motion, clock, isb_psd):
    qh, qv = motion
    h0, hm2 = clock
    r = enu_axes(p)
    a = r.T @ np.diag([qh, qh, qv]) @ r
    q = np.zeros((N, N))
    q[0:3, 0:3] = a * dt**3 / 3.0
    q[0:3, 3:6] = a * dt**2 / 2.0
    q[3:6, 0:3] = a * dt**2 / 2.0
    q[3:6, 3:6] = a * dt
    sf = h0 / 2.0 * C * C
    sg = 2.0 * math.pi**2 * hm2 * C * C
    q[6, 6] = sf * dt + sg * dt**3 / 3.0
    q[6, 7] = q[7, 6] = sg * dt**2 / 2.0
    q[7, 7] = sg * dt
    q[8, 8] = q[9, 9] = isb_psd * dt
    return q


def los(p, az_deg, el_deg):
    """Unit vector receiver -> satellite, ECEF, for an azimuth and elevation at p."""
    az, el = math.radians(az_deg), math.radians(el_deg)
    enu = np.array([math.cos(el) * math.sin(az), math.cos(el) * math.cos(az), math.sin(el)])
    return enu_axes(p).T @ enu


def pseudorange_row(e, system):
    h = np.zeros(N)
    h[0:3] = -e
    h[6] = 1.0
    if system == "E":
        h[8] = 1.0
    elif system == "C":
        h[9] = 1.0
    return h


def range_rate_row(e):
    h = np.zeros(N)
    h[3:6] = -e
    h[7] = 1.0
    return h


def unit_row(k):
    h = np.zeros(N)
    h[k] = 1.0
    return h


def fmt(values):
    return ",".join(repr(float(v)) for v in values)


def main():
    rng = random.Random(8)
    out = sys.stdout
    out.write(
        f"# generator: tools/refvectors/gen_filter.py; library: filterpy {version('filterpy')} "
        f"(KalmanFilter.predict with explicit F and Q, KalmanFilter.update in Joseph form) with "
        f"numpy {version('numpy')} and scipy {version('scipy')}; OpenBLAS kernel pinned "
        f"(OPENBLAS_CORETYPE=Nehalem on x86-64, one thread)\n"
        "# command: cargo xtask vectors (python3 tools/refvectors/gen_filter.py > "
        "tools/refvectors/filter_filterpy.csv)\n"
        "# state: x, y, z (m), vx, vy, vz (m/s), clock bias (m), drift (m/s), ISB Galileo, ISB BeiDou (m)\n"
        "# rows (first field names the kind; then the state x (10) and P row by row (100) after the step):\n"
        "#   init,x,P\n"
        "#   predict,dt_s,accel_psd_horizontal,accel_psd_vertical,h0,h_minus2,isb_psd,x,P\n"
        "#   update,h (10),z,r,gate,outcome (applied|gated),nis,x,P   (innovation = z - h.x)\n"
    )

    x0 = np.array(
        [4177830.125, 853650.5, 4728360.75, 12.0, -3.5, 0.4, 98765.4321, 151.25, 11.5, -27.25]
    )
    p0 = np.diag([1e4, 1e4, 1e4, 100.0, 100.0, 100.0, 1e10, 2500.0, 100.0, 100.0])
    truth = x0 + np.array([60.0, -40.0, 80.0, 1.5, -0.8, 0.3, 3.0e4, -20.0, 4.0, -6.0])

    kf = KalmanFilter(dim_x=N, dim_z=1)
    kf.x = x0.reshape(N, 1).copy()
    kf.P = p0.copy()
    out.write(f"init,{fmt(kf.x.ravel())},{fmt(kf.P.ravel())}\n")

    def predict(dt, motion):
        nonlocal truth
        f = transition(dt)
        q = process_noise(kf.x.ravel()[0:3], dt, motion, TCXO, ISB_PSD)
        kf.predict(F=f, Q=q)
        truth = f @ truth
        params = [dt, motion[0], motion[1], TCXO[0], TCXO[1], ISB_PSD]
        out.write(f"predict,{fmt(params)},{fmt(kf.x.ravel())},{fmt(kf.P.ravel())}\n")

    def update(h, sigma, gate, outlier=0.0):
        r = sigma * sigma
        z = float(h @ truth) + rng.gauss(0.0, sigma) + outlier
        y = z - float(h @ kf.x.ravel())
        s = float(h @ kf.P @ h) + r
        nis = y * y / s
        if nis > gate:
            outcome = "gated"
        else:
            kf.update(np.array([[z]]), R=r, H=h.reshape(1, N))
            outcome = "applied"
            nis = float(kf.y[0, 0] ** 2 / kf.S[0, 0])
        out.write(
            f"update,{fmt(h)},{fmt([z, r, gate])},{outcome},{nis!r},"
            f"{fmt(kf.x.ravel())},{fmt(kf.P.ravel())}\n"
        )

    sky = [  # azimuth, elevation (degrees), system
        (15.0, 62.0, "G"),
        (95.0, 35.0, "G"),
        (170.0, 20.0, "G"),
        (250.0, 48.0, "E"),
        (310.0, 15.0, "E"),
        (45.0, 12.0, "C"),
        (205.0, 70.0, "C"),
        (290.0, 28.0, "G"),
    ]

    # Epoch 1 after a wake-up: coarse clock (1 km), pseudoranges (5 m), Dopplers (0.2 m/s).
    predict(1.0, ROAD)
    update(unit_row(6), 1000.0, GATE_999)
    p = kf.x.ravel()[0:3].copy()
    for az, el, sys_ in sky:
        update(pseudorange_row(los(p, az, el), sys_), 5.0, GATE_999)
    for az, el, _ in sky:
        update(range_rate_row(los(p, az, el)), 0.2, GATE_999)

    # Epoch 2: pseudoranges (3 m) with an 80 m outlier against a 95 % gate, a height
    # constraint (2 m) on the up axis.
    predict(5.0, ROAD)
    p = kf.x.ravel()[0:3].copy()
    for i, (az, el, sys_) in enumerate(sky):
        outlier = 80.0 if i == 4 else 0.0
        update(pseudorange_row(los(p, az + 3.0, el - 1.0), sys_), 3.0, GATE_95, outlier)
    up = np.zeros(N)
    up[0:3] = enu_axes(p)[2]
    update(up, 2.0, GATE_999)

    # Epoch 3 after 30 s on foot: four pseudoranges, four Dopplers (0.1 m/s).
    predict(30.0, PEDESTRIAN)
    p = kf.x.ravel()[0:3].copy()
    for az, el, sys_ in sky[0:4]:
        update(pseudorange_row(los(p, az + 10.0, el + 2.0), sys_), 3.0, GATE_999)
    for az, el, _ in sky[4:8]:
        update(range_rate_row(los(p, az + 10.0, el + 2.0)), 0.1, GATE_999)

    # Parked for ten minutes, then one epoch of four pseudoranges and two Dopplers.
    predict(600.0, STATIC)
    p = kf.x.ravel()[0:3].copy()
    for az, el, sys_ in sky[2:6]:
        update(pseudorange_row(los(p, az - 20.0, el + 5.0), sys_), 4.0, GATE_999)
    for az, el, _ in sky[6:8]:
        update(range_rate_row(los(p, az - 20.0, el + 5.0)), 0.1, GATE_999)


if __name__ == "__main__":
    main()
