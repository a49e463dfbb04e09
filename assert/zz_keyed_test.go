package assert

import (
	"math/rand/v2"
	"syscall"
	"testing"
	"time"
)

func rus() (u, s time.Duration) {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano()), time.Duration(ru.Stime.Nano())
}

func TestZZKeyed(t *testing.T) {
	n := 1 << 20
	w := noiseWant(n, 1_000_003, 1<<40, 0, 1)
	perm := rand.New(rand.NewPCG(3, 4)).Perm(n)
	want, got := w.table(), w.noisy(0, perm, 8).table()
	pw, pg := w.table(), w.noisy(0, nil, 8).table()
	for rep := 0; rep < 4; rep++ {
		u0, s0 := rus()
		t0 := time.Now()
		d := Compare(want, got, ByKey("id"), Tol("*", 1e-9, 0))
		t1 := time.Now()
		u1, s1 := rus()
		Compare(pw, pg, Tol("*", 1e-9, 0))
		t2 := time.Now()
		u2, s2 := rus()
		t.Logf("keyed wall %v user %v sys %v | positional wall %v user %v sys %v  eq=%v", t1.Sub(t0), u1-u0, s1-s0, t2.Sub(t1), u2-u1, s2-s1, d.Equal())
	}
}
