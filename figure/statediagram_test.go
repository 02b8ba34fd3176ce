package figure

import (
	"encoding/xml"
	"io"
	"strings"
	"testing"

	"unfold/states"
)

func TestStateDiagram(t *testing.T) {
	// the golden-mean machine (Crutchfield & Feldman 2003): A −0|½→ A, A −1|½→ B, B −0|1→ A,
	// plus a three-state machine with edges both ways and two symbols on one pair
	cases := []*states.Result{
		{K: 2, HistoryLength: 3, StatisticalComplexity: 0.918, EntropyRate: 0.667,
			States: []states.State{{ID: 0, Probability: 2.0 / 3}, {ID: 1, Probability: 1.0 / 3}},
			Transitions: []states.Transition{{From: 0, Symbol: 0, To: 0, Probability: 0.5}, {From: 0, Symbol: 1, To: 1, Probability: 0.5},
				{From: 1, Symbol: 0, To: 0, Probability: 1}}},
		{K: 3, HistoryLength: 2,
			States: []states.State{{ID: 0, Probability: 0.5}, {ID: 1, Probability: 0.3}, {ID: 2, Probability: 0.2}},
			Transitions: []states.Transition{{From: 0, Symbol: 0, To: 1, Probability: 0.4}, {From: 0, Symbol: 1, To: 1, Probability: 0.3},
				{From: 0, Symbol: 2, To: 0, Probability: 0.3}, {From: 1, Symbol: 0, To: 0, Probability: 0.5}, {From: 1, Symbol: 1, To: 2, Probability: 0.5},
				{From: 2, Symbol: 2, To: 0, Probability: 1}}},
		{K: 2, States: []states.State{{ID: 0, Probability: 1}},
			Transitions: []states.Transition{{From: 0, Symbol: 0, To: 0, Probability: 0.5}, {From: 0, Symbol: 1, To: 0, Probability: 0.5}}},
	}
	for ci, r := range cases {
		var b strings.Builder
		if err := StateDiagram(&b, r, "ab<"); err != nil {
			t.Fatal(err)
		}
		dec := xml.NewDecoder(strings.NewReader(b.String()))
		circles, labels := 0, 0
		inText := false
		for {
			tok, err := dec.Token()
			if err == io.EOF {
				break
			}
			if err != nil {
				t.Fatalf("case %d: not valid XML: %v\n%s", ci, err, b.String())
			}
			switch e := tok.(type) {
			case xml.StartElement:
				if e.Name.Local == "circle" {
					circles++
				}
				inText = e.Name.Local == "text"
			case xml.CharData:
				if inText && strings.Contains(string(e), " | ") {
					labels++
				}
			case xml.EndElement:
				inText = false
			}
		}
		if circles != len(r.States) || labels != len(r.Transitions) {
			t.Errorf("case %d: %d circles and %d transition labels; want %d and %d", ci, circles, labels, len(r.States), len(r.Transitions))
		}
	}
}
