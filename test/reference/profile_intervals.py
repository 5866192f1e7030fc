#!/usr/bin/python3
"""Reference fixtures for the profile-likelihood intervals of the random-intercept model.

Writes test/reference/profile-intervals.json: invented two-arm data sets (drawn here with numpy's seeded generator,
stored in the fixture) and, for each, the REML or ML estimates of the between-participant variance s2u and the
within-participant variance s2, and the 95% profile-likelihood limits of s2u, s2 and the ratio g = s2u/s2, from a
likelihood written here from its textbook form (Harville 1977, J. Am. Stat. Assoc. 72:320-338), evaluated densely
with numpy (n x n covariance matrix, Cholesky log-determinants), optimised with scipy (bounded scalar minimisation for
the nuisance variance, Brent's root finder for the limits). It shares no code with the TypeScript engine.

Run with Debian's python3 (numpy, scipy):  /usr/bin/python3 test/reference/profile_intervals.py
"""
import json
import math
import os

import numpy as np
from scipy import optimize, stats

LEVEL = 0.95
CUT = stats.chi2.ppf(LEVEL, 1)


def make_data(seed, n_per_arm, sd_subject, sd_within, dropout):
    """Invented trial: 2 arms, visits on study days 1, 85, 169, 253, 337 (a few days off target), some dropout."""
    rng = np.random.default_rng(seed)
    y, t, subj, arm = [], [], [], []
    for i in range(2 * n_per_arm):
        a = i % 2
        u = sd_subject * rng.standard_normal()
        for v, day in enumerate([1, 85, 169, 253, 337]):
            if v >= 2 and rng.random() < dropout:
                break
            d = day + (0 if v == 0 else int(round(4 * rng.standard_normal())))
            months = (d - 1) / 30.4375
            y.append(round(60 + u - 0.45 * months + 0.2 * a * months + sd_within * rng.standard_normal(), 3))
            t.append(months)
            subj.append(i)
            arm.append(a)
    return {"y": y, "time": t, "subject": subj, "arm": arm, "nSubjects": 2 * n_per_arm}


class Lik:
    """Dense REML or ML log-likelihood in (s2u, s2) with the fixed effects profiled out (ML) or integrated out (REML)."""

    def __init__(self, data, method):
        self.y = np.array(data["y"], dtype=float)
        t = np.array(data["time"], dtype=float)
        a = np.array(data["arm"], dtype=float)
        self.X = np.column_stack([np.ones_like(t), a, t, a * t])
        s = np.array(data["subject"])
        self.Z = (s[:, None] == np.arange(data["nSubjects"])[None, :]).astype(float)
        self.Z = self.Z[:, self.Z.sum(axis=0) > 0]
        self.method = method

    def __call__(self, s2u, s2):
        n, p = self.X.shape
        V = s2u * self.Z @ self.Z.T + s2 * np.eye(n)
        L = np.linalg.cholesky(V)
        logdet_v = 2 * np.sum(np.log(np.diag(L)))
        Xw = np.linalg.solve(L, self.X)
        yw = np.linalg.solve(L, self.y)
        xtvx = Xw.T @ Xw
        beta = np.linalg.solve(xtvx, Xw.T @ yw)
        r = yw - Xw @ beta
        quad = r @ r
        if self.method == "ml":
            return -0.5 * (n * math.log(2 * math.pi) + logdet_v + quad)
        logdet_x = 2 * np.sum(np.log(np.diag(np.linalg.cholesky(xtvx))))
        return -0.5 * ((n - p) * math.log(2 * math.pi) + logdet_v + logdet_x + quad)


def inner_max(f, lo, hi):
    """max of f on [lo, hi] by bounded Brent minimisation of -f, tolerance 1e-11."""
    res = optimize.minimize_scalar(lambda x: -f(x), bounds=(lo, hi), method="bounded", options={"xatol": 1e-11, "maxiter": 2000})
    return -res.fun, res.x


def reference(data, method):
    lik = Lik(data, method)
    # The fit: maximise over (log s2u, log s2) with s2 profiled numerically, then check the zero boundary.
    var_y = float(np.var(data["y"]))
    prof_s2u = lambda s2u: inner_max(lambda ls: lik(s2u, math.exp(ls)), math.log(var_y) - 10, math.log(var_y) + 3)[0]
    best_l, best_x = inner_max(lambda lu: prof_s2u(math.exp(lu)), math.log(var_y) - 12, math.log(var_y) + 4)
    zero_l = prof_s2u(0.0)
    if zero_l >= best_l:
        s2u_hat, l_hat = 0.0, zero_l
    else:
        s2u_hat, l_hat = math.exp(best_x), best_l
    s2_hat = math.exp(inner_max(lambda ls: lik(s2u_hat, math.exp(ls)), math.log(var_y) - 10, math.log(var_y) + 3)[1])
    l_hat = lik(s2u_hat, s2_hat)

    def prof_s2(s2):
        m, _ = inner_max(lambda lu: lik(math.exp(lu), s2), math.log(max(s2u_hat, 1e-6 * s2_hat)) - 14, math.log(var_y) + 6)
        return max(m, lik(0.0, s2))

    def prof_g(g):
        return inner_max(lambda ls: lik(g * math.exp(ls), math.exp(ls)), math.log(s2_hat) - 6, math.log(s2_hat) + 6)[0]

    def limits(prof, est, lower_zero):
        f = lambda lx: 2 * (l_hat - prof(math.exp(lx))) - CUT
        x0 = math.log(est)
        lo = None
        if not lower_zero:
            a = x0 - 0.5
            while f(a) < 0:
                a -= 1.0
            lo = math.exp(optimize.brentq(f, a, x0, xtol=1e-14, rtol=4 * np.finfo(float).eps))
        b = x0 + 0.5
        while f(b) < 0:
            b += 1.0
        hi = math.exp(optimize.brentq(f, x0, b, xtol=1e-14, rtol=4 * np.finfo(float).eps))
        return [0.0 if lo is None else lo, hi]

    stat0 = max(0.0, 2 * (l_hat - prof_s2u(0.0)))
    lower_zero = stat0 < CUT
    return {
        "method": method,
        "s2u": s2u_hat,
        "s2": s2_hat,
        "logLikDifferenceToZero": stat0,
        "subject": limits(prof_s2u, s2u_hat, lower_zero) if s2u_hat > 0 else [0.0, None],
        "residual": limits(prof_s2, s2_hat, False),
        "ratio": limits(prof_g, s2u_hat / s2_hat, lower_zero) if s2u_hat > 0 else [0.0, None],
    }


def main():
    cases = []
    for name, seed, n, sdu, sde, drop, method in [
        ("moderate ICC, dropout, REML", 11, 10, 5.0, 4.0, 0.1, "reml"),
        ("moderate ICC, dropout, ML", 11, 10, 5.0, 4.0, 0.1, "ml"),
        ("small ICC, 15 per arm, REML", 23, 15, 1.8, 4.0, 0.08, "reml"),
    ]:
        data = make_data(seed, n, sdu, sde, drop)
        cases.append({"name": name, "data": data, "level": LEVEL, "cut": CUT, "reference": reference(data, method)})
    out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "profile-intervals.json")
    with open(out, "w") as fh:
        json.dump({"generator": "test/reference/profile_intervals.py (numpy %s, scipy)" % np.__version__, "cases": cases}, fh, indent=1)
        fh.write("\n")
    for c in cases:
        print(c["name"], json.dumps({k: v for k, v in c["reference"].items()}))


if __name__ == "__main__":
    main()
