#!/bin/sh
# report.sh - `beamledger report` end to end: the PDF opens and its text
# holds what a reviewer signs for (bench, setup, worst element, safe power,
# every caution); a 200-element bench loses no table row over its pages;
# the Markdown holds the same facts; the SVG plot's radius curve passes
# through the trace's own radii at element planes; bad output paths leave
# nothing behind.
. "${srcdir:-.}/tests/lib.sh"

export BEAMLEDGER_DB="$T_DIR/lab.db" USER=tester
B=table3-ablation
cd "$T_DIR" || exit 2
for tool in pdfinfo pdftotext python3; do
	command -v "$tool" >/dev/null 2>&1 || { echo "1..0 # SKIP $tool missing (.ci/install-deps)"; exit 0; }
done

# text of a PDF, blanks squeezed, so that wrapped lines still match
pdf_words() { pdftotext "$1" - | tr -s ' \n' '  '; }
words() { printf '%s' "$1" | tr -s ' \n' '  '; }

# ---- the demo, from the record: two setups, the second changes W1 ----
"$BEAMLEDGER" demo >demo.json
run import import demo.json
check "the demo goes into the record" status_is import 0
run set set "$B" L1 focal=300mm
run rec record "$B" -n "longer lens before the window"
check "a second setup is recorded" status_is rec 0

run pdf report "$B@2" -o review.pdf
check "report BENCH@2 -o review.pdf: exit 0" status_is pdf 0
check "... and says where it wrote" out_has pdf "review.pdf"
pages=$(pdfinfo review.pdf 2>/dev/null | sed -n 's/^Pages: *//p')
check "pdfinfo opens it and counts pages ($pages)" [ "${pages:-0}" -ge 2 ]
pdf_words review.pdf >review.txt
has() { grep -qF -- "$(words "$2")" "$1" || { diag "$1 lacks '$2'"; return 1; }; }
check "PDF: bench name" has review.txt "Review of bench $B, setup #2"
check "PDF: page numbers on every page" has review.txt "page $pages of $pages"
check "PDF: the note and the author of the setup" has review.txt "longer lens before the window"
check "PDF: ... author" has review.txt "by tester"
# worst and safe power from the trace of the same setup, not from the report
"$BEAMLEDGER" trace "$B@2" >trace2.txt
worst=$(sed -n 's/^Worst: \([^ ]*\) .*/\1/p' trace2.txt)
safe=$(sed -n 's/^Safe source power: \([^(]*\) (.*/\1/p' trace2.txt | sed 's/ *$//')
check "PDF: the worst element ($worst)" has review.txt "Worst element: $worst"
check "PDF: the safe source power ($safe)" has review.txt "Safe source power: $safe"
check "PDF: the changes since setup #1" has review.txt "Changes since setup #1"
check "PDF: ... name the changed lens" has review.txt "L1"
check "PDF: sign-off lines" sh -c 'grep -qF "Checked by" "$1" && grep -qF "Laser safety officer" "$1" && grep -qF "Date" "$1"' sh review.txt
# the content hash is that of the bench file `export` writes (sha256sum, not ours)
h=$("$BEAMLEDGER" export "$B@2" | sha256sum | cut -d' ' -f1)
check "PDF: content hash is sha256 of the exported bench file" has review.txt "$h"
check "PDF: the record's path" has review.txt "$T_DIR/lab.db"
# every caution line of the program's own safety text (from --help)
"$BEAMLEDGER" --help | sed -n '/^Laser safety:/,/^$/p' | sed '/^$/d; s/^ *- *//; s/^ *//' >cautions.txt
n=0 missing=
while IFS= read -r line; do
	n=$((n + 1))
	grep -qF -- "$(words "$line")" review.txt || missing="$missing | $line"
done <cautions.txt
check "PDF: every one of the $n caution lines" [ "$n" -ge 5 -a -z "$missing" ]
[ -z "$missing" ] || diag "missing:$missing"

# the verdict's counts, counted here from the trace's JSON
"$BEAMLEDGER" trace "$B@2" --format json >trace2.json
counts=$(python3 - trace2.json <<'EOF'
import json, sys
t = json.load(open(sys.argv[1]))
els = [e for e in t["elements"] if e["type"] != "space"]
n = lambda s: sum(1 for e in els if e["status"] == s)
w = [x for x in t["warnings"] if x["kind"] == "unterminated"]
a = [x for x in t["warnings"] if x["kind"] == "air_breakdown"]
print("Over: %d caution: %d ok: %d unrated: %d Unterminated beams: %d air-breakdown foci: %d"
      % (n("over"), n("caution"), n("ok"), n("unrated"), len(w), len(a)))
EOF
)
check "PDF: the verdict's counts ($counts)" has review.txt "$counts"
# every kind of warning the trace gives, counted from its JSON, and the
# above-critical-power notes (a flag of the rows)
warns=$(python3 - trace2.json <<'EOF'
import json, sys
t = json.load(open(sys.argv[1]))
words = {"air_breakdown": ("spark", "sparks"), "unterminated": ("unterminated beam", "unterminated beams"),
         "unrated_absorber": ("unrated absorber", "unrated absorbers"),
         "unrated_dump": ("unrated dump", "unrated dumps")}
order, n = [], {}
for w in t["warnings"]:
    if w["kind"] not in n:
        order.append(w["kind"]); n[w["kind"]] = 0
    n[w["kind"]] += 1
parts = ["%d %s" % (n[k], words.get(k, (k, k))[n[k] != 1]) for k in order]
notes = sum(1 for e in t["elements"] if "above_critical_power" in e["flags"])
print("Warnings: " + (", ".join(parts) or "none") + ("; notes: %d above critical power" % notes if notes else ""))
EOF
)
check "PDF: every warning kind with its count ($warns)" has review.txt "$warns"

# the draft compares with the latest setup; --since chooses
run sincepdf report "$B@2" --since 1 -o since.pdf
check "--since 1: exit 0" status_is sincepdf 0
run first report "$B@1" -o first.pdf
pdf_words first.pdf >first.txt
check "setup #1: says there is nothing earlier" has first.txt "first setup"

run dflt report "$B"
check "without -o: BENCH-draft.pdf in the current folder" sh -c '[ "$1" -eq 0 ] && pdfinfo "$2" >/dev/null 2>&1' sh "$(rc_of dflt)" "$B-draft.pdf"
run named report "$B@1" --format md
check "without -o, --format md: BENCH-setup-1.md" [ "$(rc_of named)" -eq 0 -a -s "$B-setup-1.md" ]

# ---- Markdown: the same facts ----
run md report "$B@2" -o review.md
check "report -o review.md: exit 0" status_is md 0
tr -s ' \n' '  ' <review.md >review.mdw
check "MD: bench and setup" has review.mdw "# Review of bench $B, setup #2"
check "MD: the worst element" has review.mdw "Worst element: $worst"
check "MD: the safe source power" has review.mdw "Safe source power: $safe"
check "MD: every warning kind with its count" has review.mdw "$warns"
check "MD: the content hash" has review.mdw "$h"
# the chain counts free space per branch: S5 (150 mm in the bench file)
# lies before CM1; the 80 mm of POL1's rejected branch do not
check "MD: the chain gives CM1's own gap" has review.mdw "CM1 (mirror) after 150 mm"
check "MD: the open rejected port is named" has review.mdw "branch POL1.rejected: free space only: **the beam leaves the bench**"
missing=
while IFS= read -r line; do
	grep -qF -- "$(words "$line")" review.mdw || missing="$missing | $line"
done <cautions.txt
check "MD: every caution line" [ -z "$missing" ]
rows=$(awk '/^## Elements/ { on = 1; next } on && /^\| / { n++ } on && /^$/ && n { exit } END { print n - 1 }' review.md)
want=$("$BEAMLEDGER" trace "$B@2" --format json | python3 -c 'import json, sys; print(len(json.load(sys.stdin)["elements"]))')
check "MD: a table row per element ($rows of $want)" [ "$rows" -eq "$want" ]
# the table's status words (issue 9 item 18): free space is n/a, the
# sparking focus (S9, an air breakdown in the trace's JSON) is "spark"
spark=$(python3 -c 'import json,sys; print([e["id"] for e in json.load(open(sys.argv[1]))["elements"] if "air_breakdown" in e["flags"]][0])' trace2.json)
check "MD: free space says n/a, as trace's table does" grep -q '^| S0 | space | .* | - | n/a |' review.md
check "MD: the sparking focus ($spark) says spark, as trace's table does" grep -q "^| $spark | space | .* | spark |" review.md
run mdout report "$B" --format md -o -
check "'-o -' with --format md writes to standard output" out_has mdout "# Review of bench $B, the draft"

# ---- 200 elements: every row survives the pages ----
python3 - <<'EOF' >big.json
import json
path = []
for i in range(1, 201):
    if i % 2:
        path.append({"id": "G%d" % i, "type": "space", "length": "50 mm"})
    else:
        path.append({"id": "E%d" % i, "type": "mirror", "aoi": 45, "reflectance": 0.999,
                     "damage": {"fluence": "10 J/cm^2", "pulse_width": "10 ns"}})
path[-1] = {"id": "E200", "type": "dump", "max_power": "5 W"}
print(json.dumps({"format": "beamledger-bench-1", "name": "long-line", "source": {
    "wavelength": "1064 nm", "pulsed": {"rep_rate": "10 Hz", "pulse_width": "8 ns",
    "shape": "gaussian", "pulse_energy": "100 mJ"}, "waist": "2 mm", "m2": 1.2,
    "polarization": 0}, "path": path}))
EOF
run big report big.json -o big.pdf
check "200-element bench: exit 0" status_is big 0
bigpages=$(pdfinfo big.pdf 2>/dev/null | sed -n 's/^Pages: *//p')
pdftotext -layout big.pdf big.txt
got=$(grep -oE '^ *[GE][0-9]+ +(space|mirror|dump) ' big.txt | awk '{print $1}' | sort -u | wc -l)
check "200-element bench: all 200 table rows are there ($got, $bigpages pages)" [ "$got" -eq 200 ]
heads=$(grep -cE '^ *element +type +z ' big.txt)
check "200-element bench: the table header repeats on its pages ($heads)" [ "$heads" -ge 3 ]

# ---- the SVG plot passes through the trace's radii ----
run svg report --demo -o plot.svg
check "report --demo -o plot.svg: exit 0" status_is svg 0
"$BEAMLEDGER" trace --demo --format json >demo-trace.json
python3 - plot.svg demo-trace.json <<'EOF' >svgcheck.txt
import json, re, sys
svg = open(sys.argv[1]).read()
tr = json.load(open(sys.argv[2]))
m = re.search(r'plot 1 branch=main x0=(\S+) x1=(\S+) ytop=(\S+) ybottom=(\S+) z0=(\S+) z1=(\S+) r_top=(\S+)', svg)
x0, x1, yt, yb, z0, z1, rt = map(float, m.groups())
# the radius x curve: the longest path stroked in its colour inside plot 1
best = []
for p in re.finditer(r'<path [^>]*stroke:rgb\(0%,0%,80%\)[^>]*d="([^"]*)"', svg):
    pts = [tuple(map(float, q)) for q in re.findall(r'[ML] ([-\d.]+) ([-\d.]+)', p.group(1))]
    if pts and all(yt - 2 <= y <= yb + 2 for _, y in pts) and len(pts) > len(best):
        best = pts
ok = len(best) > 10
for el in ("CM1", "L1"):
    e = [r for r in tr["elements"] if r["id"] == el][0]
    x = x0 + (e["z"] - z0) * (x1 - x0) / (z1 - z0)
    near = [pt for pt in best if abs(pt[0] - x) < 0.01]
    # cairo writes coordinates to 1/256 of a unit: allow 0.02
    want_y = yb - e["radius_x"] / rt * (yb - yt)
    hit = any(abs(y - want_y) < 0.02 for _, y in near)
    print("%s z=%g wx=%g x=%.3f want y=%.3f got %s %s" % (el, e["z"], e["radius_x"], x, want_y,
          [round(y, 3) for _, y in near], "ok" if hit else "MISS"))
    ok = ok and hit
# the description's frame is the frame drawn (a closed path on its corners)
fr = "M %g %g L %g %g L %g %g L %g %g Z" % (x0, yt, x1, yt, x1, yb, x0, yb)
print("frame", fr, "drawn" if fr in svg else "NOT DRAWN")
ok = ok and fr in svg
# the dashed radius y curve meets the trace's radius y at W1 (main)
besty = []
for p in re.finditer(r'<path [^>]*stroke:rgb\(85%,33%,0%\)[^>]*d="([^"]*)"', svg):
    pts = [tuple(map(float, q)) for q in re.findall(r'[ML] ([-\d.]+) ([-\d.]+)', p.group(1))]
    if pts and all(yt - 2 <= y <= yb + 2 for _, y in pts) and len(pts) > len(besty):
        besty = pts
e = [r for r in tr["elements"] if r["id"] == "W1"][0]
x = x0 + (e["z"] - z0) * (x1 - x0) / (z1 - z0)
want_y = yb - e["radius_y"] / rt * (yb - yt)
hit = any(abs(px - x) < 0.01 and abs(py - want_y) < 0.02 for px, py in besty)
print("W1 radius y", e["radius_y"], "want y=%.3f" % want_y, "ok" if hit else "MISS")
ok = ok and hit
# the axis top is a round value above every radius plotted
wmax = max(max(r["radius_x"], r["radius_y"]) for r in tr["elements"] if r["branch"] == "main")
ok = ok and wmax <= rt <= 2.5 * wmax
print("r_top", rt, "max", wmax)
sys.exit(0 if ok else 1)
EOF
check "SVG: the radius curves meet the trace's radii at CM1, L1 (x) and W1 (y); the frame is where it says" [ $? -eq 0 ]
diag "$(cat svgcheck.txt)"

# ---- bad output paths: clear words, exit 2, nothing left ----
run nodir report --demo -o "$T_DIR/no/such/dir/r.pdf"
check "missing folder: exit 2" status_is nodir 2
check "missing folder: names it" err_has nodir "the folder '$T_DIR/no/such/dir' does not exist"
check "missing folder: nothing made" [ ! -e "$T_DIR/no" ]
echo "keep me" >ro.pdf
chmod 444 ro.pdf
run ro report --demo -o ro.pdf
check "read-only file: exit 2" status_is ro 2
check "read-only file: says so" err_has ro "ro.pdf: the file is read-only"
check "read-only file: left as it was" [ "$(cat ro.pdf)" = "keep me" ]
run ext report --demo -o review.bad
check "unknown extension: exit 2" status_is ext 2
check "unknown extension: names it" err_has ext "unknown extension '.bad'"
check "unknown extension: no file" [ ! -e review.bad ]
run clash report --demo -o x.pdf --format md
check "--format against the extension: exit 2" status_is clash 2
check "... and no file" [ ! -e x.pdf ]
run nosetup report "$B@9" -o n9.pdf
check "a setup that does not exist: exit 2, no file" sh -c '[ "$1" -eq 2 ] && [ ! -e n9.pdf ]' sh "$(rc_of nosetup)"
run nosince report "$B@2" --since 9 -o s9.pdf
check "--since a setup that does not exist: exit 2, no file" sh -c '[ "$1" -eq 2 ] && [ ! -e s9.pdf ]' sh "$(rc_of nosince)"
run filesince report demo.json --since 1 -o fs.pdf
check "--since with a bench file: exit 2" status_is filesince 2
cat >bare.json <<'EOF'
{ "format": "beamledger-bench-1", "name": "bare",
  "source": { "wavelength": "633 nm", "power": "1 mW", "waist": "0.4 mm", "m2": 1, "polarization": 0 },
  "path": [ { "id": "S0", "type": "space", "length": "1 m" }, { "id": "T1", "type": "target" } ] }
EOF
run bare report bare.json -o bare.pdf
check "a bench with nothing rated: exit 0" status_is bare 0
check "... and says nothing was checked" sh -c 'pdftotext "$1" - | tr -s " \n" "  " | grep -qF "nothing was checked"' sh bare.pdf
run nob report no-such-bench -o nb.pdf
check "unknown bench: exit 2" status_is nob 2
check "unknown bench: no file" [ ! -e nb.pdf ]
check "no temporary file is left anywhere" [ -z "$(ls -a | grep -E '\.(pdf|md|svg)\.' )" ]

# ---- operating points: one point, or the base and every point ----
run pa point add "$B" full source.pulse_energy=250mJ
run pb point add "$B" align source.pulse_energy=2mJ +filter:ND9@S0 ND9.od=1
run prec record "$B" -n "two operating points"
check "a setup with two operating points is recorded" sh -c '[ "$1" -eq 0 ] && [ "$2" -eq 0 ] && [ "$3" -eq 0 ]' sh "$(rc_of pa)" "$(rc_of pb)" "$(rc_of prec)"
run ppdf report "$B@3" --point full -o point.pdf
check "report --point full: exit 0" status_is ppdf 0
check "... says which point it wrote" out_has ppdf "setup #3, point full"
pdf_words point.pdf >point.txt
check "--point PDF: the title names the point" has point.txt "Review of bench $B, setup #3, point full"
check "--point PDF: the verdict names the point" has point.txt "Operating point: full (one of 2"
check "... and its change" has point.txt "source.pulse_energy=250mJ"
# the worst at that point, from trace --point's JSON (not from the report)
"$BEAMLEDGER" trace "$B@3" --point full --format json >pfull.json
"$BEAMLEDGER" trace "$B@3" --format json >pbase.json
pw=$(python3 -c 'import json,sys; w=json.load(open(sys.argv[1]))["worst"]; print("%s %.0f" % (w["id"], 100 * w["ratio"]))' pfull.json)
check "--point PDF: the worst element at the point (${pw% *}, ${pw#* } %)" has point.txt "Worst element: ${pw% *} (window), ${pw#* } %"
# hand: the point raises the pulse energy from 200 to 250 mJ and changes
# nothing else, so every fluence, and W1's ratio, is 250/200 = 1.25 times
# the base's (fluence is linear in pulse energy)
check "--point: the point's worst ratio is 1.25 times the base's (fluence linear in energy)" python3 -c '
import json, sys
p = json.load(open(sys.argv[1]))["worst"]; b = json.load(open(sys.argv[2]))["worst"]
assert p["id"] == b["id"] == "W1", (p, b)
assert abs(p["ratio"] / b["ratio"] - 1.25) < 1e-9, (p, b)' pfull.json pbase.json
run pmd report "$B@3" --point full -o point.md
check "--point Markdown: exit 0" status_is pmd 0
tr -s ' \n' '  ' <point.md >point.mdw
check "--point MD: the title names the point" has point.mdw "# Review of bench $B, setup #3, point full"
check "--point MD: the worst element at the point" has point.mdw "Worst element: ${pw% *} (window), ${pw#* } %"
check "--point MD: the point's change" has point.mdw "changes source.pulse_energy=250mJ"
check "--point MD: the changes are between the setups as recorded" has point.mdw "Bench $B: setup #2 → setup #3"
run pdef report "$B@3" --point full
check "--point without -o: BENCH-setup-3-point-full.pdf" sh -c '[ "$1" -eq 0 ] && pdfinfo "$2" >/dev/null 2>&1' sh "$(rc_of pdef)" "$B-setup-3-point-full.pdf"

run epdf report "$B@3" --every-point -o every.pdf
check "report --every-point: exit 0" status_is epdf 0
pdf_words every.pdf >every.txt
"$BEAMLEDGER" trace "$B@3" --every-point --format json >every.json
ew=$(python3 -c '
import json, sys
t = json.load(open(sys.argv[1]))
w = max(t["worst_by_element"], key=lambda e: e["ratio"])
print("%s %.0f %s %d" % (w["id"], 100 * w["ratio"], w["point"], len(t["points"]) - 1))' every.json)
set -- $ew
check "--every-point PDF: the title says every point" has every.txt "setup #3, the base and every operating point"
check "--every-point PDF: the verdict counts the points ($4)" has every.txt "Operating points: $4 besides the base"
check "--every-point PDF: the worst anywhere and where ($1 $2 % at $3)" has every.txt "Worst over the base and every point: $1, $2 % of its threshold at point $3"
check "--every-point PDF: the table's column" has every.txt "worst, at point"
check "--every-point PDF: each point's summary" has every.txt "align: worst"
run emd report "$B@3" --every-point -o every.md
check "--every-point Markdown: exit 0" status_is emd 0
tr -s ' \n' '  ' <every.md >every.mdw
check "--every-point MD: the verdict counts the points" has every.mdw "Operating points: $4 besides the base"
check "--every-point MD: the worst anywhere and where" has every.mdw "Worst over the base and every point: $1, $2 % of its threshold at point $3"
# per element: the table's last cell names the point trace --every-point names
cat >rows.py <<'EOF'
import json, sys
t = json.load(open(sys.argv[2]))
rows = {}
for line in open(sys.argv[1]):
    if line.startswith("| ") and " at " in line:
        cells = [c.strip() for c in line.strip().strip("|").split("|")]
        rows[cells[0].split(" (in ")[0]] = cells[-1]
n = 0
for e in t["worst_by_element"]:
    if e["id"] not in rows:
        continue        # an element only a point puts in: listed, not a row
    assert rows[e["id"]].endswith(" at " + e["point"]), (e, rows[e["id"]])
    n += 1
assert n >= 5, n
EOF
check "--every-point MD: every rated element's worst is at the point trace names" python3 rows.py every.md every.json
run pbad report "$B@3" --point nosuch -o bad.pdf
check "--point with an unknown point: exit 2" status_is pbad 2
check "... names it" err_has pbad "no point 'nosuch'"
check "... and no file" [ ! -e bad.pdf ]
run pboth report "$B@3" --point full --every-point -o both.pdf
check "--point with --every-point: exit 2, no file" sh -c '[ "$1" -eq 2 ] && [ ! -e both.pdf ]' sh "$(rc_of pboth)"

done_testing
