package scores

// SetInputEnded sets the function the block reader calls when its input
// ends (see inputEnded) and returns a function that puts the old one back.
func SetInputEnded(f func()) (restore func()) {
	old := inputEnded
	inputEnded = f
	return func() { inputEnded = old }
}
