# tests/ui-lib.sh - TAP and tmux helpers for the workbench's terminal tests
# (BUILD-NOTES §6): a private tmux server, remain-on-exit set in the same
# command as new-session, the exit status through a file, and polling for
# text instead of sleeping.  Owned by the workbench; sourced by tests/ui.sh.

T_N=0 T_FAIL=0
ok()     { T_N=$((T_N+1)); echo "ok $T_N - $*"; }
not_ok() { T_N=$((T_N+1)); T_FAIL=$((T_FAIL+1)); echo "not ok $T_N - $*"; }
check()  { _d=$1; shift; if "$@"; then ok "$_d"; else not_ok "$_d"; fi; }
done_testing() { echo "1..$T_N"; [ "$T_FAIL" -eq 0 ]; }

T_DIR=$(mktemp -d "${TMPDIR:-/tmp}/beamledger-ui.XXXXXX")
T_SOCK="beamledger-ui-$$"
t() { "${TMUX_BIN:-tmux}" -L "$T_SOCK" -f /dev/null "$@"; }
t_cleanup() { t kill-server 2>/dev/null; rm -rf "$T_DIR"; }
trap t_cleanup EXIT
trap 'exit 130' INT TERM

# t_start NAME COLS ROWS CMD...: runs CMD in a detached session.
t_start() {
	_name=$1 _x=$2 _y=$3; shift 3
	rm -f "$T_DIR/$_name.status"
	LC_ALL=C.UTF-8 t new-session -d -s "$_name" -x "$_x" -y "$_y" \
		sh -c '"$@"; echo $? >"$0"' "$T_DIR/$_name.status" "$@" \; \
		set-option -t "$_name" remain-on-exit on
}
t_screen() { t capture-pane -p -t "$1"; }
t_keys()   { t send-keys -t "$@"; }
t_status() { cat "$T_DIR/$1.status" 2>/dev/null; }

_dump() { echo "# timed out waiting for: $2" >&2; t_screen "$1" | sed 's/^/# | /' >&2; }

# wait_for NAME TEXT [SECONDS]: TEXT anywhere on the screen (20 Hz polling).
wait_for() {
	_n=0 _max=$(( ${3:-10} * 20 ))
	while [ "$_n" -lt "$_max" ]; do
		t_screen "$1" 2>/dev/null | grep -qF -- "$2" && return 0
		sleep 0.05; _n=$((_n+1))
	done
	_dump "$1" "$2"; return 1
}
# wait_line NAME REGEX [SECONDS]: one screen line matching an extended regex.
wait_line() {
	_n=0 _max=$(( ${3:-10} * 20 ))
	while [ "$_n" -lt "$_max" ]; do
		t_screen "$1" 2>/dev/null | grep -qE -- "$2" && return 0
		sleep 0.05; _n=$((_n+1))
	done
	_dump "$1" "/$2/"; return 1
}
# wait_gone NAME TEXT [SECONDS]: TEXT no longer on the screen.
wait_gone() {
	_n=0 _max=$(( ${3:-10} * 20 ))
	while [ "$_n" -lt "$_max" ]; do
		t_screen "$1" 2>/dev/null | grep -qF -- "$2" || return 0
		sleep 0.05; _n=$((_n+1))
	done
	_dump "$1" "no more '$2'"; return 1
}
wait_exit() {
	_n=0
	while [ "$_n" -lt $(( ${2:-10} * 20 )) ]; do
		[ -s "$T_DIR/$1.status" ] && return 0
		sleep 0.05; _n=$((_n+1))
	done
	return 1
}
