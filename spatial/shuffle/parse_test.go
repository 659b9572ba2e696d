package shuffle

import "testing"

// Option names follow the project's one rule: case and surrounding space
// do not matter; anything else is an error naming the choices.
func TestParseNames(t *testing.T) {
	for _, c := range []struct {
		in    string
		alt   Alternative
		local Alternative
		ok    bool
	}{
		{"two-sided", TwoSided, TwoSided, true},
		{" Greater ", Greater, Greater, true},
		{"LESS", Less, Less, true},
		{"folded", 0, Folded, false},
		{"up", 0, 0, false},
	} {
		a, err := ParseAlternative(c.in)
		if (err == nil) != c.ok || (c.ok && a != c.alt) {
			t.Errorf("ParseAlternative(%q) = %v, %v", c.in, a, err)
		}
		l, err := ParseLocalAlternative(c.in)
		if wantOK := c.ok || c.local == Folded; (err == nil) != wantOK || (wantOK && l != c.local) {
			t.Errorf("ParseLocalAlternative(%q) = %v, %v", c.in, l, err)
		}
	}
	for in, want := range map[string]Adjustment{"BH": BenjaminiHochberg, "Benjamini-Yekutieli": BenjaminiYekutieli, " holm": Holm, "None": None} {
		if m, err := ParseAdjustment(in); err != nil || m != want {
			t.Errorf("ParseAdjustment(%q) = %v, %v", in, m, err)
		}
	}
	if _, err := ParseAdjustment("sidak"); err == nil {
		t.Error("ParseAdjustment accepted an unknown name")
	}
	// Each name reads back from String.
	for _, m := range []Adjustment{None, Bonferroni, Holm, BenjaminiHochberg, BenjaminiYekutieli} {
		if back, err := ParseAdjustment(m.String()); err != nil || back != m {
			t.Errorf("%v does not read back: %v, %v", m, back, err)
		}
	}
}
