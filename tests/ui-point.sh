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
# ND1 at the base: its absorbed-power rating.  By hand the main beam alone
# gives P_ND1 = 2 W·0.995·0.837214·0.995 = 1.65775 W, absorbed
# (1 - 10^-0.3)·P = 0.82690 W of 1 W: 82.7 %; the ghosts that cross it
# (25 paths: 8 first-order, 17 second-order) add about 0.9 %, not derived
# by hand, so the base's cell is the trace's own table cell.  At 'full',
# three times the pulse energy: every power, ghosts included, triples and
# the rating does not change, so ND1's ratio is exactly three times the
# base's (hand: linearity; checked on the JSON), in the table's form.
p_cell() {      # FILE ID: the ratio cell of ID in a trace table
	awk -v id="$2" '$1 == id { for (i = 2; i <= NF; i++) if ($i == "%") print $(i-1) " %" }' "$1"
}
"$BL" --db "$DB" trace $B >"$T_DIR/p-base.txt" 2>/dev/null
"$BL" --db "$DB" trace $B --point full >"$T_DIR/p-full.txt" 2>/dev/null
nd_base=$(p_cell "$T_DIR/p-base.txt" ND1)
nd_full=$(p_cell "$T_DIR/p-full.txt" ND1)
check "hand: ND1 at 'full' is three times its base ratio ($nd_base, $nd_full)" sh -c '
	"$1" --db "$2" trace "$3" --format json 2>/dev/null >"$4.b"
	"$1" --db "$2" trace "$3" --point full --format json 2>/dev/null >"$4.f"
	python3 -c "
import json, sys
r = lambda p: [e[\"ratio\"] for e in json.load(open(p))[\"elements\"] if e[\"id\"] == \"ND1\"][0]
b, f = r(sys.argv[1]), r(sys.argv[2])
assert 0.8269 < b and abs(f / b - 3) < 1e-9, (b, f)" "$4.b" "$4.f"' sh "$BL" "$DB" $B "$T_DIR/p-json"
check "... per element, the worst and where (ND1 $nd_base, $nd_full at full)" \
	wait_line ui "ND1 +$(printf %s "$nd_base" | sed 's/\./\\./') .* $nd_full +$nd_full OVER at full"
t_keys ui Escape
check "Esc: back to the chain" wait_gone ui "operating points side by side"

t_keys ui v
check "v: the sweep prompt on the selected element's angle" wait_for ui "HWP1.angle 0 .. 45"
t_keys ui Enter
check "the sweep opens" wait_for ui "sweep of HWP1.angle, 0 .. 45"
check "... at the start of the range" wait_for ui "HWP1.angle = 0°: worst W1 128 % OVER"
# Where W1 stops being over: not derived by hand (W1's ratio at each angle
# holds its 42 second-order ghosts, and the crossing is interpolated on
# the 201-point grid); the workbench must say what the CLI's sweep on the
# same grid says (13.99945°, shown to 4 digits).  13.9° would be the main
# beam alone.
sw_lo=$("$BL" --db "$DB" sweep $B HWP1.angle 0 45 --steps 201 2>/dev/null |
	sed -n 's/^Safe (nothing over): *\([0-9.]*\)° \.\. 45°$/\1/p')
sw_lo4=$(awk -v x="$sw_lo" 'BEGIN { printf "%.4g", x }')
check "the CLI's sweep has one safe interval, from $sw_lo° to 45°" [ -n "$sw_lo" ]
check "... the safe interval ($sw_lo4° .. 45°)" \
	wait_line ui "safe \(nothing over\): $(printf %s "$sw_lo4" | sed 's/\./\\./')(°| deg) \.\. 45(°| deg)"
t_keys ui Right
check "Right: the cursor moves one step (45/200)" wait_for ui "HWP1.angle = 0.225°"
t_keys ui NPage NPage NPage NPage NPage NPage NPage NPage NPage NPage
check "PgDn: 20 steps at a time, to the end" wait_for ui "HWP1.angle = 45°: worst BD1 39.6 % ok"
t_keys ui Home
check "Home: the start again" wait_for ui "HWP1.angle = 0°: worst W1"
t_keys ui End
check "End: the end again" wait_for ui "HWP1.angle = 45°: worst BD1"
t_keys ui Tab
# at 45° the plate sends everything into the splitter's reflected port
check "Tab: the chain at the cursor's value" wait_line ui " BD1 +dump +1\.98 W +39\.6 % +ok"
check "... with the knob's value above it" wait_for ui "HWP1.angle = 45°: worst BD1"
t_keys ui Home
check "... and it follows the cursor (0°: nothing reflected)" wait_line ui " BD1 +dump +[0-9.]+ [nµm]?W +[0-9.]+ % +ok|BD1 +dump +0 W"
t_keys ui Tab
check "Tab again: the plot" wait_for ui "safe (nothing over)"
t_keys ui Escape
check "Esc: back to the chain" wait_gone ui "sweep of HWP1.angle"
# the sweep opens on the marked field: mark HWP1's retardance, then v
t_keys ui Enter
wait_for ui "Enter›apply" >/dev/null
t_keys ui Escape Down Escape
t_keys ui v
check "v: the sweep prompt on the marked field" wait_for ui "HWP1.retardance 0.25 .. 1"
t_keys ui Escape
wait_gone ui "HWP1.retardance 0.25" >/dev/null
t_keys ui v
wait_for ui "HWP1.angle 0 .. 45" >/dev/null
t_keys ui C-u
t_keys ui -l "HWP1.angle 10 .. 10"
t_keys ui Enter
check "a refused range keeps the prompt with the reason" wait_for ui "two different finite values"
t_keys ui Escape
wait_gone ui "two different" >/dev/null
# ---- one point on the chain at a time; edits there are its overrides ----
check "the margin line says the base is shown, and that there are points" \
	wait_line ui '^base \(O: 2 points\) │ (worst: )?W1 109 % OVER'
t_keys ui Home
t_keys ui O
check "O: the first point on the margin line" wait_line ui '^point alignment 1/2 │ '
check "... traced at that point: the source at 20 mW" wait_line ui '^1\.064 µm 20\.0 mW pulsed'
check "... with the element the point puts in" wait_line ui '^.ND2 '
check "... the values' line says they are the point's" wait_for ui "point alignment overrides"
check "... the key line offers no layout key there, and the point key" \
	sh -c 't_screen() { "${TMUX_BIN:-tmux}" -L "$1" capture-pane -p -t ui; }; t_screen "$1" | tail -1 | grep -v "p›place" | grep -q "O›point"' _ "$T_SOCK"
t_keys ui p
check "the layout is refused while a point is shown" \
	wait_for ui "point alignment is shown: the layout is the base's"
t_keys ui Home
t_keys ui Enter
wait_line ui '^   length +\[' >/dev/null
t_keys ui C-u
t_keys ui -l "250 mm"
t_keys ui Enter
check "a value typed at a point is its override" \
	wait_for ui "point alignment: S0.length = 250 mm, its override; the base keeps its own"
t_keys ui Escape
check "... stored in the point" sh -c '"$1" --db "$2" point show '$B' alignment | grep -q "^  S0.length=250 mm$"' _ "$BL" "$DB"
check "... and not in the base" sh -c '"$1" --db "$2" export '$B' | grep -qF "\"id\": \"S0\", \"type\": \"space\", \"length\": \"300 mm\""' _ "$BL" "$DB"
# the logbook's draft line is the base's, as every setup's is
t_keys ui h
check "the logbook opens at a point" wait_for ui "setup recorded"
check "... its draft line is the base's (W1 over), not the point's" \
	sh -c '"${TMUX_BIN:-tmux}" -L "$1" capture-pane -p -t ui | grep -c "OVER W1 109 %" | grep -qx 2' _ "$T_SOCK"
t_keys ui Escape
wait_gone ui "setup recorded" >/dev/null
# the source at a point: b, then its power, replaces the point's own change
t_keys ui b
wait_for ui "the beam and bench settings" >/dev/null
t_keys ui Down Enter C-u
t_keys ui -l "50 mW"
t_keys ui Enter
check "the source's power typed at a point is its override" \
	wait_for ui "point alignment: source.power = 50 mW, its override"
check "... replacing the point's change of it" sh -c '"$1" --db "$2" point show '$B' alignment | grep -c "^  source.power=" | grep -qx 1 && "$1" --db "$2" point show '$B' alignment | grep -q "^  source.power=50 mW$"' _ "$BL" "$DB"
t_keys ui Up Up Up Up Up Enter C-u
t_keys ui -l "3"
t_keys ui Enter
check "the safety factor is refused at a point, with the reason" \
	wait_for ui "safety_factor is the bench's, not point alignment's"
t_keys ui Escape Escape
t_keys ui -
check "- undoes the override" wait_for ui "undone"
check "... the point's power is 20 mW again" sh -c '"$1" --db "$2" point show '$B' alignment | grep -q "^  source.power=20 mW$"' _ "$BL" "$DB"
t_keys ui O
check "O: the next point" wait_line ui '^point full 2/2 │ (worst: )?W1 328 % OVER'
t_keys ui O
check "O: the base again" wait_line ui '^base \(O: 2 points\) │ (worst: )?W1 109 % OVER'
t_keys ui W
check "W: each element's worst over every point, and where" wait_line ui '^ element +worst at '
# ND1 at the base is 83.6 % with the ghosts that meet it; 'full' has three
# times the pulse energy, so 3 × 83.6 % = 251 % (fluence linear in energy:
# a self-consistency check)
check "... ND1's worst: 251 % at full" wait_line ui '^.ND1 +full .* 251 % OVER'
t_keys ui W
check "W again: the base's own ratios" wait_line ui '^.ND1 .* 83\.6 % caution'
# the sweep at the point shown: 'full' is three times the base's pulse
# energy, so W1's ratio at 0° is three times the base's 128 % (fluence is
# linear in the energy: hand derivation, a self-consistency check)
t_keys ui O O Home Down Down
wait_line ui '^point full 2/2' >/dev/null
t_keys ui v
wait_for ui "HWP1.angle 0 .. 45" >/dev/null
t_keys ui Enter
check "v at a point: the sweep says so" wait_for ui "sweep of HWP1.angle, 0 .. 45 at point full"
# exactly: 3 × the base's W1 at 0° (sweep JSON, 1.2827 → 3.8482), printed
# in the sweep table's form, the workbench's
sw_full=$("$BL" --db "$DB" sweep $B HWP1.angle 0 45 --steps 201 --point full 2>/dev/null |
	awk '$1 == "0°" { print $3 " " $4; exit }')
check "hand: W1 at 0° at 'full' is three times the base's ($sw_full)" sh -c '
	"$1" --db "$2" sweep "$3" HWP1.angle 0 45 --steps 201 --format json >"$4.b" 2>/dev/null
	"$1" --db "$2" sweep "$3" HWP1.angle 0 45 --steps 201 --point full --format json >"$4.f" 2>/dev/null
	python3 -c "
import json, sys
w = lambda p: json.load(open(p))[\"rows\"][0][\"ratios\"][\"W1\"]
b, f = w(sys.argv[1]), w(sys.argv[2])
assert abs(f / b - 3) < 1e-9, (b, f)" "$4.b" "$4.f"' sh "$BL" "$DB" $B "$T_DIR/sw-json"
check "... and is traced there (W1 $sw_full)" wait_line ui "HWP1\.angle = 0°: worst W1 $sw_full OVER"
t_keys ui Escape
wait_gone ui "sweep of HWP1.angle" >/dev/null
# a new point from the workbench: o, then n; refusals said at the prompt
t_keys ui o
wait_for ui "operating points side by side" >/dev/null
t_keys ui n
check "n on the points screen asks a new point" wait_for ui "Its name and its first change"
t_keys ui -l "full: source.power=1 W"
t_keys ui Enter
check "a name in use is refused at the prompt" wait_for ui "point 'full' exists already"
t_keys ui C-u
t_keys ui -l "quarter: source.power=500 mW"
t_keys ui Enter
check "the point added and shown" wait_for ui "point quarter added and shown on the chain"
check "... a column for it on the screen" wait_line ui "element +base +alignment +full +quarter"
check "... the margin line says it is shown" wait_line ui '^point quarter 3/3 │ '
check "... and it is in the draft" sh -c '"$1" --db "$2" point show '$B' quarter | grep -q "^  source.power=500 mW$"' _ "$BL" "$DB"
t_keys ui Escape
t_keys ui Q
check "Q quits" wait_exit ui 5
check "... with status 0" [ "$(t_status ui)" = 0 ]
done_testing
