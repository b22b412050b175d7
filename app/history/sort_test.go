package history

import (
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
)

// TestSortEntriesOrder: sortEntries orders by the day taken, then ID, then
// revision, and entries equal in all three keep the order they came in
// (what sort.SliceStable gave before it went through sort.Sort), checked
// against slices.SortStableFunc on shuffled inputs with many ties.
func TestSortEntriesOrder(t *testing.T) {
	day := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	rng := rand.New(rand.NewPCG(3, 5))
	for trial := range 200 {
		n := 1 + rng.IntN(40)
		in := make([]Entry, n)
		for i := range in {
			in[i].Taken = day.AddDate(0, 0, rng.IntN(3))
			in[i].ID = string(rune('a' + rng.IntN(3)))
			in[i].Revision = rng.IntN(2)
			in[i].Title = strconv.Itoa(i) // tells equal entries apart
		}
		want := slices.Clone(in)
		slices.SortStableFunc(want, func(a, b Entry) int {
			if c := a.Taken.Compare(b.Taken); c != 0 {
				return c
			}
			if c := strings.Compare(a.ID, b.ID); c != 0 {
				return c
			}
			return a.Revision - b.Revision
		})
		got := slices.Clone(in)
		sortEntries(got)
		for i := range want {
			if got[i].Title != want[i].Title {
				t.Fatalf("trial %d: position %d holds entry %s, a stable sort puts %s there", trial, i, got[i].Title, want[i].Title)
			}
		}
	}
}
