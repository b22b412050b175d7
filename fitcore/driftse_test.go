package fitcore_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"sort"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"pairline/fitcore"
)

// estimatedSE scales each true se by √(χ²_df/df), as a line fitted to
// df + 2 readings estimates it (the readings' noise keeps the true se).
func estimatedSE(r *rand.Rand, se []float64, df int) {
	for i := range se {
		var c float64
		for range df {
			z := r.NormFloat64()
			c += z * z
		}
		se[i] *= math.Sqrt(c / float64(df))
	}
}

// TestDriftEstimatedRates keeps DriftEstimated's verdict honest by
// simulation: invented histories of 12 monthly calibrations (stepTrial:
// true se 0.007–0.013, noise of the true se), each se then estimated on
// 6 degrees of freedom; seeded PCG (2028, case number), 4,000 trials a
// case, every rate logged beside Drift's on the same histories. Measured:
// flat histories called drifting in 1.12 % (Drift 1.87 %), shifted 0.35 %
// (the step test is Drift's); drifts of 3, 6 and 15 se a year called
// drifting in 43, 95 and 100 % (Drift 53, 97, 100); a 10-se step after
// month 6 shifted in 98 %. The bounds: drifting on flat histories within
// 0.4–1.5 % (4,000 trials put the 1 % of an exact test within about
// 0.7–1.3 %; Drift's 1.87 % fails it), the drifts and the step found at
// least as often as given.
func TestDriftEstimatedRates(t *testing.T) {
	if testing.Short() {
		t.Skip("simulates 24,000 histories, each against 999 simulated ones")
	}
	const trials, n, df = 4000, 12, 6
	const noise = 0.01
	dfs := make([]float64, n)
	for i := range dfs {
		dfs[i] = df
	}
	for k, tc := range []struct {
		name               string
		truth              func(t float64) float64
		alarmLo, alarmHi   float64 // drifting, or shifted for the step
		shiftedLo, shiftHi float64
	}{
		{"flat", func(float64) float64 { return 1.5 }, 0.004, 0.015, 0, 0.01},
		{"drift 3 se/year", func(t float64) float64 { return 1.5 + 3*noise*t }, 0.3, 0.5, 0, 0.02},
		{"drift 6 se/year", func(t float64) float64 { return 1.5 + 6*noise*t }, 0.9, 1, 0, 0.02},
		{"drift 15 se/year", func(t float64) float64 { return 1.5 + 15*noise*t }, 0.99, 1, 0, 0.01},
		{"step 10 se after month 6", stepAt(6, 10*noise), 0.97, 1, 0.95, 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := rand.New(rand.NewPCG(2028, uint64(k)))
			tm, v, se := make([]float64, n), make([]float64, n), make([]float64, n)
			var drifting, shifted, plain int
			for range trials {
				stepTrial(r, n, tc.truth, tm, v, se)
				estimatedSE(r, se, df)
				d, err := fitcore.DriftEstimated(tm, v, se, dfs, 0.95, nil, nil)
				if err != nil {
					t.Fatal(err)
				}
				if d.Simulated != fitcore.DriftDraws {
					t.Fatalf("Simulated = %d, want %d", d.Simulated, fitcore.DriftDraws)
				}
				switch d.Status {
				case fitcore.DriftShifted:
					shifted++
				case fitcore.DriftDrifting:
					drifting++
				}
				e, err := fitcore.Drift(tm, v, se, 0.95, nil, nil)
				if err != nil {
					t.Fatal(err)
				}
				if e.Status == fitcore.DriftDrifting {
					plain++
				}
			}
			fd, fs := float64(drifting)/trials, float64(shifted)/trials
			fa := fd
			if tc.shiftedLo > 0 {
				fa = fd + fs // a step is found as either
			}
			t.Logf("%s, se on %d df: DriftEstimated drifting %.4f, shifted %.4f; Drift drifting %.4f (of %d, seed 2028, %d)",
				tc.name, df, fd, fs, float64(plain)/trials, trials, k)
			if fa < tc.alarmLo || fa > tc.alarmHi {
				t.Errorf("found in %.4f, want within [%g, %g]", fa, tc.alarmLo, tc.alarmHi)
			}
			if fs < tc.shiftedLo || fs > tc.shiftHi {
				t.Errorf("shifted in %.4f, want within [%g, %g]", fs, tc.shiftedLo, tc.shiftHi)
			}
		})
	}
}

// TestDriftEstimatedExact: with every standard error exact (df +Inf), or
// more calibrations than DriftSimulatedMax, DriftEstimated is Drift; with
// estimated ones it changes only the rate's p, its interval, the verdict
// and a crossing's interval, and gives the same result twice.
func TestDriftEstimatedExact(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 7))
	const n = 12
	tm, v, se := make([]float64, n), make([]float64, n), make([]float64, n)
	stepTrial(r, n, func(t float64) float64 { return 1.5 + 0.03*t }, tm, v, se)
	lower, upper := 1.0, 1.52
	exact := make([]float64, n)
	six := make([]float64, n)
	for i := range exact {
		exact[i], six[i] = math.Inf(1), 6
	}
	want, err := fitcore.Drift(tm, v, se, 0.95, &lower, &upper)
	if err != nil {
		t.Fatal(err)
	}
	got, err := fitcore.DriftEstimated(tm, v, se, exact, 0.95, &lower, &upper)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("every se exact: DriftEstimated %+v, Drift %+v", got, want)
	}
	est, err := fitcore.DriftEstimated(tm, v, se, six, 0.95, &lower, &upper)
	if err != nil {
		t.Fatal(err)
	}
	again, _ := fitcore.DriftEstimated(tm, v, se, six, 0.95, &lower, &upper)
	if !reflect.DeepEqual(est, again) {
		t.Errorf("two runs differ: %+v and %+v", est, again)
	}
	if est.Simulated != fitcore.DriftDraws || est.Rate != want.Rate || est.RateSE != want.RateSE || est.Sigma != want.Sigma ||
		est.Intercept != want.Intercept || !reflect.DeepEqual(est.Step, want.Step) {
		t.Errorf("estimated se: %+v; Drift %+v: only p, the interval and the verdict may differ", est, want)
	}
	// The reference of |T| on 6-df weights has heavier tails than t on
	// 10 df: a wider interval and a larger p.
	if !(est.RateHigh-est.RateLow > want.RateHigh-want.RateLow) || !(est.P > want.P) {
		t.Errorf("estimated se: interval [%g, %g], p %g; Drift [%g, %g], p %g: want wider and larger",
			est.RateLow, est.RateHigh, est.P, want.RateLow, want.RateHigh, want.P)
	}
	if (est.Leaves == nil) != (want.Leaves == nil) || est.Leaves != nil && (est.Leaves.At != want.Leaves.At || est.Leaves.Bounded &&
		!(est.Leaves.High-est.Leaves.Low > want.Leaves.High-want.Leaves.Low)) {
		t.Errorf("crossing: %+v, Drift %+v: same day, wider interval", est.Leaves, want.Leaves)
	}
	// Past DriftSimulatedMax calibrations: Drift's result.
	m := fitcore.DriftSimulatedMax + 1
	bt, bv, bse, bdf := make([]float64, m), make([]float64, m), make([]float64, m), make([]float64, m)
	for i := range bt {
		bt[i], bv[i], bse[i], bdf[i] = float64(i)/365, 1.5+0.01*r.NormFloat64(), 0.01, 6
	}
	big, err := fitcore.DriftEstimated(bt, bv, bse, bdf, 0.95, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	bigWant, _ := fitcore.Drift(bt, bv, bse, 0.95, nil, nil)
	if !reflect.DeepEqual(big, bigWant) {
		t.Errorf("%d calibrations: DriftEstimated differs from Drift", m)
	}
}

// TestDriftEstimatedBadDF: degrees of freedom that are not positive, or
// not one per calibration, are refused with a sentence.
func TestDriftEstimatedBadDF(t *testing.T) {
	tm := []float64{0, 0.1, 0.2, 0.3, 0.4}
	v := []float64{1, 1.1, 0.9, 1, 1.05}
	se := []float64{0.1, 0.1, 0.1, 0.1, 0.1}
	for _, df := range [][]float64{
		nil,
		{6, 6, 6, 6},
		{6, 6, 0, 6, 6},
		{6, 6, -1, 6, 6},
		{6, math.NaN(), 6, 6, 6},
		{6, 6, 6, 6, math.Inf(-1)},
	} {
		if _, err := fitcore.DriftEstimated(tm, v, se, df, 0.95, nil, nil); err == nil {
			t.Errorf("df %v: no error", df)
		}
	}
}

// TestChiSquaredDraws: the χ² draws behind DriftEstimated's simulated
// standard errors follow χ²_k: the Kolmogorov–Smirnov distance of 20,000
// draws to gonum's distuv.ChiSquared CDF is below the 0.1 % critical value
// 1.95/√n (common practice), and the mean and variance are k and 2k within
// 5 standard errors (var of the sample variance 2σ⁴/(n−1)·(1 + 6/k·…),
// the excess kurtosis of χ²_k being 12/k).
func TestChiSquaredDraws(t *testing.T) {
	const n = 20000
	for _, k := range []float64{1, 2, 3.5, 6, 30, 400} {
		x := fitcore.ChiSquaredDrawsForTest(k, n)
		sort.Float64s(x)
		cdf := distuv.ChiSquared{K: k}
		var dmax, mean, m2 float64
		for i, v := range x {
			f := cdf.CDF(v)
			dmax = math.Max(dmax, math.Max(math.Abs(f-float64(i)/n), math.Abs(f-float64(i+1)/n)))
			mean += v
		}
		mean /= n
		for _, v := range x {
			m2 += (v - mean) * (v - mean)
		}
		vr := m2 / (n - 1)
		if crit := 1.95 / math.Sqrt(n); dmax > crit {
			t.Errorf("k = %g: KS distance %.4f past %.4f", k, dmax, crit)
		}
		if math.Abs(mean-k) > 5*math.Sqrt(2*k/n) || math.Abs(vr-2*k) > 5*2*k*math.Sqrt(2.0/n)*math.Sqrt(1+6/k) {
			t.Errorf("k = %g: mean %.4f, variance %.4f; want %g and %g", k, mean, vr, k, 2*k)
		}
	}
}

func ExampleDriftEstimated() {
	// An invented conductivity probe's slope at six calibrations (one
	// every two months), each slope's standard error from its own line
	// of 8 readings (6 degrees of freedom).
	t := []float64{0, 1.0 / 6, 2.0 / 6, 3.0 / 6, 4.0 / 6, 5.0 / 6}
	slope := []float64{0.998, 0.995, 0.993, 0.990, 0.989, 0.985}
	se := []float64{0.0012, 0.0009, 0.0015, 0.0011, 0.0010, 0.0013}
	df := []float64{6, 6, 6, 6, 6, 6}
	d, err := fitcore.DriftEstimated(t, slope, se, df, 0.95, nil, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%s: %.4f a year (%.4f to %.4f), from %d simulated histories\n", d.Status, d.Rate, d.RateLow, d.RateHigh, d.Simulated)
	// Output:
	// drifting: -0.0143 a year (-0.0173 to -0.0114), from 999 simulated histories
}

// TestDriftEstimatedR holds DriftEstimated's simulation to an independent
// one in R 4.2.2 (Debian's r-base-core), on an invented history of 12
// monthly calibrations whose se come from lines of 6 to 20 readings:
//
//	tt <- (0:11) / 12
//	v  <- c(1.5012, 1.4987, 1.5043, 1.4969, 1.5021, 1.5058, 1.4992, 1.5049, 1.5071, 1.5013, 1.5066, 1.5090)
//	se <- c(0.0021, 0.0032, 0.0025, 0.0040, 0.0028, 0.0019, 0.0035, 0.0030, 0.0024, 0.0038, 0.0027, 0.0033)
//	df <- c(6, 6, 6, 10, 10, 10, 4, 4, 4, 18, 18, 18)
//	fit <- summary(lm(v ~ tt, weights = 1/se^2)); tobs <- fit$coefficients["tt", "t value"]
//	wt <- function(w, vv) { tb <- sum(w*tt)/sum(w); vb <- sum(w*vv)/sum(w); stt <- sum(w*(tt-tb)^2)
//	  r <- sum(w*(tt-tb)*(vv-vb))/stt; r / sqrt(sum(w*(vv-vb-r*(tt-tb))^2)/(length(tt)-2)/stt) }
//	set.seed(20261203); B <- 200000; ts <- numeric(B)
//	for (b in 1:B) { vv <- se*rnorm(12); ss <- se*sqrt(rchisq(12, df)/df); ts[b] <- abs(wt(1/ss^2, vv)) }
//	mean(ts >= abs(tobs)); quantile(ts, 0.95, type = 1)
//
// gives t = 2.717815 (p = 0.021641 from Student's t on 10 df), simulated
// p = 0.036950 and 95 % quantile 2.51076 of |T*| (against t's 2.22814).
// Pairline's simulation of 200,000 histories must agree within 0.003 in p
// and 0.05 in the quantile (Monte Carlo standard errors about 0.0006 and
// 0.015 for the difference of the two), which Student's t misses by 0.015
// and 0.28; DriftEstimated itself (999 draws) within 0.025 and 0.4.
func TestDriftEstimatedR(t *testing.T) {
	tm := make([]float64, 12)
	for i := range tm {
		tm[i] = float64(i) / 12
	}
	v := []float64{1.5012, 1.4987, 1.5043, 1.4969, 1.5021, 1.5058, 1.4992, 1.5049, 1.5071, 1.5013, 1.5066, 1.5090}
	se := []float64{0.0021, 0.0032, 0.0025, 0.0040, 0.0028, 0.0019, 0.0035, 0.0030, 0.0024, 0.0038, 0.0027, 0.0033}
	df := []float64{6, 6, 6, 10, 10, 10, 4, 4, 4, 18, 18, 18}
	const tR, pTR, pR, qR = 2.717815, 0.021641, 0.036950, 2.51076
	d, err := fitcore.Drift(tm, v, se, 0.95, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	tObs := d.Rate / d.RateSE
	if math.Abs(tObs-tR) > 1e-5 || math.Abs(d.P-pTR) > 1e-5 {
		t.Fatalf("Drift: t = %.6f, p = %.6f; R's lm: %.6f, %.6f", tObs, d.P, tR, pTR)
	}
	p, q := fitcore.DriftReferenceForTest(tm, se, df, 200000, tObs, 0.95)
	t.Logf("200,000 simulated histories: p %.6f (R %.6f), 95 %% quantile %.5f (R %.5f)", p, pR, q, qR)
	if math.Abs(p-pR) > 0.003 || math.Abs(q-qR) > 0.05 {
		t.Errorf("simulated p %.6f, quantile %.5f; R's %.6f, %.5f", p, q, pR, qR)
	}
	e, err := fitcore.DriftEstimated(tm, v, se, df, 0.95, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	qe := (e.RateHigh - e.Rate) / e.RateSE
	t.Logf("DriftEstimated (%d draws): p %.6f, 95 %% quantile %.5f", e.Simulated, e.P, qe)
	if math.Abs(e.P-pR) > 0.025 || math.Abs(qe-qR) > 0.4 {
		t.Errorf("DriftEstimated p %.6f, quantile %.5f; R's %.6f, %.5f", e.P, qe, pR, qR)
	}
}

// FuzzDriftEstimated: any calibrations (each four bytes: time, value, se
// and df, the last 0 for "exact") give DriftEstimated an error or a
// result without a panic, whose p is in [0, 1] (at least 1/(draws + 1)
// when simulated) and whose interval holds the rate, simulated exactly
// when some df is finite.
func FuzzDriftEstimated(f *testing.F) {
	f.Add([]byte{0, 10, 5, 6, 1, 11, 6, 6, 2, 12, 5, 6, 3, 12, 7, 6})
	f.Add([]byte{0, 10, 5, 0, 1, 11, 6, 0, 2, 12, 5, 0})
	f.Add([]byte{0, 0, 1, 1, 0, 0, 1, 1, 9, 200, 255, 255})
	f.Fuzz(func(t *testing.T, data []byte) {
		n := len(data) / 4
		tm, v, se, df := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
		finite := false
		for i := range n {
			b := data[4*i : 4*i+4]
			tm[i], v[i], se[i] = float64(b[0])/12, 1+float64(b[1])/100, float64(b[2])/1000
			df[i] = math.Inf(1)
			if b[3] > 0 {
				df[i], finite = float64(b[3])/4, true
			}
		}
		d, err := fitcore.DriftEstimated(tm, v, se, df, 0.95, nil, nil)
		if err != nil || d.Status == fitcore.DriftTooFew {
			return
		}
		pMin := 0.0 // Student's t gives 0 for values exactly on a line
		if d.Simulated > 0 {
			pMin = 1 / float64(d.Simulated+1)
		}
		if !(d.P >= pMin && d.P <= 1) || d.RateLow > d.Rate || d.Rate > d.RateHigh {
			t.Errorf("p %g (at least %g), rate %g in [%g, %g]", d.P, pMin, d.Rate, d.RateLow, d.RateHigh)
		}
		if want := finite && n <= fitcore.DriftSimulatedMax; (d.Simulated > 0) != want {
			t.Errorf("simulated %d, some df finite %v", d.Simulated, finite)
		}
	})
}
