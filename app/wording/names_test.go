package wording

import (
	"io/fs"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pairline/fitcore"
)

// nameVariants are the other names the checks once had on the screen, in
// the advice table, the report, the command or fitcore's messages. Each
// check has one name (fitcore.AssumptionID.Name, the constants above); these
// must not come back.
var nameVariants = []string{
	"Even spread", "scatter test", "bend test", "Independence could", "Influential readings",
	"No dominant reading", "straight-line check", "linearity check", "spread check",
	"scatter check", "independence check", "normality check", "Linearity could", "Normality could",
	"Evenness of scatter", "straightness:", `"Independent"`, `"Bell-shaped"`,
}

// TestOneNamePerCheck scans the Go sources of app/ and fitcore/ (tests
// left out: they may name a variant to forbid it) for the variants, and
// the messages of reports of invented records with every kind of flag for
// them and for sentences that repeat. Common practice: one term per thing
// in instructions.
func TestOneNamePerCheck(t *testing.T) {
	root := filepath.Join("..", "..")
	scanned := 0
	for _, dir := range []string{"app", "fitcore"} {
		err := filepath.WalkDir(filepath.Join(root, dir), func(p string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() || !strings.HasSuffix(p, ".go") || strings.HasSuffix(p, "_test.go") {
				return err
			}
			b, err := os.ReadFile(p)
			if err != nil {
				return err
			}
			scanned++
			for i, line := range strings.Split(string(b), "\n") {
				if strings.HasPrefix(strings.TrimSpace(line), "//") {
					continue // comments may describe the checks in their own words
				}
				for _, v := range nameVariants {
					if strings.Contains(line, v) {
						t.Errorf("%s:%d names a check %q; use the one name in fitcore/vocabulary.go", p, i+1, v)
					}
				}
			}
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
	}
	if scanned < 50 {
		t.Fatalf("scanned only %d source files", scanned)
	}
	// Invented records: a good line, a bend, growing scatter, a drift, a
	// slipped decimal point.
	r := rand.New(rand.NewPCG(3, 4))
	for _, kind := range []string{"good", "bend", "spread", "drift", "slip"} {
		var x, y []float64
		for k := range 3 {
			for i := range 12 {
				v := float64(i)
				e := r.NormFloat64()
				switch kind {
				case "bend":
					e += 0.3 * (v - 5.5) * (v - 5.5)
				case "spread":
					e *= 0.2 + v
				case "drift":
					e += 4 * float64(k*12+i) / 35
				}
				x, y = append(x, v+1), append(y, 10+2*v+e)
			}
		}
		if kind == "slip" {
			y[30] /= 10
		}
		rep, err := fitcore.Analyze(x, y, fitcore.Options{})
		if err != nil {
			t.Fatal(err)
		}
		texts := rep.Notes
		for _, a := range fitcore.AssumptionList() {
			if p := a.Get(rep); p != nil {
				texts = append(texts, p.Message, p.Advice)
			}
		}
		if rep.Advice != nil {
			texts = append(texts, rep.Advice.Reason)
			for _, c := range rep.Advice.Candidates {
				texts = append(texts, c.Why)
			}
		}
		for _, s := range texts {
			for _, v := range nameVariants {
				if strings.Contains(s, strings.Trim(v, `"`)) && !strings.HasPrefix(v, `"`) {
					t.Errorf("%s: %q names a check %q", kind, s, v)
				}
			}
			if repeatsSentence(s) {
				t.Errorf("%s: a sentence repeats in %q", kind, s)
			}
		}
	}
}

// repeatsSentence reports whether a sentence appears twice in s.
func repeatsSentence(s string) bool {
	seen := map[string]bool{}
	for _, sent := range strings.SplitAfter(s, ". ") {
		k := strings.TrimSpace(sent)
		if k == "" {
			continue
		}
		if seen[k] {
			return true
		}
		seen[k] = true
	}
	return false
}
