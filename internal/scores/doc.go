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
package scores
