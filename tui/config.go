package tui

import (
	"context"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/projection"
	"github.com/sill-tool/sill/internal/scores"
	"github.com/sill-tool/sill/internal/segment"
)

// Config is what the explorer needs from the command line.
type Config struct {
	// Load reads the scores; it runs in the background and may call
	// progress with the rows read so far.
	Load func(progress func(rows int)) (*scores.Set, error)
	// Assume returns the starting assumptions for the loaded set.
	Assume func(set *scores.Set) (projection.Assumptions, error)
	// Out is the decision file the write key saves to.
	Out string
	// Context ends writes in progress when it is cancelled; nil means
	// context.Background().
	Context context.Context
	// ToolVersion is written into the decision file.
	ToolVersion string
	// Model and ChosenBy are written into the decision file (keys model
	// and chosen_by); the assumptions form changes them.
	Model    decision.Model
	ChosenBy string
	// Styles and Keys; zero values take PlainStyles and DefaultKeyMap.
	Styles *Styles
	Keys   *KeyMap

	// Analysis says what loading computes beyond the averages (package
	// analysis): with a shift schedule and case times in the set, the
	// queue figure shows the real shifts of the validation period and
	// queue90 at the capacity is a starting point. Its Resampling is the
	// bootstrap the b key runs (Replicates 0: none); its Rules are
	// ignored, since the explorer works from the starting points.
	Analysis analysis.Options
	// SegmentOrder is the first order of the segments overlay.
	SegmentOrder segment.Order
	// ReadOnly turns the write key off and quits without asking about
	// pins not written, for an explorer served to others (sill serve):
	// it writes nothing.
	ReadOnly bool
}
