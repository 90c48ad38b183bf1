#!/usr/bin/env bash
# End-to-end smoke test of the terminal UI: drive the real binary inside tmux (send-keys) and
# read the screen back (capture-pane). New case → pick two symptoms → take the inputs from a
# demo case file → results with ranked causes → quit cleanly through the unsaved-changes prompt.
#
# Usage: tests/tui_smoke.sh [path/to/rolltriage]   (default: target/debug/rolltriage)
# Runs on a private tmux server socket, so it never touches the user's own tmux sessions.
set -euo pipefail

cd "$(dirname "$0")/.."
BIN="${1:-${ROLLTRIAGE_BIN:-target/debug/rolltriage}}"
CASE="${SMOKE_CASE:-cases/harbour_newsprint_telescoping.yaml}"
TIMEOUT="${SMOKE_TIMEOUT:-60}"
SOCKET="rolltriage-smoke-$$"
WORK="$(mktemp -d)"
T() { tmux -L "$SOCKET" "$@"; }
cleanup() {
    T kill-server >/dev/null 2>&1 || true
    rm -rf "$WORK"
}
trap cleanup EXIT

fail() {
    echo "tui_smoke: FAIL: $*" >&2
    echo "----- screen -----" >&2
    T capture-pane -p -t smoke 1>&2 2>/dev/null || cat "$WORK/last_screen" 1>&2 || true
    echo "------------------" >&2
    exit 1
}

screen() { T capture-pane -p -t smoke 2>/dev/null | tee "$WORK/last_screen"; }

# Wait until the screen shows TEXT (fixed string), or fail after TIMEOUT seconds.
wait_for() {
    local text="$1" waited=0
    while ! screen | grep -qF -- "$text"; do
        sleep 0.2
        waited=$((waited + 1))
        [ "$waited" -ge $((TIMEOUT * 5)) ] && fail "did not see \"$text\""
    done
    return 0
}

[ -x "$BIN" ] || fail "binary $BIN not found (build it first)"
[ -f "$CASE" ] || fail "demo case $CASE not found"

# 100×30 terminal, no colour (checks monochrome readability too). The exit code is written to a
# file when the program ends so we can check a clean exit.
T -f /dev/null new-session -d -s smoke -x 100 -y 30 \
    "NO_COLOR=1 '$BIN'; echo \$? > '$WORK/exit'; sleep 30"
T set-option -s escape-time 0

wait_for "Find a symptom"
wait_for "F1 help"

# Pick two symptoms by typing part of their names.
T send-keys -t smoke -l "telesc"
wait_for "Telescoping"
T send-keys -t smoke Enter
T send-keys -t smoke Escape
T send-keys -t smoke -l "crushed core"
wait_for "Crushed core"
T send-keys -t smoke Enter
wait_for "telescoping, crushed_core"

# Take web, core, roll and winding from the demo case, keeping the picked symptoms.
T send-keys -t smoke C-l
wait_for "Take the inputs from a case file"
T send-keys -t smoke -l "$CASE"
T send-keys -t smoke Enter
wait_for "Loaded $CASE"

# Results: the solve runs in the background; wait for the ranked causes.
T send-keys -t smoke F4
wait_for "Ranked causes"
wait_for " 1. "
screen | grep -qE '[0-9]+% ' || fail "no belief percentages on the results screen"
screen | grep -qF "Interlayer pressure" || fail "no pressure plot"
screen | grep -qF "crush rating" || fail "no core crush rating line"
# Expand the first cause's reasons.
T send-keys -t smoke Enter
# (numbers right-align to the widest: "▾ 1." or "▾  1." with ten causes or more)
wait_for "▾ "

# Quit: the case changed, so the UI asks; discard and leave.
T send-keys -t smoke C-q
wait_for "unsaved changes"
T send-keys -t smoke d
waited=0
while [ ! -s "$WORK/exit" ]; do
    sleep 0.2
    waited=$((waited + 1))
    [ "$waited" -ge $((TIMEOUT * 5)) ] && fail "the program did not exit after quitting"
done
code="$(cat "$WORK/exit")"
[ "$code" = "0" ] || fail "exit code $code"
echo "tui_smoke: ok"
