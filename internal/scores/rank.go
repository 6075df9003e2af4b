package scores

import (
	"math"
	"math/bits"
	"runtime"
	"sync"
	"sync/atomic"
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

// The in-place sort first spreads the keys into buckets by their top
// bucketBits varying bits (one pass over the whole set), then sorts each
// bucket, which mostly fits in the processor's cache, by its remaining bits
// with a byte-wise least-significant-digit radix sort.
const (
	bucketBits  = 12
	bucketCount = 1 << bucketBits
	// smallBucket is the size below which a bucket is sorted by insertion.
	smallBucket = 48
)

// parallelSortRows is the size from which rankInPlace uses two goroutines.
const parallelSortRows = 1 << 16

// rankInPlace sorts scores riskiest first, carrying labels and (when not
// nil) weights and segments along, keeping the read order of ties. It sorts the keys
// themselves rather than a permutation: the scores slice holds the keys
// during the sort and gets its scores back, decoded from them, at the end,
// so the extra memory is one more copy of the columns being sorted and no
// index. Minus zero comes back as plus zero.
func rankInPlace(scores []float64, labels []bool, weights []float64, segments []int32, lowerIsRiskier bool) {
	workers := 1
	if len(scores) >= parallelSortRows && runtime.GOMAXPROCS(0) > 1 {
		workers = 2
	}
	rankColumns(scores, labels, weights, segments, lowerIsRiskier, workers)
}

// rankColumns is rankInPlace on the given number of goroutines (1 or 2).
func rankColumns(scores []float64, labels []bool, weights []float64, segments []int32, lowerIsRiskier bool, workers int) {
	n := len(scores)
	if n < 2 {
		return
	}
	parts := splitRange(n, workers)
	low, high, sorted := encodeKeys(scores, parts, lowerIsRiskier)
	if sorted || low == high {
		decodeKeys(scores, lowerIsRiskier)
		return
	}
	var wg sync.WaitGroup
	// The bucket digit: the top bucketBits bits below the prefix all keys share.
	varying := 64 - bits.LeadingZeros64(low^high)
	shift := uint(max(0, varying-bucketBits))

	// Spread the keys into buckets, from scores into keys.
	hist := make([][bucketCount]int, workers)
	for w := range workers {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			h := &hist[w]
			for i := parts[w]; i < parts[w+1]; i++ {
				h[(math.Float64bits(scores[i])>>shift)&(bucketCount-1)]++
			}
		}(w)
	}
	wg.Wait()
	// next[w][d]: where worker w writes its next key of bucket d, so that
	// each worker's keys follow those of the workers before it.
	next := make([][bucketCount]int, workers)
	var bucketStart [bucketCount + 1]int
	offset := 0
	for d := range bucketCount {
		bucketStart[d] = offset
		for w := range workers {
			next[w][d] = offset
			offset += hist[w][d]
		}
	}
	bucketStart[bucketCount] = n
	keys := make([]float64, n)
	labs := make([]bool, n)
	var wts []float64
	if weights != nil {
		wts = make([]float64, n)
	}
	var segs []int32
	if segments != nil {
		segs = make([]int32, n)
	}
	for w := range workers {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			at := &next[w]
			for i := parts[w]; i < parts[w+1]; i++ {
				k := scores[i]
				d := (math.Float64bits(k) >> shift) & (bucketCount - 1)
				j := at[d]
				keys[j] = k
				labs[j] = labels[i]
				if wts != nil {
					wts[j] = weights[i]
				}
				if segs != nil {
					segs[j] = segments[i]
				}
				at[d] = j + 1
			}
		}(w)
	}
	wg.Wait()

	// Sort each bucket by the bits below the bucket digit, using the
	// caller's slices as scratch, and decode the keys back into them.
	var claimed atomic.Int64
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				d := int(claimed.Add(1) - 1)
				if d >= bucketCount {
					return
				}
				lo, hi := bucketStart[d], bucketStart[d+1]
				if hi == lo {
					continue
				}
				c := bucketColumns{keys: keys[lo:hi], labels: labs[lo:hi]}
				scratch := bucketColumns{keys: scores[lo:hi], labels: labels[lo:hi]}
				if wts != nil {
					c.weights, scratch.weights = wts[lo:hi], weights[lo:hi]
				}
				if segs != nil {
					c.segments, scratch.segments = segs[lo:hi], segments[lo:hi]
				}
				sortInto(c, scratch, shift)
				for i, k := range scratch.keys {
					scratch.keys[i] = scoreOfKey(math.Float64bits(k), lowerIsRiskier)
				}
			}
		}()
	}
	wg.Wait()
}

// encodeKeys turns scores into their risk keys in place, one goroutine per
// part (parts as splitRange gives them), and returns the smallest and
// largest key and whether the keys are in order already.
func encodeKeys(scores []float64, parts []int, lowerIsRiskier bool) (low, high uint64, sorted bool) {
	workers := len(parts) - 1
	var wg sync.WaitGroup
	type span struct {
		low, high uint64
		sorted    bool
	}
	spans := make([]span, workers)
	for w := range workers {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			sp := span{low: math.MaxUint64, sorted: true}
			previous := uint64(0)
			for i := parts[w]; i < parts[w+1]; i++ {
				k := riskKey(scores[i], lowerIsRiskier)
				scores[i] = math.Float64frombits(k)
				sp.low, sp.high = min(sp.low, k), max(sp.high, k)
				if k < previous {
					sp.sorted = false
				}
				previous = k
			}
			spans[w] = sp
		}(w)
	}
	wg.Wait()
	low, high, sorted = uint64(math.MaxUint64), uint64(0), true
	for w, sp := range spans {
		low, high = min(low, sp.low), max(high, sp.high)
		sorted = sorted && sp.sorted
		if w > 0 && math.Float64bits(scores[parts[w]-1]) > math.Float64bits(scores[parts[w]]) {
			sorted = false
		}
	}
	return low, high, sorted
}

// bucketColumns is one bucket of keys and the columns carried with them.
type bucketColumns struct {
	keys     []float64 // key bits
	labels   []bool
	weights  []float64 // nil when unweighted
	segments []int32   // nil without segments
}

// sortInto sorts from stably by the key bits below bits (the bits above
// are the same in every key) and leaves the result in to, which has the
// same length; from's contents are lost. It is a most-significant-digit
// radix sort, a byte a level, that ends in insertion sorts of short runs.
func sortInto(from, to bucketColumns, bits uint) {
	n := len(from.keys)
	if n < smallBucket || bits == 0 {
		if bits > 0 {
			insertionSort(from)
		}
		from.copyTo(to)
		return
	}
	var next bool
	if bits, next = narrow(from, bits); !next {
		from.copyTo(to) // every key is the same
		return
	}
	digitBits := min(8, bits)
	shift := bits - digitBits
	var offsets [257]int
	scatter(from, to, shift, digitBits, &offsets)
	for d := range 1 << digitBits {
		if lo, hi := offsets[d], offsets[d+1]; hi-lo > 1 {
			sortHere(to.slice(lo, hi), from.slice(lo, hi), shift)
		}
	}
}

// sortHere is sortInto with the result left in a; scratch is room of the
// same length.
func sortHere(a, scratch bucketColumns, bits uint) {
	n := len(a.keys)
	if n < smallBucket || bits == 0 {
		if bits > 0 {
			insertionSort(a)
		}
		return
	}
	bits, next := narrow(a, bits)
	if !next {
		return
	}
	digitBits := min(8, bits)
	shift := bits - digitBits
	var offsets [257]int
	scatter(a, scratch, shift, digitBits, &offsets)
	for d := range 1 << digitBits {
		lo, hi := offsets[d], offsets[d+1]
		switch {
		case hi-lo == 1:
			a.keys[lo], a.labels[lo] = scratch.keys[lo], scratch.labels[lo]
			if a.weights != nil {
				a.weights[lo] = scratch.weights[lo]
			}
			if a.segments != nil {
				a.segments[lo] = scratch.segments[lo]
			}
		case hi > lo:
			sortInto(scratch.slice(lo, hi), a.slice(lo, hi), shift)
		}
	}
}

// narrow returns how many low bits still vary among the keys of c, at
// most width; next is false when every key is the same.
func narrow(c bucketColumns, width uint) (uint, bool) {
	first := math.Float64bits(c.keys[0])
	var differ uint64
	for _, k := range c.keys[1:] {
		differ |= math.Float64bits(k) ^ first
	}
	differ &= 1<<width - 1
	if differ == 0 {
		return 0, false
	}
	return uint(64 - bits.LeadingZeros64(differ)), true
}

// scatter moves from into to, stably by the digit of digitBits bits at
// shift; offsets[d] is where digit d starts in to, offsets[1<<digitBits]
// the end.
func scatter(from, to bucketColumns, shift, digitBits uint, offsets *[257]int) {
	mask := uint64(1)<<digitBits - 1
	var counts [256]int
	for _, k := range from.keys {
		counts[(math.Float64bits(k)>>shift)&mask]++
	}
	offset := 0
	for d := range 1 << digitBits {
		offsets[d] = offset
		offset += counts[d]
	}
	offsets[1<<digitBits] = offset
	next := counts
	for d := range 1 << digitBits {
		next[d] = offsets[d]
	}
	for i, k := range from.keys {
		d := (math.Float64bits(k) >> shift) & mask
		j := next[d]
		to.keys[j] = k
		to.labels[j] = from.labels[i]
		if from.weights != nil {
			to.weights[j] = from.weights[i]
		}
		if from.segments != nil {
			to.segments[j] = from.segments[i]
		}
		next[d] = j + 1
	}
}

func (c bucketColumns) slice(lo, hi int) bucketColumns {
	s := bucketColumns{keys: c.keys[lo:hi], labels: c.labels[lo:hi]}
	if c.weights != nil {
		s.weights = c.weights[lo:hi]
	}
	if c.segments != nil {
		s.segments = c.segments[lo:hi]
	}
	return s
}

func (c bucketColumns) copyTo(to bucketColumns) {
	copy(to.keys, c.keys)
	copy(to.labels, c.labels)
	if c.weights != nil {
		copy(to.weights, c.weights)
	}
	if c.segments != nil {
		copy(to.segments, c.segments)
	}
}

// insertionSort sorts a short bucket stably by key.
func insertionSort(c bucketColumns) {
	for i := 1; i < len(c.keys); i++ {
		k, label := c.keys[i], c.labels[i]
		var weight float64
		if c.weights != nil {
			weight = c.weights[i]
		}
		var segment int32
		if c.segments != nil {
			segment = c.segments[i]
		}
		j := i
		for ; j > 0 && math.Float64bits(c.keys[j-1]) > math.Float64bits(k); j-- {
			c.keys[j] = c.keys[j-1]
			c.labels[j] = c.labels[j-1]
			if c.weights != nil {
				c.weights[j] = c.weights[j-1]
			}
			if c.segments != nil {
				c.segments[j] = c.segments[j-1]
			}
		}
		c.keys[j], c.labels[j] = k, label
		if c.weights != nil {
			c.weights[j] = weight
		}
		if c.segments != nil {
			c.segments[j] = segment
		}
	}
}

// decodeKeys turns keys held in scores back into scores.
func decodeKeys(scores []float64, lowerIsRiskier bool) {
	for i, k := range scores {
		scores[i] = scoreOfKey(math.Float64bits(k), lowerIsRiskier)
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
