#!/usr/bin/python3
"""Reference values for fitcore's assumption checks.

Run with Debian's interpreter (it has python3-statsmodels and python3-scipy):

    cd /work/main && /usr/bin/python3 testdata/refgen/checks_ref.py

Writes testdata/golden/checks.json. Data sets:
  * NIST files read from ../shared/reference (not copied: the JSON names the
    file and columns, the Go test reads the same file);
  * small seeded synthetic sets (numpy RandomState), whose values are written
    into the JSON. They are invented test data.

Every number in the JSON comes from statsmodels / scipy / numpy as named in
each field; library versions are recorded under "versions".
"""
import json
import os
import platform
import sys

import numpy as np
import scipy
import scipy.odr
import scipy.stats
import statsmodels
import statsmodels.api as sm
from statsmodels.stats.anova import anova_lm
from statsmodels.stats.diagnostic import het_breuschpagan, het_white
from statsmodels.stats.outliers_influence import OLSInfluence
from statsmodels.stats.stattools import durbin_watson
from statsmodels.sandbox.stats.runs import Runs, runstest_1samp

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
REF = os.path.join(ROOT, "..", "shared", "reference")
OUT = os.path.join(ROOT, "testdata", "golden", "checks.json")


def read_dataplot(path):
    """Rows of numbers after the first line of dashes (Dataplot layout)."""
    rows, started = [], False
    with open(path) as f:
        for line in f:
            s = line.strip()
            if not started:
                started = s.startswith("---")
                continue
            if not s:
                continue
            rows.append([float(v) for v in s.split()])
    return np.array(rows)


def read_strd(path):
    """Rows of numbers; lines starting with # are comments."""
    rows = []
    with open(path) as f:
        for line in f:
            s = line.strip()
            if s and not s.startswith("#"):
                rows.append([float(v) for v in s.split()])
    return np.array(rows)


def nist_sets():
    """(name, file relative to ../shared/reference, reader, x column, y column)."""
    return [
        ("norris", "strd/Norris.txt", "strd", 1, 0),
        ("noint1", "strd/NoInt1.txt", "strd", 1, 0),
        ("loadcell", "nist-handbook/LOADCELL.DAT", "dataplot", 0, 1),
        ("pontius", "nist-handbook/PONTIUS.DAT", "dataplot", 1, 0),
        ("alaska", "nist-handbook/ALASKA_PIPELINE.DAT", "dataplot", 1, 0),
        ("calibrationline", "nist-handbook/CALIBRATIONLINE.DAT", "dataplot", 0, 1),
        ("anscombe1", "nist-handbook/ANSCOMBE.DAT", "dataplot", 0, 1),
        ("anscombe2", "nist-handbook/ANSCOMBE.DAT", "dataplot", 2, 3),
        ("anscombe3", "nist-handbook/ANSCOMBE.DAT", "dataplot", 4, 5),
        ("anscombe4", "nist-handbook/ANSCOMBE.DAT", "dataplot", 6, 7),
    ]


def design(x, origin):
    return x[:, None] if origin else np.column_stack([np.ones_like(x), x])


def fit(x, y, w, origin):
    X = design(x, origin)
    if w is None:
        return sm.OLS(y, X).fit()
    return sm.WLS(y, X, weights=w).fit()


def curvature(x, y, w):
    q = (x - x.mean()) ** 2
    X = np.column_stack([np.ones_like(x), x, q])
    r = (sm.OLS(y, X) if w is None else sm.WLS(y, X, weights=w)).fit()
    return {"t": r.tvalues[2], "p": r.pvalues[2], "df": r.df_resid}


def lack_of_fit(x, y, w, origin):
    levels, inv = np.unique(x, return_inverse=True)
    if len(levels) == len(x):
        return None
    lin = fit(x, y, w, origin)
    D = np.zeros((len(x), len(levels)))
    D[np.arange(len(x)), inv] = 1.0
    full = sm.OLS(y, D).fit() if w is None else sm.WLS(y, D, weights=w).fit()
    t = anova_lm(lin, full)
    if t["df_diff"].iloc[1] <= 0 or t["df_resid"].iloc[1] <= 0:
        return None
    return {"f": t["F"].iloc[1], "p": t["Pr(>F)"].iloc[1],
            "df_lof": t["df_diff"].iloc[1], "df_pe": t["df_resid"].iloc[1]}


def dw_moments(x, origin):
    """E[d], Var[d] under H0 from dense M and A (Durbin & Watson 1950)."""
    n = len(x)
    X = design(x, origin)
    M = np.eye(n) - X @ np.linalg.pinv(X)
    Dm = np.diff(np.eye(n), axis=0)
    A = Dm.T @ Dm
    MA = M @ A
    P = np.trace(MA)
    Q = np.trace(MA @ MA)
    k = X.shape[1]
    mean = P / (n - k)
    var = 2 * (Q - P * mean) / ((n - k) * (n - k + 2))
    return mean, var


def runs_ref(resid):
    r = Runs((resid >= 0).astype(int))
    z, p = runstest_1samp(resid, cutoff=0, correction=True)
    npo, nne = r.runs_pos.sum(), r.runs_neg.sum()
    n = npo + nne
    mu = 2.0 * npo * nne / n + 1
    dev = r.n_runs - mu
    # For n < 50 statsmodels adds 0.5 whenever R-mu < 0.5, also for
    # -0.5 < R-mu < 0.5 where the standard continuity correction gives z = 0;
    # the Go test skips those cases.
    comparable = bool(n >= 50 or abs(dev) >= 0.5) and bool(np.all(resid != 0))
    return {"z": z, "p": p, "runs": int(r.n_runs), "comparable": comparable}


def influence(x, resid_model, w, origin):
    sw = np.ones_like(x) if w is None else np.sqrt(w)
    X = design(x, origin) * sw[:, None]
    yw = resid_model.model.endog * sw
    r = sm.OLS(yw, X).fit()
    inf = OLSInfluence(r)
    with np.errstate(all="ignore"):
        out = r.outlier_test(method="bonf")
        res = {
            "leverage": inf.hat_matrix_diag,
            "studentized": inf.resid_studentized_external,
            "cooks": inf.cooks_distance[0],
            "dffits": inf.dffits[0],
            "bonf_p": np.asarray(out)[:, 2],
        }
    return {k: [None if not np.isfinite(v) else float(v) for v in vals] for k, vals in res.items()}


def xexact(x, y, xu, yu):
    ols = sm.OLS(y, design(x, False)).fit()
    s = np.sqrt(ols.scale)
    sy = yu if yu > 0 else s
    data = scipy.odr.RealData(x, y, sx=np.full_like(x, xu), sy=np.full_like(y, sy))
    # unilinear has analytic derivatives (deriv=3); the finite-difference
    # default stops about 1e-6 short of the optimum on these data.
    o = scipy.odr.ODR(data, scipy.odr.unilinear, beta0=[ols.params[1], ols.params[0]],
                      sstol=1e-15, partol=1e-15, maxit=1000)
    o.set_job(deriv=3)
    o = o.run()
    o.beta = o.beta[::-1]  # as [intercept, slope]
    return {"xu": xu, "yu": yu, "ols_slope": ols.params[1], "ols_se": ols.bse[1],
            "deming_slope": o.beta[1], "z": (o.beta[1] - ols.params[1]) / ols.bse[1]}


def case(name, x, y, w=None, origin=False, source=None, values=False):
    m = fit(x, y, w, origin)
    resid = np.asarray(m.resid)
    sw_ = scipy.stats.shapiro(resid)
    mean, var = dw_moments(x, origin)
    mu, v = mean / 4, var / 16
    ab = mu * (1 - mu) / v - 1
    d = durbin_watson(resid)
    lo = scipy.stats.beta.cdf(d / 4, mu * ab, (1 - mu) * ab)
    hi = scipy.stats.beta.sf(d / 4, mu * ab, (1 - mu) * ab)
    X1 = design(x, False)
    bp = het_breuschpagan(resid, X1)
    c = {
        "name": name,
        "origin": origin,
        "weighted": w is not None,
        "n": len(x),
        "resid_ss": float(np.sum(resid ** 2)),
        "curvature": curvature(x, y, w),
        "lack_of_fit": lack_of_fit(x, y, w, origin),
        "breusch_pagan": {"lm": bp[0], "p": bp[1]},
        "durbin_watson": {"d": d, "mean": mean, "var": var, "p": min(1.0, 2 * min(lo, hi))},
        "runs": runs_ref(resid),
        "shapiro": {"w": sw_.statistic, "p": sw_.pvalue},
        "influence": influence(x, m, w, origin),
    }
    if len(np.unique(x)) < 3:
        # Rank-deficient quadratic: fitcore returns NA, nothing to compare.
        c["curvature"] = None
    else:
        wh = het_white(resid, X1)
        c["white"] = {"lm": wh[0], "p": wh[1]}
    if source:
        c["source"] = source
    if values:
        c["x"], c["y"] = list(map(float, x)), list(map(float, y))
        if w is not None:
            c["w"] = list(map(float, w))
    return c


def synthetic():
    """Invented data sets (seeded, values stored)."""
    out = []
    rs = np.random.RandomState(20240611)
    # A clean 8-point calibration.
    x = np.arange(1.0, 9.0)
    y = 0.5 + 2.0 * x + rs.normal(0, 0.3, x.size)
    out.append(case("syn_clean8", x, y, values=True))
    # 25 points with a slow drift in entry order (autocorrelated errors).
    x = np.linspace(0, 10, 25)
    e = np.cumsum(rs.normal(0, 0.2, x.size))
    out.append(case("syn_drift25", x, 1 + 0.8 * x + e, values=True))
    # 60 points whose scatter grows with x, with repeats at each of 12 levels.
    x = np.repeat(np.linspace(1, 12, 12), 5)
    y = 3 + 1.5 * x + rs.normal(0, 1, x.size) * 0.1 * x
    out.append(case("syn_fan60", x, y, values=True))
    out.append(case("syn_fan60_weighted", x, y, w=1 / x ** 2, values=True))
    out.append(case("syn_fan60_origin", x, y - 3, origin=True, values=True))
    # A bent response with repeats (curvature and lack of fit).
    x = np.repeat(np.array([1.0, 2, 3, 4, 5, 6]), 3)
    y = 0.2 + x + 0.05 * x ** 2 + rs.normal(0, 0.05, x.size)
    out.append(case("syn_bent18", x, y, values=True))
    # Through the origin, weighted, 15 points.
    x = np.linspace(0.5, 7.5, 15)
    y = 1.3 * x + rs.normal(0, 0.05, x.size) * x
    out.append(case("syn_origin15_w", x, y, w=1 / x, origin=True, values=True))
    # Small sets: n = 4, 5, 6 and 11 (Shapiro-Wilk branches).
    for n in (4, 5, 6, 11):
        x = np.arange(1.0, n + 1)
        y = 2 + 0.7 * x + rs.standard_t(3, n) * 0.2
        out.append(case("syn_small%d" % n, x, y, values=True))
    # One gross outlier at reading 9 of 14.
    x = np.linspace(1, 14, 14)
    y = 1 + 0.9 * x + rs.normal(0, 0.1, 14)
    y[8] += 2.5
    out.append(case("syn_outlier14", x, y, values=True))
    return out


def shapiro_samples():
    """Raw samples for ShapiroWilk itself (invented, seeded, values stored)."""
    rs = np.random.RandomState(7)
    specs = [("normal", 3), ("normal", 7), ("uniform", 12), ("normal", 20),
             ("exponential", 50), ("normal", 200), ("lognormal", 999),
             ("normal", 5000), ("uniform", 5000), ("normal", 6001)]
    out = []
    for kind, n in specs:
        if kind == "normal":
            v = rs.normal(10, 2, n)
        elif kind == "uniform":
            v = rs.uniform(0, 1, n)
        elif kind == "exponential":
            v = rs.exponential(1, n)
        else:
            v = rs.lognormal(0, 0.5, n)
        v = np.round(v, 6)
        r = scipy.stats.shapiro(v)
        out.append({"name": "%s%d" % (kind, n), "x": list(map(float, v)),
                    "w": r.statistic, "p": r.pvalue})
    # n = 3 exactly at the lower bound region and a tied sample.
    for name, v in (("three_spread", [1.0, 2.0, 10.0]), ("ties", [1, 1, 1, 2, 2, 3, 3, 3, 3, 4.0])):
        r = scipy.stats.shapiro(np.array(v))
        out.append({"name": name, "x": v, "w": r.statistic, "p": r.pvalue})
    return out


def clean(v):
    """NaN/Inf are not JSON: store them as null (the Go test skips those)."""
    if isinstance(v, dict):
        return {k: clean(u) for k, u in v.items()}
    if isinstance(v, (list, tuple)):
        return [clean(u) for u in v]
    if isinstance(v, (bool, np.bool_)):
        return bool(v)
    if isinstance(v, (int, np.integer)):
        return int(v)
    if isinstance(v, (float, np.floating)):
        return float(v) if np.isfinite(v) else None
    return v


def main():
    cases = []
    for name, rel, kind, xc, yc in nist_sets():
        path = os.path.join(REF, rel)
        a = read_strd(path) if kind == "strd" else read_dataplot(path)
        x, y = a[:, xc], a[:, yc]
        origin = name.startswith("noint")
        cases.append(case(name, x, y, origin=origin,
                          source={"file": rel, "reader": kind, "x_col": xc, "y_col": yc}))
    cases += synthetic()
    # x exactness (Deming via scipy.odr, which with constant sx, sy is the
    # Deming fit with delta = sy^2/sx^2).
    rs = np.random.RandomState(99)
    xt = np.linspace(1, 10, 20)
    xo = xt + rs.normal(0, 0.4, xt.size)
    yo = 0.3 + 1.1 * xt + rs.normal(0, 0.2, xt.size)
    xex = [{"name": "syn_xerr20", "x": list(map(float, xo)), "y": list(map(float, yo)), **xexact(xo, yo, 0.4, 0.2)},
           {"name": "syn_xerr20_small", "x": list(map(float, xo)), "y": list(map(float, yo)), **xexact(xo, yo, 0.02, 0.2)},
           {"name": "syn_xerr20_noyu", "x": list(map(float, xo)), "y": list(map(float, yo)), **xexact(xo, yo, 0.4, 0.0)}]
    doc = {
        "generator": "testdata/refgen/checks_ref.py",
        "versions": {"python": platform.python_version(), "numpy": np.__version__,
                     "scipy": scipy.__version__, "statsmodels": statsmodels.__version__},
        "note": "Synthetic sets are invented test data (seeded); NIST sets are read from ../shared/reference.",
        "cases": cases,
        "shapiro": shapiro_samples(),
        "xexact": xex,
    }
    with open(OUT, "w") as f:
        json.dump(clean(doc), f, indent=1, allow_nan=False)
        f.write("\n")
    print("wrote", OUT, file=sys.stderr)


if __name__ == "__main__":
    main()
