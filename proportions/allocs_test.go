package proportions

import "testing"

// The coverage engine calls Limits for every outcome of a design, so the
// methods of this package's core must not allocate (DEVELOPERS.md).
func TestCoreMethodsDoNotAllocate(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	c := Counts{X1: 5, N1: 56, X2: 0, N2: 29}
	for _, m := range []IntervalMethod{WaldCC, AgrestiCaffo, Newcombe, NewcombeCC, Mee, MiettinenNurminen,
		Haldane, JeffreysPerks, ProfileLikelihood, ProfileExactTails, ProfileMidPTails} {
		if a := testing.AllocsPerRun(20, func() { sinkLo, sinkHi = m.Limits(c, conf) }); a != 0 {
			t.Errorf("%s allocates %v times per interval", m.Name, a)
		}
	}
	for _, m := range []RateMethod{Wilson, WilsonCC, ClopperPearson, Jeffreys, MidPRate, LikelihoodRate} {
		if a := testing.AllocsPerRun(20, func() { sinkLo, sinkHi = m.Limits(3, 17, conf) }); a != 0 {
			t.Errorf("%s allocates %v times per interval", m.Name, a)
		}
	}
	if a := testing.AllocsPerRun(20, func() {
		sinkLo = FarringtonManningZ(c, 0.1) + MiettinenNurminenZ(c, -0.1)
		sinkHi, _ = RestrictedMLE(c, 0.2)
	}); a != 0 {
		t.Errorf("score statistics allocate %v times", a)
	}
}
