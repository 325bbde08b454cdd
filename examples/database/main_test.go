package main

import (
	"bytes"
	"context"
	"fmt"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/demo"
)

// TestDemoDatabase reads the demonstration study back from SQLite and
// finds the same edges, in the same order, as Discover on the shipped CSV
// file.
func TestDemoDatabase(t *testing.T) {
	if testing.Short() {
		t.Skip("discovers a network of 18 variables")
	}
	var out bytes.Buffer
	if err := run(context.Background(), &out, "", "SELECT * FROM study", "", &antecedent.Config{Seed: 1}); err != nil {
		t.Fatal(err)
	}
	d, o, _, err := demo.Load()
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	var want strings.Builder
	fmt.Fprintf(&want, "read %d rows of %d variables\n%d edges:\n", d.Rows(), len(d.Names()), len(res.Edges))
	for _, e := range res.Edges {
		fmt.Fprintf(&want, "  %s → %s\n", e.From, e.To)
	}
	if !strings.Contains(out.String(), want.String()) {
		t.Errorf("from the database:\n%s\nfrom the CSV file:\n%s", out.String(), want.String())
	}
}

func TestRedact(t *testing.T) {
	msg := redact(`failed to connect to user=analyst password=s3cret host=db`, "postgres://analyst:s3cret@db/clinic")
	if strings.Contains(msg, "s3cret") {
		t.Errorf("password in %q", msg)
	}
}
