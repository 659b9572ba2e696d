package choice

import "testing"

func TestParse(t *testing.T) {
	names := []Name[int]{{"queen", 1}, {"rook", 2}, {"bh", 3}, {"benjamini-hochberg", 3}}
	for _, c := range []struct {
		in   string
		want int
		ok   bool
	}{
		{"queen", 1, true}, {"Rook", 2, true}, {" ROOK ", 2, true}, {"BH", 3, true},
		{"Benjamini-Hochberg", 3, true}, {"bishop", 0, false}, {"", 0, false}, {"que en", 0, false},
	} {
		got, err := Parse("rule", c.in, names...)
		if (err == nil) != c.ok || got != c.want {
			t.Errorf("Parse(%q) = %d, %v", c.in, got, err)
		}
	}
	_, err := Parse("rule", "bishop", names[:2]...)
	if err == nil || err.Error() != `rule must be queen or rook, not "bishop"` {
		t.Errorf("error %v", err)
	}
}
