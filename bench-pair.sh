#!/usr/bin/env bash
# Pairs `bivar run` against the reference run (pandas, scipy, statsmodels,
# matplotlib: ../shared/tools/bench/reference.py) on the same CSV file, as
# whole processes, and prints each run's wall time, CPU seconds (user + sys)
# and peak RSS, then the medians, the ratio of the median CPU times and the
# median of the paired runs' CPU ratios.
#
#   ./bench-pair.sh FILE.csv [RUNS]        # default 5 runs each, alternating
#   REF=0 ./bench-pair.sh FILE.csv         # bivar only (e.g. at 10⁷ rows, where the reference takes minutes)
#
# FILE.csv is a file of ../shared/tools/bench/gen_data.py (header x,y,t):
#   /usr/bin/python3 ../shared/tools/bench/gen_data.py --sizes 1000000 --out /tmp/bench-data
# bivar runs one study (y against x, run order t) writing all three formats;
# the reference runs as its README pairs it (rasterized scatter, LOWESS
# delta 1% of the range). Needs /usr/bin/time (Debian's package "time") and,
# for the reference, Debian's python3-scipy, -statsmodels, -pandas and
# -matplotlib. Speed is measured here, never in a timed test.
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
file=$(realpath "${1:?usage: bench-pair.sh FILE.csv [RUNS]}")
runs=${2:-5}
ref=${REF:-1}
refpy=${REFPY:-$here/../shared/tools/bench/reference.py}
[ -x /usr/bin/time ] || { echo "bench-pair: /usr/bin/time is missing (apt-get install time)" >&2; exit 1; }
[ "$ref" = 0 ] || [ -f "$refpy" ] || { echo "bench-pair: $refpy not found (set REFPY, or REF=0 for bivar alone)" >&2; exit 1; }

work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
go build -o "$work/bivar" "$here/cmd/bivar"
ln -s "$file" "$work/data.csv"
cat >"$work/bivar.toml" <<EOF
title = "bench-pair: $(basename "$file") (generated benchmark data)"
[output]
dir = "report"
[[dataset]]
id = "bench"
file = "data.csv"
[[study]]
id = "y-vs-x"
dataset = "bench"
x = "x"
y = "y"
order = "t"
EOF

# measure LABEL CMD...: one run; appends "label wall cpu rss_kb" to $work/runs.
measure() {
	local label=$1
	shift
	/usr/bin/time -f "%e %U %S %M" -o "$work/t" "$@" >/dev/null 2>"$work/err" || {
		echo "bench-pair: $label failed:" >&2
		cat "$work/err" >&2
		exit 1
	}
	read -r wall user sys rss <"$work/t"
	echo "$label $wall $(echo "$user + $sys" | bc -l) $rss" >>"$work/runs"
	printf '%-9s wall %7.2f s   cpu %7.2f s   peak RSS %7.0f MB\n' "$label" "$wall" "$(echo "$user + $sys" | bc -l)" "$(echo "$rss / 1024" | bc -l)"
}

echo "file: $file ($(stat -c %s "$file") bytes), $runs runs each, $(nproc) cores"
for i in $(seq "$runs"); do
	measure bivar "$work/bivar" run "$work/bivar.toml"
	if [ "$ref" != 0 ]; then
		measure reference /usr/bin/python3 "$refpy" "$file" "$work/ref.json" \
			--svg "$work/ref.svg" --svg-rasterized --lowess-delta-frac 0.01
	fi
done
ls -l "$work/report" | awk 'NR > 1 { printf "  %10d  %s\n", $5, $9 }'

awk '
function median(s,   v, n, i, j, t) {
	n = split(s, v, " ")
	for (i = 1; i <= n; i++) for (j = i + 1; j <= n; j++) if (v[j] + 0 < v[i] + 0) { t = v[i]; v[i] = v[j]; v[j] = t }
	return (n % 2) ? v[(n + 1) / 2] : (v[n / 2] + v[n / 2 + 1]) / 2
}
{ wall[$1] = wall[$1] " " $2; cpu[$1] = cpu[$1] " " $3; rss[$1] = rss[$1] " " $4; n[$1]++; at[$1, n[$1]] = $3 }
END {
	print "medians:"
	for (k in wall) printf "  %-9s wall %7.2f s   cpu %7.2f s   peak RSS %7.0f MB\n", k, median(wall[k]), median(cpu[k]), median(rss[k]) / 1024
	if (("reference" in cpu) && ("bivar" in cpu))
		printf "CPU ratio (reference / bivar, medians): %.1f×   peak RSS ratio: %.1f×\n",
			median(cpu["reference"]) / median(cpu["bivar"]), median(rss["reference"]) / median(rss["bivar"])
	# Run i of bivar and run i of the reference ran one after the other:
	# the median of their ratios is less moved by a shared machine that
	# is slower for a minute and then faster than either median alone.
	if (("reference" in cpu) && ("bivar" in cpu)) {
		pairs = ""
		for (i = 1; i <= n["bivar"] && i <= n["reference"]; i++) pairs = pairs " " at["reference", i] / at["bivar", i]
		printf "CPU ratio, median of the %d paired runs: %.1f×\n", split(pairs, tmp, " "), median(pairs)
	}
}' "$work/runs"
