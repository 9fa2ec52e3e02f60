// Package findings turns the numbers of one study into verdicts and plain
// sentences an engineer can sign under: the form of the relationship
// (linear, curved — bending up or down, turning over inside the observed
// range or not — nonlinear, or none), its direction and strength, whether
// a few unusual rows make it, and what may not be claimed (cause, values
// outside the observed range, lurking variables checked and not checked).
//
// The package does no statistics of its own: every figure it judges is
// already in the report.Study, computed by analysis/stats and filled by
// the analysis, and written to results.json (it never reads the plot
// data, which results.json lacks). Every cut point
// is in one table, report.Thresholds, whose defaults DefaultThresholds
// documents with their sources: some common practice, some this
// project's own choices (labelled so in the sentences that print them); a
// manifest may override them.
//
// Only r's p is adjusted across the studies of a manifest. The secondary
// checks of a study (curvature, lack of fit, changing spread, drift) share
// alpha by Holm's adjustment within the study and are not adjusted across
// studies; the distance correlation and the residuals in order of x are
// read at alpha unadjusted. Each study's limits say so (see Assess).
//
// FlagPoints marks rows of the straight line as outliers, high-leverage,
// influential or of sole support; Suspect says which of those the verdict
// should not rest on; Assess decides the verdicts and writes the headline,
// the statements (each with the figures behind it) and the limits. The
// report's caution (report.Caution) applies to all of them: the statements
// never claim approval, proof or safety.
//
// The verdicts are checked against Anscombe's quartet (1973) and a
// labelled suite of generated cases (testdata/suite, written by
// internal/gensuite) run through analysis.Analyze.
package findings
