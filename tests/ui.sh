#!/bin/sh
# tests/ui.sh - the terminal workbench end to end, driven in tmux: a fresh
# database, the demo offered and loaded, a bench laid out from nothing, a
# refused value, a lens moved so that a window sits near the focus (ok ->
# OVER), commit, diff, restore, label, undo, the profile and help screens,
# a resize to 60x20 and back, quitting, a read-only database; then the
# database is checked with the CLI.  Waits for text, never sleeps blindly.
# Owned by the workbench.

command -v "${TMUX_BIN:-tmux}" >/dev/null 2>&1 || { echo "1..0 # SKIP no tmux"; exit 0; }
[ -n "$TMUX_BIN" ] || TMUX_BIN=tmux
. "${srcdir:-.}/tests/ui-lib.sh"
BL=${BEAMLEDGER:-./src/beamledger}
DB="$T_DIR/ui.db"
export XDG_DATA_HOME="$T_DIR/xdg"

start() {       # NAME [ARGS...]: the workbench at 80x24 on $DB
	_s=$1; shift
	t_start "$_s" 80 24 env XDG_DATA_HOME="$XDG_DATA_HOME" USER=lab-tester NO_COLOR= \
		"$BL" --db "$DB" "$@"
}
# key NAME KEY... then wait for TEXT: one step of a dialogue.
step() {        # DESC NAME TEXT KEY...
	_d=$1 _s=$2 _w=$3; shift 3
	t_keys "$_s" "$@"
	check "$_d" wait_for "$_s" "$_w"
}
add() {         # TYPE-KEY REQUIRED-VALUE|"" WAITTEXT: the add menu, then its prompt
	t_keys ui a
	wait_for ui "add " >/dev/null || return 1
	t_keys ui "$1"
	if [ -n "$2" ]; then
		wait_for ui "needed before it can go" >/dev/null || return 1
		t_keys ui -l "$2"
		t_keys ui Enter
	fi
	wait_for ui "$3"
}

# ---- a fresh database: the demo is offered ----
start ui
check "fresh database offers the demo" wait_for ui "Load the demo bench"
step "demo loaded and traced" ui "worst: W1 109 % OVER" y
check "unterminated beam on the status line" wait_for ui "unterminated: 728 µW after S4r"
# HWP1's share: its main beam (15.8 %) and the ghosts that meet it
check "ratio bar and status in words" wait_line ui '^ HWP1 .*15\.[89] % ok'
step "help lists every key" ui "Bench list:" '?'
t_keys ui G
check "help ends with the laser-safety cautions" wait_for ui "Align at reduced power"
step "help closes" ui "worst: W1" q
step "profile view draws radii and foci" ui "beam profile to the end of branch main" p
check "profile legend" wait_for ui "focus"
t_keys ui Escape
check "profile closes" wait_for ui "worst: W1"

# ---- a new bench laid out from nothing ----
step "back to the bench list" ui "updated (UTC)" q
step "new bench prompt" ui "Name of the new bench" n
t_keys ui -l "focus-test"
step "new bench created" ui "new bench 'focus-test'" Enter
check "empty bench says how to start" wait_for ui "press a to add"
check "add a space" add s "500 mm" "added space S1"
check "add a lens" add l "100 mm" "added lens L1"
check "add a space after it" add s "200 mm" "added space S2"
check "add another space" add s "100 mm" "added space S3"
check "add a window" add w "" "added window W1"
check "unrated window says so" wait_line ui '^ W1 .* unrated'

# its damage rating, typed into the field in place
step "fields open" ui "transmission" Enter
t_keys ui j j j j j j j j j
check "damage.cw_irradiance field" wait_for ui "damage.cw_irradiance: CW LIDT"
t_keys ui Enter
wait_for ui "Enter apply" >/dev/null
t_keys ui -l "5 kW/cm"
step "wrong unit refused at the field" ui "refused, nothing stored" Enter
check "with the bench-file message" wait_for ui "a linear power density"
check "nothing stored: still unrated" wait_line ui '^ W1 .* unrated'
t_keys ui C-u
t_keys ui -l "1 kW/cm^2"
step "rating stored" ui "W1 damage.cw_irradiance = 1 kW/cm^2" Enter
check "window ok far from the focus" wait_line ui '^ W1 .* ok *$'
# a value shown in the editor is replaced by typing, not appended to
t_keys ui Enter
wait_for ui "Enter apply" >/dev/null
t_keys ui -l "2 kW/cm^2"
step "typing replaces the shown value" ui "W1 damage.cw_irradiance = 2 kW/cm^2" Enter
# and typing a number at a chosen field starts editing it
t_keys ui -l "1 kW/cm^2"
step "typing at a field edits it" ui "W1 damage.cw_irradiance = 1 kW/cm^2" Enter
t_keys ui Escape
check "back on the chain" wait_for ui "a add"
check "add a space before the end" add s "50 mm" "added space S4"
check "add a dump" add d "" "added dump BD1"
check "all beams terminated" wait_for ui "all beams terminated"
check "adding after a dump is refused" add s "10 mm" "a dump ends its branch"
t_keys ui Escape
wait_gone ui "Enter accept" >/dev/null

step "commit prompt" ui "A note for it" c
t_keys ui -l "window far from the focus"
step "committed r2" ui "committed r2" Enter

# ---- move the lens: the window now sits near the focus ----
t_keys ui g
check "selected the first element" wait_for ui "space S1"
step "selected the lens" ui "lens L1" j
step "lens moved one place down" ui "moved L1 after S2" ']'
check "window now OVER" wait_line ui '^ W1 .* OVER'
check "status line names it" wait_for ui "worst: W1"
step "undo brings ok back" ui "undone" u
check "window ok after undo" wait_line ui '^ W1 .* ok *$'
step "redo makes it OVER again" ui "redone" U
check "window OVER after redo" wait_line ui '^ W1 .* OVER'

# ---- commit, diff, restore, label ----
step "commit prompt again" ui "A note for it" c
t_keys ui -l "lens closer to the window"
step "committed r3" ui "committed r3" Enter
step "history lists the revisions" ui "lens closer to the window" h
check "with the author" wait_for ui "lab-tester"
t_keys ui j
check "r3 selected" wait_for ui "d compares r2 → r3"
step "diff shows the chain change" ui "moved" d
check "diff shows the margin effect" wait_line ui 'W1 .*ok → .*over'
t_keys ui Escape
check "diff closes" wait_for ui "Space mark"
t_keys ui l
check "label prompt" wait_for ui "A name for r3"
t_keys ui -l "near-focus"
step "labelled" ui "r3 labelled 'near-focus'" Enter
check "label shown" wait_for ui "[near-focus]"
t_keys ui j
check "r2 selected" wait_for ui "d compares r1 → r2"
step "restore asks" ui "Make r2 the draft?" r
step "restored" ui "r2 restored as the draft" y
t_keys ui Escape
check "restored draft: window ok again" wait_line ui '^ W1 .* ok *$'
step "undo on the workbench brings the old draft back" ui "undone" u
check "window OVER after undoing the restore" wait_line ui '^ W1 .* OVER'
step "and redo restores again" ui "redone" U
check "window ok again" wait_line ui '^ W1 .* ok *$'
step "history again" ui "d compares" h
t_keys ui j j
step "restoring the revision the draft already is asks nothing" ui "the draft already is r2" r
t_keys ui Escape
check "back on the workbench" wait_for ui "a add"

# ---- resize ----
t resize-window -t ui -x 60 -y 20
check "60x20 says too small" wait_for ui "terminal too small: 60×20"
t resize-window -t ui -x 80 -y 24
check "80x24 draws again" wait_for ui "worst: W1"
t resize-window -t ui -x 120 -y 40
check "120x40 shows more columns" wait_line ui '^ element .* status +flags'
t resize-window -t ui -x 80 -y 24
check "back to 80x24" wait_gone ui "status  flags"

# ---- quit: always safe ----
t_keys ui Q
check "quits" wait_exit ui 5
check "exit status 0" [ "$(t_status ui)" = 0 ]

# ---- open BENCH goes straight to it; ASCII under a C locale ----
t_start direct 80 24 env LC_ALL=C XDG_DATA_HOME="$XDG_DATA_HOME" "$BL" --db "$DB" open focus-test
check "open BENCH goes to the bench" wait_for direct "focus-test | draft"
check "ASCII fallback under LC_ALL=C" wait_line direct '^worst: W1 .*\|.*safe source power .*\|'
t_keys direct q
check "q goes back to the list" wait_for direct "updated (UTC)"
t_keys direct q
check "and quits" wait_exit direct 5

# ---- another writer changes the draft while the workbench is open ----
"$BL" --db "$DB" copy focus-test two-writers >/dev/null 2>&1
t_start two 80 24 env XDG_DATA_HOME="$XDG_DATA_HOME" "$BL" --db "$DB" open two-writers
check "second bench open" wait_for two "two-writers"
"$BL" --db "$DB" set two-writers S1 'length=321 mm' >/dev/null 2>&1
t_keys two x
check "an edit over another writer's change is not saved, and says so" \
	wait_for two "another beamledger changed"
check "the other writer's value is still stored" \
	sh -c '"$1" --db "$2" export two-writers | grep -q "\"length\": \"321 mm\""' _ "$BL" "$DB"
t_keys two u
check "the next change replaces it, as the message said" wait_for two "draft saved"
check "now the workbench's draft is stored" \
	sh -c '! "$1" --db "$2" export two-writers | grep -q "\"length\": \"321 mm\""' _ "$BL" "$DB"
t_keys two Q
check "and quits" wait_exit two 5

# ---- a bench that is not there: said before the screen is taken ----
t_start nosuch 80 24 sh -c '"$0" --db "$1" open no-such-bench 2>"$2"' "$BL" "$DB" "$T_DIR/nosuch.err"
check "open of a missing bench exits" wait_exit nosuch 5
check "with status 2" [ "$(t_status nosuch)" = 2 ]
check "and says which bench" grep -q "bench 'no-such-bench' not found" "$T_DIR/nosuch.err"

# ---- a read-only database opens view-only ----
cp "$DB" "$T_DIR/ro.db"
chmod 0444 "$T_DIR/ro.db"
t_start ro 80 24 env XDG_DATA_HOME="$XDG_DATA_HOME" "$BL" --db "$T_DIR/ro.db" open focus-test
check "read-only database says view only" wait_for ro "VIEW ONLY"
t_keys ro x
check "edits refused in view-only mode" wait_for ro "view only: the database is read-only"
t_keys ro Q
check "view-only quits" wait_exit ro 5

# ---- open --demo: the README's first command, on an empty database ----
t_start demo 80 24 env XDG_DATA_HOME="$XDG_DATA_HOME" "$BL" --db "$T_DIR/demo.db" open --demo
check "open --demo shows the demo bench" wait_for demo "draft = r1"
check "with its over-threshold window" wait_for demo "worst: W1"
t_keys demo Q
check "open --demo quits" wait_exit demo 5
check "the demo is now #1 in that database" sh -c '"$1" --db "$2" history table3-ablation | grep -q "^#1 "' _ "$BL" "$T_DIR/demo.db"
"$BL" --db "$T_DIR/nodemo.db" open --demo </dev/null >/dev/null 2>&1
check "open --demo without a terminal is a usage error" [ $? -eq 2 ]
check "and creates no database" [ ! -e "$T_DIR/nodemo.db" ]

# ---- the database, checked with the CLI ----
log=$("$BL" --db "$DB" history focus-test 2>&1)
check "log: r3 with its note" sh -c 'printf "%s" "$1" | grep -q "lens closer to the window"' _ "$log"
check "log: the label" sh -c 'printf "%s" "$1" | grep -q "near-focus"' _ "$log"
check "log: the author" sh -c 'printf "%s" "$1" | grep -q "lab-tester"' _ "$log"
"$BL" --db "$DB" trace focus-test@3 >/dev/null 2>&1
check "r3 traces over (exit 1)" [ $? -eq 1 ]
"$BL" --db "$DB" trace focus-test >/dev/null 2>&1
check "restored draft traces ok (exit 0)" [ $? -eq 0 ]
exp=$("$BL" --db "$DB" export focus-test 2>&1)
check "export: the rating typed in the field, in its unit" sh -c 'printf "%s" "$1" | grep -q "\"cw_irradiance\": \"1 kW/cm^2\""' _ "$exp"
check "export: the lens before S2 again (restored)" sh -c 'printf "%s" "$1" | tr -d "\n " | grep -q "\"id\":\"L1\".*\"id\":\"S2\""' _ "$exp"
"$BL" --db "$DB" compare focus-test 2 3 >"$T_DIR/diff.txt" 2>&1
check "CLI diff sees the move" grep -q "moved" "$T_DIR/diff.txt"
check "demo bench is in the database" sh -c '"$1" --db "$2" list | grep -q table3-ablation' _ "$BL" "$DB"
check "database check passes" sh -c '"$1" --db "$2" check >/dev/null' _ "$BL" "$DB"

done_testing
