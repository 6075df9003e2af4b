#!/usr/bin/env bash
# Side-by-side speed and memory of `sill report FILE --format json` on the
# synthetic table of package bench, against the scikit-learn pipeline
# (bench/sklearn_pipeline.py, Debian's python3-pandas and python3-sklearn)
# and the bare Go floor (bench/floor). Every program runs RUNS times on the
# same file in one session, taking turns; the script prints the median wall
# time, CPU time and peak resident memory (/usr/bin/time -v) of each, and
# the ratios that RESULTS.md records.
#
#   bench/run.sh                 # 10 million rows, 5 runs (3 for Python)
#   ROWS=1000000 RUNS=3 bench/run.sh
#   EXPLORE_CMD='...' bench/run.sh   # also time an explorer command line
#
# Data and binaries go to bench/data/, which git ignores.
set -euo pipefail
cd "$(dirname "$0")/.."

ROWS=${ROWS:-10000000}
RUNS=${RUNS:-5}
PY_RUNS=${PY_RUNS:-3}
PYTHON=${PYTHON:-/usr/bin/python3}
out=bench/data
mkdir -p "$out"
data="$out/table-$ROWS.csv"
if [ ! -s "$data" ]; then
	echo "== generating $data"
	go run ./bench/gen -rows "$ROWS" -out "$data"
fi
load_before=$(cut -d' ' -f1-3 /proc/loadavg)
echo "== building"
go build -o "$out/sill" ./cmd/sill
go build -o "$out/floor" ./bench/floor

# once NAME COMMAND...: runs COMMAND once under /usr/bin/time -v and
# appends "NAME wall_seconds peak_kb cpu_seconds" to $out/runs.txt.
once() {
	local name=$1
	shift
	/usr/bin/time -v -o "$out/time.txt" "$@" >"$out/$name.stdout"
	awk -F': ' -v name="$name" '
		/Elapsed \(wall clock\)/ { n = split($2, p, ":"); s = 0; for (i = 1; i <= n; i++) s = s * 60 + p[i]; wall = s }
		/Maximum resident set size/ { kb = $2 }
		/User time/ { cpu += $2 }
		/System time/ { cpu += $2 }
		END { print name, wall, kb, cpu }' "$out/time.txt" >>"$out/runs.txt"
}

# The programs take turns, round after round, so that whatever else the
# machine is doing meanwhile falls on all of them alike.
: >"$out/runs.txt"
for round in $(seq "$RUNS"); do
	echo "== round $round of $RUNS" >&2
	once floor "$out/floor" "$data"
	once report "$out/sill" report "$data" --format json
	if [ -n "${EXPLORE_CMD:-}" ]; then
		# shellcheck disable=SC2086
		once explore $EXPLORE_CMD
	fi
	if [ "$round" -le "$PY_RUNS" ]; then
		once sklearn "$PYTHON" bench/sklearn_pipeline.py "$data"
	fi
done

results="$out/results.txt"
{
	echo "machine: $(uname -srm); $(nproc) cores; $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | sed 's/^ //'); $(free -g | awk '/Mem:/ {print $2 " GB"}')"
	echo "go: $(go version | cut -d' ' -f3); python: $($PYTHON -c 'import sys, pandas, sklearn; print(sys.version.split()[0], "pandas", pandas.__version__, "scikit-learn", sklearn.__version__)')"
	echo "rows: $ROWS; file: $(stat -c %s "$data") bytes; runs: $RUNS (Python $PY_RUNS); load average before: $load_before"
	for name in floor report explore sklearn; do
		grep "^$name " "$out/runs.txt" >/dev/null || continue
		median() { sort -g | awk '{a[NR] = $1} END {print a[int((NR + 1) / 2)]}'; }
		echo "$name $(awk -v n="$name" '$1 == n {print $2}' "$out/runs.txt" | median) $(awk -v n="$name" '$1 == n {print $3}' "$out/runs.txt" | median) $(awk -v n="$name" '$1 == n {print $4}' "$out/runs.txt" | median)"
	done
} | tee "$results"

awk -v rows="$ROWS" '
	NF == 4 && $2 ~ /^[0-9.]+$/ { t[$1] = $2; kb[$1] = $3; cpu[$1] = $4 }
	END {
		printf "\n%-8s %10s %12s %12s %14s\n", "program", "median s", "median cpu s", "peak MB", "bytes per row"
		for (p in t) printf "%-8s %10.2f %12.2f %12.0f %14.1f\n", p, t[p], cpu[p], kb[p] / 1024, kb[p] * 1024 / rows
		printf "\nreport / scikit-learn pipeline: %.3f (target at most 0.06)\n", t["report"] / t["sklearn"]
		printf "report / bare Go floor:         %.2f (target at most 2.5)\n", t["report"] / t["floor"]
		printf "report peak memory per row:     %.1f bytes (target at most 24)\n", kb["report"] * 1024 / rows
		if ("explore" in t) printf "explore / report:               %.2f (target at most 1.5)\n", t["explore"] / t["report"]
	}' "$results" | tee -a "$results"
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)" | tee -a "$results"
