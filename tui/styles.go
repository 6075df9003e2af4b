package tui

import (
	"io"

	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"
)

// Styles are every look the explorer uses, named for their job. Panes take
// their styles from here and never build their own. Nothing on screen
// relies on colour alone: the cut line, the cursor's tie group, true cases
// and over-capacity figures also carry a mark or a word, so the screen
// reads the same on a monochrome terminal or with NO_COLOR set.
type Styles struct {
	Pane        lipgloss.Style // the frame of a pane without focus
	FocusedPane lipgloss.Style // the frame of the pane the keys go to
	Overlay     lipgloss.Style // the frame of help, forms and questions
	PaneEdge    lipgloss.Style // the colour of Pane's border, for its title line
	FocusedEdge lipgloss.Style // the colour of FocusedPane's border
	OverlayEdge lipgloss.Style // the colour of Overlay's border
	Title       lipgloss.Style // a pane's title in its top border
	Header      lipgloss.Style // the top line: data and assumptions
	Footer      lipgloss.Style // the bottom line of key hints
	Key         lipgloss.Style // a key in a hint
	Status      lipgloss.Style // the last thing that happened (saved, refused)

	Flagged    lipgloss.Style // a ranked row above the cut
	Unflagged  lipgloss.Style // a ranked row below the cut
	CurrentCut lipgloss.Style // the rows of the cursor's tie group
	CutLine    lipgloss.Style // the line between flagged and unflagged rows
	TrueCase   lipgloss.Style // the mark of a true case
	ColumnHead lipgloss.Style // table headings

	Figure    lipgloss.Style // a headline figure
	Label     lipgloss.Style // the name of a figure
	Muted     lipgloss.Style // secondary text: intervals, counts, units
	Warning   lipgloss.Style // over capacity, refused input, unmet rules
	Good      lipgloss.Style // a difference in the better direction
	Bad       lipgloss.Style // a difference in the worse direction
	OnRule    lipgloss.Style // a starting point the cursor sits on
	Reference lipgloss.Style // the chosen (reference) candidate's heading
	Selected  lipgloss.Style // the selected candidate or form field

	HitLine    lipgloss.Style // the hit share series on the curve
	WrongLine  lipgloss.Style // the wrong-alert share series on the curve
	Marker     lipgloss.Style // the cursor's mark on the curve
	Axis       lipgloss.Style // chart axes and labels
	Band       lipgloss.Style // the bootstrap's band around the curves
	SecondLine lipgloss.Style // the second model's series
}

// DefaultStyles returns the explorer's styles for renderer r. With an ASCII
// colour profile (set it for NO_COLOR, a monochrome terminal or tests)
// every style renders as plain text.
func DefaultStyles(r *lipgloss.Renderer) Styles {
	border := lipgloss.RoundedBorder()
	// The sixteen terminal colours follow the user's theme, light or dark,
	// without asking the terminal for its background: that question goes
	// unanswered over some links and would hold up the first frame.
	accent := lipgloss.Color("6") // cyan
	muted := lipgloss.Color("8")  // bright black, grey in most themes
	warn := lipgloss.Color("1")   // red
	good := lipgloss.Color("2")   // green
	return Styles{
		Pane:        r.NewStyle().Border(border).BorderForeground(muted),
		FocusedPane: r.NewStyle().Border(lipgloss.ThickBorder()).BorderForeground(accent),
		Overlay:     r.NewStyle().Border(lipgloss.DoubleBorder()).BorderForeground(accent).Padding(0, 1),
		PaneEdge:    r.NewStyle().Foreground(muted),
		FocusedEdge: r.NewStyle().Foreground(accent),
		OverlayEdge: r.NewStyle().Foreground(accent),
		Title:       r.NewStyle().Bold(true),
		Header:      r.NewStyle().Bold(true),
		Footer:      r.NewStyle().Foreground(muted),
		Key:         r.NewStyle().Bold(true).Foreground(accent),
		Status:      r.NewStyle().Bold(true),

		Flagged:    r.NewStyle(),
		Unflagged:  r.NewStyle().Foreground(muted),
		CurrentCut: r.NewStyle().Reverse(true),
		CutLine:    r.NewStyle().Foreground(accent).Bold(true),
		TrueCase:   r.NewStyle().Foreground(warn).Bold(true),
		ColumnHead: r.NewStyle().Underline(true),

		Figure:    r.NewStyle().Bold(true),
		Label:     r.NewStyle(),
		Muted:     r.NewStyle().Foreground(muted),
		Warning:   r.NewStyle().Foreground(warn).Bold(true),
		Good:      r.NewStyle().Foreground(good),
		Bad:       r.NewStyle().Foreground(warn),
		OnRule:    r.NewStyle().Reverse(true),
		Reference: r.NewStyle().Bold(true).Underline(true),
		Selected:  r.NewStyle().Reverse(true),

		HitLine:    r.NewStyle().Foreground(accent),
		WrongLine:  r.NewStyle().Foreground(warn),
		Marker:     r.NewStyle().Bold(true),
		Axis:       r.NewStyle().Foreground(muted),
		Band:       r.NewStyle().Foreground(muted),
		SecondLine: r.NewStyle().Foreground(lipgloss.Color("5")), // magenta
	}
}

// PlainStyles returns the styles with every colour and attribute off, as
// NO_COLOR asks and as the golden-frame tests draw.
func PlainStyles() Styles {
	r := lipgloss.NewRenderer(io.Discard)
	r.SetColorProfile(termenv.Ascii)
	return DefaultStyles(r)
}
