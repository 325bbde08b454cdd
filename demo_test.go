package antecedent_test

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"

	"github.com/antecedent-lab/antecedent"
)

var update = flag.Bool("update", false, "rewrite the demonstration files in testdata/demo")

// TestDemoFilesUpToDate checks that the shipped demonstration files are
// exactly what DemoModel draws with DemoSeed; run with -update to rewrite
// them after changing the model.
func TestDemoFilesUpToDate(t *testing.T) {
	var data, ord, truth bytes.Buffer
	if err := antecedent.WriteDemoFiles(&data, &ord, &truth); err != nil {
		t.Fatal(err)
	}
	files := map[string][]byte{
		"joint_replacement.csv":       data.Bytes(),
		"joint_replacement.order":     ord.Bytes(),
		"joint_replacement_truth.csv": truth.Bytes(),
	}
	for name, want := range files {
		path := filepath.Join("testdata", "demo", name)
		if *update {
			if err := os.WriteFile(path, want, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		got, err := antecedent.DemoFile(name)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s is out of date: run go test -run TestDemoFilesUpToDate -update", path)
		}
	}
}
