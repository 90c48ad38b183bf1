#!/usr/bin/env bash
# Start a throw-away PostgreSQL server for the history tests and print its URL.
#
#   url=$(tests/pg/start.sh DIR)     # DIR: an empty temporary folder (created if missing)
#   ROLLTRIAGE_TEST_PG=$url cargo test --release --test history_pg
#   tests/pg/stop.sh DIR
#
# The cluster lives in DIR (data, socket, log), listens on 127.0.0.1 on a free port, trusts
# local connections and is deleted by stop.sh. PostgreSQL's binaries are looked up on PATH,
# then under /usr/lib/postgresql/*/bin; if none is found and we are root on a Debian-like
# machine, the distribution's `postgresql` package is installed. initdb refuses to run as
# root, so as root the server runs as the `postgres` user (created if missing).
set -euo pipefail

dir=${1:?usage: tests/pg/start.sh DIR}
mkdir -p "$dir"
dir=$(cd "$dir" && pwd)

find_bin() {
    if command -v initdb >/dev/null 2>&1; then
        # /usr/local/bin may hold links to a few of the programs only: follow them.
        dirname "$(readlink -f "$(command -v initdb)")"
        return
    fi
    local d
    for d in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V -r); do
        if [ -x "$d/initdb" ]; then
            echo "$d"
            return
        fi
    done
}

bin=$(find_bin || true)
if [ -z "$bin" ]; then
    if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null 2>&1; then
        (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql) >&2
        bin=$(find_bin)
    fi
fi
if [ -z "$bin" ]; then
    echo "tests/pg/start.sh: no PostgreSQL (initdb) found; install the distribution's postgresql package" >&2
    exit 1
fi

run_as=()
cluster="$dir/cluster"
if [ "$(id -u)" = 0 ]; then
    if ! id postgres >/dev/null 2>&1; then
        useradd --system --no-create-home --shell /bin/sh postgres
    fi
    # DIR's parents may be closed to other users (mktemp -d makes 0700 folders): the cluster
    # gets its own folder under /tmp that the postgres user owns.
    cluster=$(mktemp -d /tmp/rolltriage-pg.XXXXXX)
    chown postgres "$cluster"
    if command -v runuser >/dev/null 2>&1; then
        run_as=(runuser -u postgres --)
    else
        run_as=(su postgres -s /bin/sh -c)
    fi
fi

as_owner() {
    if [ ${#run_as[@]} -eq 0 ]; then
        "$@"
    elif [ "${run_as[0]}" = runuser ]; then
        "${run_as[@]}" "$@"
    else
        "${run_as[@]}" "$(printf '%q ' "$@")"
    fi
}

# A free port: ask the kernel for one.
port=$(python3 -c 'import socket; s=socket.socket(); s.bind(("127.0.0.1", 0)); print(s.getsockname()[1])')

echo "$bin" >"$dir/bin"
echo "$cluster" >"$dir/cluster_path"
as_owner mkdir -p "$cluster/data"
as_owner "$bin/initdb" -D "$cluster/data" -U rolltriage --auth=trust --encoding=UTF8 --no-locale >"$dir/initdb.log" 2>&1 \
    || { cat "$dir/initdb.log" >&2; exit 1; }
as_owner "$bin/pg_ctl" -D "$cluster/data" -l "$cluster/server.log" -w -t 60 \
    -o "-h 127.0.0.1 -p $port -k $cluster -c fsync=off -c max_connections=50" start >/dev/null \
    || { cat "$cluster/server.log" >&2; exit 1; }
as_owner "$bin/createdb" -h 127.0.0.1 -p "$port" -U rolltriage rolltriage_test
echo "postgres://rolltriage@127.0.0.1:$port/rolltriage_test"
