#!/usr/bin/env python3
"""Reference vectors for WGS-84 ECEF <-> geodetic and azimuth/elevation, from pymap3d.

Usage: python3 gen_frames.py > frames_pymap3d.csv
pymap3d is a general-purpose geodesy library on PyPI; the version is pinned in
requirements.txt and recorded in the output header. Points are drawn from a fixed seed
and include the poles, the equator, the antimeridian and heights from -400 m to 20,000 km.
"""
import math
import random
import sys

import pymap3d

rng = random.Random(20201177)
points = []
# Fixed special places: poles, equator, antimeridian, extreme heights.
for lat in (90.0, -90.0, 0.0, 89.999999, -89.999999, 45.0):
    for lon in (0.0, 180.0, -180.0, 179.9999999, 90.0, -90.0):
        for h in (-400.0, 0.0, 1000.0, 20_000_000.0):
            points.append((lat, lon, h))
while len(points) < 1200:
    lat = math.degrees(math.asin(rng.uniform(-1.0, 1.0)))
    lon = rng.uniform(-180.0, 180.0)
    h = rng.choice([rng.uniform(-400.0, 9000.0), 10 ** rng.uniform(3.0, math.log10(2.0e7))])
    points.append((lat, lon, h))

out = sys.stdout
import numpy  # pymap3d computes with numpy when it is installed (it is, for astropy)

out.write(
    f"# generator: tools/refvectors/gen_frames.py; library: pymap3d {pymap3d.__version__} with numpy {numpy.__version__}\n"
)
out.write("# command: python3 tools/refvectors/gen_frames.py > tools/refvectors/frames_pymap3d.csv\n")
out.write("# lat_deg,lon_deg,h_m,x_m,y_m,z_m,lat2_deg,lon2_deg,h2_m,obs_lat_deg,obs_lon_deg,obs_h_m,az_deg,el_deg\n")
for i, (lat, lon, h) in enumerate(points):
    x, y, z = pymap3d.geodetic2ecef(lat, lon, h)
    lat2, lon2, h2 = pymap3d.ecef2geodetic(x, y, z)
    # An observer on or near the ground looking at the point (skip coincident pairs).
    olat = rng.uniform(-85.0, 85.0)
    olon = rng.uniform(-180.0, 180.0)
    oh = rng.uniform(-100.0, 3000.0)
    az, el, rng_m = pymap3d.ecef2aer(x, y, z, olat, olon, oh)
    out.write(
        ",".join(
            repr(float(v))
            for v in (lat, lon, h, x, y, z, lat2, lon2, h2, olat, olon, oh, az, el)
        )
        + "\n"
    )
