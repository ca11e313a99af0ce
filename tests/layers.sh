#!/bin/sh
# layers.sh - the layering of STYLE.md holds: core-* includes neither curses
# nor SQLite and does no I/O; only store-* includes SQLite; only ui-*
# includes curses.
srcdir=${srcdir:-.}
n=0 fail=0
check() {
	n=$((n+1))
	if [ -z "$2" ]; then echo "ok $n - $1"; else fail=$((fail+1)); echo "not ok $n - $1: $2"; fi
}
cd "$srcdir/src" || exit 1
check "core-* includes no curses or sqlite" \
	"$(grep -lE '#include *[<"](n?curses|ncursesw/|sqlite3)' core-*.[ch] 2>/dev/null)"
check "core-* does no stdio I/O" \
	"$(grep -lE '\b(printf|fprintf|fputs|puts|fopen|fwrite|fread|getchar|perror)\(' core-*.c 2>/dev/null)"
check "only store-* includes sqlite3.h" \
	"$(grep -lE '#include *<sqlite3\.h>' *.c *.h | grep -v '^store-')"
check "only ui-* includes curses" \
	"$(grep -lE '#include *[<"](n?curses|ncursesw/)' *.c *.h | grep -v '^ui-')"
check "every .c includes config.h first" \
	"$(for f in *.c; do grep -m1 '^#include' "$f" | grep -q 'config.h' || echo "$f"; done)"
echo "1..$n"
[ "$fail" -eq 0 ]
