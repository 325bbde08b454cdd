package intervention

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// Kind is what an Action does to the cause.
type Kind int

const (
	// Observed leaves the cause as each row has it (the zero value).
	Observed Kind = iota
	// Set gives the cause the same value in every row.
	Set
	// Shift adds a constant to each row's value of the cause.
	Shift
)

var kindNames = []string{"observed", "set", "shift"}

// String returns "observed", "set" or "shift".
func (k Kind) String() string {
	if k >= 0 && int(k) < len(kindNames) {
		return kindNames[k]
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// MarshalText implements encoding.TextMarshaler.
func (k Kind) MarshalText() ([]byte, error) { return []byte(k.String()), nil }

// UnmarshalText implements encoding.TextUnmarshaler.
func (k *Kind) UnmarshalText(b []byte) error {
	i := slices.Index(kindNames, string(b))
	if i < 0 {
		return fmt.Errorf("%w: unknown action %q (observed, set or shift)", ErrQuestion, b)
	}
	*k = Kind(i)
	return nil
}

// Action is one setting of the cause. The zero value leaves it as
// observed.
type Action struct {
	Kind Kind `json:"kind"`
	// Value is the value the cause is set to, or the amount added to it.
	Value float64 `json:"value"`
}

// SetTo returns the action that sets the cause to x in every row.
func SetTo(x float64) Action { return Action{Kind: Set, Value: x} }

// ShiftBy returns the action that adds delta to every row's cause.
func ShiftBy(delta float64) Action { return Action{Kind: Shift, Value: delta} }

// apply returns the cause's value under a in a row where it was x.
func (a Action) apply(x float64) float64 {
	switch a.Kind {
	case Set:
		return a.Value
	case Shift:
		return x + a.Value
	}
	return x
}

// String describes the action: "set to 60", "shifted by +5", "as
// observed".
func (a Action) String() string {
	switch a.Kind {
	case Set:
		return "set to " + strconv.FormatFloat(a.Value, 'g', -1, 64)
	case Shift:
		s := strconv.FormatFloat(a.Value, 'g', -1, 64)
		if a.Value >= 0 {
			s = "+" + s
		}
		return "shifted by " + s
	}
	return "as observed"
}

// ParseAction reads an action written as "observed", "set:60" (or "=60")
// or "shift:+5" (or "+5", "-5").
func ParseAction(s string) (Action, error) {
	t := strings.TrimSpace(s)
	num := func(x string) (float64, error) {
		v, err := strconv.ParseFloat(strings.TrimSpace(x), 64)
		if err != nil {
			return 0, fmt.Errorf("%w: action %q: %q is not a number", ErrQuestion, s, x)
		}
		return v, nil
	}
	switch {
	case t == "observed":
		return Action{}, nil
	case strings.HasPrefix(t, "set:"), strings.HasPrefix(t, "="):
		v, err := num(t[strings.IndexAny(t, ":=")+1:])
		return SetTo(v), err
	case strings.HasPrefix(t, "shift:"):
		v, err := num(t[len("shift:"):])
		return ShiftBy(v), err
	case strings.HasPrefix(t, "+"), strings.HasPrefix(t, "-"):
		v, err := num(t)
		return ShiftBy(v), err
	}
	return Action{}, fmt.Errorf("%w: action %q: write observed, set:VALUE or shift:AMOUNT", ErrQuestion, s)
}
