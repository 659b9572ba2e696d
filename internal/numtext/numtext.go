package numtext

import "strconv"

// Count writes an integer with thousands separators: 9,999 and -1,234,567.
func Count[T ~int | ~int32 | ~int64](n T) string {
	s := strconv.FormatInt(int64(n), 10)
	neg := s[0] == '-'
	if neg {
		s = s[1:]
	}
	out := make([]byte, 0, len(s)+len(s)/3+1)
	if neg {
		out = append(out, '-')
	}
	for i := range len(s) {
		if i > 0 && (len(s)-i)%3 == 0 {
			out = append(out, ',')
		}
		out = append(out, s[i])
	}
	return string(out)
}

// Length writes a small distance such as the snap distance of contiguity
// with 3 significant digits (7.38e-07, 0.0125, 25): enough to tell two
// tolerances apart, and one spelling wherever the same value is printed —
// a warning and the summary of the same run must show the same number.
func Length(v float64) string {
	return strconv.FormatFloat(v, 'g', 3, 64)
}
