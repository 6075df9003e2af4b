package tui

// shared is what every pane of a screen shares: the terminal's size, the
// styles and the keys.
type shared struct {
	width, height int
	styles        Styles
	keys          KeyMap
}

// newShared returns what the panes of a screen share, with the given styles
// and keys where not nil and the plain styles and default keys otherwise.
func newShared(styles *Styles, keys *KeyMap) *shared {
	ctx := &shared{styles: PlainStyles(), keys: DefaultKeyMap()}
	if styles != nil {
		ctx.styles = *styles
	}
	if keys != nil {
		ctx.keys = *keys
	}
	return ctx
}
