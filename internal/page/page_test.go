package page_test

import (
	"bytes"
	"regexp"
	"strings"
	"testing"

	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/golden"
	"github.com/sill-tool/sill/internal/page"
	"github.com/sill-tool/sill/internal/review"
)

// offPage finds whatever in a page could make the browser ask for
// something: a source or link attribute, a CSS url() or @import, a
// script. The SVG namespace attributes (xmlns) name, they do not fetch.
var offPage = regexp.MustCompile(`(?i)\s(src|href|srcset|action|poster|data)\s*=|url\(|@import|<script|<link|<iframe|<object|<embed`)

func TestWriteText(t *testing.T) {
	f := fixture(t)
	var b bytes.Buffer
	if err := page.Write(&b, f, page.Options{Name: "parcels-cut.yaml"}); err != nil {
		t.Fatal(err)
	}
	doc := b.String()
	golden.Check(t, "testdata", "with-curve", visibleText(doc))
	if m := offPage.FindString(doc); m != "" {
		t.Errorf("the page asks for something from elsewhere: %q", m)
	}
	// Three candidates keep their figures unbroken in print (maxUnbroken).
	if !strings.Contains(doc, `<table class="candidates unbroken">`) {
		t.Error("the table of three candidates does not keep its figures unbroken")
	}
	// Untrusted text is escaped: the note's markup and the name's & and <.
	for _, raw := range []string{"<script>alert(1)", "A&B <late>", "east <dock>"} {
		if strings.Contains(doc, raw) {
			t.Errorf("the page holds %q unescaped", raw)
		}
	}
	if !strings.Contains(doc, "&lt;script&gt;alert(1)&lt;/script&gt;") || !strings.Contains(doc, "A&amp;B &lt;late&gt;") {
		t.Error("the note or the name is not shown as escaped text")
	}
	// The standing caution, never the file's hand-edited one.
	if !strings.Contains(doc, evidence.Caution) || strings.Contains(doc, "hand-edited caution") {
		t.Error("the page should carry evidence.Caution and not the file's caution")
	}
	// Two charts of the trade-off and one of the workload, inline, with no
	// XML prolog; each candidate labelled on the trade-off, the ROC and
	// the workload, the chosen one marked as chosen.
	if n := strings.Count(doc, "<svg"); n != 3 {
		t.Errorf("%d inline SVG charts, want 3", n)
	}
	if strings.Contains(doc, "<?xml") {
		t.Error("the page holds an XML prolog")
	}
	for label, want := range map[string]int{"hit=0.8 (chosen)": 3, "top=6%": 3, "A&amp;B &lt;late&gt;": 3} {
		if n := strings.Count(doc, ">"+label+"</text>"); n != want {
			t.Errorf("chart label %q %d times, want %d", label, n, want)
		}
	}
	// Print: rows are not split across pages and headers repeat.
	for _, rule := range []string{"@page", "break-inside: avoid", "display: table-header-group"} {
		if !strings.Contains(doc, rule) {
			t.Errorf("the style sheet lacks %q", rule)
		}
	}
}

// TestWriteWithoutCurve is a sill-cut/1 file read as it is: the
// candidates are drawn and the page says what the file does not hold.
func TestWriteWithoutCurve(t *testing.T) {
	f, err := decision.Read(strings.NewReader(decisionYAML), "parcels-cut.yaml")
	if err != nil {
		t.Fatal(err)
	}
	f.Assumptions.Volume, f.Assumptions.Capacity, f.Assumptions.Costs = 0, 0, nil
	for i := range f.Candidates {
		f.Candidates[i].Cut.Projected.QueuePerShift = nan()
		f.Candidates[i].Cut.Projected.CostPerShift = nan()
	}
	var b bytes.Buffer
	if err := page.Write(&b, f, page.Options{Name: "parcels-cut.yaml"}); err != nil {
		t.Fatal(err)
	}
	golden.Check(t, "testdata", "no-curve-no-volume", visibleText(b.String()))
	if n := strings.Count(b.String(), "<svg"); n != 2 {
		t.Errorf("%d charts, want 2 (no workload without a volume)", n)
	}
}

func TestWriteAgainst(t *testing.T) {
	proposed := fixture(t)
	production := fixture(t)
	production.Chosen = "top=6%"
	production.Model.Version = "v6"
	production.Data.SHA256 = "0" + production.Data.SHA256[1:]
	production.Assumptions.Capacity = 200
	for i, p := range production.Curve {
		production.Curve[i] = decision.CurvePoint{Score: p.Score, TP: p.TP * 0.9, FP: p.FP}
	}
	var b bytes.Buffer
	err := page.WriteAgainst(&b, review.Against(proposed, "new.yaml", production, "old.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	doc := b.String()
	golden.Check(t, "testdata", "against", visibleText(doc))
	if m := offPage.FindString(doc); m != "" {
		t.Errorf("the page asks for something from elsewhere: %q", m)
	}
	for _, label := range []string{">proposed: hit=0.8</text>", ">in production: top=6%</text>"} {
		if n := strings.Count(doc, label); n != 2 {
			t.Errorf("chart label %s %d times, want 2 (trade-off and ROC)", label, n)
		}
	}
}

func TestReplaceable(t *testing.T) {
	f := fixture(t)
	var b bytes.Buffer
	if err := page.Write(&b, f, page.Options{}); err != nil {
		t.Fatal(err)
	}
	if err := page.Replaceable(b.Bytes()); err != nil {
		t.Errorf("a page is not replaceable: %v", err)
	}
	for _, other := range []string{decisionYAML, "<!DOCTYPE html><html><body>someone's notes</body></html>", "score,label\n0.3,1\n"} {
		if err := page.Replaceable([]byte(other)); err == nil {
			t.Errorf("Replaceable accepted %.30q", other)
		}
	}
}
