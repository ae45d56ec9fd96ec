"""Reference values for the numeric solvers (expm, Lyapunov, Riccati) from SciPy.

Writes test/fixtures/reference/numeric_solvers.json, which is checked in so CI needs no Python.
Run from the repository root:  python3 test/reference/numeric_solvers.py

Only cases where SciPy's answer is trustworthy are written: every Riccati case is checked for
stabilisability of (A, B) (PBH test on the unstable eigenvalues), Q is positive definite (so
every pair is detectable), the Hamiltonian / symplectic spectrum is kept away from the
imaginary axis / unit circle, and SciPy's own normalised residual must be small.
"""
import json
import os

import numpy as np
import scipy
import scipy.linalg as sla

EPS = np.finfo(float).eps
rng = np.random.default_rng(20261202)


def stabilisable(a, b, discrete):
    n = a.shape[0]
    for lam in np.linalg.eigvals(a):
        unstable = abs(lam) >= 1 - 1e-8 if discrete else lam.real >= -1e-8
        if unstable:
            pbh = np.hstack([a - lam * np.eye(n), b])
            if np.linalg.matrix_rank(pbh) < n:
                return False
    return True


def care_residual(a, b, q, r, x):
    g = b @ np.linalg.solve(r, b.T)
    res = a.T @ x + x @ a - x @ g @ x + q
    den = np.linalg.norm(q) + 2 * np.linalg.norm(a) * np.linalg.norm(x) + np.linalg.norm(x) ** 2 * np.linalg.norm(g)
    return np.linalg.norm(res) / den


def dare_residual(a, b, q, r, x):
    s = r + b.T @ x @ b
    res = a.T @ x @ a - x - a.T @ x @ b @ np.linalg.solve(s, b.T @ x @ a) + q
    den = np.linalg.norm(q) + np.linalg.norm(x) + np.linalg.norm(a) ** 2 * np.linalg.norm(x) * (
        1 + np.linalg.norm(b) ** 2 * np.linalg.norm(x) * np.linalg.norm(np.linalg.inv(s)))
    return np.linalg.norm(res) / den


def care_condition(a, b, q, r, x):
    # ‖Ω⁻¹(I)‖·(‖Q‖ + 2‖A‖‖X‖ + ‖G‖‖X‖²)/‖X‖, Ω(Z) = AcᵀZ + Z·Ac — the estimate the TypeScript solver reports.
    g = b @ np.linalg.solve(r, b.T)
    ac = a - g @ x
    h = sla.solve_continuous_lyapunov(ac.T, -np.eye(a.shape[0]))
    nx = np.linalg.norm(x)
    return np.linalg.norm(h) * (np.linalg.norm(q) + 2 * np.linalg.norm(a) * nx + np.linalg.norm(g) * nx ** 2) / nx


def dare_condition(a, b, q, r, x):
    g = b @ np.linalg.solve(r, b.T)
    ac = a - b @ np.linalg.solve(r + b.T @ x @ b, b.T @ x @ a)
    h = sla.solve_discrete_lyapunov(ac.T, np.eye(a.shape[0]))
    nx, na = np.linalg.norm(x), np.linalg.norm(a)
    return np.linalg.norm(h) * (np.linalg.norm(q) + na ** 2 * nx * (1 + np.linalg.norm(g) * nx)) / nx


# Random single-input systems of higher order are often nearly uncontrollable, which makes X huge
# and the comparison meaningless (any answer agrees to within κ·ε ≈ 1). Such draws are skipped.
CONDITION_LIMIT = 1e8


def spd(n, scale=1.0):
    m = rng.standard_normal((n, n))
    return scale * (m @ m.T / n + 0.5 * np.eye(n))


def rows(m):
    return [[float(v) for v in row] for row in np.atleast_2d(m)]


cases = []
for n in range(2, 13):
    for m in (1, 2, 3):
        if m > n:
            continue
        for attempt in range(200):
            a = rng.standard_normal((n, n)) * (1.0 / np.sqrt(n)) * 1.5
            b = rng.standard_normal((n, m))
            q = spd(n)
            r = spd(m)
            if not (stabilisable(a, b, False) and stabilisable(a, b, True)):
                continue
            x_c = sla.solve_continuous_are(a, b, q, r)
            x_d = sla.solve_discrete_are(a, b, q, r)
            if care_residual(a, b, q, r, x_c) > 1e3 * EPS * n or dare_residual(a, b, q, r, x_d) > 1e3 * EPS * n:
                continue
            if care_condition(a, b, q, r, x_c) > CONDITION_LIMIT or dare_condition(a, b, q, r, x_d) > CONDITION_LIMIT:
                continue
            k_c = np.linalg.solve(r, b.T @ x_c)
            k_d = np.linalg.solve(r + b.T @ x_d @ b, b.T @ x_d @ a)
            if np.max(np.linalg.eigvals(a - b @ k_c).real) >= 0:
                continue
            if np.max(np.abs(np.linalg.eigvals(a - b @ k_d))) >= 1:
                continue
            # Continuous Lyapunov on a stable shift of A; discrete Lyapunov on a contractive scaling.
            a_stable = a - (np.max(np.linalg.eigvals(a).real) + 0.5) * np.eye(n)
            a_schur = a / (np.max(np.abs(np.linalg.eigvals(a))) * 1.25)
            lyap_c = sla.solve_continuous_lyapunov(a_stable, -q)   # a X + X a^T = -q
            lyap_d = sla.solve_discrete_lyapunov(a_schur, q)       # a X a^T - X + q = 0
            t = 0.7
            cases.append({
                'n': n, 'm': m,
                'A': rows(a), 'B': rows(b), 'Q': rows(q), 'R': rows(r),
                'careX': rows(x_c), 'dareX': rows(x_d),
                'expmT': t, 'expmAT': rows(sla.expm(a * t)),
                'lyapContinuousA': rows(a_stable), 'lyapContinuousX': rows(lyap_c),
                'lyapDiscreteA': rows(a_schur), 'lyapDiscreteX': rows(lyap_d),
            })
            break

# Generalised eigenvalues (scipy.linalg.eigvals(A, B), LAPACK QZ): regular pencils with B
# invertible, with B of reduced rank (infinite eigenvalues), and square Rosenbrock pencils
# [A B; C D] − λ[I 0; 0 0] whose finite eigenvalues are the invariant zeros.
pencils = []
for n in range(1, 11):
    a = rng.standard_normal((n, n))
    b = rng.standard_normal((n, n))
    rank = max(0, n - 1 - n // 3)
    b_singular = rng.standard_normal((n, rank)) @ rng.standard_normal((rank, n)) if rank > 0 else np.zeros((n, n))
    for kind, bb in (('regular', b), ('singularB', b_singular)):
        w = sla.eigvals(a, bb, homogeneous_eigvals=True)
        alpha, beta = w
        finite = [complex(x / y) for x, y in zip(alpha, beta) if abs(y) > 1e-8 * abs(x) * np.linalg.norm(bb) / max(np.linalg.norm(a), 1e-300)]
        pencils.append({'kind': kind, 'A': rows(a), 'B': rows(bb), 'infiniteCount': n - len(finite),
                        'finite': [[z.real, z.imag] for z in finite]})
for n, m in ((2, 1), (3, 1), (4, 2), (5, 2), (6, 3)):
    a = rng.standard_normal((n, n)); b = rng.standard_normal((n, m))
    c = rng.standard_normal((m, n)); d = np.zeros((m, m)) if n % 2 else rng.standard_normal((m, m))
    big_a = np.block([[a, b], [c, d]])
    big_e = np.block([[np.eye(n), np.zeros((n, m))], [np.zeros((m, n)), np.zeros((m, m))]])
    alpha, beta = sla.eigvals(big_a, big_e, homogeneous_eigvals=True)
    finite = [complex(x / y) for x, y in zip(alpha, beta) if abs(y) > 1e-8 * abs(x)]
    pencils.append({'kind': 'rosenbrock', 'A': rows(big_a), 'B': rows(big_e), 'infiniteCount': n + m - len(finite),
                    'finite': [[z.real, z.imag] for z in finite]})

# Sylvester equations A·X + X·B = C (scipy.linalg.solve_sylvester, Bartels–Stewart in LAPACK
# dtrsyl), rectangular, with spectra of A and −B kept apart.
sylvester = []
for n, m in ((1, 1), (2, 3), (4, 4), (6, 2), (9, 7)):
    a = rng.standard_normal((n, n)) + 2.5 * np.eye(n)
    b = rng.standard_normal((m, m)) + 2.5 * np.eye(m)
    c = rng.standard_normal((n, m))
    sylvester.append({'A': rows(a), 'B': rows(b), 'C': rows(c), 'X': rows(sla.solve_sylvester(a, b, c))})

# Riccati equations with a cross term N (argument s of SciPy's solvers); N is small enough that
# Q − N·R⁻¹·Nᵀ stays positive definite, so the folded problem is well posed.
cross = []
for n, m in ((3, 1), (5, 2), (8, 3)):
    for attempt in range(200):
        a = rng.standard_normal((n, n)) / np.sqrt(n)
        b = rng.standard_normal((n, m))
        q = spd(n)
        r = spd(m)
        nn = 0.2 * rng.standard_normal((n, m))
        if np.min(np.linalg.eigvalsh(q - nn @ np.linalg.solve(r, nn.T))) <= 0.05:
            continue
        abar = a - b @ np.linalg.solve(r, nn.T)
        if not (stabilisable(abar, b, False) and stabilisable(abar, b, True)):
            continue
        x_c = sla.solve_continuous_are(a, b, q, r, s=nn)
        x_d = sla.solve_discrete_are(a, b, q, r, s=nn)
        qbar = q - nn @ np.linalg.solve(r, nn.T)
        if care_residual(abar, b, qbar, r, x_c) > 1e3 * EPS * n or dare_residual(abar, b, qbar, r, x_d) > 1e3 * EPS * n:
            continue
        if care_condition(abar, b, qbar, r, x_c) > CONDITION_LIMIT or dare_condition(abar, b, qbar, r, x_d) > CONDITION_LIMIT:
            continue
        cross.append({'n': n, 'm': m, 'A': rows(a), 'B': rows(b), 'Q': rows(q), 'R': rows(r), 'N': rows(nn),
                      'careX': rows(x_c), 'dareX': rows(x_d)})
        break

out = {
    'generator': 'test/reference/numeric_solvers.py',
    'scipy': scipy.__version__, 'numpy': np.__version__,
    'note': 'scipy.linalg solve_continuous_are, solve_discrete_are, expm, solve_continuous_lyapunov, '
            'solve_discrete_lyapunov on seeded random stabilisable systems; Q, R positive definite.',
    'cases': cases,
    'pencils': pencils,
    'sylvester': sylvester,
    'crossTerm': cross,
}
path = os.path.join(os.path.dirname(__file__), '..', 'fixtures', 'reference', 'numeric_solvers.json')
with open(path, 'w') as f:
    json.dump(out, f, separators=(',', ':'))
print(f'wrote {len(cases)} cases')
