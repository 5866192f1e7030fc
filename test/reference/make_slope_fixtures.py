#!/usr/bin/python3
"""Reference fixtures for the random intercept and slope model, from an outside general-purpose library.

Uses Debian's python3-statsmodels (MixedLM with re_formula "~time", i.e. random intercept and slope with an
unstructured 2 x 2 covariance) on three invented data sets of an invented kidney-function trial (eGFR-like values,
visits every 3 months, two arms "Placebo" and "Drug"):
  balanced   - 24 participants, 5 visits at the same times for everyone;
  dropout    - 40 participants, visit times jittered by a few days, some participants leave early;
  nearsingular - 40 participants whose intercepts and slopes are strongly correlated (true 0.95, estimated 0.97-0.98:
                 G nearly singular, still inside);
  boundary   - the same design with another seed, where the estimate lies on the boundary (correlation 1, G singular):
               there the library's optimiser stops short of the boundary, so the test only requires our fit to reach
               at least its log-likelihood and to report the boundary.
For each, REML and ML fits: fixed effects (intercept, arm, time, arm x time), their SEs, G, sigma^2, log-likelihood.

Usage:
  /usr/bin/python3 test/reference/make_slope_fixtures.py            write test/reference/fixtures/slope-*.json
  /usr/bin/python3 test/reference/make_slope_fixtures.py --check    refit and compare with the committed fixtures
                                                                  (exit 1 when any number differs beyond tolerance)
The data come from numpy's seeded generator, so a rerun writes the same data; the fitted numbers may move in the last
digits with the library's version, hence the tolerance check rather than a byte comparison.
"""
import json
import os
import sys
import warnings

import numpy as np
import statsmodels
import statsmodels.api as sm

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "fixtures")


def make_data(name):
    """Invented data; returns dict of lists: subject, arm (0/1), time (months), y."""
    rng = np.random.RandomState({"balanced": 101, "dropout": 202, "nearsingular": 303, "boundary": 309}[name])
    subj, arm, time, y = [], [], [], []
    if name == "balanced":
        m, G, s2 = 24, np.array([[36.0, -2.0], [-2.0, 0.8]]), 9.0
    elif name == "dropout":
        m, G, s2 = 40, np.array([[49.0, 3.0], [3.0, 1.2]]), 6.0
    else:
        m, G, s2 = 40, np.array([[25.0, 4.75], [4.75, 1.0]]), 4.0  # correlation 0.95
    Lg = np.linalg.cholesky(G)
    for i in range(m):
        a = i % 2
        u = Lg @ rng.standard_normal(2)
        nvis = 5
        if name == "dropout" and rng.uniform() < 0.35:
            nvis = int(rng.randint(1, 5))
        for v in range(nvis):
            if name == "balanced":
                t = 3.0 * v
            else:
                day = 84 * v + (0 if v == 0 else int(round(6 * rng.standard_normal())))
                t = day / 30.4375
            mean = 60.0 + 1.5 * a - 0.45 * t + 0.25 * a * t
            subj.append(i)
            arm.append(a)
            time.append(round(t, 6))
            y.append(round(mean + u[0] + u[1] * t + np.sqrt(s2) * rng.standard_normal(), 4))
    return {"subject": subj, "arm": arm, "time": time, "y": y}


def fit(data, reml):
    y = np.array(data["y"])
    t = np.array(data["time"])
    a = np.array(data["arm"], dtype=float)
    X = np.column_stack([np.ones_like(t), a, t, a * t])
    Z = np.column_stack([np.ones_like(t), t])
    model = sm.MixedLM(y, X, groups=np.array(data["subject"]), exog_re=Z)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        # Several optimisers in turn, each from the previous one's end, with tight tolerances: the fixtures should be
        # the optimum, not where a default tolerance stopped.
        r = model.fit(reml=reml, method=["bfgs", "lbfgs", "cg"], maxiter=5000, gtol=1e-10)
        r = model.fit(reml=reml, start_params=r.params_object, method=["bfgs"], maxiter=5000, gtol=1e-12)
    G = np.asarray(r.cov_re)
    return {
        "fixedEffects": [float(v) for v in r.fe_params],
        "fixedEffectSe": [float(v) for v in r.bse_fe],
        "G": [[float(G[0, 0]), float(G[0, 1])], [float(G[1, 0]), float(G[1, 1])]],
        "sigma2": float(r.scale),
        "logLik": float(r.llf),
        "converged": bool(r.converged),
    }


NAMES = ["balanced", "dropout", "nearsingular", "boundary"]


def build(name):
    data = make_data(name)
    return {
        "source": "statsmodels %s MixedLM, exog_re = [1, time] (random intercept and slope, unstructured G)" % statsmodels.__version__,
        "name": name,
        "terms": ["Intercept", "Arm", "Time", "Arm x time"],
        "data": data,
        "reml": fit(data, True),
        "ml": fit(data, False),
    }


def close(a, b, rel):
    return abs(a - b) <= rel * max(1.0, abs(b))


def compare(old, new):
    bad = []
    if old["data"] != new["data"]:
        bad.append("data differ")
    for m in ("reml", "ml"):
        o, n = old[m], new[m]
        for k, (x, y) in enumerate(zip(o["fixedEffects"], n["fixedEffects"])):
            if not close(x, y, 1e-5):
                bad.append("%s fixed effect %d: %r vs %r" % (m, k, x, y))
        for i in range(2):
            for j in range(2):
                if not close(o["G"][i][j], n["G"][i][j], 1e-4):
                    bad.append("%s G[%d][%d]: %r vs %r" % (m, i, j, o["G"][i][j], n["G"][i][j]))
        if not close(o["sigma2"], n["sigma2"], 1e-4):
            bad.append("%s sigma2" % m)
        if abs(o["logLik"] - n["logLik"]) > 1e-6 * max(1.0, abs(n["logLik"])):
            bad.append("%s logLik: %r vs %r" % (m, o["logLik"], n["logLik"]))
    return bad


def main():
    check = "--check" in sys.argv[1:]
    os.makedirs(OUT, exist_ok=True)
    failed = False
    for name in NAMES:
        fx = build(name)
        path = os.path.join(OUT, "slope-%s.json" % name)
        if check:
            with open(path) as f:
                old = json.load(f)
            bad = compare(old, fx)
            print("%s: %s" % (name, "same within tolerance" if not bad else "; ".join(bad)))
            failed = failed or bool(bad)
        else:
            with open(path, "w") as f:
                json.dump(fx, f, indent=1)
                f.write("\n")
            print("wrote", path, "REML logLik", fx["reml"]["logLik"], "ML logLik", fx["ml"]["logLik"])
    sys.exit(1 if failed else 0)


if __name__ == "__main__":
    main()
