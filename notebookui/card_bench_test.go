package notebookui

import "testing"

// Rendering cost of the card's forms (the fixture analysis: 2 tests, 2
// intervals, 5 references).
func BenchmarkResultCardHTML(b *testing.B) {
	c := fixtureCard()
	for b.Loop() {
		_ = c.HTML()
	}
}

func BenchmarkResultCardText(b *testing.B) {
	c := fixtureCard()
	for b.Loop() {
		_ = c.Text()
	}
}

func BenchmarkResultCardBundle(b *testing.B) {
	c := fixtureCard()
	for b.Loop() {
		if _, err := Bundle(c); err != nil {
			b.Fatal(err)
		}
	}
}
