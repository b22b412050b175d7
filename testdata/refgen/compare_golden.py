#!/usr/bin/python3
"""Compare two directories of golden JSON files with a numeric tolerance.

    compare_golden.py COMMITTED_DIR FRESH_DIR [--rel 1e-9] [--abs 1e-12]

Only golden_*.json files are compared (other files in the folder belong to
other generators). Numbers match when |a - b| <= abs + rel * max(|a|, |b|);
strings, booleans and nulls must be equal; the "generator" block (library
versions) is shown but not compared. Exits 1 on any difference, listing each with its JSON path.
"""
import argparse
import glob
import json
import os
import sys


def walk(a, b, path, tol, out):
    ra, aa = tol
    if isinstance(a, bool) or isinstance(b, bool):
        if a is not b:
            out.append("%s: %r != %r" % (path, a, b))
    elif isinstance(a, (int, float)) and isinstance(b, (int, float)):
        if abs(a - b) > aa + ra * max(abs(a), abs(b)):
            out.append("%s: %r != %r" % (path, a, b))
    elif isinstance(a, dict) and isinstance(b, dict):
        for k in sorted(set(a) | set(b)):
            if k == "generator":
                continue
            if k not in a or k not in b:
                out.append("%s.%s: only in %s" % (path, k, "committed" if k in a else "fresh"))
                continue
            walk(a[k], b[k], path + "." + k, tol, out)
    elif isinstance(a, list) and isinstance(b, list):
        if len(a) != len(b):
            out.append("%s: length %d != %d" % (path, len(a), len(b)))
            return
        for i, (u, v) in enumerate(zip(a, b)):
            walk(u, v, "%s[%d]" % (path, i), tol, out)
    elif a != b:
        out.append("%s: %r != %r" % (path, a, b))


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("committed")
    ap.add_argument("fresh")
    ap.add_argument("--rel", type=float, default=1e-9)
    ap.add_argument("--abs", type=float, default=1e-12)
    args = ap.parse_args()
    old = {os.path.basename(p) for p in glob.glob(os.path.join(args.committed, "golden_*.json"))}
    new = {os.path.basename(p) for p in glob.glob(os.path.join(args.fresh, "golden_*.json"))}
    diffs = []
    for name in sorted(old ^ new):
        diffs.append("%s: only in %s" % (name, "committed" if name in old else "fresh"))
    for name in sorted(old & new):
        with open(os.path.join(args.committed, name)) as f:
            a = json.load(f)
        with open(os.path.join(args.fresh, name)) as f:
            b = json.load(f)
        if a.get("generator") != b.get("generator"):
            print("note: %s generated with %s, now %s" % (name, a.get("generator"), b.get("generator")))
        walk(a, b, name, (args.rel, args.abs), diffs)
    for d in diffs:
        print("DIFF", d)
    if diffs:
        print("refcheck: %d difference(s) beyond rel %g / abs %g" % (len(diffs), args.rel, args.abs))
        return 1
    print("refcheck: %d golden files match (rel %g, abs %g)" % (len(old), args.rel, args.abs))
    return 0


if __name__ == "__main__":
    sys.exit(main())
