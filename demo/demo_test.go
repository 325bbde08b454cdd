package demo_test

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"

	"github.com/antecedent-lab/antecedent/demo"
)

var update = flag.Bool("update", false, "rewrite the demonstration files in testdata")

// TestDemoFilesUpToDate checks that the shipped demonstration files are
// exactly what Model draws with Seed; run with -update to rewrite
// them after changing the model.
func TestDemoFilesUpToDate(t *testing.T) {
	var data, ord, truth bytes.Buffer
	if err := demo.WriteFiles(&data, &ord, &truth); err != nil {
		t.Fatal(err)
	}
	files := map[string][]byte{
		"joint_replacement.csv":       data.Bytes(),
		"joint_replacement.order":     ord.Bytes(),
		"joint_replacement_truth.csv": truth.Bytes(),
	}
	for name, want := range files {
		path := filepath.Join("testdata", name)
		if *update {
			if err := os.WriteFile(path, want, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		got, err := demo.File(name)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s is out of date: run go test -run TestDemoFilesUpToDate -update", path)
		}
	}
}

func BenchmarkLoad(b *testing.B) {
	for range b.N {
		if _, _, _, err := demo.Load(); err != nil {
			b.Fatal(err)
		}
	}
}
