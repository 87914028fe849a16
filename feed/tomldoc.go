package feed

import (
	"bytes"
	"errors"
	"fmt"
	"reflect"
	"sort"
	"strings"

	"github.com/pelletier/go-toml/v2"
	"github.com/pelletier/go-toml/v2/unstable"
)

// tomlDoc is one pass over a TOML document with go-toml's parser: the
// dotted key of every key-value (its table's path and its own key, inline
// tables opened) with its line, and the line of each array-table header.
// Lines come from one index of line starts: the parser's Shape counts the
// lines from the start of the document each time it is asked, which made
// a fleet file of 20,000 tails take two minutes, and go-toml's strict mode
// does the same for each unknown key.
type tomlDoc struct {
	keys   []tomlKey
	tables []tomlKey        // table and array-table headers
	arrays map[string][]int // line of each [[key]] header, in order
}

type tomlKey struct {
	key   string   // the parts joined by '.'
	parts []string // as written, a part may hold a '.'
	line  int
}

// scanTOML walks data once. A syntax error stops the walk; the decoder
// reports it.
func scanTOML(data []byte) tomlDoc {
	starts := []int{0}
	for i, c := range data {
		if c == '\n' {
			starts = append(starts, i+1)
		}
	}
	lineOf := func(r unstable.Range) int { return sort.SearchInts(starts, int(r.Offset)+1) }
	d := tomlDoc{arrays: map[string][]int{}}
	var p unstable.Parser
	p.Reset(data)
	var table []string
	for p.NextExpression() {
		e := p.Expression()
		key, line := keyOf(e.Key(), lineOf)
		switch e.Kind {
		case unstable.Table, unstable.ArrayTable:
			table = key
			full := strings.Join(key, ".")
			d.tables = append(d.tables, tomlKey{full, key, line})
			if e.Kind == unstable.ArrayTable {
				d.arrays[full] = append(d.arrays[full], line)
			}
		case unstable.KeyValue:
			d.keyValue(append(append([]string{}, table...), key...), line, e.Value(), lineOf)
		}
	}
	return d
}

// keyValue records the key-value at path, and the keys of an inline table
// (or of an array of them) it holds.
func (d *tomlDoc) keyValue(path []string, line int, v *unstable.Node, lineOf func(unstable.Range) int) {
	if v != nil && v.Raw.Length > 0 {
		line = lineOf(v.Raw)
	}
	d.keys = append(d.keys, tomlKey{strings.Join(path, "."), path, line})
	if v == nil {
		return
	}
	switch v.Kind {
	case unstable.InlineTable:
		for it := v.Children(); it.Next(); {
			kv := it.Node()
			key, kl := keyOf(kv.Key(), lineOf)
			d.keyValue(append(append([]string{}, path...), key...), kl, kv.Value(), lineOf)
		}
	case unstable.Array:
		for it := v.Children(); it.Next(); {
			if el := it.Node(); el.Kind == unstable.InlineTable {
				d.keyValue(path, line, el, lineOf)
			}
		}
	}
}

// keyOf reads a dotted key and the line of its first part.
func keyOf(it unstable.Iterator, lineOf func(unstable.Range) int) ([]string, int) {
	var key []string
	line := 0
	for it.Next() {
		n := it.Node()
		key = append(key, string(n.Data))
		if line == 0 && n.Raw.Length > 0 {
			line = lineOf(n.Raw)
		}
	}
	return key, line
}

// lines maps each dotted key to its line (the last, for a key repeated in
// array tables).
func (d tomlDoc) lines() map[string]int {
	out := make(map[string]int, len(d.keys))
	for _, k := range d.keys {
		out[k.key] = k.line
	}
	return out
}

// unknown returns an error naming the keys and tables of the document that
// schema does not know, each with its line (the first maxListed and a
// count), or nil.
func (d tomlDoc) unknown(name string, schema tomlSchema) error {
	var msgs []string
	n := 0
	check := func(k tomlKey, ok bool) {
		if ok {
			return
		}
		if n++; n <= maxListed {
			msgs = append(msgs, fmt.Sprintf("%s:%d: %s: unknown key", name, k.line, keyText(k.parts)))
		}
	}
	for _, t := range d.tables {
		check(t, schema.table(t.key))
	}
	for _, k := range d.keys {
		check(k, schema.key(k))
	}
	if n == 0 {
		return nil
	}
	if n > maxListed {
		msgs = append(msgs, fmt.Sprintf("and %d more unknown keys", n-maxListed))
	}
	return errors.New(strings.Join(msgs, "; "))
}

// tomlSchema is the keys a file may hold, read from the toml tags of the
// struct it decodes into: leaves, tables, and maps whose keys are free.
type tomlSchema struct {
	leaves, tables, free map[string]bool
}

func newTOMLSchema(v any) tomlSchema {
	s := tomlSchema{leaves: map[string]bool{}, tables: map[string]bool{}, free: map[string]bool{}}
	s.add(reflect.TypeOf(v), "")
	return s
}

func (s tomlSchema) add(t reflect.Type, prefix string) {
	for t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("toml"), ",")
		if name == "" || name == "-" {
			continue
		}
		full := prefix + name
		ft := f.Type
		for ft.Kind() == reflect.Pointer {
			ft = ft.Elem()
		}
		switch {
		case ft.Kind() == reflect.Struct:
			s.tables[full] = true
			s.add(ft, full+".")
		case ft.Kind() == reflect.Slice && ft.Elem().Kind() == reflect.Struct:
			s.tables[full] = true
			s.add(ft.Elem(), full+".")
		case ft.Kind() == reflect.Map:
			s.tables[full] = true
			s.free[full] = true
		default:
			s.leaves[full] = true
		}
	}
}

// key reports whether a key-value's dotted key is known: a leaf, or a key
// directly under a map. A struct given as an inline table is a key too.
func (s tomlSchema) key(k tomlKey) bool {
	if s.leaves[k.key] || s.tables[k.key] {
		return true
	}
	n := len(k.parts)
	return n > 1 && s.free[strings.Join(k.parts[:n-1], ".")]
}

// table reports whether a table header's dotted key is known.
func (s tomlSchema) table(k string) bool { return s.tables[k] }

// decodeTOML decodes data into v (go-toml/v2, lenient), refuses the keys
// schema does not know, and returns the document's scan and where each key
// stands: at(key) is "name:line", or name when the key is not in the file.
func decodeTOML(name string, data []byte, v any, schema tomlSchema, kinds map[string]string) (doc tomlDoc, at func(key string) string, err error) {
	if err := toml.NewDecoder(bytes.NewReader(data)).Decode(v); err != nil {
		return doc, nil, tomlError(name, err, kinds)
	}
	doc = scanTOML(data)
	if err := doc.unknown(name, schema); err != nil {
		return doc, nil, err
	}
	lines := doc.lines()
	return doc, func(key string) string {
		if l, ok := lines[key]; ok {
			return fmt.Sprintf("%s:%d", name, l)
		}
		return name
	}, nil
}
