#!/usr/bin/env bash
# Benchmarks of the numerics, the reader and the whole study, with medians.
#
#   ./bench.sh                 # every benchmark, 5 runs each
#   ./bench.sh 'Pearson|Line'  # only those matching the pattern
#   COUNT=10 ./bench.sh
#
# Prints one line per benchmark with the median ns/op, B/op and allocs/op
# of COUNT runs. With benchstat on PATH (go install golang.org/x/perf/cmd/benchstat@latest)
# it also prints benchstat's table. Raw output is kept in bench.out.
set -euo pipefail
cd "$(dirname "$0")"
pattern=${1:-.}
count=${COUNT:-5}
go test -run '^$' -bench "$pattern" -benchmem -count "$count" \
	./analysis/stats/ ./analysis/dataset/ ./analysis/ ./internal/publish/ | tee bench.out >/dev/null
awk '
/^Benchmark/ {
	name = $1; ns[name] = ns[name] " " $3
	for (i = 4; i <= NF; i++) { if ($(i+1) == "B/op") b[name] = $i; if ($(i+1) == "allocs/op") a[name] = $i }
	if (!(name in seen)) { seen[name] = 1; order[++k] = name }
}
function median(s,   v, n, i, j, t) {
	n = split(s, v, " ")
	for (i = 1; i <= n; i++) for (j = i + 1; j <= n; j++) if (v[j] + 0 < v[i] + 0) { t = v[i]; v[i] = v[j]; v[j] = t }
	return (n % 2) ? v[(n + 1) / 2] : (v[n / 2] + v[n / 2 + 1]) / 2
}
END {
	printf "%-60s %14s %12s %10s\n", "benchmark (median of runs)", "ns/op", "B/op", "allocs/op"
	for (i = 1; i <= k; i++) printf "%-60s %14.0f %12s %10s\n", order[i], median(ns[order[i]]), b[order[i]], a[order[i]]
}' bench.out
if command -v benchstat >/dev/null 2>&1; then benchstat bench.out; fi
