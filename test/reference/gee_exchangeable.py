#!/usr/bin/python3
"""Reference fixture for the GEE engine (test/core/model/gee/reference.test.ts).

Invented data (a made-up kidney-function trial: eGFR every 12 weeks, two arms, some participants stop early, one
numeric baseline covariate), fitted by Debian's python3-statsmodels GEE (Gaussian family, identity link, exchangeable
working correlation), a general-purpose outside library used only to produce this committed fixture.
Run: /usr/bin/python3 test/reference/gee_exchangeable.py > test/reference/gee-exchangeable.json

Conventions (statsmodels 0.13/0.14 as packaged by Debian):
- scale = sum r^2 / (N - p) and the correlation's denominator uses (pairs - p): the p degrees-of-freedom correction
  (ddof_scale defaults to the number of columns), as in our engine.
- cov_naive = scale * (sum X'R^-1 X)^-1; cov_robust = the sandwich; cov_robust_bc = Mancl & DeRouen (2001).
"""
import json

import numpy as np
import statsmodels
import statsmodels.api as sm


def invented(seed=20261202):
    rng = np.random.default_rng(seed)
    rows = []
    for i in range(36):
        arm = i % 2
        base = float(np.round(rng.normal(55, 8), 1))
        u = rng.normal(0, 6)
        visits = 5 if rng.uniform() > 0.3 else int(rng.integers(2, 5))
        for v in range(visits):
            t = v * 12 * 7 / 30.4375  # months since day 1
            y = 60 + u - 0.4 * t + arm * (2.0 + 0.25 * t) + 0.3 * (base - 55) + rng.normal(0, 4)
            rows.append((i, arm, t, base, float(np.round(y, 2))))
    return rows


def main():
    rows = invented()
    subj = np.array([r[0] for r in rows])
    arm = np.array([r[1] for r in rows], dtype=float)
    t = np.array([r[2] for r in rows])
    base = np.array([r[3] for r in rows])
    y = np.array([r[4] for r in rows])
    x = np.column_stack([np.ones_like(t), arm, t, arm * t, base])
    out = {
        "source": "statsmodels " + statsmodels.__version__ + " GEE, Gaussian, exchangeable (Debian python3-statsmodels)",
        "columns": ["Intercept", "Arm Drug vs Placebo", "Time", "Time x arm Drug", "baseline"],
        "data": {"subject": subj.tolist(), "arm": arm.astype(int).tolist(), "time": t.tolist(), "baseline": base.tolist(), "y": y.tolist()},
    }
    for name, cs in (("exchangeable", sm.cov_struct.Exchangeable()), ("independence", sm.cov_struct.Independence())):
        model = sm.GEE(y, x, groups=subj, family=sm.families.Gaussian(), cov_struct=cs)
        res = model.fit(maxiter=500, ctol=1e-10)
        res_bc = model.fit(maxiter=500, ctol=1e-10, cov_type="bias_reduced")
        out[name] = {
            "params": res.params.tolist(),
            "seRobust": np.sqrt(np.diag(res.cov_robust)).tolist(),
            "seModel": np.sqrt(np.diag(res.cov_naive)).tolist(),
            "seBiasReduced": res_bc.bse.tolist(),
            "scale": float(res.scale),
            "correlation": float(np.atleast_1d(cs.dep_params)[0]) if name == "exchangeable" else 0.0,
        }
        # Drug against Placebo at the last visit (day 337, 336 days = 4 x 12 weeks from day 1): arm + t x arm-by-time,
        # its SE from the robust covariance (the fit's default), by statsmodels' own t_test.
        t_last = 4 * 12 * 7 / 30.4375
        contrast = np.array([[0.0, 1.0, 0.0, t_last, 0.0]])
        tt = res.t_test(contrast)
        out[name]["lastVisit"] = {"day": 337, "time": t_last, "estimate": float(np.squeeze(tt.effect)), "se": float(np.squeeze(tt.sd))}
    print(json.dumps(out, indent=1))


if __name__ == "__main__":
    main()
