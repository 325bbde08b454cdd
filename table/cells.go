package table

import (
	"fmt"
	"math"
	"strconv"
)

// IsMissingCell reports whether a trimmed CSV cell marks a missing value,
// as ReadCSV reads it with default options.
func IsMissingCell(s string) bool { return s == "" || missingWord([]byte(s)) }

// ParseCell returns the number ReadCSV reads from a trimmed cell of a
// numeric column: NaN for a missing cell, 1 and 0 for true and false. ok is
// false when the cell is text, which makes its column a text column. It
// returns an error wrapping ErrData for an infinite number.
func ParseCell(s string) (x float64, ok bool, err error) {
	if IsMissingCell(s) {
		return math.NaN(), true, nil
	}
	var scratch []byte
	if x, ok := parseNumber([]byte(s), '.', &scratch); ok {
		if math.IsInf(x, 0) {
			return 0, false, fmt.Errorf("%w: %q is infinite", ErrData, s)
		}
		return x, true, nil
	}
	if v, ok := boolWord([]byte(s)); ok {
		return v, true, nil
	}
	return 0, false, nil
}

// FormatCell returns the text ReadCSV gives a number read before its
// column turned out to be text ("" for a missing value).
func FormatCell(x float64) string {
	if x != x {
		return ""
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}

// AddColumn adds a numeric column as NewDataset does: Binary when its
// present values are all 0 or 1, Continuous otherwise, NaN missing. It is
// used in place, never copied or changed. With AddText it builds, column
// by column, the dataset ReadCSV would read from the same cells. It
// returns an error naming the column for a bad or duplicate name, a length
// mismatch or an infinite value.
func (d *Dataset) AddColumn(name string, c []float64) error { return d.addNumeric(name, c) }
