package scores

import "math"

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
