# store-lib.sh - TAP helpers for the database end-to-end tests (sourced).
# Every test works in its own temporary directory with its own XDG and HOME,
# so that no user's real database is ever touched.

T_N=0
T_FAIL=0
ok()     { T_N=$((T_N + 1)); echo "ok $T_N - $*"; }
not_ok() { T_N=$((T_N + 1)); T_FAIL=$((T_FAIL + 1)); echo "not ok $T_N - $*"; }
skip()   { T_N=$((T_N + 1)); echo "ok $T_N - # SKIP $*"; }
# check DESCRIPTION CMD...: ok when CMD succeeds; on failure shows the last
# command's output and errors.
check() {
	_d=$1
	shift
	if "$@"; then
		ok "$_d"
	else
		not_ok "$_d"
		[ -f "$T_DIR/out" ] && sed 's/^/#   out: /' "$T_DIR/out" | head -20
		[ -f "$T_DIR/err" ] && sed 's/^/#   err: /' "$T_DIR/err" | head -20
	fi
	return 0
}
done_testing() { echo "1..$T_N"; [ "$T_FAIL" -eq 0 ]; }

BEAMLEDGER=${BEAMLEDGER:-./src/beamledger}
case $BEAMLEDGER in
/*) ;;
*) BEAMLEDGER=$(pwd)/$BEAMLEDGER ;;
esac
T_DIR=$(mktemp -d "${TMPDIR:-/tmp}/beamledger-store-test.XXXXXX") || exit 2
trap 'rm -rf "$T_DIR"' EXIT
trap 'exit 130' INT TERM
HOME=$T_DIR/home
XDG_DATA_HOME=$T_DIR/xdg
LC_ALL=C.UTF-8
USER=tester
export HOME XDG_DATA_HOME LC_ALL USER
unset BEAMLEDGER_DB NO_COLOR
mkdir -p "$HOME"

# run CMD...: the program's stdout in $T_DIR/out, stderr in $T_DIR/err,
# exit status in $RC.
run() {
	"$BEAMLEDGER" "$@" >"$T_DIR/out" 2>"$T_DIR/err"
	RC=$?
}
rc_is()    { [ "$RC" -eq "$1" ]; }
out_has()  { grep -qF -- "$1" "$T_DIR/out"; }
err_has()  { grep -qF -- "$1" "$T_DIR/err"; }
err_empty() { [ ! -s "$T_DIR/err" ]; }
# Exit status, message on stderr, nothing on stdout: how trouble looks.
trouble() { [ "$RC" -eq 2 ] && grep -q '^beamledger: ' "$T_DIR/err" && err_has "$1"; }
same_file() { cmp -s "$1" "$2"; }
have_sqlite3() { command -v sqlite3 >/dev/null 2>&1; }
# A random integer in [0, $1).
rand() { echo $(( $(od -An -N2 -tu2 /dev/urandom | tr -d ' ') % $1 )); }
