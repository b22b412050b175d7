#!/usr/bin/python3
"""Reference values for fitcore.BoxCoxProfile.

Run with Debian's interpreter (it has python3-scipy and python3-statsmodels):

    /usr/bin/python3 testdata/refgen/boxcox_ref.py

It writes testdata/golden/boxcox.json.

The Box-Cox power here is for the straight-line model y^(lam) = b0 + b1*x,
not for a constant mean (which is what scipy.stats.boxcox_normmax does), so
the profile log-likelihood is computed directly in its textbook form

    l(lam) = -n/2 * log(RSS(lam)/n) + (lam - 1) * sum(log y)

(Box & Cox 1964, JRSS B 26, eq. 9), with y^(lam) from scipy.special.boxcox
(or y^lam/lam, the same up to a constant, where that would cancel) and RSS from a statsmodels OLS fit of y^(lam) on [1, x]. This is a different
route from the Go code (no geometric-mean scaling, a library least-squares
solver), which is the point. The maximum is located on a grid of step 0.001
over [-3, 3] and refined with scipy.optimize.minimize_scalar (bounded); the
interval ends solve 2*(l_max - l(lam)) = chi2_1(level) with scipy.optimize.brentq.
An end outside [-3, 3] is reported as the bound, as the Go code does.

Data: the NIST/SEMATECH e-Handbook Alaska pipeline data (section 4.6.3; read
from ../shared/reference, not copied: only the results are stored) with
x = lab defect size and y = field defect size, and invented seeded sets whose
readings are stored in the JSON.
"""
import json
import os
import sys

import numpy as np
import scipy
import scipy.optimize as so
import scipy.special as sp
import scipy.stats as st
import statsmodels
import statsmodels.api as sm

LO, HI = -3.0, 3.0
HERE = os.path.dirname(os.path.abspath(__file__))
REPO = os.path.normpath(os.path.join(HERE, "..", ".."))
ALASKA = os.path.normpath(os.path.join(REPO, "..", "shared", "reference",
                                       "nist-handbook", "ALASKA_PIPELINE.DAT"))
OUT = os.path.join(REPO, "testdata", "golden", "boxcox.json")
PROFILE_AT = [-2.0, -1.0, -0.5, 0.0, 0.5, 1.0, 2.0]


def loglik(x, y, lam):
    n = len(y)
    if abs(lam) * np.max(np.abs(np.log(y))) <= 1:
        z = sp.boxcox(y, lam)
    else:
        # (y^lam - 1)/lam loses its digits to the "- 1" when y^lam is far
        # from 1 (y near 1e6, lam = -2); the constant goes into the intercept
        # anyway, so leave it out.
        z = np.power(y, lam) / lam
    rss = sm.OLS(z, sm.add_constant(x)).fit().ssr
    return -n / 2 * np.log(rss / n) + (lam - 1) * np.sum(np.log(y))


def profile(x, y, level):
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    grid = np.round(np.arange(LO, HI + 0.0005, 0.001), 6)
    ll = np.array([loglik(x, y, g) for g in grid])
    k = int(np.argmax(ll))
    a, b = grid[max(k - 1, 0)], grid[min(k + 1, len(grid) - 1)]
    r = so.minimize_scalar(lambda l: -loglik(x, y, l), bounds=(a, b),
                           method="bounded", options={"xatol": 1e-12})
    lam, lmax = (r.x, -r.fun) if -r.fun >= ll[k] else (grid[k], ll[k])
    cut = lmax - st.chi2.ppf(level, 1) / 2
    g = lambda l: loglik(x, y, l) - cut
    below = [i for i in range(len(grid)) if grid[i] < lam and ll[i] < cut]
    above = [i for i in range(len(grid)) if grid[i] > lam and ll[i] < cut]
    if below:
        i = below[-1]
        low = so.brentq(g, grid[i], min(grid[i + 1], lam), xtol=1e-13)
    else:
        low = LO
    if above:
        i = above[0]
        high = so.brentq(g, max(grid[i - 1], lam), grid[i], xtol=1e-13)
    else:
        high = HI
    base = loglik(x, y, 1.0)
    return {
        "lambda": float(lam), "ci_low": float(low), "ci_high": float(high),
        "profile_at": PROFILE_AT,
        "profile_minus_at_1": [float(loglik(x, y, l) - base) for l in PROFILE_AT],
    }


def read_alaska(path):
    field, lab = [], []
    with open(path) as f:
        for line in f:
            parts = line.split()
            if len(parts) != 3:
                continue
            try:
                a, b, _ = (float(p) for p in parts)
            except ValueError:
                continue
            field.append(a)
            lab.append(b)
    return lab, field


def synthetic():
    """Invented, seeded sets; each note says how it was made."""
    sets = []
    rng = np.random.default_rng(1)
    x = np.linspace(1, 10, 40)
    y = np.exp(0.5 + 0.3 * x + 0.1 * rng.standard_normal(40))
    sets.append(("log_true", "y = exp(0.5 + 0.3x + 0.1e), seed 1", x, y, 0.95))
    rng = np.random.default_rng(2)
    x = np.sort(rng.uniform(0, 20, 50))
    y = (3 + 0.8 * x + 0.5 * rng.standard_normal(50)) ** 2
    sets.append(("sqrt_true", "y = (3 + 0.8x + 0.5e)^2, seed 2", x, y, 0.95))
    rng = np.random.default_rng(3)
    x = np.arange(1, 31, dtype=float)
    y = 10 + 2 * x + 1.5 * rng.standard_normal(30)
    sets.append(("linear_true", "y = 10 + 2x + 1.5e, seed 3", x, y, 0.95))
    sets.append(("linear_true_90", "same readings as linear_true, level 0.90", x, y, 0.90))
    rng = np.random.default_rng(4)
    x = np.linspace(1, 10, 45)
    y = 1 / (0.2 + 0.1 * x + 0.01 * rng.standard_normal(45))
    sets.append(("reciprocal_true", "y = 1/(0.2 + 0.1x + 0.01e), seed 4", x, y, 0.95))
    rng = np.random.default_rng(5)
    x = np.logspace(0, 2, 60)
    y = 2 * x * (1 + 0.02 * rng.standard_normal(60))
    sets.append(("percent_error", "y = 2x(1 + 0.02e), x log-spaced 1..100, seed 5", x, y, 0.95))
    rng = np.random.default_rng(6)
    x = np.arange(1, 7, dtype=float)
    y = 5 + x + 1.0 * rng.standard_normal(6)
    sets.append(("small_noisy", "y = 5 + x + e, n = 6, seed 6 (interval reaches the bounds)", x, y, 0.95))
    rng = np.random.default_rng(7)
    x = np.linspace(0, 50, 35)
    y = 1e6 + 5e4 * x + 2e4 * rng.standard_normal(35)
    sets.append(("large_scale", "y = 1e6 + 5e4x + 2e4e, seed 7", x, y, 0.95))
    return sets


def main():
    out = {
        "source": "testdata/refgen/boxcox_ref.py: Box-Cox profile likelihood for a straight line "
                  "(Box & Cox 1964), statsmodels OLS + scipy.optimize",
        "python": sys.version.split()[0],
        "numpy": np.__version__, "scipy": scipy.__version__,
        "statsmodels": statsmodels.__version__,
        "bounds": [LO, HI],
        "cases": [],
    }
    if os.path.exists(ALASKA):
        x, y = read_alaska(ALASKA)
        c = {"name": "alaska_pipeline", "data_file": "nist-handbook/ALASKA_PIPELINE.DAT",
             "note": "NIST/SEMATECH e-Handbook 4.6.3: x = lab defect size, y = field defect size",
             "n": len(x), "level": 0.95}
        c.update(profile(x, y, 0.95))
        out["cases"].append(c)
    else:
        print("warning: %s not found; Alaska case left out" % ALASKA, file=sys.stderr)
    for name, note, x, y, level in synthetic():
        c = {"name": name, "note": "invented: " + note, "n": len(x), "level": level,
             "x": [float(v) for v in x], "y": [float(v) for v in y]}
        c.update(profile(x, y, level))
        out["cases"].append(c)
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    with open(OUT, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")
    for c in out["cases"]:
        print("%-16s n=%3d  lambda=%.6f  [%.6f, %.6f]" % (c["name"], c["n"], c["lambda"], c["ci_low"], c["ci_high"]))


if __name__ == "__main__":
    main()
