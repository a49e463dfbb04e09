package main

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"

	"github.com/proofsheet/proofsheet/fixtures"
)

// jsonSchemaVersion is the version of every JSON document the commands
// print, in its "schema_version" field. It goes up when a field changes
// meaning or goes away; new fields do not change it.
const jsonSchemaVersion = 1

// versioned puts "schema_version" first in a JSON object, or in each
// object of a JSON array, and indents the result by two spaces with a
// newline at the end.
func versioned(doc []byte) ([]byte, error) {
	var compact bytes.Buffer
	if err := json.Compact(&compact, doc); err != nil {
		return nil, err
	}
	b := compact.Bytes()
	var out []byte
	switch {
	case len(b) > 0 && b[0] == '{':
		out = addVersion(b)
	case len(b) > 0 && b[0] == '[':
		var items []json.RawMessage
		if err := json.Unmarshal(b, &items); err != nil {
			return nil, err
		}
		out = append(out, '[')
		for i, it := range items {
			if i > 0 {
				out = append(out, ',')
			}
			if len(it) > 0 && it[0] == '{' {
				it = addVersion(it)
			}
			out = append(out, it...)
		}
		out = append(out, ']')
	default:
		out = b
	}
	var pretty bytes.Buffer
	if err := json.Indent(&pretty, out, "", "  "); err != nil {
		return nil, err
	}
	pretty.WriteByte('\n')
	return pretty.Bytes(), nil
}

func addVersion(obj []byte) []byte {
	head := `{"schema_version":` + strconv.Itoa(jsonSchemaVersion)
	if bytes.Equal(bytes.TrimSpace(obj), []byte("{}")) {
		return []byte(head + "}")
	}
	return append([]byte(head+","), obj[1:]...)
}

// versionWriter passes on a JSON object written to it, indented by two
// spaces, with "schema_version" put first, for JSON that is written as it
// is made.
type versionWriter struct {
	w    io.Writer
	done bool
}

func (v *versionWriter) Write(p []byte) (int, error) {
	if v.done {
		return v.w.Write(p)
	}
	i := bytes.IndexByte(p, '{')
	if i < 0 {
		return v.w.Write(p)
	}
	v.done = true
	if _, err := v.w.Write(p[:i+1]); err != nil {
		return 0, err
	}
	if _, err := io.WriteString(v.w, "\n  \"schema_version\": "+strconv.Itoa(jsonSchemaVersion)+","); err != nil {
		return 0, err
	}
	if _, err := v.w.Write(p[i+1:]); err != nil {
		return 0, err
	}
	return len(p), nil
}

// marshalVersioned marshals v (an object) with the schema version first.
func marshalVersioned(v any) ([]byte, error) {
	b, err := json.Marshal(v)
	if err != nil {
		return nil, err
	}
	return versioned(b)
}

// JUnit XML, as CI services read it: one <testsuite> per command run, one
// <testcase> per table, check or golden file. A failure holds the rendered
// difference; trouble that kept a case from being decided is an error.

// junitCase is one test case.
type junitCase struct {
	name     string
	class    string
	took     time.Duration
	failure  string // the message of a failure, "" when it passed
	detail   string // the rendered difference
	errMsg   string // the message of an error (trouble), "" when none
	skipped  string // why it was skipped, "" when it ran
	output   string // what the case printed that is worth keeping (stderr)
	failType string // "difference" by default
}

// junitSuite is one run of a command.
type junitSuite struct {
	name  string
	took  time.Duration
	cases []junitCase
}

type xmlSuites struct {
	XMLName  xml.Name   `xml:"testsuites"`
	Name     string     `xml:"name,attr"`
	Tests    int        `xml:"tests,attr"`
	Failures int        `xml:"failures,attr"`
	Errors   int        `xml:"errors,attr"`
	Skipped  int        `xml:"skipped,attr"`
	Time     string     `xml:"time,attr"`
	Suites   []xmlSuite `xml:"testsuite"`
}

type xmlSuite struct {
	Name     string    `xml:"name,attr"`
	Tests    int       `xml:"tests,attr"`
	Failures int       `xml:"failures,attr"`
	Errors   int       `xml:"errors,attr"`
	Skipped  int       `xml:"skipped,attr"`
	Time     string    `xml:"time,attr"`
	Cases    []xmlCase `xml:"testcase"`
}

type xmlCase struct {
	Name      string      `xml:"name,attr"`
	ClassName string      `xml:"classname,attr"`
	Time      string      `xml:"time,attr"`
	Failure   *xmlProblem `xml:"failure,omitempty"`
	Error     *xmlProblem `xml:"error,omitempty"`
	Skipped   *xmlProblem `xml:"skipped,omitempty"`
	SystemErr string      `xml:"system-err,omitempty"`
}

type xmlProblem struct {
	Message string `xml:"message,attr,omitempty"`
	Type    string `xml:"type,attr,omitempty"`
	Text    string `xml:",chardata"`
}

func seconds(d time.Duration) string { return strconv.FormatFloat(d.Seconds(), 'f', 3, 64) }

// xmlText keeps the characters XML 1.0 allows (§2.2 Char); others, such as
// the escape of a terminal colour, become U+FFFD.
func xmlText(s string) string {
	return strings.Map(func(r rune) rune {
		switch {
		case r == '\t' || r == '\n' || r == '\r':
			return r
		case r < 0x20, r >= 0xD800 && r <= 0xDFFF, r == 0xFFFE, r == 0xFFFF:
			return '\uFFFD'
		}
		return r
	}, s)
}

// xml returns the suite as a JUnit XML document.
func (s *junitSuite) xml() ([]byte, error) {
	x := xmlSuite{Name: xmlText(s.name), Time: seconds(s.took), Cases: []xmlCase{}}
	for _, c := range s.cases {
		xc := xmlCase{Name: xmlText(c.name), ClassName: xmlText(c.class), Time: seconds(c.took), SystemErr: xmlText(c.output)}
		switch {
		case c.errMsg != "":
			xc.Error = &xmlProblem{Message: xmlText(firstLine(c.errMsg)), Type: "trouble", Text: xmlText(c.errMsg)}
			x.Errors++
		case c.skipped != "":
			xc.Skipped = &xmlProblem{Message: xmlText(c.skipped)}
			x.Skipped++
		case c.failure != "":
			typ := c.failType
			if typ == "" {
				typ = "difference"
			}
			xc.Failure = &xmlProblem{Message: xmlText(firstLine(c.failure)), Type: typ, Text: xmlText(c.detail)}
			x.Failures++
		}
		x.Cases = append(x.Cases, xc)
		x.Tests++
	}
	doc := xmlSuites{Name: x.Name, Tests: x.Tests, Failures: x.Failures, Errors: x.Errors, Skipped: x.Skipped, Time: x.Time, Suites: []xmlSuite{x}}
	b, err := xml.MarshalIndent(doc, "", "  ")
	if err != nil {
		return nil, err
	}
	return append(append([]byte(xml.Header), b...), '\n'), nil
}

// write writes the suite to path atomically, when path is not empty.
func (s *junitSuite) write(path string) error {
	if path == "" {
		return nil
	}
	b, err := s.xml()
	if err != nil {
		return fmt.Errorf("--junit %s: %w", path, err)
	}
	if err := fixtures.WriteFileAtomic(path, b, 0o644); err != nil {
		return flagFileError("--junit", path, err)
	}
	return nil
}

// checkJUnit refuses a --junit path that cannot be written, before any
// work is done.
func checkJUnit(path string) error {
	return checkWritable("--junit", path)
}

func firstLine(s string) string {
	s, _, _ = strings.Cut(strings.TrimSpace(s), "\n")
	return s
}

// stepSummary appends Markdown to the file GITHUB_STEP_SUMMARY names, when
// it is set.
func stepSummary(e *env, md string) error {
	path := e.getenv(stepSummaryVar)
	if path == "" {
		return nil
	}
	if !strings.HasSuffix(md, "\n") {
		md += "\n"
	}
	if err := appendFile(path, []byte(md+"\n")); err != nil {
		return fmt.Errorf("%s=%s: %w", stepSummaryVar, path, err)
	}
	return nil
}
