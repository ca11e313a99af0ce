#!/bin/sh
# cli-point.sh - operating points and sweeps end to end: add a point to a
# bench in the database, list and show it, trace it alone and with every
# point, keep it through a setup and export, sweep a knob; every bad input
# exits 2 with a message and stores nothing.
. "${srcdir:-.}/tests/store-lib.sh"

DB=$T_DIR/lab.db
B=table3-ablation
cd "$T_DIR" || exit 2
run demo
cp "$T_DIR/out" demo.json
run --db "$DB" import demo.json

# ---- points ----
run --db "$DB" point add $B alignment source.pulse_energy=2mJ +filter:ND9@S0 ND9.od=1
check "point add: exit 0" rc_is 0
check "point add: says what it did" out_has "point 'alignment' added (3 changes)"
run --db "$DB" point list $B
check "point list: base and the point" sh -c 'grep -q "^base " "$1" && grep -q "^alignment  *3 " "$1"' sh "$T_DIR/out"
run --db "$DB" point show $B alignment
check "point show: its changes" out_has "  +filter:ND9@S0"
check "point show: its worst element" out_has "Worst: "

# At 1 % of the source with a 10 % ND in, every element after ND9 gets
# 1e-3 of the base: W1's 109 % becomes 0.1 %.
run --db "$DB" trace $B --point alignment --color never
check "trace --point: exit 0 (nothing over at alignment)" rc_is 0
check "trace --point: says which point" out_has "point alignment"
run --db "$DB" trace $B --every-point --color never
check "trace --every-point: exit 1 (W1 over at the base)" rc_is 1
check "trace --every-point: per point" sh -c 'grep -q "^  alignment  *W1 " "$1"' sh "$T_DIR/out"
check "trace --every-point: per element, worst at the base" sh -c 'grep -q "^  W1  .*OVER  *base" "$1"' sh "$T_DIR/out"
run --db "$DB" trace $B --every-point --format json
check "trace --every-point --format json: a points section" out_has '"points": ['
check "... naming the point" out_has '{"name": "alignment", "changes": ["source.pulse_energy=2mJ"'
if command -v python3 >/dev/null 2>&1; then
	check "... and it is JSON" python3 -c 'import json,sys; json.load(open(sys.argv[1]))' "$T_DIR/out"
fi

# the point survives a setup and export
run --db "$DB" record $B -n "alignment point"
check "record with a point: exit 0" rc_is 0
run --db "$DB" export $B@2
check "export of the setup: the points section" out_has '"points": ['
check "... with the change" out_has '"+filter:ND9@S0"'
cp "$T_DIR/out" exported.json
run trace exported.json --point alignment --color never
check "the exported file traces the point" rc_is 0
run --db "$DB" check
check "the database with a point checks clean" rc_is 0
run --db "$DB" point list $B@1
check "point list of the setup before the point: only the base" sh -c '[ "$(wc -l <"$1")" -eq 2 ]' sh "$T_DIR/out"
run point list exported.json
check "point list of a file" out_has "alignment"
run --db "$DB" compare $B 1 2
check "compare: a new point is a change" out_has "point.alignment"

# ---- bad points: exit 2, a message, nothing stored ----
run --db "$DB" export $B
cp "$T_DIR/out" before.json
bad_point() {  # DESCRIPTION WORD ARGS...
	_d=$1 _w=$2
	shift 2
	run --db "$DB" point "$@"
	check "$_d: exit 2 and names $_w" trouble "$_w"
	check "$_d: nothing on stdout" [ ! -s "$T_DIR/out" ]
	run --db "$DB" export $B
	check "$_d: nothing stored" same_file "$T_DIR/out" before.json
}
bad_point "override of a missing id" "NOPE" add $B p2 NOPE.od=2
bad_point "key the type does not take" "focal" add $B p2 ND1.focal=2mm
bad_point "value of the wrong unit" "od" add $B p2 ND1.od=2mm
bad_point "malformed change" "ID.KEY=VALUE" add $B p2 justtext
bad_point "name taken" "exists" add $B alignment ND1.od=2
bad_point "unknown point removed" "no point 'nope'" remove $B nope
run --db "$DB" trace $B --point nope
check "trace --point of an unknown point: exit 2" trouble "no point 'nope'"
run --db "$DB" point show $B nope
check "point show of an unknown point: exit 2" trouble "no point 'nope'"

# ---- sweeps ----
run sweep demo.json HWP1.angle 0 45 --steps 46
check "sweep: exit 1 (W1 over at small angles)" rc_is 1
check "sweep: crossings" out_has "Where each rated element first reaches caution and over:"
check "sweep: safe interval" out_has "Safe (nothing over):"
check "sweep: the plot" out_has "Ratio against the knob"
run sweep demo.json HWP1.angle 30 45 --steps 16
check "sweep where nothing is over: exit 0" rc_is 0
run sweep demo.json HWP1.angle 0 45 --steps 10 --format csv
check "sweep --format csv: a header and 10 rows" sh -c '[ "$(wc -l <"$1")" -eq 11 ] && head -1 "$1" | grep -q "^value,worst,status,ratio:HWP1"' sh "$T_DIR/out"
run sweep demo.json HWP1.angle 0 45 --steps 10 --format json
check "sweep --format json: rows and crossings" sh -c 'grep -q "\"rows\": \[" "$1" && grep -q "\"crossings\": \[" "$1"' sh "$T_DIR/out"
if command -v python3 >/dev/null 2>&1; then
	check "... and it is JSON" python3 -c 'import json,sys; d=json.load(open(sys.argv[1])); assert len(d["rows"]) == 10' "$T_DIR/out"
fi
run --db "$DB" sweep $B source.pulse_energy 1mJ 100mJ --log --steps 5 --point alignment
check "sweep of a stored bench at a point, log steps: exit 0" rc_is 0
check "... says the point" out_has "point alignment"
run sweep demo.json source.power "-1 W" "2 W"
check "a negative power is refused" trouble "power"

bad_sweep() {  # DESCRIPTION WORD ARGS...
	_d=$1 _w=$2
	shift 2
	run sweep "$@"
	check "$_d: exit 2 and names $_w" trouble "$_w"
	check "$_d: nothing on stdout" [ ! -s "$T_DIR/out" ]
}
bad_sweep "FROM = TO" "different" demo.json HWP1.angle 10 10
bad_sweep "--steps 0" "at least 2" demo.json HWP1.angle 0 45 --steps 0
bad_sweep "--steps not a number" "--steps" demo.json HWP1.angle 0 45 --steps many
bad_sweep "a knob that is not a number" "not a number" demo.json PBS1.polarizing 0 1
bad_sweep "a value that is not a number" "not a number" demo.json HWP1.angle zero 45
bad_sweep "a log sweep through zero" "through zero" demo.json HWP1.angle -10 45 --log
bad_sweep "an unknown point" "no point 'nope'" demo.json HWP1.angle 0 45 --point nope
bad_sweep "an unknown id" "NOPE" demo.json NOPE.angle 0 45
bad_sweep "missing operands" "KNOB FROM TO" demo.json HWP1.angle 0
run --db "$DB" export $B
check "sweeps stored nothing" same_file "$T_DIR/out" before.json

done_testing
