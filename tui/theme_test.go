package tui

import (
	"reflect"
	"testing"
)

// Each colour of the theme means one thing: no two meanings share a
// colour (for instance drift and wave drag, or flags and buffet).
func TestThemeOneMeaningPerColour(t *testing.T) {
	v := reflect.ValueOf(DefaultTheme)
	seen := map[string]string{}
	for i := 0; i < v.NumField(); i++ {
		name := v.Type().Field(i).Name
		c := v.Field(i).Interface()
		for _, shade := range []string{reflect.ValueOf(c).FieldByName("Light").String(), reflect.ValueOf(c).FieldByName("Dark").String()} {
			if prev, dup := seen[shade]; dup {
				t.Errorf("%s and %s share the colour %s", prev, name, shade)
			}
			seen[shade] = name
		}
	}
}

// The selection markers and the bar glyphs tell things apart without
// colour.
func TestGlyphsDistinct(t *testing.T) {
	g := []string{glyphInduced, glyphWave, glyphParasite, glyphExcess}
	for i := range g {
		for j := i + 1; j < len(g); j++ {
			if g[i] == g[j] {
				t.Errorf("glyphs %d and %d are both %q", i, j, g[i])
			}
		}
	}
	if selMark == noMark || len([]rune(selMark)) != markW || len([]rune(noMark)) != markW {
		t.Errorf("markers %q %q, width %d", selMark, noMark, markW)
	}
}
