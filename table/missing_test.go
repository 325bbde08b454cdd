package table_test

import (
	"errors"
	"math"
	"slices"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
)

func TestUsable(t *testing.T) {
	nan := math.NaN()
	d, err := table.NewDataset([]string{"a", "b", "c"}, [][]float64{
		{1, 2, 3, 4, 5},
		{0, nan, 1, 1, nan},
		{5, 6, nan, 8, 9},
	})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name   string
		policy table.MissingPolicy
		vars   []int
		want   []int // nil: every row
		err    error
	}{
		{"error policy", table.MissingRefused, nil, nil, table.ErrMissing},
		{"complete case ignores vars", table.MissingCompleteCase, []int{0}, []int{0, 3}, nil},
		{"available case, complete variable", table.MissingAvailableCase, []int{0}, nil, nil},
		{"available case, one gap", table.MissingAvailableCase, []int{0, 2}, []int{0, 1, 3, 4}, nil},
		{"available case, two gaps", table.MissingAvailableCase, []int{1, 2}, []int{0, 3}, nil},
		{"unknown policy", table.MissingPolicy(7), nil, nil, table.ErrData},
	}
	for _, c := range cases {
		got, err := d.Usable(c.policy, c.vars)
		if !errors.Is(err, c.err) || (err == nil && c.err != nil) {
			t.Errorf("%s: error %v, want %v", c.name, err, c.err)
			continue
		}
		if !slices.Equal(got, c.want) || (got == nil) != (c.want == nil) {
			t.Errorf("%s: rows %v, want %v", c.name, got, c.want)
		}
	}
	var me *table.MissingError
	if _, err := d.Usable(table.MissingRefused, nil); !errors.As(err, &me) || len(me.Columns) != 2 || me.Columns[0].Name != "b" || !slices.Equal(me.Columns[0].FirstRows, []int{2, 5}) {
		t.Errorf("missing error %+v", me)
	}
	full, _ := table.NewDataset([]string{"x"}, [][]float64{{1, 2}})
	if rows, err := full.Usable(table.MissingRefused, nil); rows != nil || err != nil {
		t.Errorf("complete data: rows %v, error %v", rows, err)
	}
}

func TestMissingPolicyText(t *testing.T) {
	for _, p := range []table.MissingPolicy{table.MissingRefused, table.MissingCompleteCase, table.MissingAvailableCase} {
		b, _ := p.MarshalText()
		var q table.MissingPolicy
		if err := q.UnmarshalText(b); err != nil || q != p {
			t.Errorf("%v: read back %v, %v", p, q, err)
		}
	}
	var q table.MissingPolicy
	if err := q.UnmarshalText([]byte("drop")); err == nil {
		t.Error("an unknown policy name was accepted")
	}
}
