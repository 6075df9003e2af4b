package scores

import (
	"math"
	"sort"
	"sync"
)

// The block reader can rank a set while it is still being read: each block
// is sorted by the goroutine that parsed it (rankColumns, keys kept), and
// the sorted blocks, taken in input order, are merged into one run as they
// arrive. The result is the one rankInPlace gives the whole set: the order
// is riskiest first and, between equal keys, the input order, because runs
// are only ever merged with their neighbours and the earlier run wins ties.

// run is a stretch of rows in rank order, their scores held as keys (the
// bits of riskKey as float64s).
type run struct {
	keys     []float64
	labels   []bool
	segments []int32 // nil without segments
}

func (r run) len() int { return len(r.keys) }

func (r run) slice(lo, hi int) run {
	s := run{keys: r.keys[lo:hi], labels: r.labels[lo:hi]}
	if r.segments != nil {
		s.segments = r.segments[lo:hi]
	}
	return s
}

// parallelMergeRows is the size from which two runs are merged on two
// goroutines; a variable so that tests can reach the split with small sets.
var parallelMergeRows = 1 << 18

// mergeRuns merges a and b, a holding the earlier rows, into a new run.
// With decode the new run holds scores instead of keys.
func mergeRuns(a, b run, decode, lowerIsRiskier bool) run {
	n := a.len() + b.len()
	out := run{keys: make([]float64, n), labels: make([]bool, n)}
	if a.segments != nil {
		out.segments = make([]int32, n)
	}
	if n < parallelMergeRows {
		mergeInto(a, b, out)
		if decode {
			decodeKeys(out.keys, lowerIsRiskier)
		}
		return out
	}
	// Split both runs at one key: every row with a key up to it comes
	// before every row with a larger key, so the two halves merge apart.
	long := a
	if b.len() > a.len() {
		long = b
	}
	middle := math.Float64bits(long.keys[long.len()/2])
	i := sort.Search(a.len(), func(i int) bool { return math.Float64bits(a.keys[i]) > middle })
	j := sort.Search(b.len(), func(j int) bool { return math.Float64bits(b.keys[j]) > middle })
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		mergeInto(a.slice(i, a.len()), b.slice(j, b.len()), out.slice(i+j, n))
		if decode {
			decodeKeys(out.keys[i+j:], lowerIsRiskier)
		}
	}()
	mergeInto(a.slice(0, i), b.slice(0, j), out.slice(0, i+j))
	if decode {
		decodeKeys(out.keys[:i+j], lowerIsRiskier)
	}
	wg.Wait()
	return out
}

// mergeInto merges a and b into out, which has room for both; on equal
// keys a's rows come first. The loop picks each row without a branch on
// the keys, which in a merge of random scores would be mispredicted about
// every other row.
func mergeInto(a, b, out run) {
	var i, j, k int
	if out.segments == nil {
		i, j, k = mergeKeysLabels(a.keys, b.keys, a.labels, b.labels, out.keys, out.labels)
	} else {
		i, j, k = mergeWithSegments(a, b, out)
	}
	k += copyRun(a.slice(i, a.len()), out.slice(k, out.len()))
	copyRun(b.slice(j, b.len()), out.slice(k, out.len()))
}

// mergeKeysLabels merges until one side runs out and says how far it got
// in a, b and out. Each row is chosen with a mask rather than a branch.
func mergeKeysLabels(aKeys, bKeys []float64, aLabels, bLabels []bool, outKeys []float64, outLabels []bool) (i, j, k int) {
	aLabels, bLabels = aLabels[:len(aKeys)], bLabels[:len(bKeys)]
	for i < len(aKeys) && j < len(bKeys) && k < len(outKeys) && k < len(outLabels) {
		ka, kb := math.Float64bits(aKeys[i]), math.Float64bits(bKeys[j])
		la, lb := aLabels[i], bLabels[j]
		fromB := bit(kb < ka)
		mask := -fromB // all ones when b's row comes first
		outKeys[k] = math.Float64frombits(ka ^ (ka^kb)&mask)
		outLabels[k] = (bit(la)&^mask | bit(lb)&mask) != 0
		i += int(1 - fromB)
		j += int(fromB)
		k++
	}
	return i, j, k
}

// bit is 1 for true and 0 for false.
func bit(b bool) uint64 {
	if b {
		return 1
	}
	return 0
}

func mergeWithSegments(a, b, out run) (i, j, k int) {
	aKeys, bKeys, outKeys := a.keys, b.keys, out.keys
	aLabels, bLabels, outLabels := a.labels[:len(aKeys)], b.labels[:len(bKeys)], out.labels
	aSegments, bSegments, outSegments := a.segments[:len(aKeys)], b.segments[:len(bKeys)], out.segments
	for i < len(aKeys) && j < len(bKeys) && k < len(outKeys) && k < len(outLabels) && k < len(outSegments) {
		ka, kb := math.Float64bits(aKeys[i]), math.Float64bits(bKeys[j])
		la, lb := aLabels[i], bLabels[j]
		sa, sb := aSegments[i], bSegments[j]
		fromB := bit(kb < ka)
		mask := -fromB // all ones when b's row comes first
		outKeys[k] = math.Float64frombits(ka ^ (ka^kb)&mask)
		outLabels[k] = (bit(la)&^mask | bit(lb)&mask) != 0
		outSegments[k] = sa ^ (sa^sb)&int32(mask)
		i += int(1 - fromB)
		j += int(fromB)
		k++
	}
	return i, j, k
}

func copyRun(from, to run) int {
	copy(to.labels, from.labels)
	if from.segments != nil {
		copy(to.segments, from.segments)
	}
	return copy(to.keys, from.keys)
}

// runMerger merges sorted runs, given in input order, as they come: it
// keeps a stack of runs of falling length and merges the top two whenever
// the newer is at least as long as the one below it, so that every row is
// moved about log2(runs) times.
type runMerger struct {
	in     chan run
	result chan run
}

func newRunMerger(lowerIsRiskier bool) *runMerger {
	m := &runMerger{in: make(chan run, 1024), result: make(chan run, 1)}
	go func() {
		var stack []run
		mergeTop := func(decode bool) {
			top := len(stack) - 1
			stack = append(stack[:top-1], mergeRuns(stack[top-1], stack[top], decode, lowerIsRiskier))
		}
		for r := range m.in {
			stack = append(stack, r)
			for len(stack) >= 2 && stack[len(stack)-2].len() <= stack[len(stack)-1].len() {
				mergeTop(false)
			}
		}
		if len(stack) == 0 {
			m.result <- run{}
			return
		}
		if len(stack) == 1 {
			decodeRun(stack[0], lowerIsRiskier)
		}
		for len(stack) >= 2 {
			mergeTop(len(stack) == 2) // the last merge decodes as it goes
		}
		m.result <- stack[0]
	}()
	return m
}

// add hands the merger the next run in input order.
func (m *runMerger) add(r run) { m.in <- r }

// finish waits for every run to be merged and returns the one run, its
// keys decoded into scores.
func (m *runMerger) finish() run {
	close(m.in)
	return <-m.result
}

// decodeRun turns the keys of a merged run back into scores, on two
// goroutines for a large run.
func decodeRun(r run, lowerIsRiskier bool) {
	if r.len() < parallelMergeRows {
		decodeKeys(r.keys, lowerIsRiskier)
		return
	}
	half := r.len() / 2
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		decodeKeys(r.keys[half:], lowerIsRiskier)
	}()
	decodeKeys(r.keys[:half], lowerIsRiskier)
	wg.Wait()
}
