package intervention_test

import (
	"errors"
	"testing"

	"github.com/antecedent-lab/antecedent/intervention"
)

// FuzzParseAction checks that any text gives an action or an error
// wrapping ErrQuestion, never a panic, and that an action reads back from
// its own form.
func FuzzParseAction(f *testing.F) {
	for _, s := range []string{"observed", "set:60", "=1", "shift:-30", "+5", "-2.5", "set:", "shift:1e400", ""} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		a, err := intervention.ParseAction(s)
		if err != nil {
			if !errors.Is(err, intervention.ErrQuestion) {
				t.Fatalf("ParseAction(%q): %v does not wrap ErrQuestion", s, err)
			}
			return
		}
		b, err := a.Kind.MarshalText()
		if err != nil {
			t.Fatal(err)
		}
		var k intervention.Kind
		if err := k.UnmarshalText(b); err != nil || k != a.Kind {
			t.Fatalf("kind %v does not read back: %v", a.Kind, err)
		}
	})
}
