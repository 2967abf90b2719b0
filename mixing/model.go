package mixing

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"sort"
)

// Schema is the version tag of antipode's model files. A model file is a
// JSON object {"schema": Schema, "kind": KIND, "model": {…}} where KIND names
// the model family ("lights", "dyes", "pigments", "halftone") and "model"
// holds that family's own fields. Readers reject other schema versions.
const Schema = "antipode-model/1"

// ErrSchema reports a model file of another schema or an unknown kind.
var ErrSchema = errors.New("not an antipode model file of a known schema and kind")

// Model is a fitted mixing model that can be saved. Kind returns the
// family name written into the file.
type Model interface {
	Kind() string
}

// envelope is the on-disk form of a model file.
type envelope struct {
	Schema string          `json:"schema"`
	Kind   string          `json:"kind"`
	Model  json.RawMessage `json:"model"`
}

// decoders maps a kind to the function that decodes its "model" object.
var decoders = map[string]func(json.RawMessage) (Model, error){}

// register makes a model family loadable; each family calls it from an
// init function.
func register(kind string, decode func(json.RawMessage) (Model, error)) {
	if _, dup := decoders[kind]; dup {
		panic("mixing: model kind registered twice: " + kind)
	}
	decoders[kind] = decode
}

// Kinds returns the model families that Load understands, sorted.
func Kinds() []string {
	k := make([]string, 0, len(decoders))
	for n := range decoders {
		k = append(k, n)
	}
	sort.Strings(k)
	return k
}

// Save writes m as a model file, indented for people to read.
func Save(w io.Writer, m Model) error {
	body, err := json.Marshal(m)
	if err != nil {
		return fmt.Errorf("encoding %s model: %w", m.Kind(), err)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(envelope{Schema: Schema, Kind: m.Kind(), Model: body})
}

// Load reads a model file written by Save and returns the model; its
// dynamic type is the family's model type. It returns an error wrapping
// ErrSchema for another schema or an unknown kind, and the family's own
// validation errors.
func Load(r io.Reader) (Model, error) {
	var e envelope
	dec := json.NewDecoder(r)
	if err := dec.Decode(&e); err != nil {
		return nil, fmt.Errorf("model file: %w", err)
	}
	if e.Schema != Schema {
		return nil, fmt.Errorf("%w: schema %q (want %q)", ErrSchema, e.Schema, Schema)
	}
	d, ok := decoders[e.Kind]
	if !ok {
		return nil, fmt.Errorf("%w: kind %q (known: %v)", ErrSchema, e.Kind, Kinds())
	}
	if len(e.Model) == 0 {
		return nil, fmt.Errorf("%w: no \"model\" object", ErrSchema)
	}
	m, err := d(e.Model)
	if err != nil {
		return nil, fmt.Errorf("%s model: %w", e.Kind, err)
	}
	return m, nil
}

// gridJSON is the wavelength grid of a model file: {"start_nm", "step_nm",
// "n"}, the same in every model family.
type gridJSON struct {
	Start float64 `json:"start_nm"`
	Step  float64 `json:"step_nm"`
	N     int     `json:"n"`
}
