package fitcore

import (
	"os"
	"path/filepath"
)

// refPath returns the path of a file of the shared reference data
// (/work/shared/reference: NIST StRD and the NIST/SEMATECH handbook
// datasets), looked for beside the repository (../../shared from this
// package in the main checkout, one level further up from a worktree under
// /work/wt) or where PAIRLINE_REFERENCE points. When none exists the first
// candidate is returned, so the test's own "not found" skip names it.
func refPath(rel ...string) string {
	var roots []string
	if r := os.Getenv("PAIRLINE_REFERENCE"); r != "" {
		roots = append(roots, r)
	}
	roots = append(roots, filepath.Join("..", "..", "shared", "reference"), filepath.Join("..", "..", "..", "shared", "reference"))
	for _, r := range roots {
		p := filepath.Join(append([]string{r}, rel...)...)
		if _, err := os.Stat(p); err == nil {
			return p
		}
	}
	return filepath.Join(append([]string{roots[0]}, rel...)...)
}
