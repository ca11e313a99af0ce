#!/bin/sh
# man.sh - the manual pages are well-formed, and beamledger(1) documents
# every command the program's --help lists.
srcdir=${srcdir:-.}
n=0 fail=0
ok() { n=$((n+1)); echo "ok $n - $*"; }
nok() { n=$((n+1)); fail=$((fail+1)); echo "not ok $n - $*"; }
for page in "$srcdir"/man/beamledger.1 "$srcdir"/man/beamledger-bench.5; do
	name=$(basename "$page")
	if command -v mandoc >/dev/null 2>&1; then
		if out=$(mandoc -Tlint -Wwarning "$page" 2>&1) && [ -z "$out" ]; then
			ok "$name: mandoc -Tlint clean"
		else
			nok "$name: mandoc -Tlint: $out"
		fi
	else
		n=$((n+1)); echo "ok $n - # SKIP mandoc not installed"
	fi
	if out=$(groff -ww -z -mandoc "$page" 2>&1) && [ -z "$out" ]; then
		ok "$name: groff -ww clean"
	else
		nok "$name: groff: $out"
	fi
done
# every command in --help has its own entry in the manual
for cmd in $("$BEAMLEDGER" --help | sed -n 's/^  \([a-z][a-z]*\) .*/\1/p; s/^  \([a-z][a-z]*\)$/\1/p'); do
	if grep -q "^\.It Cm $cmd\b" "$srcdir/man/beamledger.1"; then
		ok "beamledger(1) documents '$cmd'"
	else
		nok "beamledger(1) lacks '$cmd'"
	fi
done
# the cautions are in the page and in --help
for where in man help; do
	if [ $where = man ]; then text=$(cat "$srcdir/man/beamledger.1"); else text=$("$BEAMLEDGER" --help); fi
	case $text in
	*"laser safety officer"*) ok "$where carries the laser-safety cautions" ;;
	*) nok "$where lacks the laser-safety cautions" ;;
	esac
done
echo "1..$n"
[ "$fail" -eq 0 ]
