// Package jsondiff compares two JSON documents for the project's tests:
// numbers within a tolerance, everything else exactly.
package jsondiff

import (
	"encoding/json"
	"fmt"
	"math"
)

// Diff returns the path of the first difference between JSON documents a
// and b, or "" when they agree: numbers may differ by tol relative to
// their size (absolute below 1), everything else must be equal. It
// returns an error when either is not JSON.
func Diff(a, b []byte, tol float64) (string, error) {
	var x, y any
	if err := json.Unmarshal(a, &x); err != nil {
		return "", err
	}
	if err := json.Unmarshal(b, &y); err != nil {
		return "", err
	}
	return walk("", x, y, tol), nil
}

func walk(path string, x, y any, tol float64) string {
	switch x := x.(type) {
	case map[string]any:
		ym, ok := y.(map[string]any)
		if !ok || len(ym) != len(x) {
			return path + ": different objects"
		}
		for k, v := range x {
			if d := walk(path+"."+k, v, ym[k], tol); d != "" {
				return d
			}
		}
	case []any:
		ys, ok := y.([]any)
		if !ok || len(ys) != len(x) {
			return path + ": different lengths"
		}
		for i := range x {
			if d := walk(fmt.Sprintf("%s[%d]", path, i), x[i], ys[i], tol); d != "" {
				return d
			}
		}
	case float64:
		yf, ok := y.(float64)
		if !ok || math.Abs(x-yf) > tol*math.Max(1, math.Abs(x)) {
			return fmt.Sprintf("%s: %v vs %v", path, x, y)
		}
	default:
		if x != y {
			return fmt.Sprintf("%s: %v vs %v", path, x, y)
		}
	}
	return ""
}
