package scores

import (
	"math"
	"runtime"
	"sync"
)

// riskKey maps a score to a key whose ascending order is riskiest first.
// Minus zero and plus zero get the same key.
func riskKey(score float64, lowerIsRiskier bool) uint64 {
	if score == 0 {
		score = 0 // fold -0 into +0
	}
	bits := math.Float64bits(score)
	if bits>>63 == 1 {
		bits = ^bits
	} else {
		bits |= 1 << 63
	}
	// bits now ascends with the score.
	if lowerIsRiskier {
		return bits
	}
	return ^bits
}

// scoreOfKey inverts riskKey (minus zero comes back as plus zero).
func scoreOfKey(key uint64, lowerIsRiskier bool) float64 {
	if !lowerIsRiskier {
		key = ^key
	}
	if key>>63 == 1 {
		key &^= 1 << 63
	} else {
		key = ^key
	}
	return math.Float64frombits(key)
}

// rankOrder returns the stable order of rows from riskiest to safest, or
// nil when the rows are already in that order. It is a least-significant
// digit radix sort over the keys' bytes, skipping bytes all keys share.
func rankOrder(scores []float64, lowerIsRiskier bool) []uint32 {
	n := len(scores)
	keys := make([]uint64, n)
	sorted := true
	for i, s := range scores {
		keys[i] = riskKey(s, lowerIsRiskier)
		if i > 0 && keys[i] < keys[i-1] {
			sorted = false
		}
	}
	if sorted {
		return nil
	}
	order := make([]uint32, n)
	for i := range order {
		order[i] = uint32(i)
	}
	keysTmp := make([]uint64, n)
	orderTmp := make([]uint32, n)
	var counts [256]int
	for shift := uint(0); shift < 64; shift += 8 {
		counts = [256]int{}
		for _, k := range keys {
			counts[byte(k>>shift)]++
		}
		if counts[byte(keys[0]>>shift)] == n {
			continue // every key has this byte
		}
		offset := 0
		for b, c := range counts {
			counts[b] = offset
			offset += c
		}
		for i, k := range keys {
			d := byte(k >> shift)
			keysTmp[counts[d]] = k
			orderTmp[counts[d]] = order[i]
			counts[d]++
		}
		keys, keysTmp = keysTmp, keys
		order, orderTmp = orderTmp, order
	}
	return order
}

// Digits of the in-place radix sort: 11 bits, so six passes cover a key.
const (
	digitBits  = 11
	digitCount = 1 << digitBits
	digitMask  = digitCount - 1
	digitPass  = (64 + digitBits - 1) / digitBits
)

// parallelSortRows is the size from which rankInPlace uses two goroutines.
const parallelSortRows = 1 << 16

// rankInPlace sorts scores riskiest first, carrying labels and (when not
// nil) weights along, keeping the read order of ties. It sorts the keys
// themselves rather than a permutation: the scores slice holds the keys
// during the sort and gets its scores back, decoded from them, at the end,
// so the extra memory is one more copy of the columns being sorted and no
// index. Minus zero comes back as plus zero.
func rankInPlace(scores []float64, labels []bool, weights []float64, lowerIsRiskier bool) {
	n := len(scores)
	if n < 2 {
		return
	}
	sorted := true
	previous := riskKey(scores[0], lowerIsRiskier)
	for _, s := range scores[1:] {
		k := riskKey(s, lowerIsRiskier)
		if k < previous {
			sorted = false
			break
		}
		previous = k
	}
	if sorted {
		return
	}
	workers := 1
	if n >= parallelSortRows && runtime.GOMAXPROCS(0) > 1 {
		workers = 2
	}
	// Encode the keys in place and count every digit of every key at once.
	hist := make([][digitPass][digitCount]int, workers)
	parts := splitRange(n, workers)
	var wg sync.WaitGroup
	for w := range workers {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			h := &hist[w]
			for i := parts[w]; i < parts[w+1]; i++ {
				k := riskKey(scores[i], lowerIsRiskier)
				scores[i] = math.Float64frombits(k)
				for p := range digitPass {
					h[p][(k>>(p*digitBits))&digitMask]++
				}
			}
		}(w)
	}
	wg.Wait()

	// The passes to run: skip a digit that every key shares.
	var active []int
	for p := range digitPass {
		d := (math.Float64bits(scores[0]) >> (p * digitBits)) & digitMask
		total := 0
		for w := range workers {
			total += hist[w][p][d]
		}
		if total != n {
			active = append(active, p)
		}
	}
	keys, keysTmp := scores, make([]float64, n)
	labs, labsTmp := labels, make([]bool, n)
	var wts, wtsTmp []float64
	if weights != nil {
		wts, wtsTmp = weights, make([]float64, n)
	}
	// partHist[w][d]: keys of digit d in part w of the current arrangement.
	partHist := make([][digitCount]int, workers)
	if len(active) > 0 {
		for w := range workers {
			partHist[w] = hist[w][active[0]]
		}
	}
	// nextHist[w][part][d]: digits of the next pass among the keys that
	// worker w writes into part; summed over w it is the next partHist.
	nextHist := make([][][digitCount]int, workers)
	for w := range nextHist {
		nextHist[w] = make([][digitCount]int, workers)
	}
	for a, p := range active {
		shift := uint(p * digitBits)
		nextShift, hasNext := uint(0), a+1 < len(active)
		if hasNext {
			nextShift = uint(active[a+1] * digitBits)
		}
		// offsets[w][d]: where worker w writes its first key of digit d, so
		// that each worker's keys follow those of the workers before it.
		offsets := make([][digitCount]int, workers)
		offset := 0
		for d := range digitCount {
			for w := range workers {
				offsets[w][d] = offset
				offset += partHist[w][d]
			}
		}
		for w := range workers {
			wg.Add(1)
			go func(w int) {
				defer wg.Done()
				next := &offsets[w]
				counts := nextHist[w]
				for part := range counts {
					counts[part] = [digitCount]int{}
				}
				boundary := parts[1] // only used with two workers
				for i := parts[w]; i < parts[w+1]; i++ {
					k := keys[i]
					bits := math.Float64bits(k)
					d := (bits >> shift) & digitMask
					at := next[d]
					keysTmp[at] = k
					labsTmp[at] = labs[i]
					if wts != nil {
						wtsTmp[at] = wts[i]
					}
					next[d] = at + 1
					if hasNext {
						part := 0
						if workers > 1 && at >= boundary {
							part = 1
						}
						counts[part][(bits>>nextShift)&digitMask]++
					}
				}
			}(w)
		}
		wg.Wait()
		keys, keysTmp = keysTmp, keys
		labs, labsTmp = labsTmp, labs
		wts, wtsTmp = wtsTmp, wts
		if hasNext {
			for part := range workers {
				partHist[part] = [digitCount]int{}
				for w := range workers {
					for d := range digitCount {
						partHist[part][d] += nextHist[w][part][d]
					}
				}
			}
		}
	}
	// Decode into the caller's slices.
	for w := range workers {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			for i := parts[w]; i < parts[w+1]; i++ {
				scores[i] = scoreOfKey(math.Float64bits(keys[i]), lowerIsRiskier)
			}
		}(w)
	}
	wg.Wait()
	if &labs[0] != &labels[0] {
		copy(labels, labs)
	}
	if weights != nil && &wts[0] != &weights[0] {
		copy(weights, wts)
	}
}

// splitRange cuts [0,n) into parts nearly equal parts: part w is
// [bounds[w], bounds[w+1]).
func splitRange(n, parts int) []int {
	bounds := make([]int, parts+1)
	for w := range parts + 1 {
		bounds[w] = n * w / parts
	}
	return bounds
}
