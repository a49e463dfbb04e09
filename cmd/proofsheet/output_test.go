package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

func TestTerminalAndColour(t *testing.T) {
	file, err := os.Create(filepath.Join(t.TempDir(), "out.txt"))
	require.NoError(t, err)
	defer file.Close()
	// Source: POSIX isatty() — true only for a terminal device. /dev/null
	// is a character device but not a terminal, so no colour and no
	// progress bar go there.
	dev, err := os.OpenFile(os.DevNull, os.O_WRONLY, 0)
	require.NoError(t, err)
	defer dev.Close()
	tty := openPTY(t)
	require.False(t, isTerminal(file))
	require.False(t, isTerminal(&bytes.Buffer{}))
	require.False(t, isTerminal(dev), "/dev/null is not a terminal")
	require.True(t, isTerminal(tty), "a pseudo-terminal is one")

	vars := map[string]string{}
	e := &env{stdout: tty, stderr: tty, getenv: func(k string) string { return vars[k] }}
	require.True(t, useColor(e, tty))
	require.False(t, useColor(e, dev))
	require.False(t, useColor(e, file))
	require.Nil(t, newProgress(&env{stderr: dev}, false), "no bar into /dev/null")
	// Source: no-color.org — a NO_COLOR that is present and not empty
	// turns colour off, whatever its value.
	vars["NO_COLOR"] = "1"
	require.False(t, useColor(e, tty))

	require.NotNil(t, newProgress(e, false), "a bar on a terminal")
	require.Nil(t, newProgress(e, true), "none with --quiet")
	require.Nil(t, newProgress(&env{stderr: file}, false), "none into a file")
	var nilBar *progress
	require.NotPanics(t, func() { nilBar.start("x", 1); nilBar.add(1); nilBar.finish() })
}

func TestProgressDraws(t *testing.T) {
	var buf bytes.Buffer
	p := &progress{w: &buf}
	p.start("reading want.parquet", 4000)
	p.add(1000)
	p.add(3000)
	out := buf.String()
	require.Contains(t, out, "\r["+strings.Repeat(".", progressWidth)+"]   0%  0 B of 4.0 kB  reading want.parquet")
	require.Contains(t, out, "\r["+strings.Repeat("#", progressWidth)+"] 100%  4.0 kB of 4.0 kB  reading want.parquet", "the last step always draws")
	buf.Reset()
	p.startCount("reviewing golden files", 50)
	require.Contains(t, buf.String(), "0 of 50  reviewing golden files")
	p.finish()
	require.True(t, strings.HasSuffix(buf.String(), "\r"+strings.Repeat(" ", 79)+"\r"), "finish clears the line")
	for _, line := range strings.Split(buf.String(), "\r") {
		require.LessOrEqual(t, len([]rune(line)), 79)
	}
}

func TestReadTableWithProgress(t *testing.T) {
	// A file above progressMin is read in pieces, with the bar moving.
	var b strings.Builder
	b.WriteString("id,house,tmax\n")
	for i := 0; b.Len() < progressMin+1000; i++ {
		fmt.Fprintf(&b, "%d,Les Pins,%d.25\n", i, i%40)
	}
	path := filepath.Join(t.TempDir(), "big.csv")
	require.NoError(t, os.WriteFile(path, []byte(b.String()), 0o644))
	var buf bytes.Buffer
	tb, err := readTable(&progress{w: &buf}, path)
	require.NoError(t, err)
	require.Equal(t, strings.Count(b.String(), "\n")-1, tb.NumRows())
	require.Contains(t, buf.String(), "100%")
	require.Contains(t, buf.String(), "parsing big.csv")

	// Errors read as without the bar.
	_, err = readTable(&progress{w: &buf}, filepath.Join(t.TempDir(), "absent.csv"))
	require.ErrorContains(t, err, "absent.csv: cannot read the file")
}
