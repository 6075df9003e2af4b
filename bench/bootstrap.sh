#!/usr/bin/env bash
# Side-by-side time of `sill report FILE --format json` without and with
# `--bootstrap 200` (issue 9: at most 10 times as long) on the synthetic
# table of package bench, in one session, the two taking turns RUNS times;
# prints the median wall and CPU time of each, their ratio and the load
# average before and after, as RESULTS.md records them.
#
#   bench/bootstrap.sh                  # 10 million rows, 3 runs
#   ROWS=1000000 RUNS=3 bench/bootstrap.sh
#
# Data and binaries go to bench/data/, which git ignores.
set -euo pipefail
cd "$(dirname "$0")/.."

ROWS=${ROWS:-10000000}
RUNS=${RUNS:-3}
REPLICATES=${REPLICATES:-200}
out=bench/data
mkdir -p "$out"
data="$out/table-$ROWS.csv"
if [ ! -s "$data" ]; then
	echo "== generating $data"
	go run ./bench/gen -rows "$ROWS" -out "$data"
fi
echo "== building"
go build -o "$out/sill" ./cmd/sill
load_before=$(cut -d' ' -f1-3 /proc/loadavg)

# once NAME COMMAND...: runs COMMAND once under /usr/bin/time -v and
# appends "NAME wall_seconds cpu_seconds" to $out/bootstrap-runs.txt.
once() {
	local name=$1
	shift
	/usr/bin/time -v -o "$out/time.txt" "$@" >"$out/$name.stdout"
	awk -F': ' -v name="$name" '
		/Elapsed \(wall clock\)/ { n = split($2, p, ":"); s = 0; for (i = 1; i <= n; i++) s = s * 60 + p[i]; wall = s }
		/User time/ { cpu += $2 }
		/System time/ { cpu += $2 }
		END { print name, wall, cpu }' "$out/time.txt" >>"$out/bootstrap-runs.txt"
}

: >"$out/bootstrap-runs.txt"
for round in $(seq "$RUNS"); do
	echo "== round $round of $RUNS" >&2
	once report "$out/sill" report "$data" --format json
	once resampled "$out/sill" report "$data" --format json --bootstrap "$REPLICATES"
done

{
	echo "date: $(date -u +%Y-%m-%dT%H:%MZ); machine: $(uname -srm); $(nproc) cores"
	echo "rows: $ROWS; replicates: $REPLICATES; runs: $RUNS; load average before: $load_before"
	awk '
		{ wall[$1] = wall[$1] " " $2; cpu[$1] = cpu[$1] " " $3 }
		function median(list,   a, n, i, j, t) {
			n = split(list, a, " ")
			for (i = 1; i <= n; i++) for (j = i + 1; j <= n; j++) if (a[j] + 0 < a[i] + 0) { t = a[i]; a[i] = a[j]; a[j] = t }
			return a[int((n + 1) / 2)]
		}
		END {
			for (p in wall) { m[p] = median(wall[p]); printf "%-10s median wall %.2f s, median cpu %.2f s (walls:%s)\n", p, m[p], median(cpu[p]), wall[p] }
			printf "resampled / report: %.2f (target at most 10)\n", m["resampled"] / m["report"]
		}' "$out/bootstrap-runs.txt"
	echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
} | tee "$out/bootstrap-results.txt"
