#!/bin/sh
# cli-store.sh - every database command end to end, through the real
# binary: the README walkthrough (import the demo, change a lens, commit,
# diff with the effect on the margins, label, restore, export), where the
# database lives, files that are not ours, read-only files, and refused
# edits that must store nothing.
. "${srcdir:-.}/tests/store-lib.sh"

DB=$T_DIR/lab.db
B=table3-ablation
cd "$T_DIR" || exit 2

# ---- where the database lives ----
run demo
cp "$T_DIR/out" demo.json
run import demo.json
check "XDG_DATA_HOME: the database is created under it" \
	[ "$RC" -eq 0 -a -f "$XDG_DATA_HOME/beamledger/benches.db" ]
check "XDG_DATA_HOME: directories are private (0700)" \
	[ "$(stat -c %a "$XDG_DATA_HOME/beamledger")" = 700 ]
XDG_DATA_HOME= run list
check "XDG_DATA_HOME empty: ~/.local/share is used" \
	[ "$RC" -eq 0 -a -f "$HOME/.local/share/beamledger/benches.db" ]
rm -rf "$HOME/.local"
XDG_DATA_HOME=relative/dir run list
check "XDG_DATA_HOME relative: ~/.local/share is used" \
	[ "$RC" -eq 0 -a -f "$HOME/.local/share/beamledger/benches.db" -a ! -e relative ]
rm -rf "$HOME/.local"
(unset XDG_DATA_HOME; "$BEAMLEDGER" list >/dev/null 2>&1)
check "XDG_DATA_HOME unset: ~/.local/share is used" \
	[ -f "$HOME/.local/share/beamledger/benches.db" ]
BEAMLEDGER_DB=$T_DIR/env.db run list
check "BEAMLEDGER_DB chooses the file" [ "$RC" -eq 0 -a -f "$T_DIR/env.db" ]
BEAMLEDGER_DB=$T_DIR/env.db run --db "$DB" import demo.json
check "--db wins over BEAMLEDGER_DB" [ "$RC" -eq 0 ]
BEAMLEDGER_DB=$T_DIR/env.db run list
check "... and BEAMLEDGER_DB's file holds nothing" \
	sh -c '[ "$1" -eq 0 ] && [ ! -s "$2" ]' sh "$RC" "$T_DIR/out"

# ---- the walkthrough ----
export BEAMLEDGER_DB="$DB"
run list
check "list: the bench, r1, draft same, worst over" \
	sh -c "grep -q '^$B  *r1  *same  *over ' '$T_DIR/out'"
run import demo.json
check "import twice: refused" trouble "bench '$B' already exists"
run show $B
check "show: a row per element with values and units" out_has "focal 200 mm"
check "show: side branches indented under their port" \
	sh -c "grep -q '^└ PBS1.reflected' '$T_DIR/out' && grep -q '^  S1r ' '$T_DIR/out'"
check "show: part and label columns" sh -c "grep -q '^M1 .*m2in-1064-45 *fold 1' '$T_DIR/out'"

"$BEAMLEDGER" export $B > before.json
run set $B L1 "focal=150 mm"
check "set: a lens gets a shorter focal length" rc_is 0
run list
check "list: the draft changed" sh -c "grep -q '^$B  *r1  *changed ' '$T_DIR/out'"
run show "$B@r1"
check "show BENCH@r1: the revision still has 200 mm" out_has "focal 200 mm"
run commit $B -m "shorter focus for the cell"
check "commit: r2" out_has "committed bench '$B' as r2"
run trace "$B@r1"
check "trace BENCH@REV says which revision it traced" out_has "Bench $B @ r1:"
run trace "$B"
check "trace BENCH says it traced the draft" out_has "Bench $B @ draft:"
run commit $B -m "again"
check "commit with nothing changed: refused" trouble "nothing to commit"
run log $B
check "log: newest first with author and note" \
	sh -c "head -1 '$T_DIR/out' | grep -q '^r2 .*tester  *shorter focus for the cell'"
run diff $B r1 r2
check "diff: the value old -> new with units" out_has "L1 (lens): focal 200 mm → 150 mm"
check "diff: the effect on the margins" \
	sh -c "grep -q '^  W1  *window .*109 % over → 41.3 % ok' '$T_DIR/out'"
check "diff: the worst element on both sides" out_has "Worst: W1 109 % over → ND1 82.7 % caution"
check "diff: exit status 0" rc_is 0
run diff $B r1 r2 --format json
check "diff --format json: the change and the effect" \
	sh -c "grep -q '\"kind\": \"changed\"' '$T_DIR/out' && grep -q '\"new\": \"0.15 m\"' '$T_DIR/out' \
	    && grep -q '\"status\": \"over\"' '$T_DIR/out'"
run diff $B r2
check "diff with one REV compares with the draft" out_has "No change in the chain"
run trace "$B@r1"
check "trace BENCH@r1: W1 over, exit 1" sh -c "[ $RC -eq 1 ] && grep -q '^W1 .*OVER' '$T_DIR/out'"
run trace "$B"
check "trace BENCH (the draft): nothing over, exit 0" rc_is 0
run trace "$B@nolabel"
check "trace BENCH@unknown: clear error" trouble "no revision or label 'nolabel'"

run label $B r1 aligned
check "label r1 aligned" out_has "r1 is labelled 'aligned'"
run label $B r2 aligned
check "a label names one revision" trouble "label 'aligned' already names r1"
run label $B r2 r5
check "a label may not look like a revision" trouble "would read as a revision"
run log $B
check "log shows labels" sh -c "grep -q '^r1 .*\[aligned\] imported from demo.json' '$T_DIR/out'"
run restore $B aligned
check "restore a label into the draft" out_has "the draft is now r1"
"$BEAMLEDGER" export $B > draft.json
"$BEAMLEDGER" export $B@r1 > r1.json
check "the draft equals r1 again" same_file draft.json r1.json
check "r1 equals the imported file exactly" same_file r1.json before.json
run set $B M1 rs=0.9
run restore $B r2
check "restore refuses to drop draft changes" trouble "--force"
run show $B
check "... and the draft keeps them" out_has "rs 0.9,"
run restore $B r2 --force
check "restore --force drops them" rc_is 0
"$BEAMLEDGER" export $B > draft.json
"$BEAMLEDGER" export $B@r2 > r2.json
check "the draft equals r2" same_file draft.json r2.json

# ---- export, round trip, clone ----
run export $B@aligned -o exported.json
check "export -o writes the file" [ "$RC" -eq 0 -a -s exported.json ]
check "export -o leaves no temporary file" [ "$(ls exported.json.* 2>/dev/null | wc -l)" -eq 0 ]
check "export -o equals export to stdout" same_file exported.json r1.json
"$BEAMLEDGER" --db "$T_DIR/second.db" import exported.json >/dev/null 2>&1
"$BEAMLEDGER" --db "$T_DIR/second.db" export $B > again.json
"$BEAMLEDGER" --db "$T_DIR/third.db" import again.json >/dev/null 2>&1
"$BEAMLEDGER" --db "$T_DIR/third.db" export $B > again2.json
check "import, export, import, export: identical" \
	sh -c "cmp -s exported.json again.json && cmp -s again.json again2.json"
run clone $B@r1 "copy of r1"
check "clone BENCH@r1 NEW" rc_is 0
"$BEAMLEDGER" export "copy of r1" | sed 's/"name": "copy of r1"/"name": "table3-ablation"/' > clone.json
check "the clone holds r1" same_file clone.json r1.json
run log "copy of r1"
check "the clone's log says where it came from" out_has "cloned from $B@r1"
run export nosuch
check "export of a missing bench: clear error" trouble "bench 'nosuch' not found"

# ---- odd names round trip ----
for name in "it's \"quoted\"" "semi; DROP TABLE bench; --" "Strahlweg Tisch 3 – ü 光路"; do
	run import demo.json --name "$name"
	run show "$name"
	check "name round-trips: $name" \
		sh -c '[ "$1" -eq 0 ] && head -1 "$2" | grep -qF "Bench $3 @ draft"' sh "$RC" "$T_DIR/out" "$name"
done
run list
check "list shows the odd names" out_has "semi; DROP TABLE bench; --"

# ---- edits: add, move, remove; refused edits store nothing ----
"$BEAMLEDGER" export $B > before.json
run add $B mirror M9 "reflectance=0.99" aoi=45 --after S3
check "add --after" out_has "added mirror M9"
run show $B
check "... M9 sits after S3" sh -c "grep -A1 '^S3 ' '$T_DIR/out' | grep -q '^M9 '"
run move $B M9 --after S5
check "move --after" rc_is 0
run show $B
check "... M9 sits after S5" sh -c "grep -A1 '^S5 ' '$T_DIR/out' | grep -q '^M9 '"
run add $B mirror M10 reflectance=1 --into BS1.reflected --first
run show $B
check "add --into SPLITTER.PORT --first" sh -c "grep -A1 '^└ BS1.reflected' '$T_DIR/out' | grep -q '^  M10 '"
run diff $B r2
check "diff: added elements with their place" out_has "added    M9 (mirror) in main after S5: reflectance 0.99; aoi 45°"
run remove $B M10
run remove $B M9
"$BEAMLEDGER" export $B > after.json
check "remove: back to the same bench" same_file before.json after.json
run move $B S3 --after S3
check "move next to itself: refused" trouble "cannot move next to itself"
run move $B S3
check "move without a place: usage" sh -c "[ $RC -eq 2 ] && grep -q 'Try' '$T_DIR/err'"

# Invalid values: the same message as a bench file, nothing stored.
sed 's/"focal": "200 mm"/"focal": "abc"/' demo.json > bad1.json
sed 's/"reflectance": 0.01/"reflectance": 1.2/' demo.json > bad2.json
sed 's/"focal": "200 mm"/"focal": "5 W"/' demo.json > bad3.json
for c in "1 L1 focal=abc" "2 BS1 reflectance=1.2" "3 L1 focal=5 W"; do
	n=${c%% *}; rest=${c#* }; id=${rest%% *}; kv=${rest#* }
	"$BEAMLEDGER" trace bad$n.json >/dev/null 2>file.err
	run set $B "$id" "$kv"
	want=$(sed "s/.*element '/element '/" file.err)
	got=$(sed "s/.*element '/element '/" "$T_DIR/err")
	check "set $kv: refused like in a bench file ($want)" \
		sh -c "[ $RC -eq 2 ] && [ -n \"\$1\" ] && [ \"\$1\" = \"\$2\" ]" sh "$want" "$got"
	"$BEAMLEDGER" export $B > after.json
	check "set $kv: nothing stored" same_file before.json after.json
done
run set $B L1 focal=100mm "transmission=2"
check "set: one bad pair of several refuses all" trouble "transmission 2 is out of range"
run set $B L1 nokey=1
check "set: unknown key named" trouble "unknown key 'nokey'"
run set $B NOPE focal=1m
check "set: unknown element named" trouble "no element 'NOPE' in bench '$B'"
run add $B mirror M11 reflectance=1.5
check "add: invalid value refused" trouble "element 'M11': reflectance 1.5 is out of range"
run add $B lens L1 "focal=1 m"
check "add: id used twice refused" trouble "element 'L1': id used twice"
run add $B mirror M12 --after NOPE
check "add: unknown place refused" trouble "no element 'NOPE'"
run set $B --bench "source.power=3 W" safety_factor=3
check "set --bench: source and settings" rc_is 0
run diff $B r2
check "diff shows source and settings" \
	sh -c "grep -q 'settings bench: safety_factor 2 → 3; source.power 2 W → 3 W' '$T_DIR/out'"
run set $B --bench safety_factor=0.5
check "set --bench: an invalid setting refused" trouble "safety_factor"
run set $B --bench name=other
check "set --bench name: refused" trouble "cannot be renamed"
"$BEAMLEDGER" export $B > after2.json
check "refused edits after a good one changed nothing more" \
	sh -c "grep -q '\"safety_factor\": 3' after2.json"
run restore $B r2 --force

# ---- parts ----
cat > parts.json <<'EOF'
{ "format": "beamledger-parts-1",
  "parts": [
    { "name": "m2in-1064-45", "type": "mirror", "label": "2-inch 45° mirror, 1064 nm coating",
      "aoi": 45, "rs": 0.998, "rp": 0.995,
      "damage": { "fluence": "10 J/cm^2", "pulse_width": "10 ns" } },
    { "name": "pd-10mm", "type": "detector", "max_power": "10 mW", "aperture": "10 mm" } ] }
EOF
run parts add parts.json
check "parts add" out_has "added 2 part(s)"
run parts list
check "parts list" sh -c "grep -q '^m2in-1064-45  *mirror  *2-inch 45° mirror' '$T_DIR/out' && grep -q '^pd-10mm ' '$T_DIR/out'"
run parts show m2in-1064-45
check "parts show: values with units" out_has "damage.fluence 10 J/cm²"
run add $B mirror M20 --part m2in-1064-45 rs=0.99 --after S2
check "add --part places it" rc_is 0
run show $B
check "... with the part's values, the override and part=NAME" \
	sh -c "grep '^M20 ' '$T_DIR/out' | grep -q 'm2in-1064-45 .*rs 0.99, rp 0.995, aoi 45°, damage.fluence 10 J/cm²'"
run add $B lens L9 --part m2in-1064-45
check "add --part of another type: refused" trouble "part 'm2in-1064-45' is a mirror, not a lens"
run add $B mirror M21 --part nosuch
check "add --part unknown: refused" trouble "part 'nosuch' is not on the shelf"
run commit $B -m "M20 from the shelf"
run show $B@r3
check "show: the part as placed, version 1" out_has "m2in-1064-45: version 1 (as on the shelf now)"
sed 's/"rs": 0.998/"rs": 0.5/' parts.json > parts2.json
run parts add parts2.json
run show $B@r3
check "show: the shelf moved on since" out_has "m2in-1064-45: version 1 (the shelf now has version 2)"
run export $B@r3
check "a changed part leaves the revision alone" \
	sh -c "grep '\"id\": \"M20\"' '$T_DIR/out' | grep -q '\"rs\": 0.99,'"
cat > badparts.json <<'EOF'
{ "format": "beamledger-parts-1",
  "parts": [ { "name": "new-one", "type": "lens", "focal": "100 mm" },
             { "name": "broken", "type": "window", "transmission": 1.5 } ] }
EOF
run parts add badparts.json
check "parts add: a bad part refuses the file" trouble "badparts.json: parts[1]: element 'broken': transmission 1.5 is out of range"
run parts show new-one
check "... and stores none of it" trouble "part 'new-one' is not on the shelf"

# ---- check, delete ----
run check
check "check: the database is sound" sh -c "[ $RC -eq 0 ] && grep -q ': ok$' '$T_DIR/out'"
run delete "copy of r1"
check "delete without --force: refused" trouble "--force"
run delete "copy of r1" --force
check "delete --force" out_has "deleted bench 'copy of r1'"
run check
check "check after delete: sound" rc_is 0

# ---- files that are not ours ----
printf '%s\n' '{"format": "something else"}' 'not a database at all' > notdb.db
cp notdb.db notdb.orig
run --db notdb.db list
check "a non-SQLite file is refused" trouble "not a beamledger database"
check "... and left byte for byte" same_file notdb.db notdb.orig
check "... with no journal beside it" [ ! -e notdb.db-wal -a ! -e notdb.db-journal ]
if have_sqlite3; then
	sqlite3 other.db "CREATE TABLE notes (x); INSERT INTO notes VALUES ('mine');"
	cp other.db other.orig
	run --db other.db list
	check "another program's SQLite file is refused" trouble "not a beamledger database"
	check "... and left byte for byte" same_file other.db other.orig
	cp "$DB" newer.db
	sqlite3 newer.db "PRAGMA user_version = 42;"
	cp newer.db newer.orig
	run --db newer.db list
	check "a newer schema is refused" trouble "schema version 42, newer than"
	check "... and left byte for byte" same_file newer.db newer.orig
	check "PRAGMA integrity_check says ok" [ "$(sqlite3 "$DB" 'PRAGMA integrity_check')" = ok ]
	check "foreign keys: no violation" [ -z "$(sqlite3 "$DB" 'PRAGMA foreign_key_check')" ]
else
	for i in 1 2 3 4 5 6; do skip "sqlite3 not installed"; done
fi

# ---- a read-only database ----
cp "$DB" ro.db
chmod 444 ro.db
cp ro.db ro.orig
run --db ro.db list
check "read-only: reads work, with a message" \
	sh -c "[ $RC -eq 0 ] && grep -q '$B' '$T_DIR/out' && grep -q 'read-only: changes are refused' '$T_DIR/err'"
run --db ro.db set $B L1 focal=1m
check "read-only: a change is refused" trouble "is read-only: changes are refused"
run --db ro.db commit $B -m x
check "read-only: commit refused" trouble "read-only"
check "read-only: the file is unchanged" same_file ro.db ro.orig
chmod 644 ro.db

# ---- usage ----
run commit $B
check "commit without -m: usage" sh -c "[ $RC -eq 2 ] && grep -q 'Try' '$T_DIR/err'"
run show
check "show without a bench: usage" sh -c "[ $RC -eq 2 ] && grep -q 'show: which bench' '$T_DIR/err'"
run log $B --format xml
check "log --format xml: usage" trouble "--format must be table or json"
run log $B --format json
check "log --format json" out_has '"rev": 1'
run --author "Ana Ösz" commit $B -m x
run set $B L1 "focal=190 mm"
run --author "Ana Ösz" commit $B -m "by ana"
run log $B
check "--author names the author" sh -c "head -1 '$T_DIR/out' | grep -q 'Ana Ösz  *by ana'"
for c in import list show add set remove move commit log diff restore label clone export delete parts check; do
	"$BEAMLEDGER" $c --help >/dev/null 2>&1 || { not_ok "$c --help"; continue; }
done
ok "every database command has --help"

# ---- text that would not load again is refused, and nothing is stored ----
"$BEAMLEDGER" export $B > utf8-before.json
run add $B space "$(printf 'S\377')" "length=10 mm" --after S0
check "an id that is not UTF-8 is refused" trouble "not valid UTF-8"
run set $B --bench "$(printf 'notes=\377')"
check "notes that are not UTF-8 are refused" trouble "not valid UTF-8"
run commit $B -m "$(printf 'bad \377 note')"
check "a note that is not UTF-8 is refused" trouble "not valid UTF-8"
"$BEAMLEDGER" export $B > utf8-after.json
check "... and the bench is unchanged" same_file utf8-before.json utf8-after.json
run clone $B 'lab@good'
check "a bench name with '@' is refused (BENCH@REV would be ambiguous)" trouble "'@'"
# ---- files that are not ours: a read-only export target, a URI-like name ----
echo keep > ro-target.txt
chmod 0444 ro-target.txt
run export $B -o ro-target.txt
check "export does not replace a read-only file" trouble "read-only"
check "... which still holds what it held" sh -c 'grep -qx keep ro-target.txt && [ "$(stat -c %a ro-target.txt)" = 444 ]'
cp "$DB" uri.db
chmod 0444 uri.db
run --db "file:uri.db" set $B --bench notes=changed
check "a --db starting with file: is a plain file name, not an SQLite URI" \
	sh -c '[ "$(stat -c %a uri.db)" = 444 ] && cmp -s "$1" uri.db' _ "$DB"

# ---- a mistyped --db makes nothing ----
run --db "$T_DIR/typo/sub/x.db" show $B
check "show on a missing database: trouble, said plainly" trouble "no bench database at"
check "... and no file or directory was made" [ ! -e "$T_DIR/typo" ]

done_testing
