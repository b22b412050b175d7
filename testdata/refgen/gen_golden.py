#!/usr/bin/python3
"""Generate Pairline's golden reference outputs with statsmodels and scipy.

Run with Debian's interpreter, which has python3-statsmodels and python3-scipy:

    /usr/bin/python3 testdata/refgen/gen_golden.py [--shared DIR] [--out DIR]

--shared defaults to ../shared/reference (relative to the repository root),
--out to testdata/golden. One JSON file per dataset is written,
golden_<name>.json. Each holds the x, y data it used (so the Go tests run
without the shared folder), a "source" naming where the data come from, a
"generator" recording the library versions, and a list of "fits": one per
fitting option set, each with the values statsmodels/scipy compute.

Reference computations (all from the libraries, not re-derived here, except
where a comment says otherwise):
  * OLS / WLS / through-origin fits: statsmodels.api.OLS, WLS.
  * coefficient tests against 1 (slope) and 0 (intercept): results.t_test.
  * predictions with confidence and prediction intervals:
    results.get_prediction(...).summary_frame(alpha).
  * influence: results.get_influence() (hat diagonal, externally studentized
    residuals, Cook's distance, DFFITS); Bonferroni outlier p:
    results.outlier_test(method="bonf").
  * Breusch-Pagan, Koenker's studentized (robust) form:
    statsmodels.stats.diagnostic.het_breuschpagan(resid, [1, x], robust=True).
  * White: statsmodels.stats.diagnostic.het_white(resid, [1, x]).
  * Durbin-Watson: statsmodels.stats.stattools.durbin_watson.
  * Shapiro-Wilk of the residuals: scipy.stats.shapiro.
  * curvature: t-test of the added centred (x - mean x)^2 term in an OLS fit.
  * lack of fit (x repeats): statsmodels anova_lm comparing y ~ x with
    y ~ C(x) (x as categorical: the pure-error model).
  * inverse prediction: Fieller interval found as the set of x whose
    prediction band (for the mean of m repeat readings) contains the observed
    mean; endpoints by scipy.optimize.brentq on statsmodels' prediction
    standard errors. Standard error by the delta method on statsmodels'
    cov_params plus the reading variance s^2/m.
  * Box-Cox lambda (regression form, Box & Cox 1964): maximise the profile
    log-likelihood -n/2 log(SSR(lambda)/n) + (lambda - 1) sum(log y), SSR from
    statsmodels OLS of the transformed y on x; interval where the
    log-likelihood is within chi2(1, level)/2 of its maximum.

The synthetic data sets are invented (seeded numpy draws) and are marked as
invented in their golden files.
"""

import argparse
import json
import math
import os
import sys

import numpy as np
import pandas as pd
import scipy
import scipy.optimize
import scipy.stats
import statsmodels
import statsmodels.api as sm
import statsmodels.formula.api as smf
from statsmodels.stats.anova import anova_lm
from statsmodels.stats.diagnostic import het_breuschpagan, het_white
from statsmodels.stats.stattools import durbin_watson

HANDBOOK = "NIST/SEMATECH e-Handbook of Statistical Methods, itl.nist.gov/div898/handbook, datasets page"
STRD = "NIST/ITL StRD linear least squares (itl.nist.gov/div898/strd)"


# ---------------------------------------------------------------- reading data

def _is_number(tok):
    try:
        float(tok)
        return True
    except ValueError:
        return False


def read_dataplot(path):
    """Read a Dataplot .DAT file: free text, then whitespace-separated numbers.

    The numeric block starts after the last line made only of dashes when
    there is one (every handbook file has it); otherwise every line whose
    tokens are all numbers counts. Rows must have the most common column
    count of the block; blank lines are ignored.
    """
    with open(path, "r", encoding="latin-1") as f:
        lines = [ln.rstrip("\r\n") for ln in f]
    start = 0
    for i, ln in enumerate(lines):
        s = ln.strip()
        if len(s) >= 3 and set(s) == {"-"}:
            start = i + 1
    rows = []
    for ln in lines[start:]:
        toks = ln.split()
        if toks and all(_is_number(t) for t in toks):
            rows.append([float(t) for t in toks])
    if not rows:
        raise ValueError("%s: no numeric rows" % path)
    counts = {}
    for r in rows:
        counts[len(r)] = counts.get(len(r), 0) + 1
    ncol = max(counts, key=lambda k: (counts[k], k))
    bad = [r for r in rows if len(r) != ncol]
    if bad:
        raise ValueError("%s: %d rows do not have %d columns" % (path, len(bad), ncol))
    return np.array(rows)


def read_strd(path):
    """Read an StRD file as stored in /work/shared: '#' comments, 'y x' rows."""
    rows = []
    with open(path) as f:
        for ln in f:
            s = ln.strip()
            if not s or s.startswith("#"):
                continue
            rows.append([float(t) for t in s.split()])
    a = np.array(rows)
    return a[:, 1], a[:, 0]  # x, y


# ---------------------------------------------------------------- helpers

def fnum(v):
    """A float for JSON, or None when not finite."""
    v = float(v)
    return v if math.isfinite(v) else None


def flist(a):
    return [fnum(v) for v in np.asarray(a, dtype=float)]


def coef_block(res, i, ref, level):
    alpha = 1 - level
    ci = np.asarray(res.conf_int(alpha=alpha))[i]
    r = np.zeros(len(res.params))
    r[i] = 1.0
    tt = res.t_test((r.reshape(1, -1), np.array([ref])))
    return {
        "estimate": fnum(res.params[i]),
        "se": fnum(res.bse[i]),
        "t": fnum(res.tvalues[i]),
        "p": fnum(res.pvalues[i]),
        "ci_low": fnum(ci[0]),
        "ci_high": fnum(ci[1]),
        "ref": ref,
        "t_ref": fnum(np.asarray(tt.tvalue).ravel()[0]),
        "p_ref": fnum(np.asarray(tt.pvalue).ravel()[0]),
    }


def design(x, origin):
    return x.reshape(-1, 1) if origin else sm.add_constant(x, has_constant="add")


def predictions(res, xs, origin, level, weights_at=None, no_pi=False):
    if not xs:
        return []
    xs = np.asarray(xs, dtype=float)
    ex = design(xs, origin)
    w = None if weights_at is None else weights_at(xs)
    sf = res.get_prediction(ex, weights=w).summary_frame(alpha=1 - level)
    out = []
    for k, x0 in enumerate(xs):
        if no_pi:
            # No weight is defined for a new reading at x0 (repeat-based
            # weights), so there is no reference prediction interval.
            sf.loc[sf.index[k], ["obs_ci_lower", "obs_ci_upper"]] = np.nan
        out.append({
            "x": fnum(x0),
            "fit": fnum(sf["mean"].iloc[k]),
            "se_fit": fnum(sf["mean_se"].iloc[k]),
            "ci_low": fnum(sf["mean_ci_lower"].iloc[k]),
            "ci_high": fnum(sf["mean_ci_upper"].iloc[k]),
            "pi_low": fnum(sf["obs_ci_lower"].iloc[k]),
            "pi_high": fnum(sf["obs_ci_upper"].iloc[k]),
        })
    return out


def influence(res):
    inf = res.get_influence()
    with np.errstate(all="ignore"):
        stud = inf.resid_studentized_external
        ot = res.outlier_test(method="bonf")
    return {
        "leverage": flist(inf.hat_matrix_diag),
        "residual": flist(res.resid),
        "studentized": flist(stud),
        "cooks_distance": flist(inf.cooks_distance[0]),
        "dffits": flist(inf.dffits[0]),
        "outlier_p": flist(np.asarray(ot)[:, 2]),
    }


def checks(x, y, res):
    """Assumption checks on the residuals of a line with intercept."""
    e = np.asarray(res.resid)
    n = len(x)
    X = sm.add_constant(x, has_constant="add")
    distinct = len(np.unique(x))
    out = {}

    lm, lm_p, _, _ = het_breuschpagan(e, X, robust=True)
    out["breusch_pagan"] = {"statistic": fnum(lm), "df": 1, "p": fnum(lm_p)}

    if distinct >= 3 and n > 3:
        w, w_p, _, _ = het_white(e, X)
        out["white"] = {"statistic": fnum(w), "df": 2, "p": fnum(w_p)}
    else:
        out["white"] = None

    out["durbin_watson"] = {"statistic": fnum(durbin_watson(e))}

    if n >= 3:
        sw = scipy.stats.shapiro(e)
        # scipy's n = 3 formula can round to a tiny negative p; a probability
        # is clamped to [0, 1]. Note: scipy's swilk works in single precision
        # (float32 arrays), so W is good to ~1e-7 and p to ~1e-5 relative.
        out["shapiro_wilk"] = {"statistic": fnum(sw.statistic), "p": fnum(min(1.0, max(0.0, sw.pvalue)))}
    else:
        out["shapiro_wilk"] = None

    if distinct >= 3 and n > 3:
        xc = x - x.mean()
        Xq = np.column_stack([np.ones(n), x, xc * xc])
        rq = sm.OLS(y, Xq).fit()
        out["curvature"] = {"statistic": fnum(rq.tvalues[2]), "df": fnum(rq.df_resid),
                            "p": fnum(rq.pvalues[2]), "quad_coef": fnum(rq.params[2])}
    else:
        out["curvature"] = None

    if distinct < n and distinct > 2:
        df = pd.DataFrame({"x": x, "y": y})
        m1 = smf.ols("y ~ x", df).fit()
        m2 = smf.ols("y ~ C(x)", df).fit()
        a = anova_lm(m1, m2)
        out["lack_of_fit"] = {
            "statistic": fnum(a["F"].iloc[1]),
            "df": fnum(a["df_diff"].iloc[1]),
            "df2": fnum(a["df_resid"].iloc[1]),
            "p": fnum(a["Pr(>F)"].iloc[1]),
            "ss_lack_of_fit": fnum(a["ss_diff"].iloc[1]),
            "ss_pure_error": fnum(a["ssr"].iloc[1]),
        }
    else:
        out["lack_of_fit"] = None
    return out


def inverse(res, origin, level, queries):
    """Fieller interval and delta-method SE for x behind observed y readings."""
    out = []
    if not queries:
        return out
    n = int(res.nobs)
    df = res.df_resid
    s2 = res.scale
    tcrit = scipy.stats.t.ppf(1 - (1 - level) / 2, df)
    b = np.asarray(res.params)
    C = np.asarray(res.cov_params())
    for q in queries:
        ys = np.asarray(q, dtype=float)
        m = len(ys)
        ybar = ys.mean()
        if origin:
            b1 = b[0]
            x0 = ybar / b1
            g = np.array([-ybar / b1 ** 2])
        else:
            b0, b1 = b
            x0 = (ybar - b0) / b1
            g = np.array([-1 / b1, -(ybar - b0) / b1 ** 2])
        se = math.sqrt(g @ C @ g + s2 / (m * b1 ** 2))

        def band(xv):
            pr = res.get_prediction(design(np.array([xv]), origin))
            fit = float(pr.predicted_mean[0])
            var = float(pr.se_mean[0]) ** 2 + s2 / m
            return (ybar - fit) ** 2 - tcrit ** 2 * var

        bounded = abs(res.tvalues[-1 if not origin else 0]) > tcrit
        item = {"y": list(map(float, ys)), "y_mean": fnum(ybar), "m": m,
                "x": fnum(x0), "se": fnum(se), "bounded": bool(bounded)}
        if bounded:
            width = 10 * (abs(x0) + 1) + 100 * se
            lo = scipy.optimize.brentq(band, x0 - width, x0, xtol=1e-14, rtol=1e-15, maxiter=500)
            hi = scipy.optimize.brentq(band, x0, x0 + width, xtol=1e-14, rtol=1e-15, maxiter=500)
            item["low"], item["high"] = fnum(lo), fnum(hi)
        out.append(item)
    return out


def box_cox(x, y, level):
    """Profile-likelihood Box-Cox lambda for the regression of y on x."""
    if np.any(y <= 0):
        return None
    X = sm.add_constant(x, has_constant="add")
    n = len(y)
    sly = float(np.sum(np.log(y)))

    def llf(lam):
        if abs(lam) < 1e-12:
            z = np.log(y)
        else:
            z = (y ** lam - 1) / lam
        ssr = sm.OLS(z, X).fit().ssr
        return -n / 2 * math.log(ssr / n) + (lam - 1) * sly

    grid = np.linspace(-3, 3, 601)
    vals = np.array([llf(g) for g in grid])
    k = int(np.argmax(vals))
    if k == 0 or k == len(grid) - 1:
        return {"lambda_at_bound": True}
    opt = scipy.optimize.minimize_scalar(lambda l: -llf(l), bracket=(grid[k - 1], grid[k], grid[k + 1]),
                                         method="brent", tol=1e-12)
    lam = float(opt.x)
    top = llf(lam)
    cut = scipy.stats.chi2.ppf(level, 1) / 2

    def h(l):
        return llf(l) - (top - cut)

    out = {"lambda": fnum(lam), "loglik": fnum(top)}
    lo_edge, hi_edge = lam - 10, lam + 10
    out["ci_low"] = fnum(scipy.optimize.brentq(h, lo_edge, lam, xtol=1e-13)) if h(lo_edge) < 0 else None
    out["ci_high"] = fnum(scipy.optimize.brentq(h, lam, hi_edge, xtol=1e-13)) if h(hi_edge) < 0 else None
    return out


def repeat_weights(x, y):
    """w_i = 1 / sample variance (n-1 denominator) of the y readings at x_i."""
    w = np.empty(len(x))
    for i, xv in enumerate(x):
        grp = y[x == xv]
        if len(grp) < 2:
            return None
        v = np.var(grp, ddof=1)
        if v <= 0:
            return None
        w[i] = 1 / v
    return w


# ---------------------------------------------------------------- one fit

def fit_block(x, y, spec):
    level = spec.get("level", 0.95)
    model = spec.get("model", "ols")
    wname = spec.get("weights", "")
    origin = model == "origin"
    X = design(x, origin)
    weights_at = None
    w = None
    if model == "weighted":
        if wname == "x2":
            w = 1 / x ** 2
            weights_at = lambda xs: 1 / xs ** 2
        elif wname == "x":
            w = 1 / x
            weights_at = lambda xs: 1 / xs
        elif wname == "fitted2":
            first = sm.OLS(y, X).fit()
            w = 1 / np.asarray(first.fittedvalues) ** 2
            b0, b1 = first.params
            weights_at = lambda xs: 1 / (b0 + b1 * xs) ** 2
        elif wname == "repeats":
            w = repeat_weights(x, y)
            weights_at = None  # prediction band for a reading of weight 1
        else:
            raise ValueError("unknown weights " + wname)
        res = sm.WLS(y, X, weights=w).fit()
    else:
        res = sm.OLS(y, X).fit()

    out = {"spec": spec, "n": int(res.nobs), "df": fnum(res.df_resid), "level": level}
    if origin:
        out["slope"] = coef_block(res, 0, 1.0, level)
        out["intercept"] = None
        out["cov_slope_intercept"] = 0.0
    else:
        out["intercept"] = coef_block(res, 0, 0.0, level)
        out["slope"] = coef_block(res, 1, 1.0, level)
        out["cov_slope_intercept"] = fnum(np.asarray(res.cov_params())[0, 1])
    out["residual_se"] = fnum(math.sqrt(res.scale))
    out["r_squared"] = fnum(res.rsquared)
    out["adj_r_squared"] = fnum(res.rsquared_adj)
    out["f"] = fnum(res.fvalue)
    out["f_p"] = fnum(res.f_pvalue)
    out["anova"] = {
        "regression": {"df": fnum(res.df_model), "ss": fnum(res.ess)},
        "residual": {"df": fnum(res.df_resid), "ss": fnum(res.ssr)},
    }
    if w is not None:
        out["weights"] = flist(w)
    out["predictions"] = predictions(res, spec.get("predict_x", []), origin, level, weights_at,
                                     no_pi=(wname == "repeats"))
    if model != "weighted":
        out["influence"] = influence(res)
        out["inverse"] = inverse(res, origin, level, spec.get("inverse", []))
    if model == "ols":
        out["checks"] = checks(x, y, res)
        out["box_cox"] = box_cox(x, y, level)
    return out


# ---------------------------------------------------------------- datasets

def synthetic():
    """Invented data sets (seeded numpy draws), rounded to 4 decimals."""
    sets = []

    rng = np.random.default_rng(20240611)
    x = np.repeat(np.arange(2.0, 32.0, 2.0), 2)
    y = 1.0 + 1.5 * x + rng.normal(0, 1, len(x)) * 0.08 * x
    sets.append(("synth_spread", x, np.round(y, 4),
                 "invented: scatter grows in proportion to x (seeded numpy, Larkwater Valley Water Board "
                 "turbidity probe scenario, fictional)"))

    rng = np.random.default_rng(7)
    x = np.arange(0.0, 21.0)
    y = 0.5 + 0.8 * x + 0.03 * x ** 2 + rng.normal(0, 0.3, len(x))
    sets.append(("synth_curve", x, np.round(y, 4),
                 "invented: gentle quadratic bend (seeded numpy, fictional flow-gauge scenario)"))

    rng = np.random.default_rng(99)
    x = np.linspace(1, 40, 40)
    e = np.zeros(40)
    z = rng.normal(0, 0.5, 40)
    for i in range(40):
        e[i] = (0.8 * e[i - 1] if i else 0) + z[i]
    y = 3 + 0.25 * x + e
    sets.append(("synth_drift", x, np.round(y, 4),
                 "invented: serially correlated errors, AR(1) 0.8 (seeded numpy, fictional logger)"))

    rng = np.random.default_rng(314)
    x = np.repeat([1.0, 2.5, 4.0, 5.5, 7.0, 8.5], 4)
    y = 0.2 + 2.0 * x + rng.normal(0, 0.05, len(x)) * (1 + x / 4)
    sets.append(("synth_repeats", x, np.round(y, 4),
                 "invented: four repeat readings at six levels (seeded numpy, fictional conductivity standards)"))

    rng = np.random.default_rng(5)
    x = np.concatenate([np.linspace(1, 10, 14), [25.0]])
    y = 2 + 0.9 * x + rng.normal(0, 0.4, len(x))
    y[6] += 4.0    # gross outlier
    y[14] -= 3.0   # high-leverage point off the line
    sets.append(("synth_outlier", x, np.round(y, 4),
                 "invented: one gross outlier (index 6) and one high-leverage point (index 14) "
                 "(seeded numpy, fictional)"))

    rng = np.random.default_rng(42)
    x = np.linspace(0.5, 12, 18)
    y = 1.9 * x + rng.normal(0, 0.2, len(x))
    sets.append(("synth_origin", x, np.round(y, 4),
                 "invented: proportional response through the origin (seeded numpy, fictional)"))
    return sets


def datasets(shared):
    hb = os.path.join(shared, "nist-handbook")
    sd = os.path.join(shared, "strd")
    out = []

    a = read_dataplot(os.path.join(hb, "ALASKA_PIPELINE.DAT"))
    x, y = a[:, 1], a[:, 0]  # x = lab defect size, y = field defect size
    out.append({"name": "alaska_pipeline", "x": x, "y": y,
                "source": HANDBOOK + ", ALASKA_PIPELINE.DAT (x = lab defect size, column 2; "
                          "y = field defect size, column 1); handbook 4.6.3",
                "fits": [
                    {"model": "ols", "predict_x": [10.0, 40.0, 80.0]},
                    {"model": "weighted", "weights": "x2", "predict_x": [10.0, 40.0, 80.0]},
                    {"model": "weighted", "weights": "fitted2", "predict_x": [10.0, 40.0, 80.0]},
                ]})

    a = read_dataplot(os.path.join(hb, "CALIBRATIONLINE.DAT"))
    x, y = a[:, 0], a[:, 1]
    out.append({"name": "calibrationline", "x": x, "y": y,
                "source": HANDBOOK + ", CALIBRATIONLINE.DAT (first two columns); handbook 2.3.6",
                "fits": [
                    {"model": "ols", "predict_x": [2.0, 6.0, 10.5],
                     "inverse": [[2.5], [6.0], [10.0], [6.0, 6.1, 6.05]]},
                    {"model": "ols", "level": 0.99, "predict_x": [2.0, 6.0, 10.5],
                     "inverse": [[6.0], [6.0, 6.1, 6.05]]},
                ]})

    a = read_dataplot(os.path.join(hb, "LOADCELL.DAT"))
    x, y = a[:, 0], a[:, 1]
    out.append({"name": "loadcell", "x": x, "y": y,
                "source": HANDBOOK + ", LOADCELL.DAT; handbook 2.3.6 (calibration with repeats)",
                "fits": [
                    {"model": "ols", "predict_x": [5.0, 15.0], "inverse": [[1.5]]},
                    {"model": "weighted", "weights": "repeats", "predict_x": [5.0, 15.0]},
                ]})

    a = read_dataplot(os.path.join(hb, "ANSCOMBE.DAT"))
    for k in range(4):
        x, y = a[:, 2 * k], a[:, 2 * k + 1]
        out.append({"name": "anscombe_%d" % (k + 1), "x": x, "y": y,
                    "source": HANDBOOK + ", ANSCOMBE.DAT columns X%d Y%d (Anscombe 1973, "
                              "The American Statistician 27)" % (k + 1, k + 1),
                    "fits": [{"model": "ols", "predict_x": [9.0, 15.0]}]})

    a = read_dataplot(os.path.join(hb, "PONTIUS.DAT"))
    x, y = a[:, 1], a[:, 0]  # x = load, y = deflection
    out.append({"name": "pontius", "x": x, "y": y,
                "source": HANDBOOK + ", PONTIUS.DAT (x = load, column 2; y = deflection, column 1)",
                "fits": [{"model": "ols", "predict_x": [1.0e6, 2.0e6]},
                         {"model": "origin", "predict_x": [1.0e6]}]})

    a = read_dataplot(os.path.join(hb, "LOAD_CELL_CAL.DAT"))
    x, y = a[:, 1], a[:, 0]
    out.append({"name": "load_cell_cal", "x": x, "y": y,
                "source": HANDBOOK + ", LOAD_CELL_CAL.DAT (x = load, column 2; y = deflection, column 1)",
                "fits": [{"model": "ols", "predict_x": [1.5e6]}]})

    x, y = read_strd(os.path.join(sd, "Norris.txt"))
    out.append({"name": "norris", "x": x, "y": y, "source": STRD + ", Norris",
                "fits": [{"model": "ols", "predict_x": [0.0, 500.0]}]})
    # NoInt1's points lie exactly on y = x + 70, so only the through-origin
    # fit (what the data set certifies) is meaningful there.
    x, y = read_strd(os.path.join(sd, "NoInt1.txt"))
    out.append({"name": "noint1", "x": x, "y": y, "source": STRD + ", NoInt1",
                "fits": [{"model": "origin", "predict_x": [65.0], "inverse": [[135.0]]}]})
    x, y = read_strd(os.path.join(sd, "NoInt2.txt"))
    out.append({"name": "noint2", "x": x, "y": y, "source": STRD + ", NoInt2",
                "fits": [{"model": "origin", "predict_x": [5.0]},
                         {"model": "ols", "predict_x": [5.0]}]})

    for name, x, y, src in synthetic():
        fits = [{"model": "ols", "predict_x": [float(np.median(x))]}]
        if name == "synth_spread":
            fits.append({"model": "weighted", "weights": "x2", "predict_x": [10.0]})
            fits.append({"model": "weighted", "weights": "x", "predict_x": [10.0]})
        if name == "synth_repeats":
            fits.append({"model": "weighted", "weights": "repeats", "predict_x": [3.0]})
            fits[0]["inverse"] = [[9.0], [9.0, 9.1]]
        if name == "synth_origin":
            fits.append({"model": "origin", "predict_x": [6.0], "inverse": [[10.0]]})
        out.append({"name": name, "x": x, "y": y, "source": src, "invented": True, "fits": fits})
    return out


def generator_info():
    return {
        "script": "testdata/refgen/gen_golden.py",
        "python": sys.version.split()[0],
        "statsmodels": statsmodels.__version__,
        "scipy": scipy.__version__,
        "numpy": np.__version__,
        "pandas": pd.__version__,
    }


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    root = os.path.dirname(os.path.dirname(here))
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--shared", default=os.path.join(root, "..", "shared", "reference"))
    ap.add_argument("--out", default=os.path.join(root, "testdata", "golden"))
    args = ap.parse_args()
    os.makedirs(args.out, exist_ok=True)
    gen = generator_info()
    for ds in datasets(args.shared):
        x = np.asarray(ds["x"], dtype=float)
        y = np.asarray(ds["y"], dtype=float)
        doc = {
            "name": ds["name"],
            "source": ds["source"],
            "invented": ds.get("invented", False),
            "generator": gen,
            "x": flist(x),
            "y": flist(y),
            "fits": [fit_block(x, y, spec) for spec in ds["fits"]],
        }
        path = os.path.join(args.out, "golden_%s.json" % ds["name"])
        with open(path, "w") as f:
            json.dump(doc, f, indent=1, sort_keys=True, allow_nan=False)
            f.write("\n")
        print("wrote", path)


if __name__ == "__main__":
    main()
