#!/usr/bin/env bash
# Loads the sample project's October run (invented demo data) from
# data/run-2026-10.csv into a PostgreSQL table, line2.shafts_2026_10, for
# bivar-pg.toml. The URL of the database is read from SAMPLE_DB, as the
# manifest's connection names it; psql (Debian's postgresql-client) does the
# loading with \copy, "NA" cells becoming NULL.
#
#   export SAMPLE_DB='postgres://me@localhost:5432/demo'
#   sample-project/load-pg.sh
#   go run ./cmd/bivar run sample-project/bivar-pg.toml
#
# Without a server of your own, scripts/pg-test.sh starts a throwaway one:
#
#   scripts/pg-test.sh sh -c 'export SAMPLE_DB=$BIVAR_TEST_PG_URL; sample-project/load-pg.sh && go run ./cmd/bivar run sample-project/bivar-pg.toml'
set -euo pipefail
cd "$(dirname "$0")"
: "${SAMPLE_DB:?set SAMPLE_DB to the database URL, e.g. export SAMPLE_DB=postgres://me@localhost:5432/demo}"
command -v psql >/dev/null || { echo "load-pg: psql not found: apt-get install postgresql-client" >&2; exit 1; }
psql "$SAMPLE_DB" -X -q -v ON_ERROR_STOP=1 <<'SQL'
CREATE SCHEMA IF NOT EXISTS line2;
DROP TABLE IF EXISTS line2.shafts_2026_10;
CREATE TABLE line2.shafts_2026_10 (
	part_id          text PRIMARY KEY,
	load_seq         integer,
	shift            text,
	quench_tank      text,
	austenitize_temp double precision,
	soak_time        double precision,
	transfer_time    double precision,
	oil_temp         double precision,
	temper_temp      double precision,
	enrich_gas_flow  double precision,
	shop_rh          double precision,
	surface_hardness double precision,
	core_hardness    double precision,
	impact_energy    double precision,
	runout           double precision,
	decarb_depth     double precision
);
\copy line2.shafts_2026_10 FROM 'data/run-2026-10.csv' WITH (FORMAT csv, HEADER true, NULL 'NA')
SQL
echo "load-pg: $(psql "$SAMPLE_DB" -X -At -c 'SELECT count(*) FROM line2.shafts_2026_10') rows in line2.shafts_2026_10"
