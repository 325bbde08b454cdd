package parquetfile_test

import (
	"bytes"
	"context"
	"math"
	"math/big"
	"strconv"
	"testing"

	"github.com/parquet-go/parquet-go"

	"github.com/antecedent-lab/antecedent/table/parquetfile"
)

// TestReadDecimals writes decimals with parquet-go's own writer (an
// INT64 with scale 2, and a 13-byte FIXED_LEN_BYTE_ARRAY with scale 3,
// as the format's LogicalTypes.md defines them, optional) and reads them
// back: each value is the float64 strconv.ParseFloat gives for its
// decimal digits, nulls are missing.
func TestReadDecimals(t *testing.T) {
	prices := []string{"123.45", "-0.07", "", "99999999.99", "0.10"}
	wides := []string{"12345678901234567890.123", "-1.500", "0.001", "", "-98765432109876543210.987"}
	schema := parquet.NewSchema("decimals", parquet.Group{
		"price": parquet.Optional(parquet.Decimal(2, 10, parquet.Int64Type)),
		"wide":  parquet.Optional(parquet.Decimal(3, 30, parquet.FixedLenByteArrayType(13))),
	})
	var buf bytes.Buffer
	w := parquet.NewWriter(&buf, schema)
	unscaled := func(s string, scale int) *big.Int {
		r, ok := new(big.Rat).SetString(s)
		if !ok {
			t.Fatalf("bad decimal %q", s)
		}
		r.Mul(r, new(big.Rat).SetInt(new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(scale)), nil)))
		return r.Num()
	}
	for i := range prices {
		row := make(parquet.Row, 2)
		row[0] = parquet.NullValue().Level(0, 0, 0)
		if prices[i] != "" {
			row[0] = parquet.Int64Value(unscaled(prices[i], 2).Int64()).Level(0, 1, 0)
		}
		row[1] = parquet.NullValue().Level(0, 0, 1)
		if wides[i] != "" {
			// Big-endian two's complement in 13 bytes.
			n := unscaled(wides[i], 3)
			if n.Sign() < 0 {
				n.Add(n, new(big.Int).Lsh(big.NewInt(1), 13*8))
			}
			b := n.FillBytes(make([]byte, 13))
			row[1] = parquet.FixedLenByteArrayValue(b).Level(0, 1, 1)
		}
		if _, err := w.WriteRows([]parquet.Row{row}); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	d, err := parquetfile.ReadFrom(context.Background(), bytes.NewReader(buf.Bytes()), int64(buf.Len()), "decimals.parquet", nil)
	if err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string][]string{"price": prices, "wide": wides} {
		col, err := d.Column(name)
		if err != nil {
			t.Fatal(err)
		}
		for i, s := range want {
			if s == "" {
				if !math.IsNaN(col[i]) {
					t.Errorf("%s row %d: %v, want missing", name, i+1, col[i])
				}
				continue
			}
			x, _ := strconv.ParseFloat(s, 64)
			if math.Float64bits(col[i]) != math.Float64bits(x) {
				t.Errorf("%s row %d: %v, want %v (%s)", name, i+1, col[i], x, s)
			}
		}
	}
}
