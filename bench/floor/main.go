// Command floor is the bare floor of the speed benchmark: the least work
// that any tool must do for the report's headline figures. It reads the
// whole file, parses the two columns of package bench's table on both cores
// (score with a plain decimal point, label 0 or 1, nothing else allowed),
// sorts packed keys with a two-core radix sort, and sweeps once for ROC AUC,
// average precision and the number of cuts. It checks nothing and reports
// no errors beyond refusing a row it cannot read; it exists so that the gap
// between sill and the floor stays visible.
package main

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"sync"
)

func main() {
	if len(os.Args) != 2 {
		fmt.Fprintln(os.Stderr, "usage: floor FILE")
		os.Exit(2)
	}
	data, err := os.ReadFile(os.Args[1])
	if err != nil {
		fmt.Fprintln(os.Stderr, "floor:", err)
		os.Exit(1)
	}
	data = data[bytes.IndexByte(data, '\n')+1:] // the header
	keys := parse(data)
	radixSort(keys)
	auc, ap, cuts := sweep(keys)
	fmt.Printf("rows %d cuts %d roc_auc %.12f average_precision %.12f\n", len(keys), cuts, auc, ap)
}

var pow10 = [...]float64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15}

// parse reads the rows on two goroutines into keys: the score's bits
// shifted left by one, with the label in the lowest bit. Scores must be
// non-negative, so the shift loses nothing and the keys sort as the scores.
func parse(data []byte) []uint64 {
	mid := len(data) / 2
	mid += bytes.IndexByte(data[mid:], '\n') + 1
	halves := [2][]byte{data[:mid], data[mid:]}
	var out [2][]uint64
	var wg sync.WaitGroup
	for h := range 2 {
		wg.Add(1)
		go func(h int) {
			defer wg.Done()
			part := halves[h]
			keys := make([]uint64, 0, bytes.Count(part, []byte{'\n'})+1)
			for len(part) > 0 {
				var mantissa uint64
				fraction := -1
				i := 0
				for ; part[i] != ','; i++ {
					if c := part[i]; c == '.' {
						fraction = 0
					} else {
						mantissa = mantissa*10 + uint64(c-'0')
						if fraction >= 0 {
							fraction++
						}
					}
				}
				score := float64(mantissa)
				if fraction > 0 {
					score /= pow10[fraction]
				}
				label := uint64(part[i+1] - '0')
				keys = append(keys, math.Float64bits(score)<<1|label)
				next := bytes.IndexByte(part[i:], '\n')
				if next < 0 {
					break
				}
				part = part[i+next+1:]
			}
			out[h] = keys
		}(h)
	}
	wg.Wait()
	return append(out[0], out[1]...)
}

// radixSort sorts keys ascending with an 11-bit least-significant-digit
// radix sort, each pass split between two goroutines.
func radixSort(keys []uint64) {
	const bits, buckets = 11, 1 << 11
	n := len(keys)
	tmp := make([]uint64, n)
	bounds := [3]int{0, n / 2, n}
	for shift := uint(0); shift < 64; shift += bits {
		var hist [2][buckets]int
		var wg sync.WaitGroup
		for w := range 2 {
			wg.Add(1)
			go func(w int) {
				defer wg.Done()
				for _, k := range keys[bounds[w]:bounds[w+1]] {
					hist[w][(k>>shift)&(buckets-1)]++
				}
			}(w)
		}
		wg.Wait()
		if hist[0][(keys[0]>>shift)&(buckets-1)]+hist[1][(keys[0]>>shift)&(buckets-1)] == n {
			continue
		}
		var next [2][buckets]int
		offset := 0
		for d := range buckets {
			for w := range 2 {
				next[w][d] = offset
				offset += hist[w][d]
			}
		}
		for w := range 2 {
			wg.Add(1)
			go func(w int) {
				defer wg.Done()
				at := &next[w]
				for _, k := range keys[bounds[w]:bounds[w+1]] {
					d := (k >> shift) & (buckets - 1)
					tmp[at[d]] = k
					at[d]++
				}
			}(w)
		}
		wg.Wait()
		keys, tmp = tmp, keys
	}
	if n > 0 && &keys[0] != &tmp[0] {
		copy(tmp, keys) // an odd number of passes left the result in tmp's array
	}
}

// sweep walks the keys from the highest score down, one cut per distinct
// score, and returns ROC AUC (ties half), average precision and the cuts.
func sweep(keys []uint64) (auc, ap float64, cuts int) {
	var positives, negatives float64
	for _, k := range keys {
		if k&1 == 1 {
			positives++
		} else {
			negatives++
		}
	}
	var tp, fp, previousRecall, pairs float64
	for end := len(keys); end > 0; {
		score := keys[end-1] >> 1
		var groupTP, groupFP float64
		for ; end > 0 && keys[end-1]>>1 == score; end-- {
			if keys[end-1]&1 == 1 {
				groupTP++
			} else {
				groupFP++
			}
		}
		pairs += groupFP * (tp + groupTP/2)
		tp += groupTP
		fp += groupFP
		if groupTP > 0 {
			recall := tp / positives
			ap += (recall - previousRecall) * tp / (tp + fp)
			previousRecall = recall
		}
		cuts++
	}
	return pairs / (positives * negatives), ap, cuts
}
