#!/usr/bin/python3
"""Independent REML fit of the repeated-measures model with an unstructured covariance, for a committed test fixture.

Run with Debian's /usr/bin/python3 (numpy, scipy): `/usr/bin/python3 test/reference/repeated_reml.py`.
It invents a small data set (kidney-function scenario: eGFR at weeks 0, 12, 24, 36; two arms; dropout and a few missed
visits; a numeric baseline covariate), builds the full n x n covariance V = blockdiag(Sigma restricted to each
participant's observed visits), and maximises the restricted likelihood (Patterson & Thompson 1971)

    l = -1/2 [ (N - p) log 2 pi + log|V| + log|X'V^-1 X| + r'V^-1 r ],  r = y - X beta_hat (GLS)

over the Cholesky factor of Sigma with scipy's BFGS (numerical gradient), then refines with Newton steps on a
central-difference Hessian. Design in reference-level coding: intercept, arm, visit, arm x visit, baseline,
baseline x visit. Writes repeated_reml.json next to this file: the data and the estimates.
"""
import json
import os

import numpy as np
from scipy.linalg import block_diag
from scipy.optimize import minimize

rng = np.random.default_rng(20261202)
V = 4
visits = [f"Week {12 * v}" for v in range(V)]
n = 30
rows = []
for i in range(n):
    arm = i % 2
    base = 55 + 12 * rng.standard_normal()
    u = 7 * rng.standard_normal()
    e = 0.0
    values = [None] * V
    for v in range(V):
        e = 0.5 * e + 3 * rng.standard_normal()
        if v > 0 and rng.random() < 0.08:
            continue
        values[v] = round(0.8 * base + 11 + u - 0.8 * v + (0.6 * v if arm else 0) + e, 2)
        if v > 0 and rng.random() < 0.15:
            break
    rows.append({"arm": arm, "baseline": round(base, 2), "values": values})

y, X, blocks_idx = [], [], []
for i, r in enumerate(rows):
    obs = [v for v in range(V) if r["values"][v] is not None]
    blocks_idx.append(obs)
    for v in obs:
        x = [1.0, float(r["arm"] == 1)]
        x += [float(v == w) for w in range(1, V)]
        x += [float(r["arm"] == 1 and v == w) for w in range(1, V)]
        b = r["baseline"]
        x += [b] + [b * float(v == w) for w in range(1, V)]
        X.append(x)
        y.append(r["values"][v])
y = np.array(y)
X = np.array(X)
N, p = X.shape
tri = [(j, k) for k in range(V) for j in range(k + 1)]  # L[k][j], k >= j


def sigma_of(theta):
    L = np.zeros((V, V))
    for t, (j, k) in zip(theta, tri):
        L[k, j] = np.exp(t) if j == k else t
    return L @ L.T


def reml(theta):
    S = sigma_of(theta)
    Vm = block_diag(*[S[np.ix_(o, o)] for o in blocks_idx])
    c = np.linalg.cholesky(Vm)
    Vi = np.linalg.inv(Vm)
    A = X.T @ Vi @ X
    beta = np.linalg.solve(A, X.T @ Vi @ y)
    r = y - X @ beta
    logdet_v = 2 * np.sum(np.log(np.diag(c)))
    logdet_a = np.linalg.slogdet(A)[1]
    ll = -0.5 * ((N - p) * np.log(2 * np.pi) + logdet_v + logdet_a + r @ Vi @ r)
    return ll, beta, S


theta0 = np.array([np.log(np.std(y)) if j == k else 0.0 for (j, k) in tri])
res = minimize(lambda t: -reml(t)[0], theta0, method="BFGS", options={"gtol": 1e-9, "maxiter": 10000})
theta = res.x
h = 1e-4
for _ in range(8):  # Newton refinement on central differences
    R = len(theta)
    g = np.zeros(R)
    H = np.zeros((R, R))
    f0 = reml(theta)[0]
    for a in range(R):
        ea = np.zeros(R); ea[a] = h
        g[a] = (reml(theta + ea)[0] - reml(theta - ea)[0]) / (2 * h)
        for b in range(a, R):
            eb = np.zeros(R); eb[b] = h
            H[a, b] = H[b, a] = (reml(theta + ea + eb)[0] - reml(theta + ea - eb)[0] - reml(theta - ea + eb)[0] + reml(theta - ea - eb)[0]) / (4 * h * h)
    step = np.linalg.solve(H, g)
    if reml(theta - step)[0] >= f0:
        theta = theta - step
ll, beta, S = reml(theta)
out = {
    "note": "Invented data and an independent dense REML fit made by test/reference/repeated_reml.py with numpy " + np.__version__,
    "visits": visits,
    "arms": ["Placebo", "Drug"],
    "participants": rows,
    "logLik": ll,
    "beta": beta.tolist(),
    "covariance": S.tolist(),
}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "repeated_reml.json"), "w") as f:
    json.dump(out, f, indent=1)
print("logLik", ll, "converged", res.success)
