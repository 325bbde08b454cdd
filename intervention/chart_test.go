package intervention_test

import (
	"context"
	"encoding/json"
	"math"
	"reflect"
	"testing"

	"github.com/antecedent-lab/antecedent/intervention"
)

// TestAnswerJSONAndChart checks that an answer survives JSON (NaN as
// null) and that its chart carries one row per outcome with the
// adjustment estimates beside the g-computation.
func TestAnswerJSONAndChart(t *testing.T) {
	m := mixedModel()
	im := model(t, m, mixedOrder, sample(t, m, 500, 3))
	ans, err := im.Effect(context.Background(), intervention.Question{Cause: "M", Outcomes: list("Y", "Z"), A: intervention.ShiftBy(1), B: intervention.Action{}},
		&intervention.Settings{Resamples: 10, Seed: 2})
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(ans)
	if err != nil {
		t.Fatal(err)
	}
	var back intervention.Answer
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	b2, _ := json.Marshal(&back)
	if string(b) != string(b2) {
		t.Errorf("answer changes through JSON:\n%s\n%s", b, b2)
	}
	if back.A != intervention.ShiftBy(1) || back.B != (intervention.Action{}) {
		t.Errorf("actions %v, %v after JSON", back.A, back.B)
	}
	c := ans.Chart()
	if c.Title != "M shifted by +1 rather than as observed" || len(c.Rows) != 2 || c.Caution == "" {
		t.Fatalf("chart %+v", c)
	}
	if c.Rows[0].Scale != "risk" || c.Rows[1].Scale != "mean" {
		t.Errorf("scales %q, %q", c.Rows[0].Scale, c.Rows[1].Scale)
	}
	for k, r := range c.Rows {
		o := ans.Outcomes[k]
		if !reflect.DeepEqual(r.Difference, o.Difference) || len(r.Adjusted) != 2 || r.Downstream != o.Downstream {
			t.Errorf("row %d: %+v", k, r)
		}
		if o.Binary != finite(float64(r.Ratio.Value)) || o.Binary && !reflect.DeepEqual(r.Ratio, o.Ratio) {
			t.Errorf("row %d: ratio %+v for a binary outcome %v (%+v)", k, r.Ratio, o.Binary, o.Ratio)
		}
		switch p := o.Paths; {
		case p == nil && (len(r.Paths) != 0 || r.PathsNote != o.PathsNote || r.PathsNote == ""):
			t.Errorf("row %d: paths %+v, note %q for an outcome without a decomposition (%q)", k, r.Paths, r.PathsNote, o.PathsNote)
		case p != nil && (len(r.Paths) != 2+len(p.Mediators) || r.Paths[0].Label != "total" || !reflect.DeepEqual(r.Paths[0].Estimate, p.Total) ||
			r.Paths[1].Label != "direct" || !reflect.DeepEqual(r.Paths[1].Estimate, p.Direct)):
			t.Errorf("row %d: paths %+v for %+v", k, r.Paths, p)
		}
	}
	// Z is continuous and M → Z is linear: its decomposition is charted,
	// through each mediator.
	if z := c.Rows[1]; len(z.Paths) < 2 {
		t.Errorf("Z: no path decomposition charted: %+v", z)
	} else {
		for k, m := range ans.Outcomes[1].Paths.Mediators {
			if z.Paths[2+k].Label != "through "+m.Name {
				t.Errorf("Z: path row %d is %q, want through %s", 2+k, z.Paths[2+k].Label, m.Name)
			}
		}
	}
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
