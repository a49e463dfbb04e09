package golden

import (
	"encoding/json"
	"errors"
	"fmt"
	"strings"

	"github.com/proofsheet/proofsheet/assert"
	"github.com/proofsheet/proofsheet/fixtures"
)

// Outcome is what comparing one output with its golden file found,
// outside a test: the engine of Table, Text and JSON for tools such as
// the proofsheet golden command, which decide for themselves how to report
// and when to update. CheckTable, CheckText and CheckJSON make one; Update
// writes the file.
type Outcome struct {
	// Name is the golden name; Kind what the file holds; Path the golden
	// file (absolute).
	Name string
	Kind FileKind
	Path string
	// Status is StatusEqual, StatusChanged, StatusMissing or
	// StatusInvalid (Err says why); after Update, StatusNew or
	// StatusUpdated where a file was written.
	Status Status
	// Err is why the check could not be made: a bad name, an unreadable
	// or unparsable golden file, got unfit to store.
	Err error
	// Diff is the table comparison, for tables that could be compared.
	Diff *assert.Diff
	// Detail is the readable difference when the output differs: the
	// Diff's text for tables, a line diff for text (TextDiff), JSON paths
	// for JSON (JSONDiff).
	Detail string
	// Rules are the rules a table was compared under: the given ones, or
	// those the file stores when none are given (see Store.Table). Note
	// says when given rules differ from the stored ones.
	Rules assert.Rules
	Note  string

	rewrite    bool                   // Update writes even when equal (new rules)
	unreadable bool                   // the golden file exists but cannot be read
	encode     func() ([]byte, error) // the bytes Update writes
}

// CheckTable compares got with the golden table file of name, as
// Store.Table does, without a test and without writing anything.
func (s Store) CheckTable(name string, got *fixtures.Table, opts ...assert.Option) *Outcome {
	given := assert.RulesOf(opts...)
	o := &Outcome{Rules: given}
	if got == nil {
		return s.outcome(o, name, KindTable, course{prepare: func() error { return errors.New("got is a nil table") }})
	}
	return s.outcome(o, name, KindTable, course{
		compare: func(file string, stored []byte) result {
			want, info, err := DecodeTable(file, stored)
			if err != nil {
				return result{bad: err}
			}
			var r result
			o.Rules, r.note, r.rewrite = chooseRules(info, given)
			o.Diff = assert.Compare(want, got, append(o.Rules.Options(), opts...)...)
			if o.Diff.Equal() {
				r.equal = true
				return r
			}
			r.diff = o.Diff.Text()
			return r
		},
		encode: func() ([]byte, error) {
			if p := assert.Compare(got, got, append(o.Rules.Options(), opts...)...).Problems; len(p) > 0 {
				return nil, fmt.Errorf("the options do not fit the table: %s", strings.Join(p, "; "))
			}
			return EncodeTableRules(got, o.Rules)
		},
	})
}

// CheckText compares got with the golden text file of name, byte for
// byte, as Store.Text does, without a test and without writing anything.
func (s Store) CheckText(name string, got string) *Outcome {
	return s.outcome(&Outcome{}, name, KindText, course{
		compare: func(_ string, stored []byte) result {
			if string(stored) == got {
				return result{equal: true}
			}
			return result{diff: TextDiff(string(stored), got)}
		},
		encode: func() ([]byte, error) { return []byte(got), nil },
	})
}

// CheckJSON compares the JSON document got with the golden JSON file of
// name by structure, as Store.JSON does, without a test and without
// writing anything. got that is not JSON is an error (StatusInvalid).
func (s Store) CheckJSON(name string, got []byte) *Outcome {
	var canon []byte
	return s.outcome(&Outcome{}, name, KindJSON, course{
		prepare: func() (err error) {
			if !json.Valid(got) {
				_, err = decodeJSON(got)
				if err == nil {
					err = errors.New("not JSON")
				}
				return err
			}
			canon, err = CanonicalJSON(json.RawMessage(got))
			return err
		},
		compare: func(_ string, stored []byte) result {
			diff, err := JSONDiff(stored, canon)
			return result{equal: diff == "" && err == nil, diff: diff, bad: err}
		},
		encode: func() ([]byte, error) { return canon, nil },
	})
}

// outcome runs the read-only part of a check's course.
func (s Store) outcome(o *Outcome, name string, kind FileKind, k course) *Outcome {
	o.Name, o.Kind, o.encode = name, kind, k.encode
	path, err := s.Path(name, kind)
	if err != nil {
		o.Status, o.Err = StatusInvalid, err
		return o
	}
	o.Path = path
	if k.prepare != nil {
		if err := k.prepare(); err != nil {
			o.Status, o.Err = StatusInvalid, err
			return o
		}
	}
	c := &check{path: path}
	data, exists, err := c.read()
	if err != nil {
		o.Status, o.Err = StatusInvalid, err
		return o
	}
	if !exists {
		o.Status = StatusMissing
		return o
	}
	r := k.compare(displayPath(path), data)
	o.Note, o.rewrite = r.note, r.rewrite
	switch {
	case r.bad != nil:
		o.Status, o.Err, o.unreadable = StatusInvalid, fmt.Errorf("cannot read %s: %w", displayPath(path), r.bad), true
	case r.equal:
		o.Status = StatusEqual
	default:
		o.Status, o.Detail = StatusChanged, r.diff
	}
	return o
}

// NeedsWrite reports whether Update would write the file: it is missing,
// differs, cannot be read, or stores rules other than those compared
// under.
func (o *Outcome) NeedsWrite() bool {
	switch o.Status {
	case StatusMissing, StatusChanged:
		return true
	case StatusEqual:
		return o.rewrite
	case StatusInvalid:
		// A golden file that cannot be read is rewritten; a bad name or an
		// output that cannot be stored is not.
		return o.unreadable
	}
	return false
}

// Update writes the golden file from the output when NeedsWrite says so,
// atomically (a temporary file synced and renamed into place, the
// directory made as needed), and sets Status to StatusNew or
// StatusUpdated. A file that is equal under the rules, with the same
// rules stored, is left untouched. Update does not look at update mode or
// CI: the caller decides that an update is wanted.
func (o *Outcome) Update() error {
	if !o.NeedsWrite() {
		if o.Status == StatusInvalid {
			return o.Err
		}
		return nil
	}
	data, err := o.encode()
	if err != nil {
		return fmt.Errorf("golden: %s: %w", displayPath(o.Path), err)
	}
	if err := writeGolden(o.Path, data); err != nil {
		return fmt.Errorf("golden: writing %s: %w", displayPath(o.Path), err)
	}
	if o.Status == StatusMissing {
		o.Status = StatusNew
	} else {
		o.Status = StatusUpdated
	}
	o.Err = nil
	return nil
}

// UpdateRefusedIn returns, when the environment (read by getenv) says CI
// and does not allow updates there, the error explaining the refusal
// (wrapping ErrUpdateRefused), as Go tests refuse -update; what names the
// request, such as "--update".
func UpdateRefusedIn(getenv func(string) string, what string) error {
	ci := getenv(EnvCI)
	if !truthy(ci) || truthy(getenv(EnvUpdateInCI)) {
		return nil
	}
	return refusedError(what, ci)
}
