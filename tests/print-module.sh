#!/bin/sh
# print-module.sh - the PDF and SVG writers live in the print module
# (beamledger-print.so, report-print.h), loaded only to write one: the
# program itself needs no cairo, pango or glib; the module is found beside
# the program or where BEAMLEDGER_PRINT_MODULE says; a module that is not
# there, not loadable or from another build is refused in clear words, exit
# 2 and nothing written, while the Markdown form goes on working.
. "${srcdir:-.}/tests/lib.sh"

cd "$T_DIR" || exit 2
for tool in readelf nm pdfinfo; do
	command -v "$tool" >/dev/null 2>&1 || { echo "1..0 # SKIP $tool missing (.ci/install-deps)"; exit 0; }
done
case $BEAMLEDGER in /*) ;; *) BEAMLEDGER=$OLDPWD/$BEAMLEDGER ;; esac
MODULE=$(dirname "$BEAMLEDGER")/beamledger-print.so
STALE=${T_STALE_MODULE:-$(dirname "$BEAMLEDGER")/../tests/print-stale.so}
unset BEAMLEDGER_PRINT_MODULE
# run_with NAME PROGRAM MODULE ARGS...: as run, with BEAMLEDGER_PRINT_MODULE
# set to MODULE (unset when empty)
run_with() {
	_name=$1 _prog=$2 _mod=$3
	shift 3
	if [ -n "$_mod" ]; then
		env BEAMLEDGER_PRINT_MODULE="$_mod" "$_prog" "$@"
	else
		"$_prog" "$@"
	fi <"${T_STDIN:-/dev/null}" >"$T_DIR/$_name.out" 2>"$T_DIR/$_name.err"
	echo $? >"$T_DIR/$_name.rc"
}

# ---- what the program and the module link ----
needed() { readelf -d "$1" | sed -n 's/.*(NEEDED).*\[\(.*\)\]/\1/p'; }
needed "$BEAMLEDGER" >prog.needed
check "the program needs no cairo, pango or glib ($(tr '\n' ' ' <prog.needed))" \
	sh -c '! grep -qE "^lib(cairo|pango|gobject|glib|harfbuzz|fontconfig|freetype)" "$1"' sh prog.needed
check "the module is built beside the program" [ -f "$MODULE" ]
needed "$MODULE" >mod.needed
check "... and needs cairo and pango itself" sh -c 'grep -q "^libcairo" "$1" && grep -q "^libpangocairo" "$1"' sh mod.needed
nm -D --defined-only "$BEAMLEDGER" | awk '$2 ~ /^[TDBRVW]$/ { print $3 }' | sort -u >prog.syms
check "the program exports what the module calls back (review_count_all, model_keys)" \
	sh -c 'grep -qx review_count_all "$1" && grep -qx model_keys "$1"' sh prog.syms
# The module's undefined symbols resolve against the program (exported
# with --export-dynamic), which then comes first for every library the
# module loads: a function of ours named like one of theirs would take its
# place.  None may.
if grep -qE '^(__asan_init|__ubsan_handle_[a-z_]*)$' prog.syms; then
	# the sanitizer runtime in the program interposes libc's malloc,
	# strlen, ... on purpose
	skip "a sanitizer build: its runtime's symbols are meant to take libc's place"
elif command -v ldd >/dev/null 2>&1; then
	: >libs.syms
	for lib in $(ldd "$MODULE" | awk '$2 == "=>" && $3 ~ /^\// { print $3 }'); do
		nm -D --defined-only "$lib" 2>/dev/null | awk -v l="${lib##*/}" '{ print $3, l }' >>libs.syms
	done
	clash=$(awk 'NR == FNR { p[$1]; next } ($1 in p) && $1 !~ /^(_edata|_end|__bss_start|_init|_fini)$/' \
		prog.syms libs.syms | head -n 5)
	check "the program exports $(wc -l <prog.syms) symbols, none also in the module's $(cut -d' ' -f2 libs.syms | sort -u | wc -l) libraries" \
		sh -c '[ -s prog.syms ] && [ -s libs.syms ] && [ -z "$1" ]' sh "$clash"
	[ -z "$clash" ] || diag "clashes: $clash"
else
	skip "ldd missing: the exported symbols against the module's libraries"
fi

# ---- the module beside the program: PDF and SVG as before ----
run pdf report --demo -o demo.pdf
check "PDF through the module: exit 0" status_is pdf 0
check "... pdfinfo opens it" sh -c 'pdfinfo demo.pdf | grep -q "^Pages: *[1-9]"'
run svg report --demo -o demo.svg
check "SVG through the module: exit 0" status_is svg 0
check "... an SVG document" grep -q '<svg' demo.svg
run_with env "$BEAMLEDGER" "$MODULE" report --demo -o env.svg
check "BEAMLEDGER_PRINT_MODULE naming the module: exit 0 and the same SVG" \
	sh -c '[ "$1" -eq 0 ] && cmp -s demo.svg env.svg' sh "$(rc_of env)"

cp "$MODULE" here.so
run_with rel "$BEAMLEDGER" here.so report --demo -o rel.svg
check "BEAMLEDGER_PRINT_MODULE a name without a folder: the file in the current one" \
	sh -c '[ "$1" -eq 0 ] && cmp -s demo.svg rel.svg' sh "$(rc_of rel)"

# ---- no module where it is looked for ----
refused() {  # NAME FILE: exit 2, nothing on stdout, no file, no temporary
	status_is "$1" 2 && out_empty "$1" && [ ! -e "$2" ] &&
		[ -z "$(ls -a | grep -F "$2.")" ] && err_has "$1" "nothing written" &&
		err_has "$1" "the Markdown form (--format md) needs no module"
}
run_with gone "$BEAMLEDGER" "$T_DIR/none.so" report --demo -o gone.pdf
check "module missing: exit 2, no file, Markdown named" refused gone gone.pdf
check "... says what was looked for" err_has gone "gone.pdf: PDF and SVG are drawn by the print module, which was not found (looked for $T_DIR/none.so, as BEAMLEDGER_PRINT_MODULE says)"
run_with gonesvg "$BEAMLEDGER" "$T_DIR/none.so" report --demo -o gone.svg
check "module missing, SVG: exit 2, no file" refused gonesvg gone.svg
run_with md "$BEAMLEDGER" "$T_DIR/none.so" report --demo -o still.md
check "module missing: the Markdown form still works" \
	sh -c '[ "$1" -eq 0 ] && grep -q "^# Review of bench" still.md' sh "$(rc_of md)"
run_with ver "$BEAMLEDGER" "$T_DIR/none.so" --version
check "module missing: the other commands never look for it" status_is ver 0

# the program alone in another folder: looks beside itself, then where it
# is installed; with the module copied beside it, finds it there
mkdir bin
cp "$BEAMLEDGER" bin/beamledger
run_with alone "$T_DIR/bin/beamledger" "" report --demo -o alone.pdf
if [ "$(rc_of alone)" = 0 ]; then
	skip "a print module is installed on this machine: the program alone finds it"
	rm -f alone.pdf
else
	check "the program alone: exit 2, no file" refused alone alone.pdf
	check "... names the place beside it, then the installed one" \
		err_has alone "(looked for $T_DIR/bin/beamledger-print.so, then /"
fi
cp "$MODULE" bin/
run_with beside "$T_DIR/bin/beamledger" "" report --demo -o beside.svg
check "with the module copied beside it: exit 0, the same SVG" \
	sh -c '[ "$1" -eq 0 ] && cmp -s demo.svg beside.svg' sh "$(rc_of beside)"

# ---- a module that is there but will not do ----
printf 'not a module\n' >garbage.so
run_with junk "$BEAMLEDGER" "$T_DIR/garbage.so" report --demo -o junk.pdf
check "a file that is no library: exit 2, no file" refused junk junk.pdf
check "... says it cannot be loaded" err_has junk "the print module $T_DIR/garbage.so cannot be loaded"
lib=$(sed -n 's/^\(libm\.so\..*\)/\1/p' prog.needed | head -n 1)
libm=$(command -v ldd >/dev/null 2>&1 && ldd "$BEAMLEDGER" | awk -v l="$lib" '$1 == l { print $3 }')
if [ -n "$libm" ]; then
	run_with other "$BEAMLEDGER" "$libm" report --demo -o other.pdf
	check "a library that is no print module ($libm): exit 2, no file" refused other other.pdf
	check "... says so" err_has other "$libm is not a beamledger print module"
else
	skip "no libm path from ldd: a library that is no print module"
	skip "no libm path from ldd: ... says so"
fi
check "the stale module of the test build is there ($STALE)" [ -f "$STALE" ]
run_with stale "$BEAMLEDGER" "$STALE" report --demo -o stale.pdf
check "a module from another build (stamp differs): exit 2, no file" refused stale stale.pdf
check "... says so, with both stamps" sh -c 'grep -qF "the print module $1 is from another build of beamledger (version " "$2" &&
	grep -qF "this program is version " "$2" && grep -qF "install both from one build" "$2"' sh "$STALE" "$T_DIR/stale.err"
run_with stalesvg "$BEAMLEDGER" "$STALE" report --demo -o stale.svg
check "... and for an SVG" refused stalesvg stale.svg

done_testing
