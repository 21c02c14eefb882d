package root

import (
	"fmt"
	"math"
	"testing"
)

func TestScratch(t *testing.T) {
	a, b := 0.999, 3.0
	r2 := a - 1e-7
	F := func(x float64) (float64, float64, float64) {
		u, v, w := x-r2, x-2, x-10
		return -u * v * w, -(v*w + u*w + u*v), -2 * (u + v + w)
	}
	fa, _, _ := F(a)
	fb, _, _ := F(b)
	fmt.Println(fa, fb)
	fmt.Println(BracketedHalley(F, a+1e-9, a, b))
	fmt.Println(BracketedHalley(F, 0, a, b))
	fmt.Println(math.Inf(1))
}
