package tui

import (
	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"

	"github.com/sill-tool/sill/internal/cutrule"
	"github.com/sill-tool/sill/internal/format"
)

// KeyMap is every key the explorer takes, grouped as the help shows them.
// Bindings that do not apply at the moment (a starting point the
// assumptions do not allow, strip keys with no candidate pinned) are
// disabled and drop out of the help.
type KeyMap struct {
	// Moving the cut
	Up, Down         key.Binding // one cut stricter / looser
	PageUp, PageDown key.Binding // a page of the ranked list
	Top, Bottom      key.Binding // the strictest / loosest cut

	// Starting points, in the order of cutrule.Defaults
	BaseRate, Hit, Wrong, Capacity, LeastCost key.Binding
	// HitBound and WrongBound are hit95= and wrong95=, the starting points
	// with a promise, after the others.
	HitBound, WrongBound key.Binding
	// Peak is queue90 at the capacity, after the others, with case times.
	Peak key.Binding

	// Views and panes
	CurveView key.Binding // cycle the chart between its views
	Focus     key.Binding // move the keys between the ranked list and the strip

	// Beyond the averages
	Segments     key.Binding // show or hide the breakdown by segment
	SegmentOrder key.Binding // in the breakdown: the next order (size, gap, name)
	Stability    key.Binding // resample the set (the bootstrap), or stop resampling
	Calibration  key.Binding // show or hide whether the scores read as probabilities
	Models       key.Binding // show or hide the two models' cuts side by side

	// Candidates
	Pin       key.Binding // pin the cursor's cut
	Left      key.Binding // select the candidate to the left
	Right     key.Binding // select the candidate to the right
	Jump      key.Binding // move the cursor to the selected candidate
	Remove    key.Binding // unpin the selected candidate
	MoveLeft  key.Binding // move the selected candidate one place left
	MoveRight key.Binding // move the selected candidate one place right
	Rename    key.Binding // rename the selected candidate
	Choose    key.Binding // make the selected candidate the chosen one (the reference)
	Repin     key.Binding // move the selected candidate to the cut its rule picks under the current assumptions

	// Files, forms and help
	Assumptions key.Binding // open the assumptions form
	Record      key.Binding // open the form of the model and who chose
	Write       key.Binding // write the decision file
	Help        key.Binding // show or hide every key
	HelpPage    key.Binding // in the help: the next page (keys, then the terms on screen)
	Quit        key.Binding
	Interrupt   key.Binding // quits from anywhere, forms included

	// Inside forms and questions
	NextField, PrevField key.Binding
	Accept, Cancel       key.Binding
	Yes, No              key.Binding
	// When the file changed on disk since the screen read or wrote it
	Reload, WriteElsewhere key.Binding
}

// DefaultKeyMap returns the explorer's keys. README.md lists them (section "The explorer").
func DefaultKeyMap() KeyMap {
	return KeyMap{
		Up:       key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑/k", "stricter cut, one score up")),
		Down:     key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↓/j", "looser cut, one score down")),
		PageUp:   key.NewBinding(key.WithKeys("pgup", "ctrl+u"), key.WithHelp("pgup/ctrl+u", "a page stricter")),
		PageDown: key.NewBinding(key.WithKeys("pgdown", "ctrl+d"), key.WithHelp("pgdn/ctrl+d", "a page looser")),
		Top:      key.NewBinding(key.WithKeys("home", "g"), key.WithHelp("home/g", "strictest cut")),
		Bottom:   key.NewBinding(key.WithKeys("end", "G"), key.WithHelp("end/G", "loosest cut, flag all")),

		BaseRate:   key.NewBinding(key.WithKeys("1"), key.WithHelp("1", "flag as many as the base rate")),
		Hit:        key.NewBinding(key.WithKeys("2"), key.WithHelp("2", "hit share 80%, this set only")),
		Wrong:      key.NewBinding(key.WithKeys("3"), key.WithHelp("3", "wrong-alert 1/3, this set only")),
		HitBound:   key.NewBinding(key.WithKeys("4"), key.WithHelp("4", "hit share 80% or more, 95% sure")),
		WrongBound: key.NewBinding(key.WithKeys("5"), key.WithHelp("5", "wrong-alert share 1/3 or less, 95% sure")),
		Capacity:   key.NewBinding(key.WithKeys("4"), key.WithHelp("4", "queue at capacity")),
		LeastCost:  key.NewBinding(key.WithKeys("5"), key.WithHelp("5", "least cost")),
		Peak:       key.NewBinding(key.WithKeys("6"), key.WithHelp("6", "9 shifts in 10 at capacity")),

		CurveView: key.NewBinding(key.WithKeys("v"), key.WithHelp("v", "next chart view")),
		Focus:     key.NewBinding(key.WithKeys("tab"), key.WithHelp("tab", "keys to list / strip")),

		Segments:     key.NewBinding(key.WithKeys("s"), key.WithHelp("s", "segments at this cut")),
		SegmentOrder: key.NewBinding(key.WithKeys("o"), key.WithHelp("o", "segments: next order")),
		Stability:    key.NewBinding(key.WithKeys("b"), key.WithHelp("b", "resample: how stable (stop)")),
		Calibration:  key.NewBinding(key.WithKeys("e"), key.WithHelp("e", "are scores probabilities")),
		Models:       key.NewBinding(key.WithKeys("m"), key.WithHelp("m", "two models side by side")),

		Pin:       key.NewBinding(key.WithKeys("p"), key.WithHelp("p", "pin this cut")),
		Left:      key.NewBinding(key.WithKeys("left", "h"), key.WithHelp("←/h", "previous candidate")),
		Right:     key.NewBinding(key.WithKeys("right", "l"), key.WithHelp("→/l", "next candidate")),
		Jump:      key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "cursor to candidate")),
		Remove:    key.NewBinding(key.WithKeys("x", "delete"), key.WithHelp("x/del", "unpin candidate")),
		MoveLeft:  key.NewBinding(key.WithKeys("<", ","), key.WithHelp("</,", "move candidate left")),
		MoveRight: key.NewBinding(key.WithKeys(">", "."), key.WithHelp(">/.", "move candidate right")),
		Rename:    key.NewBinding(key.WithKeys("r"), key.WithHelp("r", "rename candidate")),
		Choose:    key.NewBinding(key.WithKeys("c"), key.WithHelp("c", "choose: the others vs it")),
		Repin:     key.NewBinding(key.WithKeys("R"), key.WithHelp("R", "re-pin to its rule's cut")),

		Assumptions: key.NewBinding(key.WithKeys("a"), key.WithHelp("a", "edit assumptions")),
		Record:      key.NewBinding(key.WithKeys("i"), key.WithHelp("i", "model and who chose")),
		Write:       key.NewBinding(key.WithKeys("w"), key.WithHelp("w", "write decision file")),
		Help:        key.NewBinding(key.WithKeys("?"), key.WithHelp("?", "help")),
		HelpPage:    key.NewBinding(key.WithKeys("tab", "right", "l", "left", "h", "shift+tab"), key.WithHelp("tab/←→", "next page: keys, terms")),
		Quit:        key.NewBinding(key.WithKeys("q", "ctrl+c"), key.WithHelp("q", "quit")),
		Interrupt:   key.NewBinding(key.WithKeys("ctrl+c"), key.WithHelp("ctrl+c", "quit, from forms too")),

		NextField: key.NewBinding(key.WithKeys("tab", "down"), key.WithHelp("tab/↓", "next field")),
		PrevField: key.NewBinding(key.WithKeys("shift+tab", "up"), key.WithHelp("shift+tab/↑", "previous field")),
		Accept:    key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "apply")),
		Cancel:    key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "cancel")),
		Yes:       key.NewBinding(key.WithKeys("y"), key.WithHelp("y", "yes, replace")),
		No:        key.NewBinding(key.WithKeys("n", "esc"), key.WithHelp("n/esc", "no, keep it")),

		Reload:         key.NewBinding(key.WithKeys("r"), key.WithHelp("r", "reload the file")),
		WriteElsewhere: key.NewBinding(key.WithKeys("o"), key.WithHelp("o", "write to another file")),
	}
}

// reviewKeys are the explorer's keys plus the two note keys.
type reviewKeys struct {
	KeyMap
	Note     key.Binding // note on the selected candidate
	FileNote key.Binding // note on the whole file
	Sign     key.Binding // the sign-off form
	Chart    key.Binding // the trade-off drawn from the stored curve
	Against  key.Binding // what changes against the cut in production (with --against)
	// ScrollUp and ScrollDown bring the strip's rows above or below into
	// view when they do not all fit.
	ScrollUp, ScrollDown key.Binding
}

// newReviewKeys returns the review screen's keys made from the explorer's
// k: the help words of the keys it shares say what they do there.
func newReviewKeys(k KeyMap) reviewKeys {
	k.Choose.SetHelp("c", "choose this candidate")
	k.Write.SetHelp("w", "write the file")
	k.Left.SetHelp("←/h", "previous candidate")
	k.Right.SetHelp("→/l", "next candidate")
	k.Accept.SetHelp("enter", "keep the note")
	k.enableReview()
	return reviewKeys{
		KeyMap:     k,
		Note:       key.NewBinding(key.WithKeys("n"), key.WithHelp("n", "note on this candidate")),
		FileNote:   key.NewBinding(key.WithKeys("N"), key.WithHelp("N", "note on the file")),
		Sign:       key.NewBinding(key.WithKeys("S"), key.WithHelp("S", "sign off (written at once)")),
		Chart:      key.NewBinding(key.WithKeys("t"), key.WithHelp("t", "the trade-off chart, candidates marked")),
		Against:    key.NewBinding(key.WithKeys("d"), key.WithHelp("d", "what changes against the cut in production")),
		ScrollUp:   key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑/k", "the figures above, when they do not all fit")),
		ScrollDown: key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↓/j", "the figures below (the intervals stay in view)")),
	}
}

// enableExplorer turns on the explorer's keys that apply to s and turns
// off the others: a starting point's key only when the assumptions give
// that point (the capacity, least-cost and 9-in-10 keys follow their place
// in s.starts), the views beyond the averages when the data allows them,
// and the strip's keys only while the strip has the keys.
func (k *KeyMap) enableExplorer(s *session, stripFocused bool) {
	for _, b := range []*key.Binding{&k.BaseRate, &k.Hit, &k.Wrong, &k.HitBound, &k.WrongBound, &k.Capacity, &k.LeastCost, &k.Peak} {
		b.SetEnabled(false)
	}
	for i, o := range s.starts {
		switch o.Rule.Kind {
		case cutrule.Base:
			k.BaseRate.SetEnabled(true)
		case cutrule.Hit:
			k.Hit.SetEnabled(true)
		case cutrule.Wrong:
			k.Wrong.SetEnabled(true)
		case cutrule.HitBound:
			k.HitBound.SetEnabled(true)
			k.HitBound.SetKeys(keyName(i))
			k.HitBound.SetHelp(keyName(i), "hit share ≥ "+format.Share(o.Rule.Value)+", "+format.Level(o.Rule.Confidence())+" sure")
		case cutrule.WrongBound:
			k.WrongBound.SetEnabled(true)
			k.WrongBound.SetKeys(keyName(i))
			k.WrongBound.SetHelp(keyName(i), "wrong-alert ≤ "+format.Share(o.Rule.Value)+", "+format.Level(o.Rule.Confidence())+" sure")
		case cutrule.Queue:
			k.Capacity.SetEnabled(true)
			k.Capacity.SetHelp(keyName(i), "queue at capacity ("+format.Count(o.Rule.Value)+")")
		case cutrule.Cost:
			k.LeastCost.SetEnabled(true)
			k.LeastCost.SetKeys(keyName(i))
			k.LeastCost.SetHelp(keyName(i), "least cost")
		case cutrule.Queue90:
			k.Peak.SetEnabled(true)
			k.Peak.SetKeys(keyName(i))
			k.Peak.SetHelp(keyName(i), "9 shifts in 10 at capacity ("+format.Count(o.Rule.Value)+")")
		}
	}
	if s.set != nil {
		k.Segments.SetEnabled(s.hasSegments())
		k.SegmentOrder.SetEnabled(s.hasSegments())
		k.Models.SetEnabled(s.second() != nil)
		k.Stability.SetEnabled(true)
		k.Calibration.SetEnabled(true)
	}
	strip := stripFocused && len(s.pins) > 0
	for _, b := range []*key.Binding{&k.Left, &k.Right, &k.Jump, &k.Remove, &k.MoveLeft, &k.MoveRight, &k.Rename, &k.Choose} {
		b.SetEnabled(strip)
	}
	// Re-pinning applies to a candidate pinned under earlier assumptions
	// whose rule picks a cut now.
	k.Repin.SetEnabled(strip && s.selected < len(s.pins) && s.pins[s.selected].moved && s.pins[s.selected].now >= 0)
}

// enableReview turns on the keys the review screen takes, whatever the
// explorer's rules left them, and turns off the strip's keys that change
// the candidates, which the review screen never does.
func (k *KeyMap) enableReview() {
	for _, b := range []*key.Binding{&k.Left, &k.Right, &k.Choose, &k.Write, &k.Help, &k.Quit} {
		b.SetEnabled(true)
	}
	for _, b := range []*key.Binding{&k.Jump, &k.Remove, &k.MoveLeft, &k.MoveRight, &k.Rename, &k.Repin} {
		b.SetEnabled(false)
	}
}

// keyName is the key of the starting point at place i: 1 for the first.
func keyName(i int) string { return string(rune('1' + i)) }

// matchesDisabled reports whether msg is the key of b while b is turned
// off, so that the screen can say why the key does nothing here.
func matchesDisabled(msg tea.KeyMsg, b key.Binding) bool {
	if b.Enabled() {
		return false
	}
	b.SetEnabled(true)
	return key.Matches(msg, b)
}
