package assert

import (
	"bufio"
	"bytes"
	"io"
	"strings"
)

// renderBuffer is the buffer a renderer writes through. A stream (a file,
// a pipe) gets 64 KiB, so that a listing of millions of cells goes out in
// few writes; text built in memory (Text, HTML, Markdown, JSON, and a
// bytes.Buffer) gets a small one, since copying into it costs nothing and
// a 64 KiB buffer for a diff of a few rows cost more than writing it.
func renderBuffer(w io.Writer) *bufio.Writer {
	switch w.(type) {
	case *strings.Builder, *bytes.Buffer:
		return bufio.NewWriterSize(w, 512)
	}
	return bufio.NewWriterSize(w, 64<<10)
}
