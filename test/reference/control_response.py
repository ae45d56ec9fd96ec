"""Reference values for the control analyses (discretisation, LQR, Kalman, sampled cost, step response).

Writes test/fixtures/reference/control_response.json, checked in so CI needs no Python.
Run from the repository root:  python3 test/reference/control_response.py

Sources (all SciPy / NumPy, seeded):
  - zero-order hold: scipy.signal.cont2discrete(..., method='zoh') for random systems n = 2..12;
  - LQR gains: scipy.linalg.solve_continuous_are / solve_discrete_are (with and without a cross
    weight N); only stabilisable (A, B) with Q - N R^-1 N^T positive definite (so every pair is
    detectable), and only where SciPy's normalised residual is small and the closed loop is stable;
  - Kalman gains by duality: the filter Riccati equation is the control one for (A^T, C^T, G W G^T, V);
  - sampled continuous cost (Van Loan 1978): expm of the 2(n+m) block matrix
    [[-F^T, Qc], [0, F]] with F = [[A, B], [0, 0]], Qc = [[Q, N], [N^T, R]]; cross-checked in this
    script by adaptive quadrature (scipy.integrate.quad_vec) of exp(F^T t) Qc exp(F t) over [0, T];
  - step responses: scipy.signal.lsim of the closed loop (A - B K, B Nr, C - D K, D Nr) to a step
    (small loops; and random stable loops of 30 and 64 states, section stepResponseLarge);
  - frequency responses: C (jwI - A)^-1 B + D by numpy.linalg.solve (LAPACK zgesv).
"""
import json
import os

import numpy as np
import scipy
import scipy.integrate as sint
import scipy.linalg as sla
import scipy.signal as sig

EPS = np.finfo(float).eps
rng = np.random.default_rng(20261203)


def rows(m):
    return [[float(v) for v in row] for row in np.atleast_2d(m)]


def spd(n, scale=1.0):
    m = rng.standard_normal((n, n))
    return scale * (m @ m.T / n + 0.5 * np.eye(n))


def stabilisable(a, b, discrete):
    n = a.shape[0]
    for lam in np.linalg.eigvals(a):
        unstable = abs(lam) >= 1 - 1e-8 if discrete else lam.real >= -1e-8
        if unstable:
            pbh = np.hstack([a - lam * np.eye(n), b])
            if np.linalg.matrix_rank(pbh) < n:
                return False
    return True


def care_residual(a, b, q, r, x, s):
    g = b @ np.linalg.solve(r, b.T)
    k = np.linalg.solve(r, b.T @ x + s.T)
    res = a.T @ x + x @ a - (x @ b + s) @ k + q
    den = np.linalg.norm(q) + 2 * np.linalg.norm(a) * np.linalg.norm(x) + np.linalg.norm(x) ** 2 * np.linalg.norm(g)
    return np.linalg.norm(res) / den


def dare_residual(a, b, q, r, x, s):
    h = r + b.T @ x @ b
    res = a.T @ x @ a - x - (a.T @ x @ b + s) @ np.linalg.solve(h, b.T @ x @ a + s.T) + q
    den = np.linalg.norm(q) + np.linalg.norm(x) + np.linalg.norm(a) ** 2 * np.linalg.norm(x) * (
        1 + np.linalg.norm(b) ** 2 * np.linalg.norm(x) * np.linalg.norm(np.linalg.inv(h)))
    return np.linalg.norm(res) / den


def sampled_cost(a, b, q, r, nn, t):
    n, m = b.shape
    f = np.zeros((n + m, n + m))
    f[:n, :n] = a
    f[:n, n:] = b
    qc = np.block([[q, nn], [nn.T, r]])
    big = np.block([[-f.T, qc], [np.zeros_like(f), f]])
    e = sla.expm(big * t)
    k = n + m
    phi_f = e[k:, k:]
    w = phi_f.T @ e[:k, k:]
    w = (w + w.T) / 2
    # Independent check: quadrature of exp(F^T s) Qc exp(F s) over [0, T].
    quad, _ = sint.quad_vec(lambda s: sla.expm(f.T * s) @ qc @ sla.expm(f * s), 0, t, epsabs=1e-13, epsrel=1e-12)
    assert np.linalg.norm(quad - w) <= 1e-9 * max(1.0, np.linalg.norm(w)), 'Van Loan and quadrature disagree'
    return w[:n, :n], w[n:, n:], w[:n, n:]


# ------------------------------------------------------------------ zero-order hold
zoh = []
for n in range(2, 13):
    m = 1 + (n % 3)
    a = rng.standard_normal((n, n)) * 1.2 / np.sqrt(n)
    b = rng.standard_normal((n, m))
    c = rng.standard_normal((1, n))
    d = np.zeros((1, m))
    t = float(rng.uniform(0.05, 0.8))
    phi, gamma, *_ = sig.cont2discrete((a, b, c, d), t, method='zoh')
    zoh.append({'n': n, 'm': m, 'T': t, 'A': rows(a), 'B': rows(b), 'Phi': rows(phi), 'Gamma': rows(gamma)})

# ------------------------------------------------------------------ LQR (continuous and discrete)
lqr = []
for n in range(2, 11):
    for with_cross in (False, True):
        m = 1 + (n % 2) + (1 if with_cross else 0)
        for attempt in range(60):
            a = rng.standard_normal((n, n)) * 1.3 / np.sqrt(n)
            b = rng.standard_normal((n, m))
            q0 = spd(n)
            r = spd(m)
            nn = 0.3 * rng.standard_normal((n, m)) if with_cross else np.zeros((n, m))
            q = q0 + nn @ np.linalg.solve(r, nn.T)  # Q - N R^-1 N^T = q0, positive definite
            if not (stabilisable(a, b, False) and stabilisable(a, b, True)):
                continue
            xc = sla.solve_continuous_are(a, b, q, r, s=nn)
            xd = sla.solve_discrete_are(a, b, q, r, s=nn)
            if care_residual(a, b, q, r, xc, nn) > 1e3 * EPS * n or dare_residual(a, b, q, r, xd, nn) > 1e3 * EPS * n:
                continue
            kc = np.linalg.solve(r, b.T @ xc + nn.T)
            kd = np.linalg.solve(r + b.T @ xd @ b, b.T @ xd @ a + nn.T)
            if np.max(np.linalg.eigvals(a - b @ kc).real) >= 0 or np.max(np.abs(np.linalg.eigvals(a - b @ kd))) >= 1:
                continue
            lqr.append({'n': n, 'm': m, 'A': rows(a), 'B': rows(b), 'Q': rows(q), 'R': rows(r),
                        'N': rows(nn) if with_cross else None,
                        'continuousX': rows(xc), 'continuousK': rows(kc),
                        'discreteX': rows(xd), 'discreteK': rows(kd)})
            break

# ------------------------------------------------------------------ Kalman by duality
kalman = []
for n in range(2, 9):
    p = 1 + (n % 2)
    d = 1 + (n % 3)
    for attempt in range(60):
        a = rng.standard_normal((n, n)) * 1.3 / np.sqrt(n)
        c = rng.standard_normal((p, n))
        g = rng.standard_normal((n, d))
        w = spd(d)
        v = spd(p, 0.5)
        qn = g @ w @ g.T + 1e-1 * np.eye(n)  # keeps (A, process noise) controllable
        if not (stabilisable(a.T, c.T, False) and stabilisable(a.T, c.T, True)):
            continue
        pc = sla.solve_continuous_are(a.T, c.T, qn, v)
        pd = sla.solve_discrete_are(a.T, c.T, qn, v)
        z = np.zeros((n, p))
        if care_residual(a.T, c.T, qn, v, pc, z) > 1e3 * EPS * n or dare_residual(a.T, c.T, qn, v, pd, z) > 1e3 * EPS * n:
            continue
        lc = pc @ c.T @ np.linalg.inv(v)
        innovation = c @ pd @ c.T + v
        lp = a @ pd @ c.T @ np.linalg.inv(innovation)
        mc = pd @ c.T @ np.linalg.inv(innovation)
        if np.max(np.linalg.eigvals(a - lc @ c).real) >= 0 or np.max(np.abs(np.linalg.eigvals(a - lp @ c))) >= 1:
            continue
        kalman.append({'n': n, 'p': p, 'd': d, 'A': rows(a), 'C': rows(c), 'G': rows(g), 'W': rows(w), 'V': rows(v),
                       'stateNoiseExtra': 1e-1,
                       'continuousP': rows(pc), 'continuousL': rows(lc),
                       'discreteP': rows(pd), 'predictorL': rows(lp), 'currentM': rows(mc)})
        break

# ------------------------------------------------------------------ sampled continuous cost (Van Loan 1978)
sampled = []
for n in (2, 3, 5, 8):
    m = 1 + (n % 2)
    a = rng.standard_normal((n, n)) / np.sqrt(n)
    b = rng.standard_normal((n, m))
    q = spd(n)
    r = spd(m)
    nn = 0.2 * rng.standard_normal((n, m))
    t = float(rng.uniform(0.05, 0.5))
    qd, rd, nd = sampled_cost(a, b, q, r, nn, t)
    sampled.append({'n': n, 'm': m, 'T': t, 'A': rows(a), 'B': rows(b), 'Q': rows(q), 'R': rows(r), 'N': rows(nn),
                    'Qd': rows(qd), 'Rd': rows(rd), 'Nd': rows(nd)})

# ------------------------------------------------------------------ closed-loop step responses
steps = []
for n in (2, 3, 4, 6):
    m = 1
    for attempt in range(60):
        a = rng.standard_normal((n, n)) / np.sqrt(n)
        b = rng.standard_normal((n, m))
        c = rng.standard_normal((1, n))
        if not stabilisable(a, b, False):
            continue
        poles = -np.linspace(1.0, 2.5, n)
        k = sig.place_poles(a, b, poles).gain_matrix
        acl = a - b @ k
        dc = -(c @ np.linalg.solve(acl, b))
        if abs(dc[0, 0]) < 0.1:
            continue
        nr = 1.0 / dc[0, 0]
        t = np.linspace(0, 8.0, 801)
        _, y, x = sig.lsim((acl, b * nr, c, np.zeros((1, 1))), np.ones_like(t), t, interp=False)
        steps.append({'n': n, 'A': rows(a), 'B': rows(b), 'C': rows(c), 'K': rows(k), 'Nr': float(nr),
                      't': [float(v) for v in t[::40]], 'y': [float(v) for v in np.atleast_1d(y)[::40]]})
        break

# Frequency responses G(jω) = C (jωI − A)⁻¹ B + D by NumPy's dense complex solve (LAPACK zgesv),
# with a separate seed so the sections above are unchanged. Random A (complex pairs), plus one
# lightly damped pair (ζ = 0.01) evaluated beside its resonance.
freq_rng = np.random.default_rng(20261202)
frequency = []
for n in [3, 8, 20, 60]:
    a = freq_rng.standard_normal((n, n)) / np.sqrt(n) - 0.3 * np.eye(n)
    b = freq_rng.standard_normal((n, 2))
    c = freq_rng.standard_normal((2, n))
    d = freq_rng.standard_normal((2, 2))
    if n == 8:
        a[:2, :2] = [[0, 1], [-25.0, -0.1]]
    omegas = [0.05, 0.7, 3.0, 4.99, 40.0]
    values = []
    for w in omegas:
        g = c @ np.linalg.solve(1j * w * np.eye(n) - a, b) + d
        values.append({'re': rows(g.real), 'im': rows(g.imag)})
    frequency.append({'n': n, 'A': rows(a), 'B': rows(b), 'C': rows(c), 'D': rows(d), 'omegas': omegas, 'G': values})

# Larger closed loops (n = 30, 64) for the block recursion of the step response (the loops above
# are small enough to be stepped state by state): a random stable A_cl, scipy.signal.lsim with a
# zero-order hold, separate seed so the sections above are unchanged.
large_rng = np.random.default_rng(20261204)
large_steps = []
for n in (30, 64):
    a = large_rng.standard_normal((n, n)) / np.sqrt(n)
    a = a - (np.max(np.linalg.eigvals(a).real) + 0.4) * np.eye(n)
    b = large_rng.standard_normal((n, 1))
    c = large_rng.standard_normal((1, n))
    dc = -(c @ np.linalg.solve(a, b))
    nr = 1.0 / dc[0, 0]
    t = np.linspace(0, 8.0, 801)
    _, y, _ = sig.lsim((a, b * nr, c, np.zeros((1, 1))), np.ones_like(t), t, interp=False)
    large_steps.append({'n': n, 'A': rows(a), 'B': rows(b), 'C': rows(c), 'K': [[0.0] * n], 'Nr': float(nr),
                        't': [float(v) for v in t[::40]], 'y': [float(v) for v in np.atleast_1d(y)[::40]]})

out = {
    'generator': 'test/reference/control_response.py',
    'scipy': scipy.__version__, 'numpy': np.__version__,
    'zeroOrderHold': zoh, 'lqr': lqr, 'kalman': kalman, 'sampledCost': sampled, 'stepResponse': steps,
    'frequencyResponse': frequency, 'stepResponseLarge': large_steps,
}
path = os.path.join(os.path.dirname(__file__), '..', 'fixtures', 'reference', 'control_response.json')
with open(path, 'w') as f:
    json.dump(out, f, separators=(',', ':'))
print(f'wrote zoh {len(zoh)}, lqr {len(lqr)}, kalman {len(kalman)}, sampled {len(sampled)}, steps {len(steps)}')
