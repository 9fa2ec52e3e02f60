#!/bin/sh
# Reads the 10^7-row file of the project's data generator once and reports
# wall time, CPU time and peak memory (maximum resident set size) of the
# whole test process.
#
#   /usr/bin/python3 /work/shared/tools/bench/gen_data.py --sizes 10000000 --out DIR
#   analysis/dataset/testdata/read1e7.sh DIR
set -eu
dir=${1:?usage: read1e7.sh DIR-holding-n10000000.csv}
here=$(cd "$(dirname "$0")/.." && pwd)
bin=$(mktemp -d)/dataset.test
trap 'rm -rf "$(dirname "$bin")"' EXIT
(cd "$here" && go test -c -o "$bin" .)
BIVAR_BENCH_DATA=$dir /usr/bin/time -v "$bin" -test.run '^$' -test.bench 'ReadFile1e7$' -test.benchtime 1x -test.benchmem 2>&1 |
	grep -E 'Benchmark|Elapsed|Maximum resident|User time|System time'
