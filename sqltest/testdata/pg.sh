#!/usr/bin/env bash
# pg.sh start|stop|url: a private PostgreSQL server for the sqltest module's
# tests, from Debian's postgresql package (apt-get install postgresql).
#
# start initialises a cluster in a temporary directory, listens on
# 127.0.0.1 only at a private port (ANTECEDENT_PG_PORT, default 55432) and a
# private socket directory, creates the database "antecedent", and loads
# the clinic table (table/parquetfile/testdata/clinic.csv) with typed
# columns and a row_id in file order. Connections from loopback are trusted: the server holds only
# test data and lives as long as the tests. stop stops it and removes its
# directory; url prints the URL the tests read from ANTECEDENT_PG_URL.
# Run as root (the server runs as the postgres user) or as postgres.
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
repo="$(cd "$here/../.." && pwd)"
port="${ANTECEDENT_PG_PORT:-55432}"
dir="${ANTECEDENT_PG_DIR:-/tmp/antecedent-pg-$port}"
bin="$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -1)"

as_postgres() {
  if [ "$(id -u)" = 0 ]; then
    su postgres -s /bin/sh -c "$*"
  else
    sh -c "$*"
  fi
}

case "${1:-}" in
start)
  if [ -e "$dir/data/postmaster.pid" ]; then
    echo "pg.sh: a server is already running in $dir" >&2
    exit 1
  fi
  rm -rf "$dir"
  mkdir -p "$dir/socket"
  [ "$(id -u)" = 0 ] && chown -R postgres:postgres "$dir"
  as_postgres "'$bin/initdb' -D '$dir/data' -U postgres --auth=trust --encoding=UTF8 --locale=C.UTF-8 >'$dir/initdb.log'"
  as_postgres "'$bin/pg_ctl' -D '$dir/data' -l '$dir/server.log' -w -o \"-p $port -k $dir/socket -c listen_addresses=127.0.0.1\" start >/dev/null"
  psql=("$bin/psql" -X -q -v ON_ERROR_STOP=1 -h 127.0.0.1 -p "$port" -U postgres)
  "${psql[@]}" -d postgres -c "CREATE DATABASE antecedent"
  "${psql[@]}" -d antecedent <<SQL
CREATE TABLE clinic (
  row_id bigserial PRIMARY KEY,
  age integer NOT NULL,
  dose numeric(6, 2),
  treated boolean,
  site text,
  arm varchar(20),
  relapse bigint,
  smoker text
);
\copy clinic (age, dose, treated, site, arm, relapse, smoker) FROM '$repo/table/parquetfile/testdata/clinic.csv' WITH (FORMAT csv, HEADER true)
SQL
  echo "pg.sh: PostgreSQL $("$bin/postgres" --version | awk '{print $3}') on 127.0.0.1:$port, socket directory $dir/socket"
  ;;
stop)
  if [ -e "$dir/data/postmaster.pid" ]; then
    as_postgres "'$bin/pg_ctl' -D '$dir/data' -m fast -w stop >/dev/null"
  fi
  rm -rf "$dir"
  ;;
url)
  echo "postgres://postgres@127.0.0.1:$port/antecedent?sslmode=disable"
  ;;
*)
  echo "usage: pg.sh start|stop|url" >&2
  exit 2
  ;;
esac
