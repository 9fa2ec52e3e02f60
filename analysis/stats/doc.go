// Package stats holds bivar's numerics: pure functions on []float64 with no
// I/O and no text for people. It imports nothing of the project.
//
// Conventions: x and y must have equal length (a mismatch is a programmer
// error and panics); undefined results (a constant column, too few points)
// are NaN, never a panic. Every estimator's doc comment names its algorithm
// and source.
package stats
