package model

import "testing"

// Ids are given in order of first sight, the same name always gets the same
// id, and Name gives every name back.
func TestFlightNames(t *testing.T) {
	f := NewFlightNames()
	cases := []struct {
		name string
		want FlightID
	}{
		{"KB101", 0}, {"KB102", 1}, {"KB101", 0}, {"", 2}, {"KB102", 1}, {"a long flight name, with a comma", 3},
	}
	for _, c := range cases {
		if got := f.ID(c.name); got != c.want {
			t.Errorf("ID(%q) = %d, want %d", c.name, got, c.want)
		}
		if got := f.Name(c.want); got != c.name {
			t.Errorf("Name(%d) = %q, want %q", c.want, got, c.name)
		}
	}
	if got := f.ID("KB103"); got != 4 {
		t.Errorf("a fifth name gets id %d, want 4", got)
	}
	if got := f.Name(99); got != "" {
		t.Errorf("Name of an unknown id = %q", got)
	}
}
