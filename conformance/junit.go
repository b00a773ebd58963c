package conformance

import (
	"encoding/xml"
	"fmt"
	"io"
	"math"

	"strings"
	"time"

	"github.com/pairwell/pairwell/core/fileio"
)

// JUnit XML, the format CI systems (Jenkins, GitLab, GitHub actions that
// publish test reports) display: <testsuites> with one <testsuite> per
// subject and one <testcase> per check; a failed check has a <failure>
// whose message attribute is the one-line message, a skipped one a
// <skipped>; every case's measured error and tolerance are in its
// <system-out>.
type junitSuites struct {
	XMLName  xml.Name     `xml:"testsuites"`
	Name     string       `xml:"name,attr"`
	Tests    int          `xml:"tests,attr"`
	Failures int          `xml:"failures,attr"`
	Skipped  int          `xml:"skipped,attr"`
	Time     string       `xml:"time,attr"`
	Suites   []junitSuite `xml:"testsuite"`
}

type junitSuite struct {
	Name       string          `xml:"name,attr"`
	Tests      int             `xml:"tests,attr"`
	Failures   int             `xml:"failures,attr"`
	Errors     int             `xml:"errors,attr"`
	Skipped    int             `xml:"skipped,attr"`
	Time       string          `xml:"time,attr"`
	Properties []junitProperty `xml:"properties>property,omitempty"`
	Cases      []junitCase     `xml:"testcase"`
}

type junitProperty struct {
	Name  string `xml:"name,attr"`
	Value string `xml:"value,attr"`
}

type junitCase struct {
	Name      string        `xml:"name,attr"`
	ClassName string        `xml:"classname,attr"`
	Time      string        `xml:"time,attr"`
	Failure   *junitMessage `xml:"failure,omitempty"`
	Skipped   *junitMessage `xml:"skipped,omitempty"`
	SystemOut string        `xml:"system-out,omitempty"`
}

type junitMessage struct {
	Message string `xml:"message,attr"`
	Type    string `xml:"type,attr,omitempty"`
	Text    string `xml:",chardata"`
}

func seconds(d time.Duration) string { return fmt.Sprintf("%.6f", d.Seconds()) }

// WriteJUnit writes r as a JUnit XML document named name.
func (r Report) WriteJUnit(w io.Writer, name string) error {
	doc := junitSuites{Name: name}
	var total time.Duration
	for _, subj := range r.Subjects() {
		s := junitSuite{Name: subj}
		var st time.Duration
		for _, x := range r.Results {
			if x.Subject != subj {
				continue
			}
			if len(s.Properties) == 0 {
				s.Properties = []junitProperty{{Name: "model", Value: x.Model}}
			}
			c := junitCase{
				Name:      caseName(x) + ": " + x.Name,
				ClassName: "pairwell.conformance." + strings.ReplaceAll(x.Model, ".", "_"),
				Time:      seconds(x.Duration),
				SystemOut: measured(x),
			}
			if x.Check == CheckDerivative || x.Check == CheckIdentity {
				c.Name = x.Name
			}
			switch {
			case x.Skipped:
				c.Skipped = &junitMessage{Message: x.Message}
				s.Skipped++
			case !x.Passed:
				c.Failure = &junitMessage{Message: x.Message, Type: x.Check, Text: x.String()}
				s.Failures++
			}
			s.Tests++
			st += x.Duration
			s.Cases = append(s.Cases, c)
		}
		s.Time = seconds(st)
		total += st
		doc.Tests += s.Tests
		doc.Failures += s.Failures
		doc.Skipped += s.Skipped
		doc.Suites = append(doc.Suites, s)
	}
	doc.Time = seconds(total)
	if _, err := io.WriteString(w, xml.Header); err != nil {
		return err
	}
	enc := xml.NewEncoder(w)
	enc.Indent("", "  ")
	if err := enc.Encode(doc); err != nil {
		return fmt.Errorf("junit: %w", err)
	}
	_, err := io.WriteString(w, "\n")
	return err
}

// measured describes a result's numbers for <system-out>.
func measured(x Result) string {
	var b strings.Builder
	if !math.IsNaN(x.Error) {
		fmt.Fprintf(&b, "measured error %.6g, tolerance %.6g", x.Error, x.Tolerance)
	}
	if !math.IsNaN(x.WorstR) {
		if b.Len() > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(&b, "at r = %.9g Å", x.WorstR)
	}
	if b.Len() > 0 {
		b.WriteString(": ")
	}
	b.WriteString(x.Message)
	if x.Source != "" {
		b.WriteString(" [source: " + x.Source + "]")
	}
	return b.String()
}

// WriteJUnitFile writes r as JUnit XML to path atomically (a temporary
// file in the same directory, renamed over path when complete), so a CI
// system never reads a half-written report.
func WriteJUnitFile(path string, r Report, name string) error {
	return fileio.WriteFile(path, func(w io.Writer) error { return r.WriteJUnit(w, name) })
}
