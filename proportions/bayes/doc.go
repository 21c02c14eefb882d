// Package bayes is the Bayesian view of a comparison of two rates: with
// independent beta priors on π1 and π2 and binomial data, the posteriors
// are beta distributions, and everything that follows from them is
// computed, not simulated:
//
//   - the posteriors of the difference π1 − π2, the ratio π1/π2 and the
//     odds ratio (density, distribution function, quantiles, equal-tailed
//     and highest-density intervals), each as a one-dimensional integral
//     over one group's posterior with a stated error estimate;
//   - P(π1 > π2), as an exact finite sum when one group's posterior shapes
//     are whole numbers and as a bounded integral otherwise;
//   - P(π1 − π2 > margin), the probability inside an equivalence region the
//     user states, the expected loss of choosing each group;
//   - the posterior predictive (beta-binomial) of a future batch and the
//     chance that group 1's next batch beats group 2's;
//   - the main numbers under three standard priors and the user's.
//
// The prior is part of every result and is printed with it. The default
// is the uniform prior Beta(1, 1) on each rate (see DefaultPrior).
//
// Numerical core: the posterior of an effect E is P(E ≤ v) = ∫ f(o)·G(o, v) do
// over the outer group's posterior density f (the narrower of the two, so
// that G, the inner group's incomplete beta function, is smooth on its
// scale). The integral runs in the log-odds t = log(o/(1−o)), where the
// beta density is log-concave and smooth at any shapes, over a window that
// leaves out at most exp(ℓ(t))/|ℓ'(t)| beyond each end (a bound that holds
// for any log-concave density), on a fixed composite Gauss–Legendre rule
// tabulated once per posterior (adaptive quadrature, internal/quad, where
// its error estimate is not within the tolerances). The inner group's
// distribution function is tabulated once too, as Chebyshev series of its
// log-odds density on panels, normalised, with its own error estimate (see
// cdftable.go): it agrees with closed forms to about 10⁻¹⁵ at shapes from
// ½ to 10⁶, where gonum's incomplete beta function (mathext.RegIncBeta,
// still used for the rates' own intervals and where no table is made)
// stops about 10⁻⁹ short at 10⁶ trials. The error estimate reported is the
// quadrature's estimate plus the table's plus the truncation bounds.
//
// Searches: a quantile is found by Newton's method on the distribution
// function, started from the Cornish–Fisher expansion with the effect's
// exact skewness (see Effect.start); the highest-density interval by
// Newton's method in both ends with the density's exact slope from the
// same pass over the nodes. Each stops when the step, or the step that
// quadratic convergence predicts next, is within the search tolerance.
package bayes
