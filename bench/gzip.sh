#!/usr/bin/env bash
# Side-by-side times of reading the million-row gzip table (issue 14: a
# read in at most 1.3 times decompressing alone): BenchmarkGzipDecompress
# (the standard library's decoder alone), BenchmarkGzipLoad (scores.Load,
# the whole read) and BenchmarkGzipDecompressFast (the decoder the reader
# uses), taking turns ROUNDS times from one test binary, then
# internal/scores's BenchmarkGzipTail (the part of a read after the last
# decompressed byte, and the processor time per read). Prints each round,
# the median of each benchmark, the ratio of the medians Load/Decompress
# and the load average before and after, as RESULTS.md records them.
#
#   bench/gzip.sh             # 6 rounds
#   ROUNDS=10 bench/gzip.sh
#
# The test binaries go to bench/data/, which git ignores.
set -euo pipefail
cd "$(dirname "$0")/.."

ROUNDS=${ROUNDS:-6}
out=bench/data
mkdir -p "$out"
go test -c -o "$out/bench.test" ./bench
go test -c -o "$out/scores.test" ./internal/scores
load_before=$(cut -d' ' -f1-3 /proc/loadavg)
runs="$out/gzip-runs.txt"
: >"$runs"
for round in $(seq "$ROUNDS"); do
	"$out/bench.test" -test.run '^$' -test.bench 'Gzip(Decompress|Load|DecompressFast)$' -test.count 1 |
		grep '^BenchmarkGzip' | tee -a "$runs"
	"$out/scores.test" -test.run '^$' -test.bench 'GzipTail$' -test.benchtime 10x -test.count 1 |
		grep '^BenchmarkGzip' | tee -a "$runs"
done
load_after=$(cut -d' ' -f1-3 /proc/loadavg)
echo "== medians, ms per read ($ROUNDS rounds)"
median() { # median of the ns/op column of benchmark $1
	awk -v name="$1" '$1 ~ "^"name"-" { print $3 / 1e6 }' "$runs" | sort -g |
		awk '{ v[NR] = $1 } END { if (NR % 2) print v[(NR + 1) / 2]; else print (v[NR / 2] + v[NR / 2 + 1]) / 2 }'
}
decompress=$(median BenchmarkGzipDecompress)
load=$(median BenchmarkGzipLoad)
fast=$(median BenchmarkGzipDecompressFast)
echo "GzipDecompress $decompress  GzipLoad $load  GzipDecompressFast $fast"
awk -v l="$load" -v d="$decompress" -v f="$fast" 'BEGIN { printf "Load/Decompress %.2f  Load/DecompressFast %.2f  (target: Load/Decompress <= 1.3)\n", l / d, l / f }'
echo "load average before: $load_before  after: $load_after"
