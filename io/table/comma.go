package table

import (
	"strings"

	"github.com/areatest/areatest/io/layer"
)

// decimalComma watches one column for numbers written with a decimal
// comma ("12,5"), as spreadsheets in many locales save them. Read as they
// are, they would make the column text and its numbers unusable, so a
// column whose every present value is a whole number or digits,digits, one
// at least with the comma, is refused with a hint.
type decimalComma struct {
	other bool   // a present value that is neither form
	line  int    // line of the first value with a comma, 0 while none
	value string // that value
}

func (d *decimalComma) add(v string, line int) {
	if d.other {
		return
	}
	t := strings.TrimSpace(v)
	if t == "" || layer.IsMissingWord(t) {
		return
	}
	whole, frac, comma := strings.Cut(strings.TrimLeft(t, "+-"), ",")
	if len(t)-len(strings.TrimLeft(t, "+-")) > 1 || !digits(whole) || (comma && !digits(frac)) {
		d.other = true
		return
	}
	if comma && d.line == 0 {
		d.line, d.value = line, t
	}
}

// check returns the error for a column of decimal commas, nil otherwise.
func (d *decimalComma) check(source, column string) error {
	if d.other || d.line == 0 {
		return nil
	}
	point := strings.Replace(d.value, ",", ".", 1)
	msg := "holds " + quoteValue(d.value) + ", a number with a decimal comma; write numbers with a decimal point (" + point + ")"
	if _, frac, _ := strings.Cut(d.value, ","); len(frac) == 3 {
		msg += ", or without a thousands separator if that is what the comma is (" + strings.Replace(d.value, ",", "", 1) + ")"
	}
	return errorf(source, d.line, column, "%s", msg)
}

func digits(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return s != ""
}
