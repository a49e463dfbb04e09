package property

import (
	"github.com/proofsheet/proofsheet/internal/cp1252"
	"strings"
	"unicode"
	"unicode/utf8"

	"golang.org/x/text/unicode/norm"
)

// houseNames are the default category levels: invented greenhouse names
// with accents, so that accent, case and encoding messes have something to
// bite on.
var houseNames = []string{"Étang", "Les Pins", "Mühlbach", "Søndergård", "Quinta do Açude"}

// syllables make the words of generated strings. All are in the
// Windows-1252 repertoire, some with accents.
var syllables = []string{"ba", "lé", "mo", "ri", "tå", "sun", "çe", "dü", "ño", "ka", "vi", "ter", "gal", "hø", "wa", "zé", "bro", "lin", "ès", "pu"}

// level is a category level with its variant spellings worked out once.
type level struct {
	name                string
	upper, lower, swap  string
	stripped, nfd       string // "" when equal to name
	mojibake, win1252   string // "" when not applicable
	hasSpace, hasLetter bool
}

func makeLevels(names []string) []level {
	out := make([]level, len(names))
	for i, n := range names {
		l := level{name: n, upper: strings.ToUpper(n), lower: strings.ToLower(n), swap: swapFirst(n)}
		if s := stripAccents(n); s != n {
			l.stripped = s
		}
		if s := norm.NFD.String(n); s != n {
			l.nfd = s
		}
		if s, ok := mojibakeOf(n); ok {
			l.mojibake = s
		}
		if s, ok := toWindows1252(n); ok && s != n {
			l.win1252 = s
		}
		l.hasSpace = strings.Contains(n, " ")
		l.hasLetter = strings.IndexFunc(n, unicode.IsLetter) >= 0
		out[i] = l
	}
	return out
}

// swapFirst switches the case of the first letter.
func swapFirst(s string) string {
	r, n := utf8.DecodeRuneInString(s)
	switch {
	case unicode.IsUpper(r):
		return string(unicode.ToLower(r)) + s[n:]
	case unicode.IsLower(r):
		return string(unicode.ToUpper(r)) + s[n:]
	}
	return s
}

// stripAccents removes combining marks after canonical decomposition:
// Étang becomes Etang; letters without a decomposition (ø, ß) stay.
func stripAccents(s string) string {
	d := norm.NFD.String(s)
	var b strings.Builder
	for _, r := range d {
		if !unicode.Is(unicode.Mn, r) {
			b.WriteRune(r)
		}
	}
	return norm.NFC.String(b.String())
}

// Mojibake returns what a program shows for s when it reads the UTF-8
// bytes of s as Windows-1252 and writes the result as UTF-8 again:
// "é" (C3 A9) becomes "Ã©". Bytes is read with the WHATWG table, where the
// five bytes Microsoft leaves undefined (81, 8D, 8F, 90, 9D, as in the UTF-8
// of Á Í Ï Ð Ý) are the C1 controls of the same number, so every text can
// be restored; the loader reads Windows-1252 files with the same table.
func Mojibake(s string) string {
	var b strings.Builder
	b.Grow(len(s) * 2)
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c < 0x80 {
			b.WriteByte(c)
			continue
		}
		b.WriteRune(cp1252.Rune(c))
	}
	return b.String()
}

// mojibakeOf returns Mojibake(s) when it differs from s and can be undone.
func mojibakeOf(s string) (string, bool) {
	m := Mojibake(s)
	if m == s || strings.ContainsRune(m, utf8.RuneError) {
		return "", false
	}
	return m, true
}

// UndoMojibake restores a text that Mojibake garbled: it writes each
// character back as its Windows-1252 byte and reads the bytes as UTF-8.
// ok is false when a character has no Windows-1252 byte or the bytes are
// not valid UTF-8, which is the case for most texts that were never
// garbled.
func UndoMojibake(s string) (clean string, ok bool) {
	b, ok := toWindows1252(s)
	if !ok || !utf8.ValidString(b) {
		return "", false
	}
	return b, true
}

// toWindows1252 encodes s as Windows-1252 bytes (invalid UTF-8 when s has
// characters beyond ASCII).
func toWindows1252(s string) (string, bool) {
	b, ok := cp1252.Encode([]byte(s))
	return string(b), ok
}

// fitsWindows1252 reports whether s is valid UTF-8 whose every character
// has a Windows-1252 byte.
func fitsWindows1252(s string) bool {
	_, ok := cp1252.Encode([]byte(s))
	return ok
}

// IllFormedUTF8 lists byte sequences that are not well-formed UTF-8, as the
// invalid-UTF-8 mess inserts them: an overlong NUL, a C1 lead byte, an
// overlong three-byte form, both ends of the surrogate range, an overlong
// four-byte form, a code point above U+10FFFF, a lead byte F5, the bytes
// FE and FF, lone continuation bytes, and a three- and a four-byte
// sequence cut short (Source: The Unicode Standard, chapter 3, §3.9,
// Table 3-7 Well-Formed UTF-8 Byte Sequences: none of these fits a row).
func IllFormedUTF8() []string {
	return []string{
		"\xc0\x80", "\xc1\xbf", "\xe0\x80\x80", "\xed\xa0\x80", "\xed\xbf\xbf",
		"\xf0\x80\x80\x80", "\xf4\x90\x80\x80", "\xf5\x80\x80\x80", "\xfe", "\xff",
		"\x80", "\xbf", "\xe2\x82", "\xf0\x9f\x98",
	}
}

var illFormed = IllFormedUTF8()

// Zero-width characters: U+200B ZERO WIDTH SPACE, U+200C ZERO WIDTH
// NON-JOINER, U+200D ZERO WIDTH JOINER, U+2060 WORD JOINER.
var zeroWidth = []string{"\u200b", "\u200c", "\u200d", "\u2060"}

// insertAt puts ins at a random rune boundary of s.
func insertAt(r *rng, s, ins string) string {
	n := utf8.RuneCountInString(s)
	k := r.intn(n + 1)
	i := 0
	for ; k > 0 && i < len(s); k-- {
		_, size := utf8.DecodeRuneInString(s[i:])
		i += size
	}
	return s[:i] + ins + s[i:]
}

// replaceSpace replaces one random space of s with rep; ok is false when
// s has no space.
func replaceSpace(r *rng, s, rep string) (string, bool) {
	n := strings.Count(s, " ")
	if n == 0 {
		return "", false
	}
	k := r.intn(n)
	i := -1
	for ; k >= 0; k-- {
		i += 1 + strings.IndexByte(s[i+1:], ' ')
	}
	return s[:i] + rep + s[i+1:], true
}

func spellNBSP(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	if s, ok := replaceSpace(r, v.text, "\u00a0"); ok {
		return s, MessNBSP, true
	}
	return v.text + "\u00a0", MessNBSP, true
}

func spellZeroWidth(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	return insertAt(r, v.text, pick(r, zeroWidth)), MessZeroWidth, true
}

func spellStrayBOM(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	return "\ufeff" + v.text, MessStrayBOM, true
}

func spellInvalidUTF8(_ *colGen, r *rng, v *value) (string, Mess, bool) {
	return insertAt(r, v.text, pick(r, illFormed)), MessInvalidUTF8, true
}

func spellMojibake(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	s, ok := mojibakeOf(v.text)
	return s, MessMojibake, ok
}

func spellWindows1252(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	s, ok := toWindows1252(v.text)
	return s, MessWindows1252, ok && s != v.text
}

func spellDecomposed(_ *colGen, _ *rng, v *value) (string, Mess, bool) {
	s := norm.NFD.String(v.text)
	return s, MessDecomposed, s != v.text
}

var stringSpellers = []localeSpeller{
	{mess: MessEdgeSpace, fn: func(_ *colGen, r *rng, v *value) (string, Mess, bool) {
		return edgeSpace(r, v.text), MessEdgeSpace, true
	}},
	{mess: MessNBSP, fn: spellNBSP}, {mess: MessZeroWidth, fn: spellZeroWidth}, {mess: MessStrayBOM, fn: spellStrayBOM},
	{mess: MessMojibake, fn: spellMojibake}, {mess: MessWindows1252, fn: spellWindows1252},
	{mess: MessInvalidUTF8, fn: spellInvalidUTF8}, {mess: MessDecomposed, fn: spellDecomposed},
}

// levelOf finds the precomputed level of a category value.
func (g *colGen) levelOf(s string) *level {
	for i := range g.levels {
		if g.levels[i].name == s {
			return &g.levels[i]
		}
	}
	return nil
}

func levelSpeller(m Mess, f func(r *rng, l *level) (string, bool)) localeSpeller {
	return localeSpeller{mess: m, fn: func(g *colGen, r *rng, v *value) (string, Mess, bool) {
		l := g.levelOf(v.text)
		if l == nil {
			return "", "", false
		}
		s, ok := f(r, l)
		return s, m, ok && s != "" && s != l.name
	}}
}

var categorySpellers = []localeSpeller{
	levelSpeller(MessCase, func(r *rng, l *level) (string, bool) {
		return pick(r, []string{l.upper, l.lower, l.swap}), l.hasLetter
	}),
	{mess: MessEdgeSpace, fn: func(_ *colGen, r *rng, v *value) (string, Mess, bool) {
		return edgeSpace(r, v.text), MessEdgeSpace, true
	}},
	levelSpeller(MessInnerSpace, func(r *rng, l *level) (string, bool) { return replaceSpace(r, l.name, "  ") }),
	levelSpeller(MessAccent, func(_ *rng, l *level) (string, bool) { return l.stripped, true }),
	levelSpeller(MessDecomposed, func(_ *rng, l *level) (string, bool) { return l.nfd, true }),
	levelSpeller(MessMojibake, func(_ *rng, l *level) (string, bool) { return l.mojibake, true }),
	levelSpeller(MessWindows1252, func(_ *rng, l *level) (string, bool) { return l.win1252, true }),
	{mess: MessInvalidUTF8, fn: spellInvalidUTF8}, {mess: MessStrayBOM, fn: spellStrayBOM},
	{mess: MessNBSP, fn: spellNBSP}, {mess: MessZeroWidth, fn: spellZeroWidth},
}

// word makes one word of one to three syllables.
func word(b []byte, r *rng) []byte {
	n := 1 + r.intn(3)
	for i := 0; i < n; i++ {
		b = append(b, syllables[r.intn(len(syllables))]...)
	}
	return b
}

// words makes up to max words, the first capitalised.
func words(b []byte, r *rng, max int) []byte {
	n := 1 + r.intn(max)
	for i := 0; i < n; i++ {
		if i > 0 {
			b = append(b, ' ')
		}
		start := len(b)
		b = word(b, r)
		if i == 0 && b[start] >= 'a' && b[start] <= 'z' {
			b[start] -= 'a' - 'A'
		}
	}
	return b
}

// Line terminators mixed inside a multi-line value.
var lineBreaks = []string{"\r\n", "\r", "\n"}

func (g *colGen) stringValue(r *rng, v *value) {
	c, cc := g.cfg, g.cc
	var buf [64]byte
	ruled := cc.maxLen > 0 || cc.minLen > 0 || len(cc.alphabet) > 0 || g.used != nil
	switch {
	case ruled:
	case c.force == MessLong || cc.allowed[MessLong] && r.chance(cc.messRate*0.02):
		// Words up to 256 bytes, then that run repeated: long is the point,
		// not variety.
		b := make([]byte, 0, c.longText+300)
		for len(b) < min(c.longText, 256) {
			if len(b) > 0 {
				b = append(b, ' ')
			}
			b = word(b, r)
		}
		for run := len(b); len(b) < c.longText; {
			b = append(b, ' ')
			b = append(b, b[:run]...)
		}
		b = b[:c.longText]
		if k := len(b) - 1; k >= 0 && b[k] >= 0x80 { // maybe cut inside a letter: drop its start
			for k > 0 && !utf8.RuneStart(b[k]) {
				k--
			}
			if !utf8.FullRune(b[k:]) {
				b = b[:k]
			}
		}
		for len(b) < c.longText {
			b = append(b, 'a')
		}
		s := string(b)
		v.clean, v.plain, v.text, v.raw, v.mess, v.fixed = s, s, s, s, MessLong, true
		return
	case c.force == MessLineEndings || cc.allowed[MessLineEndings] && r.chance(cc.messRate*0.08):
		lines := 2 + r.intn(3)
		var clean, raw strings.Builder
		lf := true
		for i := 0; i < lines; i++ {
			if i > 0 {
				br := pick(r, lineBreaks)
				if i == lines-1 && lf {
					br = "\r\n" // at least one break that is not LF
				}
				lf = lf && br == "\n"
				clean.WriteByte('\n')
				raw.WriteString(br)
			}
			w := words(buf[:0], r, c.maxWords)
			clean.Write(w)
			raw.Write(w)
		}
		v.clean, v.plain, v.text, v.raw = clean.String(), clean.String(), clean.String(), raw.String()
		v.mess, v.fixed = MessLineEndings, true
		return
	}
	for try := 0; ; try++ {
		var s string
		switch {
		case len(cc.alphabet) > 0:
			n := cc.minLen + r.intn(cc.maxLen-cc.minLen+1)
			rs := make([]rune, n)
			for i := range rs {
				rs[i] = cc.alphabet[r.intn(len(cc.alphabet))]
			}
			s = string(rs)
		case ruled:
			s = g.wordsWithin(r)
		default:
			s = string(words(buf[:0], r, c.maxWords))
		}
		if try < 64 && (g.isToken(s) || g.used != nil && g.isUsed(s)) {
			continue
		}
		if g.used != nil && g.isUsed(s) {
			s = g.freeString(try)
		}
		g.taken(s)
		v.clean, v.plain, v.text = s, s, s
		return
	}
}

// wordsWithin makes words whose length in characters lies within the
// column's bounds.
func (g *colGen) wordsWithin(r *rng) string {
	lo, hi := max(g.cc.minLen, 1), g.cc.maxLen
	var b []byte
	for utf8.RuneCount(b) < lo || len(b) == 0 {
		if len(b) > 0 {
			b = append(b, ' ')
		}
		b = words(b, r, g.cfg.maxWords)
	}
	s := string(b)
	if hi > 0 && utf8.RuneCountInString(s) > hi {
		rs := []rune(s)[:hi]
		if rs[hi-1] == ' ' {
			rs[hi-1] = 'a'
		}
		s = string(rs)
	}
	return s
}

// freeString makes a string not yet taken in a unique column, counting
// through the alphabet (or the letters) from n.
func (g *colGen) freeString(n int) string {
	alpha := g.cc.alphabet
	if len(alpha) == 0 {
		alpha = []rune(alphabets["lower"])
	}
	lo := max(g.cc.minLen, 1)
	for k := n; ; k++ {
		var rs []rune
		for x := k; ; x /= len(alpha) {
			rs = append(rs, alpha[x%len(alpha)])
			if x < len(alpha) {
				break
			}
		}
		for len(rs) < lo {
			rs = append(rs, alpha[0])
		}
		s := string(rs)
		if g.cc.maxLen > 0 && len(rs) > g.cc.maxLen {
			return s // the capacity check keeps this from happening
		}
		if !g.isUsed(s) && !g.isToken(s) {
			return s
		}
	}
}

// isToken reports whether s is a null token or sentinel of the column.
func (g *colGen) isToken(s string) bool {
	if len(s) > g.maxToken {
		return false
	}
	for _, t := range g.nullTokens {
		if strings.EqualFold(t, s) {
			return true
		}
	}
	for _, t := range g.sentinels {
		if strings.EqualFold(t, s) {
			return true
		}
	}
	return false
}
