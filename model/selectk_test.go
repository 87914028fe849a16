package model

import (
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"
)

// The medians by selection and the sliding window give exactly what
// sorting gives (the reference is the definition: sort, take the middle),
// on random data with many ties, odd and even counts.
func TestSelectionMatchesSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	refMedian := func(v []float64) float64 {
		c := append([]float64(nil), v...)
		sort.Float64s(c)
		return sortedMedian(c)
	}
	for _, n := range []int{1, 2, 3, 31, 32, 33, 100, 101, 1000, 4097} {
		for trial := 0; trial < 20; trial++ {
			v := make([]float64, n)
			for i := range v {
				switch trial % 3 {
				case 0:
					v[i] = rng.NormFloat64()
				case 1:
					v[i] = float64(rng.IntN(5)) // many ties
				default:
					v[i] = float64(i) // sorted already
				}
			}
			if got, want := Median(v), refMedian(v); got != want {
				t.Fatalf("n %d trial %d: median %v, sort gives %v", n, trial, got, want)
			}
			for _, k := range []int{0, n / 3, n - 1} {
				c := append([]float64(nil), v...)
				ref := append([]float64(nil), v...)
				slices.Sort(ref)
				if got := orderStat(c, k); got != ref[k] {
					t.Fatalf("n %d: order statistic %d %v, want %v", n, k, got, ref[k])
				}
			}
			half := 1 + trial%12
			got := RollingMedian(v, half)
			for i := range v {
				if want := refMedian(v[max(0, i-half):min(n, i+half+1)]); got[i] != want {
					t.Fatalf("n %d half %d: rolling median at %d %v, want %v", n, half, i, got[i], want)
				}
			}
		}
	}
	withNaN := []float64{1, math.NaN(), 3, 2}
	if got := RollingMedian(withNaN, 1); len(got) != 4 {
		t.Errorf("with NaN: %v", got)
	}
}

// TheilSen by selection equals TheilSen by a full sort of the slopes.
func TestTheilSenSelection(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	// Normal noise, heavy tails, many tied x and y (above 4,096 pairs the
	// slopes are selected within a sampled range: theilSenWindow).
	noise := map[string]func(x float64) float64{
		"normal":  func(x float64) float64 { return 0.02*x + rng.NormFloat64() },
		"cauchy":  func(x float64) float64 { return 0.02*x + rng.NormFloat64()/rng.NormFloat64() },
		"rounded": func(x float64) float64 { return math.Round(0.02*x + rng.NormFloat64()) },
		"steps":   func(x float64) float64 { return math.Floor(x / 40) },
	}
	for _, name := range []string{"normal", "cauchy", "rounded", "steps"} {
		for _, n := range []int{3, 4, 10, 57, 90, 91, 180, 181, 400} {
			x, y := make([]float64, n), make([]float64, n)
			for i := range x {
				x[i] = float64(i/2) + 0.1*float64(i%2) // some near ties
				if name != "normal" && i%3 == 0 {
					x[i] = float64(i / 3) // exact ties
				}
				y[i] = noise[name](x[i])
			}
			checkTheilSen(t, name, x, y)
		}
	}
}

func checkTheilSen(t *testing.T, name string, x, y []float64) {
	t.Helper()
	n := len(x)
	{
		got := TheilSen(x, y, 0.95)
		var slopes []float64
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				if dx := x[j] - x[i]; dx != 0 {
					slopes = append(slopes, (y[j]-y[i])/dx)
				}
			}
		}
		sort.Float64s(slopes)
		N := float64(len(slopes))
		c := 1.959963984540054 * math.Sqrt(float64(n)*float64(n-1)*float64(2*n+5)/18)
		lo := max(int(math.Floor((N-c)/2))-1, 0)
		hi := min(int(math.Ceil((N+c)/2)), len(slopes)-1)
		if got.Slope != sortedMedian(slopes) || got.Lo != slopes[lo] || got.Hi != slopes[hi] {
			t.Errorf("%s n %d: %+v; sorted slopes give %v [%v, %v]", name, n, got, sortedMedian(slopes), slopes[lo], slopes[hi])
		}
	}
}

// BenchmarkTheilSen: the drift's Theil–Sen on 180 daily medians (16,110
// pair slopes), slopes/s.
func BenchmarkTheilSen(b *testing.B) {
	rng := rand.New(rand.NewPCG(5, 6))
	x, y := make([]float64, 180), make([]float64, 180)
	for i := range x {
		x[i], y[i] = float64(i)+0.3*rng.Float64(), 0.01*float64(i)+rng.NormFloat64()
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		TheilSen(x, y, 0.95)
	}
	b.ReportMetric(float64(len(x)*(len(x)-1)/2*b.N)/b.Elapsed().Seconds(), "slopes/s")
}
