#!/bin/sh
# tests/ui-ghost.sh - surface reflections in the terminal workbench, driven
# in tmux on the demo bench (ghost-conventions.md): the margin line counts
# the strays to block, an element's results list the ghosts that meet it
# and the ones it makes, the reflections screen (f) lists every ghost and
# stray worst first and Enter goes to the element, the values of glass
# show their reflections under their own heading, and tilting the demo's
# lens by 2 degrees turns its ghosts into strays to block.  At 80x24 and
# at 132x43.  Waits for text, never sleeps blindly.  Owned by the workbench.

command -v "${TMUX_BIN:-tmux}" >/dev/null 2>&1 || { echo "1..0 # SKIP no tmux"; exit 0; }
[ -n "$TMUX_BIN" ] || TMUX_BIN=tmux
. "${srcdir:-.}/tests/ui-lib.sh"
BL=${BEAMLEDGER:-./src/beamledger}
DB="$T_DIR/ghost.db"
export XDG_DATA_HOME="$T_DIR/xdg"

step() {        # DESC NAME TEXT KEY...: keys, then wait for TEXT
	_d=$1 _s=$2 _w=$3; shift 3
	t_keys "$_s" "$@"
	check "$_d" wait_for "$_s" "$_w"
}
no_line() { ! t_screen "$1" | grep -qE -- "$2"; }

# what the CLI says of the demo, to hold the screens to
BLOCK=$("$BL" trace --demo --format json 2>/dev/null | python3 -c '
import json, sys
d = json.load(sys.stdin)
print(sum(1 for w in d.get("warnings", []) if w.get("kind") == "stray"))' 2>/dev/null)
[ -n "$BLOCK" ] || BLOCK='[0-9]+'

t_start g 80 24 env XDG_DATA_HOME="$XDG_DATA_HOME" USER=lab-tester NO_COLOR=1 \
	"$BL" --db "$DB" open --demo
check "the demo opens" wait_for g "draft = #1"

# ---- the margin line (80 columns): the strays to block, the worst whole ----
check "the margin line counts the strays to block" \
	wait_line g "^worst: W1 109 % OVER ×0\.9[0-9]* │ safe source power 91[34] mW │ [0-9]+ hazards │ $BLOCK strays\$"

# ---- the settings (b): the tilt and the stray level under their heading ----
t_keys g b
check "the settings' effect counts the reflections" wait_line g "│ [0-9]+ ghosts, [0-9]+ over · $BLOCK strays to block\$"
check "the bench's reflection keys grouped" wait_line g '^ Surface reflections'
check "... under human labels" wait_line g '^   stray warn level +1 mW'
t_keys g Escape
wait_for g "p›place" >/dev/null

# ---- an element's results: the ghosts that meet it ----
t_keys g Down Down
check "HWP1 selected" wait_for g 'waveplate HWP1'
check "where the ghosts change little, the derivation keeps its place" \
	wait_line g '│ why +fluence 10\.0 J/cm²'
t_keys g Up Up
check "S0 selected" wait_for g 'space S0'
check "a gap gets no ghost lines" wait_gone g "ghosts in"

# ---- the reflections screen (f) ----
step "f opens the reflections" g "▸ reflections ·" f
check "with its count line" wait_line g "^ [0-9]+ ghosts: [0-9]+ over, [0-9]+ (at )?caution · [0-9]+ strays: $BLOCK to block"
check "its columns" wait_line g '^  kind +surfaces / source +power worst at +ratio status'
check "the lens ghost whose focus sparks comes first" \
	wait_line g '^▲ ghost +L1\.back +3\.[0-9]+ mW CM1 .* spark '
check "then the strays to block" wait_line g '^▲ stray +PBS1 back +[0-9.]+ mW .* block'
check "a second-order ghost names both surfaces in order" wait_line g '^  ghost² +W1\.front → ND1\.back '
check "the chosen one in full below" wait_for g "its focus in S8"
check "and the key line" wait_line g '^↑↓›choose ┆ Enter›go to element ┆ Esc›back'
check "no row is cut into the margin line" wait_line g '^worst: W1'
t_keys g Down
check "Down chooses the next" wait_for g "stray from PBS1 (back)"
step "Enter goes to the stray's source" g "PBS1 selected" Enter
check "the workbench, on PBS1" wait_for g 'splitter PBS1 "attenuator cube"'
check "its strays to block are said beside its rating, even at 80x24" \
	wait_line g '│ strays +back [0-9.]+ mW: block it'
check "the reflections screen is closed" wait_gone g "▸ reflections ·"
t_keys g f
wait_for g "▸ reflections ·" >/dev/null
step "Enter on the first goes to the spark ghost's worst element" g "CM1 selected" Enter
check "CM1: the ghosts raise its ratio, said beside the rating" \
	wait_line g '│ ghosts in +[0-9]+ meet it, \+[0-9.]+ [mµk]?W/cm²: [0-9.]+ %'
check "... alone vs with them (wrapped under it)" wait_line g '│ +alone, [0-9.]+ % with them'
t_keys g f
wait_for g "▸ reflections ·" >/dev/null
step "Esc goes back" g "p›place" Escape

# ---- help names the key and the screen ----
t_keys g '?'
wait_for g "Bench list:" >/dev/null
: >"$T_DIR/help.txt"
for _p in 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15 16; do
	_was=$(t_screen g)
	printf '%s\n' "$_was" >>"$T_DIR/help.txt"
	t_keys g PgDn
	_n=0
	while [ "$_n" -lt 40 ] && [ "$(t_screen g)" = "$_was" ]; do
		sleep 0.05; _n=$((_n+1))
	done
done
check "help names f on the chain" grep -qE '^    f +every ghost and stray, worst first' "$T_DIR/help.txt"
check "help has the reflections screen's keys" grep -q '^Reflections (f):' "$T_DIR/help.txt"
check "help says what a ghost is" grep -q "Every glass surface reflects a little of the beam" "$T_DIR/help.txt"
check "and still ends with the laser-safety cautions" grep -q "Align at reduced power" "$T_DIR/help.txt"
check "no help line is cut at 80 columns" sh -c '! grep -q "…$" "$1"' _ "$T_DIR/help.txt"
t_keys g q
wait_for g "p›place" >/dev/null

# ---- a larger terminal: the key line names f, the results list more ----
t resize-window -t g -x 132 -y 43
check "132x43: the key line names the reflections" wait_line g 'f›reflections'
check "the margin line says the strays in words" wait_line g "│ $BLOCK strays to block\$"
t_keys g End Up Up Up Up
check "L1 selected" wait_for g 'lens L1 "focusing lens"'
check "the ghosts it makes, worst first, with where each is worst" \
	wait_line g '│ makes +L1\.(front|back)[^:]*: [A-Z0-9]+ [<0-9.]+ % (ok|caution|OVER)'
check "the one that counts most where it meets" wait_line g '│ most +[A-Z0-9]+\.(front|back)'
# the profile lays a chosen ghost over the beam (f there), worst first
step "the profile of L1's branch" g "▸ profile along main" z
check "its key line offers the ghost" wait_line g 'f›ghost'
t_keys g f
check "f lays the worst ghost on the path over the beam" wait_line g '^ ○=ghost L1\.back [0-9.]+ mW, larger radius at each element'
check "... drawn at the elements it meets" wait_line g '│.*(○|▲)'
t_keys g f
check "f again: the next ghost" wait_line g '^ ○=ghost [A-Z0-9]+\.(front|back)'
check "... not the same one" wait_gone g '○=ghost L1.back '
t_keys g Escape
check "back on L1" wait_for g 'lens L1 "focusing lens"'
# the value pane of glass: the reflections under their own heading
check "lens radii under a human label" wait_line g '^   front radius r1 +- '
check "the glass by name" wait_line g '^   glass +- '
check "no key is left under its file name" no_line g '^   (surface_reflectance|r1|r2|material|brewster) '

# ---- tilt the lens by 2 degrees: its ghosts become strays to block ----
t_keys g Enter
wait_line g '^   focal length +\[' >/dev/null
for _k in 1 2 3 4 5 6 7 8 9 10 11 12 13 14 15 16 17 18 19 20; do
	t_screen g | grep -q 'aoi: angle of incidence' && break
	t_keys g Down
	sleep 0.05
done
check "the tilt field reached" wait_for g "aoi: angle of incidence"
check "the surface reflections grouped, after the rating" wait_line g '^ Surface reflections'
check "aoi on glass is the tilt" wait_line g '^   tilt \(aoi\) +\['
t_keys g C-u
t_keys g -l "2"
step "L1 tilted by 2 degrees" g "L1 aoi = 2 (Esc, then - undoes)" Enter
# in the values, - starts a negative number, as the hint says: Esc first
t_keys g -
check "- in the values starts a number" wait_line g '^   tilt \(aoi\) +\[-'
t_keys g Escape
check "... and Esc leaves the tilt as typed" wait_line g '^   tilt \(aoi\) +2 '
t_keys g Escape
check "the results say its strays, to block" wait_line g '│ strays +(front|back) [0-9.]+ mW: block it'
step "the reflections screen lists them" g "▸ reflections ·" f
check "L1's front reflection is a stray to block now" wait_line g '^▲ stray +L1 front +[0-9.]+ mW .* block'
check "and its back ghost no longer sparks" no_line g '^▲ ghost +L1\.back '
t_keys g Escape
step "undo puts the lens straight again" g "undone" -

# ---- ASCII under a C locale ----
t_keys g Q
wait_exit g 5
t_start asc 80 24 env LC_ALL=C XDG_DATA_HOME="$XDG_DATA_HOME" NO_COLOR=1 "$BL" --db "$DB" open table3-ablation
check "ASCII workbench open" wait_for asc "table3-ablation"
t_keys asc f
check "ASCII reflections" wait_line asc '^! ghost +L1\.back '
check "second order in ASCII" wait_line asc '^  ghost2 +W1\.front -> ND1\.back '
t_keys asc Q
check "quits" wait_exit asc 5

done_testing
