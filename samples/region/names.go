package region

import "strings"

// Place names are a root of one or two syllables (consonant, vowel, now and
// then a soft consonant) plus an ending from a small invented set. The
// endings give the names the air of one made-up language and make it
// unlikely that a name is a real place; roots ending in a vowel take an
// ending that starts with a consonant and the other way round, so no
// unpronounceable clusters form.
var (
	onsets   = []string{"b", "br", "d", "dr", "f", "g", "gr", "h", "k", "kr", "l", "m", "n", "p", "r", "s", "sk", "st", "t", "th", "tr", "v", "w", "z"}
	vowels   = []string{"a", "a", "e", "e", "i", "o", "o", "u", "ae", "ei", "ou", "y"}
	codas    = []string{"", "", "", "n", "r", "l"}
	consEnds = []string{"vael", "skarn", "thren", "drith", "maer", "vosk", "brenn", "thyl", "zenn", "kell"}
	vowEnds  = []string{"ouvek", "ymor", "ennod", "ulth", "eira", "orrin", "avyn", "yrre", "anthe", "olvy", "esset", "urvan", "ethik", "aunde"}
)

// namer hands out names that are unique among those it has given.
type namer struct {
	s    *stream
	seen map[string]bool
}

func newNamer(s *stream) *namer {
	return &namer{s: s, seen: make(map[string]bool)}
}

func (n *namer) pick(list []string) string { return list[n.s.intN(len(list))] }

// next returns a fresh name.
func (n *namer) next() string {
	for {
		syllables := 1 + n.s.intN(2)
		var b strings.Builder
		coda := ""
		for range syllables {
			b.WriteString(n.pick(onsets))
			b.WriteString(n.pick(vowels))
			coda = n.pick(codas)
			b.WriteString(coda)
		}
		if coda == "" {
			b.WriteString(n.pick(consEnds))
		} else {
			b.WriteString(n.pick(vowEnds))
		}
		name := b.String()
		name = strings.ToUpper(name[:1]) + name[1:]
		if !n.seen[name] {
			n.seen[name] = true
			return name
		}
	}
}
