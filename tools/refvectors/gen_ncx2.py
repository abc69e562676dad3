#!/usr/bin/env python3
"""Non-centrality of the residual test's missed-detection bound, from scipy.stats.ncx2.

Usage: python3 gen_ncx2.py > ncx2_scipy.csv
scipy is a general-purpose scientific library on PyPI, pinned in requirements.txt. For a
χ² residual test with k degrees of freedom, threshold T = chi2.isf(pfa, k), and a missed-
detection probability pmd, the row gives λ such that ncx2.cdf(T, k, λ) = pmd (the
non-centrality a fault must reach to be detected with probability 1 − pmd; its square root
is the "pbias" of slope-based protection levels, Brown 1992). Solved with brentq to 1e-14
relative. Output is deterministic (repr of float64).
"""
import sys

import scipy
from scipy.optimize import brentq
from scipy.stats import chi2, ncx2

CASES = [(k, pfa, pmd) for k in (1, 2, 3, 4, 5, 6, 8, 12, 20) for (pfa, pmd) in
         ((6.667e-5, 1e-3), (1e-5, 1e-3), (1e-3, 1e-2), (3.333e-7, 1e-7))]

out = sys.stdout
out.write(f"# generator: tools/refvectors/gen_ncx2.py; library: scipy {scipy.__version__}\n")
out.write("# command: cargo xtask vectors (python3 tools/refvectors/gen_ncx2.py > tools/refvectors/ncx2_scipy.csv)\n")
out.write("# dof,pfa,pmd,threshold,lambda\n")
for k, pfa, pmd in CASES:
    t = chi2.isf(pfa, k)
    lam = brentq(lambda l: ncx2.cdf(t, k, l) - pmd, 1e-6, 1e4, xtol=1e-14, rtol=1e-14, maxiter=500)
    out.write(f"{k},{pfa!r},{pmd!r},{float(t)!r},{float(lam)!r}\n")
