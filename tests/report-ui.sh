#!/bin/sh
# report-ui.sh - the workbench's history screen writes the printed review
# of the chosen setup (key v) into the current folder and says where; the
# PDF it leaves opens; the terminal profile shows the ids of elements a
# column apart on two rows.  Driven in tmux like tests/ui.sh.

command -v "${TMUX_BIN:-tmux}" >/dev/null 2>&1 || { echo "1..0 # SKIP no tmux"; exit 0; }
command -v pdfinfo >/dev/null 2>&1 || { echo "1..0 # SKIP no pdfinfo"; exit 0; }
[ -n "$TMUX_BIN" ] || TMUX_BIN=tmux
. "${srcdir:-.}/tests/ui-lib.sh"
BL=${BEAMLEDGER:-./src/beamledger}
case $BL in /*) ;; *) BL=$PWD/$BL ;; esac
DB="$T_DIR/ui.db"
B=table3-ablation

"$BL" demo >"$T_DIR/demo.json"
"$BL" --db "$DB" import "$T_DIR/demo.json" >/dev/null
"$BL" --db "$DB" set "$B" L1 focal=300mm >/dev/null
"$BL" --db "$DB" record "$B" -n "longer lens" >/dev/null
mkdir "$T_DIR/here"
t_start rv 100 30 env -C "$T_DIR/here" USER=lab-tester NO_COLOR= "$BL" --db "$DB" open "$B"
check "the workbench opens the bench" wait_for rv "worst:"
t_keys rv h
check "history lists the setups" wait_for rv "longer lens"
t_keys rv Down
t_keys rv v
check "v says where the review went" wait_for rv "written to $T_DIR/here/$B-setup-2.pdf"
check "the PDF is there and opens" sh -c 'pdfinfo "$1" | grep -q "^Pages: *[1-9]"' sh "$T_DIR/here/$B-setup-2.pdf"
check "nothing else is left in the folder" [ "$(ls "$T_DIR/here" | wc -l)" -eq 1 ]
# the terminal profile: W1 and T1 are 20 mm apart, one column at this
# width; both ids are shown, on two rows, rather than one hiding the other
t_keys rv Escape
check "back on the chain" wait_for rv "worst:"
t_keys rv End
t_keys rv z
check "the profile of T1's branch" wait_for rv "target T1 at z"
check "T1's id under its mark" wait_line rv '^ .* L1 +T1 *$'
check "W1's id on the second row, not hidden" wait_line rv ' W1 *$'
t_keys rv Q
check "quits" wait_exit rv 5

# without the print module (report-print.h): the workbench says what was
# looked for and that the Markdown form needs none, writes nothing, and
# goes on
mkdir "$T_DIR/none"
t_start nm 100 30 env -C "$T_DIR/none" BEAMLEDGER_PRINT_MODULE="$T_DIR/no-module.so" \
	USER=lab-tester NO_COLOR= "$BL" --db "$DB" open "$B"
check "without the module: the workbench opens" wait_for nm "worst:"
t_keys nm h
check "... history" wait_for nm "longer lens"
t_keys nm Down
t_keys nm v
check "... v says the review was not written" wait_for nm "review not written"
# the screen's words with the line breaks taken out
words_on() { t_screen "$1" | tr -s ' \n' '  ' | grep -qF -- "$2" ||
	{ diag "screen lacks '$2'"; t_screen "$1" | sed 's/^/# | /'; return 1; }; }
check "... that the print module was not found, and where it looked" \
	words_on nm "the print module, which was not found (looked for $T_DIR/no-module.so"
check "... that Markdown needs no module" words_on nm "the Markdown form (--format md) needs no module"
check "... and that nothing was written" words_on nm "nothing written"
check "... and nothing is in the folder" [ -z "$(ls -A "$T_DIR/none")" ]
t_keys nm Escape
check "Esc goes back to the history" wait_for nm "longer lens"
t_keys nm Escape
check "... and the chain" wait_for nm "worst:"
t_keys nm Q
check "quits" wait_exit nm 5
check "... with status 0" [ "$(t_status nm)" = 0 ]
done_testing
