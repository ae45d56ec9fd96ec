"""Reference values for the control analyses (placement, transfer functions, structure, DC gain).

Writes test/fixtures/reference/control_placement.json (checked in so CI needs no Python).
Run from the repository root:  python3 test/reference/control_placement.py

Only trustworthy cases are written: placement plants are controllable with a comfortable PBH
margin, SciPy's achieved poles must match the request to 1e-8 relative, and the eigenvector
condition of its closed loop is recorded so tests can scale their tolerances.
"""
import json
import warnings
import os

import numpy as np
import scipy.signal as sig

rng = np.random.default_rng(20261202)
warnings.simplefilter("ignore", UserWarning)  # KNV0 non-convergence notes; accuracy is checked below
EPS = np.finfo(float).eps


def pbh_margin(a, b):
    n = a.shape[0]
    scale = np.linalg.norm(np.hstack([a, b]))
    return min(np.linalg.svd(np.hstack([a - lam * np.eye(n), b]), compute_uv=False)[-1] for lam in np.linalg.eigvals(a)) / scale


def random_poles(n, rng):
    poles = []
    while len(poles) < n:
        if n - len(poles) >= 2 and rng.random() < 0.4:
            re, im = -rng.uniform(0.5, 4), rng.uniform(0.3, 3)
            poles += [complex(re, im), complex(re, -im)]
        else:
            poles.append(complex(-rng.uniform(0.5, 6), 0))
    return poles


placement = []
for n in range(2, 13):
    for m in (1, 2, 3):
        if m > n:
            continue
        for _ in range(20):
            a = rng.uniform(-1, 1, (n, n))
            b = rng.uniform(-1, 1, (n, m))
            if pbh_margin(a, b) < 1e-2:
                continue
            poles = random_poles(n, rng)
            try:
                result = sig.place_poles(a, b, np.array(poles), method="KNV0" if m > 1 else "YT")
            except Exception:
                continue
            k = result.gain_matrix
            achieved = np.linalg.eigvals(a - b @ k)
            w, v = np.linalg.eig(a - b @ k)
            v = v / np.linalg.norm(v, axis=0)
            kappa = np.linalg.cond(v)
            err = max(min(abs(x - p) for x in achieved) / abs(p) for p in poles)
            if err > 1e-8 or kappa > 1e6:
                continue
            placement.append({
                "A": a.tolist(), "B": b.tolist(),
                "poles": [[p.real, p.imag] for p in poles],
                "gain": k.tolist(),
                "achieved": [[x.real, x.imag] for x in achieved],
                "eigenvectorCondition": float(kappa),
            })
            break

transfer = []
for n in range(1, 7):
    for (p, m) in ((1, 1), (2, 1), (1, 2), (2, 2)):
        a = rng.uniform(-2, 2, (n, n))
        b = rng.uniform(-1, 1, (n, m))
        c = rng.uniform(-1, 1, (p, n))
        d = rng.uniform(-1, 1, (p, m)) * (rng.random() < 0.5)
        pairs = []
        for j in range(m):
            num, den = sig.ss2tf(a, b, c, d, input=j)
            for i in range(p):
                pairs.append({"output": i, "input": j, "numerator": num[i].tolist(), "denominator": den.tolist()})
        transfer.append({"A": a.tolist(), "B": b.tolist(), "C": c.tolist(), "D": d.tolist(), "pairs": pairs})

structure = []
for n in range(2, 9):
    for m in (1, 2):
        for target in (n, max(1, n - 1), max(1, n - 2)):
            if target > n:
                continue
            # Block-triangular pair with a controllable (target)-dimensional part, then rotated.
            a11 = rng.uniform(-1, 1, (target, target))
            b1 = rng.uniform(-1, 1, (target, m))
            a12 = rng.uniform(-1, 1, (target, n - target))
            a22 = rng.uniform(-1, 1, (n - target, n - target))
            a = np.block([[a11, a12], [np.zeros((n - target, target)), a22]])
            b = np.vstack([b1, np.zeros((n - target, m))])
            q, _ = np.linalg.qr(rng.normal(size=(n, n)))
            a = q @ a @ q.T
            b = q @ b
            ctrb = np.hstack([np.linalg.matrix_power(a, k) @ b for k in range(n)])
            s = np.linalg.svd(ctrb, compute_uv=False)
            rank = int(np.sum(s > s[0] * 1e-10))
            if rank != target or (target < n and s[target - 1] < 1e-6 * s[0]):
                continue
            structure.append({"A": a.tolist(), "B": b.tolist(), "controllableDimension": rank})

dc = []
for n in range(1, 7):
    for (p, m) in ((1, 1), (2, 2), (1, 2)):
        a = rng.uniform(-1, 1, (n, n))
        b = rng.uniform(-1, 1, (n, m))
        c = rng.uniform(-1, 1, (p, n))
        d = rng.uniform(-0.5, 0.5, (p, m))
        if pbh_margin(a, b) < 1e-2:
            continue
        k = sig.place_poles(a, b, -np.arange(1.0, n + 1) * 0.7 - 0.3).gain_matrix
        acl = a - b @ k
        g = (c - d @ k) @ np.linalg.solve(-acl, b) + d
        dc.append({"A": a.tolist(), "B": b.tolist(), "C": c.tolist(), "D": d.tolist(), "K": k.tolist(),
                   "dcGain": g.tolist(), "condition": float(np.linalg.cond(acl))})

out = {
    "generator": "test/reference/control_placement.py",
    "numpy": np.__version__,
    "placement": placement,
    "transfer": transfer,
    "structure": structure,
    "dcGain": dc,
}
path = os.path.join("test", "fixtures", "reference", "control_placement.json")
with open(path, "w") as f:
    json.dump(out, f, indent=1)
print(len(placement), "placement;", len(transfer), "transfer;", len(structure), "structure;", len(dc), "dc")
