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
