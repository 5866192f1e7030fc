#!/usr/bin/python3
"""Reference fixture for the random-intercept logistic model (test/core/model/logistic/reference.test.ts).

Invented data (a made-up kidney-function trial: a yes/no "eGFR below the cut-off" answer every 12 weeks, two arms).
The marginal likelihood of each participant, L_i = integral of prod_j p(y_ij | x_ij'b + s*z) * phi(z) dz, is computed by
direct numerical integration (scipy.integrate.quad on the real line, relative tolerance 1e-13), independently of the
engine's Gauss-Hermite rules; the maximum is found over (b, log s) with scipy.optimize.minimize (BFGS on central-
difference gradients) followed by Newton steps with a central-difference Hessian; the SEs come from that Hessian.
Run: /usr/bin/python3 test/reference/logistic_quadrature.py > test/reference/logistic-quadrature.json
"""
import json
import math

import numpy as np
import scipy
from scipy import integrate, optimize


def invented(seed=20261203):
    rng = np.random.default_rng(seed)
    rows = []
    for i in range(40):
        arm = i % 2
        u = rng.normal(0, 1.3)
        visits = 4 if rng.uniform() > 0.25 else int(rng.integers(1, 4))
        for v in range(visits):
            t = v * 12 * 7 / 30.4375
            eta = -0.8 + u + 0.12 * t - arm * (0.3 + 0.1 * t)
            y = int(rng.uniform() < 1 / (1 + math.exp(-eta)))
            rows.append((i, arm, t, y))
    return rows


def log_bern(y, eta):
    return -np.logaddexp(0.0, -eta) if y == 1 else -np.logaddexp(0.0, eta)


def participant_loglik(eta, y, s):
    def integrand(z):
        return math.exp(sum(log_bern(yj, ej + s * z) for ej, yj in zip(eta, y)) - 0.5 * z * z) / math.sqrt(2 * math.pi)
    val, _ = integrate.quad(integrand, -np.inf, np.inf, epsabs=0, epsrel=1e-13, limit=400)
    return math.log(val)


def main():
    rows = invented()
    subj = np.array([r[0] for r in rows])
    arm = np.array([r[1] for r in rows], dtype=float)
    t = np.array([r[2] for r in rows])
    y = np.array([r[3] for r in rows])
    x = np.column_stack([np.ones_like(t), arm, t, arm * t])
    groups = [np.where(subj == g)[0] for g in np.unique(subj)]

    def loglik(theta):
        b, s = theta[:-1], math.exp(theta[-1])
        eta = x @ b
        return sum(participant_loglik(eta[g], y[g], s) for g in groups)

    def grad(theta, h=1e-6):
        g = np.zeros_like(theta)
        for j in range(len(theta)):
            e = np.zeros_like(theta)
            e[j] = h
            g[j] = (loglik(theta + e) - loglik(theta - e)) / (2 * h)
        return g

    def hess(theta, h=1e-4):
        q = len(theta)
        out = np.zeros((q, q))
        for a in range(q):
            for b in range(q):
                ea = np.zeros(q)
                eb = np.zeros(q)
                ea[a] = h
                eb[b] = h
                out[a, b] = (loglik(theta + ea + eb) - loglik(theta + ea - eb) - loglik(theta - ea + eb) + loglik(theta - ea - eb)) / (4 * h * h)
        return (out + out.T) / 2

    theta0 = np.array([0.0, 0.0, 0.0, 0.0, 0.0])
    res = optimize.minimize(lambda th: -loglik(th), theta0, jac=lambda th: -grad(th), method="BFGS", options={"gtol": 1e-7})
    theta = res.x
    for _ in range(3):
        theta = theta - np.linalg.solve(hess(theta), grad(theta))
    cov = np.linalg.inv(-hess(theta))
    s = math.exp(theta[-1])
    one = []
    for eta_list, y_list, sig in (([0.3, -0.2, 1.1], [1, 0, 1], 1.5), ([-2.0, -1.5], [0, 0], 0.7), ([0.5] * 6, [1, 1, 1, 0, 1, 1], 3.0), ([4.0, 5.0], [0, 1], 0.01)):
        one.append({"eta": eta_list, "y": y_list, "sigma": sig, "logLik": participant_loglik(np.array(eta_list), y_list, sig)})
    out = {
        "source": "direct integration, scipy " + scipy.__version__ + " integrate.quad (Debian python3-scipy)",
        "columns": ["Intercept", "Arm Drug vs Placebo", "Time", "Time x arm Drug"],
        "data": {"subject": subj.tolist(), "arm": arm.astype(int).tolist(), "time": t.tolist(), "y": y.tolist()},
        "estimates": theta[:-1].tolist(),
        "se": np.sqrt(np.diag(cov))[:-1].tolist(),
        "sigma": s,
        "variance": s * s,
        "logLik": loglik(theta),
        "gradientAtMaximum": grad(theta).tolist(),
        "participants": one,
    }
    # Drug against Placebo at the last visit (day 253, 252 days = 3 x 12 weeks from day 1) on the log-odds scale:
    # arm + t x arm-by-time, its SE from the same inverse Hessian.
    t_last = 3 * 12 * 7 / 30.4375
    l = np.array([0.0, 1.0, 0.0, t_last])
    cov_b = cov[:-1, :-1]
    out["lastVisit"] = {"day": 253, "time": t_last, "estimate": float(l @ theta[:-1]), "se": float(np.sqrt(l @ cov_b @ l))}
    print(json.dumps(out, indent=1))


if __name__ == "__main__":
    main()
