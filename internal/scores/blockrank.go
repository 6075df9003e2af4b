package scores

import (
	"math"
	"math/bits"
	"runtime"
	"sync"
	"sync/atomic"
)

// The block reader can rank a set while it is still being read. Each block
// is bucketed by the goroutine that parsed it: its scores become keys (the
// bits of riskKey) and its rows are grouped, in input order within each
// group, by one radix digit of the key that the first block fixes for the
// whole read. When the last block is in, each bucket's pieces are taken
// from the blocks in input order and sorted by the bits below the digit,
// the buckets shared out between both cores. The result is the one
// rankInPlace gives the whole set: riskiest first and, between equal keys,
// the input order, because every step is stable and the buckets follow
// each other in key order.
//
// The digit is the top bucketBits bits below the prefix that the first
// block's keys share. Keys of later blocks whose prefix is smaller or
// larger go to a bucket before or after the digit's (their range is not
// known in advance, so they are sorted by every bit); so does every key
// when the first block has no rows, with the digit then the key's top
// bits.

// bigBucketRows is the size from which a bucket of the block reader is
// ranked on its own, on both cores (see rankBuckets); a variable so that
// tests can reach it with small sets.
var bigBucketRows = parallelSortRows

// blockBuckets counts the buckets of a read: the keys below the first
// block's prefix, the values of the digit, and the keys above.
const blockBuckets = bucketCount + 2

// blockDigit is the digit the blocks of one read are bucketed on. ready is
// closed once the first block has fixed it; the fields are read only
// after that.
type blockDigit struct {
	ready  chan struct{}
	shift  uint   // the digit is bits [shift, shift+bucketBits) of a key
	prefix uint64 // key>>(shift+bucketBits) of a key in the digit's buckets
}

func newBlockDigit() *blockDigit { return &blockDigit{ready: make(chan struct{})} }

// fix sets the digit from the smallest and largest key of the first block
// (any when it has no rows) and releases the blocks waiting for it.
func (d *blockDigit) fix(low, high uint64, rows int) {
	d.shift = 64 - bucketBits
	if rows > 0 {
		varying := 64 - bits.LeadingZeros64(low^high)
		d.shift = uint(max(0, varying-bucketBits))
		d.prefix = low >> (d.shift + bucketBits)
	}
	close(d.ready)
}

// bucket returns the bucket of key: 0 below the prefix, 1 + the digit,
// blockBuckets-1 above.
func (d *blockDigit) bucket(key uint64) int {
	top := key >> (d.shift + bucketBits) // 0 when the digit is the top bits
	b := 1 + int((key>>d.shift)&(bucketCount-1))
	if top < d.prefix {
		b = 0
	}
	if top > d.prefix {
		b = blockBuckets - 1
	}
	return b
}

// bucketBlock turns the scores of a parsed block into keys and groups its
// rows by bucket, keeping their order within each; blk.starts[b] is where
// bucket b begins. The first block (seq 0) fixes the digit, later ones
// wait for it. A block that failed to parse only fixes the digit when it
// is the first, so that no block waits for ever.
func (p *blockParser) bucketBlock(blk *block) {
	d := p.digit
	n := len(blk.scores)
	if blk.event != nil {
		if blk.seq == 0 {
			d.fix(0, 0, 0)
		}
		return
	}
	lowerIsRiskier := p.b.opt.LowerIsRiskier
	starts := make([]int32, blockBuckets+1)
	if blk.seq == 0 {
		low, high, _ := encodeKeys(blk.scores, []int{0, n}, lowerIsRiskier)
		d.fix(low, high, n)
		for _, k := range blk.scores {
			starts[d.bucket(math.Float64bits(k))+1]++
		}
	} else {
		<-d.ready
		// Turn the scores into keys and count them in one pass.
		for i, score := range blk.scores {
			k := riskKey(score, lowerIsRiskier)
			blk.scores[i] = math.Float64frombits(k)
			starts[d.bucket(k)+1]++
		}
	}
	for b := range blockBuckets {
		starts[b+1] += starts[b]
	}
	next := make([]int32, blockBuckets)
	copy(next, starts)
	keys := make([]float64, n)
	labels := make([]bool, n)
	var segments []int32
	if blk.segments != nil {
		segments = make([]int32, n)
	}
	for i, k := range blk.scores {
		b := d.bucket(math.Float64bits(k))
		j := next[b]
		keys[j], labels[j] = k, blk.labels[i]
		if segments != nil {
			segments[j] = blk.segments[i]
		}
		next[b] = j + 1
	}
	select {
	case p.spare <- blockColumns{blk.scores[:0], blk.labels[:0], nil}:
	default:
	}
	blk.scores, blk.labels, blk.segments, blk.starts = keys, labels, segments, starts
}

// bucketedBlock is a block's rows grouped by bucket (see bucketBlock).
type bucketedBlock struct {
	rows   bucketColumns
	starts []int32
}

// rankBuckets returns the rows of the bucketed blocks, given in input
// order, in rank order, their keys decoded into scores; rows is their
// number. Buckets of at least a quarter of the rows (and at least
// bigBucketRows) are ranked after the others, each on both cores.
func rankBuckets(blocks []bucketedBlock, rows int, d *blockDigit, lowerIsRiskier bool) bucketColumns {
	out := bucketColumns{keys: make([]float64, rows), labels: make([]bool, rows)}
	if len(blocks) > 0 && blocks[0].rows.segments != nil {
		out.segments = make([]int32, rows)
	}
	var start [blockBuckets + 1]int
	for _, blk := range blocks {
		for b := range blockBuckets {
			start[b+1] += int(blk.starts[b+1] - blk.starts[b])
		}
	}
	largest := 0
	big := max(bigBucketRows, rows/4)
	for b := range blockBuckets {
		if size := start[b+1]; size < big {
			largest = max(largest, size)
		}
		start[b+1] += start[b]
	}
	var claimed atomic.Int64
	var wg sync.WaitGroup
	for range max(1, min(2, runtime.GOMAXPROCS(0))) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			scratch := newBucketColumns(largest, out.segments != nil)
			for {
				b := int(claimed.Add(1) - 1)
				if b >= blockBuckets {
					return
				}
				lo, hi := start[b], start[b+1]
				if hi-lo >= big || hi == lo {
					continue
				}
				gather(blocks, b, scratch)
				bits := uint(64) // the buckets outside the digit's, by every bit
				if b > 0 && b < blockBuckets-1 {
					bits = d.shift
				}
				to := out.slice(lo, hi)
				sortInto(scratch.slice(0, hi-lo), to, bits)
				decodeKeys(to.keys, lowerIsRiskier)
			}
		}()
	}
	wg.Wait()
	for b := range blockBuckets {
		if lo, hi := start[b], start[b+1]; hi-lo >= big {
			to := out.slice(lo, hi)
			gather(blocks, b, to)
			decodeKeys(to.keys, lowerIsRiskier)
			rankInPlace(to.keys, to.labels, nil, to.segments, lowerIsRiskier)
		}
	}
	return out
}

// gather copies bucket b of every block, in input order, to the start of
// to, which has room for them.
func gather(blocks []bucketedBlock, b int, to bucketColumns) {
	at := 0
	for _, blk := range blocks {
		lo, hi := blk.starts[b], blk.starts[b+1]
		if hi == lo {
			continue
		}
		copy(to.keys[at:], blk.rows.keys[lo:hi])
		copy(to.labels[at:], blk.rows.labels[lo:hi])
		if to.segments != nil {
			copy(to.segments[at:], blk.rows.segments[lo:hi])
		}
		at += int(hi - lo)
	}
}

// newBucketColumns makes columns of n rows for keys, labels and, when
// segmented, segments.
func newBucketColumns(n int, segmented bool) bucketColumns {
	c := bucketColumns{keys: make([]float64, n), labels: make([]bool, n)}
	if segmented {
		c.segments = make([]int32, n)
	}
	return c
}
