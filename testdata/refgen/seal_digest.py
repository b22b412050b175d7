#!/usr/bin/python3
"""Seal digests of the sample session file, computed from FORMAT.md alone.

    /usr/bin/python3 testdata/refgen/seal_digest.py

Reads testdata/session/sample.json (the sample file as decoded to JSON, invented
data), builds for each sealed revision the byte encoding that app/session/FORMAT.md
("Seal digest") specifies, hashes it with hashlib.sha256 (FIPS 180-4) and writes
testdata/golden/seal_digest.json. It shares no code with Pairline: the Go test
(app/session/seal_golden_test.go) checks that Pairline's digests are these.
"""
import datetime
import hashlib
import json
import os
import platform
import struct

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
SRC = os.path.join(ROOT, "testdata", "session", "sample.json")
OUT = os.path.join(ROOT, "testdata", "golden", "seal_digest.json")

ZERO = "0001-01-01T00:00:00Z"


def tm(s):
    """RFC 3339 in UTC, nanoseconds with trailing zeros dropped, or ''."""
    if s is None or s == ZERO:
        return ""
    date, _, rest = s.partition("T")
    # Go writes UTC times with Z; keep the fraction as digits (Python's datetime
    # has only microseconds).
    assert rest.endswith("Z"), s
    clock = rest[:-1]
    hms, _, frac = clock.partition(".")
    frac = frac.rstrip("0")
    datetime.datetime.strptime(date + "T" + hms, "%Y-%m-%dT%H:%M:%S")  # a valid time
    return date + "T" + hms + ("." + frac if frac else "") + "Z"


def f64(v):
    return struct.pack(">d", float(v)).hex()


def opt(v):
    return "" if v is None else f64(v)


def enc(sid, created, r, seal):
    items = []

    def it(name, value):
        items.append((name, value))

    it("format", "pairline-seal-1")
    it("id", sid)
    it("created", tm(created))
    it("revision", str(r["revision"]))
    for k in ["title", "site"]:
        it(k, r[k])
    ins = r["instrument"]
    it("instrument.description", ins["description"])
    it("instrument.serial", ins["serial"])
    it("instrument.id", ins["id"])
    it("instrument.interval_days", str(ins["interval_days"]))
    for k in ["operator", "x_name", "x_unit", "y_name", "y_unit", "notes"]:
        it(k, r[k])
    dc = r["decimal_comma"]
    it("decimal_comma", "" if dc is None else ("true" if dc else "false"))
    loc = r["location"]
    if loc is None:
        it("location", "")
    else:
        it("location", "given")
        it("location.lat", f64(loc["lat"]))
        it("location.lon", f64(loc["lon"]))
        it("location.accuracy_m", f64(loc["accuracy_m"]))
        it("location.taken", tm(loc["taken"]))
    rd = r["readings"] or []
    it("readings", str(len(rd)))
    for i, q in enumerate(rd):
        p = "readings[%d]." % i
        it(p + "x", q["x"])
        it(p + "y", q["y"])
        it(p + "note", q["note"])
        it(p + "taken", tm(q["taken"]))
        it(p + "excluded", "true" if q["excluded"] else "false")
        it(p + "exclude_reason", q["exclude_reason"])
    st = r["settings"]
    it("settings.model", st["model"])
    it("settings.transform", st["transform"])
    it("settings.box_cox_lambda", opt(st["box_cox_lambda"]))
    it("settings.weights", st["weights"])
    it("settings.level", f64(st["level"]))
    it("settings.slope_ref", opt(st["slope_ref"]))
    it("settings.intercept_ref", opt(st["intercept_ref"]))
    for k in ["variance_ratio", "x_uncertainty", "y_uncertainty"]:
        it("settings." + k, f64(st[k]))
    a = st["acceptance"]
    if a is None:
        it("settings.acceptance", "")
    else:
        it("settings.acceptance", "given")
        for k in ["min_r_squared", "slope_low", "slope_high", "intercept_low", "intercept_high", "max_residual"]:
            it("settings.acceptance." + k, opt(a.get(k)))
        it("settings.acceptance.max_residual_percent_of_span", "true" if a.get("max_residual_percent_of_span") else "false")
    cs = r["conditions"] or []
    it("conditions", str(len(cs)))
    for i, c in enumerate(cs):
        for k in ["name", "value", "unit"]:
            it("conditions[%d].%s" % (i, k), c[k])
    ss = r["standards"] or []
    it("standards", str(len(ss)))
    for i, c in enumerate(ss):
        for k in ["name", "certificate", "value", "uncertainty"]:
            it("standards[%d].%s" % (i, k), c[k])
        it("standards[%d].expiry" % i, tm(c["expiry"]))
    us = r["unknowns"] or []
    it("unknowns", str(len(us)))
    for i, u in enumerate(us):
        it("unknowns[%d].name" % i, u["name"])
        rs = u["readings"] or []
        it("unknowns[%d].readings" % i, str(len(rs)))
        for j, v in enumerate(rs):
            it("unknowns[%d].readings[%d]" % (i, j), v)
    it("performed_by", seal["performed_by"])
    it("performed_at", tm(seal["performed_at"]))
    it("reviewed_by", seal["reviewed_by"])
    it("reviewed_at", tm(seal["reviewed_at"]))
    out = b""
    for name, value in items:
        v = value.encode("utf-8")
        out += name.encode("ascii") + b" " + str(len(v)).encode("ascii") + b" " + v + b"\n"
    return hashlib.sha256(out).hexdigest()


doc = json.load(open(SRC, encoding="utf-8"))
digests = []
for k, s in enumerate(doc["sessions"]):
    for r in s["sealed"] or []:
        digests.append({"session": k, "revision": r["revision"], "digest": enc(s["id"], s["created"], r, r["seal"])})
    if s["seal"] is not None:
        digests.append({"session": k, "revision": s["revision"], "digest": enc(s["id"], s["created"], s, s["seal"])})
with open(OUT, "w") as f:
    json.dump({"source": "testdata/session/sample.json (invented data), hashed by this script from FORMAT.md",
               "generator": {"script": "testdata/refgen/seal_digest.py", "python": platform.python_version()},
               "digests": digests}, f, indent=1)
    f.write("\n")
print("wrote", OUT, len(digests), "digests")
