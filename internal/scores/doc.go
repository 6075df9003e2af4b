// Package scores reads scored validation sets and holds them column-wise,
// ranked from the riskiest case to the safest.
//
// # The cut rule
//
// Everywhere in sill a cut is a score value c, and a case is an alert
// (flagged) when its score is >= c; with LowerIsRiskier it is flagged when
// its score is <= c. Cases tied at one score are therefore always on the
// same side of a cut. Other packages refer to this paragraph rather than
// restating it.
//
// # Weights
//
// A weight column holds non-negative frequency weights: a row of weight 2
// counts exactly as the same row written twice. A zero weight keeps the row
// in the ranked list and its score as a cut, but it adds nothing to any
// count. A negative weight is an error. Without a weight column every row
// weighs 1.
//
// # Numbers and limits
//
// A number is read in decimal notation as CSV practice writes it: an
// optional sign, digits with an optional point, an optional exponent
// (0.25, -3, .5, 1.5e-3). Go's hexadecimal floats (0x1p-2) and digits
// separated by underscores (1_000) are not numbers. The words inf and nan
// read as the values they name and are refused as not finite, as are
// numbers too large for float64.
//
// A line may hold at most MaxLine bytes (16 MiB): the header, each row of
// delimited text (a quoted record over several lines counts as one), each
// JSON Lines object, and so every cell and every JSON value. Past it
// reading stops with ErrTooLong at the line, so an input that never ends
// costs at most that much memory before it is refused. Two columns of one
// name (or two keys of one JSON object) are ErrDuplicateColumn.
package scores
