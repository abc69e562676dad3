#!/usr/bin/env python3
"""Reference vectors for the exported UTC time stamps, from astropy.

Usage: python3 gen_times.py > times_astropy.csv
astropy (a general-purpose astronomy library on PyPI, pinned in requirements.txt) converts
each GPS instant (week, time of week) to UTC with its bundled leap-second table; no network
access (IERS auto-download is switched off). For each instant the output gives GPS - UTC,
the ISO 8601 stamp with milliseconds (the CSV and GPX form), and the NMEA 0183 time
(hhmmss.ss) and date (ddmmyy) fields. Python formats those fields from astropy's calendar
values, independently of the exporter's own formatting.

The exporter uses a fixed GPS - UTC of 18 s, valid from 2017-01-01 00:00:00 UTC, so the
instants start exactly there; the second before it is the leap second 2016-12-31 23:59:60
UTC, which a fixed offset cannot express.
"""
import sys

from astropy.utils import iers

iers.conf.auto_download = False

import astropy  # noqa: E402
import erfa  # noqa: E402
from astropy.time import Time  # noqa: E402

try:
    from importlib.metadata import version

    iers_data = version("astropy-iers-data")
except Exception:  # pragma: no cover - the pinned install always has it
    iers_data = "unknown"

WEEK_S = 604800
# GPS instants (week, time of week in s), each with why it is here. Fractions are whole
# hundredths so that the NMEA field (2 decimals) and the ISO stamp (3 decimals) are exact.
INSTANTS = [
    (1930, 18.0, "first UTC second after the 2016-12-31 leap second; UTC year change"),
    (1930, 18.5, "half a second later"),
    (2047, 604799.0, "last second of GPS week 2047"),
    (2048, 0.0, "first second of GPS week 2048 (10-bit week number rolls over)"),
    (2048, 18.0, "UTC midnight 2019-04-07"),
    (2295, 86417.0, "last second of 2023 UTC"),
    (2295, 86418.0, "2024-01-01 00:00:00 UTC (CHECKS.md GPS time section)"),
    (2303, 390914.25, "leap day 2024-02-29"),
    (2359, 258318.0, "an ordinary evening in 2025"),
    (2399, 604799.75, "end of GPS week 2399"),
    (2400, 0.25, "start of GPS week 2400"),
]

# GPS - UTC = (TAI - UTC) - 19 s (GPS time is TAI - 19 s). TAI - UTC comes from the
# leap-second table astropy uses for its UTC conversions (erfa.dat, which astropy brings up
# to date from its bundled table on its first UTC conversion), on the UTC calendar day of
# the instant: unlike astropy's unix seconds it is not smeared across a leap-second day.


def gps_minus_utc(t):
    y, mo, d, h, mi, s = t.utc.ymdhms
    tai_utc = erfa.dat(y, mo, d, (h * 3600 + mi * 60 + s) / 86400.0)
    return round(float(tai_utc)) - 19


out = sys.stdout
out.write(
    f"# generator: tools/refvectors/gen_times.py; library: astropy {astropy.__version__} "
    f"with pyerfa {erfa.__version__} and astropy-iers-data {iers_data} (leap seconds bundled, no download)\n"
)
out.write("# command: python3 tools/refvectors/gen_times.py > tools/refvectors/times_astropy.csv\n")
# Outside the exporter's range, shown for the record: the leap second itself.
leap = Time(1930 * WEEK_S, 17.5, format="gps").utc
leap.precision = 3
before = Time(1930 * WEEK_S, 16.0, format="gps")
out.write(
    f"# not covered: GPS 1930/17.5 s is {leap.isot}Z UTC (inside the leap second); "
    f"GPS - UTC was {gps_minus_utc(before)} s before it\n"
)
out.write("# gps_week,tow_s,gps_minus_utc_s,utc_iso,nmea_time,nmea_date,note\n")
for week, tow, note in INSTANTS:
    t = Time(week * WEEK_S, tow, format="gps")
    u = t.utc
    y, mo, d, h, mi, s = u.ymdhms
    whole = int(s)
    centis = round((s - whole) * 100)
    millis = round((s - whole) * 1000)
    assert millis == 10 * centis, "instants must be whole hundredths of a second"
    iso = f"{y:04d}-{mo:02d}-{d:02d}T{h:02d}:{mi:02d}:{whole:02d}.{millis:03d}Z"
    # astropy's own ISO form of the same instant, as a cross-check of the fields above.
    u.precision = 3
    assert u.isot + "Z" == iso, (u.isot, iso)
    nmea_time = f"{h:02d}{mi:02d}{whole:02d}.{centis:02d}"
    nmea_date = f"{d:02d}{mo:02d}{y % 100:02d}"
    assert "," not in note
    out.write(f"{week},{tow},{gps_minus_utc(t)},{iso},{nmea_time},{nmea_date},{note}\n")
