package format

import (
	"strconv"
	"strings"
)

// Plural is a whole number n, written plainly, with the noun that agrees
// with it: "1 row", "0 rows", "6000 rows".
func Plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// Grid lays out a heading and rows as text columns padded to their widest
// cell: the first column left-aligned, the others right-aligned (they hold
// figures), two spaces apart, with no trailing spaces. When wordsLast is
// set the last column is left-aligned too, for a column of words (a note,
// a sentence). Every row has as many cells as the heading. Cells pass
// through Printable.
func Grid(header []string, rows [][]string, wordsLast bool) string {
	// Cells are made printable first, so that a value written out as
	// "\x1b" is measured as it will show.
	all := make([][]string, 0, len(rows)+1)
	for _, row := range append([][]string{header}, rows...) {
		printable := make([]string, len(row))
		for i, cell := range row {
			printable[i] = Printable(cell)
		}
		all = append(all, printable)
	}
	widths := make([]int, len(header))
	for _, row := range all {
		for i, cell := range row {
			widths[i] = max(widths[i], len([]rune(cell)))
		}
	}
	var b strings.Builder
	for _, row := range all {
		b.WriteString(gridRow(row, widths, wordsLast))
	}
	return b.String()
}

// GridRow lays out one row of a grid whose column widths were measured
// beforehand with CellWidth, exactly as Grid lays out each of its rows:
// for a table too long to hold in memory, measured in one pass over its
// rows and written in a second. The cells pass through Printable.
func GridRow(cells []string, widths []int, wordsLast bool) string {
	printable := make([]string, len(cells))
	for i, cell := range cells {
		printable[i] = Printable(cell)
	}
	return gridRow(printable, widths, wordsLast)
}

// CellWidth is the width a cell takes in a grid.
func CellWidth(cell string) int { return len([]rune(Printable(cell))) }

func gridRow(row []string, widths []int, wordsLast bool) string {
	var l strings.Builder
	for i, cell := range row {
		pad := strings.Repeat(" ", max(0, widths[i]-len([]rune(cell))))
		if i == 0 {
			l.WriteString(cell + pad)
		} else if wordsLast && i == len(row)-1 {
			l.WriteString("  " + cell + pad)
		} else {
			l.WriteString("  " + pad + cell)
		}
	}
	return strings.TrimRight(l.String(), " ") + "\n" // no trailing spaces after an empty last cell
}

// Markdown escapes the characters that Markdown tables, emphasis and
// inline HTML read (so that a note such as "<night> shift" shows as
// written), and folds line breaks into spaces. It does not make the text
// terminal-safe: the Markdown writers pass their whole output through
// PrintableText.
func Markdown(s string) string {
	s = strings.NewReplacer("|", `\|`, "*", `\*`, "_", `\_`, "`", "\\`", "\r\n", " ", "\n", " ").Replace(s)
	// A "<" opens inline HTML only before a letter, "/", "!" or "?"; a
	// figure's "<=" is left as it is.
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		if s[i] == '<' && i+1 < len(s) && (isASCIILetter(s[i+1]) || strings.IndexByte("/!?", s[i+1]) >= 0) {
			b.WriteByte('\\')
		}
		b.WriteByte(s[i])
	}
	return b.String()
}

func isASCIILetter(c byte) bool { return 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' }

// MarkdownCells is Markdown applied to each cell of a table row.
func MarkdownCells(cells []string) []string {
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = Markdown(c)
	}
	return out
}

// Wrap breaks text into lines of at most width runes at spaces, the
// first line starting with first and every later one with rest (their
// indents), each ending in a line break. A word longer than the room
// left stands alone on its line. The text passes through Printable.
func Wrap(text string, width int, first, rest string) string {
	var b strings.Builder
	line, indent := "", first
	for _, word := range strings.Fields(Printable(text)) {
		switch {
		case line == "":
			line = word
		case len([]rune(indent+line+" "+word)) <= width:
			line += " " + word
		default:
			b.WriteString(indent + line + "\n")
			line, indent = word, rest
		}
	}
	if line != "" {
		b.WriteString(indent + line + "\n")
	}
	return b.String()
}
