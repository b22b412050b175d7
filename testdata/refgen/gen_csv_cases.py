#!/usr/bin/python3
"""Write the CSV/TSV test inputs of `pairline fit` and their expected fits.

    /usr/bin/python3 testdata/refgen/gen_csv_cases.py

All readings are INVENTED (the fictional Larkwater Valley Water Board's
bench checks of its field meters). The script holds each case's intended
x, y pairs, writes them to testdata/csv/ in a different file dialect (BOM,
';' with decimal commas, tabs, quotes, blank and incomplete rows, extra
columns), and records in testdata/csv/expected.json the fit statsmodels
(Debian python3-statsmodels, OLS) gives for the intended pairs, with the
number of rows the command must skip. The Go test app/cli/fit_test.go runs
`pairline fit --json` on each file and compares.
"""

import json
import os
import sys

import numpy as np
import statsmodels
import statsmodels.api as sm

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(os.path.dirname(HERE), "csv")

# Invented: nitrate standards (mg/L) against a field photometer.
NITRATE_X = [0.5, 1.0, 2.0, 4.0, 6.0, 8.0, 10.0, 12.5]
NITRATE_Y = [0.56, 1.07, 2.01, 4.12, 6.05, 8.19, 10.11, 12.71]
# Invented: conductivity standards (µS/cm) against a handheld meter.
COND_X = [84.0, 147.0, 500.0, 1000.0, 1413.0, 2000.0, 2764.0]
COND_Y = [86.1, 149.5, 507.2, 1011.8, 1427.9, 2019.3, 2791.0]
# Invented: turbidity standards (NTU) against a probe.
TURB_X = [0.1, 1.0, 5.0, 10.0, 20.0, 40.0, 80.0, 100.0, 200.0]
TURB_Y = [0.14, 1.05, 5.21, 10.12, 20.61, 40.87, 81.24, 101.9, 203.3]


def comma(v):
    return ("%g" % v).replace(".", ",")


def write(name, text, bom=False, newline="\n"):
    path = os.path.join(OUT, name)
    data = text.replace("\n", newline).encode("utf-8")
    if bom:
        data = b"\xef\xbb\xbf" + data
    with open(path, "wb") as f:
        f.write(data)


def ols(x, y):
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    r = sm.OLS(y, sm.add_constant(x)).fit()
    return {
        "n": len(x),
        "intercept": float(r.params[0]),
        "slope": float(r.params[1]),
        "intercept_se": float(r.bse[0]),
        "slope_se": float(r.bse[1]),
        "r_squared": float(r.rsquared),
        "residual_se": float(np.sqrt(r.scale)),
    }


def main():
    os.makedirs(OUT, exist_ok=True)
    cases = []

    # 1. UTF-8 byte-order mark, header, CRLF line ends.
    rows = "".join("%g,%g\n" % p for p in zip(NITRATE_X, NITRATE_Y))
    write("bom_header.csv", "nitrate standard mg/L,photometer mg/L\n" + rows, bom=True, newline="\r\n")
    cases.append({"file": "bom_header.csv", "args": [], "n_skipped": 0, "fit": ols(NITRATE_X, NITRATE_Y)})

    # 2. Semicolons and decimal commas (a European spreadsheet export).
    rows = "".join("%s;%s\n" % (comma(a), comma(b)) for a, b in zip(NITRATE_X, NITRATE_Y))
    write("semicolon_decimal_comma.csv", "standard;reading\n" + rows)
    cases.append({"file": "semicolon_decimal_comma.csv", "args": [], "n_skipped": 0,
                  "fit": ols(NITRATE_X, NITRATE_Y)})

    # 3. Tabs, no header.
    rows = "".join("%g\t%g\n" % p for p in zip(COND_X, COND_Y))
    write("tabs_no_header.tsv", rows)
    cases.append({"file": "tabs_no_header.tsv", "args": [], "n_skipped": 0, "fit": ols(COND_X, COND_Y)})

    # 4. Quoted header names with commas inside, quoted numbers, thousands
    #    separators inside quotes.
    rows = "".join('"%s","%s"\n' % ("{:,.1f}".format(a), "{:,.1f}".format(b)) for a, b in zip(COND_X, COND_Y))
    write("quoted.csv", '"standard, uS/cm","meter, uS/cm"\n' + rows)
    cases.append({"file": "quoted.csv", "args": [], "n_skipped": 0, "fit": ols(COND_X, COND_Y)})

    # 5. Blank rows, two incomplete rows (a reading missing) and one row
    #    whose reading is text: 3 rows skipped, blank lines not counted.
    lines = ["standard,probe"]
    for i, (a, b) in enumerate(zip(TURB_X, TURB_Y)):
        lines.append("%g,%g" % (a, b))
        if i == 2:
            lines += ["", "30,"]
        if i == 5:
            lines += [",55.0", "", "60,over range"]
    write("blank_incomplete.csv", "\n".join(lines) + "\n\n")
    cases.append({"file": "blank_incomplete.csv", "args": [], "n_skipped": 3, "fit": ols(TURB_X, TURB_Y)})

    # 6. Extra columns; the pairs are chosen by header name and by number.
    lines = ["site,standard,probe A,probe B"]
    probe_a = [round(v * 1.01, 3) for v in TURB_Y]
    for i, (a, b) in enumerate(zip(TURB_X, TURB_Y)):
        lines.append("Larkwater intake %d,%g,%g,%g" % (i + 1, a, probe_a[i], b))
    write("columns.csv", "\n".join(lines) + "\n")
    cases.append({"file": "columns.csv", "args": ["--x-col", "standard", "--y-col", "4"], "n_skipped": 0,
                  "fit": ols(TURB_X, TURB_Y)})
    cases.append({"file": "columns.csv", "args": ["--x-col", "2", "--y-col", "probe a"], "n_skipped": 0,
                  "fit": ols(TURB_X, probe_a)})

    # Unusable inputs (expected errors are checked in the Go test).
    write("header_only.csv", "standard,reading\n")
    write("two_rows.csv", "standard,reading\n1.0,1.1\n2.0,2.1\n")
    write("same_x.csv", "standard,reading\n5.0,5.1\n5.0,4.9\n5.0,5.05\n5.0,5.0\n")
    write("text_only.csv", "site,note\nintake,cloudy\nweir,clear\nbridge,windy\n")

    doc = {
        "invented": True,
        "source": "invented readings (fictional Larkwater Valley Water Board); expected fits from statsmodels OLS",
        "generator": {"script": "testdata/refgen/gen_csv_cases.py", "python": sys.version.split()[0],
                      "statsmodels": statsmodels.__version__, "numpy": np.__version__},
        "cases": cases,
    }
    with open(os.path.join(OUT, "expected.json"), "w") as f:
        json.dump(doc, f, indent=1, sort_keys=True)
        f.write("\n")
    with open(os.path.join(OUT, "README.md"), "w") as f:
        f.write(
            "# testdata/csv — inputs for `pairline fit`\n\n"
            "All readings here are INVENTED: bench checks of the fictional Larkwater Valley Water Board's\n"
            "field meters. Written by `testdata/refgen/gen_csv_cases.py`, which also records in\n"
            "`expected.json` the fit that Debian's python3-statsmodels (OLS) gives for the intended pairs.\n"
            "Each file exercises one way real exports differ: a byte-order mark and CRLF (`bom_header.csv`),\n"
            "`;` with decimal commas (`semicolon_decimal_comma.csv`), tabs without a header\n"
            "(`tabs_no_header.tsv`), quoted cells (`quoted.csv`), blank and incomplete rows\n"
            "(`blank_incomplete.csv`), extra columns chosen by name or number (`columns.csv`), and unusable\n"
            "files (`header_only.csv`, `two_rows.csv`, `same_x.csv`, `text_only.csv`).\n")
    print("wrote", OUT)


if __name__ == "__main__":
    main()
