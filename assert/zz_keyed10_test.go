package assert

import (
	"math/rand/v2"
	"os"
	"testing"
	"time"
)

func TestZZKeyed10(t *testing.T) {
	if os.Getenv("ZZ10") == "" {
		t.Skip()
	}
	for _, n := range []int{1_000_000, 10_000_000} {
		w := noiseWant(n, 1_000_003, 1<<40, 0, 1)
		perm := rand.New(rand.NewPCG(3, 4)).Perm(n)
		want, got := w.table(), w.noisy(0, perm, 8).table()
		for rep := 0; rep < 2; rep++ {
			u0, s0 := rus()
			t0 := time.Now()
			d := Compare(want, got, ByKey("id"), Tol("*", 1e-9, 0))
			t1 := time.Now()
			u1, s1 := rus()
			t.Logf("n=%d keyed wall %v user %v sys %v eq=%v", n, t1.Sub(t0), u1-u0, s1-s0, d.Equal())
		}
	}
}
