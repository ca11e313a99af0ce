#!/bin/sh
# cli-store-kill.sh - durability and concurrency of the database, through
# the real binary: `record` and `set` killed with SIGKILL at random moments
# (the file must stay sound and every record that said so must be there,
# intact), then several processes recording at once (each succeeds or says
# "busy"; no setup is lost or numbered twice).
. "${srcdir:-.}/tests/store-lib.sh"

cd "$T_DIR" || exit 2
export BEAMLEDGER_DB="$T_DIR/kill.db"
KILLS=${KILLS:-75}     # a third kill draft saves: 50 kill records

# A bench big enough that a record takes a few milliseconds and a draft
# save tens of them: 3001 elements.
{
	printf '{"format":"beamledger-bench-1","name":"big","source":{"wavelength":"1064 nm",'
	printf '"power":"2 W","waist":"2 mm"},"path":['
	i=0
	while [ $i -lt 1500 ]; do
		printf '{"id":"S%d","type":"space","length":"10 mm"},' $i
		printf '{"id":"M%d","type":"mirror","reflectance":0.999,"damage":{"cw_linear":"10 kW/cm"}},' $i
		i=$((i + 1))
	done
	printf '{"id":"END","type":"dump"}]}\n'
} > big.json
run import big.json
check "a 3001-element bench imported" rc_is 0

# How long an unkilled record takes here, in ms: kill within that time
# (sleep's own start-up shifts the moments a little later).
t0=$(date +%s%N)
"$BEAMLEDGER" set big S0 "length=10.5 mm" >/dev/null 2>&1
t1=$(date +%s%N)
"$BEAMLEDGER" record big -n "timing" >/dev/null 2>&1
t2=$(date +%s%N)
set_ms=$(( (t1 - t0) / 1000000 + 1 ))
commit_ms=$(( (t2 - t1) / 1000000 + 1 ))
echo "# set takes ~${set_ms} ms, record ~${commit_ms} ms here"

: > committed
killed=0
set_failed=0
i=1
while [ $i -le $KILLS ]; do
	# The value this round records: length of S7 in micrometres.
	v=$((20000 + i))
	if [ $((i % 3)) -eq 0 ]; then
		# Kill a draft save instead; the draft is then old or new, never half.
		"$BEAMLEDGER" set big S7 "length=$v um" >set.out 2>&1 &
		pid=$!
		d=$(rand $((set_ms * 1000)))
	else
		# Not killed, so it must work: else this round's record would hold
		# an older value than v.
		"$BEAMLEDGER" set big S7 "length=$v um" >/dev/null 2>&1 || {
			set_failed=$((set_failed + 1)); echo "# set failed in round $i"; }
		# Emptied here, not by the record's own redirection: that one runs
		# in the forked child, and a child killed before it (a loaded
		# machine, a short delay) would leave an earlier round's "recorded
		# #N" in the file, read below as this round's.
		: > commit.out
		"$BEAMLEDGER" record big -n "round $i" >commit.out 2>&1 &
		pid=$!
		d=$(rand $((commit_ms * 1000)))
	fi
	sleep "$(printf '%d.%06d' $((d / 1000000)) $((d % 1000000)))"
	kill -9 $pid 2>/dev/null
	wait $pid 2>/dev/null
	[ $? -eq 137 ] && killed=$((killed + 1))
	if [ $((i % 3)) -ne 0 ]; then
		rev=$(sed -n "s/^bench 'big': recorded #\([0-9]*\)$/\1/p" commit.out)
		[ -n "$rev" ] && echo "$rev $i $v" >> committed
	fi
	i=$((i + 1))
done
echo "# $killed of $KILLS processes died by the signal; $(wc -l < committed) of" \
	"$((KILLS - KILLS / 3)) records had reported success first"

run check
check "after $KILLS kills: beamledger check finds the file sound" rc_is 0
if have_sqlite3; then
	check "after $KILLS kills: PRAGMA integrity_check = ok" \
		[ "$(sqlite3 "$BEAMLEDGER_DB" 'PRAGMA integrity_check')" = ok ]
else
	skip "sqlite3 not installed"
fi
"$BEAMLEDGER" history big | grep '^#' > log.txt 2>&1
lost=0
while read -r rev round v; do
	grep -q "^#$rev .* round $round\$" log.txt || { lost=$((lost + 1)); echo "# #$rev (round $round) is missing from the history"; }
	# v um exported in mm, as typed: 20001 -> "20.001 mm", 20010 -> "20.01 mm"
	want=$(echo "$v" | sed 's/\(...\)$/.\1/; s/0*$//; s/\.$//')
	"$BEAMLEDGER" export "big@$rev" > rev.json 2>&1 &&
		grep -o '"id": *"S7"[^}]*}' rev.json | grep -qF "\"length\": \"$want mm\"" ||
		{ lost=$((lost + 1)); echo "# #$rev (round $round) does not hold S7 = $v um"; }
done < committed
check "every record that reported success is present and intact ($(wc -l < committed))" \
	[ "$lost" -eq 0 ]
check "no setup number was reported by two records" \
	[ -z "$(cut -d' ' -f1 committed | sort | uniq -d)" ]
check "every draft save that was not killed succeeded" [ "$set_failed" -eq 0 ]
nrev=$(wc -l < log.txt)
top=$(sed -n '1s/^#\([0-9]*\) .*/\1/p' log.txt)
check "setups are numbered 1..$top without gaps" [ "$nrev" -eq "$top" ]
run set big S7 "length=1 mm"
run record big -n "after the kills"
check "the database takes records after the kills" out_has "bench 'big': recorded #$((top + 1))"

# ---- processes recording at once ----
run demo
cp "$T_DIR/out" demo.json
"$BEAMLEDGER" import demo.json --name bench-a >/dev/null 2>&1
"$BEAMLEDGER" import demo.json --name bench-b >/dev/null 2>&1
"$BEAMLEDGER" import demo.json --name shared >/dev/null 2>&1
# writer NAME BENCH ELEMENT: 15 rounds of set + record; results in NAME.log
writer() {
	j=1
	while [ $j -le 15 ]; do
		"$BEAMLEDGER" set "$2" "$3" "length=$((100 + j)) mm" >/dev/null 2>>"$1.err"
		"$BEAMLEDGER" record "$2" -n "$1 $j" >>"$1.log" 2>>"$1.err"
		j=$((j + 1))
	done
}
writer wa bench-a S2 &
p1=$!
writer wb bench-b S2 &
p2=$!
writer wc shared S3 &
p3=$!
writer wd shared S5 &
p4=$!
wait $p1 $p2 $p3 $p4
bad_err=$(cat wa.err wb.err wc.err wd.err | grep -v "database is busy" | grep -v "nothing to record")
check "concurrent writers: every refusal is 'busy' or 'nothing to record'" [ -z "$bad_err" ]
[ -n "$bad_err" ] && echo "$bad_err" | sed 's/^/#   /'
for w in wa:bench-a wb:bench-b; do
	name=${w%%:*} bench=${w#*:}
	n_ok=$(grep -c "^bench '$bench': recorded #" "$name.log")
	n_log=$("$BEAMLEDGER" history "$bench" | grep -c '^#')
	check "two benches at once: $bench has #1 + its $n_ok records" [ "$n_log" -eq $((n_ok + 1)) ]
done
n_ok=$(cat wc.log wd.log | grep -c "^bench 'shared': recorded #")
n_dup=$(cat wc.log wd.log | sed -n "s/^bench 'shared': recorded //p" | sort | uniq -d | wc -l)
n_log=$("$BEAMLEDGER" history shared | grep -c '^#')
check "one bench from two processes: no setup lost or numbered twice" \
	[ "$n_log" -eq $((n_ok + 1)) -a "$n_dup" -eq 0 ]
run check
check "after the concurrent writers: the file is sound" rc_is 0

# A writer that cannot get the lock in time says so and changes nothing.
if have_sqlite3; then
	before=$("$BEAMLEDGER" history bench-a | grep -c '^#')
	"$BEAMLEDGER" set bench-a S2 "length=1 m" >/dev/null 2>&1
	( printf 'BEGIN IMMEDIATE;\n'; sleep 6; printf 'ROLLBACK;\n' ) | sqlite3 "$BEAMLEDGER_DB" &
	lock=$!
	sleep 0.3
	run record bench-a -n "blocked"
	wait $lock
	check "a record blocked past the busy timeout: a clear 'busy' error" \
		trouble "database is busy (another beamledger is writing); try again"
	after=$("$BEAMLEDGER" history bench-a | grep -c '^#')
	check "... and no setup was added" [ "$before" -eq "$after" ]
else
	skip "sqlite3 not installed"
	skip "sqlite3 not installed"
fi

done_testing
