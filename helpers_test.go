package antecedent_test

import (
	"strconv"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/order"
)

func mustOrder(t testing.TB, s string) *order.Order {
	t.Helper()
	o, err := order.Parse(strings.NewReader(s))
	if err != nil {
		t.Fatal(err)
	}
	return o
}

func ftoa(x float64) string { return strconv.FormatFloat(x, 'f', 6, 64) }
