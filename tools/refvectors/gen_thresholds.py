#!/usr/bin/env python3
"""The engine's built-in threshold table for its default probabilities, from scipy.

Usage: python3 gen_thresholds.py > thresholds_default.csv
For the default false-alarm probability 0.002/30 per epoch (US National Research Council
1995, Table 1, via ../shared/CHECKS.md) and the default integrity risk 1e-3, each row gives,
for 1 to 60 degrees of freedom, the residual-test threshold T = chi2.isf(pfa, k) and the
non-centrality λ with ncx2.cdf(T, k, λ) = pmd (brentq to 1e-14 relative). The last row
(dof 0) gives the two-sided normal quantile of the integrity risk, norm.isf(pmd / 2).
scipy is pinned in requirements.txt. Output is deterministic (repr of float64).
"""
import sys

import scipy
from scipy.optimize import brentq
from scipy.stats import chi2, ncx2, norm

PFA = 0.002 / 30.0
PMD = 1e-3

out = sys.stdout
out.write(f"# generator: tools/refvectors/gen_thresholds.py; library: scipy {scipy.__version__}\n")
out.write("# command: cargo xtask vectors (python3 tools/refvectors/gen_thresholds.py > tools/refvectors/thresholds_default.csv)\n")
out.write(f"# pfa {PFA!r}, pmd {PMD!r}\n")
out.write("# dof,threshold,lambda (dof 0: the normal quantile of pmd/2 in the threshold column)\n")
for k in range(1, 61):
    t = chi2.isf(PFA, k)
    lam = brentq(lambda l: ncx2.cdf(t, k, l) - PMD, 1e-6, 1e4, xtol=1e-14, rtol=1e-14, maxiter=500)
    out.write(f"{k},{float(t)!r},{float(lam)!r}\n")
out.write(f"0,{float(norm.isf(PMD / 2))!r},0.0\n")
