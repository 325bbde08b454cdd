package order_test

import (
	"bytes"
	"errors"
	"reflect"
	"testing"

	"github.com/antecedent-lab/antecedent/order"
)

// FuzzParse checks that Parse never panics and that whatever it accepts
// survives a text round trip unchanged.
func FuzzParse(f *testing.F) {
	f.Add([]byte(sample))
	f.Add([]byte(`{"tiers": [["a","b"],["c"]], "forbidden": [["a","c"]], "required": [["b","c"]]}`))
	f.Add([]byte("tier: \"a b\", c\nforbid a -> c\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		o, err := order.Parse(bytes.NewReader(in))
		if err != nil {
			return
		}
		var buf bytes.Buffer
		if err := o.WriteText(&buf); err != nil {
			t.Fatal(err)
		}
		back, err := order.Parse(&buf)
		if err != nil {
			// Names the text form cannot carry (quotes, empty names,
			// line breaks) may come from JSON.
			return
		}
		if !reflect.DeepEqual(normalise(back), normalise(o)) {
			t.Fatalf("round trip changed %+v into %+v", o, back)
		}
	})
}

// normalise makes nil and empty slices alike and drops all-empty labels.
func normalise(o *order.Order) *order.Order {
	c := order.Order{}
	for _, t := range o.Tiers {
		c.Tiers = append(c.Tiers, append([]string{}, t...))
	}
	for _, l := range o.Labels {
		if l != "" {
			c.Labels = append([]string{}, o.Labels...)
			break
		}
	}
	c.Forbidden = append([]order.Edge{}, o.Forbidden...)
	c.Required = append([]order.Edge{}, o.Required...)
	return &c
}

// FuzzRoundTrip checks the order file's round trip strictly: whatever
// Parse accepts, WriteText either writes or refuses with ErrNotText (a name
// or label the text form cannot carry), and what it writes Parse reads back
// equal; writing that again gives the same bytes.
func FuzzRoundTrip(f *testing.F) {
	f.Add([]byte(sample))
	f.Add([]byte("tier baseline: age, \"body mass\"\ntier later: x y # note\nrequire age -> x\nforbid \"body mass\" -> y\n"))
	f.Add([]byte(`{"tiers": [["a b","c"],["d"]], "labels": ["first", "second"], "required": [["a b","d"]]}`))
	f.Add([]byte(`{"tiers": [["a"],["b"]], "labels": ["x: y", "#"]}`))
	f.Add([]byte(`{"tiers": [["a\"b"]]}`))
	f.Add([]byte(`{"tiers": [[]], "labels": ["", "", "extra"]}`))
	f.Add([]byte("tier: \"->\" \"#\" \",\"\nforbid \"->\" -> \"#\"\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		o, err := order.Parse(bytes.NewReader(in))
		if err != nil {
			return
		}
		var first bytes.Buffer
		if err := o.WriteText(&first); err != nil {
			if !errors.Is(err, order.ErrNotText) {
				t.Fatalf("WriteText: %v", err)
			}
			return
		}
		back, err := order.Parse(bytes.NewReader(first.Bytes()))
		if err != nil {
			t.Fatalf("WriteText wrote %q, which Parse refuses: %v", first.Bytes(), err)
		}
		if !reflect.DeepEqual(normalise(back), normalise(o)) {
			t.Fatalf("round trip through %q changed %+v into %+v", first.Bytes(), o, back)
		}
		var second bytes.Buffer
		if err := back.WriteText(&second); err != nil || !bytes.Equal(first.Bytes(), second.Bytes()) {
			t.Fatalf("writing again gave %q (%v), first %q", second.Bytes(), err, first.Bytes())
		}
	})
}
