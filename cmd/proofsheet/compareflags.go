package main

import (
	"errors"
	"flag"

	"github.com/proofsheet/proofsheet/assert"
)

// compareFlags are the comparison options diff, golden and hammer share:
// --key, --any-row-order, --tol, --ignore and --loose-types.
type compareFlags struct {
	fs       *flag.FlagSet
	keys     string
	anyOrder bool
	tols     tolFlags
	ignore   string
	loose    bool
}

// addCompareFlags defines the comparison options on fs.
func addCompareFlags(fs *flag.FlagSet) *compareFlags {
	f := &compareFlags{fs: fs}
	fs.StringVar(&f.keys, "key", "", "")
	fs.BoolVar(&f.anyOrder, "any-row-order", false, "")
	fs.Var(&f.tols, "tol", "")
	fs.StringVar(&f.ignore, "ignore", "", "")
	fs.BoolVar(&f.loose, "loose-types", false, "")
	return f
}

// options returns the comparison options the flags give, list limit
// aside, or an error that names the flag at fault.
func (f *compareFlags) options() ([]assert.Option, error) {
	opts, err := tolOptions(f.tols)
	if err != nil {
		return nil, err
	}
	if f.keys != "" && f.anyOrder {
		return nil, errors.New("--key and --any-row-order exclude each other: rows are matched by key or in any order")
	}
	if isSet(f.fs, "key") {
		k := splitList(f.keys)
		if len(k) == 0 {
			return nil, errors.New("--key: no column named")
		}
		opts = append(opts, assert.ByKey(k...))
	}
	if f.anyOrder {
		opts = append(opts, assert.AnyRowOrder())
	}
	if cols := splitList(f.ignore); len(cols) > 0 {
		opts = append(opts, assert.IgnoreColumns(cols...))
	}
	if f.loose {
		opts = append(opts, assert.LooseTypes())
	}
	return opts, nil
}

// keyed reports whether rows pair by key or in any order, rather than by
// position.
func (f *compareFlags) keyed() bool {
	return isSet(f.fs, "key") || f.anyOrder
}

// named returns the columns the flags name: keys, ignored columns and
// the columns of the tolerance specs.
func (f *compareFlags) named() []string {
	named := append(splitList(f.keys), splitList(f.ignore)...)
	for _, spec := range f.tols {
		named = append(named, tolColumn(spec))
	}
	return named
}
