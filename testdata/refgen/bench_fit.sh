#!/bin/bash
# make bench-fit: time `bin/pairline fit`, `bin/pairline fit --no-advice`
# and fit_pandas_bench.py (pandas, statsmodels, scipy) on one generated CSV
# of N rows (invented readings, gen_fit_big.py), best of 3 each, and print
# the ratios. The pandas pipeline does the work of --no-advice (the line
# with inference and the checks, no remedy tried), so that ratio compares
# like with like; the default also tries nine remedies and the Box–Cox
# power. Timings on a shared
# machine vary: the load average is printed with them.
set -euo pipefail
N=${N:-1000000}
here=$(cd "$(dirname "$0")" && pwd)
root=$(cd "$here/../.." && pwd)
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
/usr/bin/python3 "$here/gen_fit_big.py" "$N" "$tmp/big.csv"
echo "file: $N rows, $(stat -c %s "$tmp/big.csv") bytes; load: $(cut -d' ' -f1-3 /proc/loadavg)"
best() { # best and median of 3 runs of "$@", in seconds, and the peak RSS
	local ts=() rss=0
	for _ in 1 2 3; do
		local t0 t1 m
		t0=$(date +%s.%N)
		/usr/bin/time -o "$tmp/rss" -f %M "$@" >/dev/null
		m=$(tail -1 "$tmp/rss")
		t1=$(date +%s.%N)
		ts+=("$(echo "$t1 - $t0" | bc)")
		(( m > rss )) && rss=$m
	done
	printf '%s\n' "${ts[@]}" | sort -n | awk -v rss="$rss" 'NR==1{min=$1} NR==2{med=$1} END{printf "%.3f %.3f %d\n", min, med, rss}'
}
read -r pmin pmed prss < <(best "$root/bin/pairline" fit "$tmp/big.csv")
read -r nmin nmed nrss < <(best "$root/bin/pairline" fit --no-advice "$tmp/big.csv")
read -r qmin qmed qrss < <(best /usr/bin/python3 "$here/fit_pandas_bench.py" "$tmp/big.csv")
echo "pairline fit:             min ${pmin} s, median ${pmed} s, peak RSS $((prss / 1024)) MiB"
echo "pairline fit --no-advice: min ${nmin} s, median ${nmed} s, peak RSS $((nrss / 1024)) MiB"
echo "pandas + statsmodels:     min ${qmin} s, median ${qmed} s, peak RSS $((qrss / 1024)) MiB"
echo "ratio, the same work (pandas / pairline fit --no-advice, best of 3): $(echo "scale=2; $qmin / $nmin" | bc)"
echo "ratio, with the advice (pandas / pairline fit, best of 3): $(echo "scale=2; $qmin / $pmin" | bc)"
echo "load after: $(cut -d' ' -f1-3 /proc/loadavg)"
