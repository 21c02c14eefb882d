package proportions

import "github.com/propscope/propscope/internal/special"

// Confidence is a two-sided confidence level with its normal quantile
// z = Φ⁻¹((1 + Level)/2) computed once, so methods called for every outcome
// of a design do not recompute it.
type Confidence struct {
	Level float64 `json:"level"`
	Z     float64 `json:"z"`
}

// NewConfidence validates the level and computes its quantile with gonum's
// standard normal distribution.
func NewConfidence(level float64) (Confidence, error) {
	if err := ValidateLevel(level); err != nil {
		return Confidence{}, err
	}
	return Confidence{Level: level, Z: special.NormalQuantile((1 + level) / 2)}, nil
}

// Alpha returns 1 − Level.
func (c Confidence) Alpha() float64 { return 1 - c.Level }
