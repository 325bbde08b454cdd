package order_test

import (
	"bytes"
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
