# lib.sh - TAP helpers for the shell tests (sourced, not run).
#
# A test sources this with  . "${srcdir:-.}/tests/lib.sh" , calls check or
# ok/not_ok once per assertion, and ends with done_testing, which prints the
# plan and gives the exit status.  Scratch files go under $T_DIR, a private
# mktemp directory removed on exit.

T_N=0
T_FAIL=0

ok()     { T_N=$((T_N + 1)); echo "ok $T_N - $*"; }
not_ok() { T_N=$((T_N + 1)); T_FAIL=$((T_FAIL + 1)); echo "not ok $T_N - $*"; }
skip()   { T_N=$((T_N + 1)); echo "ok $T_N - # SKIP $*"; }

# check DESCRIPTION COMMAND...: one TAP line for the command's success.
check() {
	_d=$1
	shift
	if "$@"; then ok "$_d"; else not_ok "$_d"; fi
}

# diag TEXT...: a comment line for the log (the driver shows it on failure).
diag() { printf '%s\n' "$@" | sed 's/^/# /'; }

done_testing() {
	echo "1..$T_N"
	[ "$T_FAIL" -eq 0 ]
}

# The program under test: make check exports BEAMLEDGER; by hand, the build.
BEAMLEDGER=${BEAMLEDGER:-./src/beamledger}
srcdir=${srcdir:-.}

T_DIR=$(mktemp -d "${TMPDIR:-/tmp}/beamledger-test.XXXXXX") || {
	echo "Bail out! cannot make a scratch directory"
	exit 99
}
t_cleanup() { rm -rf "$T_DIR"; }
trap t_cleanup EXIT
trap 'exit 130' INT TERM

# run NAME ARGS...: runs the program with stdin from /dev/null, keeping its
# stdout, stderr and exit status in $T_DIR/NAME.{out,err,rc}.
run() {
	_name=$1
	shift
	"$BEAMLEDGER" "$@" <"${T_STDIN:-/dev/null}" >"$T_DIR/$_name.out" 2>"$T_DIR/$_name.err"
	echo $? >"$T_DIR/$_name.rc"
}

rc_of()    { cat "$T_DIR/$1.rc"; }
status_is() { [ "$(rc_of "$1")" = "$2" ] || { diag "$1: exit status $(rc_of "$1"), want $2"; \
	sed 's/^/# stderr: /' "$T_DIR/$1.err"; return 1; }; }
out_empty() { [ ! -s "$T_DIR/$1.out" ] || { diag "$1: stdout not empty:"; \
	head -n 5 "$T_DIR/$1.out" | sed 's/^/# | /'; return 1; }; }
err_empty() { [ ! -s "$T_DIR/$1.err" ] || { diag "$1: stderr not empty:"; \
	head -n 5 "$T_DIR/$1.err" | sed 's/^/# | /'; return 1; }; }
# out_has NAME TEXT / err_has NAME TEXT: fixed-string search.
out_has() { grep -qF -- "$2" "$T_DIR/$1.out" || { diag "$1: stdout lacks '$2'"; return 1; }; }
err_has() { grep -qF -- "$2" "$T_DIR/$1.err" || { diag "$1: stderr lacks '$2':"; \
	sed 's/^/# | /' "$T_DIR/$1.err"; return 1; }; }

# The escape byte, for colour checks.
T_ESC=$(printf '\033')
has_escape() { grep -q "$T_ESC" "$1"; }
no_escape()  { ! grep -q "$T_ESC" "$1"; }

# Writes a bench file with ' for " (readable inline JSON): bench NAME TEXT.
bench() { printf '%s\n' "$2" | tr "'" '"' >"$T_DIR/$1"; }

have() { command -v "$1" >/dev/null 2>&1; }
