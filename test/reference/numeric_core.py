"""Reference values for the core dense linear algebra (eigenvalues, singular values, ranks,
polynomial roots) from NumPy/SciPy (LAPACK dgeev, dgesdd; numpy.roots).

Writes test/fixtures/reference/numeric_core.json, which is checked in so CI needs no Python.
Run from the repository root:  python3 test/reference/numeric_core.py

Each eigenvalue comes with its condition number kappa = 1/|y^H x| (unit left/right eigenvectors
from scipy.linalg.eig of the balanced matrix), so the test can allow c*n*eps*||balanced A||*kappa. Rank-deficient matrices are
built as U diag(s) V^T with the discarded singular values far below max(m,n)*eps*s_max and the
kept ones far above it, so the expected rank is not borderline.
"""
import json
import os

import numpy as np
import scipy
import scipy.linalg as sla

rng = np.random.default_rng(20261202)


def sorted_eigs(values):
    return sorted(((float(v.real), float(v.imag)) for v in values), key=lambda p: (p[0], p[1]))


def eigen_case(a):
    # Conditioning is measured on the balanced matrix (scipy.linalg.matrix_balance, a diagonal
    # similarity), which is what a balancing eigensolver's error actually depends on.
    balanced, _ = sla.matrix_balance(a, permute=False)
    w, vl, vr = sla.eig(balanced, left=True, right=True)
    kappa = []
    for i in range(len(w)):
        x = vr[:, i] / np.linalg.norm(vr[:, i])
        y = vl[:, i] / np.linalg.norm(vl[:, i])
        kappa.append(float(1.0 / max(abs(np.vdot(y, x)), np.finfo(float).tiny)))
    order = sorted(range(len(w)), key=lambda i: (w[i].real, w[i].imag))
    return {
        "A": a.tolist(),
        "balancedNorm": float(np.linalg.norm(balanced)),
        "eigenvalues": [[float(w[i].real), float(w[i].imag)] for i in order],
        "kappa": [kappa[i] for i in order],
    }


def orthogonal(n):
    q, r = np.linalg.qr(rng.standard_normal((n, n)))
    return q * np.sign(np.diag(r))


eigen = []
for n in list(range(2, 13)) + [50, 50]:
    eigen.append(eigen_case(rng.standard_normal((n, n))))
# Badly scaled: D B D^-1 with D spanning 1e-6..1e6 (balancing must undo it).
n = 8
d = np.logspace(-6, 6, n)
eigen.append(eigen_case(np.diag(d) @ rng.standard_normal((n, n)) @ np.diag(1 / d)))

singular = []
for m, n in [(2, 2), (3, 5), (5, 3), (6, 6), (9, 4), (12, 12), (50, 50), (50, 30)]:
    a = rng.standard_normal((m, n))
    singular.append({"A": a.tolist(), "singularValues": np.linalg.svd(a, compute_uv=False).tolist()})

ranks = []
for m, n, r in [(4, 4, 2), (6, 3, 1), (5, 8, 3), (10, 10, 7), (12, 9, 2), (7, 7, 7)]:
    k = min(m, n)
    kept = np.logspace(0, -6, r) if r > 0 else np.array([])
    s = np.concatenate([kept, np.full(k - r, 1e-22)])
    a = orthogonal(m)[:, :k] @ np.diag(s) @ orthogonal(n)[:, :k].T
    ranks.append({"A": a.tolist(), "rank": int(np.linalg.matrix_rank(a)), "constructedRank": r})

polynomials = []
for degree in [2, 3, 4, 5, 6, 8]:
    p = rng.standard_normal(degree + 1)
    companion = np.diag(np.ones(degree - 1), -1)
    companion[0, :] = -p[1:] / p[0]
    case = eigen_case(companion)
    polynomials.append({"coefficients": p.tolist(), "roots": sorted_eigs(np.roots(p)), "kappa": case["kappa"],
                        "balancedNorm": case["balancedNorm"], "companionRoots": case["eigenvalues"]})

out = {
    "generator": "test/reference/numeric_core.py",
    "numpy": np.__version__,
    "scipy": scipy.__version__,
    "note": "scipy.linalg.eig (LAPACK dgeev) eigenvalues with condition numbers, numpy.linalg.svd singular values, "
            "numpy.linalg.matrix_rank, numpy.roots; seeded standard-normal matrices (default_rng(20261202)).",
    "eigen": eigen,
    "singular": singular,
    "ranks": ranks,
    "polynomials": polynomials,
}
path = os.path.join("test", "fixtures", "reference", "numeric_core.json")
with open(path, "w") as f:
    json.dump(out, f, separators=(",", ":"))
print("wrote", path)
