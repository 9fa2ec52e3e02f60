// Package stats holds bivar's numerics: pure functions on []float64 with no
// I/O and no text for people. It imports nothing of the project.
//
// Conventions: x and y must have equal length (a mismatch is a programmer
// error and panics); undefined results (a constant column, too few points)
// are NaN, never a panic. Every estimator's doc comment names its algorithm
// and source.
//
// Core statistics: describe.go (Describe, Quartiles by Hyndman & Fan type
// 7, CentredMoments), correlation.go (Pearson with the Fisher-z interval,
// Ranks, Spearman, Kendall's τ-b by Knight's algorithm), lsq.go (least
// squares by Householder QR of the centred design: LeastSquares,
// Polynomial, Line, intervals), influence.go (leverage, studentized
// residuals, Cook's distance, DFFITS, leave-one-out fits in O(n)), and
// sortkey.go (the O(n) radix sort behind ranks and quartiles), and
// sorted.go (Sorted: a study's pairs put in one canonical order once, which
// the order-based statistics share, and from which every result depends on
// the set of pairs only, not on the order the caller holds them in). The fits
// return an error, not NaN, for data that cannot be fitted (too few rows, a
// constant or collinear column, a non-finite value), so that the caller
// can say why a fit is missing.
package stats
