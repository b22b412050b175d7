#!/usr/bin/python3
"""The work of `pairline fit` on a CSV, done with pandas and statsmodels,
for `make bench-fit` to time against bin/pairline (Debian's
python3-pandas, python3-statsmodels and python3-scipy).

Reads the first two columns of FILE with pandas.read_csv, fits ordinary
least squares with inference (statsmodels OLS: estimates, standard errors,
intervals, t and p), and runs Breusch–Pagan and White
(statsmodels.stats.diagnostic), Durbin–Watson (statsmodels.stats.stattools),
Shapiro–Wilk on a subsample of 5,000 residuals (scipy.stats.shapiro; scipy
takes at most 5,000 for its p-value), leverage and Cook's distance
(OLSInfluence). It prints a few figures so the work cannot be skipped.

Usage: fit_pandas_bench.py FILE
"""
import sys

import numpy as np
import pandas as pd
import statsmodels.api as sm
from scipy import stats
from statsmodels.stats.diagnostic import het_breuschpagan, het_white
from statsmodels.stats.outliers_influence import OLSInfluence
from statsmodels.stats.stattools import durbin_watson


def main(path):
    df = pd.read_csv(path)
    x = df.iloc[:, 0].to_numpy(dtype=float)
    y = df.iloc[:, 1].to_numpy(dtype=float)
    X = sm.add_constant(x)
    fit = sm.OLS(y, X).fit()
    ci = fit.conf_int(0.05)
    bp = het_breuschpagan(fit.resid, X)
    white = het_white(fit.resid, X)
    dw = durbin_watson(fit.resid)
    rng = np.random.default_rng(1)
    sub = rng.choice(fit.resid, size=min(5000, len(fit.resid)), replace=False)
    sw = stats.shapiro(sub)
    infl = OLSInfluence(fit)
    lev = infl.hat_matrix_diag
    cooks = infl.cooks_distance[0]
    print(f"n {len(x)} slope {fit.params[1]:.9g} ± {fit.bse[1]:.3g} [{ci[1][0]:.9g}, {ci[1][1]:.9g}] "
          f"p {fit.pvalues[1]:.3g} intercept {fit.params[0]:.9g}")
    print(f"BP {bp[0]:.6g} White {white[0]:.6g} DW {dw:.6g} SW(5000) {sw.statistic:.6g} "
          f"max leverage {lev.max():.3g} max Cook {cooks.max():.3g}")


if __name__ == "__main__":
    main(sys.argv[1])
