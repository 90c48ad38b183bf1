#!/usr/bin/env bash
# Stop the throw-away PostgreSQL server started by tests/pg/start.sh DIR and delete its files.
set -uo pipefail
dir=${1:?usage: tests/pg/stop.sh DIR}
[ -d "$dir" ] || exit 0
if [ -f "$dir/bin" ] && [ -f "$dir/cluster_path" ]; then
    bin=$(cat "$dir/bin")
    cluster=$(cat "$dir/cluster_path")
    if [ -d "$cluster/data" ]; then
        if [ "$(id -u)" = 0 ] && command -v runuser >/dev/null 2>&1; then
            runuser -u postgres -- "$bin/pg_ctl" -D "$cluster/data" -m immediate -w stop >/dev/null 2>&1
        elif [ "$(id -u)" = 0 ]; then
            su postgres -s /bin/sh -c "'$bin/pg_ctl' -D '$cluster/data' -m immediate -w stop" >/dev/null 2>&1
        else
            "$bin/pg_ctl" -D "$cluster/data" -m immediate -w stop >/dev/null 2>&1
        fi
    fi
    case "$cluster" in
        "$dir"/*) ;;
        /tmp/rolltriage-pg.*) rm -rf "$cluster" ;;
    esac
fi
rm -rf "$dir"
