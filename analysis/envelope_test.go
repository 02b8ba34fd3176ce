package analysis

import (
	"encoding/json"
	"strings"
	"testing"
)

// TestEnvelopeUnits checks the "units" object of the JSON envelope (DESIGN.md §3: units
// {time, signal}): written after "input", with the input's units, and not inside "input".
func TestEnvelopeUnits(t *testing.T) {
	in := &Input{Path: "r.csv", Samples: 3, Dt: 0.5, Units: Units{Time: "s", Signal: "µε"}}
	b, err := Envelope("inspect", "v", in, nil, map[string]int{"n": 1})
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]json.RawMessage
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	var u Units
	if err := json.Unmarshal(m["units"], &u); err != nil || u != in.Units {
		t.Errorf("units = %s (%v), want %+v", m["units"], err, in.Units)
	}
	if strings.Contains(string(m["input"]), "units") {
		t.Errorf("input = %s: units belong beside it", m["input"])
	}
	if i, j := strings.Index(string(b), `"input"`), strings.Index(string(b), `"units"`); !(i < j && j < strings.Index(string(b), `"parameters"`)) {
		t.Errorf("key order: want input, units, parameters:\n%s", b)
	}
}
