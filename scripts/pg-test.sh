#!/usr/bin/env bash
# Runs a command with a throwaway PostgreSQL cluster of its own: initdb in a
# temporary folder, listening on a Unix socket in that folder only (no TCP),
# trust authentication for the user bivar_test, BIVAR_TEST_PG_URL exported
# for the tests; the cluster is stopped and its folder removed on exit.
#
#   scripts/pg-test.sh                      # go test ./...
#   scripts/pg-test.sh go test -run PG -v ./analysis/...
#
# Needs Debian's postgresql package (apt-get install postgresql). As root,
# the server runs as the postgres user, since PostgreSQL refuses root.
set -euo pipefail
cd "$(dirname "$0")/.."
[ $# -gt 0 ] || set -- go test ./...
bin=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1)
if [ -z "$bin" ] || [ ! -x "$bin/initdb" ]; then
	echo "pg-test: no PostgreSQL server found under /usr/lib/postgresql; install it: apt-get install postgresql" >&2
	exit 1
fi
dir=$(mktemp -d "${TMPDIR:-/tmp}/bivar-pg.XXXXXX")
as=()
if [ "$(id -u)" = 0 ]; then
	chown postgres: "$dir"
	as=(runuser -u postgres --)
fi
stop() {
	"${as[@]}" "$bin/pg_ctl" -D "$dir/data" -m fast -w stop >/dev/null 2>&1 || true
	rm -rf "$dir"
}
trap stop EXIT
"${as[@]}" "$bin/initdb" -D "$dir/data" -U bivar_test --auth=trust -E UTF8 --locale=C >"$dir/initdb.log" 2>&1 ||
	{ cat "$dir/initdb.log" >&2; exit 1; }
"${as[@]}" "$bin/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w \
	-o "-c listen_addresses='' -k $dir -c fsync=off -c full_page_writes=off" start >/dev/null ||
	{ cat "$dir/server.log" >&2; exit 1; }
export BIVAR_TEST_PG_URL="postgres:///postgres?host=$dir&user=bivar_test&sslmode=disable"
echo "pg-test: PostgreSQL $("$bin/postgres" --version | awk '{print $3}') on the socket in $dir" >&2
"$@"
