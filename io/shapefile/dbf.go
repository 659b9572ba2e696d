package shapefile

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"strconv"

	"github.com/areatest/areatest/io/layer"
)

// The dBASE table: a 32-byte header (record count at 4, header length at
// 8, record length at 10, language driver at 29, all little-endian), field
// descriptors of 32 bytes ended by 0x0D, then fixed-length records, each
// led by a deletion flag (' ' kept, '*' deleted).
const (
	dbfHeader  = 32
	fieldDesc  = 32
	fieldsEnd  = 0x0D
	deletedRec = '*'
)

// field is one column of the table.
type field struct {
	name string
	typ  byte // C, N, F, L or D
	off  int  // within the record, after the deletion flag
	size int
}

// table is a parsed .dbf: its fields and where its records lie.
type table struct {
	m         member
	count     int
	headerLen int
	recLen    int
	ldid      byte
	fields    []field
}

// openTable checks the header and reads the field descriptors. Fields of
// types other than C, N, F, L and D (memo fields, whose text lives in a
// .dbt the shapefile does not carry, and the binary types of later dBASE
// and FoxPro versions) are left out with a warning, as are later fields
// repeating a name.
func openTable(m member, dec *textDecoder) (*table, []string, *Error) {
	d := m.data
	if len(d) < dbfHeader+1 {
		return nil, nil, errorf(m.name, 0, "is %d bytes long, too short for a dBASE table; is it cut short?", len(d))
	}
	t := &table{
		m:         m,
		count:     int(binary.LittleEndian.Uint32(d[4:])),
		headerLen: int(binary.LittleEndian.Uint16(d[8:])),
		recLen:    int(binary.LittleEndian.Uint16(d[10:])),
		ldid:      d[29],
	}
	if t.headerLen < dbfHeader+1 || t.headerLen > len(d) || t.recLen < 1 {
		return nil, nil, errorf(m.name, 0, "has a header length of %d and a record length of %d, which no dBASE table of %d bytes has", t.headerLen, t.recLen, len(d))
	}
	var warns []string
	seen := make(map[string]bool)
	off := 1
	for p := dbfHeader; p+fieldDesc <= t.headerLen && d[p] != fieldsEnd; p += fieldDesc {
		f := field{typ: d[p+11], off: off, size: int(d[p+16])}
		raw := d[p : p+11]
		if i := bytes.IndexByte(raw, 0); i >= 0 {
			raw = raw[:i]
		}
		f.name = string(bytes.TrimSpace([]byte(dec.decode(raw, 0, ""))))
		off += f.size
		switch {
		case f.name == "":
			warns = append(warns, fmt.Sprintf("%s: field %d has no name; it is left out", m.name, len(t.fields)+1))
		case f.size == 0: // holds nothing; left out so that a hostile header of many such fields cannot make huge columns from a small table
			warns = append(warns, fmt.Sprintf("%s: column %q has a width of 0 bytes; it is left out", m.name, f.name))
		case !bytes.ContainsRune([]byte("CNFLD"), rune(f.typ)):
			warns = append(warns, fmt.Sprintf("%s: column %q is of dBASE type %s, which is not read; it is left out", m.name, f.name, strconv.QuoteRune(rune(f.typ))))
		case seen[f.name]:
			warns = append(warns, fmt.Sprintf("%s: a second column is named %q; it is left out", m.name, f.name))
		default:
			seen[f.name] = true
			t.fields = append(t.fields, f)
		}
	}
	if off > t.recLen {
		return nil, nil, errorf(m.name, 0, "has fields of %d bytes in all (with the deletion flag), more than its records of %d bytes", off, t.recLen)
	}
	if need := int64(t.headerLen) + int64(t.count)*int64(t.recLen); need > int64(len(d)) {
		return nil, nil, errorf(m.name, 0, "says it holds %d records of %d bytes after a %d-byte header, %d bytes in all, but it is %d bytes long; is it cut short?", t.count, t.recLen, t.headerLen, need, len(d))
	}
	return t, warns, nil
}

// record returns the bytes of record i (0-based), deletion flag first.
func (t *table) record(i int) []byte {
	at := t.headerLen + i*t.recLen
	return t.m.data[at : at+t.recLen]
}

// cellKind says how a value enters its column.
type cellKind int

const (
	cellMissing cellKind = iota
	cellText             // through the shared rules (numbers, missing words, codes)
	cellWord             // as text that is not a number (booleans, dates)
)

// cell reads field f of record rec, whose number is num.
func (t *table) cell(rec []byte, num int, f *field, dec *textDecoder) (string, cellKind) {
	raw := rec[f.off : f.off+f.size]
	switch f.typ {
	case 'C':
		return dec.decode(bytes.TrimRight(raw, " \x00"), num, f.name), cellText
	case 'N', 'F':
		s := bytes.Trim(raw, " \x00")
		// dBASE writes a number too wide for its field as asterisks.
		if len(s) == 0 || len(bytes.Trim(s, "*")) == 0 {
			return "", cellMissing
		}
		return dec.decode(s, num, f.name), cellText
	case 'L':
		s := bytes.Trim(raw, " \x00")
		if len(s) == 0 || string(s) == "?" {
			return "", cellMissing
		}
		switch s[0] {
		case 'T', 't', 'Y', 'y':
			return "true", cellWord
		case 'F', 'f', 'N', 'n':
			return "false", cellWord
		}
		return dec.decode(s, num, f.name), cellWord
	default: // 'D'
		s := bytes.Trim(raw, " \x00")
		if len(s) == 0 || string(s) == "00000000" {
			return "", cellMissing
		}
		if len(s) == 8 && allDigits(s) {
			return string(s[:4]) + "-" + string(s[4:6]) + "-" + string(s[6:]), cellWord
		}
		return dec.decode(s, num, f.name), cellWord
	}
}

func allDigits(b []byte) bool {
	for _, c := range b {
		if c < '0' || c > '9' {
			return false
		}
	}
	return true
}

// add appends a value to its column's builder.
func add(b *layer.Builder, s string, k cellKind) {
	switch k {
	case cellMissing:
		b.AddMissing()
	case cellText:
		b.AddText(s)
	default:
		b.AddWord(s)
	}
}
