package main

import (
	"encoding/json"
	"fmt"
	"path/filepath"
	"strings"
	"time"
)

// checkNames lists the checks as given.
func (h *hammerRun) checkNames() string {
	var names []string
	for _, c := range h.checks {
		names = append(names, c.spec)
	}
	return strings.Join(names, ", ")
}

// headline says what ran: "proofsheet hammer: 37 of 100 samples of
// uploads.schema (seed 7), checks runs, same-on-plain".
func (h *hammerRun) headline() string {
	return fmt.Sprintf("proofsheet hammer: %d of %s of %s (seed %d, %s); checks: %s",
		h.ran, pluralWord(h.samples, "sample", "samples"), h.schemaFile, h.seed, h.seedFrom, h.checkNames())
}

// outcome is the one-line result.
func (h *hammerRun) outcome() string {
	switch {
	case h.trouble != nil:
		return "Trouble: " + firstLine(h.trouble.Error())
	case h.failure != nil:
		f := h.failure
		return fmt.Sprintf("FAILED %s on sample %d: %s", f.verdict.check.spec, f.sample.index+1, f.verdict.line)
	}
	return fmt.Sprintf("All held: %s, %s, %s of the programs in %s.",
		pluralWord(h.ran, "sample", "samples"), pluralWord(len(h.checks), "check", "checks"),
		pluralWord(int(h.judge.rn.runs.Load()), "run", "runs"), time.Since(h.start).Round(10*time.Millisecond))
}

// report writes the report in a format: text, markdown or json.
func (h *hammerRun) report(format string) string {
	switch format {
	case "json":
		b, err := h.json()
		if err != nil {
			return fmt.Sprintf("{\"error\": %q}\n", err.Error())
		}
		return string(b)
	case "markdown":
		return h.markdown()
	}
	var b strings.Builder
	b.WriteString(h.headline() + "\n" + h.outcome() + "\n")
	if h.failure != nil {
		b.WriteString(h.failureText())
	}
	return b.String()
}

// sections are the parts of a failure report, titled.
type section struct {
	title, body string
	code        bool // the body is verbatim text
}

func (h *hammerRun) failureSections() []section {
	f := h.failure
	v := f.verdict
	var out []section
	if h.maxShrinks > 0 {
		out = append(out, section{body: fmt.Sprintf("Shrunk from %s to %s in %s (%s tried).", f.sample.size(), f.shrunk.size(),
			pluralWord(f.steps, "step", "steps"), pluralWord(f.tried, "input", "inputs"))})
	}
	in := f.shrunk.input()
	for k, file := range in.files {
		title := "The smallest failing input"
		if len(in.files) > 1 {
			title = fmt.Sprintf("The smallest failing input, file %d of %d", k+1, len(in.files))
		}
		out = append(out, section{title: title + ", " + h.keptName(f.inputPath(file.name)), body: showBytes(file.data, f.shrunk.files[k].Style.Encoding, 60), code: true})
	}
	if v.variant != nil {
		what := map[string]string{"plain": "Its plain spelling", "shuffled": "Its rows shuffled", "fed-back": "The output fed back in"}[v.variantName]
		for k, file := range v.variant.files {
			rel := filepath.Join(v.variantName, file.name)
			if f.shrunk.folder {
				rel = filepath.Join(v.variantName, "input", file.name)
			}
			enc := f.shrunk.files[min(k, len(f.shrunk.files)-1)].Style.Encoding
			if v.variantName == "fed-back" {
				enc = "utf-8"
			}
			out = append(out, section{title: what + ", " + h.keptName(rel), body: showBytes(file.data, enc, 60), code: true})
		}
	}
	if v.detail != "" {
		title := "Output diff"
		if v.diff == nil {
			title = "Details"
		}
		out = append(out, section{title: title, body: strings.TrimRight(v.detail, "\n"), code: true})
	}
	if tail := trimStderr(v.base.stderr, stderrLines); tail != "" {
		out = append(out, section{title: fmt.Sprintf("The program's standard error on it (last %d lines at most)", stderrLines), body: tail, code: true})
	}
	if v.other != nil && v.other != v.base {
		if tail := trimStderr(v.other.stderr, stderrLines); tail != "" {
			out = append(out, section{title: "Standard error of the second run", body: tail, code: true})
		}
	}
	out = append(out, section{title: "Reproduce (the same inputs, from the seed)", body: h.reproduce, code: true})
	if cmds := h.byHand(f); len(cmds) > 0 {
		out = append(out, section{title: "By hand, on the kept input", body: strings.Join(cmds, "\n"), code: true})
	} else {
		out = append(out, section{body: "Give --keep DIR to get the failing input's bytes and the commands that run the program on them by hand."})
	}
	if len(f.kept) > 0 {
		out = append(out, section{body: "Kept in " + h.keep + ": " + strings.Join(f.kept, ", ")})
	}
	if f.keepNote != "" {
		out = append(out, section{body: "Not kept: " + f.keepNote})
	}
	if len(f.others) > 0 {
		var lines []string
		for _, o := range f.others {
			lines = append(lines, o.check.spec+": "+o.line)
		}
		out = append(out, section{body: fmt.Sprintf("Other checks that failed on sample %d (not shrunk):\n  %s", f.sample.index+1, strings.Join(lines, "\n  "))})
	}
	return out
}

// keptName names a kept file: "kept as failing/sample.csv", or its name.
func (h *hammerRun) keptName(rel string) string {
	if h.keep == "" {
		return filepath.ToSlash(rel)
	}
	return "kept as " + filepath.ToSlash(filepath.Join(h.keep, rel))
}

func (h *hammerRun) failureText() string {
	var b strings.Builder
	for _, s := range h.failureSections() {
		b.WriteString("\n")
		if s.title != "" {
			b.WriteString(s.title + ":\n")
		}
		if s.code {
			b.WriteString(indentText(strings.TrimRight(s.body, "\n"), "  ") + "\n")
		} else {
			b.WriteString(strings.TrimRight(s.body, "\n") + "\n")
		}
	}
	return b.String()
}

func indentText(s, by string) string {
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		if l != "" {
			lines[i] = by + l
		}
	}
	return strings.Join(lines, "\n")
}

func (h *hammerRun) markdown() string {
	var b strings.Builder
	fmt.Fprintf(&b, "## proofsheet hammer\n\n**%s**\n\n%s\n\n| check | result |\n|---|---|\n", mdEscapeText(h.outcome()), mdEscapeText(strings.TrimPrefix(h.headline(), "proofsheet hammer: ")))
	for _, c := range h.checks {
		fmt.Fprintf(&b, "| %s | %s |\n", mdCodeSpan(c.spec), mdEscapeText(h.checkResult(c)))
	}
	if h.failure != nil {
		for _, s := range h.failureSections() {
			b.WriteString("\n")
			if s.title != "" {
				b.WriteString(mdEscapeText(s.title) + ":\n\n")
			}
			if s.code {
				b.WriteString(mdFenced(s.body))
			} else {
				b.WriteString(mdEscapeText(s.body) + "\n")
			}
		}
	}
	return b.String()
}

// mdEscapeText escapes what Markdown reads as markup.
func mdEscapeText(s string) string {
	return strings.NewReplacer(`\`, `\\`, "|", `\|`, "*", `\*`, "_", `\_`, "`", "\\`", "<", "&lt;", ">", "&gt;", "[", `\[`, "]", `\]`, "\n", " ").Replace(s)
}

// checkResult is a check's result in a word or a line.
func (h *hammerRun) checkResult(c *hammerCheck) string {
	switch {
	case h.trouble != nil:
		return "not judged: " + firstLine(h.trouble.Error())
	case h.failure != nil && h.failure.verdict.check == c:
		return "failed: " + h.failure.verdict.line
	case h.failure != nil:
		for _, o := range h.failure.others {
			if o.check == c {
				return "failed: " + o.line
			}
		}
	}
	return fmt.Sprintf("held on %s", pluralWord(h.ran, "sample", "samples"))
}

// junit is the JUnit report: one case per check.
func (h *hammerRun) junit() *junitSuite {
	s := &junitSuite{name: "proofsheet hammer", took: time.Since(h.start)}
	for _, c := range h.checks {
		tc := junitCase{name: c.spec, class: "proofsheet.hammer"}
		switch {
		case h.trouble != nil:
			tc.errMsg = h.trouble.Error()
		case h.failure != nil && h.failure.verdict.check == c:
			tc.failure = c.spec + ": " + h.failure.verdict.line
			tc.detail = h.outcome() + "\n" + h.failureText()
			tc.output = trimStderr(h.failure.verdict.base.stderr, stderrLines)
		case h.failure != nil:
			for _, o := range h.failure.others {
				if o.check == c {
					tc.failure = c.spec + ": " + o.line
					tc.detail = fmt.Sprintf("on sample %d (seed %d), not shrunk: %s\n%s", h.failure.sample.index+1, h.seed, o.line, o.detail)
				}
			}
		}
		s.cases = append(s.cases, tc)
	}
	return s
}

// json writes the report as JSON.
func (h *hammerRun) json() ([]byte, error) {
	type jFile struct {
		Name     string `json:"name"`
		Kept     string `json:"kept,omitempty"`
		Encoding string `json:"encoding"`
		Text     string `json:"text"`
		Bytes    []byte `json:"bytes"`
	}
	type jCheck struct {
		Check  string `json:"check"`
		Result string `json:"result"`
	}
	type jFailure struct {
		Check      string          `json:"check"`
		Class      string          `json:"class"`
		Message    string          `json:"message"`
		Sample     int             `json:"sample"`
		RowsBefore int             `json:"rows_before"`
		RowsAfter  int             `json:"rows_after"`
		Steps      int             `json:"shrink_steps"`
		Tried      int             `json:"shrink_tried"`
		Input      []jFile         `json:"input"`
		Variant    []jFile         `json:"variant"`
		Detail     string          `json:"detail,omitempty"`
		Diff       json.RawMessage `json:"diff"`
		Stderr     string          `json:"stderr"`
		Reproduce  string          `json:"reproduce"`
		ByHand     []string        `json:"by_hand"`
		Kept       []string        `json:"kept"`
		Others     []jCheck        `json:"other_failures"`
	}
	out := struct {
		Schema   string    `json:"schema"`
		Seed     int64     `json:"seed"`
		Samples  int       `json:"samples"`
		Ran      int       `json:"samples_run"`
		Runs     int64     `json:"program_runs"`
		Held     bool      `json:"held"`
		Trouble  string    `json:"trouble,omitempty"`
		Checks   []jCheck  `json:"checks"`
		Failure  *jFailure `json:"failure"`
		Headline string    `json:"headline"`
		Outcome  string    `json:"outcome"`
	}{Schema: h.schemaFile, Seed: h.seed, Samples: h.samples, Ran: h.ran, Runs: h.judge.rn.runs.Load(),
		Held: h.failure == nil && h.trouble == nil, Checks: []jCheck{}, Headline: h.headline(), Outcome: h.outcome()}
	if h.trouble != nil {
		out.Trouble = h.trouble.Error()
	}
	for _, c := range h.checks {
		out.Checks = append(out.Checks, jCheck{Check: c.spec, Result: h.checkResult(c)})
	}
	if f := h.failure; f != nil {
		v := f.verdict
		jf := &jFailure{Check: v.check.spec, Class: v.class, Message: v.line, Sample: f.sample.index + 1,
			RowsBefore: f.sample.rows(), RowsAfter: f.shrunk.rows(), Steps: f.steps, Tried: f.tried,
			Input: []jFile{}, Variant: []jFile{}, Detail: v.detail, Diff: json.RawMessage("null"),
			Stderr: trimStderr(v.base.stderr, stderrLines), Reproduce: h.reproduce, ByHand: h.byHand(f), Kept: f.kept, Others: []jCheck{}}
		if jf.ByHand == nil {
			jf.ByHand = []string{}
		}
		if jf.Kept == nil {
			jf.Kept = []string{}
		}
		for k, file := range f.shrunk.input().files {
			enc := f.shrunk.files[k].Style.Encoding
			text, _ := decodeFor(file.data, enc)
			jfile := jFile{Name: file.name, Encoding: string(enc), Text: strings.ToValidUTF8(string(text), "\uFFFD"), Bytes: file.data}
			if h.keep != "" {
				jfile.Kept = filepath.ToSlash(filepath.Join(h.keep, f.inputPath(file.name)))
			}
			jf.Input = append(jf.Input, jfile)
		}
		if v.variant != nil {
			for _, file := range v.variant.files {
				jf.Variant = append(jf.Variant, jFile{Name: file.name, Text: strings.ToValidUTF8(string(file.data), "\uFFFD"), Bytes: file.data})
			}
		}
		if v.diff != nil {
			js, err := v.diff.JSON()
			if err != nil {
				return nil, err
			}
			jf.Diff = js
		}
		for _, o := range f.others {
			jf.Others = append(jf.Others, jCheck{Check: o.check.spec, Result: "failed: " + o.line})
		}
		out.Failure = jf
	}
	return marshalVersioned(out)
}
