package model

import "math"

// lineSums holds prefix sums of a series (x, y) so that the least-squares
// line of any run of it, and its residual sum of squares, cost O(1).
type lineSums struct {
	x, y, xx, xy, yy []float64 // sums over [0, i)
}

// newLineSums makes the prefix sums of x, y, in buffers of a (nil: new).
func newLineSums(x, y []float64, a *arena) *lineSums {
	n := len(x)
	s := &lineSums{a.floats(n + 1), a.floats(n + 1), a.floats(n + 1), a.floats(n + 1), a.floats(n + 1)}
	for i := 0; i < n; i++ {
		s.x[i+1] = s.x[i] + x[i]
		s.y[i+1] = s.y[i] + y[i]
		s.xx[i+1] = s.xx[i] + x[i]*x[i]
		s.xy[i+1] = s.xy[i] + x[i]*y[i]
		s.yy[i+1] = s.yy[i] + y[i]*y[i]
	}
	return s
}

// Line is a least-squares line y = A + B (x − X0) over N points, with Sxx
// the spread of x about its mean X0 and SSE the residual sum of squares.
type Line struct {
	A, B, X0, Sxx, SSE float64
	N                  int
}

// At returns the line's value at x.
func (l Line) At(x float64) float64 { return l.A + l.B*(x-l.X0) }

// VarAt returns the variance of the fitted value at x for noise variance s2:
// s2 (1/N + (x − X0)²/Sxx) (ordinary least squares).
func (l Line) VarAt(x, s2 float64) float64 {
	v := 1 / float64(l.N)
	if l.Sxx > 0 {
		v += (x - l.X0) * (x - l.X0) / l.Sxx
	}
	return s2 * v
}

// fit returns the least-squares line of points [a, b).
func (s *lineSums) fit(a, b int) Line {
	n := float64(b - a)
	sx, sy := s.x[b]-s.x[a], s.y[b]-s.y[a]
	mx, my := sx/n, sy/n
	sxx := s.xx[b] - s.xx[a] - sx*mx
	sxy := s.xy[b] - s.xy[a] - sx*my
	syy := s.yy[b] - s.yy[a] - sy*my
	l := Line{A: my, X0: mx, Sxx: sxx, N: b - a}
	if sxx > 1e-12 {
		l.B = sxy / sxx
		l.SSE = syy - sxy*l.B
	} else {
		l.SSE = syy
	}
	l.SSE = math.Max(l.SSE, 0)
	return l
}

// cost is the residual sum of squares of the line through [a, b).
func (s *lineSums) cost(a, b int) float64 { return s.fit(a, b).SSE }

// SegmentLines splits a series (x ascending) into runs, each fitted by its
// own least-squares line, by binary segmentation: a run is split at the
// index that lowers the total residual sum of squares most, if it lowers it
// by more than penalty and both parts keep at least minLen points; the parts
// are split in turn (Scott & Knott, Biometrics 30, 1974; Killick et al.,
// J. Am. Stat. Assoc. 107, 2012, review the method). forced lists indices
// where a run must start (e.g. at events); they are boundaries whatever the
// gain. It returns the start index of every run after the first, ascending.
func SegmentLines(x, y []float64, minLen int, penalty float64, forced []int) []int {
	return segmentLines(newLineSums(x, y, nil), len(x), minLen, penalty, forced)
}

// segmentLines is SegmentLines on the prefix sums s of a series of n points.
func segmentLines(s *lineSums, n, minLen int, penalty float64, forced []int) []int {
	if n == 0 {
		return nil
	}
	minLen = max(minLen, 3)
	bounds := []int{0}
	for _, f := range forced {
		if f > bounds[len(bounds)-1] && f < n {
			bounds = append(bounds, f)
		}
	}
	bounds = append(bounds, n)
	var out []int
	var split func(a, b int)
	split = func(a, b int) {
		if b-a < 2*minLen {
			return
		}
		whole := s.cost(a, b)
		best, at := 0.0, -1
		for k := a + minLen; k <= b-minLen; k++ {
			if gain := whole - s.cost(a, k) - s.cost(k, b); gain > best {
				best, at = gain, k
			}
		}
		if at < 0 || best <= penalty {
			return
		}
		split(a, at)
		out = append(out, at)
		split(at, b)
	}
	for i := 0; i+1 < len(bounds); i++ {
		if i > 0 {
			out = append(out, bounds[i])
		}
		split(bounds[i], bounds[i+1])
	}
	return out
}

// NoiseSigma estimates the noise standard deviation of a series that may
// hold steps and slow drifts, from its successive differences:
// σ = 1.4826 · MAD(Δy) / √2 (the median absolute deviation scaled to a
// normal standard deviation; Rousseeuw & Croux, J. Am. Stat. Assoc. 88,
// 1993). Fewer than 3 points give NaN.
func NoiseSigma(y []float64) float64 { return noiseSigma(y, nil) }

// noiseSigma is NoiseSigma with its buffer from a.
func noiseSigma(y []float64, a *arena) float64 {
	if len(y) < 3 {
		return math.NaN()
	}
	d := a.floats(len(y) - 1)
	for i := range d {
		d[i] = y[i+1] - y[i]
	}
	m := median(d)
	for i := range d {
		d[i] = math.Abs(d[i] - m)
	}
	return 1.4826 * median(d) / math.Sqrt2
}
