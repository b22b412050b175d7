#!/usr/bin/python3
"""Reference values for the standards' uncertainties in an inverse prediction.

Run with Debian's interpreter (python3-numpy, python3-scipy, python3-statsmodels):

    /usr/bin/python3 testdata/refgen/standards_mc.py

Writes testdata/golden/standards_mc.json. fitcore (Options.XStandardUncertainties)
adds to the x read back from an unknown's mean reading, x0 = (ybar0 - b0)/b1, the
term sum_i (d x0/d x_i)^2 u^2(x_i) (JCGM 100:2008, GUM, 5.1.2 eq. 10). This script
checks that term two ways that share no code with fitcore:

  * mc_u: propagation of distributions by Monte Carlo (JCGM 101:2008): draw
    x_i* = x_i + u_i z_i (z_i standard normal, numpy default_rng, seeded), refit the
    line by least squares with numpy.linalg.lstsq for every draw with the y readings
    and ybar0 held fixed, and take the standard deviation of x0*; mc_se is its Monte
    Carlo standard error, sd/sqrt(2(M-1)) (normal approximation);
  * lin_u: the law of propagation with the sensitivities d x0/d x_i taken by central
    finite differences of the same numpy refit (step 1e-6 of the x range).

It also gives, from statsmodels OLS, the fit's own standard error of x0,
se_fit = s/|b1| sqrt(1/m + 1/n + (ybar0 - ybar)^2/(b1^2 Sxx)) (origin line:
s/|b1| sqrt(1/m + x0^2 Var(b1)/s^2)), the combined u = sqrt(se_fit^2 + lin_u^2), the
Welch-Satterthwaite nu_eff = u^4/(se_fit^4/nu) (GUM G.4.1, reported only) and the
interval x0 -/+ t(nu) u with scipy.stats.t.ppf at the fit's residual degrees of
freedom nu (conservative, as fitcore reports it: nu <= nu_eff).

The data are invented (a conductivity meter against invented standards).
"""
import json
import os
import platform

import numpy as np
import scipy
import scipy.stats
import statsmodels
import statsmodels.api as sm

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
OUT = os.path.join(ROOT, "testdata", "golden", "standards_mc.json")

M = 1_000_000
LEVEL = 0.95


def fit(x, y, origin):
    if origin:
        A = x[:, None]
        b1 = np.linalg.lstsq(A, y, rcond=None)[0][0]
        return 0.0, b1
    A = np.column_stack([np.ones_like(x), x])
    b0, b1 = np.linalg.lstsq(A, y, rcond=None)[0]
    return b0, b1


def x0_of(x, y, ybar0, origin):
    b0, b1 = fit(x, y, origin)
    return (ybar0 - b0) / b1


def mc(x, y, u, ybar0, origin, rng):
    """Vectorised refits: closed-form least squares per draw (the same normal
    equations lstsq solves), in chunks."""
    out = []
    chunk = 100_000
    for _ in range(M // chunk):
        xs = x[None, :] + u[None, :] * rng.standard_normal((chunk, len(x)))
        if origin:
            b1 = (xs * y).sum(1) / (xs * xs).sum(1)
            b0 = 0.0
        else:
            mx = xs.mean(1, keepdims=True)
            my = y.mean()
            dx = xs - mx
            b1 = (dx * (y - my)).sum(1) / (dx * dx).sum(1)
            b0 = my - b1 * mx[:, 0]
        out.append((ybar0 - b0) / b1)
    return np.concatenate(out)


def case(name, x, y, u, ys0, origin, seed):
    x, y, u = np.array(x, float), np.array(y, float), np.array(u, float)
    ybar0 = float(np.mean(ys0))
    m = len(ys0)
    n = len(x)
    x0 = x0_of(x, y, ybar0, origin)
    # Cross-check the lstsq refit against the draws' closed form at u = 0.
    rng = np.random.default_rng(seed)
    draws = mc(x, y, u, ybar0, origin, rng)
    sd = float(np.std(draws, ddof=1))
    h = 1e-6 * (x.max() - x.min())
    sens = []
    for i in range(n):
        xp, xm = x.copy(), x.copy()
        xp[i] += h
        xm[i] -= h
        sens.append((x0_of(xp, y, ybar0, origin) - x0_of(xm, y, ybar0, origin)) / (2 * h))
    sens = np.array(sens)
    lin_u = float(np.sqrt(np.sum((sens * u) ** 2)))
    if origin:
        res = sm.OLS(y, x[:, None]).fit()
        b1 = res.params[0]
        s2 = res.scale
        se_fit = float(np.sqrt(s2 / m + x0 ** 2 * res.bse[0] ** 2) / abs(b1))
    else:
        res = sm.OLS(y, sm.add_constant(x)).fit()
        b1 = res.params[1]
        s2 = res.scale
        sxx = float(np.sum((x - x.mean()) ** 2))
        se_fit = float(np.sqrt(s2) / abs(b1) * np.sqrt(1 / m + 1 / n + (ybar0 - y.mean()) ** 2 / (b1 ** 2 * sxx)))
    nu = float(res.df_resid)
    uc = float(np.hypot(se_fit, lin_u))
    nu_eff = min(nu * (uc / se_fit) ** 4, 1e7)
    t = float(scipy.stats.t.ppf(1 - (1 - LEVEL) / 2, nu))
    return {
        "name": name,
        "invented": True,
        "model": "origin" if origin else "ols",
        "x": x.tolist(), "y": y.tolist(), "u_x": u.tolist(), "unknown_y": list(map(float, ys0)),
        "level": LEVEL,
        "x0": float(x0),
        "mc_draws": M, "mc_seed": seed,
        "mc_mean": float(np.mean(draws)),
        "mc_u": sd, "mc_se": sd / np.sqrt(2 * (M - 1)),
        "lin_u": lin_u,
        "se_fit": se_fit, "u_c": uc, "nu_eff": nu_eff, "t": t,
        "low": float(x0 - t * uc), "high": float(x0 + t * uc),
    }


cases = [
    case("conductivity, standards with certificates (invented)",
         [84, 147, 500, 1000, 1413, 2000, 2764], [85.9, 146.1, 503, 1004.5, 1419, 2010, 2771],
         [0.42, 0.8, 2.5, 5, 7, 10, 14], [612, 615.5, 611], False, 20251202),
    case("conductivity, some standards exact, unknown near the top (invented)",
         [84, 147, 500, 1000, 1413, 2000, 2764], [85.9, 146.1, 503, 1004.5, 1419, 2010, 2771],
         [0, 3, 0, 0, 20, 0, 30], [2600], False, 20251203),
    case("pressure through the origin (invented)",
         [10, 20, 40, 60, 80, 100], [10.4, 20.1, 40.9, 60.2, 81.1, 100.6],
         [0.05, 0.05, 0.1, 0.15, 0.2, 0.25], [55.0, 55.3], True, 20251204),
]

doc = {
    "source": "invented data; Monte Carlo propagation (JCGM 101:2008) and finite-difference "
              "law of propagation (JCGM 100:2008 5.1.2) with numpy, fit SE with statsmodels OLS, "
              "t quantile with scipy",
    "generator": {
        "script": "testdata/refgen/standards_mc.py",
        "python": platform.python_version(),
        "numpy": np.__version__, "scipy": scipy.__version__, "statsmodels": statsmodels.__version__,
    },
    "cases": cases,
}
with open(OUT, "w") as f:
    json.dump(doc, f, indent=1)
    f.write("\n")
print("wrote", OUT)
