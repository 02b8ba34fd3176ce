package safejson

import (
	"encoding/json"
	"math"
	"slices"
	"testing"
	"time"
)

type cao struct {
	Dimension int     `json:"dimension"`
	E1        float64 `json:"e1"`
	E2        float64 `json:"e2,omitempty"`
}

type inner struct {
	Cao  []cao   `json:"cao"`
	Skip float64 `json:"-"`
	priv float64
}

type Embedded struct {
	Promoted float32
}

type result struct {
	Embedded
	Dim      inner              `json:"dim"`
	Ptr      *float64           `json:"ptr"`
	Any      any                `json:"any"`
	Map      map[string]float64 `json:"map"`
	Arr      [2]float64         `json:"arr"`
	When     time.Time          `json:"when"`
	Named    myFloat            `json:"named"`
	Bytes    []byte             `json:"bytes"`
	Nil      *inner             `json:"nil"`
	IntMap   map[int][]float64  `json:"int_map"`
	Unnamed  float64
	Interval []float64 `json:"interval"`
}

type myFloat float64

func TestMarshalNullsNonFinite(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	p := math.Inf(-1)
	r := result{
		Embedded: Embedded{Promoted: float32(nan)},
		Dim:      inner{Cao: []cao{{1, 0.5, 0.25}, {2, 0.9, nan}, {3, inf, 1}, {4, 1, -inf}}, Skip: nan, priv: nan},
		Ptr:      &p,
		Any:      []any{1.5, nan, map[string]any{"x y": inf}},
		Map:      map[string]float64{"b": nan, "a": 2},
		Arr:      [2]float64{inf, 3},
		When:     time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC),
		Named:    myFloat(nan),
		Bytes:    []byte("hi"),
		IntMap:   map[int][]float64{10: {nan}, 2: {1}},
		Unnamed:  -0.0,
		Interval: []float64{0.1, 1e300, 5e-324},
	}
	b, nulled, err := Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	if !json.Valid(b) {
		t.Fatalf("invalid JSON: %s", b)
	}
	want := []string{"Promoted", "dim.cao[1].e2", "dim.cao[2].e1", "dim.cao[3].e2", "ptr", "any[1]", `any[2]["x y"]`, "map.b", "arr[0]", "named", "int_map.10[0]"}
	if !slices.Equal(nulled, want) {
		t.Errorf("nulled %q\nwant   %q", nulled, want)
	}
	// The expected text: the same struct with the non-finite numbers replaced by what
	// encoding/json writes for a nil pointer (null), built by hand (common practice).
	const wantJSON = `{"Promoted":null,"dim":{"cao":[{"dimension":1,"e1":0.5,"e2":0.25},{"dimension":2,"e1":0.9,"e2":null},{"dimension":3,"e1":null,"e2":1},{"dimension":4,"e1":1,"e2":null}]},"ptr":null,"any":[1.5,null,{"x y":null}],"map":{"a":2,"b":null},"arr":[null,3],"when":"2026-01-01T00:00:00Z","named":null,"bytes":"aGk=","nil":null,"int_map":{"10":[null],"2":[1]},"Unnamed":0,"interval":[0.1,1e+300,5e-324]}`
	if string(b) != wantJSON {
		t.Errorf("got  %s\nwant %s", b, wantJSON)
	}
	// The input is not modified.
	if !math.IsNaN(r.Dim.Cao[1].E2) || !math.IsInf(*r.Ptr, -1) || !math.IsNaN(r.Map["b"]) {
		t.Error("the input was modified")
	}
	if c := Cautions(nulled[1:2]); len(c) != 1 || c[0] != "dim.cao[1].e2 is not finite (written as null)" {
		t.Errorf("cautions %q", c)
	}
}

// TestMarshalFiniteIdentical: without non-finite numbers the output is encoding/json's, byte
// for byte (the reference library).
func TestMarshalFiniteIdentical(t *testing.T) {
	for _, v := range []any{
		result{Dim: inner{Cao: []cao{{1, 0.5, 0}}}, Map: map[string]float64{"z": 1e-7, "a": -0.0}, Interval: []float64{1, 2.5e21}},
		[]float32{1.1, 3.4e38},
		map[string]any{"a": []any{1, "x", nil, true}},
		nil,
		7.25,
	} {
		got, nulled, err := Marshal(v)
		want, err2 := json.Marshal(v)
		if err != nil || err2 != nil || string(got) != string(want) || len(nulled) != 0 {
			t.Errorf("%v: %s %v %v; json %s %v", v, got, nulled, err, want, err2)
		}
	}
	// With a non-finite number somewhere, the finite ones are still written as encoding/json
	// writes them.
	x := []float64{0.1, 1.0 / 3, math.NaN(), -7.123456789012345e-299, 1e21, float64(float32(0.1))}
	got, nulled, err := Marshal(x)
	if err != nil || len(nulled) != 1 || nulled[0] != "[2]" {
		t.Fatal(string(got), nulled, err)
	}
	fin, _ := json.Marshal([]any{x[0], x[1], nil, x[3], x[4], x[5]})
	if string(got) != string(fin) {
		t.Errorf("got %s, want %s", got, fin)
	}
	// A non-finite top-level value, a float32 and strings that look like the sentinel.
	for _, c := range []struct {
		v    any
		want string
	}{
		{math.Inf(1), "null"},
		{[]float32{float32(math.NaN()), 2}, "[null,2]"},
		{[]any{"-7.123456789012345e-299", math.NaN()}, `["-7.123456789012345e-299",null]`},
	} {
		got, _, err := Marshal(c.v)
		if err != nil || string(got) != c.want {
			t.Errorf("%v: %s %v, want %s", c.v, got, err, c.want)
		}
	}
}

func TestMarshalFailsOnlyForOtherReasons(t *testing.T) {
	if _, _, err := Marshal(map[string]any{"c": make(chan int), "x": math.NaN()}); err == nil {
		t.Error("a channel was marshalled")
	}
	type node struct {
		V    float64
		Next *node
	}
	n := &node{V: math.NaN()}
	n.Next = n
	if _, _, err := Marshal(n); err == nil {
		t.Error("a cycle was marshalled")
	}
}
