package intervention_test

import (
	"context"
	"encoding/json"
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
		if !reflect.DeepEqual(r.Difference, ans.Outcomes[k].Difference) || len(r.Adjusted) != 2 {
			t.Errorf("row %d: %+v", k, r)
		}
	}
}
