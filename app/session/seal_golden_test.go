package session

import (
	"bytes"
	"encoding/json"
	"os"
	"testing"
)

// TestSealDigestGolden: the digests of the sample's sealed revisions
// (revision 1, reviewed, kept in Sealed; revision 2, current) are the ones
// testdata/refgen/seal_digest.py computes with Python's hashlib from
// FORMAT.md's "Seal digest" alone, reading testdata/session/sample.json:
// the specification is complete enough for someone else to re-check a
// seal.
func TestSealDigestGolden(t *testing.T) {
	b, err := os.ReadFile("../../testdata/golden/seal_digest.json")
	if err != nil {
		t.Fatal(err)
	}
	var g struct {
		Digests []struct {
			Session, Revision int
			Digest            string
		}
	}
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	file, err := os.ReadFile(samplePath)
	if err != nil {
		t.Fatal(err)
	}
	f, err := Decode(bytes.NewReader(file))
	if err != nil {
		t.Fatal(err)
	}
	if len(g.Digests) != 2 {
		t.Fatalf("%d reference digests, want 2", len(g.Digests))
	}
	for _, d := range g.Digests {
		s := f.Sessions[d.Session]
		var got string
		if d.Revision == s.Revision {
			got, err = s.SealDigest()
			if err != nil {
				t.Fatal(err)
			}
		} else {
			for i := range s.Sealed {
				if s.Sealed[i].Revision == d.Revision {
					got = sealDigest(s.ID, s.Created, &s.Sealed[i])
				}
			}
		}
		if got != d.Digest {
			t.Errorf("session %d revision %d: digest %s, hashlib from FORMAT.md %s", d.Session, d.Revision, got, d.Digest)
		}
	}
}
