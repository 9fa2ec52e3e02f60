package manifest

// This file holds the study keys about measurement: the study's kind
// (relationship or agreement of two methods), replicate readings, a gauge's
// repeatability SD, the agreement table and the planning table, with their
// validation.

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/units"
)

// The kinds of study (study.kind).
const (
	// KindRelationship: how y goes with x (the default).
	KindRelationship = "relationship"
	// KindAgreement: x and y are two measurements of the same quantity in
	// the same unit (two gauges, methods, labs, fixtures); the study asks
	// whether they agree.
	KindAgreement = "agreement"
)

// Kinds are the values of study.kind.
func Kinds() []string { return []string{KindRelationship, KindAgreement} }

// GaugeSD declares the repeatability SD of the gauge behind x and behind y
// (in each column's unit), for the correction of r and the slope for
// measurement error; nil leaves that variable uncorrected (measured
// without error).
type GaugeSD struct {
	X *float64 `toml:"x"`
	Y *float64 `toml:"y"`
}

// Agreement is the [study.agreement] table of an agreement study.
type Agreement struct {
	// Acceptable is the largest difference between the methods that does
	// not matter in use, ±Acceptable; in Unit when given, else in the
	// columns' unit. nil: no verdict on agreement, only the figures.
	Acceptable *float64 `toml:"acceptable"`
	// Unit is the UCUM code Acceptable is written in; "" means the
	// columns' unit. It must convert to the columns' unit.
	Unit string `toml:"unit"`
	// Delta is the error-variance ratio var(error of y)/var(error of x) of
	// the Deming line; nil: estimated from the replicates, else 1.
	Delta *float64 `toml:"delta"`
}

// Plan is the [study.plan] table: targets for the statement of how many
// rows the next run needs. Every key is optional (see the Default…
// constants).
type Plan struct {
	RHalfWidth     *float64 `toml:"r_half_width"`     // half-width wanted for r's interval
	SlopeHalfWidth *float64 `toml:"slope_half_width"` // half-width wanted for the slope's interval, in y's unit per x's unit
	SmallestR      *float64 `toml:"smallest_r"`       // smallest |r| worth detecting; default the observed r
	Power          *float64 `toml:"power"`            // chance of detecting it
	// LimitsHalfWidth (agreement studies) is the half-width wanted for the
	// intervals of the limits of agreement, in the columns' unit; default
	// half the present one.
	LimitsHalfWidth *float64 `toml:"limits_half_width"`
}

// Planning defaults (study.plan). DefaultRHalfWidth is common practice for
// a correlation "known to ±0.1"; the slope's default target is half its
// present half-width (the project's choice: the next run should halve the
// uncertainty), so it needs no unit.
const (
	DefaultRHalfWidth = 0.1
	DefaultPower      = 0.8
)

// measure checks the keys of this file for one study and fills Kind's
// default. d is the study's dataset (zero when it is not declared).
func (p *parser) measure(owner, name string, s *Study, d Dataset) {
	if s.Kind == "" {
		s.Kind = KindRelationship
	}
	p.oneOf(owner, "study.kind", s.Kind, Kinds())
	agree := s.Kind == KindAgreement
	unitOf := func(col string) string { return d.Units[col] }
	quote := func(u string) string {
		if u == "" {
			return "no unit"
		}
		return strconv.Quote(u)
	}
	if agree && s.X != "" && s.Y != "" && d.ID != "" && unitOf(s.X) != unitOf(s.Y) {
		p.add(owner, "study.kind", "study %q: an agreement study compares two measurements of the same quantity in the same unit, but x %q is in %s and y %q is in %s ([dataset.units] of dataset %q): declare the same unit for both columns (convert one column first if the gauges read in different units)",
			name, s.X, quote(unitOf(s.X)), s.Y, quote(unitOf(s.Y)), d.ID)
	}
	reps := func(axis, col string, list []string) {
		key := "study." + axis + "_replicates"
		seen := map[string]bool{}
		for _, c := range list {
			switch {
			case c == "":
				p.add(owner, key, "study %q: %s_replicates holds an empty column name", name, axis)
			case c == s.X || c == s.Y:
				p.add(owner, key, "study %q: %s_replicates lists %q, which is x or y itself; list the other readings of the same items", name, axis, c)
			case seen[c]:
				p.add(owner, key, "study %q: %s_replicates lists %q twice", name, axis, c)
			case d.ID != "" && col != "" && unitOf(c) != unitOf(col):
				p.add(owner, key, "study %q: %s_replicates column %q is in %s but %s %q is in %s: replicate readings of one gauge must share its unit",
					name, axis, c, quote(unitOf(c)), axis, col, quote(unitOf(col)))
			}
			seen[c] = true
		}
	}
	reps("x", s.X, s.XReplicates)
	reps("y", s.Y, s.YReplicates)
	for _, c := range s.XReplicates {
		if slices.Contains(s.YReplicates, c) {
			p.add(owner, "study.y_replicates", "study %q: column %q is listed as a replicate of both x and y", name, c)
		}
	}

	if g := s.GaugeSD; g != nil {
		if agree {
			p.add(owner, "study.gauge_sd", "study %q: gauge_sd applies to relationship studies; an agreement study estimates each method's repeatability from x_replicates and y_replicates", name)
		}
		for _, v := range []struct {
			axis string
			sd   *float64
			reps []string
		}{{"x", g.X, s.XReplicates}, {"y", g.Y, s.YReplicates}} {
			if v.sd == nil {
				continue
			}
			if !(*v.sd >= 0) || math.IsInf(*v.sd, 0) {
				p.add(owner, "study.gauge_sd."+v.axis, "study %q: gauge_sd.%s = %v must be a finite SD of 0 or more (the gauge's repeatability SD, in the column's unit)", name, v.axis, *v.sd)
			}
			if len(v.reps) > 0 {
				p.add(owner, "study.gauge_sd."+v.axis, "study %q: gauge_sd.%s and %s_replicates both give the repeatability of %s: keep one (the replicates estimate it from the data)", name, v.axis, v.axis, v.axis)
			}
		}
	}

	if a := s.Agreement; a != nil {
		if !agree {
			p.add(owner, "study.agreement", "study %q: [study.agreement] applies to agreement studies only: add kind = %q, or remove the table", name, KindAgreement)
		}
		if a.Acceptable != nil && !(*a.Acceptable > 0 && !math.IsInf(*a.Acceptable, 0)) {
			p.add(owner, "study.agreement.acceptable", "study %q: agreement.acceptable = %v must be a positive number: the largest difference between the methods that does not matter, written without a sign (it means ±)", name, *a.Acceptable)
		}
		if a.Delta != nil && !(*a.Delta > 0 && !math.IsInf(*a.Delta, 0)) {
			p.add(owner, "study.agreement.delta", "study %q: agreement.delta = %v must be a positive number, the ratio of the error variances of y and x (1 when the methods are equally precise)", name, *a.Delta)
		}
		if a.Unit != "" {
			if a.Acceptable == nil {
				p.add(owner, "study.agreement.unit", "study %q: agreement.unit is the unit of agreement.acceptable, which is not given", name)
			}
			if err := units.Check(a.Unit); err != nil {
				p.add(owner, "study.agreement.unit", "study %q: agreement.unit: %v", name, err)
			} else if d.ID != "" && s.X != "" {
				from := unitOf(s.X)
				if from == "" {
					p.add(owner, "study.agreement.unit", "study %q: agreement.unit = %q, but [dataset.units] of dataset %q gives x %q no unit to convert it to: declare the columns' unit, or leave agreement.unit out",
						name, a.Unit, d.ID, s.X)
				} else if units.Check(from) == nil {
					if _, _, err := units.Affine(a.Unit, from); err != nil {
						p.add(owner, "study.agreement.unit", "study %q: agreement.unit: %v", name, err)
					}
				}
			}
		}
	}
	if s.Expect != nil && s.Expect.Agree != nil {
		switch {
		case !agree:
			p.add(owner, "study.expect.agree", "study %q: expect.agree applies to agreement studies only: add kind = %q", name, KindAgreement)
		case s.Agreement == nil || s.Agreement.Acceptable == nil:
			p.add(owner, "study.expect.agree", "study %q: expect.agree needs the acceptable difference: add [study.agreement] with acceptable = … (± in the columns' unit)", name)
		}
	}

	// The measurement parts work on the recorded values: a gauge SD or a
	// replicates' within-item SD in the recorded unit says nothing of the
	// spread on a log or root scale (it would depend on the level), and
	// agreement is about differences in the recorded unit.
	for _, sc := range []struct{ axis, scale string }{{"x", s.XScale}, {"y", s.YScale}} {
		if !Scaled(sc.scale) {
			continue
		}
		var uses []string
		if agree {
			uses = append(uses, fmt.Sprintf("kind = %q", KindAgreement))
		}
		if s.GaugeSD != nil {
			uses = append(uses, "gauge_sd")
		}
		if len(s.XReplicates) > 0 || len(s.YReplicates) > 0 {
			uses = append(uses, "replicate columns (x_replicates, y_replicates)")
		}
		if len(uses) > 0 {
			p.add(owner, "study."+sc.axis+"_scale", "study %q: %s_scale = %q cannot be used with %s: agreement and the correction for measurement error work on the recorded values (a gauge SD or a within-item SD in the recorded unit does not carry over to a transformed scale, where the spread depends on the level); remove %s_scale, or make a separate relationship study for the transformed scale",
				name, sc.axis, sc.scale, strings.Join(uses, " and "), sc.axis)
			break
		}
	}

	if pl := s.Plan; pl != nil {
		frac := func(key string, v *float64, what string) {
			if v != nil && !(*v > 0 && *v < 1) {
				p.add(owner, "study.plan."+key, "study %q: plan.%s = %v is outside (0, 1): %s", name, key, *v, what)
			}
		}
		frac("r_half_width", pl.RHalfWidth, "give the half-width wanted for r's interval, such as 0.1")
		frac("smallest_r", pl.SmallestR, "give the smallest |r| worth detecting, such as 0.3")
		frac("power", pl.Power, "give the chance of detecting it, such as 0.8")
		if v := pl.SlopeHalfWidth; v != nil && !(*v > 0 && !math.IsInf(*v, 0)) {
			p.add(owner, "study.plan.slope_half_width", "study %q: plan.slope_half_width = %v must be a positive number, in y's unit per x's unit", name, *v)
		}
		if agree {
			// The plans of r, the slope and power test a relationship,
			// which says nothing of whether two methods agree.
			for _, k := range []struct {
				key string
				set bool
			}{{"r_half_width", pl.RHalfWidth != nil}, {"slope_half_width", pl.SlopeHalfWidth != nil}, {"smallest_r", pl.SmallestR != nil}, {"power", pl.Power != nil}} {
				if k.set {
					p.add(owner, "study.plan."+k.key, "study %q: plan.%s plans a relationship study; an agreement study plans the width of its limits of agreement: use plan.limits_half_width, or remove the key", name, k.key)
				}
			}
		}
		if v := pl.LimitsHalfWidth; v != nil {
			switch {
			case !agree:
				p.add(owner, "study.plan.limits_half_width", "study %q: plan.limits_half_width applies to agreement studies only (the intervals of the limits of agreement): add kind = %q, or remove the key", name, KindAgreement)
			case !(*v > 0 && !math.IsInf(*v, 0)):
				p.add(owner, "study.plan.limits_half_width", "study %q: plan.limits_half_width = %v must be a positive number, in the columns' unit", name, *v)
			}
		}
	}
}

// AcceptableIn returns the acceptable difference of a converted to the
// unit code to (the columns' unit): a difference converts by the scale
// alone, the offset of a unit such as the degree Celsius cancelling. ok is
// false when a declares none or the units do not convert.
func (a *Agreement) AcceptableIn(to string) (v float64, ok bool) {
	if a == nil || a.Acceptable == nil {
		return 0, false
	}
	if a.Unit == "" || strings.TrimSpace(a.Unit) == strings.TrimSpace(to) {
		return *a.Acceptable, true
	}
	scale, _, err := units.Affine(a.Unit, to)
	if err != nil {
		return 0, false
	}
	return *a.Acceptable * math.Abs(scale), true
}
