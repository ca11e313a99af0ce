#!/bin/sh
# tests/ui-point.sh - the workbench's operating-point screens in tmux: every
# point side by side (the ratio of each rated element at the base and at each
# point, its worst and where), and a sweep of the selected element's angle
# with a cursor that walks along it.  Waits for text, never sleeps blindly.

command -v "${TMUX_BIN:-tmux}" >/dev/null 2>&1 || { echo "1..0 # SKIP no tmux"; exit 0; }
[ -n "$TMUX_BIN" ] || TMUX_BIN=tmux
. "${srcdir:-.}/tests/ui-lib.sh"
BL=${BEAMLEDGER:-./src/beamledger}
DB="$T_DIR/ui.db"
B=table3-ablation
export XDG_DATA_HOME="$T_DIR/xdg"

"$BL" demo >"$T_DIR/demo.json" &&
"$BL" --db "$DB" import "$T_DIR/demo.json" >/dev/null &&
"$BL" --db "$DB" point add $B alignment 'source.power=20 mW' '+filter:ND2@S0' 'ND2.od=1' >/dev/null &&
"$BL" --db "$DB" point add $B full 'source.pulse_energy=600 mJ' >/dev/null ||
	{ echo "1..0 # SKIP could not set the bench up"; exit 0; }

t_start ui 100 30 env XDG_DATA_HOME="$XDG_DATA_HOME" NO_COLOR= "$BL" --db "$DB" open $B
check "the chain is drawn" wait_for ui "W1"
t_keys ui o
check "o: every point side by side" wait_for ui "operating points side by side"
check "... a column per point" wait_line ui "element +base +alignment +full +worst at"
check "... each point's worst element" wait_line ui "worst +W1 109 % +W1 0.11 % +W1 328 %"
# ND1 at the base 82.7 % from the main beam (the trace's own table) and a
# little more from the ghosts that meet it; at 'full' three times the
# energy: about 248 % (linear), over there
check "... per element, the worst and where" wait_line ui "ND1 +8[0-9.]* % .* 2[45][0-9] % +2[45][0-9] % OVER at full"
t_keys ui Escape
check "Esc: back to the chain" wait_gone ui "operating points side by side"

t_keys ui v
check "v: the sweep prompt on the selected element's angle" wait_for ui "HWP1.angle 0 .. 45"
t_keys ui Enter
check "the sweep opens" wait_for ui "sweep of HWP1.angle, 0 .. 45"
check "... at the start of the range" wait_for ui "HWP1.angle = 0°: worst W1 128 % OVER"
# 13.9° for the main beam alone; the ghosts that meet W1 narrow it a little
check "... the safe interval" wait_line ui "safe \(nothing over\): 1[34](\.[0-9]*)? deg|safe \(nothing over\): 1[34](\.[0-9]*)?°"
t_keys ui Right
check "Right: the cursor moves one step (45/200)" wait_for ui "HWP1.angle = 0.225°"
t_keys ui NPage NPage NPage NPage NPage NPage NPage NPage NPage NPage
check "PgDn: 20 steps at a time, to the end" wait_for ui "HWP1.angle = 45°: worst BD1 39.6 % ok"
t_keys ui Home
check "Home: the start again" wait_for ui "HWP1.angle = 0°: worst W1"
t_keys ui End
check "End: the end again" wait_for ui "HWP1.angle = 45°: worst BD1"
t_keys ui Escape
check "Esc: back to the chain" wait_gone ui "sweep of HWP1.angle"
t_keys ui v
wait_for ui "HWP1.angle 0 .. 45" >/dev/null
t_keys ui C-u
t_keys ui -l "HWP1.angle 10 .. 10"
t_keys ui Enter
check "a refused range keeps the prompt with the reason" wait_for ui "two different finite values"
t_keys ui Escape
wait_gone ui "two different" >/dev/null
t_keys ui Q
check "Q quits" wait_exit ui 5
check "... with status 0" [ "$(t_status ui)" = 0 ]
done_testing
