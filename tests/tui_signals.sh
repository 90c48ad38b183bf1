#!/usr/bin/env bash
# The terminal UI restores the terminal when it is told to stop by a signal: for each of
# SIGTERM, SIGINT, SIGHUP and SIGQUIT, start `rolltriage tui --mouse` in tmux, send the signal
# to the program, and check that raw mode is off (stty settings as before), the alternate
# screen is left, the cursor is shown and mouse reporting is off.
#
# Usage: tests/tui_signals.sh [path/to/rolltriage]   (default: target/debug/rolltriage)
# Runs on a private tmux server socket, so it never touches the user's own tmux sessions.
set -euo pipefail

cd "$(dirname "$0")/.."
BIN="${1:-${ROLLTRIAGE_BIN:-target/debug/rolltriage}}"
TIMEOUT="${SIGNAL_TIMEOUT:-30}"
SOCKET="rolltriage-signals-$$"
WORK="$(mktemp -d)"
T() { tmux -L "$SOCKET" "$@"; }
cleanup() {
    T kill-server >/dev/null 2>&1 || true
    rm -rf "$WORK"
}
trap cleanup EXIT

fail() {
    echo "tui_signals: FAIL: $*" >&2
    exit 1
}

[ -x "$BIN" ] || fail "binary $BIN not found (build it first)"

# A session that lives for the whole run keeps the private server up between the signal runs:
# otherwise the server exits with the last session and the next new-session can race it
# ("server exited unexpectedly" on a loaded machine).
T -f /dev/null new-session -d -s keep "sleep 3600"

for SIG in TERM INT HUP QUIT; do
    rm -f "$WORK/before" "$WORK/after" "$WORK/exit"
    # The shell records the terminal settings before and after the program; `ulimit -c 0`
    # keeps SIGQUIT from leaving a core file.
    T -f /dev/null new-session -d -s "s$SIG" -x 100 -y 30 \
        "ulimit -c 0; stty -g > '$WORK/before'; NO_COLOR=1 '$BIN' tui --mouse; echo \$? > '$WORK/exit'; stty -g > '$WORK/after'; sleep 60"
    waited=0
    until T capture-pane -p -t "s$SIG" 2>/dev/null | grep -qF "Find a symptom"; do
        sleep 0.2
        waited=$((waited + 1))
        [ "$waited" -ge $((TIMEOUT * 5)) ] && fail "SIG$SIG: the UI did not start"
    done
    [ "$(T display -p -t "s$SIG" '#{alternate_on}')" = "1" ] || fail "SIG$SIG: the UI is not on the alternate screen"
    pane_pid="$(T display -p -t "s$SIG" '#{pane_pid}')"
    pid="$(ps -o pid= --ppid "$pane_pid" | tr -d ' ' | head -n 1)"
    [ -n "$pid" ] || fail "SIG$SIG: cannot find the program's process"
    kill -s "$SIG" "$pid"
    waited=0
    until [ -s "$WORK/after" ]; do
        sleep 0.2
        waited=$((waited + 1))
        [ "$waited" -ge $((TIMEOUT * 5)) ] && fail "SIG$SIG: the program did not stop"
    done
    sleep 0.2
    cmp -s "$WORK/before" "$WORK/after" || fail "SIG$SIG: terminal settings not restored (raw mode left on)"
    state="$(T display -p -t "s$SIG" '#{alternate_on} #{cursor_flag} #{mouse_any_flag} #{mouse_button_flag} #{mouse_standard_flag} #{mouse_sgr_flag}')"
    [ "$state" = "0 1 0 0 0 0" ] || fail "SIG$SIG: terminal state alternate/cursor/mouse(any,button,standard,sgr) = $state, expected 0 1 0 0 0 0"
    T kill-session -t "s$SIG"
    echo "tui_signals: SIG$SIG restored (exit $(cat "$WORK/exit"))"
done
echo "tui_signals: ok"
