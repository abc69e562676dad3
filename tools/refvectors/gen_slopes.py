#!/usr/bin/env python3
"""Slopes of the weighted least-squares residual test, from numpy: the reference for
engine/src/integrity/slope.rs.

Usage: python3 gen_slopes.py > slopes_numpy.csv
For random geometries (seeded: unit lines of sight above 5 degrees in east/north/up, one
receiver clock per system present, weights 1/sigma^2), numpy builds the full matrices the
textbook way: G (n x (3 + systems)), W = diag(w), A = (G^T W G)^-1 G^T W, the hat matrix
P = G A, and per satellite the horizontal slope sqrt((A_Ei^2 + A_Ni^2) / (w_i (1 - P_ii)))
and the vertical slope |A_Ui| / sqrt(w_i (1 - P_ii)) (Brown 1992; Parkinson & Axelrad
1988): the position error per unit square root of the non-centrality a bias on satellite i
gives the weighted residual test. Rows: case, satellite, e, n, u, system, weight,
slope_h, slope_v ("inf" for a satellite whose residual is always zero, the only one of its
system). numpy is pinned in requirements.txt; OpenBLAS is pinned to its baseline
kernel and one thread for byte-identical output (see gen_filter.py).
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

rng = random.Random(20261202)
out = sys.stdout
out.write(f"# generator: tools/refvectors/gen_slopes.py; library: numpy {version('numpy')}\n")
out.write("# command: cargo xtask vectors (python3 tools/refvectors/gen_slopes.py > tools/refvectors/slopes_numpy.csv)\n")
out.write("# case,satellite,e,n,u,system,weight,slope_h,slope_v,residual,sse,sse_without,shift_e,shift_n,shift_u\n")
for case in range(40):
    n = rng.randint(5, 12)
    systems = [rng.randrange(3) if case % 3 else 0 for _ in range(n)]
    present = sorted(set(systems))
    rows, weights = [], []
    for i in range(n):
        el = math.radians(rng.uniform(5.0, 89.0))
        az = math.radians(rng.uniform(0.0, 360.0))
        u = [math.cos(el) * math.sin(az), math.cos(el) * math.cos(az), math.sin(el)]
        sigma = 0.3 + 0.3 / math.sin(el) + rng.uniform(0.0, 1.0)
        rows.append(u)
        weights.append(1.0 / sigma ** 2)
    if n < 3 + len(present) + 1:
        continue
    G = np.zeros((n, 3 + len(present)))
    for i in range(n):
        G[i, :3] = [-c for c in rows[i]]
        G[i, 3 + present.index(systems[i])] = 1.0
    W = np.diag(weights)
    A = np.linalg.inv(G.T @ W @ G) @ G.T @ W
    P = G @ A
    # Measurements: a truth plus noise of each sigma; the full solution and its residuals.
    x_true = np.array([rng.uniform(-5, 5) for _ in range(G.shape[1])])
    z = G @ x_true + np.array([rng.gauss(0.0, 1.0) / math.sqrt(w) for w in weights])
    x_hat = A @ z
    v = z - G @ x_hat
    sse = float(sum(weights[i] * v[i] ** 2 for i in range(n)))
    for i in range(n):
        # Leave-one-out by an explicit re-solve (nan where removing it leaves a clock
        # without a satellite).
        keep = [j for j in range(n) if j != i]
        Gk, Wk, zk = G[keep], np.diag([weights[j] for j in keep]), z[keep]
        cols = [c for c in range(G.shape[1]) if np.any(Gk[:, c] != 0.0)]
        if len(cols) < G.shape[1] or len(keep) < len(cols):
            sse_wo, shift = math.nan, [math.nan] * 3
        else:
            xk = np.linalg.solve(Gk.T @ Wk @ Gk, Gk.T @ Wk @ zk)
            vk = zk - Gk @ xk
            sse_wo = float(vk @ Wk @ vk)
            shift = [float(xk[c] - x_hat[c]) for c in range(3)]
        d = weights[i] * (1.0 - P[i, i])
        if 1.0 - P[i, i] < 1e-9:
            # Its residual is always zero (the only satellite of its system): a bias on it
            # cannot be detected, whatever its size.
            sh = sv = math.inf
        else:
            sh = math.sqrt((A[0, i] ** 2 + A[1, i] ** 2) / d)
            sv = abs(A[2, i]) / math.sqrt(d)
        e, nn, u = rows[i]
        out.write(
            f"{case},{i},{e!r},{nn!r},{u!r},{systems[i]},{weights[i]!r},{float(sh)!r},{float(sv)!r},"
            f"{float(v[i])!r},{sse!r},{sse_wo!r},{shift[0]!r},{shift[1]!r},{shift[2]!r}\n"
        )
