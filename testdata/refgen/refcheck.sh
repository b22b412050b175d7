#!/bin/sh
# Regenerate the golden reference outputs with Debian's statsmodels/scipy and
# compare them with the committed ones (testdata/golden). Exits non-zero when
# they differ beyond the tolerance of compare_golden.py; prints
# "SKIPPED refcheck: ..." and exits 0 when the libraries or the shared
# reference data are missing.
#
# Usage (from anywhere): testdata/refgen/refcheck.sh
set -u
here=$(cd "$(dirname "$0")" && pwd)
root=$(cd "$here/../.." && pwd)
py=/usr/bin/python3
shared="$root/../shared/reference"

if [ ! -x "$py" ]; then
	echo "SKIPPED refcheck: $py not found (install python3-statsmodels and python3-scipy)"
	exit 0
fi
if ! "$py" -c 'import statsmodels, scipy, numpy, pandas' 2>/dev/null; then
	echo "SKIPPED refcheck: $py cannot import statsmodels/scipy/numpy/pandas (apt-get install python3-statsmodels python3-scipy)"
	exit 0
fi
if [ ! -d "$shared/nist-handbook" ] || [ ! -d "$shared/strd" ]; then
	echo "SKIPPED refcheck: reference data not found at $shared"
	exit 0
fi

tmp=$(mktemp -d) || exit 1
trap 'rm -rf "$tmp"' EXIT INT TERM
if ! "$py" "$here/gen_golden.py" --shared "$shared" --out "$tmp" >"$tmp/gen.log" 2>&1; then
	cat "$tmp/gen.log"
	echo "refcheck: generator failed"
	exit 1
fi
"$py" "$here/compare_golden.py" "$root/testdata/golden" "$tmp"
