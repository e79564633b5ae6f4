#!/usr/bin/env bash
# A throwaway PostgreSQL server for the results-database tests (issue 8).
#
#   eval "$(.ci/postgres-setup.sh)"        # start; exports JUNCTIONFIT_TEST_PG and JUNCTIONFIT_TEST_PG_DIR
#   .ci/postgres-setup.sh --stop           # stop the server in $JUNCTIONFIT_TEST_PG_DIR and delete it
#
# Start installs Debian's postgresql package when no server binaries are found, creates a fresh cluster
# in a temporary folder (never the system's own cluster), listening on localhost only, on a free port
# from 55432 up, with a login role and a test database. Standard output carries only the two export lines,
# so that `eval` can take them; everything else goes to standard error. As root, the server runs as the
# "postgres" user (PostgreSQL refuses to run as root).
set -euo pipefail

log() { printf 'postgres-setup: %s\n' "$*" >&2; }

as_owner() {
    # Runs a command as the cluster owner: "postgres" when we are root, ourselves otherwise.
    if [ "$(id -u)" -eq 0 ]; then
        runuser -u postgres -- "$@"
    else
        "$@"
    fi
}

find_bindir() {
    local d
    for d in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V -r); do
        if [ -x "$d/initdb" ] && [ -x "$d/pg_ctl" ]; then
            echo "$d"
            return 0
        fi
    done
    if command -v initdb >/dev/null 2>&1 && command -v pg_ctl >/dev/null 2>&1; then
        dirname "$(command -v initdb)"
        return 0
    fi
    return 1
}

port_in_use() {
    # True when something accepts TCP connections on localhost:$1.
    (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null
}

if [ "${1:-}" = "--stop" ]; then
    dir="${JUNCTIONFIT_TEST_PG_DIR:-}"
    if [ -z "$dir" ] || [ ! -d "$dir/data" ]; then
        log "nothing to stop (JUNCTIONFIT_TEST_PG_DIR is not set or has no cluster)"
        exit 0
    fi
    bindir="$(find_bindir)"
    as_owner "$bindir/pg_ctl" -D "$dir/data" -m fast -w stop >&2 || true
    rm -rf -- "$dir"
    log "stopped and removed $dir"
    exit 0
fi

if ! bindir="$(find_bindir)"; then
    if [ "$(id -u)" -ne 0 ]; then
        log "PostgreSQL is not installed and we are not root; install it with: apt-get install -y postgresql"
        exit 1
    fi
    log "installing Debian's postgresql package"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq >&2 || log "apt-get update failed; trying the install with the lists we have"
    apt-get install -y -qq postgresql >&2
    bindir="$(find_bindir)"
fi
log "server binaries in $bindir"

if [ "$(id -u)" -eq 0 ] && ! id postgres >/dev/null 2>&1; then
    useradd --system --home-dir /var/lib/postgresql --shell /bin/sh postgres
fi

dir="$(mktemp -d "${TMPDIR:-/tmp}/junctionfit-pg.XXXXXX")"
chmod 0755 "$dir"
if [ "$(id -u)" -eq 0 ]; then chown postgres: "$dir"; fi

port="${JUNCTIONFIT_TEST_PG_PORT:-55432}"
while port_in_use "$port"; do port=$((port + 1)); done

password="$(od -An -tx1 -N16 /dev/urandom | tr -d ' \n')"
pwfile="$dir/superuser.pw"
printf '%s\n' "$password" > "$pwfile"
if [ "$(id -u)" -eq 0 ]; then chown postgres: "$pwfile"; fi
chmod 0600 "$pwfile"

(cd "$dir" && as_owner "$bindir/initdb" -D "$dir/data" -U postgres --pwfile="$pwfile" \
    --auth-local=trust --auth-host=scram-sha-256 -E UTF8 --locale=C.UTF-8 >"$dir/initdb.log" 2>&1) || {
    cat "$dir/initdb.log" >&2
    exit 1
}
rm -f -- "$pwfile"

# localhost only; the Unix socket lives in the cluster folder, not in /var/run.
(cd "$dir" && as_owner "$bindir/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w -t 60 \
    -o "-c listen_addresses=localhost -c port=$port -c unix_socket_directories=$dir -c max_connections=100" start >&2) || {
    cat "$dir/server.log" >&2
    exit 1
}

role="junctionfit"
database="junctionfit_test"
psql_owner() { (cd "$dir" && as_owner "$bindir/psql" -h "$dir" -p "$port" -U postgres -d postgres -v ON_ERROR_STOP=1 -q "$@"); }
psql_owner -c "CREATE ROLE $role LOGIN PASSWORD '$password'" >&2
psql_owner -c "CREATE DATABASE $database OWNER $role" >&2

log "server on localhost:$port (data in $dir); test database $database, role $role"
echo "export JUNCTIONFIT_TEST_PG='Host=localhost;Port=$port;Database=$database;Username=$role;Password=$password'"
echo "export JUNCTIONFIT_TEST_PG_DIR='$dir'"
