#!/bin/sh
# cli-store-robust.sh - hostile input and a machine against the database:
# endless input, values that crashed the reader, a file-size limit
# (SIGXFSZ), a read-only folder, a full disk.  Each must give a message
# that says what is really wrong, exit 2, and leave the database intact.  The full disk needs a private tmpfs (user and mount
# namespaces); the read-only folder needs a user that is not root.
. "${srcdir:-.}/tests/store-lib.sh"

B=table3-ablation
cd "$T_DIR" || exit 2
chmod 755 "$T_DIR"          # another user reads the folder below
run demo
cp "$T_DIR/out" demo.json
run --db lab.db import demo.json
check "setup: a database with the demo" rc_is 0
cp lab.db lab.orig

# ---- input: capped, and never a crash ----
# (each of these read 14 GB or crashed before; the cap is 64 MiB)
run trace /dev/zero
check "trace /dev/zero: refused, naming the file" trouble "/dev/zero: larger than 64 MiB"
yes | "$BEAMLEDGER" trace - >"$T_DIR/out" 2>"$T_DIR/err"
RC=$?
check "endless standard input: refused" trouble "<stdin>: larger than 64 MiB"
check "endless standard input: nothing on stdout" [ ! -s "$T_DIR/out" ]
run --db lab.db import /dev/zero
check "import /dev/zero: refused" trouble "/dev/zero: larger than 64 MiB"
sed 's/"n2": *"[^"]*"/"n2": "1e309 cm^2\/W"/' demo.json >n2.json
if grep -q '1e309' n2.json; then
	run trace n2.json
	check "an n2 beyond range: refused, not a crash" trouble "out of range"
else
	skip "the demo has no n2 to change"
fi
sed 's/"polarization": *[-0-9.e]*/"polarization": 1e308/' demo.json >pol.json
run trace pol.json
check "polarization 1e308: refused (was 'ok')" trouble "polarization"
printf '\357\273\277' | cat - demo.json >bom.json
run trace bom.json
check "a leading byte-order mark is accepted" sh -c "[ $RC -le 1 ] && [ -s '$T_DIR/out' ]"

# ---- a file-size limit: the write fails, the process is not killed ----
# (ulimit -f counts 512- or 1024-byte blocks by shell; 16 of either is less
# than the 32 KiB -shm SQLite makes)
cp lab.orig lim.db
(ulimit -f 16 && exec "$BEAMLEDGER" --db lim.db set $B L1 focal=300mm) \
	>"$T_DIR/out" 2>"$T_DIR/err"
RC=$?
check "file-size limit: set says so (not killed by SIGXFSZ)" trouble "file-size limit"
(ulimit -f 16 && exec "$BEAMLEDGER" --db lim.db record $B -n x) \
	>"$T_DIR/out" 2>"$T_DIR/err"
RC=$?
check "file-size limit: record says so" trouble "file-size limit"
run --db lim.db check
check "file-size limit: the database is intact" rc_is 0
# and outside the database: a file written over the limit is an error with
# a message, and nothing is left (no partial file, no temporary one)
mkdir lim-out
(ulimit -f 4 && exec "$BEAMLEDGER" report --demo -o lim-out/review.md) \
	>"$T_DIR/out" 2>"$T_DIR/err"
RC=$?
check "file-size limit: report -o says so (not killed)" trouble "File too large; nothing written"
check "... and leaves no file behind" sh -c '[ -z "$(ls -A lim-out)" ]'
(ulimit -f 4 && exec "$BEAMLEDGER" trace --demo --format json) >lim-out/t.json 2>"$T_DIR/err"
RC=$?
check "file-size limit: trace to a file says so" trouble "standard output: File too large"
run --db lim.db history $B
check "file-size limit: nothing was recorded" sh -c "[ $RC -eq 0 ] && grep -q '^#1 ' '$T_DIR/out' && ! grep -q '^#2' '$T_DIR/out'"

# ---- a read-only database in a read-only folder ----
as_other=
if [ "$(id -u)" -ne 0 ]; then
	as_other=" "
elif command -v setpriv >/dev/null 2>&1; then
	as_other="setpriv --reuid=65534 --regid=65534 --clear-groups"
	# the build may sit where that user cannot reach it
	$as_other "$BEAMLEDGER" --version >/dev/null 2>&1 || as_other=
fi
mkdir ro ro2
cp lab.orig ro/lab.db
cp lab.orig ro2/lab.db
: >ro2/lab.db-wal           # changes of a writer that is gone, no -shm
chmod 444 ro/lab.db ro2/lab.db
chmod 555 ro ro2
if [ -n "$as_other" ]; then
	# shellcheck disable=SC2086
	$as_other "$BEAMLEDGER" --db ro/lab.db history $B >"$T_DIR/out" 2>"$T_DIR/err"
	RC=$?
	check "read-only folder: the database is read" \
		sh -c "[ $RC -eq 0 ] && grep -q 'imported from demo.json' '$T_DIR/out'"
	# shellcheck disable=SC2086
	$as_other "$BEAMLEDGER" --db ro/lab.db check >"$T_DIR/out" 2>"$T_DIR/err"
	RC=$?
	check "read-only folder: check reads it" rc_is 0
	check "read-only folder: nothing was written beside it" \
		sh -c "[ \$(ls ro | wc -l) -eq 1 ]"
	# shellcheck disable=SC2086
	$as_other "$BEAMLEDGER" --db ro/lab.db set $B L1 focal=1m >"$T_DIR/out" 2>"$T_DIR/err"
	RC=$?
	check "read-only folder: a change is refused" trouble "read-only"
	# shellcheck disable=SC2086
	$as_other "$BEAMLEDGER" --db ro2/lab.db history $B >"$T_DIR/out" 2>"$T_DIR/err"
	RC=$?
	check "read-only folder with a -wal but no -shm: says exactly why" \
		trouble "needs a -shm file"
else
	for i in 1 2 3 4 5; do skip "root without setpriv: no read-only folder"; done
fi
chmod 755 ro ro2

# ---- a full disk ----
if command -v unshare >/dev/null 2>&1 &&
    unshare -rm sh -c 'mount -t tmpfs -o size=64k tmpfs "$1"' sh "$T_DIR" 2>/dev/null; then
	mkdir full
	unshare -rm sh -c '
		cd "$1" || exit 9
		mount -t tmpfs -o size=256k tmpfs full || exit 9
		cp lab.orig full/lab.db || exit 9
		dd if=/dev/zero of=full/fill bs=4096 2>/dev/null
		for c in "history $3" "check" "record $3 -n x"; do
			# shellcheck disable=SC2086
			"$2" --db full/lab.db $c >"full-$c.out" 2>"full-${c%% *}.err"
			echo $? >"full-${c%% *}.rc"
		done
		rm full/fill
		cmp full/lab.db lab.orig && echo same >full-same
		"$2" --db full/lab.db history "$3" >full-after.out 2>&1
		echo $? >full-after.rc
	' sh "$T_DIR" "$BEAMLEDGER" $B
	for c in history check record; do
		RC=$(cat "full-$c.rc" 2>/dev/null || echo 99)
		cp "full-$c.err" "$T_DIR/err" 2>/dev/null
		check "full disk: $c says the disk is full" trouble "the disk is full"
		check "full disk: $c says the database is intact" err_has "database itself is intact"
	done
	check "full disk: the database is unchanged" [ -f full-same ]
	check "full disk: after space is freed it reads" [ "$(cat full-after.rc)" = 0 ]
else
	for i in 1 2 3 4 5 6 7 8; do skip "no user and mount namespaces for a small tmpfs"; done
fi

done_testing
