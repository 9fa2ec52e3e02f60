package jsonloc

import (
	"encoding/json"
	"reflect"
	"testing"
)

// custom fails on anything but a number, as report.Float does on a quoted "NaN".
type custom float64

func (c *custom) UnmarshalJSON(b []byte) error {
	if b[0] == '"' {
		return &json.UnmarshalTypeError{Value: "string", Type: reflect.TypeFor[custom]()}
	}
	return json.Unmarshal(b, (*float64)(c))
}

func TestFill(t *testing.T) {
	data := []byte("{\"studies\": [\n  {\"pearson\": {\"r\": 1}},\n  {\"pearson\": {\"r\": \"NaN\"}}\n]}")
	var v struct {
		Studies []struct {
			Pearson struct {
				R custom `json:"r"`
			} `json:"pearson"`
		} `json:"studies"`
	}
	err := json.Unmarshal(data, &v)
	var te *json.UnmarshalTypeError
	if !errorsAs(err, &te) {
		t.Fatalf("error %v is not a type error", err)
	}
	if te.Offset != 0 || te.Field != "studies.pearson.r" {
		t.Fatalf("encoding/json now gives Offset %d, Field %q; Fill may no longer be needed", te.Offset, te.Field)
	}
	Fill(data, err)
	want := int64(len("{\"studies\": [\n  {\"pearson\": {\"r\": 1}},\n  {\"pearson\": {\"r\": \""))
	if te.Field != "studies[1].pearson.r" || te.Offset != want {
		t.Errorf("Fill: Field %q, Offset %d; want %q, %d", te.Field, te.Offset, "studies[1].pearson.r", want)
	}
}

func TestFillLeavesOthers(t *testing.T) {
	te := &json.UnmarshalTypeError{Value: "string", Field: "a", Offset: 7}
	Fill([]byte(`{"a": "x"}`), te)
	if te.Offset != 7 || te.Field != "a" {
		t.Errorf("an error with an offset was changed: %+v", te)
	}
	te = &json.UnmarshalTypeError{Value: "string", Field: "b"}
	Fill([]byte(`{"a": "x"`), te) // no such path, and cut short
	if te.Offset != 0 || te.Field != "b" {
		t.Errorf("an error whose value is not found was changed: %+v", te)
	}
}

func errorsAs(err error, te **json.UnmarshalTypeError) bool {
	t, ok := err.(*json.UnmarshalTypeError)
	*te = t
	return ok
}
