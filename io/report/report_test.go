package report

import "testing"

func TestFormatting(t *testing.T) {
	for _, c := range []struct {
		got, want string
	}{
		{PValue(0.04321), "0.0432"},
		{PValue(1), "1.0000"},
		{PValue(0.00005), "5.0e-05"},
		{Number(-70.80000000000001), "-70.8"},
		{Number(0.5351), "0.5351"},
		{Number(12345.6), "12346"},
		{Number(0), "0"},
		{Number(3e-7), "3.000e-07"},
		{plural(1, "area", "areas"), "1 area"},
		{plural(0, "area", "areas"), "0 areas"},
		{plural(12345, "area", "areas"), "12,345 areas"},
		{Wrap("one two three four", 9, "- ", "  "), "- one two\n  three\n  four\n"},
	} {
		if c.got != c.want {
			t.Errorf("got %q, want %q", c.got, c.want)
		}
	}
}
