package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"dragdeck/feed/store"
)

// check --layout prints how each field is found; report through a layout
// gives the report of the same rows in dragdeck's own columns; import
// keeps the layout file in the store; a bad layout is one line with its
// line number, exit 2.
func TestLayoutCommands(t *testing.T) {
	dir := filepath.Join("..", "..", "testdata", "layouts")
	lay, csv := filepath.Join(dir, "recorder_lbh.toml"), filepath.Join(dir, "recorder_lbh.csv")
	code, out, errs := runArgs("check", "--layout", lay, csv)
	if code != 0 || !strings.Contains(out, "fuel_flow  FF1 + FF2, summed, lb/h") || !strings.Contains(out, "zone America/New_York → UTC") {
		t.Fatalf("check: exit %d\n%s\n%s", code, out, errs)
	}
	_, viaLayout, _ := runArgs("report", "--format", "json", "--layout", lay, csv)
	_, plain, _ := runArgs("report", "--format", "json", filepath.Join(dir, "reference.csv"))
	strip := func(s string) string { // the sources' names differ, the rest may not
		var keep []string
		for _, l := range strings.Split(s, "\n") {
			if !strings.Contains(l, ".csv") {
				keep = append(keep, l)
			}
		}
		return strings.Join(keep, "\n")
	}
	if viaLayout == "" || strip(viaLayout) != strip(plain) {
		t.Errorf("report through the layout differs from the reference's:\n%s\n---\n%s", viaLayout, plain)
	}
	db := filepath.Join(t.TempDir(), "s.db")
	if code, out, errs := runArgs("import", "--store", db, "--layout", lay, csv); code != 0 || !strings.Contains(out, "6 new") {
		t.Fatalf("import: exit %d %s %s", code, out, errs)
	}
	st, err := store.Open(db, true)
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	if ls, err := st.Layouts(); err != nil || !strings.Contains(string(ls["recorder_lbh.toml"]), "America/New_York") {
		t.Errorf("the store keeps %v (%v)", ls, err)
	}
	bad := filepath.Join(t.TempDir(), "bad.toml")
	if err := os.WriteFile(bad, []byte("[time]\ncolumn = \"T\"\n[fields]\nwind = { column = \"W\" }\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, _, errs := runArgs("check", "--layout", bad, csv); code != 2 || !strings.Contains(errs, "bad.toml:4: fields.wind: unknown key") || strings.Count(strings.TrimSpace(errs), "\n") != 0 {
		t.Errorf("a bad layout: exit %d, %q", code, errs)
	}
}
