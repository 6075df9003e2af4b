package decision

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"time"

	"go.yaml.in/yaml/v3"

	"github.com/sill-tool/sill/internal/curve"
	"github.com/sill-tool/sill/internal/design"
	"github.com/sill-tool/sill/internal/evidence"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// errPanic marks a panic that Read recovered from; the fuzz test fails on
// it, so that a recovered bug does not hide.
var errPanic = errors.New("the reader failed on this input")

// MaxSize is the largest decision file Read accepts, in bytes.
const MaxSize = 16 << 20

// ReadFile reads the decision file at path; see Read.
func ReadFile(path string) (*File, error) {
	file, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("read decision file: %w", err)
	}
	defer file.Close()
	if info, err := file.Stat(); err == nil && info.IsDir() {
		return nil, fmt.Errorf("read decision file: %s is a directory, expected a file", path)
	}
	return Read(file, path)
}

// ReadFileStamped reads the decision file at path like ReadFile and also
// returns its Stamp, which a later Write can expect (WriteOptions.Expect)
// so as never to write over a change made since.
func ReadFileStamped(path string) (*File, sharedfile.Stamp, error) {
	data, stamp, err := sharedfile.Read(path, MaxSize)
	if errors.Is(err, sharedfile.ErrTooLarge) {
		return nil, sharedfile.Stamp{}, &ParseError{File: path, Err: fmt.Errorf("%w: larger than %d bytes, expected a small YAML file", ErrInvalid, MaxSize)}
	}
	if err != nil {
		return nil, sharedfile.Stamp{}, fmt.Errorf("read decision file: %w", err)
	}
	f, err := Read(bytes.NewReader(data), path)
	if err != nil {
		return nil, sharedfile.Stamp{}, err
	}
	return f, stamp, nil
}

// Read reads one decision file from r; source names it in errors.
//
// Reading is strict. Every error is a *ParseError naming the key path and
// wrapping one of the sentinels: ErrSyntax for YAML that does not parse or
// holds more than one document, ErrFormat for a format other than Format,
// ErrMissingKey, ErrUnknownKey, ErrType for a value of the wrong kind (a
// string must be a YAML string: quote numbers used as names),
// ErrNotFinite for a number that must be finite and is null, .nan or
// .inf, ErrUnknownChosen, and ErrInvalid for other values out of range.
//
// The keys the issue of the format lists are required; candidates[].rule,
// candidates[].note and note may be absent (read as null). The keys this
// package adds are optional. chosen_score, a copy of the chosen
// candidate's score for deployment configs, must agree with it when
// present. The others are derived when absent: data.negatives
// (NaN), data.weight_column (""), validation.rows (flagged, rounded),
// validation.flagged_share, validation.false_discovery_rate and
// validation.false_discovery_ci (from precision) and
// projected.cost_per_case (cost_per_shift over the volume, else NaN).
//
// Read never panics, whatever the input.
func Read(r io.Reader, source string) (f *File, err error) {
	defer func() {
		if p := recover(); p != nil {
			f, err = nil, &ParseError{File: source, Err: fmt.Errorf("%w: %w (%v)", ErrSyntax, errPanic, p)}
		}
	}()
	data, err := io.ReadAll(io.LimitReader(r, MaxSize+1))
	if err != nil {
		return nil, &ParseError{File: source, Err: fmt.Errorf("read: %w", err)}
	}
	if len(data) > MaxSize {
		return nil, &ParseError{File: source, Err: fmt.Errorf("%w: larger than %d bytes, expected a small YAML file", ErrInvalid, MaxSize)}
	}
	dec := yaml.NewDecoder(bytes.NewReader(data))
	var doc yaml.Node
	if err := dec.Decode(&doc); err != nil {
		if errors.Is(err, io.EOF) {
			return nil, &ParseError{File: source, Err: fmt.Errorf("%w: empty file, expected a decision file (format: %s)", ErrSyntax, Format)}
		}
		return nil, syntaxError(source, err)
	}
	var extra yaml.Node
	if err := dec.Decode(&extra); !errors.Is(err, io.EOF) {
		if err != nil {
			return nil, syntaxError(source, err)
		}
		return nil, &ParseError{File: source, Line: extra.Line, Err: fmt.Errorf("%w: a second YAML document, expected one", ErrSyntax)}
	}
	rd := &reader{file: source, lines: map[string]int{}}
	f = rd.file_(&doc)
	if rd.err != nil {
		return nil, rd.err
	}
	if err := f.Validate(); err != nil {
		var pe *ParseError
		if errors.As(err, &pe) {
			pe.File = source
			pe.Line = rd.lineOf(pe.Path)
		}
		return nil, err
	}
	return f, nil
}

var yamlLine = regexp.MustCompile(`^yaml: line (\d+): `)

func syntaxError(source string, err error) error {
	msg := err.Error()
	line := 0
	if m := yamlLine.FindStringSubmatch(msg); m != nil {
		line, _ = strconv.Atoi(m[1])
		msg = msg[len(m[0]):]
	}
	msg = strings.TrimPrefix(msg, "yaml: ")
	return &ParseError{File: source, Line: line, Err: fmt.Errorf("%w: %s", ErrSyntax, msg)}
}

// reader walks the YAML tree, keeping the first error; once it has one,
// every getter returns a zero value.
type reader struct {
	file  string
	err   error
	lines map[string]int // key path -> line of its value
}

func (r *reader) fail(n *yaml.Node, path string, err error) {
	if r.err == nil {
		line := 0
		if n != nil {
			line = n.Line
		}
		r.err = &ParseError{File: r.file, Line: line, Path: path, Err: err}
	}
}

func (r *reader) lineOf(path string) int {
	for path != "" {
		if line, ok := r.lines[path]; ok {
			return line
		}
		i := strings.LastIndexAny(path, ".[")
		if i < 0 {
			break
		}
		path = path[:i]
	}
	return 0
}

// deref follows an alias to the node it names.
func deref(n *yaml.Node) *yaml.Node {
	for i := 0; n != nil && n.Kind == yaml.AliasNode && i < 8; i++ {
		n = n.Alias
	}
	return n
}

// describe names what a node holds, for "found ..." in errors.
func describe(n *yaml.Node) string {
	if n == nil {
		return "nothing"
	}
	switch n.Kind {
	case yaml.MappingNode:
		return "a mapping"
	case yaml.SequenceNode:
		return "a list"
	case yaml.ScalarNode:
		v := n.Value
		if len(v) > 40 {
			v = v[:40] + "…"
		}
		switch n.ShortTag() {
		case "!!null":
			return "null"
		case "!!str":
			return strconv.Quote(v)
		}
		return v
	}
	return "nothing"
}

// fields reads a mapping with the given required and optional keys.
func (r *reader) fields(n *yaml.Node, path string, required, optional []string) map[string]*yaml.Node {
	n = deref(n)
	if r.err != nil || n == nil {
		return map[string]*yaml.Node{}
	}
	if n.Kind != yaml.MappingNode {
		r.fail(n, path, fmt.Errorf("%w: expected a mapping, found %s", ErrType, describe(n)))
		return map[string]*yaml.Node{}
	}
	allowed := map[string]bool{}
	for _, k := range append(append([]string(nil), required...), optional...) {
		allowed[k] = true
	}
	out := map[string]*yaml.Node{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		key, value := deref(n.Content[i]), n.Content[i+1]
		if key == nil || key.Kind != yaml.ScalarNode {
			r.fail(n.Content[i], path, fmt.Errorf("%w: a key that is not a name", ErrType))
			return out
		}
		keyPath := join(path, key.Value)
		if !allowed[key.Value] {
			names := append(append([]string(nil), required...), optional...)
			sort.Strings(names)
			r.fail(key, keyPath, fmt.Errorf("%w, expected one of %s", ErrUnknownKey, strings.Join(names, ", ")))
			return out
		}
		if _, dup := out[key.Value]; dup {
			r.fail(key, keyPath, fmt.Errorf("%w: the key appears twice", ErrInvalid))
			return out
		}
		out[key.Value] = value
		r.lines[keyPath] = key.Line
	}
	for _, k := range required {
		if _, ok := out[k]; !ok {
			r.fail(n, join(path, k), ErrMissingKey)
			return out
		}
	}
	return out
}

func join(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

func isNull(n *yaml.Node) bool {
	n = deref(n)
	return n == nil || (n.Kind == yaml.ScalarNode && n.ShortTag() == "!!null")
}

func (r *reader) str(n *yaml.Node, path string) string {
	n = deref(n)
	if r.err != nil || n == nil {
		return ""
	}
	if n.Kind != yaml.ScalarNode || n.ShortTag() != "!!str" {
		r.fail(n, path, fmt.Errorf("%w: expected a string, found %s (quote it if it is meant as text)", ErrType, describe(n)))
		return ""
	}
	return n.Value
}

// optionalStr reads a string or null ("").
func (r *reader) optionalStr(n *yaml.Node, path string) string {
	if isNull(n) {
		return ""
	}
	return r.str(n, path)
}

func (r *reader) boolean(n *yaml.Node, path string) bool {
	n = deref(n)
	if r.err != nil || n == nil {
		return false
	}
	var b bool
	if n.Kind != yaml.ScalarNode || n.ShortTag() != "!!bool" || n.Decode(&b) != nil {
		r.fail(n, path, fmt.Errorf("%w: expected true or false, found %s", ErrType, describe(n)))
	}
	return b
}

// number reads a number that may be null (NaN) when nullable is set; any
// other non-finite value is an error.
func (r *reader) number(n *yaml.Node, path string, nullable bool) float64 {
	n = deref(n)
	if r.err != nil || n == nil {
		return math.NaN()
	}
	if nullable && isNull(n) {
		return math.NaN()
	}
	tag := n.ShortTag()
	if n.Kind == yaml.ScalarNode && tag == "!!null" {
		r.fail(n, path, fmt.Errorf("%w, found null", ErrNotFinite))
		return math.NaN()
	}
	var v float64
	if n.Kind != yaml.ScalarNode || (tag != "!!int" && tag != "!!float") || n.Decode(&v) != nil {
		r.fail(n, path, fmt.Errorf("%w: expected a number, found %s", ErrType, describe(n)))
		return math.NaN()
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		r.fail(n, path, fmt.Errorf("%w, found %s", ErrNotFinite, n.Value))
		return math.NaN()
	}
	return v
}

// count reads a finite number >= 0.
func (r *reader) count(n *yaml.Node, path string) float64 {
	v := r.number(n, path, false)
	if r.err == nil && v < 0 {
		r.fail(deref(n), path, fmt.Errorf("%w: %v, expected a count >= 0", ErrInvalid, v))
	}
	return v
}

// share reads a number in [0,1] or null (NaN).
func (r *reader) share(n *yaml.Node, path string) float64 {
	v := r.number(n, path, true)
	if r.err == nil && !math.IsNaN(v) && !(v >= 0 && v <= 1) {
		r.fail(deref(n), path, fmt.Errorf("%w: %v, expected a share in [0,1] or null", ErrInvalid, v))
	}
	return v
}

func (r *reader) integer(n *yaml.Node, path string) int {
	n = deref(n)
	if r.err != nil || n == nil {
		return 0
	}
	var v int
	if n.Kind != yaml.ScalarNode || n.ShortTag() != "!!int" || n.Decode(&v) != nil || v < 0 {
		r.fail(n, path, fmt.Errorf("%w: expected a whole number >= 0, found %s", ErrType, describe(n)))
		return 0
	}
	return v
}

func (r *reader) list(n *yaml.Node, path string) []*yaml.Node {
	n = deref(n)
	if r.err != nil || n == nil {
		return nil
	}
	if n.Kind != yaml.SequenceNode {
		r.fail(n, path, fmt.Errorf("%w: expected a list, found %s", ErrType, describe(n)))
		return nil
	}
	return n.Content
}

func (r *reader) numbers(n *yaml.Node, path string) []float64 {
	items := r.list(n, path)
	out := make([]float64, 0, len(items))
	for i, item := range items {
		out = append(out, r.number(item, fmt.Sprintf("%s[%d]", path, i), false))
	}
	return out
}

// interval reads [lower, upper] of shares or nulls, or a null interval.
func (r *reader) interval(n *yaml.Node, path string) [2]float64 {
	if isNull(n) {
		return [2]float64{math.NaN(), math.NaN()}
	}
	return r.pair(n, path, r.share, intervalEnds)
}

// pairEnds names the two ends of a pair in the reader's messages.
type pairEnds struct{ expected, first, second string }

var (
	intervalEnds = pairEnds{"[lower, upper]", "lower end", "upper end"}
	rangeEnds    = pairEnds{"[low, high]", "low", "high"}
)

// pair reads a list of two values, each through read, the first not above
// the second; NaNs once the file is found wrong.
func (r *reader) pair(n *yaml.Node, path string, read func(*yaml.Node, string) float64, ends pairEnds) [2]float64 {
	items := r.list(n, path)
	if r.err == nil && len(items) != 2 {
		r.fail(deref(n), path, fmt.Errorf("%w: %d values, expected %s", ErrInvalid, len(items), ends.expected))
	}
	if r.err != nil {
		return [2]float64{math.NaN(), math.NaN()}
	}
	out := [2]float64{read(items[0], path+"[0]"), read(items[1], path+"[1]")}
	if r.err == nil && out[0] > out[1] {
		r.fail(deref(n), path, fmt.Errorf("%w: %s %v above %s %v", ErrInvalid, ends.first, out[0], ends.second, out[1]))
	}
	return out
}

// projectedInterval reads the interval of a projected figure: null, or
// [low, high] with low <= high, both shares when share is set.
func (r *reader) projectedInterval(n *yaml.Node, path string, share bool) [2]float64 {
	if isNull(n) {
		return [2]float64{math.NaN(), math.NaN()}
	}
	if share {
		return r.interval(n, path)
	}
	return r.pair(n, path, func(n *yaml.Node, path string) float64 { return r.number(n, path, false) }, rangeEnds)
}

func (r *reader) file_(doc *yaml.Node) *File {
	root := doc
	if doc.Kind == yaml.DocumentNode {
		if len(doc.Content) != 1 {
			r.fail(doc, "", fmt.Errorf("%w: an empty document, expected a decision file (format: %s)", ErrSyntax, Format))
			return nil
		}
		root = doc.Content[0]
	}
	// The format comes first, so that another kind of file is named as
	// such rather than by its first unknown key.
	f := &File{Format: r.format(root)}
	v2 := f.Format == Format
	required := []string{"format", "created", "tool_version", "data", "assumptions", "chosen", "candidates", "caution"}
	optional := []string{"note", "chosen_score"}
	if v2 {
		required = append(required, "model", "chosen_by", "curve", "sign_offs")
		optional = append(optional, "shift_schedule", "calibration")
	}
	top := r.fields(root, "", required, optional)
	f.Created = r.created(top["created"])
	f.ToolVersion = r.str(top["tool_version"], "tool_version")
	if v2 {
		m := r.fields(top["model"], "model", []string{"name", "version"}, nil)
		f.Model = Model{Name: r.optionalStr(m["name"], "model.name"), Version: r.optionalStr(m["version"], "model.version")}
		f.ChosenBy = r.optionalStr(top["chosen_by"], "chosen_by")
	}
	f.Data = r.data(top["data"])
	f.Assumptions = r.assumptions(top["assumptions"])
	if v2 {
		f.ShiftSchedule = r.schedule(top["shift_schedule"])
		f.Calibration = r.calibration(top["calibration"])
	}
	f.Chosen = r.str(top["chosen"], "chosen")
	items := r.list(top["candidates"], "candidates")
	for i, item := range items {
		f.Candidates = append(f.Candidates, r.candidate(item, fmt.Sprintf("candidates[%d]", i), f.Assumptions, v2))
	}
	if v2 {
		f.SignOffs = r.signOffs(top["sign_offs"])
		f.Curve = r.curve(top["curve"], f.Data)
		r.squaresOnCurve(f)
	}
	if r.err == nil && len(items) == 0 {
		r.fail(deref(top["candidates"]), "candidates", fmt.Errorf("%w: an empty list, expected at least one candidate", ErrInvalid))
	}
	f.Note = r.optionalStr(top["note"], "note")
	f.Caution = r.str(top["caution"], "caution")
	r.consistent(f)
	if node, ok := top["chosen_score"]; ok && r.err == nil {
		// A copy for deployment configs; it must agree with the candidate,
		// so that a hand edit of one without the other is caught.
		score := r.number(node, "chosen_score", false)
		for i, c := range f.Candidates {
			if r.err == nil && c.Name == f.Chosen && c.Cut.Score != score {
				r.fail(deref(node), "chosen_score", fmt.Errorf("%w: %v, but the chosen candidate %q (candidates[%d]) has score %v; make them agree", ErrInvalid, score, c.Name, i, c.Cut.Score))
			}
		}
	}
	return f
}

// format reads the format key of a file's root mapping, and fails on a
// format other than this one or the earlier one, and on a root that is no
// mapping.
func (r *reader) format(root *yaml.Node) string {
	m := deref(root)
	if m == nil {
		return ""
	}
	if m.Kind != yaml.MappingNode {
		r.fail(m, "", fmt.Errorf("%w: expected a mapping of keys, found %s; not a decision file (format: %s)", ErrType, describe(m), Format))
		return ""
	}
	format := ""
	for i := 0; i+1 < len(m.Content); i += 2 {
		if k := deref(m.Content[i]); k != nil && k.Kind == yaml.ScalarNode && k.Value == "format" {
			format = r.str(m.Content[i+1], "format")
			if r.err == nil && format != Format && format != FormatV1 {
				r.fail(m.Content[i+1], "format", fmt.Errorf("%w %q, expected %q (or the earlier %q)", ErrFormat, format, Format, FormatV1))
			}
		}
	}
	return format
}

// created reads the created key: an RFC 3339 timestamp.
func (r *reader) created(node *yaml.Node) time.Time {
	created := deref(node)
	if r.err != nil {
		return time.Time{}
	}
	var err error
	var t time.Time
	if created == nil || created.Kind != yaml.ScalarNode || (created.ShortTag() != "!!str" && created.ShortTag() != "!!timestamp") {
		err = fmt.Errorf("%w: expected an RFC 3339 timestamp, found %s", ErrType, describe(created))
	} else if t, err = time.Parse(time.RFC3339, created.Value); err != nil {
		err = fmt.Errorf("%w: %q, expected an RFC 3339 timestamp such as 2026-09-01T06:00:00Z", ErrInvalid, created.Value)
	}
	if err != nil {
		r.fail(created, "created", err)
	}
	return t
}

// consistent fails on a repeated candidate name, and on validation
// counts that do not add up: tp + fn must be the data's positives, fp + tn
// its negatives (when the file has them) and tp + fp the cases flagged, to
// within countTolerance of the larger side (weighted counts are sums of
// floats). A hand edit of one figure without the others is caught here,
// with the line of the figure.
func (r *reader) consistent(f *File) {
	seen := map[string]int{}
	for i, c := range f.Candidates {
		if r.err != nil {
			return
		}
		path := fmt.Sprintf("candidates[%d]", i)
		if j, ok := seen[c.Name]; ok {
			r.failAt(path+".name", fmt.Errorf("%w: %q is also the name of candidates[%d], expected unique names", ErrInvalid, c.Name, j))
			return
		}
		seen[c.Name] = i
		if len(f.Curve) > 0 && !onCurve(f.Curve, c.Cut.Score) {
			r.failAt(path+".score", fmt.Errorf("%w: %v is not a cut of the curve, expected every candidate's cut in it", ErrInvalid, c.Cut.Score))
			return
		}
		e, vp := c.Cut, path+".validation"
		switch {
		case !sameCount(e.TP+e.FN, f.Data.Positives):
			r.failAt(vp+".tp", fmt.Errorf("%w: tp %v + fn %v = %v, expected data.positives %v; were the counts edited by hand?", ErrInvalid, e.TP, e.FN, e.TP+e.FN, f.Data.Positives))
		case !math.IsNaN(f.Data.Negatives) && !sameCount(e.FP+e.TN, f.Data.Negatives):
			r.failAt(vp+".fp", fmt.Errorf("%w: fp %v + tn %v = %v, expected data.negatives %v; were the counts edited by hand?", ErrInvalid, e.FP, e.TN, e.FP+e.TN, f.Data.Negatives))
		case !sameCount(e.TP+e.FP, e.Flagged):
			r.failAt(vp+".flagged", fmt.Errorf("%w: %v, expected tp + fp = %v; were the counts edited by hand?", ErrInvalid, e.Flagged, e.TP+e.FP))
		}
	}
}

func onCurve(points []CurvePoint, score float64) bool {
	for _, p := range points {
		if p.Score == score {
			return true
		}
	}
	return false
}

// countTolerance is the relative slack of sameCount.
const countTolerance = 1e-9

// sameCount reports whether two (possibly weighted) counts agree to
// within countTolerance of the larger.
func sameCount(a, b float64) bool {
	return math.Abs(a-b) <= countTolerance*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

// failAt fails at the line recorded for path (or its nearest parent).
func (r *reader) failAt(path string, err error) {
	if r.err == nil {
		r.err = &ParseError{File: r.file, Line: r.lineOf(path), Path: path, Err: err}
	}
}

func (r *reader) data(n *yaml.Node) Data {
	m := r.fields(n, "data",
		[]string{"path", "sha256", "rows", "positives", "score_column", "label_column", "lower_is_riskier", "score_histogram"},
		[]string{"negatives", "weight_column", "weight_kind", "ranking", "squared_weights"})
	d := Data{
		Path:           r.str(m["path"], "data.path"),
		SHA256:         r.str(m["sha256"], "data.sha256"),
		Rows:           r.integer(m["rows"], "data.rows"),
		Positives:      r.count(m["positives"], "data.positives"),
		Negatives:      math.NaN(),
		ScoreColumn:    r.str(m["score_column"], "data.score_column"),
		LabelColumn:    r.str(m["label_column"], "data.label_column"),
		WeightColumn:   r.optionalStr(m["weight_column"], "data.weight_column"),
		LowerIsRiskier: r.boolean(m["lower_is_riskier"], "data.lower_is_riskier"),
	}
	if r.err == nil && !isDigest(d.SHA256) {
		r.fail(deref(m["sha256"]), "data.sha256", fmt.Errorf("%w: %q, expected 64 hexadecimal digits (or empty for data not read from a file)", ErrInvalid, d.SHA256))
	}
	if v, ok := m["negatives"]; ok && !isNull(v) {
		d.Negatives = r.count(v, "data.negatives")
	}
	if v, ok := m["weight_kind"]; ok && !isNull(v) {
		name := r.str(v, "data.weight_kind")
		kind, err := design.ParseKind(name)
		if r.err == nil && err != nil {
			r.fail(deref(v), "data.weight_kind", fmt.Errorf("%w: %q, expected frequency or sampling (or null)", ErrInvalid, name))
		}
		d.WeightKind = kind
	}
	h := r.fields(m["score_histogram"], "data.score_histogram", []string{"edges", "counts"}, nil)
	d.Histogram = Histogram{
		Edges:  r.numbers(h["edges"], "data.score_histogram.edges"),
		Counts: r.numbers(h["counts"], "data.score_histogram.counts"),
	}
	if v, ok := m["ranking"]; ok && !isNull(v) {
		d.Ranking = r.ranking(v)
	}
	if v, ok := m["squared_weights"]; ok && !isNull(v) {
		d.Squares = r.squares(v, d)
	}
	return d
}

// ranking reads data.ranking: the ROC AUC and average precision, shares or
// null, each with an interval that holds it when both are given.
func (r *reader) ranking(n *yaml.Node) *Ranking {
	const path = "data.ranking"
	m := r.fields(n, path, []string{"roc_auc", "roc_auc_ci", "average_precision", "average_precision_ci"}, nil)
	out := &Ranking{
		ROCAUC:             r.share(m["roc_auc"], path+".roc_auc"),
		ROCAUCCI:           r.interval(m["roc_auc_ci"], path+".roc_auc_ci"),
		AveragePrecision:   r.share(m["average_precision"], path+".average_precision"),
		AveragePrecisionCI: r.interval(m["average_precision_ci"], path+".average_precision_ci"),
	}
	for _, c := range []struct {
		key string
		v   float64
		ci  [2]float64
	}{{"roc_auc_ci", out.ROCAUC, out.ROCAUCCI}, {"average_precision_ci", out.AveragePrecision, out.AveragePrecisionCI}} {
		if r.err == nil && !math.IsNaN(c.v) && !math.IsNaN(c.ci[0]) && !math.IsNaN(c.ci[1]) && !(c.ci[0] <= c.v && c.v <= c.ci[1]) {
			r.fail(deref(m[c.key]), path+"."+c.key, fmt.Errorf("%w: [%v, %v] does not hold the figure %v", ErrInvalid, c.ci[0], c.ci[1], c.v))
		}
	}
	return out
}

// isDigest reports whether s is a hex SHA-256 digest or empty.
func isDigest(s string) bool {
	if s == "" {
		return true
	}
	if len(s) != 64 {
		return false
	}
	for _, c := range s {
		if !(c >= '0' && c <= '9' || c >= 'a' && c <= 'f' || c >= 'A' && c <= 'F') {
			return false
		}
	}
	return true
}

func (r *reader) assumptions(n *yaml.Node) projection.Assumptions {
	m := r.fields(n, "assumptions", []string{"base_rate", "volume_per_shift", "cost_false_alert", "cost_miss", "cost_hit", "capacity", "confidence"}, nil)
	a := projection.Assumptions{
		BaseRate:   r.number(m["base_rate"], "assumptions.base_rate", false),
		Confidence: r.number(m["confidence"], "assumptions.confidence", false),
	}
	positive := func(key string) float64 {
		if isNull(m[key]) {
			return 0
		}
		v := r.number(m[key], "assumptions."+key, false)
		if r.err == nil && !(v > 0) {
			r.fail(deref(m[key]), "assumptions."+key, fmt.Errorf("%w: %v, expected a positive number or null", ErrInvalid, v))
		}
		return v
	}
	a.Volume = positive("volume_per_shift")
	a.Capacity = positive("capacity")
	var costs [3]float64
	anyCost := false
	for i, key := range []string{"cost_false_alert", "cost_miss", "cost_hit"} {
		if !isNull(m[key]) {
			costs[i] = r.number(m[key], "assumptions."+key, false)
			anyCost = true
		}
	}
	if anyCost {
		a.Costs = &projection.Costs{FalseAlert: costs[0], Miss: costs[1], Hit: costs[2]}
	}
	if r.err == nil && !(a.BaseRate >= 0 && a.BaseRate <= 1) {
		r.fail(deref(m["base_rate"]), "assumptions.base_rate", fmt.Errorf("%w: %v, expected a share in [0,1]", ErrInvalid, a.BaseRate))
	}
	if r.err == nil && !(a.Confidence > 0 && a.Confidence < 1) {
		r.fail(deref(m["confidence"]), "assumptions.confidence", fmt.Errorf("%w: %v, expected a level in (0,1) such as 0.95", ErrInvalid, a.Confidence))
	}
	return a
}

func (r *reader) candidate(n *yaml.Node, path string, a projection.Assumptions, v2 bool) Candidate {
	optional := []string{"rule", "note"}
	if v2 {
		optional = append(optional, "stability", "segments", "shifts", "rule_holds", "rule_picks", "promise", "cost_optimism")
	}
	m := r.fields(n, path, []string{"name", "score", "validation", "projected"}, optional)
	c := Candidate{
		Name: r.str(m["name"], path+".name"),
		Rule: r.optionalStr(m["rule"], path+".rule"),
		Note: r.optionalStr(m["note"], path+".note"),
	}
	e := &c.Cut
	e.Score = r.number(m["score"], path+".score", false)

	vp := path + ".validation"
	v := r.fields(m["validation"], vp,
		[]string{"flagged", "tp", "fp", "fn", "tn", "recall", "recall_ci", "precision", "precision_ci", "false_positive_rate"},
		[]string{"rows", "flagged_share", "false_discovery_rate", "false_discovery_ci", "effective_trials"})
	e.Flagged = r.count(v["flagged"], vp+".flagged")
	e.TP = r.count(v["tp"], vp+".tp")
	e.FP = r.count(v["fp"], vp+".fp")
	e.FN = r.count(v["fn"], vp+".fn")
	e.TN = r.count(v["tn"], vp+".tn")
	e.Recall = r.share(v["recall"], vp+".recall")
	e.RecallCI = r.interval(v["recall_ci"], vp+".recall_ci")
	e.Precision = r.share(v["precision"], vp+".precision")
	e.PrecisionCI = r.interval(v["precision_ci"], vp+".precision_ci")
	e.FalsePositiveRate = r.share(v["false_positive_rate"], vp+".false_positive_rate")
	if node, ok := v["rows"]; ok {
		e.Rows = r.integer(node, vp+".rows")
	} else {
		e.Rows = int(math.Round(e.Flagged))
	}
	if node, ok := v["flagged_share"]; ok {
		e.FlaggedShare = r.share(node, vp+".flagged_share")
	} else if total := e.TP + e.FP + e.FN + e.TN; total > 0 {
		e.FlaggedShare = e.Flagged / total
	} else {
		e.FlaggedShare = math.NaN()
	}
	if node, ok := v["false_discovery_rate"]; ok {
		e.FalseDiscoveryRate = r.share(node, vp+".false_discovery_rate")
	} else {
		e.FalseDiscoveryRate = 1 - e.Precision
	}
	if node, ok := v["false_discovery_ci"]; ok {
		e.FalseDiscoveryCI = r.interval(node, vp+".false_discovery_ci")
	} else {
		e.FalseDiscoveryCI = [2]float64{1 - e.PrecisionCI[1], 1 - e.PrecisionCI[0]}
	}
	// Frequency weights' trials are the weighted counts; sampling
	// weights' are written out.
	e.Trials = evidence.FrequencyTrials(curve.Point{TP: e.TP, FP: e.FP, FN: e.FN, TN: e.TN})
	if node, ok := v["effective_trials"]; ok && !isNull(node) {
		tp := vp + ".effective_trials"
		t := r.fields(node, tp, []string{"recall", "false_positive_rate", "precision", "flagged_share", "base_rate"}, nil)
		e.Trials = evidence.Trials{
			Recall:            r.count(t["recall"], tp+".recall"),
			FalsePositiveRate: r.count(t["false_positive_rate"], tp+".false_positive_rate"),
			Precision:         r.count(t["precision"], tp+".precision"),
			FlaggedShare:      r.count(t["flagged_share"], tp+".flagged_share"),
			BaseRate:          r.count(t["base_rate"], tp+".base_rate"),
		}
	}

	pp := path + ".projected"
	p := r.fields(m["projected"], pp, []string{"alert_rate", "precision", "queue_per_shift", "cost_per_shift"},
		[]string{"cost_per_case", "precision_ci", "alert_rate_ci", "queue_per_shift_ci", "cost_per_shift_ci", "cost_per_case_ci"})
	e.Projected.AlertRate = r.share(p["alert_rate"], pp+".alert_rate")
	e.Projected.Precision = r.share(p["precision"], pp+".precision")
	e.Projected.QueuePerShift = r.number(p["queue_per_shift"], pp+".queue_per_shift", true)
	e.Projected.CostPerShift = r.number(p["cost_per_shift"], pp+".cost_per_shift", true)
	if node, ok := p["cost_per_case"]; ok {
		e.Projected.CostPerCase = r.number(node, pp+".cost_per_case", true)
	} else if a.Volume > 0 {
		e.Projected.CostPerCase = e.Projected.CostPerShift / a.Volume
	} else {
		e.Projected.CostPerCase = math.NaN()
	}
	// The projected figures' intervals; a file written before they were
	// recorded gets them from its counts and assumptions, as they would
	// have been written.
	e.ProjectedCI = projection.IntervalsOf(projection.Counts{TP: e.TP, FP: e.FP, FN: e.FN, TN: e.TN}, a)
	for _, iv := range []struct {
		key   string
		ci    *[2]float64
		share bool
	}{
		{"precision_ci", &e.ProjectedCI.Precision, true},
		{"alert_rate_ci", &e.ProjectedCI.AlertRate, true},
		{"queue_per_shift_ci", &e.ProjectedCI.QueuePerShift, false},
		{"cost_per_shift_ci", &e.ProjectedCI.CostPerShift, false},
		{"cost_per_case_ci", &e.ProjectedCI.CostPerCase, false},
	} {
		if node, ok := p[iv.key]; ok {
			*iv.ci = r.projectedInterval(node, pp+"."+iv.key, iv.share)
		}
	}
	c.Stability = r.stability(m["stability"], path+".stability")
	c.Segments = r.segments(m["segments"], path+".segments")
	c.Shifts = r.shifts(m["shifts"], path+".shifts")
	c.RuleCheck = r.ruleCheck(m["rule_holds"], m["rule_picks"], path, e.Score)
	c.Promise = r.promise(m, path, c.Rule)
	c.Optimism = r.optimism(m["cost_optimism"], path+".cost_optimism", c.Rule, *e, a.Volume)
	return c
}

// ruleCheck reads rule_holds (true, false or null: no check) and
// rule_picks (a score or null: no cut meets the rule) of the candidate at
// path; rule_picks without rule_holds is an error. A rule that holds picks
// the candidate's score when rule_picks is absent.
func (r *reader) ruleCheck(holds, picks *yaml.Node, path string, score float64) *RuleCheck {
	if r.err != nil {
		return nil
	}
	if isNull(holds) {
		if !isNull(picks) {
			r.fail(deref(picks), path+".rule_picks", fmt.Errorf("%w: a score the rule picks without rule_holds, expected null", ErrInvalid))
		}
		return nil
	}
	k := &RuleCheck{Holds: r.boolean(holds, path+".rule_holds"), Picks: math.NaN()}
	switch {
	case picks != nil:
		k.Picks = r.number(picks, path+".rule_picks", true)
	case k.Holds:
		k.Picks = score
	}
	return k
}
