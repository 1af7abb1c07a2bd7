#!/usr/bin/env bash
# Load test of the member list, GET /api/v1/projects/{id}/members, on SQLite
# and on PostgreSQL: builds the binary, starts `residuum serve`, seeds one
# project with 200 members and runs wrk against the list (the default page
# of 50 and the full page of 200), printing requests/s and the 99th
# percentile latency. Targets: ≥ 2000 req/s, p99 ≤ 20 ms.
#
#   scripts/loadtest.sh                    # both stores
#   STORES=sqlite scripts/loadtest.sh      # one store
#   DURATION=30s CONNECTIONS=64 scripts/loadtest.sh
#
# PostgreSQL: LOADTEST_DATABASE_URL names an existing, empty database;
# without it the script starts a throwaway cluster with initdb/pg_ctl (as the
# postgres user when run as root). Needs curl and wrk.
set -euo pipefail
cd "$(dirname "$0")/.."

DURATION=${DURATION:-10s}
CONNECTIONS=${CONNECTIONS:-32}
THREADS=${THREADS:-2}
STORES=${STORES:-"sqlite postgres"}
MEMBERS=${MEMBERS:-200}

for tool in curl wrk go; do
	command -v "$tool" >/dev/null || { echo "loadtest: $tool not found" >&2; exit 1; }
done

work=$(mktemp -d)
chmod 755 "$work"
server_pid=""
pg_data=""
cleanup() {
	if [ -n "$server_pid" ]; then kill "$server_pid" 2>/dev/null || true; wait "$server_pid" 2>/dev/null || true; fi
	if [ -n "$pg_data" ]; then pg_run pg_ctl -D "$pg_data" -m immediate -w stop >/dev/null 2>&1 || true; fi
	rm -rf "$work"
}
trap cleanup EXIT

echo "loadtest: building residuum"
go build -o "$work/residuum" ./cmd/residuum

# start_server ARGS...: starts serve on a free port and sets base_url.
start_server() {
	"$work/residuum" serve -addr 127.0.0.1:0 -demo=false -log-level warn "$@" >"$work/stdout" 2>"$work/stderr" &
	server_pid=$!
	for _ in $(seq 1 300); do
		base_url=$(sed -n 's/^residuum: listening on \(http:\/\/[0-9.:]*\).*/\1/p' "$work/stdout" | head -n1)
		[ -n "$base_url" ] && return 0
		kill -0 "$server_pid" 2>/dev/null || break
		sleep 0.1
	done
	echo "loadtest: the service did not start" >&2
	cat "$work/stderr" >&2
	exit 1
}

stop_server() {
	kill -TERM "$server_pid"
	wait "$server_pid" || true
	server_pid=""
}

# seed: one project with $MEMBERS members; sets list_url.
seed() {
	local pid body
	pid=$(curl -sf -H 'Content-Type: application/json' -d '{"name": "load test"}' "$base_url/api/v1/projects" |
		sed -n 's/^{"id":\([0-9]*\).*/\1/p')
	[ -n "$pid" ] || { echo "loadtest: project not created" >&2; exit 1; }
	local input
	input=$(cat api/testdata/beam.json)
	for i in $(seq -w 1 "$MEMBERS"); do
		body="{\"label\": \"B$i\", \"location\": \"grid $i\", \"input\": $input}"
		curl -sf -o /dev/null -H 'Content-Type: application/json' -d "$body" "$base_url/api/v1/projects/$pid/members" ||
			{ echo "loadtest: member $i not created" >&2; exit 1; }
	done
	list_url="$base_url/api/v1/projects/$pid/members"
}

# measure LABEL URL: runs wrk and prints one summary line.
measure() {
	local label=$1 url=$2 out rps p99
	curl -sf -o /dev/null "$url" || { echo "loadtest: GET $url failed" >&2; exit 1; }
	out=$(wrk -t"$THREADS" -c"$CONNECTIONS" -d"$DURATION" --latency "$url")
	echo "$out" >"$work/wrk-$label.txt"
	rps=$(echo "$out" | awk '/^Requests\/sec:/ {print $2}')
	p99=$(echo "$out" | awk '$1 == "99%" {print $2}')
	errors=$(echo "$out" | awk '/Non-2xx|Socket errors/ {print}' | tr '\n' ' ')
	printf '%-28s %10s req/s   p99 %8s   %s\n' "$label" "$rps" "$p99" "$errors"
}

pg_run() {
	if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

# start_postgres: sets database_url to a fresh database.
start_postgres() {
	if [ -n "${LOADTEST_DATABASE_URL:-}" ]; then
		database_url=$LOADTEST_DATABASE_URL
		return 0
	fi
	local bin
	bin=$(dirname "$(command -v pg_ctl 2>/dev/null || ls /usr/lib/postgresql/*/bin/pg_ctl 2>/dev/null | tail -n1)")
	[ -x "$bin/initdb" ] || { echo "loadtest: no PostgreSQL (set LOADTEST_DATABASE_URL)" >&2; return 1; }
	export PATH="$bin:$PATH"
	pg_data="$work/pg"
	mkdir -p "$pg_data"
	[ "$(id -u)" = 0 ] && chown postgres "$pg_data"
	pg_run initdb -D "$pg_data" -U postgres --auth=trust >/dev/null
	local port
	port=$(python3 -c 'import socket; s=socket.socket(); s.bind(("127.0.0.1", 0)); print(s.getsockname()[1])')
	pg_run pg_ctl -D "$pg_data" -l "$pg_data/log" -w \
		-o "-p $port -k $pg_data -c listen_addresses=127.0.0.1 -c max_connections=100" start >/dev/null
	pg_run psql -h 127.0.0.1 -p "$port" -U postgres -qc 'CREATE DATABASE loadtest' >/dev/null
	database_url="postgres://postgres@127.0.0.1:$port/loadtest?sslmode=disable"
}

echo "loadtest: $MEMBERS members, wrk -t$THREADS -c$CONNECTIONS -d$DURATION (targets: ≥ 2000 req/s, p99 ≤ 20 ms)"
for store in $STORES; do
	case $store in
	sqlite)
		start_server -data "$work/data"
		;;
	postgres)
		start_postgres || continue
		start_server -database-url "$database_url"
		;;
	*)
		echo "loadtest: unknown store $store" >&2
		exit 2
		;;
	esac
	seed
	measure "$store, page of 50" "$list_url"
	measure "$store, page of 200" "$list_url?limit=200"
	stop_server
done
