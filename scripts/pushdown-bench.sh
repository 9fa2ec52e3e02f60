#!/usr/bin/env bash
# Measures a study whose rows stay in PostgreSQL (more rows than max_rows,
# set to 1000):
# bivar's wall time and peak resident memory (/usr/bin/time -v) against the
# database's own scan of the same table (SELECT count(*), psql's \timing),
# medians of three runs each, and, when the server's log is where
# scripts/pg-test.sh puts it, the server's time for each statement bivar
# sent (log_min_duration_statement, median of the three runs; a statement
# is matched across runs by its opening words, since one run on a second
# connection may end before or after the other's). The table
# is the 10⁷-row one of
# analysis/pushdown_pg_test.go (bigTableSQL, the same statement), built
# in the database by generate_series.
#
# With BIVAR_BINS, a list of bivar binaries, the runs alternate between
# them (run 1 of each, then run 2 of each, …) on the one table, and each
# binary gets its own figures: to compare a change against the binary
# before it on a shared machine.
#
#   scripts/pg-test.sh scripts/pushdown-bench.sh            # 10⁷ rows
#   scripts/pg-test.sh scripts/pushdown-bench.sh 1000000    # another size
#   BIVAR_BINS="/tmp/old /tmp/new" scripts/pg-test.sh scripts/pushdown-bench.sh
#
# STUDY=xy measures the study of x and y alone (no group, run order or
# covariate); KEEP=1 keeps a pdbench table of the same size that an
# earlier run left (on a server kept running), instead of building it anew.
set -euo pipefail
cd "$(dirname "$0")/.."
rows=${1:-10000000}
: "${BIVAR_TEST_PG_URL:?run it under scripts/pg-test.sh, which starts a server and sets BIVAR_TEST_PG_URL}"
[ -x /usr/bin/time ] || { echo "pushdown-bench: needs GNU time (apt-get install time)" >&2; exit 1; }
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
read -r -a bins <<<"${BIVAR_BINS:-}"
if [ ${#bins[@]} -eq 0 ]; then
	go build -o "$tmp/bivar" ./cmd/bivar
	bins=("$tmp/bivar")
fi
have=""
[ "${KEEP:-}" != 1 ] || have=$(psql "$BIVAR_TEST_PG_URL" -X -qtA -c "SELECT count(*) FROM pdbench" 2>/dev/null || true)
[ "$have" = "$rows" ] || psql "$BIVAR_TEST_PG_URL" -q -v ON_ERROR_STOP=1 <<SQL
DROP TABLE IF EXISTS pdbench;
CREATE TABLE pdbench (id text, x float8, y float8, z float8, g text, o bigint);
INSERT INTO pdbench SELECT 'r' || i, 50 + 10 * sin(i * 12.9898),
  3 + 0.5 * (50 + 10 * sin(i * 12.9898)) + 0.01 * (10 * sin(i * 12.9898))^2 + (1.5 + sin(i * 12.9898)) * sin(i * 78.233)
    + CASE WHEN i % 99991 = 0 THEN 40 ELSE 0 END,
  cos(i * 3.3) + 0.2 * sin(i * 12.9898), 'L' || (i % 4), i / 10
  FROM generate_series(1, $rows) i;
VACUUM ANALYZE pdbench;
SQL
cat >"$tmp/m.toml" <<TOML
title = "push-down benchmark"
[[dataset]]
id = "d"
table = "pdbench"
connection = "BIVAR_TEST_PG_URL"
id_column = "id"
statement_timeout = "10m"
max_rows = 1000
[[study]]
id = "s"
dataset = "d"
x = "x"
y = "y"
TOML
[ "${STUDY:-}" = xy ] || cat >>"$tmp/m.toml" <<TOML
group = "g"
order = "o"
covariates = ["z"]
TOML
median() { sort -g | awk '{v[NR]=$1} END {print v[int((NR+1)/2)]}'; }
scan=()
for i in 1 2 3; do
	ms=$(psql "$BIVAR_TEST_PG_URL" -X -q -c '\timing on' -c 'SELECT count(*) FROM pdbench' | sed -n 's/^Time: \([0-9.]*\) ms.*/\1/p')
	scan+=("$(awk -v m="$ms" 'BEGIN {printf "%.2f", m / 1000}')")
done
# The server's log under scripts/pg-test.sh: server.log in the socket's folder.
host=$(printf '%s' "$BIVAR_TEST_PG_URL" | sed -n 's/.*[?&]host=\([^&]*\).*/\1/p')
log=""
if [ -n "$host" ] && [ -r "$host/server.log" ]; then
	log="$host/server.log"
	# log_statement_stats: the server process's CPU time for each
	# statement (user + system), steadier than its wall time on a shared
	# machine.
	export PGOPTIONS="-c log_min_duration_statement=0 -c log_statement_stats=on"
fi
declare -A wall rss logs
for i in 1 2 3; do
	for b in "${!bins[@]}"; do
		from=0
		[ -z "$log" ] || from=$(stat -c %s "$log")
		/usr/bin/time -v -o "$tmp/time.txt" "${bins[$b]}" run -o "$tmp/out" "$tmp/m.toml" >/dev/null 2>"$tmp/err.txt" || { cat "$tmp/err.txt" >&2; exit 1; }
		[ -z "$log" ] || { tail -c +"$((from + 1))" "$log" >"$tmp/log$b.$i.txt"; logs[$b]+=" $tmp/log$b.$i.txt"; }
		wall[$b]+=" $(awk -F': ' '/Elapsed \(wall clock\)/ {n = split($2, p, ":"); s = 0; for (k = 1; k <= n; k++) s = s * 60 + p[k]; printf "%.2f", s}' "$tmp/time.txt")"
		rss[$b]+=" $(awk -F': ' '/Maximum resident set size/ {printf "%.1f", $2 / 1024}' "$tmp/time.txt")"
	done
done
echo "rows: $rows; load average at the end: $(cut -d' ' -f1-3 /proc/loadavg)"
echo "database scan, SELECT count(*): median $(printf '%s\n' "${scan[@]}" | median) s (runs: ${scan[*]})"
for b in "${!bins[@]}"; do
	read -r -a w <<<"${wall[$b]}"
	read -r -a r <<<"${rss[$b]}"
	[ ${#bins[@]} -eq 1 ] || echo "== ${bins[$b]}"
	echo "bivar run, pushed down: median $(printf '%s\n' "${w[@]}" | median) s (runs: ${w[*]}), peak RSS median $(printf '%s\n' "${r[@]}" | median) MB (runs: ${r[*]})"
	if [ -n "$log" ]; then
		echo "server time per statement (median of the runs: wall ms, CPU ms), in the order the server ended them in the first run:"
		# shellcheck disable=SC2086
		/usr/bin/python3 - ${logs[$b]} <<'PY'
import re, statistics, sys
runs = []
for name in sys.argv[1:]:
    text = open(name, errors="replace").read()
    # Each execute's duration, then its EXECUTE MESSAGE STATISTICS block.
    runs.append([(float(m.group(1)), 1000 * (float(m.group(3)) + float(m.group(4))), " ".join(m.group(2).split())[:60])
                 for m in re.finditer(r"duration: ([0-9.]+) ms  execute [^:]*: (.*?)\n\S.*?EXECUTE MESSAGE STATISTICS.*?!\s+([0-9.]+) s user, ([0-9.]+) s system", text, re.S)])
# Each statement keyed by its opening words and how many times they came
# before in the run (a statement run twice is two).
keyed = []
for r in runs:
    seen, d = {}, {}
    for t, c, text in r:
        seen[text] = seen.get(text, 0) + 1
        d[(text, seen[text])] = (t, c)
    keyed.append(d)
seen = {}
for t, c, text in runs[0]:
    seen[text] = seen.get(text, 0) + 1
    k = (text, seen[text])
    if all(k in d for d in keyed):
        print("%9.0f %9.0f  %s" % (statistics.median(d[k][0] for d in keyed), statistics.median(d[k][1] for d in keyed), text))
print("%9.0f %9.0f  (all statements; the walls add up to more than the run's when two statements overlap)" % (statistics.median(sum(t for t, _, _ in r) for r in runs), statistics.median(sum(c for _, c, _ in r) for r in runs)))
PY
	fi
done
