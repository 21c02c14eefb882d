package bayes

import "github.com/propscope/propscope/internal/special"

func normalQuantile(p float64) float64 { return special.NormalQuantile(p) }
