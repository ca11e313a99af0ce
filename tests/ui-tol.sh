#!/bin/sh
# tests/ui-tol.sh - the workbench's tolerance screen on a long run, driven
# in tmux on the demo bench with two tolerances: a sample count typed (s)
# large enough to take many seconds shows its progress after about one,
# Esc or Ctrl-C stops it and the screen shows the samples done so far,
# marked as stopped, without leaving the screen or the workbench (other
# keys typed meanwhile are kept for after); and the chain's key line names
# f and t at 80 columns as well as at 200.  At 80x24 and 200x60.  Waits
# for text, never sleeps blindly.  Owned by the workbench.

command -v "${TMUX_BIN:-tmux}" >/dev/null 2>&1 || { echo "1..0 # SKIP no tmux"; exit 0; }
[ -n "$TMUX_BIN" ] || TMUX_BIN=tmux
. "${srcdir:-.}/tests/ui-lib.sh"
BL=${BEAMLEDGER:-./src/beamledger}
DB="$T_DIR/tol.db"
export XDG_DATA_HOME="$T_DIR/xdg"
# a million samples of the demo take many seconds on any machine this
# runs on (about 15 s on two cores): far longer than the second after
# which the progress shows, so the stop always comes first
BIG=1000000

step() {        # DESC NAME TEXT KEY...: keys, then wait for TEXT
	_d=$1 _s=$2 _w=$3; shift 3
	t_keys "$_s" "$@"
	check "$_d" wait_for "$_s" "$_w"
}
no_line() { ! t_screen "$1" | grep -qE -- "$2"; }
# NAME COLS ROWS ARGS...: the workbench on $DB.  As t_start, but the shell
# that writes the exit status ignores SIGINT: Ctrl-C goes to the whole
# foreground group, and a shell that gets it while it waits dies after its
# child however the child ends, so the status would never be written
# (an interactive shell does not).  The workbench sets its own handler.
tstart() {
	_s=$1 _x=$2 _y=$3; shift 3
	rm -f "$T_DIR/$_s.status"
	LC_ALL=C.UTF-8 t new-session -d -s "$_s" -x "$_x" -y "$_y" \
		sh -c 'trap "" INT; "$@"; echo $? >"$0"' "$T_DIR/$_s.status" \
		env XDG_DATA_HOME="$XDG_DATA_HOME" USER=lab-tester NO_COLOR=1 "$BL" --db "$DB" "$@" \; \
		set-option -t "$_s" remain-on-exit on
}
# the count the head line says was done, and what the histogram counts
head_done() { t_screen "$1" | sed -n 's/^ STOPPED after \([0-9]*\) of .*/\1/p' | head -1; }
hist_n() { t_screen "$1" | sed -n "s/^ W1's ratio in \([0-9]*\) samples.*/\1/p" | head -1; }

# ---- 80x24: the chain's key line names f and t ----
tstart k 80 24 open --demo
check "the demo opens at 80x24" wait_for k "worst: W1"
check "the key line at 80 columns offers f and t, in their brief words" \
	wait_line k '^p›place  -›undo ┆ Enter›edit ┆ r›record ┆ !›hazards  f›ghosts  t›odds ┆ \?›help$'
check "... not cut" no_line k '^p›place.*…$'
step "f there opens the reflections" k "▸ reflections ·" f
step "Esc back" k "f›ghosts" Escape
step "t there opens the tolerances" k "No value on this bench carries a tolerance" t
step "Esc back again" k "t›odds" Escape

# ---- the help lists both, and says how a long run stops ----
t_keys k '?'
wait_for k "Bench list:" >/dev/null
: >"$T_DIR/help.txt"
for _p in 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15 16 17 18; do
	_was=$(t_screen k)
	printf '%s\n' "$_was" >>"$T_DIR/help.txt"
	t_keys k PgDn
	_n=0
	while [ "$_n" -lt 40 ] && [ "$(t_screen k)" = "$_was" ]; do
		sleep 0.05; _n=$((_n+1))
	done
done
check "help names f on the chain" grep -qE '^    f +every ghost and stray' "$T_DIR/help.txt"
check "help names t on the chain" grep -qE '^    t +the odds that each rated optic is over' "$T_DIR/help.txt"
check "help names s on the tolerance screen" grep -qE '^    s +run again with a sample count typed' "$T_DIR/help.txt"
check "help says a long run stops on Esc or Ctrl-C" grep -q "it, and the screen shows the samples done so far, marked STOPPED" "$T_DIR/help.txt"
check "no help line is cut at 80 columns" sh -c '! grep -q "…$" "$1"' _ "$T_DIR/help.txt"
t_keys k q
wait_for k "t›odds" >/dev/null
t_keys k Q
check "quits" wait_exit k 5

# two tolerances on the demo, as the CLI sets them
"$BL" --db "$DB" set table3-ablation --bench "source.pulse_energy=200 mJ ± 5 %" >/dev/null 2>&1
"$BL" --db "$DB" set table3-ablation S0 "length=300 mm ± 2 mm" >/dev/null 2>&1

"$BL" --db "$DB" export table3-ablation >"$T_DIR/before.json" 2>&1

# ---- 80x24: a long run, its progress, Esc ----
tstart r 80 24 open table3-ablation
check "the bench with tolerances opens" wait_for r "worst: W1"
step "t runs the screen's own short run" r "Statistical: 2000 samples, seed 1, 2 tolerances" t
check "the key line names the sample count key" \
	wait_line r '^↑↓›choose ┆ Enter›go to element  n›seed  m›more  s›samples ┆ Esc›back ┆ \?›help$'
step "s asks how many samples" r "How many samples (10 to $BIG here" s
t_keys r C-u
t_keys r -l "many"
step "a count that is no number is refused at the prompt" r "'many' is not a sample count" Enter
t_keys r C-u
t_keys r -l "2000000"
step "too many is refused, with the most there is" r "2000000 samples: give 10 to $BIG here" Enter
t_keys r C-u
t_keys r -l "$BIG"
t_keys r Enter
check "after about a second the run shows its progress" \
	wait_line r "│ sampling… [0-9]+ of $BIG samples \([0-9]+ %\) +│" 15
check "... and how to stop it" wait_for r "Esc or Ctrl-C stops it, keeping the samples done"
t_keys r Escape
check "Esc stops it: the head says stopped after how many" \
	wait_line r "^ STOPPED after [0-9]+ of $BIG samples; the figures are of those only$" 15
n=$(head_done r)
check "... a whole number of samples short of the million ($n)" \
	sh -c '[ -n "$1" ] && [ "$1" -gt 0 ] && [ "$1" -lt "$2" ]' _ "$n" "$BIG"
check "the histogram counts the same samples" sh -c '[ -n "$1" ] && [ "$1" = "$2" ]' _ "$(hist_n r)" "$n"
check "the message line says so too" \
	wait_line r "^stopped after $n of $BIG samples \([0-9.]+ s\); n, m or s runs again$"
check "the progress box is gone" wait_gone r "sampling…"
check "Esc stopped the run and left the screen open" wait_for r "▸ tolerances"
check "the table is there, of those samples" wait_line r '^▲W1 +109 % +[0-9.]+ ± [0-9.]+ %'
check "... and the workbench runs" [ -z "$(t_status r)" ]

# ---- Ctrl-C stops a run too, and not the workbench ----
t_keys r s C-u
t_keys r -l "$BIG"
t_keys r Enter
check "a second long run shows its progress" wait_line r "│ sampling… [0-9]+ of $BIG samples" 15
t_keys r C-c
check "Ctrl-C stops it: stopped after how many" \
	wait_line r "^ STOPPED after [0-9]+ of $BIG samples; the figures are of those only$" 15
check "... still on the tolerance screen" wait_for r "▸ tolerances"
check "... the workbench still runs" [ -z "$(t_status r)" ]
step "keys work again afterwards: s with 5000" r "How many samples" s
t_keys r C-u
t_keys r -l "5000"
step "... runs to the end, not marked" r "Statistical: 5000 samples, seed 1, 2 tolerances" Enter
check "... the stopped marking gone" wait_gone r "STOPPED"
step "n: the next seed with as many" r "Statistical: 5000 samples, seed 2, 2 tolerances" n
step "Esc now goes back to the chain" r "t›odds" Escape
t_keys r Q
check "quits" wait_exit r 5
check "exit status 0" [ "$(t_status r)" = 0 ]
"$BL" --db "$DB" export table3-ablation >"$T_DIR/after.json" 2>&1
check "nothing about the bench changed: its export is the same as before the runs" \
	cmp -s "$T_DIR/before.json" "$T_DIR/after.json"

# ---- 200x60: the whole words, the long forms ----
tstart w 200 60 open table3-ablation
check "200x60: the bench opens" wait_for w "worst: W1"
check "the key line in whole words" wait_line w '!›hazards  f›reflections  t›tolerance  z›profile ┆ q›list ┆ \?›help$'
t_keys w t
check "the tolerance screen" wait_for w "Statistical estimates from 2000 random samples (seed 1) of 2 tolerances"
check "its key line in whole words" wait_line w '^↑↓›choose ┆ Enter›go to element  n›new seed  m›more samples  s›sample count ┆ Esc›back ┆ \?›help$'

t_keys w s C-u
t_keys w -l "$BIG"
t_keys w Enter
check "200x60: the progress shows" wait_line w "│ sampling… [0-9]+ of $BIG samples" 15
t_keys w Up
t_keys w Escape
check "the long form of the stopped head" \
	wait_line w "^ STOPPED after [0-9]+ of $BIG samples; statistical estimates from those \(seed 1\) of 2 tolerances; ± is one standard error$" 15
check "a key typed while it ran is kept for after: Up chose L1" \
	wait_line w "^ L1's ratio in [0-9]+ samples"
t_keys w Q
check "200x60: quits" wait_exit w 5

done_testing
