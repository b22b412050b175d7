package fitcore

import (
	"math"
	"sort"
)

// Sorting helpers for the checks. Samples of ckMSDMin values or more start
// with a most significant digit pass (ckSortFloats, orderLarge). Large samples are sorted by a least
// significant digit radix sort on order-preserving integer keys (Knuth, The
// Art of Computer Programming, vol. 3, §5.2.5): six stable counting passes of
// 11 bits over the 64-bit keys, skipping a pass when every key has the same
// digit there, so the cost is O(n) with a small constant and never worse than
// O(n log n). Small samples use package sort's interface sort (sort.Sort),
// which the standard library links into the browser build anyway: a
// generic sort (slices.Sort, slices.SortFunc) would add an instantiation of
// its own, 6 to 15 kB of app.wasm each (DEVELOPERS.md, "Fifth cut").

// ckRadixMin is the sample size from which the radix sort is used; below it
// the comparison sort is faster.
const ckRadixMin = 512

const (
	ckRadixBits   = 11
	ckRadixSize   = 1 << ckRadixBits
	ckRadixPasses = 6 // ⌈64/11⌉; ckRadixCount is written out for six
)

// ckSortKey maps a float64 to a uint64 whose unsigned order is the numeric
// order of the (non-NaN) floats; −0 sorts just before +0.
func ckSortKey(v float64) uint64 {
	b := math.Float64bits(v)
	if b>>63 != 0 {
		return ^b
	}
	return b | 1<<63
}

// ckFromKey inverts ckSortKey.
func ckFromKey(k uint64) float64 {
	if k>>63 != 0 {
		return math.Float64frombits(k &^ (1 << 63))
	}
	return math.Float64frombits(^k)
}

// ckSortBuf holds the work space of the sorts, so that one analysis (and
// the refits of its advice) allocates it once.
type ckSortBuf struct {
	k1, k2 []uint64
	p1, p2 []ckKeyIdx
	idx    []int32
	f      []float64 // sorted values
	cnt    []int32   // ckSortFloats's and orderLarge's counters
	// orderBucket's counters for its three depths and its work space
	deep [3][]int32
	tmp  []int32

	// Shapiro–Wilk's coefficients by sample size: they depend on n only,
	// so the advice's refits, which share this buffer, work them out once.
	swA map[int][]float64
}

// swCoef returns swCoefficients(n), computed once per buffer.
func (b *ckSortBuf) swCoef(n int) []float64 {
	if a, ok := b.swA[n]; ok {
		return a
	}
	if b.swA == nil {
		b.swA = make(map[int][]float64, 3)
	}
	a := swCoefficients(n)
	b.swA[n] = a
	return a
}

func ckGrowU64(b []uint64, n int) []uint64 {
	if cap(b) < n {
		return make([]uint64, n)
	}
	return b[:n]
}

func ckGrowI32(b []int32, n int) []int32 {
	if cap(b) < n {
		return make([]int32, n)
	}
	return b[:n]
}

func ckGrowF64(b []float64, n int) []float64 {
	if cap(b) < n {
		return make([]float64, n)
	}
	return b[:n]
}

// ckRadixCount counts the six digits of k (written out: this loop is the
// hot spot of the sort).
func ckRadixCount(cnt *[ckRadixPasses][ckRadixSize]int32, k uint64) {
	const m = ckRadixSize - 1
	cnt[0][k&m]++
	cnt[1][(k>>ckRadixBits)&m]++
	cnt[2][(k>>(2*ckRadixBits))&m]++
	cnt[3][(k>>(3*ckRadixBits))&m]++
	cnt[4][(k>>(4*ckRadixBits))&m]++
	cnt[5][(k>>(5*ckRadixBits))&m]++
}

// ckRadixOffsets turns the per-digit counts of n keys into starting
// offsets and says which passes are needed (a pass where every key has the
// digit of the key k0 would move nothing).
func ckRadixOffsets(k0 uint64, n int32, cnt *[ckRadixPasses][ckRadixSize]int32) (need [ckRadixPasses]bool) {
	for p := range ckRadixPasses {
		d := (k0 >> (p * ckRadixBits)) & (ckRadixSize - 1)
		need[p] = cnt[p][d] != n
		var sum int32
		for d := range cnt[p] {
			c := cnt[p][d]
			cnt[p][d] = sum
			sum += c
		}
	}
	return need
}

// ckRadixKeys sorts keys ascending using tmp (same length) as work space
// and returns the slice that holds the result (keys or tmp).
func ckRadixKeys(keys, tmp []uint64) []uint64 {
	var cnt [ckRadixPasses][ckRadixSize]int32
	for _, k := range keys {
		ckRadixCount(&cnt, k)
	}
	need := ckRadixOffsets(keys[0], int32(len(keys)), &cnt)
	src, dst := keys, tmp
	for p := range ckRadixPasses {
		if !need[p] {
			continue
		}
		c := &cnt[p]
		sh := uint(p * ckRadixBits)
		for _, k := range src {
			d := (k >> sh) & (ckRadixSize - 1)
			dst[c[d]] = k
			c[d]++
		}
		src, dst = dst, src
	}
	return src
}

// ckKeyIdx is a sort key with the position of its value.
type ckKeyIdx struct {
	k uint64
	i int32
}

// ckKeyIdxSlice sorts pairs by key, then by position (sort.Interface).
type ckKeyIdxSlice []ckKeyIdx

func (s ckKeyIdxSlice) Len() int      { return len(s) }
func (s ckKeyIdxSlice) Swap(i, j int) { s[i], s[j] = s[j], s[i] }
func (s ckKeyIdxSlice) Less(i, j int) bool {
	return s[i].k < s[j].k || (s[i].k == s[j].k && s[i].i < s[j].i)
}

// ckRadixPairs sorts p ascending by key, stable (equal keys keep their
// order), with tmp (same length) as work space, and returns the slice that
// holds the result (p or tmp).
func ckRadixPairs(p, tmp []ckKeyIdx) []ckKeyIdx {
	var cnt [ckRadixPasses][ckRadixSize]int32
	for _, e := range p {
		ckRadixCount(&cnt, e.k)
	}
	need := ckRadixOffsets(p[0].k, int32(len(p)), &cnt)
	src, dst := p, tmp
	for q := range ckRadixPasses {
		if !need[q] {
			continue
		}
		c := &cnt[q]
		sh := uint(q * ckRadixBits)
		for _, e := range src {
			d := (e.k >> sh) & (ckRadixSize - 1)
			dst[c[d]] = e
			c[d]++
		}
		src, dst = dst, src
	}
	return src
}

// ckMSDMin is the number of values from which ckSortFloats starts with a most
// significant digit pass: below it (Shapiro–Wilk's groups of at most 5000)
// the whole sort fits in the cache and ckRadixKeys is as fast.
const ckMSDMin = 1 << 15

const (
	ckMSDBits = 16 // the first, most significant, digit
	ckLowBits = 8  // the digits of the rest, bits 0 … 47
	ckLowSize = 1 << ckLowBits
	ckLowPass = (64 - ckMSDBits) / ckLowBits
	ckInsMax  = 48 // a bucket this small is sorted by insertion
)

// topBuckets returns b.cnt set to the start of each bucket of v's values
// by the top 16 bits of their keys (ckSortKey), and the size of the
// largest bucket.
func (b *ckSortBuf) topBuckets(v []float64) (cnt []int32, most int32) {
	if b.cnt == nil {
		b.cnt = make([]int32, 1<<ckMSDBits)
	}
	cnt = b.cnt[:1<<ckMSDBits]
	clear(cnt)
	for _, a := range v {
		cnt[ckSortKey(a)>>(64-ckMSDBits)]++
	}
	var sum int32
	for d, c := range cnt {
		cnt[d] = sum
		sum += c
		most = max(most, c)
	}
	return cnt, most
}

// ckSortFloats sets out (len(v) long, not v) to the values of v sorted
// ascending, for a large sample (ckMSDMin values or more): one counting
// pass and one move deal the values into out in buckets by the top 16 bits
// of their keys (ckSortKey: sign, exponent and 4 bits of the fraction;
// b.cnt, 2^16 counters, is the work space); the values of a record of
// residuals fill a few hundred of them, so the move writes to few places
// at once, and each bucket, a few thousand values for such a record, is
// then sorted as keys on their lower 48 bits inside the cache (ckSortLow:
// by insertion when it holds at most ckInsMax keys, else by six stable
// counting passes of 8 bits, skipping a pass where every key of the bucket
// has the same digit) and written back as values. The keys and their work
// space (b.k1, b.k2) are one bucket long, as long as the largest bucket,
// so beside its result the sort needs little more than the counters
// (until 4 December the keys of the whole sample and their work space:
// 16 bytes a value; DEVELOPERS.md, "Memory of a big fit"). The result is
// that of ckRadixKeys (a sort of integers has one answer;
// TestSortKeysAgainstRadix compares them). A sample whose values all share
// their top 16 bits costs about what ckRadixKeys costs.
func ckSortFloats(v, out []float64, b *ckSortBuf) {
	cnt, most := b.topBuckets(v)
	for _, a := range v {
		d := ckSortKey(a) >> (64 - ckMSDBits)
		out[cnt[d]] = a
		cnt[d]++
	}
	// cnt[d] is now the end of bucket d in out.
	b.k1 = ckGrowU64(b.k1, int(most))
	b.k2 = ckGrowU64(b.k2, int(most))
	var start int32
	for _, end := range cnt {
		if end-start > 1 {
			bucket, keys := out[start:end], b.k1[:end-start]
			for i, a := range bucket {
				keys[i] = ckSortKey(a)
			}
			ckSortLow(keys, b.k2[:end-start])
			for i, k := range keys {
				bucket[i] = ckFromKey(k)
			}
		}
		start = end
	}
}

// ckSortLow sorts b, whose keys share their top 16 bits, ascending in
// place, using w (same length) as work space.
func ckSortLow(b, w []uint64) {
	if len(b) <= ckInsMax {
		for i := 1; i < len(b); i++ {
			k := b[i]
			j := i
			for j > 0 && b[j-1] > k {
				b[j] = b[j-1]
				j--
			}
			b[j] = k
		}
		return
	}
	var cnt [ckLowPass][ckLowSize]int32
	for _, k := range b {
		cnt[0][k&(ckLowSize-1)]++
		cnt[1][(k>>ckLowBits)&(ckLowSize-1)]++
		cnt[2][(k>>(2*ckLowBits))&(ckLowSize-1)]++
		cnt[3][(k>>(3*ckLowBits))&(ckLowSize-1)]++
		cnt[4][(k>>(4*ckLowBits))&(ckLowSize-1)]++
		cnt[5][(k>>(5*ckLowBits))&(ckLowSize-1)]++
	}
	n := int32(len(b))
	src, dst := b, w
	for p := range ckLowPass {
		sh := uint(p * ckLowBits)
		c := &cnt[p]
		if c[(b[0]>>sh)&(ckLowSize-1)] == n {
			continue // every key has this digit
		}
		var sum int32
		for d := range c {
			v := c[d]
			c[d] = sum
			sum += v
		}
		for _, k := range src {
			d := (k >> sh) & (ckLowSize - 1)
			dst[c[d]] = k
			c[d]++
		}
		src, dst = dst, src
	}
	if &src[0] != &b[0] {
		copy(b, src)
	}
}

// sortedCopy returns the values of v sorted ascending in a slice owned by b
// (valid until the next use of b). v must hold no NaN.
func (b *ckSortBuf) sortedCopy(v []float64) []float64 {
	n := len(v)
	b.f = ckGrowF64(b.f, n)
	out := b.f
	switch {
	case n < ckRadixMin:
		copy(out, v)
		//lint:ignore S1032 sort.Float64s is slices.Sort, a generic sort of its own in app.wasm
		sort.Sort(sort.Float64Slice(out))
	case n < ckMSDMin:
		for i, k := range b.radixKeys(v) {
			out[i] = ckFromKey(k)
		}
	default:
		ckSortFloats(v, out, b)
	}
	return out
}

// sortInPlace sorts v ascending, using b's key space. v must hold no NaN.
func (b *ckSortBuf) sortInPlace(v []float64) {
	switch n := len(v); {
	case n < ckRadixMin:
		//lint:ignore S1032 sort.Float64s is slices.Sort, a generic sort of its own in app.wasm
		sort.Sort(sort.Float64Slice(v))
	case n < ckMSDMin:
		for i, k := range b.radixKeys(v) {
			v[i] = ckFromKey(k)
		}
	default:
		copy(v, b.sortedCopy(v))
	}
}

// radixKeys returns the keys (ckSortKey) of v sorted ascending by
// ckRadixKeys, in b.k1 or b.k2.
func (b *ckSortBuf) radixKeys(v []float64) []uint64 {
	n := len(v)
	b.k1 = ckGrowU64(b.k1, n)
	b.k2 = ckGrowU64(b.k2, n)
	for i, a := range v {
		b.k1[i] = ckSortKey(a)
	}
	return ckRadixKeys(b.k1, b.k2)
}

// ckAscending says whether v is already in ascending order (−0 before +0).
func ckAscending(v []float64) bool {
	for i := 1; i < len(v); i++ {
		if ckSortKey(v[i-1]) > ckSortKey(v[i]) {
			return false
		}
	}
	return true
}

// order returns the positions of v in ascending order of value, equal
// values in order of position, in a slice owned by b (valid until the next
// use of b). v must hold no NaN and len(v) < 2³¹.
func (b *ckSortBuf) order(v []float64) []int32 {
	n := len(v)
	b.idx = ckGrowI32(b.idx, n)
	if ckAscending(v) {
		for i := range b.idx {
			b.idx[i] = int32(i)
		}
		return b.idx
	}
	if n >= ckMSDMin {
		b.orderLarge(v)
		return b.idx
	}
	p1, p2 := b.pairs(n)
	for i, a := range v {
		p1[i] = ckKeyIdx{ckSortKey(a), int32(i)}
	}
	var sorted []ckKeyIdx
	if n < ckRadixMin {
		// Ordered by key, then position: one answer, that of a stable
		// sort by key.
		sort.Sort(ckKeyIdxSlice(p1))
		sorted = p1
	} else {
		sorted = ckRadixPairs(p1, p2)
	}
	for j, e := range sorted {
		b.idx[j] = e.i
	}
	return b.idx
}

// pairs returns b's two spaces of n key–position pairs.
func (b *ckSortBuf) pairs(n int) (p1, p2 []ckKeyIdx) {
	if cap(b.p1) < n {
		b.p1 = make([]ckKeyIdx, n)
		b.p2 = make([]ckKeyIdx, n)
	}
	return b.p1[:n], b.p2[:n]
}

// ckPairMax is the largest bucket orderLarge sorts as key–position pairs
// (b.p1 and b.p2, 16 bytes a pair each: 2 MiB in all); a larger bucket is
// dealt again by its next 16 bits.
const ckPairMax = 1 << 16

// orderLarge sets b.idx (len(v) long) to the positions of v in ascending
// order of value, equal values in order of position, with little work
// space beside the positions (which the result is): one counting pass and
// one stable move deal the positions into buckets by the top 16 bits of
// their values' keys (b.cnt), each bucket is then sorted as key–position
// pairs, gathered from v, by ckSortLowPairs in the cache (orderBucket).
// Until 4 December the whole sort ran on pairs: 32 bytes a value of work
// space beside the 4 of the result, the largest part of the heap of
// `pairline fit --no-advice` on 10⁶ rows; now it needs 2 MiB of pairs
// and, only where one bucket holds more than ckPairMax values, 4 bytes a
// value of that bucket. The answer is the same (a sort by key, then
// position, has one; TestOrderLarge compares it with a stable sort).
func (b *ckSortBuf) orderLarge(v []float64) {
	idx := b.idx
	cnt, most := b.topBuckets(v)
	b.pairs(min(int(most), ckPairMax)) // made once, at its largest
	for i, a := range v {
		d := ckSortKey(a) >> (64 - ckMSDBits)
		idx[cnt[d]] = int32(i)
		cnt[d]++
	}
	// cnt[d] is now the end of bucket d; each bucket is in position order.
	var start int32
	for _, end := range cnt {
		if end-start > 1 {
			b.orderBucket(v, idx[start:end], 64-ckMSDBits)
		}
		start = end
	}
}

// orderBucket sorts idx, positions in ascending order whose values' keys
// agree in every bit from bit low up, by key and then position: as pairs
// when there are at most ckPairMax of them, else by a stable counting
// move on the 16 bits below low (b.deep's counters for that depth, b.tmp as
// work space) and then each of those buckets in turn.
func (b *ckSortBuf) orderBucket(v []float64, idx []int32, low uint) {
	m := len(idx)
	if m <= ckPairMax {
		p, w := b.pairs(m)
		for j, i := range idx {
			p[j] = ckKeyIdx{ckSortKey(v[i]), i}
		}
		ckSortLowPairs(p, w) // the keys share their top 16 bits at least
		for j := range p {
			idx[j] = p[j].i
		}
		return
	}
	if low == 0 {
		return // equal keys, in order of position
	}
	low -= ckMSDBits
	depth := 2 - int(low/ckMSDBits) // low 32, 16, 0 → 0, 1, 2
	if b.deep[depth] == nil {
		b.deep[depth] = make([]int32, 1<<ckMSDBits)
	}
	cnt := b.deep[depth]
	clear(cnt)
	const mask = 1<<ckMSDBits - 1
	for _, i := range idx {
		cnt[(ckSortKey(v[i])>>low)&mask]++
	}
	if cnt[(ckSortKey(v[idx[0]])>>low)&mask] == int32(m) {
		b.orderBucket(v, idx, low) // one digit: nothing moves
		return
	}
	var sum int32
	for d, c := range cnt {
		cnt[d] = sum
		sum += c
	}
	b.tmp = ckGrowI32(b.tmp, m)
	tmp := b.tmp
	for _, i := range idx {
		d := (ckSortKey(v[i]) >> low) & mask
		tmp[cnt[d]] = i
		cnt[d]++
	}
	copy(idx, tmp)
	var start int32
	for _, end := range cnt {
		if end-start > 1 {
			b.orderBucket(v, idx[start:end], low)
		}
		start = end
	}
}

// ckSortLowPairs sorts b, whose keys share their top 16 bits, stably by
// key in place, using w (same length) as work space.
func ckSortLowPairs(b, w []ckKeyIdx) {
	if len(b) <= ckInsMax {
		for i := 1; i < len(b); i++ {
			e := b[i]
			j := i
			for j > 0 && b[j-1].k > e.k {
				b[j] = b[j-1]
				j--
			}
			b[j] = e
		}
		return
	}
	var cnt [ckLowPass][ckLowSize]int32
	for _, e := range b {
		k := e.k
		cnt[0][k&(ckLowSize-1)]++
		cnt[1][(k>>ckLowBits)&(ckLowSize-1)]++
		cnt[2][(k>>(2*ckLowBits))&(ckLowSize-1)]++
		cnt[3][(k>>(3*ckLowBits))&(ckLowSize-1)]++
		cnt[4][(k>>(4*ckLowBits))&(ckLowSize-1)]++
		cnt[5][(k>>(5*ckLowBits))&(ckLowSize-1)]++
	}
	n := int32(len(b))
	src, dst := b, w
	for q := range ckLowPass {
		sh := uint(q * ckLowBits)
		c := &cnt[q]
		if c[(b[0].k>>sh)&(ckLowSize-1)] == n {
			continue // every key has this digit
		}
		var sum int32
		for d := range c {
			v := c[d]
			c[d] = sum
			sum += v
		}
		for _, e := range src {
			d := (e.k >> sh) & (ckLowSize - 1)
			dst[c[d]] = e
			c[d]++
		}
		src, dst = dst, src
	}
	if &src[0] != &b[0] {
		copy(b, src)
	}
}
