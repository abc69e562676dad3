#!/usr/bin/env python3
"""Chi-square quantiles for the consistency tests (NEES, NIS) and the integrity thresholds,
from scipy.stats.

Usage: python3 gen_chi2.py > chi2_scipy.csv
scipy is a general-purpose scientific library on PyPI, pinned in requirements.txt. Each row
gives the degrees of freedom and the 0.025 and 0.975 quantiles (`chi2.ppf`), and the upper
tail points `chi2.isf` at the false-alarm probabilities 6.667e-5 and 3.333e-7 (CHECKS.md's
integrity table), and the 0.999 quantile (the filter's divergence test). Output is deterministic (repr of float64).
"""
import sys

import scipy
from scipy.stats import chi2

# Degrees of freedom: 1-6 (integrity table), 150 and 300 (CHECKS.md's n = 3 and n = 6 over
# N = 50 runs), 500 (n = 10 states over 50 runs: the filter's NEES), 800 (16 scalar updates
# over 50 runs: the filter's NIS), 8000 (n = 8 over 1000 runs).
# 8, 20, 50, 100, 200: the range of the filter's divergence window (filter/window.rs).
DOFS = [1, 2, 3, 4, 5, 6, 8, 20, 50, 100, 150, 200, 300, 500, 800, 8000]

out = sys.stdout
out.write(f"# generator: tools/refvectors/gen_chi2.py; library: scipy {scipy.__version__}\n")
out.write("# command: cargo xtask vectors (python3 tools/refvectors/gen_chi2.py > tools/refvectors/chi2_scipy.csv)\n")
out.write("# dof,ppf_0.025,ppf_0.975,isf_6.667e-5,isf_3.333e-7,ppf_0.999\n")
for k in DOFS:
    row = [chi2.ppf(0.025, k), chi2.ppf(0.975, k), chi2.isf(6.667e-5, k), chi2.isf(3.333e-7, k), chi2.ppf(0.999, k)]
    out.write(f"{k}," + ",".join(repr(float(v)) for v in row) + "\n")
