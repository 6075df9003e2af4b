#!/usr/bin/env bash
# Time to the explorer's first screen and its peak memory on the table of
# run.sh, as a user sees it: the explorer runs in a detached tmux pane; the
# script polls the pane every 50 ms until the header shows "ROC AUC", then
# reads the process's peak resident memory (VmHWM) and quits it with q;
# `sill report` runs in each round too, for the ratio. The explorer's time
# includes tmux's start and the polling step, so it errs long.
#
#   bench/explore.sh            # after bench/run.sh has built and made the data
#   ROWS=1000000 RUNS=3 bench/explore.sh
set -euo pipefail
cd "$(dirname "$0")/.."
ROWS=${ROWS:-10000000}
RUNS=${RUNS:-3}
out=bench/data
data="$out/table-$ROWS.csv"
[ -s "$data" ] || { echo "explore.sh: $data missing; run bench/run.sh first" >&2; exit 1; }
go build -o "$out/sill" ./cmd/sill
session="sill-bench-$$"
for round in $(seq "$RUNS"); do
	start=$(date +%s.%N)
	tmux new-session -d -s "$session" -x 120 -y 40 "$out/sill explore $data"
	shown=no
	for _ in $(seq 1 600); do
		if tmux capture-pane -t "$session" -p | grep -q "ROC AUC"; then
			shown=yes
			break
		fi
		sleep 0.05
	done
	end=$(date +%s.%N)
	pid=$(tmux list-panes -t "$session" -F '#{pane_pid}')
	kb=$(awk '/VmHWM/ {print $2}' "/proc/$pid/status")
	tmux send-keys -t "$session" q
	sleep 0.3
	tmux kill-session -t "$session" 2>/dev/null || true
	[ "$shown" = yes ] || { echo "explore.sh: no first screen within 30 s" >&2; exit 1; }
	echo "explore $(echo "$end - $start" | bc) $kb"
	# report in the same round, for the ratio
	/usr/bin/time -f "report %e %M" -o "$out/time.txt" "$out/sill" report "$data" --format json >/dev/null
	cat "$out/time.txt"
done | tee "$out/explore.txt"
median() { sort -g | awk '{a[NR] = $1} END {print a[int((NR + 1) / 2)]}'; }
t=$(awk '$1 == "explore" {print $2}' "$out/explore.txt" | median)
kb=$(awk '$1 == "explore" {print $3}' "$out/explore.txt" | median)
r=$(awk '$1 == "report" {print $2}' "$out/explore.txt" | median)
awk -v t="$t" -v kb="$kb" -v r="$r" -v rows="$ROWS" 'BEGIN {
	printf "explore first screen: median %.2f s, %.2f times report'"'"'s %.2f s (target at most 1.5)\n", t, t / r, r
	printf "explore peak memory: median %.0f MB, %.1f bytes per row (target at most 40)\n", kb / 1024, kb * 1024 / rows
}' | tee -a "$out/explore.txt"
