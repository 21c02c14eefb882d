package bayes

import (
	"fmt"
	"math"
)

// MaxBatch is the largest future batch the predictive distribution covers.
const MaxBatch int64 = 1_000_000

// DefaultBatch is the future batch size used when none is given.
const DefaultBatch int64 = 100

// Predictive is the posterior predictive distribution of the number of
// events K in a future batch of Batch units from one group: the
// beta-binomial, P(K = k) = C(m, k)·B(α + k, β + m − k)/B(α, β), with
// mean mα/(α+β) and variance mαβ(α+β+m)/((α+β)²(α+β+1)).
type Predictive struct {
	Batch    int64   `json:"batch"`
	Mean     float64 `json:"mean"`
	Variance float64 `json:"variance"`
	// Lower and Upper are the equal-tailed interval of K at the analysis's
	// level: the smallest k with P(K ≤ k) ≥ (1 − level)/2 and the smallest
	// k with P(K ≤ k) ≥ (1 + level)/2.
	Lower int64 `json:"lower"`
	Upper int64 `json:"upper"`
	// Probabilities[k] is P(K = k) for k = From, From+1, ...; the counts
	// outside carry less than 10⁻¹⁸ of the probability together (not in
	// the JSON).
	From          int64     `json:"-"`
	Probabilities []float64 `json:"-"`
}

// Predict returns the predictive distribution of events in a future batch
// of the given size (1 to MaxBatch; an error wrapping ErrBatch otherwise).
// The probabilities are computed from the peak outwards through the ratio
// of neighbouring terms, (m−k)(α+k)/((k+1)(β+m−k−1)), and normalised to sum
// to one; for α, β ≥ 1 the terms are log-concave and the walk stops when a
// geometric bound puts the rest below 10⁻¹⁸ of the sum, otherwise every k
// from 0 to m is kept.
func (p Posterior) Predict(batch int64) (Predictive, error) {
	if batch < 1 || batch > MaxBatch {
		return Predictive{}, fmt.Errorf("batch of %d: %w; a future batch has 1 to %d units", batch, ErrBatch, MaxBatch)
	}
	a, b, m := p.EventShape, p.NonEventShape, float64(batch)
	ratio := func(k float64) float64 { return (m - k) * (a + k) / ((k + 1) * (b + m - k - 1)) }
	// the peak: the first k at which the ratio drops to 1 or below
	peak := math.Floor((m*a - b + 1) / (a + b)) // from ratio(k) = 1 for log-concave terms
	peak = math.Max(0, math.Min(m, peak))
	for peak < m && ratio(peak) > 1 {
		peak++
	}
	for peak > 0 && ratio(peak-1) < 1 {
		peak--
	}
	logConcave := a >= 1 && b >= 1
	var up, down []float64
	term := 1.0
	for k := peak; k < m; k++ {
		r := ratio(k)
		term *= r
		up = append(up, term)
		if logConcave && r < 1 && term*r/(1-r) < 1e-18 {
			break
		}
	}
	term = 1.0
	for k := peak; k > 0; k-- {
		r := 1 / ratio(k-1)
		term *= r
		down = append(down, term)
		if logConcave && r < 1 && term*r/(1-r) < 1e-18 {
			break
		}
	}
	probs := make([]float64, 0, len(down)+1+len(up))
	for i := len(down) - 1; i >= 0; i-- {
		probs = append(probs, down[i])
	}
	probs = append(probs, 1)
	probs = append(probs, up...)
	var sum float64
	for _, v := range probs {
		sum += v
	}
	for i := range probs {
		probs[i] /= sum
	}
	s := a + b
	return Predictive{
		Batch: batch, Mean: m * a / s, Variance: m * a * b * (s + m) / (s * s * (s + 1)),
		From: int64(peak) - int64(len(down)), Probabilities: probs,
	}, nil
}

// At returns P(K = k).
func (d Predictive) At(k int64) float64 {
	i := k - d.From
	if i < 0 || i >= int64(len(d.Probabilities)) {
		return 0
	}
	return d.Probabilities[i]
}

// quantile returns the smallest k with P(K ≤ k) ≥ q.
func (d Predictive) quantile(q float64) int64 {
	var c float64
	for i, v := range d.Probabilities {
		c += v
		if c >= q*(1-1e-12) {
			return d.From + int64(i)
		}
	}
	return d.From + int64(len(d.Probabilities)) - 1
}

// compareBatches returns P(K1 > K2) and P(K1 = K2) for independent
// predictive counts.
func compareBatches(d1, d2 Predictive) (greater, tie float64) {
	// cumulative of K2 below each k
	cum := make([]float64, len(d2.Probabilities)+1)
	for i, v := range d2.Probabilities {
		cum[i+1] = cum[i] + v
	}
	below := func(k int64) float64 { // P(K2 < k)
		i := k - d2.From
		switch {
		case i <= 0:
			return 0
		case i >= int64(len(d2.Probabilities)):
			return cum[len(cum)-1]
		}
		return cum[i]
	}
	for i, v := range d1.Probabilities {
		k := d1.From + int64(i)
		greater += v * below(k)
		tie += v * d2.At(k)
	}
	return greater, tie
}
